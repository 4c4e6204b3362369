"""The pendulum as it swings under given conditions: gravity, air, inertia, torque, periods.

:func:`pendulum_state` is the one place a design becomes equation-of-motion coefficients and
periods; the readout, the curves, the sensitivities, the solver and the sweeps all use it.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .air import air_density
from .blades import blade_stiffness_n_m_per_rad
from .constants import SECONDS_PER_DAY
from .design import Design
from .errors import DesignError
from .gravity import normal_gravity
from .mass_properties import Body, MassProperties, layout, mass_properties
from .period import period_at, period_exact_and_slopes, period_small

__all__ = ["PendulumState", "pendulum_state", "suspension_stiffness", "SECONDS_PER_DAY"]

def suspension_stiffness(design: Design, tension_n: float) -> float:
    """The suspension's restoring stiffness, N·m/rad, under a pull of ``tension_n`` (N).

    A spring given by its blades is a blade in bending under tension
    (:func:`core.blades.blade_stiffness_n_m_per_rad`, Young's modulus from the material table);
    otherwise the design's own stiffness (0 for a knife edge).
    """
    blades = design.suspension.blades
    if blades is None:
        return design.suspension.stiffness_n_m_per_rad
    return blade_stiffness_n_m_per_rad(
        blades.count, design.material(blades.material).youngs_modulus_pa, blades.width_m,
        blades.thickness_m, blades.free_length_m, tension_n)


@dataclass(frozen=True)
class PendulumState:
    """Coefficients and periods of one design under one set of conditions.

    Attributes
    ----------
    g_m_s2 : local gravity, m/s².
    air_density_kg_m3 : kg/m³ (0 in vacuum).
    inertia_kg_m2 : I, moment of inertia about the pivot including the air carried along, kg·m².
    torque_n_m : A = g Σ(m − ρV) z, N·m (gravity torque per unit sin θ, buoyancy included).
    stiffness_n_m_per_rad : k, N·m/rad.
    amplitude_rad : semi-arc θ₀, rad.
    period_s, period_small_s : exact and linearised full periods, s.
    period_slope_torque, period_slope_stiffness : ∂T/∂A and ∂T/∂k.
    """

    design: Design
    temperature_c: float
    pressure_hpa: float
    g_m_s2: float
    air_density_kg_m3: float
    bodies: tuple[Body, ...]
    mass: MassProperties
    inertia_kg_m2: float
    torque_n_m: float
    stiffness_n_m_per_rad: float
    amplitude_rad: float
    period_s: float
    period_small_s: float
    period_slope_torque: float
    period_slope_stiffness: float

    @property
    def target_period_s(self) -> float | None:
        return self.design.target.target_period_s

    @property
    def rate_s_per_day(self) -> float | None:
        """Seconds gained per day against the target (positive: the clock gains)."""
        t = self.target_period_s
        return None if t is None else SECONDS_PER_DAY * (t / self.period_s - 1.0)

    @property
    def rate_per_period_change(self) -> float:
        """d(rate)/dT, (s/day)/s: −SECONDS_PER_DAY·T_target/T² (the clock's own T when no
        target)."""
        t = self.target_period_s or self.period_s
        return -SECONDS_PER_DAY * t / self.period_s**2

    def period_change(self, d_inertia: float, d_torque: float, d_stiffness: float = 0.0) -> float:
        """First-order change of the exact period, s, for small changes of I, A and k."""
        return (self.period_s / (2.0 * self.inertia_kg_m2) * d_inertia
                + self.period_slope_torque * d_torque
                + self.period_slope_stiffness * d_stiffness)

    def rate_change(self, d_inertia: float, d_torque: float, d_stiffness: float = 0.0) -> float:
        """First-order change of the rate, s/day, for small changes of I, A and k."""
        return self.rate_per_period_change * self.period_change(d_inertia, d_torque, d_stiffness)

    def main_bob(self) -> Body | None:
        """The heaviest bob as it hangs, or None when the design has no bob."""
        bobs = [b for b in self.bodies if b.kind == "bob"]
        return max(bobs, key=lambda b: b.mass_kg) if bobs else None


def gravity_at(design: Design, elevation_m: float | None = None) -> float:
    """Local g, m/s²: the site's override, or WGS84 normal gravity at latitude and elevation."""
    site = design.site
    if site.g_m_s2 is not None:
        return site.g_m_s2
    h = site.elevation_m if elevation_m is None else elevation_m
    return normal_gravity(site.latitude_deg, h)


def pendulum_state(design: Design, *, temperature_c: float | None = None,
                   pressure_hpa: float | None = None, elevation_m: float | None = None,
                   amplitude_deg: float | None = None, slopes: bool = True,
                   hang_either_way: bool = False) -> PendulumState:
    """Evaluate ``design`` under its site's conditions, or the ones overridden here.

    With ``slopes=False`` only the period is computed (the period slopes are NaN): the fast
    path for the many perturbed evaluations of sensitivities, budgets and solvers. With
    ``hang_either_way`` a body whose centre of mass lies above the pivot is taken as turned
    over so that it hangs below it (a reversible pendulum on its other pivot): the torque's
    magnitude is used.

    Raises
    ------
    DesignError
        ``field='parts'`` when the centre of mass (less buoyancy) is not below the pivot.
    """
    site = design.site
    t = site.temperature_c if temperature_c is None else temperature_c
    p = site.pressure_hpa if pressure_hpa is None else pressure_hpa
    amp = design.swing.amplitude_deg if amplitude_deg is None else amplitude_deg
    g = gravity_at(design, elevation_m)
    rho = air_density(p, t)
    bodies = layout(design, t)
    mass = mass_properties(bodies, rho)
    torque = g * mass.effective_first_moment_kg_m
    if hang_either_way:
        torque = abs(torque)
    if not torque > 0.0 or not math.isfinite(torque):
        raise _not_hanging(design, bodies, mass, rho)
    inertia = mass.effective_inertia_kg_m2
    k = suspension_stiffness(design, mass.mass_kg * g)
    theta0 = math.radians(amp)
    if slopes:
        periods, slope_a, slope_k = period_exact_and_slopes(inertia, torque, k, [theta0])
        period, d_a, d_k = float(periods[0]), float(slope_a[0]), float(slope_k[0])
    else:
        period, d_a, d_k = period_at(inertia, torque, k, theta0), math.nan, math.nan
    return PendulumState(design, t, p, g, rho, bodies, mass, inertia, torque, k, theta0,
                         period, period_small(inertia, torque, k), d_a, d_k)


def _not_hanging(design: Design, bodies: tuple[Body, ...], mass: MassProperties,
                 rho: float) -> DesignError:
    """The refusal of a design that does not hang below its pivot, naming the real cause:
    the centre of mass above the pivot, or — when the weight alone would hang — the air's
    buoyancy (a part lighter than the air it displaces, named, or the whole)."""
    if not mass.first_moment_kg_m > 0.0:
        return DesignError("parts", "the centre of mass must hang below the pivot (the "
                                    f"design's first moment Σ m·z is "
                                    f"{mass.first_moment_kg_m:.4g} kg·m)")
    names = [p.name for p in design.parts]
    for b in bodies:
        air = rho * b.volume_m3
        if b.mass_kg <= air and b.name in names:
            return DesignError(f"parts[{names.index(b.name)}]",
                               f"the part '{b.name}' is lighter than the air it displaces "
                               f"({b.mass_kg:.3g} kg against {air:.3g} kg of air at "
                               f"{rho:.4g} kg/m³), so the pendulum does not hang down")
    return DesignError("parts", "the air buoys the pendulum more than its weight pulls it down "
                                f"(air {rho:.4g} kg/m³): it does not hang below the pivot")

