"""The plot widgets: the API the exporter shares, data drawn from the result, exports."""

from __future__ import annotations

import re
import xml.etree.ElementTree as ET
from pathlib import Path

import numpy as np
import pytest
from PySide6.QtCore import QPointF, Qt
from PySide6.QtGui import QImage
from PySide6.QtWidgets import QLabel

from app import theme
from app.views.catalogue import PLOT_CLASSES
from app.views.chart import SMALL_PANE_TICK_DENSITY
from app.views.motion import MotionPlot
from app.views.period_curve import PeriodCurvePlot
from app.views.phase import PhasePlot
from app.views.plot_export import export_plot
from core import analyse, load_design, with_value

EXAMPLE = (Path(__file__).resolve().parents[2]
           / "resources/examples/workshop_regulator.pendulum.json")


def _laid_out(widget, width: int, height: int):  # type: ignore[no-untyped-def]
    """Size ``widget`` and lay it out as shown, without putting it on any screen."""
    widget.setAttribute(Qt.WidgetAttribute.WA_DontShowOnScreen, True)
    widget.resize(width, height)
    widget.show()
    return widget


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
    # a damped swing is drawn as the core's motion from release (angle, angular velocity)
    assert result.design.swing.quality_factor is not None
    np.testing.assert_allclose(plot.current.getData()[0], np.degrees(result.motion.angle_rad))
    np.testing.assert_allclose(plot.current.getData()[1],
                               np.degrees(result.motion.angular_velocity_rad_s))
    used = sum(c.getData()[0] is not None and c.getData()[0].size > 0
               for c in plot.neighbours)
    assert used == len(result.phase.neighbours)
    np.testing.assert_allclose(plot.separatrix.getData()[1],
                               np.degrees(result.phase.separatrix.angular_velocity_rad_s))


class TestPeriodCurve:
    def test_one_quantity_at_a_time_from_the_core_curve(self, qtbot, results) -> None:  # type: ignore[no-untyped-def]
        result, _ = results
        plot = PeriodCurvePlot()
        qtbot.addWidget(plot)
        plot.show_result(result)
        np.testing.assert_allclose(plot.period.getData()[1], result.period_curve.period_s)
        assert plot.quantity == "period"
        assert plot.period.isVisible() and not plot.error.isVisible()
        assert plot.getPlotItem().getAxis("left").labelText == "Period (s)"
        plot.quantity_box.setCurrentIndex(1)  # the person picks circular error
        assert plot.quantity == "circular_error"
        assert plot.error.isVisible() and not plot.period.isVisible()
        assert plot.getPlotItem().getAxis("left").labelText == "Circular error (s/day)"
        np.testing.assert_allclose(plot.shown_values(),
                                   result.period_curve.circular_error_s_per_day)
        np.testing.assert_allclose(plot.error.getData()[1],  # filled when chosen
                                   result.period_curve.circular_error_s_per_day)
        plot.quantity_box.setCurrentIndex(2)  # the rate against the target
        assert plot.quantity == "rate" and plot.rate.isVisible() and not plot.error.isVisible()
        np.testing.assert_allclose(plot.shown_values(), result.period_curve.rate_s_per_day)
        assert plot.dot.pos().y() == pytest.approx(result.rate_s_per_day)
        with pytest.raises(ValueError, match="quantity"):
            plot.set_quantity("beats")

    def test_rate_without_a_target_draws_nothing(self, qtbot, results) -> None:  # type: ignore[no-untyped-def]
        result, _ = results
        untargeted = analyse(with_value(result.design, "target.period_s", None))
        assert untargeted.period_curve.rate_s_per_day is None
        plot = PeriodCurvePlot()
        qtbot.addWidget(plot)
        plot.set_quantity("rate")
        plot.show_result(untargeted)
        assert np.isnan(plot.shown_values()).all()

    def test_working_arc_is_marked_on_the_curve_with_its_values(self, qtbot, results) -> None:  # type: ignore[no-untyped-def]
        result, _ = results  # workshop regulator: 1.6°, 1.999926 s, 4.211 s/day
        plot = PeriodCurvePlot()
        qtbot.addWidget(plot)
        plot.show_result(result)
        assert plot.marker.value() == pytest.approx(1.6)
        assert (plot.dot.pos().x(), plot.dot.pos().y()) == pytest.approx((1.6, result.period_s))
        assert plot.marker_text() == ("1.6°\n1.999926 s\n4.211 s/day lost to the arc\n"
                                      "(against vanishing arcs)")
        plot.set_quantity("circular_error")
        assert plot.dot.pos().y() == pytest.approx(result.circular_error_s_per_day)

    def test_near_and_whole_x_ranges(self, qtbot, results) -> None:  # type: ignore[no-untyped-def]
        result, baseline = results  # working arcs 1.6° and 5°
        plot = PeriodCurvePlot()
        qtbot.addWidget(plot)
        plot.resize(600, 400)
        plot.show_result(result)
        vb = plot.getPlotItem().vb
        lo, hi = vb.viewRange()[0]
        assert hi == pytest.approx(10.0 + 0.02 * 10.0, rel=1e-3)  # at least 10°, 2 % padding
        plot.show_result(baseline)
        assert vb.viewRange()[0][1] == pytest.approx(20.0 * 1.02, rel=1e-3)  # 4 × 5°
        plot.range_box.setCurrentIndex(1)  # whole range
        assert plot.x_range == "whole"
        lo, hi = vb.viewRange()[0]
        assert lo < 0.0 and hi == pytest.approx(180.0 * 1.02, rel=1e-3)
        y_lo, y_hi = vb.viewRange()[1]
        assert y_hi >= float(np.max(baseline.period_curve.period_s))  # 179.9° is on view
        with pytest.raises(ValueError, match="x range"):
            plot.set_x_range("far")

    def test_baseline_ghost_follows_the_quantity(self, qtbot, results) -> None:  # type: ignore[no-untyped-def]
        result, baseline = results
        plot = PeriodCurvePlot()
        qtbot.addWidget(plot)
        plot.show_result(result, baseline)
        np.testing.assert_allclose(plot.ghost.getData()[1], baseline.period_curve.period_s)
        plot.set_quantity("circular_error")
        np.testing.assert_allclose(plot.ghost.getData()[1],
                                   baseline.period_curve.circular_error_s_per_day)


