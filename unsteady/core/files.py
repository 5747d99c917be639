"""Files the tool writes, and only those: atomic writes, a record of what each folder holds, leftovers.

Every file or folder is made under a unique temporary name beside its target
and renamed into place when complete.  A folder the tool writes (a run, a
sweep) holds a record, :data:`RECORD`, listing each file it wrote with its
size and SHA-256 digest; a folder or file is replaced only when the tool can
prove it wrote it (:func:`claim_out_dir`, :func:`check_out_file`), anything
else in the way is refused before any computing.  A writer holds a lock
(``flock``) on its temporary for as long as it writes, so leftovers of a
process that was killed are told from work in progress and removed by the
next run (:func:`clean_leftovers`).
"""

from __future__ import annotations

import errno
import hashlib
import json
import os
import re
import shutil
import tempfile
import time
from contextlib import contextmanager
from pathlib import Path

from .errors import UsageError

try:                                 # POSIX; elsewhere nothing is locked (see _in_use)
    import fcntl
except ImportError:                  # pragma: no cover
    fcntl = None

#: The record of what the tool wrote into a folder (hidden; JSON).
RECORD = ".unsteady-files.json"
#: Temporaries of :func:`atomic_path` (``.<stem>.<8 random>.part<suffix>``) and of
#: :func:`atomic_dir` (``.<name>.<8 random>.part`` / ``.old``).
_TEMP = re.compile(r"^\.(?P<stem>.+)\.[a-z0-9_]{8}\.(?P<kind>part|old)(?P<suffix>\.[^.]*)?$")
#: A temporary whose lock cannot be tested is taken for a leftover after this long (s).
_STALE_AFTER = 24 * 3600.0
#: Text of the mark appended to a film (see :func:`append_mark`).
MARK = b"written by unsteady (airfoil unsteady-load model)"


def umask() -> int:
    """The process's file-creation mask (read without changing it for good)."""
    mask = os.umask(0)
    os.umask(mask)
    return mask


def _remove(path):
    try:
        os.unlink(path)
    except FileNotFoundError:
        pass


# ---------------------------------------------------------------------------
# locks: a writer holds one on its temporary until it is renamed into place

def _lock(fd):
    if fcntl is not None:
        try:
            fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except OSError:             # a file system without locks: _in_use falls back to age
            pass


def _in_use(path) -> bool:
    """Whether a live process still holds the lock of the temporary ``path``."""
    try:
        fd = os.open(path, os.O_RDONLY)
    except OSError:
        return True                  # cannot look: leave it alone
    try:
        if fcntl is None:
            raise OSError(errno.ENOTSUP, "no locks")
        fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
        return False
    except BlockingIOError:
        return True
    except OSError:
        try:
            return time.time() - os.stat(path).st_mtime < _STALE_AFTER
        except OSError:
            return True
    finally:
        os.close(fd)


# ---------------------------------------------------------------------------
# atomic files

@contextmanager
def atomic_path(target, mode=0o666):
    """A unique temporary path beside ``target``, renamed onto it when the block ends without error.

    The temporary file is created empty (``tempfile.mkstemp``: no two
    processes or threads ever share one), with permissions ``mode`` less the
    umask, locked while the block runs (so :func:`clean_leftovers` leaves it
    alone) and named ``.<stem>.<random>.part<suffix>`` so that tools which
    read the format from the suffix (matplotlib, ffmpeg) still can.  On any
    error (KeyboardInterrupt too) it is removed and ``target`` is left as it
    was.  In a folder with a complete :data:`RECORD` the new file joins the
    record: its digest is accepted before the rename (the earlier one still
    is too), and becomes the only one after it, so a process killed in
    between leaves a file the record vouches for.

    Parameters
    ----------
    target : path
        The file to write; its folder must exist.
    mode : int
        Permission bits before the umask (0o666: like ``open(target, "w")``).

    Yields
    ------
    pathlib.Path
        Where to write.
    """
    target = Path(target)
    fd, tmp = tempfile.mkstemp(prefix=f".{target.stem}.", suffix=f".part{target.suffix}",
                               dir=target.parent)
    try:
        _lock(fd)
        os.chmod(tmp, mode & ~umask())        # mkstemp makes the file private
        yield Path(tmp)
        entry = _record_ahead(target, Path(tmp))
        os.replace(tmp, target)
        if entry is not None:
            _update_record(target.absolute().parent, {target.name: entry})
    except BaseException:
        _remove(tmp)
        raise
    finally:
        os.close(fd)


