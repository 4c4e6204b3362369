"""The pivot position control, the pivot figures in the readout and the pivot marks on the
swing preview (issue 17)."""

from __future__ import annotations

import math
from typing import Any

import pytest
from PySide6.QtCore import QPointF, Qt
from PySide6.QtWidgets import QApplication

from app.form.number_field import NumberField
from app.form.pivot_control import PIVOT_LABEL, pivot_below_rod_top_m
from app.form.units import METRES_PER_INCH, UnitSystem
from app.readout.readout_format import format_value
from app.views.swing_preview import SwingPreview
from app.window.main_window import MainWindow
from core import Design, design_to_dict

STEP_M = 0.001  # one metric step of a length field, m


def pivot_field(window: MainWindow) -> NumberField:
    return window.design_panel.pivot_control.row.field


def positions(design: Design) -> list[float]:
    """Every position measured from the pivot in the design's file form, in file order."""
    out: list[float] = []
    for part in design_to_dict(design)["parts"]:
        for key in ("top_m", "at_m", "centre_m"):
            if isinstance(part.get(key), float):
                out.append(part[key])
        mount: Any = part.get("mount")
        if isinstance(mount, dict) and isinstance(mount.get("centre_m"), float):
            out.append(mount["centre_m"])
    return out


def drag(window: MainWindow, steps: int) -> None:
    """Step the pivot like a drag (live previews), then end the run of steps."""
    field = pivot_field(window)
    app = QApplication.instance()
    for _ in range(abs(steps)):
        field.stepBy(1 if steps > 0 else -1)
        app.processEvents()
    field.finish_steps()
    app.processEvents()


def type_into(qtbot, field: NumberField, text: str) -> None:  # type: ignore[no-untyped-def]
    field.lineEdit().selectAll()
    qtbot.keyClicks(field, text)
    qtbot.keyClick(field, Qt.Key.Key_Return)


def wait_computed(qtbot, window: MainWindow) -> None:  # type: ignore[no-untyped-def]
    qtbot.waitUntil(lambda: window.result is not None
                    and window.result.design == window.document.design)


class TestPivotControl:
    def test_it_sits_in_the_suspension_group_reading_the_rod_top(self, window) -> None:  # type: ignore[no-untyped-def]
        control = window.design_panel.pivot_control
        assert control.label.text() == PIVOT_LABEL
        assert control.row.parentWidget().title() == "Suspension"  # type: ignore[attr-defined]
        # The example hangs its rod from its top: the pivot is 0 below it.
        assert pivot_field(window).value() == 0.0
        assert control.row.unit_label.text() == "m"

    def test_a_drag_moves_every_part_by_the_same_amount_in_one_undo_step(
            self, window, qtbot) -> None:  # type: ignore[no-untyped-def]
        before = window.document.design
        drag(window, 25)  # 25 mm down the body
        after = window.document.design
        assert pivot_field(window).value() == pytest.approx(0.025, abs=1e-12)
        moved = [b - a for a, b in zip(positions(before), positions(after), strict=True)]
        assert len(moved) >= 2
        assert moved == pytest.approx([-0.025] * len(moved), abs=1e-12)
        assert window.document.undo_stack.count() == 1
        assert window.document.undo_stack.undoText() == "Move pivot"
        # The drag was live: the window computed the moved design.
        wait_computed(qtbot, window)
        assert window.result.centre_of_mass_m == pytest.approx(
            analyse_of(before).centre_of_mass_m - 0.025, abs=1e-9)

    def test_undo_restores_every_position_exactly(self, window) -> None:  # type: ignore[no-untyped-def]
        before = window.document.design
        drag(window, 7)
        drag(window, -3)
        assert window.document.design != before
        window.document.undo_stack.undo()
        restored = window.document.design
        assert restored == before
        assert positions(restored) == positions(before)  # exactly, not approximately
        assert pivot_field(window).value() == 0.0

    def test_a_pivot_below_the_centre_of_mass_is_refused_and_the_design_kept(
            self, window, qtbot) -> None:  # type: ignore[no-untyped-def]
        before = window.document.design
        depth = window.result.centre_of_mass_m + 0.01
        type_into(qtbot, pivot_field(window), f"{depth:.4f}")
        problem = window.design_panel.pivot_control.row.problem()
        assert "centre of mass" in problem and problem.endswith("turn over")
        assert window.document.design == before
        assert window.document.undo_stack.count() == 0

    def test_a_pivot_above_the_body_is_refused(self, window, qtbot) -> None:  # type: ignore[no-untyped-def]
        before = window.document.design
        type_into(qtbot, pivot_field(window), "-0.05")
        assert "must sit on the body" in window.design_panel.pivot_control.row.problem()
        assert window.document.design == before

    def test_a_drag_that_runs_into_the_centre_of_mass_keeps_its_last_good_value(
            self, window) -> None:  # type: ignore[no-untyped-def]
        field = pivot_field(window)
        h = window.result.centre_of_mass_m
        field.set_live_value(h - 0.005)  # good
        QApplication.instance().processEvents()
        field.set_live_value(h + 0.005)  # refused
        field.finish_steps()
        assert pivot_below_rod_top_m(window.document.design) == pytest.approx(h - 0.005,
                                                                               abs=1e-12)
        assert window.document.undo_stack.count() == 1
        assert "centre of mass" in window.design_panel.pivot_control.row.problem()

    def test_inch_pound_shows_and_steps_inches(self, window) -> None:  # type: ignore[no-untyped-def]
        window.set_unit_system(UnitSystem.INCH_POUND)
        control = window.design_panel.pivot_control
        assert control.row.unit_label.text() == "in"
        drag(window, 2)  # two steps of 0.05 in
        assert control.row.field.text() == "0.1"
        # 1 in = 0.0254 m exactly (international inch, 1959 agreement).
        assert pivot_below_rod_top_m(window.document.design) == pytest.approx(
            0.1 * METRES_PER_INCH, abs=1e-12)
        assert window.document.design.parts[0].top_m == pytest.approx(-0.00254, abs=1e-12)


