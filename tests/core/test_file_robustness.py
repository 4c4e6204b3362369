"""Broken design files and failing saves (DESIGN §3, §4): the core refuses each with one
``DesignError`` naming the field, and ``penduline report FILE`` exits 2 with one stderr line.

Every broken file is built here in ``tmp_path``; the example design is the only file read from
the repository. Faults the test machine cannot produce for real (a folder that refuses writes
when the tests run as root, a full disk, a failing rename) are simulated by monkeypatching the
function the core calls to raise the ``OSError`` the system would raise. No Qt is involved.
"""

from __future__ import annotations

import errno
import json
import os
import random
import subprocess
import sys
import tempfile
from collections.abc import Callable
from pathlib import Path
from typing import Any

import pytest

import core.atomic_write as atomic_write
import core.fileformat as fileformat
from app.cli import main
from core import DesignError, load_design, loads_design, save_design, with_value
from core.fileformat import MAX_FILE_BYTES

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json"
EXAMPLE_TEXT = EXAMPLE.read_text(encoding="utf-8")
NESTING_BYTES = 100_000


def _garbage() -> bytes:
    rng = random.Random(20240611)
    return b"\xff\xfe\x00" + bytes(rng.randrange(256) for _ in range(4096))


def _nested(open_: str, close: str, inner: str = "") -> bytes:
    depth = (NESTING_BYTES - len(inner)) // (len(open_) + len(close))
    return (open_ * depth + inner + close * depth).encode("ascii")


