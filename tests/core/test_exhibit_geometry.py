"""Reference tests for core/exhibit_geometry.py: rise, deepest point, sweep, floor and barrier.

Every reference is plain geometry of the drawn outlines (DOMAIN §5): a point at (x, z) in body
axes, turned by θ, lies at depth z cos θ − x sin θ and at x cos θ + z sin θ from the vertical.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np
import pytest

from core import analyse, design_from_dict
from core.analysis import Result
from core.exhibit_geometry import HEADROOM_M, reach_below_depth_m, swept_geometry

from _core_builders import bob, clamp, design, rod


def _cylinder(amplitude_deg: float) -> Result:
    """A 20 kg cylinder bob, 0.3 m across and 0.4 m high, centred 2.5 m down a thin rod."""
    parts = [rod(length_m=2.5, diameter_m=0.004),
             bob("cylinder", diameter_m=0.3, height_m=0.4, mass_kg=20.0,
                 mount=clamp(centre_m=2.5))]
    return analyse(design_from_dict(design(parts, amplitude_deg=amplitude_deg)))


def _sphere(amplitude_deg: float, centre_m: float = 24.0, diameter_m: float = 0.3) -> Result:
    parts = [rod(length_m=centre_m, diameter_m=0.004),
             bob("sphere", diameter_m=diameter_m, mass_kg=200.0,
                 mount=clamp(centre_m=centre_m))]
    return analyse(design_from_dict(design(parts, amplitude_deg=amplitude_deg)))


def _brute(result: Result, amplitude_deg: float, n_angle: int = 4001
           ) -> tuple[float, float]:
    """Deepest point and farthest reach by turning a dense cloud of outline points."""
    pts = []
    for b in result.bodies:
        if b.kind == "bob" and b.shape == "sphere":
            a = np.linspace(0, 2 * np.pi, 2001)
            pts.append(np.c_[0.5 * b.width_m * np.sin(a), b.centre_m + 0.5 * b.width_m
                             * np.cos(a)])
        else:
            for x in (-0.5 * b.width_m, 0.5 * b.width_m):
                for z in (b.top_m, b.bottom_m):
                    pts.append(np.array([[x, z]]))
    cloud = np.vstack(pts)
    th = np.radians(np.linspace(-amplitude_deg, amplitude_deg, n_angle))
    depth = np.outer(np.cos(th), cloud[:, 1]) - np.outer(np.sin(th), cloud[:, 0])
    across = np.outer(np.cos(th), cloud[:, 0]) + np.outer(np.sin(th), cloud[:, 1])
    return float(depth.max()), float(np.abs(across).max())


class TestRiseAndSweep:
    @pytest.mark.parametrize("deg", [3.0, 40.0, 120.0])
    def test_bob_rise(self, deg: float) -> None:
        # c (1 − cos θ₀) for the bob's centre c below the pivot (DOMAIN §5).
        g = _cylinder(deg).geometry
        assert g is not None
        assert g.bob_rise_m == pytest.approx(2.5 * (1 - math.cos(math.radians(deg))), rel=1e-12)

    def test_centre_sweep_170_is_2l(self) -> None:
        # Issue 10: a bob 0.55 m down at 170° sweeps 2 × 0.55 m, not 2L sin 170° = 0.19 m.
        parts = [rod(length_m=0.55, diameter_m=0.004),
                 bob("sphere", diameter_m=0.05, mass_kg=1.0, mount=clamp(centre_m=0.55))]
        r = analyse(design_from_dict(design(parts, amplitude_deg=170.0)))
        assert r.exhibit.sweep_width_m == pytest.approx(1.10, rel=1e-12)

    @pytest.mark.parametrize("deg", [2.0, 20.0, 60.0, 100.0])
    def test_outer_sweep_cylinder_corner(self, deg: float) -> None:
        # The cylinder's lower outer corner (x, z) = (0.15, 2.7) is the outermost point:
        # outer reach √(x² + z²)·sin(min(90°, θ₀ + atan(x/z))) (DOMAIN §5); sweep = 2 × reach.
        x, z = 0.15, 2.7
        reach = math.hypot(x, z) * math.sin(min(math.pi / 2, math.radians(deg) + math.atan(x / z)))
        r = _cylinder(deg)
        assert r.geometry is not None
        assert r.geometry.outer_sweep_m == pytest.approx(2 * reach, rel=1e-12)
        assert r.report_dict()["outer_sweep_m"] == pytest.approx(2 * reach, rel=1e-12)

    @pytest.mark.parametrize("deg", [1.0, 4.0, 30.0])
    def test_lowest_point_cylinder(self, deg: float) -> None:
        # The lower corner at radius R = √(x² + z²), angle φ = atan(x/z) from the vertical
        # reaches R cos(φ − min(φ, θ₀)) (plain geometry) — deeper than the bottom at rest
        # once θ₀ > 0.
        x, z = 0.15, 2.7
        radius, phi = math.hypot(x, z), math.atan2(x, z)
        r = _cylinder(deg)
        expected = radius * math.cos(phi - min(phi, math.radians(deg)))
        assert r.exhibit.lowest_point_m == pytest.approx(expected, rel=1e-12)
        assert r.report_dict()["lowest_point_m"] == pytest.approx(expected, rel=1e-12)

    @pytest.mark.parametrize("deg", [5.0, 75.0, 135.0])
    def test_against_a_turned_point_cloud(self, deg: float) -> None:
        # Brute force: 2001 points on the sphere's outline and every rod corner, turned
        # through 4001 angles (plain geometry; the sampling is good to ~1e-6 m here).
        r = _sphere(deg, centre_m=3.0)
        deepest, reach = _brute(r, deg)
        assert r.geometry is not None
        assert r.geometry.lowest_point_m == pytest.approx(deepest, abs=2e-6)
        assert r.geometry.outer_reach_m == pytest.approx(reach, abs=2e-6)
        # a sphere: its centre's path plus its radius
        assert r.geometry.outer_sweep_m == pytest.approx(
            2 * (3.0 * math.sin(min(math.radians(deg), math.pi / 2)) + 0.15), rel=1e-12)


class TestFloorAndBarrier:
    def test_clearance_and_margin(self) -> None:
        # Pivot 26 m above the floor, sphere 0.3 m across at 24 m, 5°: the lowest point is
        # 24.15 m down (the sphere's bottom, at rest), 1.85 m above the floor; the reach is
        # 24 sin 5° + 0.15 m (plain geometry).
        r = _sphere(5.0)
        g = swept_geometry(r.bodies, math.radians(5.0), r.bodies[1], pivot_above_floor_m=26.0,
                           barrier_radius_m=3.0)
        reach = 24.0 * math.sin(math.radians(5.0)) + 0.15
        assert g.floor_clearance_m == pytest.approx(26.0 - 24.15, rel=1e-12)
        assert g.barrier_margin_m == pytest.approx(3.0 - reach, rel=1e-12)
        # below 2.2 m above the floor only near the bottom: never out at the barrier
        assert g.reach_below_headroom_m is not None and g.reach_below_headroom_m < 3.0
        assert not g.within_reach
        assert swept_geometry(r.bodies, math.radians(5.0), r.bodies[1]).floor_clearance_m is None

    def test_within_reach(self) -> None:
        # The bob passes lower than the headroom out at the barrier: visitors within reach.
        r = _sphere(5.0)
        g = swept_geometry(r.bodies, math.radians(5.0), r.bodies[1], pivot_above_floor_m=26.0,
                           barrier_radius_m=1.0)
        assert g.within_reach
        no_barrier = swept_geometry(r.bodies, math.radians(5.0), r.bodies[1],
                                    pivot_above_floor_m=26.0)
        assert no_barrier.within_reach and no_barrier.barrier_margin_m is None
        high = swept_geometry(r.bodies, math.radians(5.0), r.bodies[1],
                              pivot_above_floor_m=24.15 + HEADROOM_M + 0.01)
        assert not high.within_reach and high.reach_below_headroom_m is None

    def test_reach_below_headroom_against_geometry(self) -> None:
        # The sphere (radius r = 0.15 at c = 24) turned by θ has its centre at depth 24 cos θ;
        # the part deeper than D = 23.9 reaches 24 sin θ + √(r² − (D − 24 cos θ)²) out (the
        # half chord); maximised over θ on a fine grid (plain geometry).
        r = _sphere(5.0)
        depth = 23.9
        th = np.radians(np.linspace(-5.0, 5.0, 200001))
        cz = 24.0 * np.cos(th)
        half = np.sqrt(np.clip(0.15**2 - np.clip(depth - cz, 0, None) ** 2, 0, None))
        expected = float(np.max((24.0 * np.abs(np.sin(th)) + half)[cz + 0.15 > depth]))
        got = reach_below_depth_m(r.bodies, math.radians(5.0), depth)
        assert got == pytest.approx(expected, abs=1e-5)


def _exhibit_file(floor_m: float, barrier_m: float | None) -> dict[str, Any]:
    parts = [rod(length_m=24.0, diameter_m=0.004, material="music_wire"),
             bob("sphere", diameter_m=0.3, mass_kg=200.0, mount=clamp(centre_m=24.0))]
    d = design(parts, amplitude_deg=5.0)
    d.update({"version": 2, "purpose": "exhibit",
              "exhibit": {"pivot_above_floor_m": floor_m, "barrier_radius_m": barrier_m}})
    return d


def test_planning_keys_through_analyse() -> None:
    # A format-2 file with a floor and a barrier (DESIGN §8). Floor clearance = pivot height −
    # lowest point; barrier margin = radius − reach (plain geometry).
    r = analyse(design_from_dict(_exhibit_file(25.0, 1.5)))
    out = r.report_dict()
    assert out["purpose"] == "exhibit"
    assert out["floor_clearance_m"] == pytest.approx(25.0 - 24.15, rel=1e-12)
    assert out["barrier_margin_m"] == pytest.approx(
        1.5 - (24.0 * math.sin(math.radians(5.0)) + 0.15), rel=1e-12)
    assert out["visitors_within_reach"] is True
    assert any("Visitors can be hit" in w for w in r.warnings)
    assert any("beyond the barrier" in w for w in r.warnings)
    safe = analyse(design_from_dict(_exhibit_file(27.0, 3.0)))
    assert safe.warnings == ()
    assert safe.report_dict()["barrier_margin_m"] > 0
    no_barrier = analyse(design_from_dict(_exhibit_file(25.0, None))).report_dict()
    assert no_barrier["barrier_margin_m"] is None and no_barrier["visitors_within_reach"]