def analyse_of(design: Design):  # type: ignore[no-untyped-def]
    from core import analyse
    return analyse(design)


class TestPivotReadout:
    def test_radius_of_gyration_is_that_of_the_bodies_about_their_centre_of_mass(
            self, window) -> None:  # type: ignore[no-untyped-def]
        bodies = window.result.bodies
        mass = sum(b.mass_kg for b in bodies)
        h = sum(b.mass_kg * b.centre_m for b in bodies) / mass
        # Parallel-axis theorem (Steiner): I_cm = Σ (I_own + m d²), d from the centre of mass;
        # k_c = √(I_cm / M) (any mechanics text [pub, memory]).
        i_cm = sum(b.inertia_centre_kg_m2 + b.mass_kg * (b.centre_m - h) ** 2 for b in bodies)
        k_c = math.sqrt(i_cm / mass)
        assert window.readout.value_text("radius_of_gyration_m") == format_value(k_c, "{:.6f}")
        # A clock pendulum's k_c is some tenths of its length: a figure of the right size
        # (common practice, no source).
        assert 0.05 < k_c < 0.5 * h

    def test_every_pivot_figure_has_a_row_and_a_tooltip(self, window) -> None:  # type: ignore[no-untyped-def]
        from app.readout.readout_format import describe
        for key in ("radius_of_gyration_m", "shortest_period_pivot_m",
                    "shortest_period_small_s", "conjugate_pivot_m",
                    "pivot_sensitivity_s_per_day_per_mm"):
            assert window.readout.value_text(key) not in ("", "—")
            assert len(describe(key)) > 40
        assert "knife edge" in describe("shortest_period_pivot_m")

    def test_inch_pound_shows_the_radius_in_inches(self, window) -> None:  # type: ignore[no-untyped-def]
        window.set_unit_system(UnitSystem.INCH_POUND)
        k = window.result.pivot.radius_of_gyration_m
        # 1 in = 0.0254 m exactly (international inch).
        assert window.readout.value_text("radius_of_gyration_m") == format_value(
            k / 0.0254, "{:.6f}")


class TestPivotMarks:
    def test_the_preview_marks_the_centres_and_the_shortest_period_pivot(
            self, window, qtbot) -> None:  # type: ignore[no-untyped-def]
        preview = next(p for p in window.plots if isinstance(p, SwingPreview))
        preview.show_result(window.result)
        r = window.result
        depths = preview.marks.depths_m()
        assert depths["centre_of_mass"] == r.centre_of_mass_m
        assert depths["centre_of_oscillation"] == r.centre_of_oscillation_m
        assert depths["shortest_period_pivot"] == pytest.approx(
            r.centre_of_mass_m - r.pivot.shortest_period_pivot_m, abs=1e-15)
        assert preview.marks.key_names() == ["Centre of mass", "Centre of oscillation",
                                             "Shortest-period pivot"]
        key = preview.info_text()
        for glyph, name in (("◐", "centre of mass"), ("◇", "centre of oscillation"),
                            ("△", "shortest-period pivot")):
            assert f"{glyph} {name}" in key  # told apart by shape, not colour alone

    def test_the_marks_swing_with_the_body(self, window) -> None:  # type: ignore[no-untyped-def]
        preview = next(p for p in window.plots if isinstance(p, SwingPreview))
        preview.show_result(window.result)
        preview.set_playing(False)
        preview.set_time(0.0)  # released at the full semi-arc
        item = preview.marks.items["centre_of_mass"]
        depth = window.result.centre_of_mass_m
        shown = item.mapToItem(preview.getPlotItem().getViewBox().childGroup,
                               QPointF(0.0, 0.0))  # the point marked
        angle = preview.shown_angle_rad()
        assert abs(angle) > 0.0
        # Plain geometry: a point at depth d on an axis turned by θ sits d·sin θ across.
        assert shown.x() == pytest.approx(depth * math.sin(angle), rel=1e-6)
        assert shown.y() == pytest.approx(depth * math.cos(angle), rel=1e-6)
