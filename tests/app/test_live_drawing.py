"""During a live drag the views skip drawing what could not be seen, and draw everything again
once the drag stops: antialiasing, a damped swing's coinciding loops, a small-angle curve
lying under the exact one."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from app.views.motion import MotionPlot
from app.views.phase import PhasePlot
from app.views.swing_preview import SwingPreview
from core import analyse, load_design, with_value

EXAMPLES = Path(__file__).resolve().parents[2] / "resources" / "examples"


@pytest.fixture(scope="module")
def regulator():  # type: ignore[no-untyped-def]
    return analyse(load_design(EXAMPLES / "workshop_regulator.pendulum.json"))


def _dragged(view, qtbot, first, then):  # type: ignore[no-untyped-def]
    """``view`` shown with ``first``, then ``then`` arriving within the settling time (a
    live drag that lasts until the test ends it with ``view._stream_ended()``)."""
    qtbot.addWidget(view)
    view.resize(700, 460)
    view.show()
    view._stream_timer.setInterval(60_000)
    view.show_result(first)
    view.show_result(then)
    assert view._streaming
    return view


def _longer(result, factor: float = 1.001):  # type: ignore[no-untyped-def]
    design = result.design
    return analyse(with_value(design, "parts[0].length_m", design.parts[0].length_m * factor))


def test_swing_preview_is_antialiased_at_rest_only(qtbot, regulator):  # type: ignore[no-untyped-def]
    view = SwingPreview()
    qtbot.addWidget(view)
    view.resize(700, 460)
    view.show()
    view.show_result(regulator)
    assert view.smooth  # a rotated rod is stair-stepped without it
    view.show_result(_longer(regulator))  # within the settling time: a live drag
    assert not view.smooth
    qtbot.waitUntil(lambda: view.smooth, timeout=3000)


def test_damped_loops_that_coincide_are_drawn_once_during_a_drag(qtbot, regulator):  # type: ignore[no-untyped-def]
    # Q = 12000: over the three periods drawn the arc falls by 1 − exp(−3π/Q) ≈ 8e-4 of itself,
    # well under half a pixel here, so the later loops lie on the first
    then = _longer(regulator)
    plot = _dragged(PhasePlot(), qtbot, regulator, then)
    x, _ = plot.current.getData()
    first_period = int(np.count_nonzero(then.motion.time_s <= then.period_s)) + 1
    assert len(x) == first_period < then.motion.time_s.size
    np.testing.assert_allclose(x, np.degrees(then.motion.angle_rad[:first_period]))
    assert plot.legend_names()[0] == "This swing, damped"
    plot._stream_ended()
    np.testing.assert_allclose(plot.current.getData()[0], np.degrees(then.motion.angle_rad))


def test_a_visible_spiral_is_drawn_whole_during_a_drag(qtbot, regulator):  # type: ignore[no-untyped-def]
    # Q = 20: the arc falls by 1 − exp(−3π/20) ≈ 38 % over the three periods drawn
    damped = analyse(with_value(regulator.design, "swing.quality_factor", 20.0))
    then = _longer(damped)
    plot = _dragged(PhasePlot(), qtbot, damped, then)
    assert len(plot.current.getData()[0]) == then.motion.time_s.size


def test_small_angle_curve_under_the_exact_one_is_not_drawn_during_a_drag(qtbot, regulator):  # type: ignore[no-untyped-def]
    # at 1.6° the curves differ by about 0.001° (the right axis): a tenth of a pixel here
    then = _longer(regulator)
    plot = _dragged(MotionPlot(), qtbot, regulator, then)
    assert len(plot.linear.getData()[0]) == 0
    assert plot.legend_names()[1] == "Small-angle model (coincides)"
    plot._stream_ended()
    np.testing.assert_allclose(plot.linear.getData()[1],
                               np.degrees(then.motion.linear_angle_rad))


def test_small_angle_curve_apart_from_the_exact_one_is_drawn_during_a_drag(qtbot, regulator):  # type: ignore[no-untyped-def]
    # at 60° the period is 7 % longer than the small-angle one: the curves part visibly
    wide = analyse(with_value(regulator.design, "swing.amplitude_deg", 60.0))
    then = _longer(wide)
    plot = _dragged(MotionPlot(), qtbot, wide, then)
    np.testing.assert_allclose(plot.linear.getData()[1],
                               np.degrees(then.motion.linear_angle_rad))
