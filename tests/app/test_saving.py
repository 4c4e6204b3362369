"""Saves that respect the file: the window asks before overwriting a file another program
changed, offers Save As for a read-only file, writes through a symbolic link, keeps the file's
mode, and says any other refusal while the document stays unsaved. Also ``solve --write``
refusing to overwrite a changed file unless ``--force``."""

from __future__ import annotations

import os
import stat
from pathlib import Path
from typing import Any

import pytest
from PySide6.QtWidgets import QMessageBox

from app import cli
from app.document.document import Document
from app.window.main_window import MainWindow
from core import load_design, save_design, with_value
from core.atomic_write import FileChangedError, ReadOnlyFileError, file_stamp

ARC = "swing.amplitude_deg"


class Answer:
    """Stands in for ``QMessageBox.exec``: clicks the button labelled ``text`` and records
    the questions asked."""

    def __init__(self, text: str) -> None:
        self.text = text
        self.asked: list[str] = []

    @property
    def exec(self) -> Any:
        """The stand-in, as a plain function (it becomes the box's method)."""
        return lambda box: self(box)

    def __call__(self, box: QMessageBox) -> int:
        self.asked.append(box.text())
        [button] = [b for b in box.buttons() if b.text().replace("&", "") == self.text]
        button.click()
        return 0


def edited(window: MainWindow, arc: float = 3.5) -> Any:
    design = with_value(window.document.design, ARC, arc)
    window.document.commit(design, "arc", ARC)
    return design


def changed_elsewhere(path: Path) -> bytes:
    """Another program rewrites the file (a different, valid design)."""
    save_design(with_value(load_design(path), ARC, 7.0), path)
    return path.read_bytes()


@pytest.fixture
def messages(window: MainWindow, monkeypatch: pytest.MonkeyPatch) -> list[str]:
    said: list[str] = []
    monkeypatch.setattr(window, "show_message", lambda title, text: said.append(text))
    return said


