"""Wiring of the workbench window: form → document → core → plots and readout, and back.

These tests check wiring, not physics: expected figures come from ``core.analyse`` itself.
"""

from __future__ import annotations

import xml.etree.ElementTree as ET
from pathlib import Path

import numpy as np
import pytest
from PySide6.QtCore import QMimeData, QPointF, Qt, QUrl
from PySide6.QtGui import QDropEvent, QImage
from PySide6.QtWidgets import QApplication

from app.document.settings import app_settings, recent_files
from app.form.number_field import NumberField
from app.form.units import UnitSystem
from app.readout.readout_format import format_value
from app.window.main_window import MainWindow
from core import analyse, load_design, with_value
from core.tuning import BudgetRanges

PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"


def type_into(qtbot, field: NumberField, text: str) -> None:  # type: ignore[no-untyped-def]
    """Replace the field's text by typing, then press Enter."""
    field.lineEdit().selectAll()
    qtbot.keyClicks(field, text)
    qtbot.keyClick(field, Qt.Key.Key_Return)


def wait_computed(qtbot, window: MainWindow) -> None:  # type: ignore[no-untyped-def]
    qtbot.waitUntil(lambda: window.computing_idle() and window.result is not None
                    and window.result.design == window.document.design)


def field(window: MainWindow, path: str) -> NumberField:
    editor = window.design_panel.row(path).editor()
    assert isinstance(editor, NumberField)
    return editor


class TestLiveEditing:
    def test_typing_a_length_changes_readout_and_plots(self, window: MainWindow, qtbot) -> None:  # type: ignore[no-untyped-def]
        motion = window.plots[0]
        old_time = motion.exact.getData()[0].copy()
        type_into(qtbot, field(window, "parts[0].length_m"), "1.2")
        wait_computed(qtbot, window)
        assert window.document.design.parts[0].length_m == 1.2
        expected = analyse(window.document.design)
        assert window.readout.value_text("period_s") == format_value(expected.period_s,
                                                                     "{:.9f}")
        new_time, new_angle = motion.exact.getData()
        assert new_time[-1] == pytest.approx(expected.motion.time_s[-1], rel=1e-12)
        assert new_time[-1] > old_time[-1]  # a longer rod swings more slowly
        np.testing.assert_allclose(new_angle, np.degrees(expected.motion.angle_rad), rtol=1e-12)
        period = window.plots[2]
        window.plot_area.show_plot(2)  # plots behind other tabs are drawn when shown
        np.testing.assert_allclose(period.period.getData()[1], expected.period_curve.period_s)

    def test_inch_pound_entry_is_stored_in_si(self, window: MainWindow, qtbot) -> None:  # type: ignore[no-untyped-def]
        window.set_unit_system(UnitSystem.INCH_POUND)
        row = window.design_panel.row("parts[0].diameter_m")
        assert row.unit_label.text() == "in"
        type_into(qtbot, field(window, "parts[0].diameter_m"), "0.25")
        assert window.document.design.parts[0].diameter_m == pytest.approx(0.00635, rel=1e-12)
        assert window.readout._items["mass_kg"][0].text(2) == "lb"

    def test_trim_height_requotes_the_trim_figure(self, window: MainWindow, qtbot) -> None:  # type: ignore[no-untyped-def]
        type_into(qtbot, window.readout.trim_field, "0.2")
        qtbot.waitUntil(lambda: window.result.sensitivities.trim_height_m == 0.2)
        expected = analyse(window.document.design, trim_height_m=0.2)
        assert window.readout.value_text("trim_s_per_day_per_g") == format_value(
            expected.sensitivities.trim_s_per_day_per_g, "{:+.4f}")

    @pytest.mark.slow
    def test_many_live_updates_keep_the_window_alive(self, window: MainWindow, qtbot) -> None:  # type: ignore[no-untyped-def]
        """≥ 300 live updates through the stepping path (guards a known PySide6 6.12.0 crash
        on Python 3.11, "Fatal Python error: none_dealloc")."""
        window.show()
        length = field(window, "parts[0].length_m")
        app = QApplication.instance()
        start = window.compute_count
        for i in range(320):
            length.stepBy(-1 if i % 4 == 3 else 1)  # a wavering drag, 160 mm longer overall
            app.processEvents()
            qtbot.waitUntil(window.computing_idle)  # each step analysed and shown
        length.finish_steps()
        app.processEvents()
        wait_computed(qtbot, window)
        assert window.isVisible()
        assert window.compute_count - start >= 300
        assert length.value() == pytest.approx(1.1131 + 0.160, abs=1e-9)
        assert window.result.design.parts[0].length_m == pytest.approx(length.value(), abs=1e-12)
        assert window.document.undo_stack.count() == 1  # one drag, one undo step