# name → (file bytes, field, words the reason must contain)
BROKEN_BYTES: dict[str, tuple[bytes, str, str]] = {
    "empty": (b"", "file", "is empty"),
    "only whitespace": (b" \n\t\r\n  ", "file", "is empty"),
    "truncated JSON": (EXAMPLE_TEXT[: len(EXAMPLE_TEXT) // 2].encode(), "file",
                       "is not valid JSON"),
    "JSON cut after the last brace": (EXAMPLE_TEXT.rstrip()[:-1].encode(), "file",
                                      "is not valid JSON"),
    "binary garbage": (_garbage(), "file", "is not UTF-8 text (byte 0)"),
    "NUL bytes": (b"\x00" * 512, "file", "is not UTF-8 text (byte 0)"),
    "UTF-16 with BOM": (EXAMPLE_TEXT.encode("utf-16"), "file", "is not UTF-8 text (byte 0)"),
    "UTF-16-LE without BOM": (EXAMPLE_TEXT.encode("utf-16-le"), "file",
                              "is not UTF-8 text (byte 1); it looks like UTF-16"),
    "UTF-32": (EXAMPLE_TEXT.encode("utf-32"), "file", "is not UTF-8 text (byte 0)"),
    "Latin-1": (EXAMPLE_TEXT.replace("Workshop regulator", "Werkstätte").encode("latin-1"),
                "file", "is not UTF-8 text (byte "),
    "another format": (EXAMPLE_TEXT.replace('"penduline-design"', '"clock-design"').encode(),
                       "format", "'clock-design' is not a Penduline design"),
    "no format": (EXAMPLE_TEXT.replace('"format": "penduline-design",', "").encode(),
                  "format", "is missing"),
    "newer version": (EXAMPLE_TEXT.replace('"version": 2', '"version": 3').encode(),
                      "version", "version 3 is newer than this Penduline reads"),
    "version as text": (EXAMPLE_TEXT.replace('"version": 2', '"version": "2"').encode(),
                        "version", "must be a whole number"),
    "100 kB of nested arrays": (_nested("[", "]"), "file", "nested too deeply"),
    "100 kB of nested objects": (_nested('{"a":', "}", "1"), "file", "nested too deeply"),
    "deep nesting inside a field": (EXAMPLE_TEXT.replace(
        '"name": "Workshop regulator"',
        '"name": ' + "[" * 40_000 + "]" * 40_000).encode(), "file", "nested too deeply"),
    "a list, not an object": (b"[1, 2, 3]", "file", "must be an object, not a list"),
    "a bare number": (b"42", "file", "must be an object, not a number"),
    "NaN in a number": (EXAMPLE_TEXT.replace('"amplitude_deg": 1.6',
                                             '"amplitude_deg": NaN').encode(),
                        "file", "contains NaN"),
    "Infinity in a number": (EXAMPLE_TEXT.replace('"amplitude_deg": 1.6',
                                                  '"amplitude_deg": -Infinity').encode(),
                             "file", "contains -Infinity"),
    "1e999 in a number": (EXAMPLE_TEXT.replace('"amplitude_deg": 1.6',
                                               '"amplitude_deg": 1e999').encode(),
                          "swing.amplitude_deg", "must be a finite number"),
}


def _write(tmp_path: Path, data: bytes) -> Path:
    path = tmp_path / "broken.pendulum.json"
    path.write_bytes(data)
    return path


def _sparse_huge(tmp_path: Path) -> Path:
    path = tmp_path / "huge.pendulum.json"
    with open(path, "wb") as fh:
        fh.truncate(MAX_FILE_BYTES * 4)  # a sparse file: no disk space used
    return path


def _just_over_the_limit(tmp_path: Path) -> Path:
    """The valid example padded with spaces to one byte over the limit (valid JSON)."""
    path = tmp_path / "padded.pendulum.json"
    data = EXAMPLE_TEXT.encode()
    path.write_bytes(data + b" " * (MAX_FILE_BYTES + 1 - len(data)))
    assert path.stat().st_size == MAX_FILE_BYTES + 1
    return path


def _folder(tmp_path: Path) -> Path:
    path = tmp_path / "folder.pendulum.json"
    path.mkdir()
    return path


def _missing(tmp_path: Path) -> Path:
    return tmp_path / "missing.pendulum.json"


# name → (make the path, field, words)
BROKEN_PATHS: dict[str, tuple[Callable[[Path], Path], str, str]] = {
    "huge sparse file": (_sparse_huge, "file",
                         f"is {MAX_FILE_BYTES * 4} bytes; a design file is at most "
                         f"{MAX_FILE_BYTES} bytes"),
    "one byte over the limit": (_just_over_the_limit, "file",
                                f"a design file is at most {MAX_FILE_BYTES} bytes"),
    "a folder": (_folder, "file", "is a folder, not a design file"),
    "a missing file": (_missing, "file", "does not exist"),
}


def _deny_reading(monkeypatch: pytest.MonkeyPatch, path: Path) -> None:
    """Make reading ``path`` fail as chmod 000 would (the tests may run as root, where it
    does not)."""
    real = Path.read_bytes

    def read_bytes(self: Path) -> bytes:
        if self == path:
            raise PermissionError(errno.EACCES, os.strerror(errno.EACCES), str(self))
        return real(self)

    monkeypatch.setattr(Path, "read_bytes", read_bytes)


def _one_line(err: str) -> str:
    lines = err.splitlines()
    assert len(lines) == 1, err
    assert "Traceback" not in err
    return lines[0]


class TestLoadBrokenFiles:
    @pytest.mark.parametrize("name", list(BROKEN_BYTES))
    def test_refused_with_the_field_and_the_file_unchanged(self, tmp_path: Path,
                                                           name: str) -> None:
        data, field, words = BROKEN_BYTES[name]
        path = _write(tmp_path, data)
        stamp = path.stat().st_mtime_ns
        with pytest.raises(DesignError) as info:
            load_design(path)
        assert info.value.field == field
        assert words in info.value.reason
        assert str(info.value) == f"{field}: {info.value.reason}"
        assert path.read_bytes() == data and path.stat().st_mtime_ns == stamp
        with pytest.raises(DesignError) as from_bytes:  # the same bytes, not from a file
            loads_design(data)
        assert from_bytes.value.field == field

    def test_the_latin1_message_gives_the_offset_of_the_first_bad_byte(self,
                                                                      tmp_path: Path) -> None:
        data = BROKEN_BYTES["Latin-1"][0]
        with pytest.raises(DesignError) as info:
            load_design(_write(tmp_path, data))
        offset = data.index("ä".encode("latin-1"))
        assert info.value.reason == f"is not UTF-8 text (byte {offset})"

    def test_a_utf8_byte_order_mark_is_accepted(self, tmp_path: Path) -> None:
        path = _write(tmp_path, b"\xef\xbb\xbf" + EXAMPLE_TEXT.encode())
        assert load_design(path) == load_design(EXAMPLE)

    @pytest.mark.parametrize("name", list(BROKEN_PATHS))
    def test_paths_that_are_not_design_files_are_refused(self, tmp_path: Path,
                                                         name: str) -> None:
        make, field, words = BROKEN_PATHS[name]
        path = make(tmp_path)
        with pytest.raises(DesignError) as info:
            load_design(path)
        assert info.value.field == field
        assert words in info.value.reason

    def test_an_unreadable_file_is_refused(self, tmp_path: Path,
                                           monkeypatch: pytest.MonkeyPatch) -> None:
        path = _write(tmp_path, EXAMPLE_TEXT.encode())
        _deny_reading(monkeypatch, path)
        with pytest.raises(DesignError) as info:
            load_design(path)
        assert info.value.field == "file"
        assert info.value.reason == f"{path} cannot be read (Permission denied)"


class TestReportCommandOnBrokenFiles:
    """`penduline report FILE`: exit 2, exactly one stderr line naming the field, no output."""

    @pytest.mark.parametrize("name", list(BROKEN_BYTES))
    def test_broken_contents(self, tmp_path: Path, capsys: pytest.CaptureFixture[str],
                             name: str) -> None:
        data, field, words = BROKEN_BYTES[name]
        code = main(["report", str(_write(tmp_path, data))])
        out, err = capsys.readouterr()
        assert code == 2 and out == ""
        line = _one_line(err)
        assert line.startswith(f"penduline: {field}: ") and words in line

    @pytest.mark.parametrize("name", list(BROKEN_PATHS))
    def test_broken_paths(self, tmp_path: Path, capsys: pytest.CaptureFixture[str],
                          name: str) -> None:
        make, field, words = BROKEN_PATHS[name]
        code = main(["report", "--json", str(make(tmp_path))])
        out, err = capsys.readouterr()
        assert code == 2 and out == ""
        line = _one_line(err)
        assert line.startswith(f"penduline: {field}: ") and words in line

    def test_unreadable_file(self, tmp_path: Path, capsys: pytest.CaptureFixture[str],
                             monkeypatch: pytest.MonkeyPatch) -> None:
        path = _write(tmp_path, EXAMPLE_TEXT.encode())
        _deny_reading(monkeypatch, path)
        code = main(["report", str(path)])
        out, err = capsys.readouterr()
        assert code == 2 and out == ""
        assert _one_line(err) == f"penduline: file: {path} cannot be read (Permission denied)"

    @pytest.mark.parametrize("name", ["binary garbage", "100 kB of nested arrays",
                                      "newer version"])
    def test_in_a_real_process(self, tmp_path: Path, name: str) -> None:
        """The installed command's own process: exit status 2 and one stderr line."""
        data, field, words = BROKEN_BYTES[name]
        path = _write(tmp_path, data)
        code = "import sys; from app.cli import main; sys.exit(main(sys.argv[1:]))"
        done = subprocess.run([sys.executable, "-c", code, "report", str(path)], cwd=ROOT,
                              capture_output=True, text=True, timeout=120)
        assert done.returncode == 2 and done.stdout == ""
        line = _one_line(done.stderr)
        assert line.startswith(f"penduline: {field}: ") and words in line


# ================================================================================== saving

def _oserror(code: int) -> OSError:
    return OSError(code, os.strerror(code))


@pytest.fixture
def saved(tmp_path: Path) -> Path:
    """A design file on disk (the example, saved by the core) in an otherwise empty folder."""
    path = tmp_path / "design.pendulum.json"
    save_design(load_design(EXAMPLE), path)
    return path


def _edited() -> Any:
    return with_value(load_design(EXAMPLE), "swing.amplitude_deg", 2.5)


def _fail_write_after(monkeypatch: pytest.MonkeyPatch, code: int, keep: int) -> None:
    """Make writing the temporary file fail with ``code`` after ``keep`` characters (a disk
    that fills up part way)."""
    real_fdopen = os.fdopen

    class Failing:
        def __init__(self, fh: Any) -> None:
            self._fh = fh

        def write(self, text: str) -> int:
            self._fh.write(text[:keep])
            self._fh.flush()
            raise _oserror(code)

        def __getattr__(self, name: str) -> Any:
            return getattr(self._fh, name)

        def __enter__(self) -> Failing:
            return self

        def __exit__(self, *exc: object) -> None:
            self._fh.close()

    monkeypatch.setattr(fileformat.os, "fdopen",
                        lambda fd, *a, **k: Failing(real_fdopen(fd, *a, **k)))


def _raise(code: int) -> Callable[..., Any]:
    def fail(*_args: Any, **_kwargs: Any) -> Any:
        raise _oserror(code)
    return fail


SAVE_FAULTS: dict[str, tuple[Callable[[pytest.MonkeyPatch], None], str]] = {
    "read-only folder (no temporary file)": (
        lambda mp: mp.setattr(atomic_write, "_open_temp", _raise(errno.EACCES)),
        os.strerror(errno.EACCES)),
    "read-only file system": (
        lambda mp: mp.setattr(atomic_write, "_open_temp", _raise(errno.EROFS)),
        os.strerror(errno.EROFS)),
    "disk full while writing": (
        lambda mp: _fail_write_after(mp, errno.ENOSPC, 100), os.strerror(errno.ENOSPC)),
    "disk full on the first byte": (
        lambda mp: _fail_write_after(mp, errno.ENOSPC, 0), os.strerror(errno.ENOSPC)),
    "flush to disk fails": (
        lambda mp: mp.setattr(fileformat.os, "fsync", _raise(errno.EIO)),
        os.strerror(errno.EIO)),
    "rename across devices": (
        lambda mp: mp.setattr(fileformat.os, "replace", _raise(errno.EXDEV)),
        os.strerror(errno.EXDEV)),
    "rename refused": (
        lambda mp: mp.setattr(fileformat.os, "replace", _raise(errno.EACCES)),
        os.strerror(errno.EACCES)),
}


class TestSaveFaults:
    @pytest.mark.parametrize("name", list(SAVE_FAULTS))
    def test_old_file_kept_byte_for_byte_and_no_temporary_file_left(
            self, saved: Path, monkeypatch: pytest.MonkeyPatch, name: str) -> None:
        before = saved.read_bytes()
        inject, words = SAVE_FAULTS[name]
        with monkeypatch.context() as fault:
            inject(fault)
            with pytest.raises(DesignError) as info:
                save_design(_edited(), saved)
        assert info.value.field == "file"
        assert info.value.reason == f"could not save {saved}: {words}"
        assert saved.read_bytes() == before
        assert sorted(p.name for p in saved.parent.iterdir()) == [saved.name]
        save_design(_edited(), saved)  # the fault gone, the same call succeeds
        assert load_design(saved) == _edited()

    def test_a_missing_folder(self, tmp_path: Path) -> None:
        target = tmp_path / "no such folder" / "x.pendulum.json"
        with pytest.raises(DesignError) as info:
            save_design(_edited(), target)
        assert info.value.field == "file" and "could not save" in info.value.reason
        assert list(tmp_path.iterdir()) == []

    def test_a_folder_in_the_way(self, tmp_path: Path) -> None:
        target = tmp_path / "taken.pendulum.json"
        target.mkdir()
        (target / "keep.txt").write_text("keep", encoding="utf-8")
        with pytest.raises(DesignError) as info:
            save_design(_edited(), target)
        assert info.value.field == "file" and "could not save" in info.value.reason
        assert (target / "keep.txt").read_text(encoding="utf-8") == "keep"
        assert sorted(p.name for p in tmp_path.iterdir()) == [target.name]

    def test_text_that_cannot_be_encoded_is_refused_on_reading(self, saved: Path) -> None:
        """A name holding a lone surrogate (``\\ud800`` is valid JSON) could never be written
        back as UTF-8, so reading refuses it, naming the field; the saved file is untouched."""
        before = saved.read_bytes()
        with pytest.raises(DesignError) as info:
            loads_design(EXAMPLE_TEXT.replace('"Workshop regulator"', '"odd \\ud800 name"'))
        assert info.value.field == "name" and "unpaired surrogate" in info.value.reason
        assert saved.read_bytes() == before
        assert sorted(p.name for p in saved.parent.iterdir()) == [saved.name]

    def test_a_successful_save_replaces_the_file_whole(self, saved: Path) -> None:
        save_design(_edited(), saved)
        assert load_design(saved) == _edited()
        assert json.loads(saved.read_text(encoding="utf-8"))["swing"]["amplitude_deg"] == 2.5
        assert sorted(p.name for p in saved.parent.iterdir()) == [saved.name]
        assert not list(Path(tempfile.gettempdir()).glob(f".{saved.name}.*.tmp"))
