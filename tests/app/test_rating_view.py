"""The Rating view: the demo log's fit on view, table edits as single undo steps through the
document, pasted rows, the model fitted to the clock, Q from the decay, CSV in and out, units,
and the fit made only while the view is on screen."""

from __future__ import annotations

from datetime import UTC, datetime, timedelta
from pathlib import Path

import pytest
from PySide6.QtCore import QTimer
from PySide6.QtWidgets import QApplication

from app.form.units import UnitSystem
from app.views.catalogue import VIEWS
from app.views.rating_edits import COLUMNS, table_rows
from app.views.rating_view import RatingView
from core import load_design
from core.fileformat import design_to_dict, get_value
from core.rating_model import default_fit_field, model_at_conditions
from core.rating_report import rating_report

ROOT = Path(__file__).resolve().parents[2]
HALL = ROOT / "resources" / "examples" / "hall_clock.pendulum.json"
COLUMN = {c.key: i for i, c in enumerate(COLUMNS)}


def rating_view(win) -> RatingView:  # type: ignore[no-untyped-def]
    view = next(p for p in win.plots if isinstance(p, RatingView))
    win.plot_area.show_plot(win.plots.index(view))
    QApplication.processEvents()
    view.fit_now()
    return view


def type_cell(view: RatingView, row: int, key: str, text: str) -> None:
    model = view.table.table_model
    model.setData(model.index(row, COLUMN[key]), text)
    QApplication.processEvents()


class TestOnView:
    def test_a_tab_of_its_own_registered_once(self) -> None:
        assert VIEWS.count(RatingView) == 1
        assert RatingView.grid_member is False and RatingView.in_report is False

    def test_the_demo_log_shows_its_two_segments(self, window) -> None:  # type: ignore[no-untyped-def]
        view = rating_view(window)
        log = window.document.design.rating_log
        assert view.report is not None and view.problem == ""
        assert [s["readings"] for s in view.report["segments"]] == [11, 20]
        assert view.table.table_model.rowCount() == len(log.readings) + len(log.adjustments)
        # the fitted line is drawn over both segments, broken at the adjustment
        x, _y = view.error_plot.fit.getData()
        assert len(x) == len(log.readings)
        assert len(view.error_plot.adjustment_lines) == len(log.adjustments)
        assert "Segment 2" in view.figures.text() and "rating nut" in view.figures.text()
        assert view.allan_plot.curve.getData()[0] is not None
        # the rate points between readings and both lines are drawn
        assert len(view.rate_plot.points.getData()[0]) > 20
        assert len(view.rate_plot.measured.getData()[0]) == 2
        assert len(view.rate_plot.model.getData()[0]) == 2

    def test_the_fit_waits_until_the_view_is_on_screen(self, window) -> None:  # type: ignore[no-untyped-def]
        view = next(p for p in window.plots if isinstance(p, RatingView))
        window.plot_area.show_plot(0)
        QApplication.processEvents()
        assert view.fit_count == 0
        window.document.commit(load_design(HALL), "another design")
        QApplication.processEvents()
        assert view.fit_count == 0  # not on screen: nothing fitted
        window.document.undo_stack.undo()
        view = rating_view(window)
        assert view.fit_count == 1
        view.fit_now()  # nothing changed: not fitted again
        assert view.fit_count == 1


