"""The plot widgets: the API the exporter shares, data drawn from the result, exports."""

from __future__ import annotations

import xml.etree.ElementTree as ET
from pathlib import Path

import numpy as np
import pytest
from PySide6.QtGui import QImage

from app.plots import PLOT_CLASSES, MotionPlot, PeriodCurvePlot, PhasePlot, export_plot
from core import analyse, load_design, with_value

EXAMPLE = Path(__file__).resolve().parents[2] / "resources/examples/workshop_regulator.pendulum.json"


@pytest.fixture(scope="module")
def results():  # type: ignore[no-untyped-def]
    design = load_design(EXAMPLE)
    return analyse(design), analyse(with_value(design, "swing.amplitude_deg", 5.0))


def test_titles_and_slugs() -> None:
    assert [(c.slug, bool(c.title)) for c in PLOT_CLASSES] == [
        ("motion", True), ("phase", True), ("period_curve", True)]


def test_motion_draws_exact_linear_and_difference_in_degrees(qtbot, results) -> None:  # type: ignore[no-untyped-def]
    result, baseline = results
    plot = MotionPlot()
    qtbot.addWidget(plot)
    plot.show_result(result, baseline)
    t, angle = plot.exact.getData()
    np.testing.assert_allclose(t, result.motion.time_s)
    np.testing.assert_allclose(angle, np.degrees(result.motion.angle_rad))
    np.testing.assert_allclose(plot.linear.getData()[1],
                               np.degrees(result.motion.linear_angle_rad))
    np.testing.assert_allclose(plot.difference.getData()[1],
                               np.degrees(result.motion.difference_rad))
    np.testing.assert_allclose(plot.ghost.getData()[1], np.degrees(baseline.motion.angle_rad))
    plot.set_show_difference(False)
    assert not plot.difference.isVisible() and not plot.difference_action.isChecked()
    plot.show_result(result)
    assert plot.ghost.getData()[0].size == 0  # no baseline, no ghost


def test_phase_fills_its_fixed_slots(qtbot, results) -> None:  # type: ignore[no-untyped-def]
    result, _ = results
    plot = PhasePlot()
    qtbot.addWidget(plot)
    items_before = len(plot.getPlotItem().items)
    plot.show_result(result)
    plot.show_result(result)
    assert len(plot.getPlotItem().items) == items_before  # items are reused, never re-added
    np.testing.assert_allclose(plot.current.getData()[0],
                               np.degrees(result.phase.current.angle_rad))
    used = sum(c.getData()[0] is not None and c.getData()[0].size > 0
               for c in plot.neighbours)
    assert used == len(result.phase.neighbours)
    np.testing.assert_allclose(plot.separatrix.getData()[1],
                               np.degrees(result.phase.separatrix.angular_velocity_rad_s))


def test_period_curve_marks_the_working_arc(qtbot, results) -> None:  # type: ignore[no-untyped-def]
    result, _ = results
    plot = PeriodCurvePlot()
    qtbot.addWidget(plot)
    plot.show_result(result)
    np.testing.assert_allclose(plot.period.getData()[1], result.period_curve.period_s)
    np.testing.assert_allclose(plot.error.getData()[1],
                               result.period_curve.circular_error_s_per_day)
    assert plot.marker.value() == pytest.approx(1.6)


@pytest.mark.parametrize("cls", PLOT_CLASSES)
def test_export_png_and_svg(qtbot, results, tmp_path: Path, cls) -> None:  # type: ignore[no-untyped-def]
    plot = cls()
    qtbot.addWidget(plot)
    plot.resize(800, 500)
    plot.show_result(results[0], results[1])
    png = export_plot(plot, tmp_path / f"{plot.slug}.png")
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    image = QImage(str(png))
    assert not image.isNull() and image.width() >= 1200
    svg = export_plot(plot, tmp_path / f"{plot.slug}.svg")
    root = ET.parse(svg).getroot()
    assert root.tag.endswith("svg") and len(list(root.iter())) > 10


def test_export_refuses_other_formats(qtbot, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
    plot = MotionPlot()
    qtbot.addWidget(plot)
    with pytest.raises(ValueError, match=".png or .svg"):
        export_plot(plot, tmp_path / "motion.jpg")


def test_a_shown_plot_closes_cleanly(qtbot, results) -> None:  # type: ignore[no-untyped-def]
    for cls in PLOT_CLASSES:
        plot = cls()
        plot.show()
        plot.show_result(results[0])
        plot.close()  # pyqtgraph's close must not touch the deleted legend