class TestPhaseView:
    def test_separatrix_view_frames_plus_minus_180(self, qtbot, results) -> None:  # type: ignore[no-untyped-def]
        result, _ = results
        plot = PhasePlot()
        qtbot.addWidget(plot)
        plot.show_result(result)
        vb = plot.getPlotItem().vb
        # Orbits of the regulator reach 3 × 1.6° = 4.8°: framed with 8 % to spare.
        assert vb.viewRange()[0][1] == pytest.approx(4.8 * 1.08, rel=1e-9)
        plot.separatrix_box.setChecked(True)
        assert plot.shows_separatrix and plot.separatrix_action.isChecked()
        (x_lo, x_hi), (y_lo, y_hi) = vb.viewRange()
        assert (x_lo, x_hi) == pytest.approx((-180.0, 180.0), rel=1e-9)
        top = float(np.degrees(np.max(np.abs(result.phase.separatrix.angular_velocity_rad_s))))
        assert y_hi == pytest.approx(1.08 * top, rel=1e-9)
        plot.separatrix_action.setChecked(False)
        assert not plot.separatrix_box.isChecked()
        assert vb.viewRange()[0][1] == pytest.approx(4.8 * 1.08, rel=1e-9)

    def test_fewer_ticks_in_a_small_pane(self, qtbot, results) -> None:  # type: ignore[no-untyped-def]
        plot = PhasePlot()
        qtbot.addWidget(plot)
        _laid_out(plot, 900, 600)
        assert plot.tick_density == 1.0
        plot.resize(330, 280)
        assert plot.tick_density == SMALL_PANE_TICK_DENSITY
        assert plot.getPlotItem().getAxis("left")._tickDensity == SMALL_PANE_TICK_DENSITY


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


# ------------------------------------------------------------------ SVG geometry
_NUMBER = re.compile(r"-?\d+(?:\.\d+)?(?:e-?\d+)?")


def _matrix(transform: str) -> np.ndarray:
    a, b, c, d, e, f = (float(x) for x in _NUMBER.findall(transform))
    return np.array([[a, c, e], [b, d, f], [0.0, 0.0, 1.0]])


def _svg_elements(path: Path) -> list[tuple[str, dict, np.ndarray, str]]:
    """Every drawn element as (tag, attributes, points in document units, text), with the
    transforms of its enclosing groups applied."""
    out: list[tuple[str, dict, np.ndarray, str]] = []

    def walk(node: ET.Element, m: np.ndarray) -> None:
        if node.get("transform"):
            m = m @ _matrix(node.get("transform"))
        tag = node.tag.rsplit("}", 1)[-1]
        if tag in ("path", "polyline", "text"):
            if tag == "path":
                values = [float(v) for v in _NUMBER.findall(node.get("d", ""))]
            elif tag == "polyline":
                values = [float(v) for v in _NUMBER.findall(node.get("points", ""))]
            else:
                values = [float(node.get("x", 0)), float(node.get("y", 0))]
            xy = np.array(values, dtype=float).reshape(-1, 2)
            pts = (m @ np.vstack([xy.T, np.ones(len(xy))]))[:2].T
            out.append((tag, dict(node.attrib), pts, (node.text or "").strip()))
        for child in node:
            walk(child, m)

    walk(ET.parse(path).getroot(), np.eye(3))
    return out