class TestBadInput:
    def test_text_that_is_not_a_number_is_marked_and_the_result_kept(
            self, window: MainWindow, qtbot) -> None:  # type: ignore[no-untyped-def]
        before = window.result
        type_into(qtbot, field(window, "parts[0].length_m"), "1.2x")
        row = window.design_panel.row("parts[0].length_m")
        assert "not a number" in row.problem()
        assert row.editor().property("invalid") is True
        assert window.result is before
        assert window.document.design == before.design

    @pytest.mark.parametrize("path, text, words", [
        ("parts[0].length_m", "-1", "Rod length must be between 0.1 mm and 1000 m."),
        ("swing.amplitude_deg", "180", "Semi-arc must be between"),
    ])
    def test_values_out_of_range_are_refused_with_the_core_reason(
            self, window: MainWindow, qtbot, path: str, text: str, words: str) -> None:  # type: ignore[no-untyped-def]
        before = window.document.design
        type_into(qtbot, field(window, path), text)
        assert words in window.design_panel.row(path).problem()
        assert window.document.design == before

    def test_a_bob_that_does_not_reach_its_rod_is_refused(self, window: MainWindow,
                                                          qtbot) -> None:  # type: ignore[no-untyped-def]
        panel = window.design_panel
        panel.select_part(2)
        mount = panel.row("parts[2].mount.kind")
        mount.combo.setCurrentIndex(mount.combo.findData("clamp"))
        mount.combo.activated.emit(mount.combo.currentIndex())
        assert window.document.design.parts[2].mount.kind == "clamp"
        type_into(qtbot, field(window, "parts[2].mount.centre_m"), "3")
        assert "does not reach" in panel.row("parts[2].mount.centre_m").problem()
        assert window.document.design.parts[2].mount.kind == "clamp"


def budget_rows(window: MainWindow) -> list[tuple[str, str]]:
    """The rate budget's lines as shown: (label, value) of each."""
    return [(item.text(0), item.text(1)) for item in window.readout._budget_items
            if not item.isHidden()]


