"""The swing preview: drawn to scale from the design, posed by the exact motion, animated by a
timer that only rotates existing items and can be stopped."""

from __future__ import annotations

import math
import os
from pathlib import Path

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

import numpy as np
import pytest
from PySide6 import QtCore

from app import theme
from app.views.swing_preview import (
    CAUTION_MARGIN_PX,
    SPEEDS,
    SwingPreview,
    SwingPreviewControls,
)
from core import analyse, design_from_dict, load_design, with_value
from core.analysis import LOAD_CAUTION
from core.fileformat import design_to_dict

EXAMPLES = Path(__file__).resolve().parents[2] / "resources" / "examples"


@pytest.fixture(scope="module")
def atrium():
    return analyse(load_design(EXAMPLES / "atrium_pendulum.pendulum.json"))


@pytest.fixture(scope="module")
def regulator():
    return analyse(load_design(EXAMPLES / "workshop_regulator.pendulum.json"))


@pytest.fixture
def preview(qtbot):
    view = SwingPreview()
    qtbot.addWidget(view)
    view.resize(800, 520)
    yield view
    view.set_playing(False)
    assert not view.is_playing()


def _bob_design(shape: str, centre_m: float = 0.9, **size: float) -> dict:
    """A 1 m steel rod with a 0.2 m brass bob of ``shape`` clamped at ``centre_m``; no
    damping."""
    bob = {"kind": "bob", "name": "bob", "shape": shape, "material": "brass",
           "mount": {"kind": "clamp", "on": "rod", "centre_m": centre_m}, "diameter_m": 0.2,
           "mass_kg": None, **size}
    return {"format": "penduline-design", "version": 1, "name": f"{shape} test",
            "reference_temperature_c": 20.0,
            "site": {"latitude_deg": 45.0, "elevation_m": 0.0, "g_m_s2": None,
                     "temperature_c": 20.0, "pressure_hpa": 1013.25},
            "parts": [{"kind": "rod", "name": "rod", "material": "steel", "top_m": 0.0,
                       "length_m": 1.0, "diameter_m": 0.01, "mass_kg": None}, bob],
            "swing": {"amplitude_deg": 20.0, "quality_factor": None}}