class TestEdits:
    def test_adding_a_reading_is_one_undo_step_and_undo_restores_the_log(self, window) -> None:  # type: ignore[no-untyped-def]
        view = rating_view(window)
        before = window.document.design.rating_log
        steps = window.document.undo_stack.count()
        view.add_reading_now()
        QApplication.processEvents()
        after = window.document.design.rating_log
        assert window.document.undo_stack.count() == steps + 1
        assert len(after.readings) == len(before.readings) + 1
        new = next(r for r in after.readings if r not in before.readings)
        assert new.at.utcoffset() is not None
        assert abs(new.at - datetime.now(UTC)) < timedelta(minutes=1)
        assert view.table.table_model.rowCount() == len(table_rows(after))
        window.document.undo_stack.undo()
        QApplication.processEvents()
        assert window.document.design.rating_log == before

    def test_the_window_shortcut_adds_a_reading_from_another_tab(self, window) -> None:  # type: ignore[no-untyped-def]
        window.plot_area.show_plot(0)
        before = len(window.document.design.rating_log.readings)
        window._add_rating_reading()
        QApplication.processEvents()
        assert len(window.document.design.rating_log.readings) == before + 1
        view = next(p for p in window.plots if isinstance(p, RatingView))
        assert window.plot_area.current_view() is view

    def test_a_typed_cell_is_one_step_and_a_bad_one_is_refused_by_row(self, window) -> None:  # type: ignore[no-untyped-def]
        view = rating_view(window)
        steps = window.document.undo_stack.count()
        type_cell(view, 2, "error_s", "9.5")
        log = window.document.design.rating_log
        assert log.readings[2].error_s == 9.5
        assert window.document.undo_stack.count() == steps + 1
        type_cell(view, 4, "temperature_c", "warm")
        assert window.document.design.rating_log == log
        assert window.document.undo_stack.count() == steps + 1
        assert view.message.text() == "Row 5, Temp.: 'warm' is not a number. The log is unchanged."
        type_cell(view, 4, "temperature_c", "150")
        assert "Row 5, Temp.:" in view.message.text() and "out of range" in view.message.text()
        assert window.document.design.rating_log == log

    def test_a_pasted_sheet_keeps_the_good_rows_and_names_the_bad_one(self, window) -> None:  # type: ignore[no-untyped-def]
        view = rating_view(window)
        before = window.document.design.rating_log
        steps = window.document.undo_stack.count()
        sheet = ("2027-04-01T08:00:00+02:00\t-4.1\t18.5\t1012\n"
                 "2027-04-02T08:00:00+02:00\tten\t18.9\t1011\n"
                 "2027-04-03T08:00:00+02:00\t-4.5\t19.2\t1010\n")
        messages = view.table.paste(sheet)
        QApplication.processEvents()
        log = window.document.design.rating_log
        assert len(log.readings) == len(before.readings) + 2
        assert [r.error_s for r in log.readings[-2:]] == [-4.1, -4.5]
        assert log.readings[-1].pressure_hpa == 1010.0
        assert len(messages) == 1 and messages[0].startswith("pasted line 2: error_s")
        assert "pasted line 2" in view.message.text()
        assert window.document.undo_stack.count() == steps + 1

    def test_deleting_rows_is_one_step(self, window) -> None:  # type: ignore[no-untyped-def]
        view = rating_view(window)
        before = window.document.design.rating_log
        view.table.selectRow(0)
        view.table.delete_rows()
        QApplication.processEvents()
        assert window.document.design.rating_log.readings == before.readings[1:]
        window.document.undo_stack.undo()
        assert window.document.design.rating_log == before

    def test_the_window_stays_live_while_the_table_is_edited(self, window) -> None:  # type: ignore[no-untyped-def]
        view = rating_view(window)
        ticks: list[int] = []
        timer = QTimer()
        timer.setInterval(0)
        timer.timeout.connect(lambda: ticks.append(1))
        timer.start()
        for row in range(12):
            type_cell(view, row if row < 11 else row + 2, "note", f"checked {row}")
        timer.stop()
        assert ticks  # the event loop ran between the edits
        log = window.document.design.rating_log
        assert [r.note for r in log.readings[:12]] == [f"checked {i}" for i in range(12)]
        view.fit_now()
        assert view._fitted_key is not None and view._fitted_key[0] is window.document.design


