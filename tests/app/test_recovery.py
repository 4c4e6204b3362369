"""Autosave and recovery: unsaved edits survive a crash, and only a crash.

Every test has its own data folder (``PENDULINE_DATA_DIR`` → ``tmp_path``). A crash is made
for real once (a child process autosaves and dies with ``os._exit``, leaving its lock file
behind); elsewhere it is simulated in this process by releasing a session's lock without the
clean close, which is what the next start-up sees after a crash. The question asked at start-up
is answered by monkeypatching :meth:`MainWindow.ask_restore`.
"""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import time
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import pytest

from app.document import recovery
from app.document.document import Document
from app.document.recovery import (
    AUTOSAVE_DELAY_S,
    AUTOSAVE_INTERVAL_S,
    DATA_DIR_ENV,
    Autosaver,
    find_orphans,
    recovery_folder,
)
from app.window.main_window import MainWindow
from core import Design, load_design, with_value

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json"


@pytest.fixture
def data_dir(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> Path:
    folder = tmp_path / "data"
    monkeypatch.setenv(DATA_DIR_ENV, str(folder))
    return folder


@pytest.fixture
def folder(data_dir: Path) -> Path:
    return data_dir / "recovery"


def _edit(design: Design, arc: float = 2.5) -> Design:
    return with_value(design, "swing.amplitude_deg", arc)


def _files(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir()) if folder.exists() else []


class Asked:
    """Stands in for the start-up question: records the sessions offered, answers ``answer``."""

    def __init__(self, answer: bool) -> None:
        self.answer = answer
        self.offered: list[recovery.RecoveryEntry] = []

    def __call__(self, entry: recovery.RecoveryEntry) -> bool:
        self.offered.append(entry)
        return self.answer


@pytest.fixture
def make_window(qtbot, data_dir: Path, monkeypatch: pytest.MonkeyPatch):  # type: ignore[no-untyped-def]
    """Windows on a design, discard prompt bypassed, messages recorded in ``win.shown``."""
    made: list[MainWindow] = []

    def make(design: Design | None = None, path: Path | None = None,
             answer: bool | None = None) -> MainWindow:
        win = MainWindow(design if design is not None else load_design(EXAMPLE), path)
        qtbot.addWidget(win)
        monkeypatch.setattr(win, "confirm_discard", lambda: True)
        win.shown = []  # type: ignore[attr-defined]
        monkeypatch.setattr(win, "show_message",
                            lambda title, text: win.shown.append((title, text)))  # type: ignore[attr-defined]
        if answer is not None:
            monkeypatch.setattr(win, "ask_restore", Asked(answer))
        made.append(win)
        return win

    return make


@pytest.fixture
def crashed(folder: Path, qtbot) -> Iterator[Any]:  # type: ignore[no-untyped-def]
    """Make sessions as a crashed run leaves them: autosaved, lock no longer held."""
    kept: list[Document] = []

    def crash(design: Design, original: Path | None) -> Path:
        document = Document(load_design(EXAMPLE), original)
        saver = Autosaver(document, folder)
        document.commit(design, "Edit", "x")
        assert saver.autosave_now()
        design_path = saver.design_path()
        assert design_path is not None
        # The process "dies": nothing more is written or removed, and its lock is released
        # without the clean close (a stale lock reads the same to the next start-up).
        saver.timer.stop()
        document.dirtyChanged.disconnect(saver._on_dirty_changed)
        recovery._HELD.discard(os.path.abspath(str(saver.lock_path())))
        assert saver._lock is not None
        saver._lock.unlock()
        kept.append(document)
        return design_path

    yield crash


class TestWhere:
    def test_the_recovery_folder_follows_the_override(self, data_dir: Path) -> None:
        assert recovery_folder() == data_dir / "recovery"

    def test_tests_never_use_the_real_data_folder(
            self, private_data_folder: Path, tmp_path_factory: pytest.TempPathFactory) -> None:
        """The session-wide override (tests/app/conftest.py) points into pytest's temporary
        folder, so no window in any test writes to the user's data folder."""
        assert private_data_folder.is_relative_to(tmp_path_factory.getbasetemp())
        assert os.environ[DATA_DIR_ENV] == str(private_data_folder)
        assert recovery.data_folder() == private_data_folder


class TestAutosave:
    def test_default_interval_is_30_s(self, qtbot, folder: Path) -> None:  # type: ignore[no-untyped-def]
        saver = Autosaver(Document(load_design(EXAMPLE)), folder)
        assert AUTOSAVE_INTERVAL_S == 30.0 and saver.timer.interval() == 30_000
        assert not saver.timer.isActive()

    def test_the_timer_autosaves_a_dirty_document(self, qtbot, folder: Path,  # type: ignore[no-untyped-def]
                                                 example_copy: Path) -> None:
        document = Document(load_design(example_copy), example_copy)
        saver = Autosaver(document, folder, interval_s=0.05)
        edited = _edit(document.design)
        with qtbot.waitSignal(saver.saved, timeout=5000) as signal:
            document.commit(edited, "Change semi-arc", "swing.amplitude_deg")
            assert saver.timer.isActive()
        design_path = signal.args[0]
        assert design_path.parent == folder
        assert load_design(design_path) == edited  # a valid design file on its own
        info = json.loads(design_path.with_name(
            design_path.name.replace(".pendulum.json", ".recovery.json")).read_text("utf-8"))
        assert info["format"] == "penduline-recovery"
        assert info["original_path"] == str(example_copy)
        assert info["name"] == edited.name
        saver.close()

    def test_the_record_is_written_before_the_design(
            self, folder: Path, example_copy: Path, monkeypatch: pytest.MonkeyPatch) -> None:
        # A process killed between the two writes must not leave a design without its record
        # (the file it came from would be lost): the design file goes last.
        written: list[str] = []
        real = recovery.write_text_atomic

        def recorder(path: Path, text: str) -> None:
            written.append(Path(path).name)
            real(path, text)

        monkeypatch.setattr(recovery, "write_text_atomic", recorder)
        document = Document(load_design(example_copy), example_copy)
        saver = Autosaver(document, folder, interval_s=3600.0)
        document.commit(_edit(document.design), "Change semi-arc", "swing.amplitude_deg")
        assert saver.autosave_now()
        assert [name.split(".", 1)[1] for name in written] == ["recovery.json",
                                                              "pendulum.json"]
        saver.close()

    def test_an_edit_is_autosaved_a_moment_after_it_is_made(self, qtbot, folder: Path) -> None:  # type: ignore[no-untyped-def]
        document = Document(load_design(EXAMPLE))
        saver = Autosaver(document, folder, interval_s=3600.0, delay_s=0.2)
        assert AUTOSAVE_DELAY_S == 3.0 and Autosaver(document, folder).soon.interval() == 3000
        edited = _edit(document.design, 3.0)
        with qtbot.waitSignal(saver.saved, timeout=5000) as signal:
            document.commit(edited, "Change semi-arc", "swing.amplitude_deg")
        assert load_design(signal.args[0]) == edited  # not the 1 h interval: the short delay
        saver.close()

    @pytest.mark.slow
    def test_edits_in_quick_succession_are_written_once_after_the_last(
            self, qtbot, folder: Path) -> None:  # type: ignore[no-untyped-def]
        document = Document(load_design(EXAMPLE))
        saver = Autosaver(document, folder, interval_s=3600.0, delay_s=1.0)
        writes: list[Path] = []
        saver.saved.connect(writes.append)
        for arc in (2.6, 2.7, 2.8):
            document.preview(_edit(document.design, arc))  # a drag: live edits
            assert saver.soon.isActive() and saver.soon.remainingTime() > 500  # (re)started
        assert writes == []
        qtbot.waitUntil(lambda: len(writes) == 1, timeout=5000)
        qtbot.wait(200)
        assert len(writes) == 1 and load_design(writes[0]).swing.amplitude_deg == 2.8
        saver.close()

    def test_nothing_is_written_while_the_document_is_saved(self, qtbot, folder: Path) -> None:  # type: ignore[no-untyped-def]
        saver = Autosaver(Document(load_design(EXAMPLE)), folder, interval_s=0.05)
        assert not saver.autosave_now()
        assert not folder.exists()

    def test_later_edits_replace_the_autosave_and_unchanged_ones_are_not_rewritten(
            self, qtbot, folder: Path) -> None:  # type: ignore[no-untyped-def]
        document = Document(load_design(EXAMPLE))
        saver = Autosaver(document, folder)
        writes: list[Path] = []
        saver.saved.connect(writes.append)
        document.commit(_edit(document.design, 2.5), "a", "swing.amplitude_deg")
        assert saver.autosave_now() and saver.autosave_now()
        assert len(writes) == 1
        document.commit(_edit(document.design, 3.5), "b", "swing.amplitude_deg")
        assert saver.autosave_now()
        assert len(writes) == 2 and writes[0] == writes[1]
        assert load_design(writes[1]).swing.amplitude_deg == 3.5
        assert len([n for n in _files(folder) if n.endswith(".pendulum.json")]) == 1
        saver.close()

    def test_save_removes_the_autosave(self, qtbot, folder: Path, example_copy: Path) -> None:  # type: ignore[no-untyped-def]
        document = Document(load_design(example_copy), example_copy)
        saver = Autosaver(document, folder)
        document.commit(_edit(document.design), "a", "x")
        assert saver.autosave_now()
        assert len(_files(folder)) == 3  # design, record, lock
        document.save()
        assert [n for n in _files(folder) if not n.endswith(".lock")] == []
        assert not saver.timer.isActive()
        saver.close()
        assert _files(folder) == []

    def test_undo_back_to_the_saved_design_removes_the_autosave(self, qtbot,  # type: ignore[no-untyped-def]
                                                                folder: Path) -> None:
        document = Document(load_design(EXAMPLE))
        saver = Autosaver(document, folder)
        document.commit(_edit(document.design), "a", "x")
        assert saver.autosave_now()
        document.undo_stack.undo()
        assert not document.is_dirty
        assert [n for n in _files(folder) if not n.endswith(".lock")] == []
        saver.close()

    def test_a_failing_autosave_says_why_and_keeps_the_edits(
            self, qtbot, data_dir: Path, make_window) -> None:  # type: ignore[no-untyped-def]
        data_dir.parent.mkdir(parents=True, exist_ok=True)
        data_dir.write_text("a file where the data folder should be", encoding="utf-8")
        win = make_window()
        win.document.commit(_edit(win.document.design), "a", "x")
        assert win.autosaver is not None
        with qtbot.waitSignal(win.autosaver.failed) as signal:
            assert not win.autosaver.autosave_now()
        assert signal.args[0].startswith("Autosave failed: cannot write to ")
        assert win.statusBar().currentMessage() == signal.args[0]
        assert win.document.is_dirty and win.document.design.swing.amplitude_deg == 2.5
        data_dir.unlink()  # the folder can be made again: the next autosave works
        assert win.autosaver.autosave_now()
        assert win.autosaver.last_error == ""

    def test_the_screenshot_window_does_not_autosave(self, qtbot) -> None:  # type: ignore[no-untyped-def]
        win = MainWindow(load_design(EXAMPLE), None, remember_layout=False)
        qtbot.addWidget(win)
        assert win.autosaver is None
        assert not win.offer_recovery()
        win.document.undo_stack.setClean()


class TestCleanExit:
    def test_closing_removes_the_session(self, make_window, folder: Path) -> None:  # type: ignore[no-untyped-def]
        win = make_window()
        win.document.commit(_edit(win.document.design), "a", "x")
        assert win.autosaver.autosave_now()
        assert len(_files(folder)) == 3
        assert win.close()  # the person chose to discard the edits
        assert _files(folder) == []

    def test_discarding_for_a_new_design_removes_the_autosave(self, make_window,  # type: ignore[no-untyped-def]
                                                              folder: Path) -> None:
        win = make_window()
        win.document.commit(_edit(win.document.design), "a", "x")
        assert win.autosaver.autosave_now()
        assert win.new_document()
        assert [n for n in _files(folder) if not n.endswith(".lock")] == []

    def test_a_running_session_is_not_offered_to_another_window(self, make_window) -> None:  # type: ignore[no-untyped-def]
        first = make_window()
        first.document.commit(_edit(first.document.design), "a", "x")
        assert first.autosaver.autosave_now()
        second = make_window(answer=True)
        assert not second.offer_recovery()
        assert second.ask_restore.offered == []
        assert first.autosaver.design_path().exists()


class TestRecovery:
    @pytest.mark.slow
    def test_restore_after_a_real_crash(self, make_window, folder: Path,  # type: ignore[no-untyped-def]
                                        example_copy: Path, data_dir: Path) -> None:
        code = (
            "import os, sys\n"
            "from PySide6.QtCore import QCoreApplication\n"
            "from app.document.document import Document\n"
            "from app.document.recovery import Autosaver\n"
            "from core import load_design, with_value\n"
            "app = QCoreApplication([])\n"
            "path = sys.argv[1]\n"
            "doc = Document(load_design(path), path)\n"
            "saver = Autosaver(doc)\n"
            "doc.commit(with_value(doc.design, 'parts[0].length_m', 1.25), 'Edit', 'x')\n"
            "assert saver.autosave_now()\n"
            "os._exit(3)  # a crash: no clean close, the lock file stays behind\n")
        done = subprocess.run([sys.executable, "-c", code, str(example_copy)], cwd=ROOT,
                              env={**os.environ, DATA_DIR_ENV: str(data_dir)},
                              capture_output=True, text=True, timeout=120)
        assert done.returncode == 3, done.stderr
        names = _files(folder)
        assert len(names) == 3 and any(n.endswith(".lock") for n in names)
        on_disk = example_copy.read_bytes()
        win = make_window(load_design(EXAMPLE), example_copy, answer=True)
        assert win.offer_recovery()
        [entry] = win.ask_restore.offered
        assert entry.original_path == example_copy and entry.info_problem == ""
        doc = win.document
        assert doc.design == with_value(load_design(EXAMPLE), "parts[0].length_m", 1.25)
        assert doc.path == example_copy and doc.is_dirty and doc.undo_stack.count() == 0
        assert win.isWindowModified()
        assert example_copy.read_bytes() == on_disk  # restoring does not write the file
        assert entry.design_path.name not in _files(folder)  # the old session is gone ...
        assert load_design(win.autosaver.design_path()) == doc.design  # ... safe in this one
        win.compute_now()
        assert win.result.design == doc.design
        assert win.save()
        assert load_design(example_copy) == doc.design and not doc.is_dirty
        assert [n for n in _files(folder) if not n.endswith(".lock")] == []

    @pytest.mark.slow
    def test_a_window_killed_seconds_after_an_edit_gives_the_edit_back(
            self, make_window, folder: Path, example_copy: Path, data_dir: Path) -> None:  # type: ignore[no-untyped-def]
        code = (
            "import sys\n"
            "from PySide6.QtCore import QTimer\n"
            "from PySide6.QtWidgets import QApplication\n"
            "from app.window.main_window import MainWindow\n"
            "from core import load_design, with_value\n"
            "app = QApplication([])\n"
            "path = sys.argv[1]\n"
            "win = MainWindow(load_design(path), path, remember_layout=False, autosave=True)\n"
            "win.autosaver.timer.setInterval(3_600_000)  # only the short delay may write\n"
            "win.show()\n"
            "def edit():\n"
            "    win.document.commit(with_value(win.document.design, 'parts[0].length_m',\n"
            "                                   1.25), 'Edit', 'x')\n"
            "    print('edited', flush=True)\n"
            "QTimer.singleShot(300, edit)\n"
            "app.exec()\n")
        child = subprocess.Popen([sys.executable, "-c", code, str(example_copy)], cwd=ROOT,
                                 env={**os.environ, DATA_DIR_ENV: str(data_dir),
                                      "QT_QPA_PLATFORM": "offscreen"},
                                 stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
        try:
            assert child.stdout is not None
            assert child.stdout.readline().strip() == "edited", child.stderr
            edited = with_value(load_design(EXAMPLE), "parts[0].length_m", 1.25)

            def autosaved() -> bool:
                for p in folder.glob("*.pendulum.json") if folder.exists() else []:
                    try:
                        return load_design(p) == edited
                    except ValueError:  # not yet whole: the writer renames it into place
                        return False
                return False

            deadline = time.monotonic() + 60.0
            while not autosaved() and time.monotonic() < deadline and child.poll() is None:
                time.sleep(0.1)
            assert autosaved(), "the edit was not autosaved"
        finally:
            os.kill(child.pid, signal.SIGKILL)  # the window's process dies mid-session
            child.wait(timeout=60)
        assert child.returncode == -signal.SIGKILL
        on_disk = example_copy.read_bytes()
        win = make_window(load_design(EXAMPLE), example_copy, answer=True)
        assert win.offer_recovery()
        [entry] = win.ask_restore.offered
        assert entry.original_path == example_copy
        assert win.document.design == edited and win.document.is_dirty
        assert example_copy.read_bytes() == on_disk

    def test_restore_of_a_design_never_saved(self, make_window, crashed,  # type: ignore[no-untyped-def]
                                             folder: Path) -> None:
        edited = _edit(load_design(EXAMPLE), 4.0)
        crashed(edited, None)
        win = make_window(answer=True)
        assert win.offer_recovery()
        assert win.document.design == edited
        assert win.document.path is None and win.document.is_dirty
        assert win.windowTitle().startswith("Untitled[*]")

    def test_declining_deletes_the_autosave(self, make_window, crashed,  # type: ignore[no-untyped-def]
                                            folder: Path) -> None:
        crashed(_edit(load_design(EXAMPLE)), EXAMPLE)
        win = make_window(answer=False)
        before = win.document.design
        assert not win.offer_recovery()
        assert len(win.ask_restore.offered) == 1
        assert _files(folder) == []
        assert win.document.design == before and not win.document.is_dirty
        assert not win.offer_recovery()  # nothing is offered twice
        assert len(win.ask_restore.offered) == 1

    def test_newest_first_and_one_restored_per_start(self, make_window, crashed,  # type: ignore[no-untyped-def]
                                                     folder: Path) -> None:
        older = crashed(_edit(load_design(EXAMPLE), 3.0), None)
        newer = crashed(_edit(load_design(EXAMPLE), 5.0), None)
        os.utime(older, (1_000_000_000, 1_000_000_000))
        assert [e.design_path for e in find_orphans(folder)] == [newer, older]
        win = make_window(answer=True)
        assert win.offer_recovery()
        assert win.document.design.swing.amplitude_deg == 5.0
        assert [e.design_path for e in win.ask_restore.offered] == [newer]
        assert older.exists()  # kept for the next start
        assert [e.design_path for e in find_orphans(folder)] == [older]

    def test_a_corrupt_autosave_is_kept_aside_and_start_up_goes_on(
            self, make_window, crashed, folder: Path) -> None:  # type: ignore[no-untyped-def]
        design_path = crashed(_edit(load_design(EXAMPLE)), EXAMPLE)
        design_path.write_bytes(b'{"format": "penduline-design", "version": 1, "na')
        good = crashed(_edit(load_design(EXAMPLE), 6.0), None)
        win = make_window(answer=True)
        assert win.offer_recovery()  # the good one is still restored
        assert win.document.design.swing.amplitude_deg == 6.0
        assert [e.design_path for e in win.ask_restore.offered] == [good]
        [(title, text)] = win.shown
        bad = design_path.with_name(design_path.name + ".bad")
        assert title == "Cannot recover design"
        assert "file: is not valid JSON" in text and str(bad) in text
        assert bad.read_bytes() == b'{"format": "penduline-design", "version": 1, "na'
        assert bad.with_name(bad.name.replace(".pendulum.json", ".recovery.json")).exists()
        assert not design_path.exists()
        assert find_orphans(folder) == []  # a .bad file is never offered again

    def test_a_corrupt_record_still_offers_the_design(self, make_window, crashed,  # type: ignore[no-untyped-def]
                                                      folder: Path) -> None:
        edited = _edit(load_design(EXAMPLE), 7.0)
        design_path = crashed(edited, EXAMPLE)
        info = design_path.with_name(design_path.name.replace(".pendulum.json",
                                                              ".recovery.json"))
        info.write_bytes(b"\xff\xfe garbage")
        win = make_window(answer=True)
        assert win.offer_recovery()
        [entry] = win.ask_restore.offered
        assert entry.original_path is None
        assert entry.info_problem.startswith("its record cannot be read")
        assert win.document.design == edited and win.document.path is None

    def test_a_garbage_design_file_in_the_folder_never_crashes_start_up(
            self, make_window, folder: Path) -> None:  # type: ignore[no-untyped-def]
        folder.mkdir(parents=True)
        (folder / "stray.pendulum.json").write_bytes(b"\x00\x01\x02")
        (folder / "nested.pendulum.json").write_bytes(b"[" * 100_000)
        win = make_window(answer=True)
        before = win.document.design
        assert not win.offer_recovery()
        assert len(win.shown) == 2 and win.ask_restore.offered == []
        assert sorted(_files(folder)) == ["nested.pendulum.json.bad", "stray.pendulum.json.bad"]
        assert win.document.design == before

    def test_the_question_names_the_file_and_can_be_answered(
            self, make_window, crashed, monkeypatch: pytest.MonkeyPatch) -> None:  # type: ignore[no-untyped-def]
        from PySide6.QtWidgets import QMessageBox

        crashed(_edit(load_design(EXAMPLE)), EXAMPLE)
        win = make_window()
        asked: list[str] = []

        def question(_parent: Any, title: str, text: str, *_args: Any) -> Any:
            asked.append(f"{title}|{text}")
            return QMessageBox.StandardButton.Discard

        monkeypatch.setattr(QMessageBox, "question", question)
        assert not win.offer_recovery()
        [text] = asked
        assert text.startswith("Restore unsaved edits?|Penduline did not close normally.")
        assert f"from {EXAMPLE} (Workshop regulator)" in text
