"""The pivot as a parameter: moving it along the body, and where the period is shortest.

Notes
-----
Moving the pivot a distance s down the body lowers nothing but changes every position:
z → z − s. With the air model of :mod:`core.model` the effective inertia and the torque
coefficient are then exactly
I(s) = Mᵢ (s − sᵢ)² + I_min and A(s) + k = g Mₐ e, e = sₐ + k/(g Mₐ) − s,
with Mᵢ = Σ(m + CρV) (mass plus air carried along), Mₐ = Σ(m − ρV) (mass less buoyancy), sᵢ and
sₐ their centres, I_min the effective inertia about sᵢ. The small-arc period
T₀ = 2π √(I/(A + k)) is shortest at e* = √(δ² + I_min/Mᵢ), δ = sₐ + k/(g Mₐ) − sᵢ (set
dT₀/de = 0); in vacuum without a spring δ = 0 and e* = k_c = √(I_cm/M), the radius of gyration
about the centre of mass, and T₀ = 2π √(2 k_c / g) (Kater; any mechanics text [pub, memory]).

The conjugate pivot is the other pivot with the same small-arc period on the far side of the
centre of mass (the body turned over to hang from it, as a reversible pendulum): in vacuum
k_c²/h below the centre of mass, the centre of oscillation. With air or a spring it is the root
of the same quadratic nearer to that point.

The pivot sensitivity is the linear rate change when the pivot moves 1 mm up the body (every
part 1 mm further below it), from the exact period's slopes at the working arc.
"""

from __future__ import annotations

import copy
import math
from dataclasses import dataclass
from typing import Any

from .errors import DesignError
from .mass_properties import Body
from .model import PendulumState

__all__ = ["PivotFigures", "pivot_figures", "shift_pivot", "pivot_shift_limits",
           "check_pivot_shift", "radius_of_gyration_m"]

_MM = 1e-3


@dataclass(frozen=True)
class PivotFigures:
    """Where the pivot sits on the body, and where it would give the shortest period.

    Attributes
    ----------
    radius_of_gyration_m : k_c = √(I_cm/M) about the centre of mass (vacuum), m.
    shortest_period_pivot_m : distance of the shortest-period pivot above the centre of mass, m
        (same site, air and spring); None for a body lighter than the air it displaces.
    shortest_period_small_s : small-arc period with the pivot there, s (None with it).
    conjugate_pivot_m : distance of the conjugate pivot *below* the centre of mass (the body
        turned over to hang from it), m; None when no such pivot exists.
    pivot_sensitivity_s_per_day_per_mm : rate change for the pivot moved 1 mm up the body
        (linear), s/day.
    """

    radius_of_gyration_m: float
    shortest_period_pivot_m: float | None
    shortest_period_small_s: float | None
    conjugate_pivot_m: float | None
    pivot_sensitivity_s_per_day_per_mm: float


def radius_of_gyration_m(bodies: tuple[Body, ...]) -> float:
    """k_c = √(I_cm / M) of the bodies about their centre of mass (vacuum), m."""
    mass = sum(b.mass_kg for b in bodies)
    h = sum(b.mass_kg * b.centre_m for b in bodies) / mass
    i_cm = sum(b.inertia_centre_kg_m2 + b.mass_kg * (b.centre_m - h) ** 2 for b in bodies)
    return math.sqrt(i_cm / mass)


def _coefficients(state: PendulumState) -> tuple[float, float, float, float, float]:
    """(Mᵢ, sᵢ, I_min, g Mₐ, sₐ + k/(g Mₐ)) of the module notes."""
    rho, g = state.air_density_kg_m3, state.g_m_s2
    bodies = state.bodies
    m_i = sum(b.mass_kg + rho * b.added_mass_coefficient * b.volume_m3 for b in bodies)
    p = sum((b.mass_kg + rho * b.added_mass_coefficient * b.volume_m3) * b.centre_m
            for b in bodies)
    s_i = p / m_i
    i_min = sum(b.inertia_centre_kg_m2
                + rho * b.added_mass_coefficient * b.volume_m3 * b.length_along_m**2 / 12.0
                + (b.mass_kg + rho * b.added_mass_coefficient * b.volume_m3)
                * (b.centre_m - s_i) ** 2 for b in bodies)
    g_ma = g * sum(b.mass_kg - rho * b.volume_m3 for b in bodies)
    s_e = (state.torque_n_m + state.stiffness_n_m_per_rad) / g_ma if g_ma > 0.0 else math.nan
    return m_i, s_i, i_min, g_ma, s_e