class TestDrawnGeometry:
    def test_atrium_matches_the_design_file(self, preview, atrium):
        # Design file: 18 m wire of 2.5 mm from the pivot; 0.32 m sphere centred at 18.15 m.
        # Site 2 K below the reference temperature: steel shrinks by 11.5e-6/K · 2 K ≈ 2.3e-5.
        preview.show_result(atrium)
        ext = preview.drawn_extents()
        assert set(ext) == {"wire", "sphere"}
        top, bottom, width = ext["wire"]
        assert top == 0.0
        assert bottom == pytest.approx(18.0, rel=1e-4)
        assert width == pytest.approx(0.0025, rel=1e-4)
        top, bottom, width = ext["sphere"]
        assert width == pytest.approx(0.32, rel=1e-4)
        assert bottom - top == pytest.approx(0.32, rel=1e-4)
        assert 0.5 * (top + bottom) == pytest.approx(18.15, rel=1e-4)
        assert preview.drawn_shape("wire") == "rectangle"
        assert preview.drawn_shape("sphere") == "circle"

    def test_every_part_matches_its_body(self, preview, regulator):
        preview.show_result(regulator)
        ext = preview.drawn_extents()
        for body in regulator.bodies:
            top, bottom, width = ext[body.name]
            assert (top, bottom, width) == pytest.approx(
                (body.top_m, body.bottom_m, body.width_m), abs=1e-12)

    def test_regulator_stack(self, preview, regulator):
        # Workshop regulator file: invar rod 1.1131 m × 8 mm; steel sleeve 55 mm × 20 mm on
        # the rod end; 110 × 120 mm cylinder bob resting on the sleeve; trim weight at 0.45 m.
        preview.show_result(regulator)
        ext = preview.drawn_extents()
        assert ext["rod"] == pytest.approx((0.0, 1.1131, 0.008), abs=1e-9)
        assert ext["sleeve"] == pytest.approx((1.1131 - 0.055, 1.1131, 0.02), abs=1e-9)
        assert ext["bob"] == pytest.approx((1.1131 - 0.055 - 0.12, 1.1131 - 0.055, 0.11),
                                           abs=1e-9)
        assert ext["trim"] == pytest.approx((0.45, 0.45, 0.0), abs=1e-9)
        assert [preview.drawn_shape(n) for n in ("rod", "sleeve", "bob", "trim")] == [
            "rectangle", "rectangle", "rectangle", "point"]

    @pytest.mark.parametrize("shape, size, drawn", [
        ("disc", {"thickness_m": 0.03}, "circle"),
        ("lens", {"thickness_m": 0.04}, "circle"),
        ("sphere", {}, "circle"),
        ("cylinder", {"height_m": 0.15}, "rectangle"),
    ])
    def test_bob_shapes(self, preview, shape, size, drawn):
        result = analyse(design_from_dict(_bob_design(shape, **size)))
        preview.show_result(result)
        top, bottom, width = preview.drawn_extents()["bob"]
        assert preview.drawn_shape("bob") == drawn
        assert width == pytest.approx(0.2, abs=1e-12)
        height = size.get("height_m", 0.2)  # disc and lens are seen face-on: a 0.2 m circle
        assert bottom - top == pytest.approx(height, abs=1e-12)
        assert 0.5 * (top + bottom) == pytest.approx(0.9, abs=1e-12)

    def test_deepest_point_of_a_wide_cylinder_is_a_corner(self, preview):
        # Cylinder 0.2 m wide centred at 0.95 m, 0.15 m high: bottom at 1.025 m, below the
        # rod's end. Its corner at radius √(1.025² + 0.1²) is reached at 5.57° < 20° (plain
        # geometry); the preview shows the core's figure.
        result = analyse(design_from_dict(_bob_design("cylinder", 0.95, height_m=0.15)))
        preview.show_result(result)
        assert preview.deepest_point_m() == pytest.approx(math.hypot(1.025, 0.1), rel=1e-12)
        assert preview.deepest_point_m() == result.geometry.lowest_point_m

    def test_atrium_deepest_point_is_the_exhibit_figure(self, preview, atrium):
        preview.show_result(atrium)
        assert preview.deepest_point_m() == pytest.approx(atrium.exhibit.lowest_point_m,
                                                          rel=1e-12)


class TestPose:
    def test_release_pose_is_the_full_semi_arc_to_the_right(self, preview, atrium):
        preview.show_result(atrium)
        preview.set_time(0.0)
        theta0 = math.radians(atrium.amplitude_deg)
        assert preview.shown_angle_rad() == pytest.approx(theta0, rel=1e-9)
        r = next(b for b in atrium.bodies if b.kind == "bob").centre_m
        x, y = preview.drawn_point("sphere")
        assert x == pytest.approx(r * math.sin(theta0), rel=1e-9)
        assert y == pytest.approx(r * math.cos(theta0), rel=1e-9)

    def test_angles_are_the_core_motion_samples(self, preview, atrium):
        preview.show_result(atrium)
        m = atrium.motion
        for i in (0, 57, 300, 611, 1199):
            preview.set_time(float(m.time_s[i]))
            assert preview.shown_angle_rad() == pytest.approx(float(m.angle_rad[i]),
                                                              abs=1e-12)
        # Damped (Q given): the sampled span is played from release, then starts again.
        preview.set_time(float(m.time_s[-1]) + float(m.time_s[57]))
        assert preview.shown_angle_rad() == pytest.approx(float(m.angle_rad[57]), abs=1e-12)

    def test_undamped_motion_repeats_every_period(self, preview, regulator):
        undamped = analyse(with_value(regulator.design, "swing.quality_factor", None))
        preview.show_result(undamped)
        t = np.linspace(0.0, undamped.period_s, 37)
        now = [preview.angle_at(x) for x in t]
        later = [preview.angle_at(x + 5 * undamped.period_s) for x in t]
        assert later == pytest.approx(now, abs=1e-12)
        assert preview.angle_at(0.5 * undamped.period_s) == pytest.approx(
            -math.radians(undamped.amplitude_deg), rel=1e-9)

    def test_baseline_is_a_ghost(self, preview, regulator):
        longer = analyse(with_value(regulator.design, "parts[0].length_m", 1.2))
        preview.show_result(regulator, longer)
        assert preview.shows_baseline
        assert "baseline" in preview.info_text()
        preview.show_result(regulator)
        assert not preview.shows_baseline


