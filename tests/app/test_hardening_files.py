"""Broken files and failing saves in the window: a message naming the field, the open document
untouched (design, file, unsaved state, undo history), the previous file on disk byte for byte.

The window reports problems through :meth:`MainWindow.show_message`; these tests record its
calls (one test lets it show its real message box). Faults the test machine cannot produce for
real (a folder refusing writes when the tests run as root, a full disk, a failing rename, an
unreadable file) are simulated by monkeypatching the call the core makes.
"""

from __future__ import annotations

import errno
import os
import random
import stat
from collections.abc import Callable
from pathlib import Path
from typing import Any

import pytest
from PySide6.QtCore import QMimeData, QPointF, Qt, QUrl
from PySide6.QtGui import QDropEvent
from PySide6.QtWidgets import QMessageBox

import core.atomic_write as atomic_write
import core.fileformat as fileformat
from app.cli import main
from app.document.document import read_design_file
from app.window.main_window import MainWindow
from core import DesignError, load_design, with_value
from core.fileformat import MAX_FILE_BYTES

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json"
EXAMPLE_TEXT = EXAMPLE.read_text(encoding="utf-8")


def _garbage() -> bytes:
    rng = random.Random(7)
    return b"\xff\xfe" + bytes(rng.randrange(256) for _ in range(2048))


# name → (file bytes, field, words the message must contain)
BROKEN_BYTES: dict[str, tuple[bytes, str, str]] = {
    "empty": (b"", "file", "is empty"),
    "truncated JSON": (EXAMPLE_TEXT[:300].encode(), "file", "is not valid JSON"),
    "binary garbage": (_garbage(), "file", "is not UTF-8 text"),
    "UTF-16": (EXAMPLE_TEXT.encode("utf-16"), "file", "is not UTF-8 text"),
    "Latin-1": (EXAMPLE_TEXT.replace("Workshop", "Wärkstatt").encode("latin-1"), "file",
                "is not UTF-8 text"),
    "another format": (EXAMPLE_TEXT.replace('"penduline-design"', '"other"').encode(),
                       "format", "is not a Penduline design"),
    "newer version": (EXAMPLE_TEXT.replace('"version": 2', '"version": 7').encode(),
                      "version", "version 7 is newer"),
    "100 kB of nested arrays": (b"[" * 50_000 + b"]" * 50_000, "file", "nested too deeply"),
    "100 kB of nested objects": (b'{"a":' * 16_666 + b"1" + b"}" * 16_666, "file",
                                 "nested too deeply"),
    "a value out of range": (EXAMPLE_TEXT.replace('"amplitude_deg": 1.6',
                                                  '"amplitude_deg": 200').encode(),
                             "swing.amplitude_deg", "out of range"),
}


def _huge(tmp_path: Path) -> Path:
    path = tmp_path / "huge.pendulum.json"
    with open(path, "wb") as fh:
        fh.truncate(MAX_FILE_BYTES + 1)  # sparse
    return path


def _folder(tmp_path: Path) -> Path:
    path = tmp_path / "folder.pendulum.json"
    path.mkdir()
    return path


def _fifo(tmp_path: Path) -> Path:
    path = tmp_path / "pipe.pendulum.json"
    os.mkfifo(path)  # reading it would wait for a writer forever
    return path


BROKEN_PATHS: dict[str, tuple[Callable[[Path], Path], str, str]] = {
    "huge file": (_huge, "file", f"a design file is at most {MAX_FILE_BYTES} bytes"),
    "a folder": (_folder, "file", "is a folder, not a design file"),
    "a missing file": (lambda tmp: tmp / "missing.pendulum.json", "file", "does not exist"),
    "a named pipe": (_fifo, "file", "is not a regular file"),
    "a device": (lambda tmp: Path("/dev/zero"), "file", "is not a regular file"),
}


class Messages:
    """Records what the window would tell the person."""

    def __init__(self) -> None:
        self.shown: list[tuple[str, str]] = []

    def __call__(self, title: str, text: str) -> None:
        self.shown.append((title, text))

    def only(self) -> tuple[str, str]:
        assert len(self.shown) == 1, self.shown
        return self.shown[0]


@pytest.fixture
def messages(window: MainWindow, monkeypatch: pytest.MonkeyPatch) -> Messages:
    recorder = Messages()
    monkeypatch.setattr(window, "show_message", recorder)
    return recorder


@pytest.fixture
def edited(window: MainWindow) -> MainWindow:
    """The window with one unsaved edit (dirty, one undo step)."""
    design = with_value(window.document.design, "swing.amplitude_deg", 2.25)
    window.document.commit(design, "Change semi-arc", "swing.amplitude_deg")
    window.compute_now()
    assert window.document.is_dirty and window.document.undo_stack.count() == 1
    return window


def _state(window: MainWindow) -> tuple[Any, ...]:
    doc = window.document
    return (doc.design, doc.committed_design, doc.path, doc.is_dirty, doc.undo_stack.count(),
            doc.undo_stack.index(), window.windowTitle(), window.isWindowModified(),
            window.result, window.readout.value_text("period_s"))


