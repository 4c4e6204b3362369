"""The sweep tab and the swing preview in inch-pound: what is shown follows the window's unit
system, what is computed stays SI.

Unit factors: the international inch is exactly 25.4 mm and the foot 12 in (the 1959
international yard and pound agreement; NIST SP 811, appendix B).
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest
from PySide6.QtCore import Qt

from app.form.units import UnitSystem
from app.views.sweep import SweepPlot
from app.views.swing_preview import SwingPreview, SwingPreviewControls
from core import analyse, load_design
from core.solve import sweep_field

EXAMPLES = Path(__file__).resolve().parents[2] / "resources" / "examples"
INCH_M = 0.0254  # NIST SP 811: 1 in = 0.0254 m exactly
FOOT_M = 0.3048  # NIST SP 811: 1 ft = 0.3048 m exactly
ROD_M = 1.1131  # workshop regulator: invar rod length, m (example file)
IP, METRIC = UnitSystem.INCH_POUND, UnitSystem.METRIC


@pytest.fixture(scope="module")
def regulator():  # type: ignore[no-untyped-def]
    return analyse(load_design(EXAMPLES / "workshop_regulator.pendulum.json"))


@pytest.fixture(scope="module")
def hall():  # type: ignore[no-untyped-def]
    """The science-hall exhibit: a floor and a barrier."""
    return analyse(load_design(EXAMPLES / "science_hall_pendulum.pendulum.json"))


@pytest.fixture
def sweep(qtbot, regulator):  # type: ignore[no-untyped-def]
    plot = SweepPlot()
    qtbot.addWidget(plot)
    plot.resize(700, 480)
    plot.show_result(regulator)
    plot.set_field("parts[0].length_m")
    return plot


def _type(qtbot, box, text: str) -> None:  # type: ignore[no-untyped-def]
    """Type ``text`` into a spin box as a person would, and press Enter."""
    box.lineEdit().selectAll()
    qtbot.keyClicks(box.lineEdit(), text)
    qtbot.keyClick(box.lineEdit(), Qt.Key.Key_Return)


class TestSweepInInchPound:
    def test_the_axis_range_marks_and_field_list_change_to_inches(self, sweep):
        assert sweep.plotItem.getAxis("bottom").labelText.endswith("(m)")
        before = sweep.sweep_range()
        sweep.set_unit_system(IP)
        axis = sweep.plotItem.getAxis("bottom")
        assert axis.labelText.endswith("(in)")
        assert axis.scale == pytest.approx(1 / INCH_M, rel=1e-12)  # ticks numbered in inches
        assert sweep.unit_label.text() == "in"
        items = [sweep.field_box.itemText(i) for i in range(sweep.field_box.count())]
        assert any(t.endswith("(in)") for t in items) and any(t.endswith("(lb)") for t in items)
        assert not any(t.endswith("(m)") or t.endswith("(kg)") for t in items)
        # the boxes show the same range in inches; the range swept does not move
        assert sweep.start_box.value() == pytest.approx(before[0] / INCH_M, abs=1e-6)
        assert sweep.sweep_range() == before
        assert sweep.marker_text().startswith(f"now {ROD_M / INCH_M:.2f} in:")

    def test_a_range_typed_in_inches_sweeps_the_same_range_in_metres(self, qtbot, sweep,
                                                                     regulator):
        sweep.set_unit_system(IP)
        _type(qtbot, sweep.start_box, "39.37")
        _type(qtbot, sweep.stop_box, "47.24")
        start, stop = sweep.sweep_range()
        assert start == pytest.approx(1.0, abs=1e-4)  # 39.37 in ≈ 1 m
        assert stop == pytest.approx(47.24 * INCH_M, rel=1e-12)
        sweep.sweep_now()
        assert sweep.table is not None
        assert sweep.table.values[0] == pytest.approx(39.37 * INCH_M, rel=1e-12)
        expected = sweep_field(regulator.design, "parts[0].length_m", start, stop,
                               len(sweep.table.values))
        np.testing.assert_allclose(sweep.table.period_s, expected.period_s, rtol=1e-12)
        # back in metric the typed range stays, shown in metres
        sweep.set_unit_system(METRIC)
        assert sweep.plotItem.getAxis("bottom").labelText.endswith("(m)")
        assert sweep.start_box.value() == pytest.approx(1.0, abs=1e-4)
        assert sweep.sweep_range() == (start, stop)

    def test_the_pivot_sweep_marks_the_conjugate_in_inches(self, sweep, regulator):
        sweep.set_unit_system(IP)
        sweep.set_field("pivot")
        sweep.sweep_now()
        centre_in = regulator.centre_of_oscillation_m / INCH_M
        assert sweep.conjugate_text() == f"conjugate pivot {centre_in:.4f} in"
        assert sweep.least_text().endswith(" in")

    def test_the_window_passes_its_choice_to_the_sweep(self, window):  # type: ignore[no-untyped-def]
        plot = next(p for p in window.plots if isinstance(p, SweepPlot))
        window.plot_area.show_plot(window.plots.index(plot))  # a plot on view is drawn
        window.set_unit_system(IP)
        assert plot.unit_label.text() in ("in", "lb")
        window.set_unit_system(METRIC)
        assert plot.unit_label.text() in ("m", "kg")


class TestPreviewInInchPound:
    @pytest.fixture
    def preview(self, qtbot):  # type: ignore[no-untyped-def]
        view = SwingPreview()
        qtbot.addWidget(view)
        view.resize(800, 520)
        yield view
        view.set_playing(False)

    def test_a_clock_pendulum_is_drawn_in_inches_an_exhibit_in_feet(self, preview, regulator,
                                                                    hall):
        preview.show_result(regulator)
        left = preview.getPlotItem().getAxis("left")
        assert left.labelUnits == "m" and left.scale == 1.0
        preview.set_unit_system(IP)
        assert left.labelUnits == "in"
        assert left.scale == pytest.approx(1 / INCH_M, rel=1e-12)
        assert preview.getPlotItem().getAxis("bottom").labelUnits == "in"
        preview.show_result(hall)  # metres deep: feet
        assert left.labelUnits == "ft"
        assert left.scale == pytest.approx(1 / FOOT_M, rel=1e-12)
        assert " ft below pivot" in preview._site.label.textItem.toPlainText()
        assert " m " not in preview._site.label.textItem.toPlainText()

    def test_the_line_depth_is_typed_in_the_display_unit(self, qtbot, preview, regulator):
        preview.show_result(regulator)
        controls = SwingPreviewControls(preview)
        qtbot.addWidget(controls)
        preview.set_unit_system(IP)
        controls.set_unit(preview.axis_unit())
        assert controls.line_depth.suffix() == " in"
        controls.line_check.setChecked(True)
        controls.line_depth.setValue(60.0)
        assert preview.clearance_line_m() == pytest.approx(60.0 * INCH_M, rel=1e-12)
        controls.set_unit(preview.axis_unit())  # the same unit again: the line stays put
        assert controls.line_depth.value() == pytest.approx(60.0)