def write_bytes(path, data: bytes, mode=0o666):
    """Write ``data`` to ``path`` atomically (flushed to disk before the rename); returns the Path."""
    path = Path(path)
    with atomic_path(path, mode) as tmp:
        with open(tmp, "wb") as f:
            f.write(data)
            f.flush()
            os.fsync(f.fileno())
    return path


def write_text(path, text: str, encoding="utf-8", mode=0o666):
    """Write ``text`` to ``path`` atomically (see :func:`write_bytes`); returns the Path."""
    return write_bytes(path, text.encode(encoding), mode)


# ---------------------------------------------------------------------------
# atomic folders

def _exchange(a, b) -> bool:
    """Swap the paths ``a`` and ``b`` in one step (Linux ``renameat2(RENAME_EXCHANGE)``).

    Returns False where the system or the file system cannot (then nothing moved).
    """
    try:
        import ctypes
        libc = ctypes.CDLL(None, use_errno=True)
        fn = libc.renameat2
    except (OSError, AttributeError):
        return False
    at_fdcwd, rename_exchange = -100, 2
    if fn(at_fdcwd, os.fsencode(str(a)), at_fdcwd, os.fsencode(str(b)), rename_exchange) == 0:
        return True
    code = ctypes.get_errno()
    if code in (errno.ENOSYS, errno.EINVAL, errno.ENOTSUP):
        return False
    raise OSError(code, os.strerror(code), str(a), None, str(b))


def _swap_in(tmp, target, parent):
    """Put the complete folder ``tmp`` at ``target``; returns the path now holding the earlier folder
    (to delete), or None.  At every instant ``target`` is the earlier folder or the new one where
    the system can swap two paths in one step; elsewhere an interrupted swap leaves the earlier
    folder as ``.<name>.<random>.old/x``, which :func:`clean_leftovers` puts back."""
    if not os.path.lexists(target):
        os.rename(tmp, target)
        return None
    if _exchange(tmp, target):
        return tmp
    old = Path(tempfile.mkdtemp(prefix=f".{target.name}.", suffix=".old", dir=parent))
    fd = os.open(old, os.O_RDONLY)
    try:
        _lock(fd)
        os.rename(target, old / "x")
        try:
            os.rename(tmp, target)
        except BaseException:
            os.rename(old / "x", target)      # put the earlier folder back
            os.rmdir(old)
            raise
    finally:
        os.close(fd)
    return old


@contextmanager
def atomic_dir(target, kind="run"):
    """A unique temporary folder beside ``target``, put in its place when the block ends without error.

    The folder gets the permissions a new folder would (0o777 less the
    umask) and its :data:`RECORD` (``kind``, then, when the block ends, every
    file written into it); it is locked while it is being filled.  An
    existing ``target`` is replaced only once the new folder is complete
    (swapped in, then the earlier one deleted); on any error the temporary
    folder is deleted and ``target`` is untouched.  Deciding whether
    ``target`` may be replaced is the caller's job (:func:`claim_out_dir`).

    Yields
    ------
    pathlib.Path
        The folder to fill (plain files; subfolders are recorded by name).
    """
    target = Path(target)
    parent = target.absolute().parent
    parent.mkdir(parents=True, exist_ok=True)
    tmp = Path(tempfile.mkdtemp(prefix=f".{target.name}.", suffix=".part", dir=parent))
    fd = os.open(tmp, os.O_RDONLY)
    try:
        _lock(fd)
        os.chmod(tmp, 0o777 & ~umask())
        _write_record(tmp, {"kind": kind, "complete": False, "files": {}})
        yield tmp
        write_record(tmp, kind)
        earlier = _swap_in(tmp, target, parent)
        if earlier is not None:
            shutil.rmtree(earlier, ignore_errors=True)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
    finally:
        os.close(fd)


# ---------------------------------------------------------------------------
# the record of what a folder holds

def digest(path) -> str:
    """SHA-256 of a file's bytes (hex)."""
    h = hashlib.sha256()
    with open(path, "rb") as f:
        for block in iter(lambda: f.read(1 << 20), b""):
            h.update(block)
    return h.hexdigest()