def test_a_changed_file_is_asked_about_and_cancel_keeps_it(
        window: MainWindow, example_copy: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    edited(window)
    theirs = changed_elsewhere(example_copy)
    answer = Answer("Cancel")
    monkeypatch.setattr(QMessageBox, "exec", answer.exec)
    assert not window.save()
    assert len(answer.asked) == 1 and example_copy.name in answer.asked[0]
    assert "changed by another program" in answer.asked[0]
    assert example_copy.read_bytes() == theirs and window.document.is_dirty


def test_overwrite_replaces_the_changed_file_and_the_next_save_does_not_ask(
        window: MainWindow, example_copy: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    ours = edited(window)
    changed_elsewhere(example_copy)
    answer = Answer("Overwrite")
    monkeypatch.setattr(QMessageBox, "exec", answer.exec)
    assert window.save()
    assert load_design(example_copy) == ours and not window.document.is_dirty
    again = edited(window, 4.0)
    assert window.save()  # the stamp of our own save: no question
    assert len(answer.asked) == 1 and load_design(example_copy) == again


def test_save_as_keeps_the_changed_file(window: MainWindow, example_copy: Path,
                                        tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    ours = edited(window)
    theirs = changed_elsewhere(example_copy)
    monkeypatch.setattr(QMessageBox, "exec", Answer("Save As…").exec)
    other = tmp_path / "mine.pendulum.json"
    monkeypatch.setattr(window, "ask_save_path", lambda: other)
    assert window.save()
    assert example_copy.read_bytes() == theirs
    assert load_design(other) == ours and window.document.path == other


def test_a_read_only_file_offers_save_as(window: MainWindow, example_copy: Path,
                                         tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    ours = edited(window)
    before = example_copy.read_bytes()
    example_copy.chmod(0o444)
    answer = Answer("Save As…")
    monkeypatch.setattr(QMessageBox, "exec", answer.exec)
    other = tmp_path / "copy.pendulum.json"
    monkeypatch.setattr(window, "ask_save_path", lambda: other)
    assert window.save()
    assert len(answer.asked) == 1 and "read-only" in answer.asked[0]
    assert example_copy.read_bytes() == before
    assert stat.S_IMODE(example_copy.stat().st_mode) == 0o444
    assert load_design(other) == ours and window.document.path == other


def test_a_read_only_file_and_cancel_stays_unsaved(
        window: MainWindow, example_copy: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    edited(window)
    before = example_copy.read_bytes()
    example_copy.chmod(0o444)
    monkeypatch.setattr(QMessageBox, "exec", Answer("Cancel").exec)
    assert not window.save()
    assert example_copy.read_bytes() == before and window.document.is_dirty


def test_a_symbolic_link_is_saved_through(qtbot, tmp_path: Path, example_copy: Path,  # type: ignore[no-untyped-def]
                                          messages: list[str]) -> None:
    link = tmp_path / "link.pendulum.json"
    link.symlink_to(example_copy)
    window = MainWindow(load_design(link), link, remember_layout=False, autosave=False)
    qtbot.addWidget(window)
    ours = edited(window)
    assert window.save()
    assert link.is_symlink() and os.readlink(link) == str(example_copy)
    assert load_design(example_copy) == ours
    window.document.undo_stack.setClean()


def test_the_mode_of_the_file_is_kept(window: MainWindow, example_copy: Path) -> None:
    example_copy.chmod(0o664)
    edited(window)
    assert window.save()
    assert stat.S_IMODE(example_copy.stat().st_mode) == 0o664


def test_any_other_refusal_is_said_and_the_document_stays_unsaved(
        window: MainWindow, tmp_path: Path, messages: list[str]) -> None:
    edited(window)
    assert not window.save_as(tmp_path / "no such folder" / "x.pendulum.json")
    assert len(messages) == 1 and "could not save" in messages[0]
    assert window.document.is_dirty


def test_the_document_stamps_its_file_when_opened_and_saved(example_copy: Path) -> None:
    document = Document(load_design(example_copy))
    document.open(example_copy)
    assert document.file_stamp == file_stamp(example_copy)
    document.commit(with_value(document.design, ARC, 3.0), "arc", ARC)
    changed_elsewhere(example_copy)
    with pytest.raises(FileChangedError):
        document.save()
    assert document.is_dirty
    document.save(force=True)
    assert document.file_stamp == file_stamp(example_copy) and not document.is_dirty
    example_copy.chmod(0o444)
    document.commit(with_value(document.design, ARC, 3.2), "arc", ARC)
    with pytest.raises(ReadOnlyFileError):
        document.save()


class TestSolveWrite:
    ARGS = ["--vary", "parts[0].length_m", "--target-period", "1.5"]

    def _solve_changing(self, out: Path, monkeypatch: pytest.MonkeyPatch) -> bytes:
        """Make the solve itself stand in for another program that rewrites ``out``."""
        import core.solve

        real = core.solve.solve
        theirs = b'{"written": "by another program"}\n'

        def solve_and_change(*args: Any, **kwargs: Any) -> Any:
            out.write_bytes(theirs)
            return real(*args, **kwargs)

        monkeypatch.setattr(core.solve, "solve", solve_and_change)
        return theirs

    def test_a_changed_output_is_refused(self, example_copy: Path, tmp_path: Path,
                                         monkeypatch: pytest.MonkeyPatch,
                                         capsys: pytest.CaptureFixture[str]) -> None:
        out = tmp_path / "out.pendulum.json"
        out.write_text("{}\n", encoding="utf-8")
        theirs = self._solve_changing(out, monkeypatch)
        code = cli.main(["solve", str(example_copy), *self.ARGS, "--write", str(out)])
        assert code == 2 and out.read_bytes() == theirs
        assert "--force" in capsys.readouterr().err

    def test_force_overwrites_it(self, example_copy: Path, tmp_path: Path,
                                 monkeypatch: pytest.MonkeyPatch) -> None:
        out = tmp_path / "out.pendulum.json"
        out.write_text("{}\n", encoding="utf-8")
        self._solve_changing(out, monkeypatch)
        code = cli.main(["solve", str(example_copy), *self.ARGS, "--write", str(out),
                         "--force"])
        assert code == 0
        assert load_design(out).parts[0].length_m != load_design(example_copy).parts[0].length_m

    def test_an_unchanged_output_is_written(self, example_copy: Path, tmp_path: Path) -> None:
        out = tmp_path / "out.pendulum.json"
        out.write_text("{}\n", encoding="utf-8")
        assert cli.main(["solve", str(example_copy), *self.ARGS, "--write", str(out)]) == 0
        assert load_design(out).name == load_design(example_copy).name

    def test_the_help_names_force(self, capsys: pytest.CaptureFixture[str]) -> None:
        with pytest.raises(SystemExit):
            cli.main(["solve", "--help"])
        assert "--force" in capsys.readouterr().out
