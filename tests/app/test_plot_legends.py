"""The charts' legends name only what is on view, and their ranges hold what they draw."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from app.views.motion import MotionPlot
from app.views.period_curve import NO_TARGET_NOTE, PeriodCurvePlot
from app.views.phase import PhasePlot
from core import analyse, load_design, with_value

EXAMPLES = Path(__file__).resolve().parents[2] / "resources" / "examples"


@pytest.fixture(scope="module")
def regulator():  # type: ignore[no-untyped-def]
    return analyse(load_design(EXAMPLES / "workshop_regulator.pendulum.json"))


@pytest.fixture(scope="module")
def atrium():  # type: ignore[no-untyped-def]
    return analyse(load_design(EXAMPLES / "atrium_pendulum.pendulum.json"))


def _shown(view, qtbot, result, baseline=None):  # type: ignore[no-untyped-def]
    qtbot.addWidget(view)
    view.resize(700, 460)
    view.show()
    view.show_result(result, baseline)
    return view


def test_small_angle_curve_under_the_exact_one_is_said_to_coincide(qtbot, regulator):  # type: ignore[no-untyped-def]
    # at 1.6° the two differ by about 0.001° (the right axis): under a pixel
    plot = _shown(MotionPlot(), qtbot, regulator)
    assert plot.legend_names() == ["Exact", "Small-angle model (coincides)",
                                   "Exact − small-angle"]
    wide = analyse(with_value(regulator.design, "swing.amplitude_deg", 60.0))
    plot.show_result(wide)  # at 60° the period is 7 % longer (plain elliptic integral)
    assert plot.legend_names()[1] == "Small-angle model"
    plot.set_show_difference(False)
    assert plot.legend_names() == ["Exact", "Small-angle model"]


def test_phase_legend_names_the_damped_swing_and_only_lines_on_view(qtbot, regulator):  # type: ignore[no-untyped-def]
    plot = _shown(PhasePlot(), qtbot, regulator)
    # a clock's ±1.6°: the separatrix (±180°) and the orbits over the top are far off view
    assert plot.legend_names() == ["This swing, damped", "Other semi-arcs, undamped"]
    plot.set_show_separatrix(True)
    assert "Separatrix" in plot.legend_names()
    undamped = analyse(with_value(regulator.design, "swing.quality_factor", None))
    plot.set_show_separatrix(False)
    plot.show_result(undamped)
    assert plot.legend_names()[0] == "This swing"
    # the undamped swing is its closed orbit
    np.testing.assert_allclose(plot.current.getData()[0],
                               np.degrees(undamped.phase.current.angle_rad))


@pytest.mark.parametrize("amplitude", [120.0, 150.0, 170.0])
def test_phase_frames_the_orbits_over_the_top_of_a_wide_swing(qtbot, regulator, amplitude):  # type: ignore[no-untyped-def]
    result = analyse(with_value(regulator.design, "swing.amplitude_deg", amplitude))
    plot = _shown(PhasePlot(), qtbot, result)
    (x0, x1), (y0, y1) = plot.getPlotItem().vb.viewRange()
    assert x0 <= -180.0 and x1 >= 180.0
    for curve in plot.over_the_top:
        xs, ys = curve.getData()
        if xs is not None and xs.size:
            assert y0 <= float(np.min(ys)) and float(np.max(ys)) <= y1
    assert {"Separatrix", "Over the top"} <= set(plot.legend_names())


def test_period_curve_range_holds_the_line_to_the_edge_and_the_baseline(qtbot, regulator):  # type: ignore[no-untyped-def]
    baseline = analyse(with_value(regulator.design, "parts[0].length_m", 1.0))  # far shorter
    plot = _shown(PeriodCurvePlot(), qtbot, regulator, baseline)
    (x0, x1), (y0, y1) = plot.getPlotItem().vb.viewRange()
    for curve in (plot.period, plot.ghost):
        xs, ys = curve.getData()
        # the drawn line at the right edge, by linear interpolation between its samples
        assert y0 <= float(np.interp(x1, xs, ys)) <= y1
        inside = (xs >= x0) & (xs <= x1)
        assert y0 <= float(np.min(ys[inside])) and float(np.max(ys[inside])) <= y1


def test_rate_without_a_target_is_explained_in_the_plot(qtbot, atrium):  # type: ignore[no-untyped-def]
    assert atrium.period_curve.rate_s_per_day is None  # the atrium example has no target
    plot = _shown(PeriodCurvePlot(), qtbot, atrium)
    assert plot.note_text() == ""
    plot.set_quantity("rate")
    assert plot.note_text() == NO_TARGET_NOTE.replace("\n", "\n")
    assert not plot.marker.isVisible()
    plot.set_quantity("period")
    assert plot.note_text() == "" and plot.marker.isVisible()


def test_main_curves_are_smooth_at_rest_and_plain_during_a_drag(qtbot, regulator):  # type: ignore[no-untyped-def]
    plot = _shown(PhasePlot(), qtbot, regulator)
    assert plot.smooth and plot.current.opts["antialias"]
    wider = analyse(with_value(regulator.design, "swing.amplitude_deg", 1.7))
    plot.show_result(wider)  # within the settling time of the last: a live drag
    assert not plot.smooth
    qtbot.waitUntil(lambda: plot.smooth, timeout=3000)  # smoothed once the stream stops