def _entry(path):
    if path.is_dir():
        return {"dir": True}
    return {"size": path.stat().st_size, "sha256": digest(path)}


def _write_record(folder, data):
    from .version import __version__
    data = {"written_by": "unsteady", "version": __version__, **data}
    write_text(Path(folder) / RECORD, json.dumps(data, indent=1, sort_keys=True) + "\n")


def read_record(folder):
    """The folder's record as a dict, or None when it has none (or one that cannot be read)."""
    try:
        data = json.loads((Path(folder) / RECORD).read_text())
    except (OSError, ValueError):
        return None
    if not isinstance(data, dict) or data.get("written_by") != "unsteady" \
            or not isinstance(data.get("files"), dict):
        return None
    return data


def write_record(folder, kind, folders=()):
    """Record every file now in ``folder`` (its size and digest) as written by the tool.

    ``folders`` names subfolders that belong to the folder even before they exist
    (a sweep's ``runs``).
    """
    folder = Path(folder)
    files = {n: {"dir": True} for n in folders}
    for p in sorted(folder.iterdir()):
        if p.name != RECORD and not _TEMP.match(p.name):
            files[p.name] = _entry(p)
    _write_record(folder, {"kind": kind, "complete": True, "files": files})


def _update_record(folder, entries):
    """Set the given entries (name -> entry) of ``folder``'s record, one writer at a time."""
    folder = Path(folder)
    fd = os.open(folder, os.O_RDONLY)
    try:
        if fcntl is not None:
            try:
                fcntl.flock(fd, fcntl.LOCK_EX)
            except OSError:
                pass
        data = read_record(folder)
        if data is None:
            return
        data["files"].update(entries)
        _write_record(folder, {k: v for k, v in data.items() if k not in ("written_by", "version")})
    finally:
        os.close(fd)


def _record_ahead(target, tmp):
    """Before ``tmp`` is renamed onto ``target``: accept its content in the record of the folder
    (when it has a complete one) beside the current one; returns the new entry, or None."""
    if target.name == RECORD or _TEMP.match(target.name):
        return None
    folder = target.absolute().parent
    data = read_record(folder)
    if data is None or not data.get("complete"):
        return None                          # no record, or a folder still being filled
    entry = _entry(tmp)
    old = data["files"].get(target.name)
    also = [{k: old[k] for k in ("size", "sha256")}] if isinstance(old, dict) and "sha256" in old else []
    _update_record(folder, {target.name: {**entry, "also": also}})
    return entry


def record(*paths):
    """Add files written by other means than :func:`atomic_path` to the record of their folder
    (none: nothing to do).  Files written through :func:`atomic_path` join it by themselves."""
    by_folder = {}
    for p in paths:
        p = Path(p)
        if p.is_file():
            by_folder.setdefault(p.absolute().parent, {})[p.name] = _entry(p)
    for folder, entries in by_folder.items():
        if read_record(folder) is not None:
            _update_record(folder, entries)


def _matches(path, want):
    """Whether the file ``path`` is the one ``want`` (a record entry, or one of its ``also``) describes."""
    try:
        size = path.stat().st_size
        versions = [want, *want.get("also", ())]
        if not any(size == v.get("size") for v in versions):
            return False
        d = digest(path)
        return any(size == v.get("size") and d == v.get("sha256") for v in versions)
    except OSError:
        return False


def foreign_entry(folder, kind):
    """The first entry of ``folder`` (in name order) the tool cannot prove it wrote, as
    (name, why), or None when the folder holds only what its record lists, unchanged.

    ``name`` is None when the folder as a whole is of another kind.
    """
    folder = Path(folder)
    names = sorted(n for n in os.listdir(folder) if n != RECORD and not _TEMP.match(n))
    data = read_record(folder)
    if data is None:
        if not names:
            return None
        return names[0], "which unsteady did not write (the folder has no record of an earlier run)"
    if data.get("kind") != kind:
        return None, f"is a {data.get('kind')} folder of unsteady, not a {kind} folder"
    files = data["files"]
    for n in names:
        p = folder / n
        want = files.get(n)
        if not isinstance(want, dict):
            return n, "which unsteady did not write"
        if want.get("dir"):
            if not p.is_dir() or p.is_symlink():
                return n, "which unsteady did not write"
            continue
        if p.is_symlink() or not p.is_file():
            return n, "which unsteady did not write"
        if not _matches(p, want):
            return n, "changed since unsteady wrote it"
    return None


