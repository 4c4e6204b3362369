"""The sweep tab: period and rate against one field, drawn from ``core.solve.sweep_field``
only, swept when on view and the design changed, coalesced while the design changes fast."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest
from PySide6.QtCore import Qt

import app.views.sweep as sweep_module
from app.views.sweep import SWEEP_POINTS, SweepPlot, sweep_fields
from core import analyse, load_design, with_value
from core.solve import sweep_field

EXAMPLES = Path(__file__).resolve().parents[2] / "resources" / "examples"
ROD = 1.1131  # workshop regulator: invar rod from the pivot, m (example file)


@pytest.fixture(scope="module")
def regulator():
    return analyse(load_design(EXAMPLES / "workshop_regulator.pendulum.json"))


@pytest.fixture
def sweep(qtbot):
    plot = SweepPlot()
    qtbot.addWidget(plot)
    plot.resize(700, 480)
    return plot


def _shown(plot: SweepPlot) -> SweepPlot:
    plot.setAttribute(Qt.WidgetAttribute.WA_DontShowOnScreen, True)
    plot.show()
    return plot


def _assert_same(drawn, expected) -> None:  # type: ignore[no-untyped-def]
    np.testing.assert_array_equal(np.isnan(drawn), np.isnan(expected))
    np.testing.assert_allclose(drawn, expected, rtol=0, atol=0, equal_nan=True)


class TestFields:
    def test_the_regulator_offers_its_lengths_positions_masses_and_the_pivot(self, regulator):
        fields = sweep_fields(regulator.design)
        assert [(f.path, f.unit, f.value) for f in fields] == [
            ("parts[0].length_m", "m", ROD), ("parts[0].top_m", "m", 0.0),
            ("parts[1].length_m", "m", 0.055), ("parts[2].mass_kg", "kg", 8.5),
            ("parts[3].at_m", "m", 0.45), ("parts[3].mass_kg", "kg", 0.004),
            ("pivot", "m", 0.0)]
        assert fields[-1].label == "Pivot position along the pendulum"

    def test_a_clamped_bob_offers_its_centre_and_a_spring_its_stiffness(self):
        design = load_design(EXAMPLES / "atrium_pendulum.pendulum.json")
        paths = [f.path for f in sweep_fields(design)]
        assert "parts[1].mount.centre_m" in paths
        assert "suspension.stiffness_n_m_per_rad" not in paths  # a knife edge: nothing to vary
        sprung = with_value(with_value(design, "suspension.kind", "spring"),
                            "suspension.stiffness_n_m_per_rad", 0.5)
        stiffness = [f for f in sweep_fields(sprung) if f.label == "Spring stiffness"]
        assert [(f.path, f.value) for f in stiffness] == [
            ("suspension.stiffness_n_m_per_rad", 0.5)]


class TestCurve:
    def test_period_and_rate_are_the_core_sweep(self, sweep, regulator):
        sweep.show_result(regulator)  # hidden: swept at once
        assert sweep.field().path == "parts[0].length_m"
        start, stop = sweep.sweep_range()
        assert (start, stop) == pytest.approx((0.8 * ROD, 1.2 * ROD), rel=1e-12)  # ±20 %
        table = sweep_field(regulator.design, "parts[0].length_m", start, stop, SWEEP_POINTS)
        x, y = sweep.curve.getData()
        _assert_same(x, table.values)
        _assert_same(y, table.period_s)
        sweep.quantity_box.setCurrentIndex(1)  # rate against the target (2 s)
        _assert_same(sweep.curve.getData()[1], table.rate_s_per_day)
        assert sweep.plotItem.getAxis("left").labelText == "Rate against target (s/day)"

    def test_current_value_is_marked_with_the_core_figures(self, sweep, regulator):
        sweep.show_result(regulator)
        assert sweep.marker.value() == pytest.approx(ROD)
        assert (sweep.dot.pos().x(), sweep.dot.pos().y()) == pytest.approx(
            (ROD, regulator.period_s))
        assert sweep.marker_text() == f"now 1.113 m: {regulator.period_s:.6f} s"
        sweep.set_quantity("rate")
        assert sweep.dot.pos().y() == pytest.approx(regulator.rate_s_per_day)

    def test_pivot_sweep_marks_the_shortest_period(self, sweep, regulator):
        sweep.show_result(regulator)
        sweep.set_field("pivot")
        start, stop = sweep.sweep_range()
        assert (start, stop) == pytest.approx((-0.1 * ROD, 1.0 * ROD), rel=1e-12)
        table = sweep_field(regulator.design, "pivot", start, stop, SWEEP_POINTS)
        _assert_same(sweep.curve.getData()[1], table.period_s)
        # Past the centre of mass the pendulum hangs turned over: both branches are drawn,
        # and the conjugate pivot (the core's centre of oscillation) is marked.
        assert np.isfinite(table.period_s).sum() >= SWEEP_POINTS - 1
        assert sweep.conjugate_text() == (
            f"conjugate pivot {regulator.centre_of_oscillation_m:.4f} m")
        least = int(np.nanargmin(table.period_s))
        assert sweep.least_period_value() == table.values[least]
        assert (sweep.least_dot.pos().x(), sweep.least_dot.pos().y()) == pytest.approx(
            (table.values[least], table.period_s[least]))
        assert sweep.least_text().startswith(f"shortest period {table.period_s[least]:.6f} s")
        sweep.set_field("parts[2].mass_kg")
        assert sweep.least_period_value() is None and sweep.least_text() == ""

    def test_a_range_set_by_hand_is_kept_until_reset(self, sweep, regulator):
        sweep.show_result(regulator)
        sweep.set_range(1.0, 1.05)
        longer = analyse(with_value(regulator.design, "parts[0].length_m", 1.2))
        sweep.show_result(longer)
        assert sweep.sweep_range() == (1.0, 1.05)
        _assert_same(sweep.curve.getData()[1], sweep_field(
            longer.design, "parts[0].length_m", 1.0, 1.05, SWEEP_POINTS).period_s)
        sweep.reset_range()
        assert sweep.sweep_range() == pytest.approx((0.96, 1.44), rel=1e-12)


class TestWhenSwept:
    def test_shown_sweeps_coalesce_to_the_newest_design(self, qtbot, sweep, regulator,
                                                        monkeypatch):
        calls = []

        def counting(design, path, start, stop, points):  # type: ignore[no-untyped-def]
            calls.append(design)
            return sweep_field(design, path, start, stop, points)

        monkeypatch.setattr(sweep_module, "sweep_field", counting)
        _shown(sweep)
        designs = [with_value(regulator.design, "parts[0].length_m", 1.10 + 0.002 * i)
                   for i in range(5)]
        results = [analyse(d) for d in designs]
        for result in results:  # a drag: five results before the event loop runs
            sweep.show_result(result)
        assert calls == []
        qtbot.waitUntil(lambda: len(calls) == 1)
        assert calls == [designs[-1]]
        sweep.show_result(results[-1])  # the same design again: nothing to sweep
        sweep.sweep_now()
        assert len(calls) == 1 and sweep.sweep_count == 1

    def test_the_window_sweeps_only_while_the_tab_is_on_view(self, window):  # type: ignore[no-untyped-def]
        sweep = next(p for p in window.plots if isinstance(p, SweepPlot))
        assert isinstance(sweep, SweepPlot)
        assert sweep.sweep_count == 0  # computed designs, sweep never on view
        window.grid_action.setChecked(True)  # all plots together: the sweep keeps its tab
        index = window.plots.index(sweep)
        assert index not in window.plot_area.shown_indices()
        assert sweep.sweep_count == 0
        window.plot_area.show_plot(index)
        assert window.plot_area.shown_indices() == [index]
        assert sweep.sweep_count == 1
        np.testing.assert_array_equal(sweep.curve.getData()[1], sweep.table.period_s)


class TestDefaultsAndLeastMark:
    def test_a_clamped_bob_is_swept_by_its_position_first(self, sweep):
        hall = analyse(load_design(EXAMPLES / "hall_clock.pendulum.json"))
        sweep.show_result(hall)
        assert sweep.field().path == "parts[1].mount.centre_m"  # the lens bob, clamped
        # every point of the default range (±20 % of the bob's centre) gives a design
        assert np.isfinite(sweep.table.period_s).all()

    def test_the_shortest_period_is_marked_only_at_an_interior_minimum(self, sweep, regulator):
        sweep.show_result(regulator)
        sweep.set_field("pivot")
        assert sweep.least_period_value() is not None
        # the period only shortens as the pivot moves down this first tenth of the rod, so
        # the least sample is the range's end: no minimum to mark (compound pendulum,
        # T ∝ sqrt((k² + h²)/h) falls while h > k; plain mechanics)
        sweep.set_range(0.0, 0.1)
        periods = np.asarray(sweep.table.period_s, dtype=float)
        assert np.all(np.diff(periods) < 0)
        assert sweep.least_period_value() is None and sweep.least_text() == ""