class TestReuse:
    """A new result with the same parts moves the items made for the last one; only a new
    set of parts makes new ones."""

    @staticmethod
    def _part_items(preview):  # type: ignore[no-untyped-def]
        return {name: id(item) for name, item in preview._drawing.items.items()}

    def test_a_geometry_change_moves_the_same_items(self, preview, regulator):
        preview.show_result(regulator)
        before = self._part_items(preview)
        scene_before = set(map(id, preview.scene().items()))
        longer = analyse(with_value(regulator.design, "parts[0].length_m", 1.2))
        preview.show_result(longer)
        assert self._part_items(preview) == before
        assert set(map(id, preview.scene().items())) == scene_before
        ext = preview.drawn_extents()
        for body in longer.bodies:  # drawn where the new result puts them
            assert ext[body.name] == pytest.approx((body.top_m, body.bottom_m, body.width_m),
                                                   abs=1e-12)
        assert preview.deepest_point_m() >= longer.exhibit.lowest_point_m

    def test_a_new_shape_or_part_makes_new_items(self, preview):
        disc = analyse(design_from_dict(_bob_design("disc", thickness_m=0.03)))
        preview.show_result(disc)
        before = self._part_items(preview)
        sphere = analyse(design_from_dict(_bob_design("sphere")))
        preview.show_result(sphere)
        assert preview.drawn_shape("bob") == "circle"
        assert self._part_items(preview)["bob"] != before["bob"]
        d = _bob_design("cylinder", height_m=0.15)
        d["parts"].append({"kind": "weight", "name": "trim", "mass_kg": 0.01, "at_m": 0.4,
                           "on": "rod"})
        preview.show_result(analyse(design_from_dict(d)))
        assert set(preview.drawn_extents()) == {"rod", "bob", "trim"}
        assert preview.drawn_shape("bob") == "rectangle"
        assert preview.drawn_extents()["trim"] == pytest.approx((0.4, 0.4, 0.0), abs=1e-12)

    def test_the_ghost_follows_its_own_parts(self, preview, regulator):
        longer = analyse(with_value(regulator.design, "parts[0].length_m", 1.2))
        preview.show_result(regulator, longer)
        ghost_items = {name: id(item) for name, item in preview._ghost.items.items()}
        rod = preview._ghost.items["rod"].rect()
        assert rod.bottom() == pytest.approx(
            next(b.bottom_m for b in longer.bodies if b.name == "rod"), abs=1e-12)
        preview.show_result(analyse(with_value(regulator.design, "parts[0].length_m", 1.15)),
                            longer)
        assert {n: id(i) for n, i in preview._ghost.items.items()} == ghost_items


class TestFitsASmallPane:
    def test_the_caution_wraps_to_the_width(self, qtbot, atrium):
        # A quarter of the centre area at 1280×800 is about 310 × 300 px.
        view = SwingPreview()
        qtbot.addWidget(view)
        view.setAttribute(QtCore.Qt.WidgetAttribute.WA_DontShowOnScreen, True)
        view.resize(310, 300)
        view.show()
        view.show_result(atrium)
        qtbot.waitExposed(view)
        caution = view._caution
        assert caution.item.textWidth() == 310 - CAUTION_MARGIN_PX
        assert caution.item.boundingRect().width() <= 310 - CAUTION_MARGIN_PX + 1
        assert view.getPlotItem().sceneBoundingRect().width() <= 310
        assert view.getPlotItem().getViewBox().sceneBoundingRect().height() > 80
        assert LOAD_CAUTION in view.caution_text()