def owned_file(path, marked=None) -> bool:
    """Whether the tool can prove it wrote the file ``path``: its folder's record lists it
    unchanged, or ``marked(path)`` finds the tool's mark in it."""
    path = Path(path)
    if path.is_symlink() or not path.is_file():
        return False
    data = read_record(path.absolute().parent)
    want = data["files"].get(path.name) if data else None
    if isinstance(want, dict) and not want.get("dir") and _matches(path, want):
        return True
    return bool(marked and marked(path))


# ---------------------------------------------------------------------------
# marks in files that live outside a recorded folder (films)

def append_mark(path):
    """Append the tool's mark to a film in a way its format ignores.

    MP4: a top-level free-space box (``free``; ISO/IEC 14496-12, 8.1.2: its
    contents are irrelevant and may be ignored).  GIF: a Comment Extension
    (0x21 0xFE) before the trailer 0x3B (GIF89a specification, section 24).
    Other suffixes: nothing.
    """
    path = Path(path)
    suffix = path.suffix.lower()
    if suffix == ".mp4":
        with open(path, "ab") as f:
            f.write((8 + len(MARK)).to_bytes(4, "big") + b"free" + MARK)
    elif suffix == ".gif":
        with open(path, "r+b") as f:
            f.seek(-1, os.SEEK_END)
            if f.read(1) != b";":
                return
            f.seek(-1, os.SEEK_END)
            f.write(b"!\xfe" + bytes([len(MARK)]) + MARK + b"\x00;")
            f.truncate()


def has_mark(path) -> bool:
    """Whether the file ends with the mark of :func:`append_mark`."""
    try:
        with open(path, "rb") as f:
            f.seek(0, os.SEEK_END)
            size = f.tell()
            f.seek(max(0, size - len(MARK) - 16))
            return MARK in f.read()
    except OSError:
        return False


# ---------------------------------------------------------------------------
# leftovers of killed processes

def clean_leftovers(folder, name=None):
    """Remove the tool's own leftovers in ``folder`` (of the entry ``name`` only, when given).

    A leftover is a temporary of :func:`atomic_path` or :func:`atomic_dir`
    that no live process holds: a ``.part`` file, a ``.part`` folder holding
    the tool's record (or nothing), an ``.old`` folder holding an earlier
    folder (``x``), which is put back when its place is empty.  Anything else
    is left alone.  Returns the names removed or put back.
    """
    folder = Path(folder)
    done = []
    try:
        entries = sorted(os.listdir(folder))
    except OSError:
        return done
    for n in entries:
        m = _TEMP.match(n)
        if not m:
            continue
        stem = m.group("stem")
        p = folder / n
        if name is not None and stem not in (name, Path(name).stem):
            continue
        if p.is_symlink() or _in_use(p):
            continue
        try:
            if p.is_file() and m.group("kind") == "part":
                os.unlink(p)
            elif p.is_dir() and m.group("kind") == "part" and not m.group("suffix"):
                inside = os.listdir(p)
                if inside and RECORD not in inside:
                    continue
                shutil.rmtree(p)
            elif p.is_dir() and m.group("kind") == "old" and not m.group("suffix"):
                inside = os.listdir(p)
                if inside not in ([], ["x"]):
                    continue
                home = folder / stem
                if inside and not os.path.lexists(home) and (p / "x" / RECORD).is_file():
                    os.rename(p / "x", home)     # the swap was cut short: the earlier folder goes back
                shutil.rmtree(p)
            else:
                continue
        except OSError:
            continue
        done.append(n)
    return done


# ---------------------------------------------------------------------------
# may the tool write there?

def _empty(text, label, what):
    if not str(text).strip():
        raise UsageError(f"error: -: {label}: is empty; give {what}")


def _line(path, label, source, text):
    """``error: <path>: <label>: <text>``, or with the scenario file that named the path
    (``source``, key ``label`` = output.dir) ``error: <source>: <label>: <path> <text>``."""
    return f"error: {source}: {label}: {path} {text}" if source else f"error: {path}: {label}: {text}"