class TestModel:
    def test_fit_model_to_clock_moves_the_bob_until_the_rates_agree(self, window) -> None:  # type: ignore[no-untyped-def]
        view = rating_view(window)
        design = window.document.design
        path = default_fit_field(design)
        old = get_value(design_to_dict(design), path)
        steps = window.document.undo_stack.count()
        view.fit_model()
        QApplication.processEvents()
        fitted = window.document.design
        assert window.document.undo_stack.count() == steps + 1
        assert get_value(design_to_dict(fitted), path) != old
        report = rating_report(fitted, fitted.rating_log)
        mean = report["mean_conditions"]
        model = model_at_conditions(fitted, mean["temperature_c"], mean["pressure_hpa"],
                                    mean["semi_arc_deg"])
        measured = report["measured_rate_at_mean_conditions_s_per_day"]
        assert model.rate_s_per_day == pytest.approx(measured, abs=1e-6)
        window.document.undo_stack.undo()
        assert window.document.design == design

    def test_set_q_from_decay_is_one_step(self, window) -> None:  # type: ignore[no-untyped-def]
        view = rating_view(window)
        q = view.report["quality_factor"]
        view.set_quality_factor()
        assert window.document.design.swing.quality_factor == pytest.approx(q, rel=1e-12)
        window.document.undo_stack.undo()
        assert window.document.design.swing.quality_factor != pytest.approx(q, rel=1e-12)


class TestFilesAndUnits:
    def test_csv_out_and_back_in_is_the_same_log(self, window, tmp_path) -> None:  # type: ignore[no-untyped-def]
        view = rating_view(window)
        log = window.document.design.rating_log
        path = view.export_csv(tmp_path / "log.csv")
        header = path.read_text(encoding="utf-8").splitlines()[0]
        assert "error_s" in header and "temperature_c" in header and "pressure_hpa" in header
        view.table.selectRow(0)
        view.table.delete_rows()
        assert window.document.design.rating_log != log
        assert view.import_csv(path) == []
        assert window.document.design.rating_log == log

    def test_inch_pound_shows_fahrenheit_and_reads_it_back(self, window) -> None:  # type: ignore[no-untyped-def]
        view = rating_view(window)
        window.set_unit_system(UnitSystem.INCH_POUND)
        model = view.table.table_model
        header = model.headerData(COLUMN["temperature_c"], __import__(
            "PySide6.QtCore", fromlist=["Qt"]).Qt.Orientation.Horizontal)
        assert header == "Temp. (°F)"
        first = window.document.design.rating_log.readings[0]
        shown = float(model.data(model.index(0, COLUMN["temperature_c"])))
        assert shown == pytest.approx(first.temperature_c * 1.8 + 32.0, abs=1e-3)  # unit rule
        type_cell(view, 0, "temperature_c", "68")
        assert window.document.design.rating_log.readings[0].temperature_c == \
            pytest.approx(20.0, abs=1e-12)  # 68 °F = 20 °C exactly


class TestEmpty:
    def test_a_design_without_a_log_shows_a_sentence_and_can_start_one(self, window) -> None:  # type: ignore[no-untyped-def]
        window.document.replace(load_design(HALL), None)
        view = rating_view(window)
        assert view.report is None and "No rating log yet" in view.problem
        assert view.table.table_model.rowCount() == 0
        assert not view.fit_button.isEnabled()
        view.add_reading_now()
        QApplication.processEvents()
        view.fit_now()
        assert len(window.document.design.rating_log.readings) == 1
        assert "rate needs at least three readings" in view.problem
        view.table.selectRow(0)
        view.table.delete_rows()
        view.fit_now()
        assert window.document.design.rating_log is None and "No rating log yet" in view.problem

    def test_a_view_alone_without_a_document(self, qtbot) -> None:  # type: ignore[no-untyped-def]
        from core import analyse

        view = RatingView()
        qtbot.addWidget(view)
        view.resize(900, 600)
        view.show()
        view.show_result(analyse(load_design(HALL)))
        view.fit_now()
        assert "No rating log yet" in view.problem
        view.add_reading_now()  # nothing to edit: a sentence, not an exception
        assert view.message.text()