class TestAnimation:
    def test_speed_factors(self, preview, regulator):
        preview.show_result(regulator)
        assert SPEEDS == (1.0, 0.5, 0.25, 0.1)
        preview.set_speed(0.25)
        preview.set_time(0.0)
        preview.advance(0.2)
        assert preview.time_s == pytest.approx(0.05, abs=1e-15)
        preview.set_speed(0.1)
        preview.advance(0.2)
        assert preview.time_s == pytest.approx(0.07, abs=1e-15)
        assert preview.shown_angle_rad() == pytest.approx(preview.angle_at(0.07), abs=1e-15)
        # the speed is the window's state: the control bar shows it, the drawing does not
        assert "1/10×" not in preview.info_text() and "nimation" not in preview.info_text()
        with pytest.raises(ValueError, match="speed"):
            preview.set_speed(2.0)

    def test_timer_runs_rotates_only_and_stops(self, qtbot, preview, atrium):
        preview.show_result(atrium)
        preview.set_time(0.0)
        items_before = set(map(id, preview.scene().items()))
        with qtbot.waitSignal(preview.playingChanged):
            preview.set_playing(True)
        assert preview.is_playing()
        qtbot.waitUntil(lambda: preview.time_s > 0.05, timeout=5000)
        assert set(map(id, preview.scene().items())) == items_before
        assert preview.shown_angle_rad() == pytest.approx(preview.angle_at(preview.time_s),
                                                          abs=1e-15)
        preview.set_playing(False)
        assert not preview.is_playing()
        stopped_at = preview.time_s
        qtbot.wait(50)
        assert preview.time_s == stopped_at


class FakeClock:
    """A clock moved by hand: the animation's only source of time in the tests below."""

    def __init__(self, start_s: float = 1000.0) -> None:
        self.now = start_s

    def now_s(self) -> float:
        return self.now

    def forward(self, seconds: float) -> None:
        self.now += seconds


def exact_angle(result, swing_time_s: float) -> float:
    """The core's exact angle ``swing_time_s`` after release of an undamped design: its
    sampled motion (three periods from rest at θ₀) interpolated at the time modulo the
    period."""
    m = result.motion
    return float(np.interp(math.fmod(swing_time_s, result.period_s), m.time_s, m.angle_rad))


@pytest.fixture(scope="module")
def undamped(regulator):  # type: ignore[no-untyped-def]
    """The regulator without damping: its motion repeats every period."""
    result = analyse(with_value(regulator.design, "swing.quality_factor", None))
    assert result.period_s == pytest.approx(2.0, abs=1e-3)  # a seconds pendulum
    return result