def probe_writable(folder, shown, label="--out", source=None):
    """Create and remove a file in ``folder``: UsageError (one line) when it cannot be done.

    More truthful than the permission bits: it sees read-only file systems,
    ``/proc`` and the like, and what the superuser may do.
    """
    try:
        fd, p = tempfile.mkstemp(prefix=".unsteady-probe.", dir=folder)
        os.close(fd)
        os.unlink(p)
    except OSError as exc:
        raise UsageError(_line(shown, label, source, f"cannot be written: no file can be made in {folder} "
                               f"({exc.strerror or exc}); choose a folder you can write in")) from None


def _nearest_existing(path):
    anc = Path(path).absolute()
    while not os.path.lexists(anc):
        anc = anc.parent
    return anc


def claim_out_dir(path, kind, label="--out", *, create=False, folders=(), source=None):
    """Check, before any computing, that the folder ``path`` may take output of ``kind`` ("run", "sweep").

    Allowed: a new path (its nearest existing folder writable), an empty
    folder, or a folder whose record (``kind``) lists every entry unchanged:
    the tool's own earlier output.  The tool's stale leftovers beside and
    inside it are removed first (:func:`clean_leftovers`; an interrupted swap
    is put back).  ``create``: make the folder and its record now (a sweep,
    filled piece by piece; ``folders``: subfolders it will hold).
    ``source``: the scenario file when the path came from its ``output.dir``
    (``label``), for the messages.

    Returns
    -------
    pathlib.Path

    Raises
    ------
    UsageError
        ``error: <path>: <label>: ...`` naming the first entry the tool did
        not write, or why the folder cannot be written.
    """
    _empty(path, label, "a folder (or leave the option out)")
    path = Path(path)
    again = "give a new folder, an empty one or an earlier one of unsteady's"

    def refuse(text):
        return UsageError(_line(path, label, source, text))
    if path.is_symlink():
        raise refuse("is a symbolic link; give the folder it points to")
    if os.path.lexists(path) and not path.is_dir():
        raise refuse(f"exists and is not a folder; {again}")
    parent = path.absolute().parent
    if parent.is_dir():
        clean_leftovers(parent, path.name)
    if path.is_dir():
        if read_record(path) is not None:
            clean_leftovers(path)
        try:
            bad = foreign_entry(path, kind)
        except OSError as exc:
            raise refuse(f"cannot be read ({exc.strerror}); {again}") from None
        if bad is not None:
            name, why = bad
            raise refuse(f"{f'holds {name}, {why}' if name is not None else why}; {again} (nothing was deleted)")
        probe_writable(path, path, label, source)
        probe_writable(parent, path, label, source)
    else:
        anc = _nearest_existing(path)
        if not anc.is_dir():
            raise refuse(f"lies under {anc}, which is a file, not a folder")
        probe_writable(anc, path, label, source)
    if create:
        path.mkdir(parents=True, exist_ok=True)
        data = read_record(path)
        if data is None:
            write_record(path, kind, folders)
        elif any(n not in data["files"] for n in folders):
            data["files"].update({n: {"dir": True} for n in folders})
            _write_record(path, {k: v for k, v in data.items() if k not in ("written_by", "version")})
    return path


def check_out_file(path, label="--out", *, marked=None, what="a file name"):
    """Check, before any computing, that the file ``path`` may be written.

    Its folder must exist and be writable; an existing file is replaced only
    when the tool can prove it wrote it (:func:`owned_file`: listed unchanged
    in its folder's record, or ``marked(path)``).  The tool's stale
    temporaries of that file are removed first.

    Returns
    -------
    pathlib.Path

    Raises
    ------
    UsageError
    """
    _empty(path, label, what)
    path = Path(path)
    parent = path.absolute().parent
    if path.is_dir():
        raise UsageError(f"error: {path}: {label}: is a folder; give {what}")
    if not parent.is_dir():
        raise UsageError(f"error: {path}: {label}: folder {path.parent} does not exist; create it first")
    probe_writable(parent, path, label)
    clean_leftovers(parent, path.name)
    if os.path.lexists(path) and not owned_file(path, marked):
        raise UsageError(f"error: {path}: {label}: exists and was not written by unsteady; "
                         "give a new file name or move that file away (nothing was replaced)")
    return path
