"""Saves that respect the file they replace (core/atomic_write.py).

Each test makes the situation on a real file system (a pytest tmp folder) and checks the file
afterwards: content, mode, link kind, and that no temporary file is left beside it.
"""

from __future__ import annotations

import os
import stat
from pathlib import Path

import pytest

from core import DesignError
from core import atomic_write as aw
from core.fileformat import write_text_atomic as fileformat_write


def _leftovers(folder: Path, keep: set[str]) -> list[str]:
    return sorted(p.name for p in folder.iterdir() if p.name not in keep)


def _mode(path: Path) -> int:
    return stat.S_IMODE(os.stat(path).st_mode)


def test_new_file_written_and_stamped(tmp_path: Path) -> None:
    target = tmp_path / "a.json"
    stamp = aw.write_text_atomic(target, "één\n")
    assert target.read_bytes() == "één\n".encode()
    assert stamp == aw.file_stamp(target)
    assert stamp.size == len("één\n".encode())
    assert _leftovers(tmp_path, {"a.json"}) == []


@pytest.mark.parametrize("umask", [0o022, 0o077, 0o002])
def test_new_file_mode_follows_umask(tmp_path: Path, umask: int) -> None:
    # A new file gets 0666 less the umask (POSIX open(2) semantics), not mkstemp's 0600.
    old = os.umask(umask)
    try:
        aw.write_text_atomic(tmp_path / "new.json", "x")
    finally:
        os.umask(old)
    assert _mode(tmp_path / "new.json") == 0o666 & ~umask


def test_mode_0664_kept(tmp_path: Path) -> None:
    target = tmp_path / "shared.json"
    target.write_text("old")
    os.chmod(target, 0o664)
    old = os.umask(0o077)
    try:
        aw.write_text_atomic(target, "new")
    finally:
        os.umask(old)
    assert target.read_text() == "new"
    assert _mode(target) == 0o664


def test_fileformat_writer_delegates(tmp_path: Path) -> None:
    # core.fileformat.write_text_atomic (used by save_design) keeps the mode too: one writer.
    target = tmp_path / "d.json"
    target.write_text("old")
    os.chmod(target, 0o644)
    fileformat_write(target, "new")
    assert target.read_text() == "new" and _mode(target) == 0o644


def test_symbolic_link_written_through(tmp_path: Path) -> None:
    real = tmp_path / "real.json"
    real.write_text("old")
    os.chmod(real, 0o640)
    link = tmp_path / "link.json"
    link.symlink_to(real)
    aw.write_text_atomic(link, "new")
    assert link.is_symlink() and os.readlink(link) == str(real)
    assert real.read_text() == "new" and _mode(real) == 0o640
    assert _leftovers(tmp_path, {"real.json", "link.json"}) == []


def test_relative_link_into_other_folder(tmp_path: Path) -> None:
    (tmp_path / "store").mkdir()
    (tmp_path / "store" / "real.json").write_text("old")
    (tmp_path / "link.json").symlink_to(Path("store") / "real.json")
    aw.write_text_atomic(tmp_path / "link.json", "new")
    assert (tmp_path / "link.json").is_symlink()
    assert (tmp_path / "store" / "real.json").read_text() == "new"


def test_read_only_refused_original_intact(tmp_path: Path) -> None:
    target = tmp_path / "locked.json"
    target.write_text("original")
    os.chmod(target, 0o444)
    with pytest.raises(aw.ReadOnlyFileError) as info:
        aw.write_text_atomic(target, "new")
    assert isinstance(info.value, DesignError) and info.value.field == "file"
    assert "is read-only; save under another name" in str(info.value)
    assert target.read_text() == "original" and _mode(target) == 0o444
    assert _leftovers(tmp_path, {"locked.json"}) == []
    # force does not override a read-only file
    with pytest.raises(aw.ReadOnlyFileError):
        aw.write_text_atomic(target, "new", force=True)


@pytest.mark.parametrize("length", [250, 255])
def test_long_name_saves(tmp_path: Path, length: int) -> None:
    # NAME_MAX is 255 bytes on the usual Linux file systems; the temporary name must fit too.
    name_max = os.pathconf(tmp_path, "PC_NAME_MAX")
    assert name_max >= length
    name = "p" * (length - 5) + ".json"
    assert len(name.encode()) == length
    aw.write_text_atomic(tmp_path / name, "first")
    aw.write_text_atomic(tmp_path / name, "second")
    assert (tmp_path / name).read_text() == "second"
    with aw.atomic_path(tmp_path / name) as tmp:  # the temporary keeps ".json" and still fits
        assert tmp.suffix == ".json"
        tmp.write_text("third")
    assert (tmp_path / name).read_text() == "third"
    assert _leftovers(tmp_path, {name}) == []


def test_long_multibyte_name_saves(tmp_path: Path) -> None:
    name = "é" * 122 + ".json"  # 249 bytes in UTF-8; cutting must not split a character
    aw.write_text_atomic(tmp_path / name, "x")
    aw.write_text_atomic(tmp_path / name, "y")
    assert (tmp_path / name).read_text() == "y"