class TestBudgetRanges:
    """The rate budget's half-widths: typed in the readout, judged by the core, passed to
    ``core.analyse``, kept in the settings and not in the design file."""

    def test_a_temperature_range_of_10_k_gives_the_core_budget_for_it(
            self, window: MainWindow, qtbot) -> None:  # type: ignore[no-untyped-def]
        # Example site 20 °C; default ranges ±5 K, ±30 hPa, ±0.1°.
        default_line = window.result.budget.lines[0]
        assert budget_rows(window)[0] == ("Temperature ±5 °C",
                                          f"{abs(default_line.spread_s_per_day):.2f}")
        type_into(qtbot, window.readout.budget_fields["temperature_k"], "10")
        qtbot.waitUntil(lambda: window.result.budget.lines[0].high == 30.0)
        expected = analyse(window.document.design,
                           budget_ranges=BudgetRanges(temperature_k=10.0)).budget
        line = window.result.budget.lines[0]
        assert (line.low, line.high) == (10.0, 30.0)
        assert line == expected.lines[0]  # the same computation: equal to the last bit
        assert window.result.budget.lines[1:] == expected.lines[1:]  # the others untouched
        assert budget_rows(window)[0] == ("Temperature ±10 °C",
                                          f"{abs(expected.lines[0].spread_s_per_day):.2f}")
        assert budget_rows(window)[3] == ("Worst case (sum)",
                                          f"{expected.worst_case_s_per_day:.2f}")
        # A range twice as wide spreads the rate (nearly linear in temperature) about twice
        # as far: the line really changed.
        assert line.spread_s_per_day == pytest.approx(2 * default_line.spread_s_per_day,
                                                      rel=5e-3)
        assert window.budget_ranges() == BudgetRanges(temperature_k=10.0)
        assert not window.document.is_dirty  # not part of the design

    def test_ranges_are_kept_in_the_settings_for_the_next_window(
            self, window: MainWindow, qtbot) -> None:  # type: ignore[no-untyped-def]
        type_into(qtbot, window.readout.budget_fields["pressure_hpa"], "50")
        type_into(qtbot, window.readout.budget_fields["arc_deg"], "0.25")
        assert float(app_settings().value("budget/pressure_hpa")) == 50.0
        assert float(app_settings().value("budget/arc_deg")) == 0.25
        later = MainWindow(window.document.design)
        qtbot.addWidget(later)
        later.compute_now()
        assert later.budget_ranges() == BudgetRanges(pressure_hpa=50.0, arc_deg=0.25)
        assert later.readout.budget_fields["pressure_hpa"].text() == "50"
        line = later.result.budget.lines[1]
        site = later.document.design.site.pressure_hpa
        assert (line.low, line.high) == (site - 50.0, site + 50.0)
        later.document.undo_stack.setClean()

    def test_unusable_stored_ranges_fall_back_to_the_defaults(self, example_copy: Path,
                                                              qtbot) -> None:  # type: ignore[no-untyped-def]
        app_settings().clear()  # as the window fixture does; the two windows below suffice
        design = load_design(example_copy)
        app_settings().setValue("budget/temperature_k", "warm")
        later = MainWindow(design)
        qtbot.addWidget(later)
        assert later.budget_ranges() == BudgetRanges()
        app_settings().setValue("budget/temperature_k", -3.0)
        again = MainWindow(design)
        qtbot.addWidget(again)
        assert again.budget_ranges() == BudgetRanges()

    @pytest.mark.parametrize("key, text, words", [
        ("temperature_k", "-2", "must be between 0 and 100 °C"),
        ("pressure_hpa", "nan", "not a finite number"),
        ("arc_deg", "wide", "is not a number"),
        ("arc_deg", "95", "must be between 0 and 90°"),
    ])
    def test_a_refused_range_is_marked_and_the_last_result_kept(
            self, window: MainWindow, qtbot, key: str, text: str, words: str) -> None:  # type: ignore[no-untyped-def]
        before, count = window.result, window.compute_count
        rows = budget_rows(window)
        entry = window.readout.budget_fields[key]
        type_into(qtbot, entry, text)
        window.compute_now()
        assert entry.property("invalid") is True
        assert words in entry.problem()
        sentence = window.readout.budget_problem_text()
        assert words in sentence and sentence.endswith("the last good ranges.")
        assert window.result is before and window.compute_count == count
        assert window.budget_ranges() == BudgetRanges()
        assert budget_rows(window) == rows
        type_into(qtbot, entry, "0")  # a good value clears the mark
        assert entry.problem() == "" and window.readout.budget_problem_text() == ""
        assert getattr(window.budget_ranges(), key) == 0.0

    def test_inch_pound_shows_fahrenheit_and_inches_of_mercury(
            self, window: MainWindow, qtbot) -> None:  # type: ignore[no-untyped-def]
        window.set_unit_system(UnitSystem.INCH_POUND)
        fields = window.readout.budget_fields
        assert fields["temperature_k"].unit().text == "°F"
        assert fields["temperature_k"].text() == "9"  # 5 K = 9 °F (a difference: no offset)
        assert fields["pressure_hpa"].text() == "0.886"  # 30 hPa = 0.886 inHg
        assert window.readout._range_items["pressure_hpa"].text(2) == "inHg"
        type_into(qtbot, fields["temperature_k"], "18")  # 18 °F = 10 K
        qtbot.waitUntil(lambda: window.result.budget.lines[0].high == pytest.approx(30.0))
        assert window.budget_ranges().temperature_k == pytest.approx(10.0, rel=1e-12)
        assert window.budget_ranges().pressure_hpa == 30.0  # untouched by the conversion
        assert budget_rows(window)[0][0] == "Temperature ±18 °F"

    def test_stepping_a_range_recomputes_live(self, window: MainWindow, qtbot) -> None:  # type: ignore[no-untyped-def]
        arc = window.readout.budget_fields["arc_deg"]
        arc.stepBy(2)  # 0.1° + 2 × 0.05°
        qtbot.waitUntil(lambda: window.budget_ranges().arc_deg == pytest.approx(0.2))
        window.compute_now()
        line = window.result.budget.lines[2]
        amp = window.document.design.swing.amplitude_deg
        assert (line.low, line.high) == pytest.approx((amp - 0.2, amp + 0.2), abs=1e-12)
        arc.finish_steps()


class TestUndoRedo:
    def test_undo_and_redo_restore_designs_exactly(self, window: MainWindow, qtbot) -> None:  # type: ignore[no-untyped-def]
        original = window.document.design
        type_into(qtbot, field(window, "parts[0].length_m"), "1.2")
        after_length = window.document.design
        type_into(qtbot, field(window, "swing.amplitude_deg"), "2.5")
        after_arc = window.document.design
        assert after_arc == with_value(after_length, "swing.amplitude_deg", 2.5)
        window.undo_action.trigger()
        assert window.document.design == after_length
        assert field(window, "swing.amplitude_deg").value() == 1.6
        window.undo_action.trigger()
        assert window.document.design == original
        window.redo_action.trigger()
        window.redo_action.trigger()
        assert window.document.design == after_arc
        wait_computed(qtbot, window)

    def test_parts_can_be_added_duplicated_and_removed(self, window: MainWindow) -> None:
        panel = window.design_panel
        count = len(window.document.design.parts)
        assert panel.add_part("weight")
        assert len(window.document.design.parts) == count + 1
        assert panel.selected_part() == count
        assert panel.duplicate_selected_part()
        assert window.document.design.parts[-1].name == "trim 3"
        assert panel.remove_selected_part()
        panel.select_part(0)
        assert not panel.remove_selected_part()  # the rod carries the sleeve
        assert "carried by" in panel.parts_problem.text()
        for _ in range(3):  # remove, duplicate, add
            window.undo_action.trigger()
        assert len(window.document.design.parts) == count


