"""Atomic writes (unsteady.core.files): whole files or nothing, permissions after the umask, unique temporaries."""

import os

import pytest

from unsteady.core import files


def _umask(value):
    old = os.umask(value)
    return old


def test_write_text_follows_the_umask_and_leaves_no_temporary(tmp_path):
    old = _umask(0o027)
    try:
        p = files.write_text(tmp_path / "table.csv", "a,b\n1,2\n")
    finally:
        os.umask(old)
    assert p.read_text() == "a,b\n1,2\n"
    assert p.stat().st_mode & 0o777 == 0o640          # 0o666 less the umask, as open() would
    assert [q.name for q in tmp_path.iterdir()] == ["table.csv"]


def test_a_failed_write_keeps_the_old_file_and_removes_the_temporary(tmp_path):
    target = tmp_path / "picture.png"
    target.write_bytes(b"old")
    with pytest.raises(RuntimeError):
        with files.atomic_path(target) as tmp:
            assert tmp.parent == tmp_path and tmp.suffix == ".png" and tmp.name.startswith(".picture.")
            tmp.write_bytes(b"half")
            raise RuntimeError("drawing failed")
    assert target.read_bytes() == b"old"
    assert [q.name for q in tmp_path.iterdir()] == ["picture.png"]


def test_two_writers_of_one_target_never_share_a_temporary(tmp_path):
    target = tmp_path / "sweep.csv"
    with files.atomic_path(target) as a, files.atomic_path(target) as b:
        assert a != b and a.exists() and b.exists()
        a.write_text("first")
        b.write_text("second")
    # the later rename wins; both temporaries are gone
    assert target.read_text() == "first"
    assert [q.name for q in tmp_path.iterdir()] == ["sweep.csv"]


def test_atomic_dir_replaces_a_folder_only_when_complete(tmp_path):
    target = tmp_path / "run"
    target.mkdir()
    (target / "history.csv").write_text("old")
    with pytest.raises(KeyboardInterrupt):
        with files.atomic_dir(target) as tmp:
            (tmp / "history.csv").write_text("new, unfinished")
            raise KeyboardInterrupt
    assert (target / "history.csv").read_text() == "old"
    assert [q.name for q in tmp_path.iterdir()] == ["run"]
    old = _umask(0o022)
    try:
        with files.atomic_dir(target) as tmp:
            (tmp / "history.csv").write_text("new")
    finally:
        os.umask(old)
    assert (target / "history.csv").read_text() == "new"
    assert target.stat().st_mode & 0o777 == 0o755
    assert [q.name for q in tmp_path.iterdir()] == ["run"]