def test_changed_on_disk_refused_then_forced(tmp_path: Path) -> None:
    target = tmp_path / "d.json"
    stamp = aw.write_text_atomic(target, "mine")
    target.write_text("theirs, longer")  # another program
    assert aw.file_changed(target, stamp)
    with pytest.raises(aw.FileChangedError) as info:
        aw.write_text_atomic(target, "mine again", expect=stamp)
    assert info.value.field == "file"
    assert "was changed by another program since it was opened" in str(info.value)
    assert target.read_text() == "theirs, longer"
    new = aw.write_text_atomic(target, "mine again", expect=stamp, force=True)
    assert target.read_text() == "mine again"
    aw.write_text_atomic(target, "and again", expect=new)  # the returned stamp is current


def test_same_size_change_detected(tmp_path: Path) -> None:
    # Same length, same mtime restored: only the content hash can tell.
    target = tmp_path / "d.json"
    stamp = aw.write_text_atomic(target, "aaaa")
    target.write_text("bbbb")
    os.utime(target, ns=(stamp.mtime_ns, stamp.mtime_ns))
    with pytest.raises(aw.FileChangedError):
        aw.write_text_atomic(target, "cccc", expect=stamp)


def test_touched_but_same_content_is_not_a_change(tmp_path: Path) -> None:
    target = tmp_path / "d.json"
    stamp = aw.file_stamp(target)
    assert stamp is None
    stamp = aw.write_text_atomic(target, "same")
    target.write_text("same")
    os.utime(target, ns=(1, 1))
    assert not aw.file_changed(target, stamp)
    aw.write_text_atomic(target, "next", expect=stamp)
    assert target.read_text() == "next"


def test_fifo_refused(tmp_path: Path) -> None:
    fifo = tmp_path / "pipe.json"
    os.mkfifo(fifo)
    with pytest.raises(DesignError) as info:
        aw.write_text_atomic(fifo, "x")
    assert info.value.field == "file" and "not an ordinary file" in str(info.value)
    assert stat.S_ISFIFO(os.lstat(fifo).st_mode)
    assert aw.file_stamp(fifo) is None  # and stamping it does not block on the pipe
    assert _leftovers(tmp_path, {"pipe.json"}) == []


def test_folder_refused(tmp_path: Path) -> None:
    folder = tmp_path / "designs"
    folder.mkdir()
    with pytest.raises(DesignError) as info:
        aw.write_bytes_atomic(folder, b"x")
    assert info.value.field == "file" and "is a folder" in str(info.value)
    assert folder.is_dir() and list(folder.iterdir()) == []


def test_hard_link_is_replaced_not_shared(tmp_path: Path) -> None:
    # Documented choice: a save replaces the file; another hard link keeps the old content.
    target = tmp_path / "d.json"
    target.write_text("old")
    other = tmp_path / "other.json"
    os.link(target, other)
    aw.write_text_atomic(target, "new")
    assert target.read_text() == "new"
    assert other.read_text() == "old"
    assert os.stat(target).st_ino != os.stat(other).st_ino


@pytest.mark.parametrize("fault", ["replace", "fsync"])
def test_fault_during_write_leaves_original(tmp_path: Path, monkeypatch: pytest.MonkeyPatch,
                                            fault: str) -> None:
    target = tmp_path / "d.json"
    target.write_text("original")

    def boom(*_args: object, **_kwargs: object) -> None:
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(aw.os, fault, boom)
    with pytest.raises(DesignError) as info:
        aw.write_text_atomic(target, "new")
    monkeypatch.undo()
    assert info.value.field == "file" and "No space left on device" in str(info.value)
    assert target.read_text() == "original"
    assert _leftovers(tmp_path, {"d.json"}) == []


def test_bytes_and_atomic_path(tmp_path: Path) -> None:
    png = tmp_path / "plot.png"
    aw.write_bytes_atomic(png, b"\x89PNG\r\n")
    assert png.read_bytes() == b"\x89PNG\r\n"
    os.chmod(png, 0o664)
    with aw.atomic_path(png) as tmp:
        assert tmp.parent == tmp_path and tmp.exists() and tmp.suffix == ".png"
        tmp.write_bytes(b"second")
    assert png.read_bytes() == b"second" and _mode(png) == 0o664
    with pytest.raises(RuntimeError):
        with aw.atomic_path(png) as tmp:
            tmp.write_bytes(b"half")
            raise RuntimeError("the writer failed")
    assert png.read_bytes() == b"second"
    assert _leftovers(tmp_path, {"plot.png"}) == []


def test_wrong_argument_types() -> None:
    with pytest.raises(TypeError):
        aw.write_text_atomic("x.json", b"bytes")  # type: ignore[arg-type]
    with pytest.raises(TypeError):
        aw.write_bytes_atomic("x.bin", "text")  # type: ignore[arg-type]
