"""The one reader of CSV tables in scenarios (motion ``table`` law, gust ``table`` profile), with file, row and line in its errors."""

from __future__ import annotations

import csv
import io
import math
from pathlib import Path

import numpy as np

from ..core.errors import InputError


def table_path(file, base_dir=None):
    """The path of a table named in a scenario: ``~`` expanded, relative to ``base_dir`` (the scenario's folder)."""
    path = Path(file).expanduser()
    if not path.is_absolute() and base_dir is not None:
        path = Path(base_dir) / path
    return path


def _text(path):
    try:
        return path.read_text(encoding="utf-8-sig")
    except FileNotFoundError:
        raise InputError("file", f"table '{path}' not found") from None
    except IsADirectoryError:
        raise InputError("file", f"'{path}' is a folder, not a CSV table") from None
    except UnicodeDecodeError:
        raise InputError("file", f"'{path}' is not a text (CSV) file") from None
    except OSError as exc:
        raise InputError("file", f"cannot read table '{path}' ({exc.strerror or exc})") from None


def _rows(text):
    """(header, [(line number, cells)]): blank lines and lines starting with ``#`` skipped."""
    reader = csv.reader(io.StringIO(text))
    header, rows = None, []
    for cells in reader:
        if not cells or not "".join(cells).strip() or cells[0].lstrip().startswith("#"):
            continue
        if header is None:
            header = [c.strip().lower() for c in cells]
        else:
            rows.append((reader.line_num, cells))
    return header, rows


def _number(cells, i, col, k, line, name):
    cell = cells[i].strip() if i < len(cells) else ""
    try:
        x = float(cell)
    except ValueError:
        shown = f"'{cell}'" if cell else "an empty cell"
        raise InputError("file", f"row {k} (line {line}) of '{name}': {shown} in column {col} is not a "
                                 "number") from None
    if not math.isfinite(x):
        raise InputError("file", f"row {k} (line {line}) of '{name}': {col} = {cell} is not finite")
    return x


def read_table(path, columns):
    """Numeric columns of a CSV table whose first column increases strictly.

    The first row that is not blank or a ``#`` comment names the columns
    (any order, case and spaces ignored; other columns are ignored); every
    later row holds numbers.

    Parameters
    ----------
    path : path
    columns : dict of str -> str
        The columns to read, in order, each with what it holds (for the
        messages), e.g. ``{"t": "s", "value": "the law's unit"}``.

    Returns
    -------
    tuple of numpy.ndarray
        One array per column, at least 2 values each.

    Raises
    ------
    InputError
        Key ``file``; the message names the file and, for a bad cell, the
        data row and the line of the file.
    """
    path = Path(path)
    name = path.name
    header, rows = _rows(_text(path))
    wanted = " and ".join(f"{c} ({what})" for c, what in columns.items())
    if header is None:
        raise InputError("file", f"'{name}' is empty; it needs a header row naming columns {wanted}")
    for col in columns:
        if col not in header:
            found = ", ".join(h for h in header if h) or "nothing"
            raise InputError("file", f"'{name}' has no column '{col}'; the header row must name columns "
                                     f"{wanted} (found: {found})")
    index = [header.index(c) for c in columns]
    data = np.array([[_number(cells, i, col, k, line, name) for i, col in zip(index, columns)]
                     for k, (line, cells) in enumerate(rows, start=1)]).reshape(len(rows), len(columns))
    if len(rows) < 2:
        raise InputError("file", f"'{name}' has {len(rows)} data row{'s' if len(rows) != 1 else ''}; "
                                 "at least 2 are needed")
    first = next(iter(columns))
    bad = np.flatnonzero(np.diff(data[:, 0]) <= 0.0)
    if len(bad):
        k = int(bad[0]) + 2
        raise InputError("file", f"row {k} (line {rows[k - 1][0]}) of '{name}': {first} = {data[k - 1, 0]:g} "
                                 f"does not come after {first} = {data[k - 2, 0]:g}; {first} must increase strictly")
    return tuple(data[:, j].copy() for j in range(len(columns)))