class TestTrueSpeed:
    """The animation clock runs at true speed: the pose drawn after t seconds of (fake) wall
    time is the exact pose at speed × t, however the frames fall."""

    @pytest.fixture
    def clock(self) -> FakeClock:
        return FakeClock()

    @pytest.fixture
    def timed(self, qtbot, clock):
        view = SwingPreview(clock=clock)
        qtbot.addWidget(view)
        view.resize(800, 520)
        yield view
        view.set_playing(False)

    @pytest.mark.parametrize("speed", [1.0, 0.5])
    @pytest.mark.parametrize("wall_s", [0.37, 1.0, 2.9, 61.3])
    def test_pose_after_t_is_the_exact_pose_at_speed_times_t(self, timed, clock, undamped,
                                                             speed, wall_s):
        timed.show_result(undamped)
        timed.set_speed(speed)
        timed.set_time(0.0)
        timed.set_playing(True)
        clock.forward(wall_s)
        timed.draw_frame()
        assert timed.time_s == pytest.approx(speed * wall_s, rel=1e-12)
        assert timed.shown_angle_rad() == pytest.approx(exact_angle(undamped, speed * wall_s),
                                                        abs=1e-6)

    def test_half_a_period_of_wall_time_swings_to_the_other_side(self, timed, clock,
                                                                 undamped):
        theta0 = math.radians(undamped.amplitude_deg)
        timed.show_result(undamped)
        timed.set_time(0.0)
        timed.set_playing(True)
        clock.forward(0.5 * undamped.period_s)
        timed.draw_frame()
        assert timed.shown_angle_rad() == pytest.approx(-theta0, abs=1e-6)
        timed.set_speed(0.5)  # at ½× the next half period of wall time is a quarter swing
        clock.forward(0.5 * undamped.period_s)
        timed.draw_frame()
        assert timed.shown_angle_rad() == pytest.approx(0.0, abs=1e-6)

    def test_late_frames_and_a_stall_do_not_slow_the_swing(self, timed, clock, undamped):
        timed.show_result(undamped)
        timed.set_time(0.0)
        timed.set_playing(True)
        wall = 0.0
        # Frames late and uneven (a busy event loop), then a 0.9 s stall (a long drag step).
        for step in [0.016, 0.021, 0.048, 0.9, 0.016, 0.033, 0.250, 0.017]:
            clock.forward(step)
            wall += step
            timed.draw_frame()
            assert timed.time_s == pytest.approx(wall, rel=1e-12)
            assert timed.shown_angle_rad() == pytest.approx(exact_angle(undamped, wall),
                                                            abs=1e-6)

    def test_a_change_of_speed_keeps_the_time_already_swung(self, timed, clock, undamped):
        timed.show_result(undamped)
        timed.set_time(0.0)
        timed.set_playing(True)
        clock.forward(1.3)  # 1.3 s at 1×, then 2 s at ½×: 2.3 s of swing
        timed.set_speed(0.5)
        clock.forward(2.0)
        timed.draw_frame()
        assert timed.time_s == pytest.approx(2.3, rel=1e-12)
        assert timed.shown_angle_rad() == pytest.approx(exact_angle(undamped, 2.3), abs=1e-6)

    def test_paused_and_hidden_time_does_not_count(self, timed, clock, undamped):
        timed.setAttribute(QtCore.Qt.WidgetAttribute.WA_DontShowOnScreen, True)
        timed.show()
        timed.show_result(undamped)
        timed.set_time(0.0)
        timed.set_playing(True)
        clock.forward(0.4)
        timed.set_playing(False)  # paused where the swing is at 0.4 s
        assert timed.shown_angle_rad() == pytest.approx(exact_angle(undamped, 0.4), abs=1e-6)
        clock.forward(5.0)
        timed.draw_frame()
        assert timed.time_s == pytest.approx(0.4, rel=1e-12)
        timed.set_playing(True)
        clock.forward(0.25)
        timed.hide()  # another tab chosen: the swing holds at 0.65 s
        clock.forward(7.0)
        timed.set_speed(0.5)  # changed while hidden: still no time passes
        timed.set_speed(1.0)
        timed.show()
        clock.forward(0.1)
        timed.draw_frame()
        assert timed.time_s == pytest.approx(0.75, rel=1e-12)
        assert timed.shown_angle_rad() == pytest.approx(exact_angle(undamped, 0.75), abs=1e-6)

    def test_the_frame_timer_poses_from_the_clock(self, qtbot, timed, clock, undamped):
        timed.show_result(undamped)
        timed.set_time(0.0)
        timed.set_playing(True)
        clock.forward(1.234)
        qtbot.waitUntil(lambda: abs(timed.time_s - 1.234) < 1e-9, timeout=5000)  # next frame
        assert timed.shown_angle_rad() == pytest.approx(exact_angle(undamped, 1.234),
                                                        abs=1e-6)

    def test_a_damped_swing_plays_its_sampled_motion_at_true_speed(self, timed, clock,
                                                                   atrium):
        m = atrium.motion  # Q given: no repetition within the sampled span
        timed.show_result(atrium)
        timed.set_time(0.0)
        timed.set_playing(True)
        wall = 0.0
        for wall_s in (3.1, 9.7, 0.5 * float(m.time_s[-1])):
            clock.forward(wall_s - wall)
            wall = wall_s
            timed.draw_frame()
            assert timed.shown_angle_rad() == pytest.approx(
                float(np.interp(wall_s, m.time_s, m.angle_rad)), abs=1e-6)


