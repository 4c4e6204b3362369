"""The document: exact undo/redo of immutable designs, merged step runs, dirty flag, files."""

from __future__ import annotations

from pathlib import Path

import pytest

from app.document.document import Document, blank_design
from core import DesignError, load_design, with_value


@pytest.fixture
def document(qtbot, example_copy: Path) -> Document:  # type: ignore[no-untyped-def]
    return Document(load_design(example_copy), example_copy)


class TestEditing:
    def test_commit_undo_redo_restore_designs_exactly(self, document: Document) -> None:
        first = document.design
        second = with_value(first, "parts[0].length_m", 1.2)
        third = with_value(second, "swing.amplitude_deg", 3.0)
        document.commit(second, "Change length", "parts[0].length_m")
        document.commit(third, "Change semi-arc", "swing.amplitude_deg")
        assert document.undo_stack.count() == 2
        document.undo_stack.undo()
        assert document.design == second
        document.undo_stack.undo()
        assert document.design == first
        document.undo_stack.redo()
        document.undo_stack.redo()
        assert document.design == third

    def test_step_runs_of_one_field_merge_into_one_undo_step(self, document: Document) -> None:
        original = document.design
        for length in (1.12, 1.13, 1.14):
            document.commit(with_value(document.design, "parts[0].length_m", length),
                            "Change length", "parts[0].length_m", mergeable=True)
        assert document.undo_stack.count() == 1
        assert document.design.parts[0].length_m == 1.14
        document.undo_stack.undo()
        assert document.design == original

    def test_typed_edits_are_separate_undo_steps(self, document: Document) -> None:
        for length in (1.12, 1.13):
            document.commit(with_value(document.design, "parts[0].length_m", length),
                            "Change length", "parts[0].length_m")
        assert document.undo_stack.count() == 2

    def test_preview_shows_a_design_without_touching_the_history(self, document: Document,
                                                                 qtbot) -> None:  # type: ignore[no-untyped-def]
        live = with_value(document.design, "parts[0].length_m", 1.15)
        with qtbot.waitSignal(document.designChanged) as signal:
            document.preview(live)
        assert signal.args == [live]
        assert document.undo_stack.count() == 0
        assert document.is_dirty
        document.revert_preview()
        assert document.design == document.committed_design
        assert not document.is_dirty


class TestFiles:
    def test_save_then_open_round_trip(self, document: Document, tmp_path: Path) -> None:
        edited = with_value(document.design, "swing.amplitude_deg", 2.5)
        document.commit(edited, "Change semi-arc", "swing.amplitude_deg")
        assert document.is_dirty
        target = tmp_path / "saved.pendulum.json"
        document.save(target)
        assert not document.is_dirty and document.path == target
        other = Document(blank_design())
        other.open(target)
        assert other.design == edited
        assert other.path == target and not other.is_dirty

    def test_failed_save_keeps_the_document_unsaved(self, document: Document,
                                                    tmp_path: Path) -> None:
        document.commit(with_value(document.design, "swing.amplitude_deg", 2.5), "x", "a")
        with pytest.raises(DesignError) as info:
            document.save(tmp_path / "no such folder" / "x.pendulum.json")
        assert info.value.field == "file"
        assert document.is_dirty

    def test_open_refuses_a_bad_file_and_keeps_the_design(self, document: Document,
                                                          tmp_path: Path) -> None:
        bad = tmp_path / "bad.pendulum.json"
        bad.write_text('{"format": "something else"}', encoding="utf-8")
        before = document.design
        with pytest.raises(DesignError) as info:
            document.open(bad)
        assert info.value.field == "format"
        assert document.design == before
