"""Rods as cables: static elastic stretch, the rate change it causes, and peak stress.

Notes
-----
Each rod carries its own weight and what hangs from it: a bob clamped to it (at the clamp, or at
the rod's lower end when the bob is centred below it), a trim weight (at its point), a sleeve
and anything on the sleeve (at the rod's lower end), and a rod hung from it (at its lower end).
With T(s) the weight hanging below the section s down the rod (length L, section A = πd²/4,
Young's modulus E of its material, :mod:`core.materials`), Hooke's law gives the stretch
ΔL = ∫₀^L T(s) ds / (E A) = g [m_rod L/2 + Σ mᵢ aᵢ] / (E A), mᵢ hung at aᵢ down the rod, and a
point at a down the rod moves by δ(a) = ∫₀^a T(s) ds / (E A).

The stretch rate re-evaluates the period with every part moved by the stretch above it (the
rod's own centre by its mean displacement, its length by ΔL) at the working arc: exact within
that model, with the rod's inertia about its own centre taken as uniformly stretched.

Peak stress: at the bottom of the swing each mass m at depth z pulls with m(g + z ω_max²)
(the rigid body's dynamic load M(g + hω²) shared out); the most loaded section of a rod hung
from above is its top. Weights in vacuum (buoyancy, ≤ 0.02 % for metal, is left out).

Limits: the figures are ideal loads with no safety factor, for a solid round rod or wire of the
stated diameter; a rope or stranded cable (its lower effective modulus, construction stretch
and strength) is out of scope; the fixing and structure are a qualified engineer's work under
local building codes.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from .constants import SECONDS_PER_DAY
from .design import Bob, ClampMount, Design, Rod, Sleeve, Weight
from .mass_properties import Body, mass_properties
from .model import PendulumState
from .period import period_at

__all__ = ["RodLoad", "CableFigures", "cable_figures"]


@dataclass(frozen=True)
class RodLoad:
    """One rod as a cable (SI units).

    Attributes
    ----------
    name, material : the rod.
    area_m2 : cross-section πd²/4.
    youngs_modulus_pa : E of the material.
    carried_mass_kg : the rod and everything hanging from it.
    stretch_m : static elastic stretch under the load below each section.
    peak_tension_n : tension at its top at the bottom of the swing.
    peak_stress_pa : that tension over the section.
    strength_pa, strength_kind : the material's yield strength ("yield") or, without one, its
        tensile strength ("tensile"); None when the table has neither.
    """

    name: str
    material: str
    area_m2: float
    youngs_modulus_pa: float
    carried_mass_kg: float
    stretch_m: float
    peak_tension_n: float
    peak_stress_pa: float
    strength_pa: float | None
    strength_kind: str | None


@dataclass(frozen=True)
class CableFigures:
    """Stretch and stress of the pendulum's rods (None where the design has no rod).

    Attributes
    ----------
    rods : per rod.
    stretch_m : total static stretch of all rods, m (the bob's drop for a single cable).
    stretch_rate_s_per_day : rate change the stretch causes (negative: the clock loses).
    peak_stress_pa : stress in the most loaded section at the bottom of the swing.
    peak_stress_part : the rod it is in.
    peak_stress_ratio : peak stress over that rod's strength (None: no strength in the table).
    peak_stress_ratio_basis : "yield" or "tensile" (None with the ratio).
    """

    rods: tuple[RodLoad, ...]
    stretch_m: float | None
    stretch_rate_s_per_day: float | None
    peak_stress_pa: float | None
    peak_stress_part: str | None
    peak_stress_ratio: float | None
    peak_stress_ratio_basis: str | None


def _strength(design: Design, material: str) -> tuple[float | None, str | None]:
    m = design.material(material)
    for attr, kind in (("yield_strength_pa", "yield"), ("tensile_strength_pa", "tensile")):
        value = getattr(m, attr, None)
        if isinstance(value, (int, float)) and value > 0:
            return float(value), kind
    return None, None


def _carriers(design: Design, bodies: dict[str, Body]) -> dict[str, tuple[str, float]]:
    """Part name -> (rod carrying it, distance of the load point down that rod, m)."""
    out: dict[str, tuple[str, float]] = {}

    def end_of(rod_name: str) -> float:
        return bodies[rod_name].bottom_m - bodies[rod_name].top_m

    for p in design.parts:
        if isinstance(p, Sleeve):
            out[p.name] = (p.on, end_of(p.on))
        elif isinstance(p, Weight):
            rod = bodies[p.on]
            out[p.name] = (p.on, min(max(bodies[p.name].centre_m - rod.top_m, 0.0), end_of(p.on)))
        elif isinstance(p, Bob):
            if isinstance(p.mount, ClampMount):
                rod = bodies[p.mount.on]
                a = min(max(bodies[p.name].centre_m - rod.top_m, 0.0), end_of(p.mount.on))
                out[p.name] = (p.mount.on, a)
            else:
                sleeve = design.part(p.mount.on)
                assert isinstance(sleeve, Sleeve)
                out[p.name] = (sleeve.on, end_of(sleeve.on))
        elif isinstance(p, Rod) and p.hangs_from is not None:
            host = design.part(p.hangs_from.part)
            if isinstance(host, Sleeve):  # through the sleeve, onto its rod's lower end
                out[p.name] = (host.on, end_of(host.on))
            elif isinstance(host, Rod):
                upper = p.hangs_from.end == "upper"
                out[p.name] = (host.name, 0.0 if upper else end_of(host.name))
    return out


def _descendants(name: str, carriers: dict[str, tuple[str, float]]) -> list[str]:
    """Every part hanging, directly or through others, from part ``name``."""
    out: list[str] = []
    todo = [name]
    while todo:
        here = todo.pop()
        for child, (host, _a) in carriers.items():
            if host == here and child not in out and child != name:
                out.append(child)
                todo.append(child)
    return out


def cable_figures(design: Design, state: PendulumState, peak_angular_velocity_rad_s: float
                  ) -> CableFigures:
    """Stretch, stretch rate and peak stress of every rod of ``design`` (module notes)."""
    bodies = {b.name: b for b in state.bodies}
    carriers = _carriers(design, bodies)
    g, w2 = state.g_m_s2, peak_angular_velocity_rad_s**2
    rods = [p for p in design.parts if isinstance(p, Rod)]
    shift: dict[str, float] = {}
    loads: list[RodLoad] = []

    def total_mass(name: str) -> float:
        return bodies[name].mass_kg + sum(bodies[c].mass_kg
                                          for c in _descendants(name, carriers))

    moved: dict[str, float] = {}  # displacement of each part's reference point, m
    mean_shift: dict[str, float] = {}
    ordered = sorted(rods, key=lambda r: len(_ancestry(r.name, carriers)))
    for rod in ordered:
        b = bodies[rod.name]
        length = b.bottom_m - b.top_m
        area = math.pi * b.width_m**2 / 4.0
        modulus = design.material(rod.material).youngs_modulus_pa
        direct = [(c, a) for c, (host, a) in carriers.items() if host == rod.name]
        hung = [(total_mass(c), a) for c, a in direct]
        ea = modulus * area
        stretch = g * (b.mass_kg * length / 2.0 + sum(m * a for m, a in hung)) / ea
        base = moved.get(rod.name, 0.0)  # the rod's top moves with its host
        for c, a in direct:
            local = g * (b.mass_kg * (a - a * a / (2.0 * length))
                         + sum(m * min(ai, a) for m, ai in hung)) / ea
            moved[c] = base + local
        mean_shift[rod.name] = base + g * (b.mass_kg * length / 3.0 + sum(
            m * (a - a * a / (2.0 * length)) for m, a in hung)) / ea
        shift[rod.name] = stretch
        members = [rod.name, *_descendants(rod.name, carriers)]
        tension = sum(bodies[n].mass_kg * (g + bodies[n].centre_m * w2) for n in members)
        strength, kind = _strength(design, rod.material)
        loads.append(RodLoad(rod.name, rod.material, area, modulus, total_mass(rod.name),
                             stretch, tension, tension / area, strength, kind))
    if not loads:
        return CableFigures((), None, None, None, None, None, None)
    rate = _stretch_rate(state, moved, mean_shift, shift)
    worst = max(loads, key=lambda r: r.peak_stress_pa)
    ratio = None if worst.strength_pa is None else worst.peak_stress_pa / worst.strength_pa
    return CableFigures(tuple(loads), sum(r.stretch_m for r in loads), rate,
                        worst.peak_stress_pa, worst.name, ratio,
                        None if ratio is None else worst.strength_kind)


def _ancestry(name: str, carriers: dict[str, tuple[str, float]]) -> list[str]:
    out: list[str] = []
    while name in carriers and len(out) < 1000:
        name = carriers[name][0]
        out.append(name)
    return out


def _stretch_rate(state: PendulumState, moved: dict[str, float],
                  mean_shift: dict[str, float], stretch: dict[str, float]) -> float:
    """Rate change, s/day, of the pendulum with every part lowered by the stretch above it."""
    new: list[Body] = []
    for b in state.bodies:
        if b.name in stretch:
            length = b.bottom_m - b.top_m
            grown = length + stretch[b.name]
            top = b.top_m + moved.get(b.name, 0.0)
            inertia = b.inertia_centre_kg_m2 + b.mass_kg * (grown**2 - length**2) / 12.0
            new.append(replace(b, top_m=top, bottom_m=top + grown,
                               centre_m=b.centre_m + mean_shift[b.name],
                               inertia_centre_kg_m2=inertia, length_along_m=grown))
        else:
            dz = moved.get(b.name, 0.0)
            new.append(replace(b, top_m=b.top_m + dz, bottom_m=b.bottom_m + dz,
                               centre_m=b.centre_m + dz))
    mass = mass_properties(tuple(new), state.air_density_kg_m3)
    torque = state.g_m_s2 * mass.effective_first_moment_kg_m
    period = period_at(mass.effective_inertia_kg_m2, torque, state.stiffness_n_m_per_rad,
                       state.amplitude_rad)
    before = period_at(state.inertia_kg_m2, state.torque_n_m, state.stiffness_n_m_per_rad,
                       state.amplitude_rad)
    return SECONDS_PER_DAY * (before / period - 1.0)