class TestClearanceAndCaution:
    def test_clearance_line(self, preview, atrium):
        preview.show_result(atrium)
        lowest = atrium.exhibit.lowest_point_m  # 18.3096 m
        assert preview.clearance_m() is None
        preview.set_clearance_line(lowest + 0.5)
        assert preview.clearance_m() == pytest.approx(0.5, abs=1e-12)
        assert not preview.clearance_reached()
        assert preview.clearance_colour() == theme.MARKER.lower()
        preview.set_clearance_line(lowest - 0.1)
        assert preview.clearance_m() == pytest.approx(-0.1, abs=1e-12)
        assert preview.clearance_reached()
        assert preview.clearance_colour() == theme.PROBLEM.lower()
        preview.set_clearance_line(None)
        assert preview.clearance_line_m() is None

    def test_load_is_shown_with_its_caution(self, preview, atrium):
        preview.show_result(atrium)
        assert f"{atrium.max_pivot_load_n:.4g} N" in preview.info_text()
        assert LOAD_CAUTION in preview.caution_text()

    def test_spring_caution_for_a_spring_suspension(self, preview):
        d = _bob_design("sphere")
        d["suspension"] = {"kind": "spring", "stiffness_n_m_per_rad": 0.5}
        preview.show_result(analyse(design_from_dict(d)))
        assert "Suspension-spring" in preview.caution_text()


def test_controls_drive_the_preview(qtbot, preview, atrium):
    preview.show_result(atrium)
    controls = SwingPreviewControls(preview)
    qtbot.addWidget(controls)
    controls.play_button.click()
    assert preview.is_playing() and controls.play_button.text() == "Pause"
    controls.play_button.click()
    assert not preview.is_playing() and controls.play_button.text() == "Play"
    controls.speed_box.setCurrentIndex(2)
    assert preview.speed == 0.25
    preview.set_speed(0.1)
    assert controls.speed_box.currentText() == "1/10×"
    controls.line_check.setChecked(True)  # proposes a line 0.5 m below the deepest point
    expected = round(atrium.exhibit.lowest_point_m + 0.5, 3)  # 18.810 m
    assert preview.clearance_line_m() == pytest.approx(expected, abs=1e-9)
    controls.line_depth.setValue(18.0)
    assert preview.clearance_reached()
    controls.line_check.setChecked(False)
    assert preview.clearance_m() is None


def test_design_round_trip_of_the_atrium_example():
    # The exhibit example is a valid format-1 file and keeps its values through a round trip.
    design = load_design(EXAMPLES / "atrium_pendulum.pendulum.json")
    assert design_from_dict(design_to_dict(design)) == design


def test_window_preview_has_play_and_speed_controls(window, qtbot) -> None:  # type: ignore[no-untyped-def]
    """A newcomer finds play/pause and speed on the preview itself, not only in its menu."""
    window.show()
    window.plot_area.show_plot(3)
    preview = window.plots[3]
    qtbot.waitExposed(preview)
    controls = preview.controls
    assert controls.isVisible() and controls.geometry().top() == 0
    controls.speed_box.setCurrentIndex(controls.speed_box.findData(0.5))
    assert preview.speed == 0.5
    controls.play_button.setChecked(True)
    assert preview.is_playing()
    controls.play_button.setChecked(False)
    assert not preview.is_playing()


def test_the_load_caution_only_where_the_core_gives_it(qtbot, regulator):  # type: ignore[no-untyped-def]
    from core.analysis import LOAD_CAUTION_MASS_KG

    view = SwingPreview()
    qtbot.addWidget(view)
    # the regulator, 9.1 kg and 1.1 m long, is below the core's threshold for the caution
    assert regulator.mass_kg < LOAD_CAUTION_MASS_KG
    view.show_result(regulator)
    assert LOAD_CAUTION not in regulator.cautions and view.caution_text() == ""


def test_a_rod_thinner_than_two_pixels_is_outlined_not_filled(qtbot, atrium, regulator):  # type: ignore[no-untyped-def]
    # a filled rectangle under a pixel wide, rotated, leaves a faint streak beside it
    view = SwingPreview()
    qtbot.addWidget(view)
    view.resize(700, 760)
    view.show_result(atrium)  # a 2.5 mm wire in a view some 20 m across: far under a pixel
    assert not view._drawing.is_filled("wire")
    view.show_result(regulator)  # an 8 mm rod in a view about 1.3 m across: several pixels
    assert view._drawing.is_filled("rod")