def _deny_reading(monkeypatch: pytest.MonkeyPatch, path: Path) -> None:
    real = Path.read_bytes

    def read_bytes(self: Path) -> bytes:
        if self == path:
            raise PermissionError(errno.EACCES, os.strerror(errno.EACCES), str(self))
        return real(self)

    monkeypatch.setattr(Path, "read_bytes", read_bytes)


class TestOpeningBrokenFiles:
    @pytest.fixture
    def asked(self, edited: MainWindow, monkeypatch: pytest.MonkeyPatch) -> list[int]:
        calls: list[int] = []
        monkeypatch.setattr(edited, "confirm_discard", lambda: calls.append(1) or True)
        return calls

    def _check_refused(self, window: MainWindow, messages: Messages, path: Path, field: str,
                       words: str, asked: list[int]) -> None:
        before = _state(window)
        assert not window.open_file(path)
        title, text = messages.only()
        assert title == "Cannot open design"
        assert text.startswith(f"{path.name}: {field}: ") and words in text
        assert _state(window) == before
        assert asked == []  # refused before asking about the unsaved edit

    @pytest.mark.parametrize("name", list(BROKEN_BYTES))
    def test_broken_contents(self, edited: MainWindow, messages: Messages, asked: list[int],
                             tmp_path: Path, name: str) -> None:
        data, field, words = BROKEN_BYTES[name]
        path = tmp_path / "broken.pendulum.json"
        path.write_bytes(data)
        self._check_refused(edited, messages, path, field, words, asked)
        assert path.read_bytes() == data

    @pytest.mark.parametrize("name", list(BROKEN_PATHS))
    def test_broken_paths(self, edited: MainWindow, messages: Messages, asked: list[int],
                          tmp_path: Path, name: str) -> None:
        make, field, words = BROKEN_PATHS[name]
        self._check_refused(edited, messages, make(tmp_path), field, words, asked)

    def test_an_unreadable_file(self, edited: MainWindow, messages: Messages,
                                asked: list[int], tmp_path: Path,
                                monkeypatch: pytest.MonkeyPatch) -> None:
        path = tmp_path / "locked.pendulum.json"
        path.write_text(EXAMPLE_TEXT, encoding="utf-8")
        _deny_reading(monkeypatch, path)
        self._check_refused(edited, messages, path, "file", "cannot be read (Permission denied)",
                            asked)

    def test_dropping_a_broken_file(self, edited: MainWindow, messages: Messages,
                                    tmp_path: Path) -> None:
        path = tmp_path / "dropped.pendulum.json"
        path.write_bytes(BROKEN_BYTES["truncated JSON"][0])
        before = _state(edited)
        mime = QMimeData()
        mime.setUrls([QUrl.fromLocalFile(str(path))])
        edited.dropEvent(QDropEvent(QPointF(5, 5), Qt.DropAction.CopyAction, mime,
                                    Qt.MouseButton.LeftButton, Qt.KeyboardModifier.NoModifier))
        assert "is not valid JSON" in messages.only()[1]
        assert _state(edited) == before

    def test_the_message_box_is_shown_and_names_the_field(self, edited: MainWindow,
                                                          tmp_path: Path) -> None:
        path = tmp_path / "v9.pendulum.json"
        path.write_text(EXAMPLE_TEXT.replace('"version": 2', '"version": 9'), encoding="utf-8")
        assert not edited.open_file(path)
        boxes = [b for b in edited.findChildren(QMessageBox) if b.isVisible()]
        assert len(boxes) == 1
        assert boxes[0].windowTitle() == "Cannot open design"
        assert boxes[0].text() == ("v9.pendulum.json: version: version 9 is newer than this "
                                   "Penduline reads (up to 2); update Penduline")
        assert edited.last_message == boxes[0].text()
        boxes[0].close()

    def test_a_good_file_still_opens_after_the_refusals(self, edited: MainWindow,
                                                        messages: Messages,
                                                        tmp_path: Path) -> None:
        for name in BROKEN_BYTES:
            path = tmp_path / f"{len(messages.shown)}.pendulum.json"
            path.write_bytes(BROKEN_BYTES[name][0])
            assert not edited.open_file(path)
        assert len(messages.shown) == len(BROKEN_BYTES)
        assert edited.document.undo_stack.count() == 1 and edited.document.is_dirty
        assert edited.open_file(EXAMPLE)
        assert edited.document.design == load_design(EXAMPLE)
        assert edited.document.path == EXAMPLE and not edited.document.is_dirty
        assert edited.document.undo_stack.count() == 0


class TestReadDesignFile:
    def test_refuses_a_device_without_reading_it(self) -> None:
        with pytest.raises(DesignError) as info:
            read_design_file("/dev/zero")
        assert (info.value.field, info.value.reason) == ("file", "zero is not a regular file")

    def test_reads_a_regular_file(self, example_copy: Path) -> None:
        assert stat.S_ISREG(example_copy.stat().st_mode)
        assert read_design_file(example_copy) == load_design(EXAMPLE)