def _size_px(root: ET.Element, dpi: float) -> tuple[float, float]:
    def px(value: str) -> float:
        number = float(_NUMBER.match(value).group())  # type: ignore[union-attr]
        return number / 25.4 * dpi if value.endswith("mm") else number
    return px(root.get("width", "")), px(root.get("height", ""))


class TestSvgGeometry:
    def test_axes_text_and_curves_share_one_frame(self, qtbot, results, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
        result, _ = results  # 3 periods of ≈ 2 s: time axis 0–6 s
        plot = MotionPlot()
        qtbot.addWidget(plot)
        _laid_out(plot, 800, 500)
        plot.show_result(result)
        svg = export_plot(plot, tmp_path / "motion.svg")
        root = ET.parse(svg).getroot()
        # The document is the widget's size in pixels at the screen's resolution.
        assert root.get("viewBox").split() == ["0", "0", "800", "500"]
        assert _size_px(root, plot.logicalDpiX()) == pytest.approx((800.0, 500.0), abs=0.5)
        elements = _svg_elements(svg)
        drawn = np.vstack([pts for tag, _a, pts, _t in elements if tag != "text"])
        assert drawn[:, 0].min() >= -1.0 and drawn[:, 0].max() <= 800.0
        assert drawn[:, 1].min() >= -1.0 and drawn[:, 1].max() <= 500.0
        # The exact curve lands where the plot maps its data on screen.
        vb = plot.getPlotItem().vb
        exact = [pts for tag, a, pts, _t in elements
                 if tag == "path" and a.get("stroke", "").lower() == theme.EXACT
                 or tag == "path" and len(pts) > 1000]
        assert exact, "the exact curve is in the drawing"
        first = vb.mapViewToScene(QPointF(0.0, float(np.degrees(result.motion.angle_rad[0]))))
        start = min(exact, key=lambda pts: abs(pts[0, 0] - first.x()))[0]
        assert start == pytest.approx((first.x(), first.y()), abs=1.0)
        # Each time-axis label sits under its own time on that same curve frame (at 72 dpi
        # the labels shrank towards the left: "6" landed ≈ 160 px short of 6 s).
        below_view = vb.sceneBoundingRect().bottom()
        labels = {t: pts[0] for tag, _a, pts, t in elements
                  if tag == "text" and t in {"1", "2", "3", "4", "5", "6"}
                  and below_view < pts[0, 1] < below_view + 40}
        assert set(labels) == {"1", "2", "3", "4", "5", "6"}
        for text, (x_left, _y) in labels.items():
            centre = vb.mapViewToScene(QPointF(float(text), 0.0)).x()
            assert x_left == pytest.approx(centre - 4.0, abs=6.0), text

    def test_plain_widget_svg_is_written_at_the_screen_resolution(self, qtbot,
                                                                  tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
        label = QLabel("Semi-arc")
        qtbot.addWidget(label)
        label.resize(320, 90)
        svg = export_plot(label, tmp_path / "label.svg")
        root = ET.parse(svg).getroot()
        assert root.get("viewBox").split() == ["0", "0", "320", "90"]
        assert _size_px(root, label.logicalDpiX()) == pytest.approx((320.0, 90.0), abs=0.5)


class TestLiveDrag:
    def test_axes_hold_still_while_results_stream_in(self, qtbot, results) -> None:  # type: ignore[no-untyped-def]
        result, _ = results
        plot = _laid_out(PhasePlot(), 600, 400)
        qtbot.addWidget(plot)
        plot._stream_timer.setInterval(60_000)  # the stream ends when the test says so
        vb = plot.getPlotItem().vb
        plot.show_result(result)  # the first result after a pause: framed exactly
        framed = vb.viewRange()
        assert framed[1][1] == pytest.approx(
            1.08 * float(np.degrees(max(np.max(np.abs(o.angular_velocity_rad_s))
                                        for o in (result.phase.current,
                                                  *result.phase.neighbours)))), rel=1e-9)
        slower = analyse(with_value(result.design, "parts[0].length_m", 1.12))
        plot.show_result(slower)  # a drag: slightly slower swings fit the axes as they are
        assert vb.viewRange() == framed
        far = analyse(with_value(result.design, "parts[0].length_m", 0.6))
        plot.show_result(far)  # outgrows them: new axes with room for the next steps
        y_top = 1.08 * float(np.degrees(max(np.max(np.abs(o.angular_velocity_rad_s))
                                            for o in (far.phase.current,
                                                      *far.phase.neighbours))))
        assert vb.viewRange()[1][1] == pytest.approx(y_top * 1.4, rel=1e-9)
        plot._stream_ended()  # the drag is over: framed exactly
        assert vb.viewRange()[1][1] == pytest.approx(y_top, rel=1e-9)
