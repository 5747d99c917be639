"""Atomic writes: every file or folder is made under a unique temporary name beside its target and renamed into place when complete."""

from __future__ import annotations

import os
import shutil
import tempfile
from contextlib import contextmanager
from pathlib import Path


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


@contextmanager
def atomic_path(target, mode=0o666):
    """A unique temporary path beside ``target``, renamed onto it when the block ends without error.

    The temporary file is created empty (``tempfile.mkstemp``: no two
    processes or threads ever share one), with permissions ``mode`` less the
    umask, and named ``.<stem>.<random>.part<suffix>`` so that tools which
    read the format from the suffix (matplotlib, ffmpeg) still can.  On any
    error (KeyboardInterrupt too) it is removed and ``target`` is left as it
    was.

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
    os.close(fd)
    try:
        os.chmod(tmp, mode & ~umask())        # mkstemp makes the file private
        yield Path(tmp)
        os.replace(tmp, target)
    except BaseException:
        _remove(tmp)
        raise


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


@contextmanager
def atomic_dir(target):
    """A unique temporary folder beside ``target``, put in its place when the block ends without error.

    The folder gets the permissions a new folder would (0o777 less the
    umask).  An existing ``target`` is replaced only once the new folder is
    complete (moved aside, the new one renamed in, the old one deleted); on
    any error the temporary folder is deleted and ``target`` is untouched.
    Deciding whether ``target`` may be replaced is the caller's job.

    Yields
    ------
    pathlib.Path
        The folder to fill.
    """
    target = Path(target)
    parent = target.resolve().parent
    parent.mkdir(parents=True, exist_ok=True)
    tmp = Path(tempfile.mkdtemp(prefix=f".{target.name}.", suffix=".part", dir=parent))
    try:
        os.chmod(tmp, 0o777 & ~umask())
        yield tmp
        if target.exists():
            old = Path(tempfile.mkdtemp(prefix=f".{target.name}.", suffix=".old", dir=parent))
            os.rename(target, old / "x")
            try:
                os.rename(tmp, target)
            except BaseException:
                os.rename(old / "x", target)      # put the earlier folder back
                os.rmdir(old)
                raise
            shutil.rmtree(old, ignore_errors=True)
        else:
            os.rename(tmp, target)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