class TestWindowCommandOnBrokenFiles:
    """`penduline FILE`: a bad file is refused before any window appears (exit 2, one line)."""

    @pytest.mark.parametrize("name", ["binary garbage", "newer version",
                                      "100 kB of nested arrays"])
    def test_exit_2_with_one_line(self, tmp_path: Path, capsys: pytest.CaptureFixture[str],
                                  name: str) -> None:
        data, field, words = BROKEN_BYTES[name]
        path = tmp_path / "broken.pendulum.json"
        path.write_bytes(data)
        code = main([str(path)])
        out, err = capsys.readouterr()
        assert code == 2 and out == ""
        lines = err.splitlines()
        assert len(lines) == 1 and lines[0].startswith(f"penduline: {field}: ")
        assert words in lines[0] and "Traceback" not in err


# ================================================================================== saving

def _oserror(code: int) -> OSError:
    return OSError(code, os.strerror(code))


def _raise(code: int) -> Callable[..., Any]:
    def fail(*_args: Any, **_kwargs: Any) -> Any:
        raise _oserror(code)
    return fail


def _disk_full(monkeypatch: pytest.MonkeyPatch) -> None:
    real_fdopen = os.fdopen

    class Full:
        def __init__(self, fh: Any) -> None:
            self._fh = fh

        def write(self, text: str) -> int:
            self._fh.write(text[:64])
            self._fh.flush()
            raise _oserror(errno.ENOSPC)

        def __getattr__(self, name: str) -> Any:
            return getattr(self._fh, name)

        def __enter__(self) -> Full:
            return self

        def __exit__(self, *exc: object) -> None:
            self._fh.close()

    monkeypatch.setattr(fileformat.os, "fdopen", lambda fd, *a, **k: Full(real_fdopen(fd, *a, **k)))


SAVE_FAULTS: dict[str, tuple[Callable[[pytest.MonkeyPatch], None], int]] = {
    "read-only folder": (lambda mp: mp.setattr(atomic_write, "_open_temp",
                                               _raise(errno.EACCES)), errno.EACCES),
    "disk full": (_disk_full, errno.ENOSPC),
    "rename fails": (lambda mp: mp.setattr(fileformat.os, "replace", _raise(errno.EXDEV)),
                     errno.EXDEV),
}


class TestSaveFaults:
    @pytest.mark.parametrize("name", list(SAVE_FAULTS))
    def test_save_keeps_the_old_file_and_stays_unsaved(
            self, edited: MainWindow, messages: Messages, monkeypatch: pytest.MonkeyPatch,
            name: str) -> None:
        path = edited.document.path
        assert path is not None
        before_bytes = path.read_bytes()
        before = _state(edited)
        inject, code = SAVE_FAULTS[name]
        with monkeypatch.context() as fault:
            inject(fault)
            assert not edited.save()
        title, text = messages.only()
        assert title == "Cannot save design"
        assert text == f"could not save {path}: {os.strerror(code)}"
        assert path.read_bytes() == before_bytes
        assert sorted(p.name for p in path.parent.iterdir()) == [path.name]
        assert _state(edited) == before
        assert edited.windowTitle().startswith(f"{path.name}[*]") and edited.isWindowModified()
        assert edited.save()  # the fault gone, Save works and the document is saved
        assert not edited.document.is_dirty
        assert load_design(path) == edited.document.design

    @pytest.mark.parametrize("name", list(SAVE_FAULTS))
    def test_save_as_keeps_the_old_name_and_writes_nothing(
            self, edited: MainWindow, messages: Messages, monkeypatch: pytest.MonkeyPatch,
            tmp_path: Path, name: str) -> None:
        other = tmp_path / "elsewhere"
        other.mkdir()
        target = other / "new.pendulum.json"
        before = _state(edited)
        inject, code = SAVE_FAULTS[name]
        with monkeypatch.context() as fault:
            inject(fault)
            assert not edited.save_as(target)
        assert messages.only()[1] == f"could not save {target}: {os.strerror(code)}"
        assert list(other.iterdir()) == []
        assert _state(edited) == before  # still the old file name, still unsaved

    def test_save_over_an_existing_file_that_fails_keeps_it(
            self, edited: MainWindow, messages: Messages, monkeypatch: pytest.MonkeyPatch,
            tmp_path: Path) -> None:
        """Save As onto another design file: the file there survives a failed rename."""
        target = tmp_path / "other.pendulum.json"
        target.write_text(EXAMPLE_TEXT.replace("Workshop regulator", "Keep me"),
                          encoding="utf-8")
        before = target.read_bytes()
        with monkeypatch.context() as fault:
            fault.setattr(fileformat.os, "replace", _raise(errno.EACCES))
            assert not edited.save_as(target)
        assert target.read_bytes() == before
        assert sorted(p.name for p in tmp_path.iterdir()) == sorted(
            [target.name, edited.document.path.name])
        assert edited.document.path != target and edited.document.is_dirty
        assert "Permission denied" in messages.only()[1]