def pivot_figures(state: PendulumState) -> PivotFigures:
    """Radius of gyration, shortest-period pivot and its period, conjugate pivot, sensitivity."""
    m_i, s_i, i_min, g_ma, s_e = _coefficients(state)
    h = state.mass.centre_of_mass_m
    k = state.stiffness_n_m_per_rad
    rho = state.air_density_kg_m3
    d_inertia = 2.0 * _MM * sum((b.mass_kg + rho * b.added_mass_coefficient * b.volume_m3)
                                * b.centre_m for b in state.bodies)
    sensitivity = state.rate_change(d_inertia, g_ma * _MM)
    k_c = radius_of_gyration_m(state.bodies)
    if not g_ma > 0.0:  # buoyant overall: lowering the pivot never shortens the period
        return PivotFigures(k_c, None, None, None, sensitivity)
    delta = s_e - s_i
    e_star = math.sqrt(delta * delta + i_min / m_i)
    shortest = 2.0 * math.pi * math.sqrt((m_i * (e_star - delta) ** 2 + i_min) / (g_ma * e_star))
    # Turned over at s below the pivot: A' + k = g Mₐ (s − sₐ) + k = g Mₐ e₂, with
    # e₂ = s − s_e + 2k/(g Mₐ); I = Mᵢ (e₂ + δ₂)² + I_min, δ₂ = s_e − 2k/(g Mₐ) − sᵢ.
    f_now = state.inertia_kg_m2 / (state.torque_n_m + k)
    d2 = s_e - 2.0 * k / g_ma - s_i
    b = 2.0 * m_i * d2 - f_now * g_ma
    c = m_i * d2 * d2 + i_min
    disc = b * b - 4.0 * m_i * c
    conjugate = None
    if disc >= 0.0:
        roots = [(-b + sign * math.sqrt(disc)) / (2.0 * m_i) for sign in (1.0, -1.0)]
        guess = i_min / (m_i * h)
        pivots = [e2 + s_e - 2.0 * k / g_ma for e2 in roots if e2 > 0.0]
        if pivots:
            conjugate = min(pivots, key=lambda z: abs(z - h - guess)) - h
    return PivotFigures(k_c, h - (s_e - e_star), shortest, conjugate, sensitivity)


def shift_pivot(design_dict: dict[str, Any], shift_m: float) -> dict[str, Any]:
    """A copy of a design dict with the pivot moved ``shift_m`` down the pendulum, m.

    Every position measured from the pivot (a rod's ``top_m``, a weight's ``at_m``, a clamp's
    ``centre_m``) decreases by ``shift_m``; parts placed relative to other parts follow them.
    Nothing is validated here: pass the result through ``core.design_from_dict``.
    """
    if isinstance(shift_m, bool) or not isinstance(shift_m, (int, float)) \
            or not math.isfinite(shift_m):
        raise DesignError("pivot", f"the pivot shift must be a finite number, not {shift_m!r}")
    new = copy.deepcopy(design_dict)
    for part in new.get("parts", []):
        if not isinstance(part, dict):
            continue
        for key in ("top_m", "at_m", "centre_m"):
            if isinstance(part.get(key), (int, float)) and not isinstance(part[key], bool):
                part[key] = part[key] - shift_m
        mount = part.get("mount")
        if isinstance(mount, dict) and isinstance(mount.get("centre_m"), (int, float)):
            mount["centre_m"] = mount["centre_m"] - shift_m
    return new


def pivot_shift_limits(state: PendulumState) -> tuple[float, float]:
    """(lowest, highest) pivot shift down the body, m, that keeps the pivot on the body and
    above the centre of mass (the upper limit is excluded: there the body would turn over)."""
    top = min(b.top_m for b in state.bodies)
    return top, state.mass.centre_of_mass_m


def check_pivot_shift(state: PendulumState, shift_m: float) -> None:
    """Refuse a pivot shift that leaves the body or reaches the centre of mass.

    Raises
    ------
    DesignError
        ``field='pivot'`` with the reason in plain words.
    """
    lo, hi = pivot_shift_limits(state)
    if not math.isfinite(shift_m):
        raise DesignError("pivot", "the pivot position must be a finite number")
    if shift_m < lo - 1e-12:
        raise DesignError("pivot", f"the pivot would be {lo - shift_m:.4g} m above the top of "
                                   "the pendulum: it must sit on the body")
    if shift_m >= hi:
        raise DesignError("pivot", "the pivot must stay above the centre of mass "
                                   f"({hi:.4g} m below the present pivot), or the pendulum "
                                   "would turn over")