class TestFiles:
    def test_save_then_open_round_trip(self, window: MainWindow, qtbot,
                                       tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
        type_into(qtbot, field(window, "swing.amplitude_deg"), "2.25")
        assert window.isWindowModified()
        assert window.windowTitle().startswith("regulator.pendulum.json[*]")
        target = tmp_path / "copy.pendulum.json"
        assert window.save_as(target)
        assert not window.isWindowModified()
        saved = window.document.design
        assert load_design(target) == saved
        assert target.resolve() in recent_files()
        assert window.new_document()
        assert window.document.path is None
        assert window.open_file(target)
        assert window.document.design == saved

    def test_failed_save_says_why_and_stays_unsaved(self, window: MainWindow, qtbot,
                                                    tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
        type_into(qtbot, field(window, "swing.amplitude_deg"), "2.25")
        assert not window.save_as(tmp_path / "missing" / "x.pendulum.json")
        assert "could not save" in window.last_message
        assert window.document.is_dirty

    def test_discard_prompt_can_keep_the_document(self, window: MainWindow, qtbot,
                                                  monkeypatch: pytest.MonkeyPatch) -> None:  # type: ignore[no-untyped-def]
        type_into(qtbot, field(window, "swing.amplitude_deg"), "2.25")
        monkeypatch.setattr(window, "confirm_discard", lambda: False)
        edited = window.document.design
        assert not window.new_document()
        assert window.document.design == edited

    def test_dropping_a_design_file_opens_it(self, window: MainWindow, tmp_path: Path) -> None:
        other = tmp_path / "other.pendulum.json"
        from core import save_design

        save_design(with_value(window.document.design, "name", "Dropped"), other)
        mime = QMimeData()
        mime.setUrls([QUrl.fromLocalFile(str(other))])
        event = QDropEvent(QPointF(10, 10), Qt.DropAction.CopyAction, mime,
                           Qt.MouseButton.LeftButton, Qt.KeyboardModifier.NoModifier)
        window.dropEvent(event)
        assert window.document.design.name == "Dropped"
        assert window.document.path == other

    def test_a_bad_file_is_refused_with_its_field(self, window: MainWindow,
                                                  tmp_path: Path) -> None:
        bad = tmp_path / "bad.pendulum.json"
        bad.write_text(EXAMPLE_TEXT.replace('"amplitude_deg": 1.6', '"amplitude_deg": 200'),
                       encoding="utf-8")
        before = window.document.design
        assert not window.open_file(bad)
        assert "swing.amplitude_deg" in window.last_message
        assert window.document.design == before

    def test_layout_is_remembered(self, window: MainWindow) -> None:
        window.resize(1100, 700)
        window.plot_area.set_arrangement("grid")
        window.close()
        settings = app_settings()
        assert settings.value("view/arrangement") == "grid"
        assert not settings.value("window/geometry").isEmpty()
        settings.setValue("view/arrangement", "tabs")


class TestExport:
    @pytest.mark.slow
    def test_export_plots_writes_valid_png_and_svg(self, window: MainWindow,
                                                   tmp_path: Path) -> None:
        written = window.export_plots(tmp_path / "plots")
        names = sorted(p.name for p in written)
        assert "motion.png" in names and "period_curve.svg" in names
        for path in written:
            if path.suffix == ".png":
                assert path.read_bytes()[:8] == PNG_SIGNATURE
                assert not QImage(str(path)).isNull()
            else:
                assert ET.parse(path).getroot().tag.endswith("svg")

    def test_baseline_is_drawn_in_grey_and_compared(self, window: MainWindow, qtbot) -> None:  # type: ignore[no-untyped-def]
        window.pin_baseline()
        baseline = window.baseline
        type_into(qtbot, field(window, "parts[0].length_m"), "1.2")
        wait_computed(qtbot, window)
        ghost_t, _ = window.plots[0].ghost.getData()
        assert ghost_t[-1] == pytest.approx(baseline.motion.time_s[-1])
        assert not window.readout.tree.isColumnHidden(3)
        item = window.readout._items["period_s"][0]
        delta = window.result.period_s - baseline.period_s
        assert item.text(3) == format_value(delta, "{:+.9f}")
        window.clear_baseline()
        assert window.readout.tree.isColumnHidden(3)


EXAMPLE_TEXT = (Path(__file__).resolve().parents[2] / "resources" / "examples"
                / "workshop_regulator.pendulum.json").read_text(encoding="utf-8")
