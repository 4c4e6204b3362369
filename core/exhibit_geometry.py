"""Where the swinging body goes: rise, deepest point, sweep, floor clearance, barrier margin.

Notes
-----
Plain geometry of the outlines the window draws, in the plane of swing, body axes x across
and z down from the pivot: a rod, a sleeve and a cylinder bob are rectangles, a sphere, disc or
lens bob a circle of its diameter, a trim weight a point. Turned by θ, a point at radius
R = √(x² + z²) and angle φ = atan2(x, z) from the vertical lies at depth R cos(φ + θ) and at
R sin(φ + θ) from the vertical through the pivot. Over the swing θ runs through [−θ₀, θ₀], so
the deepest point and the farthest reach of a convex outline are found at its corners (or, for
a circle, its centre plus the radius) with ψ = φ + θ over [φ − θ₀, φ + θ₀]. For a body point at
(x, z) below the pivot this is DOMAIN §5's outer reach √(x² + z²)·sin(min(90°, θ₀ + atan(x/z))).
The swept path is symmetric about the vertical, so its width is twice the farthest reach: 2L
for a point L down once θ₀ ≥ 90°.

The bob rises c(1 − cos θ₀) at the end of the swing (c: its centre below the pivot). Heights
above the floor need ``pivot_above_floor_m``; the barrier margin is the barrier radius less the
farthest reach (the swing plane turns, so the swept area on the floor is a disc).

Visitors: the body "comes within reach" where it passes lower than :data:`HEADROOM_M` above the
floor at or beyond the barrier (anywhere, without a barrier). 2.2 m is common practice, no
source; it is above the 2030 mm (80 in) minimum head clearance under overhead objects of the
2010 ADA Standards for Accessible Design §307.4 [pub]. A visitor's arm reaching over the barrier
is not included: give the barrier a margin.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .mass_properties import Body

__all__ = ["SweptGeometry", "swept_geometry", "HEADROOM_M", "centre_sweep_width_m",
           "deepest_and_reach_m", "reach_below_depth_m"]

HEADROOM_M = 2.2
_ROUND = ("sphere", "disc", "lens")
_TWO_PI = 2.0 * math.pi


@dataclass(frozen=True)
class SweptGeometry:
    """The swept body against the room (lengths in m; None where not defined).

    Attributes
    ----------
    bob_rise_m : rise of the main bob's centre at the end of the swing, signed: negative for a
        bob above the pivot, which drops as the body swings (None: no bob).
    lowest_point_m : deepest point of any part's outline during the swing, below the pivot.
    outer_reach_m : largest horizontal distance of the body from the vertical through the pivot.
    outer_sweep_m : width swept by the outermost points of the body, 2 × outer_reach_m.
    floor_clearance_m : floor to the lowest point of the swing (None: no floor given;
        negative: the body reaches the floor).
    barrier_margin_m : barrier radius less the outer reach (None: no barrier; negative: the
        body swings out over the barrier).
    reach_below_headroom_m : largest horizontal distance at which the body passes lower than
        :data:`HEADROOM_M` above the floor (None: no floor given, or it never does).
    within_reach : True when the body passes lower than the headroom at or beyond the barrier
        (anywhere without a barrier); False without a floor.
    """

    bob_rise_m: float | None
    lowest_point_m: float
    outer_reach_m: float
    outer_sweep_m: float
    floor_clearance_m: float | None
    barrier_margin_m: float | None
    reach_below_headroom_m: float | None
    within_reach: bool


def _max_cos(lo: float, hi: float) -> float:
    """max cos ψ for ψ in [lo, hi]."""
    n = math.ceil(lo / _TWO_PI)
    if n * _TWO_PI <= hi:
        return 1.0
    return max(math.cos(lo), math.cos(hi))


def _max_abs_sin(lo: float, hi: float) -> float:
    """max |sin ψ| for ψ in [lo, hi]."""
    n = math.ceil((lo - math.pi / 2) / math.pi)
    if math.pi / 2 + n * math.pi <= hi:
        return 1.0
    return max(abs(math.sin(lo)), abs(math.sin(hi)))


def _corners(b: Body) -> list[tuple[float, float]]:
    """Body-axis points (x, z) whose extremes bound the outline (a circle: its centre)."""
    if b.kind == "weight" or (b.kind == "bob" and b.shape in _ROUND):
        return [(0.0, b.centre_m)]
    half = 0.5 * b.width_m
    return [(x, z) for x in (-half, half) for z in (b.top_m, b.bottom_m)]


def _radius(b: Body) -> float:
    return 0.5 * b.width_m if b.kind == "bob" and b.shape in _ROUND else 0.0


def deepest_and_reach_m(bodies: tuple[Body, ...], amplitude_rad: float) -> tuple[float, float]:
    """(deepest point below the pivot, farthest horizontal reach), m, over a swing of ±θ₀."""
    deepest, reach = -math.inf, 0.0
    for b in bodies:
        r = _radius(b)
        for x, z in _corners(b):
            big, phi = math.hypot(x, z), math.atan2(x, z)
            lo, hi = phi - amplitude_rad, phi + amplitude_rad
            deepest = max(deepest, big * _max_cos(lo, hi) + r)
            reach = max(reach, big * _max_abs_sin(lo, hi) + r)
    return deepest, reach


def centre_sweep_width_m(centre_m: float, amplitude_rad: float) -> float:
    """Width swept by a point ``centre_m`` below the pivot: 2c·sin(min(θ₀, 90°)), m.

    Examples
    --------
    >>> round(centre_sweep_width_m(0.55, math.radians(170.0)), 12)
    1.1
    """
    return 2.0 * abs(centre_m) * math.sin(min(amplitude_rad, math.pi / 2))


def reach_below_depth_m(bodies: tuple[Body, ...], amplitude_rad: float, depth_m: float,
                        samples: int = 2001) -> float | None:
    """Largest horizontal distance at which any outline lies deeper than ``depth_m`` below the
    pivot during the swing, m (None: never). The swing angle is sampled at ``samples`` even
    steps (ends included); each outline is clipped exactly at the given depth."""
    th = np.linspace(-amplitude_rad, amplitude_rad, samples)
    s, c = np.sin(th), np.cos(th)
    best = -np.inf
    for b in bodies:
        if b.kind == "bob" and b.shape in _ROUND:
            r = 0.5 * b.width_m
            cx, cz = b.centre_m * s, b.centre_m * c
            gap = np.clip(depth_m - cz, 0.0, None)
            half = np.sqrt(np.clip(r * r - gap * gap, 0.0, None))
            ok = cz + r > depth_m
            if ok.any():
                best = max(best, float(np.max((np.abs(cx) + half)[ok])))
            continue
        pts = _corners(b)
        if b.kind != "weight":
            pts = [pts[0], pts[1], pts[3], pts[2]]  # around the rectangle
        px = np.array([x for x, _z in pts])
        pz = np.array([z for _x, z in pts])
        xs = np.outer(c, px) + np.outer(s, pz)
        zs = np.outer(c, pz) - np.outer(s, px)
        inside = zs > depth_m
        if inside.any():
            best = max(best, float(np.max(np.abs(xs[inside]))))
        if len(pts) > 1:  # edges crossing the depth line
            x2, z2 = np.roll(xs, -1, axis=1), np.roll(zs, -1, axis=1)
            cross = (zs - depth_m) * (z2 - depth_m) < 0.0
            if cross.any():
                t = (depth_m - zs[cross]) / (z2[cross] - zs[cross])
                best = max(best, float(np.max(np.abs(xs[cross] + t * (x2[cross] - xs[cross])))))
    return None if not math.isfinite(best) else best


def swept_geometry(bodies: tuple[Body, ...], amplitude_rad: float, bob: Body | None, *,
                   pivot_above_floor_m: float | None = None,
                   barrier_radius_m: float | None = None) -> SweptGeometry:
    """The swept body against the floor and the barrier (see the module notes).

    Parameters
    ----------
    bodies : the parts as they hang (positions m below the pivot).
    amplitude_rad : semi-arc θ₀, rad.
    bob : the main bob (None: no bob).
    pivot_above_floor_m : height of the pivot above the floor, m (None: no floor given).
    barrier_radius_m : radius of the visitors' barrier around the vertical through the pivot,
        m (None: no barrier).
    """
    deepest, reach = deepest_and_reach_m(bodies, amplitude_rad)
    clearance = low_reach = None
    within = False
    if pivot_above_floor_m is not None:
        clearance = pivot_above_floor_m - deepest
        low_reach = reach_below_depth_m(bodies, amplitude_rad, pivot_above_floor_m - HEADROOM_M)
        if low_reach is not None:
            within = barrier_radius_m is None or low_reach >= barrier_radius_m
    return SweptGeometry(
        bob_rise_m=None if bob is None else bob.centre_m * (1.0 - math.cos(amplitude_rad)),
        lowest_point_m=deepest,
        outer_reach_m=reach,
        outer_sweep_m=2.0 * reach,
        floor_clearance_m=clearance,
        barrier_margin_m=None if barrier_radius_m is None else barrier_radius_m - reach,
        reach_below_headroom_m=low_reach,
        within_reach=within,
    )
