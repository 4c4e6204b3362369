"""Exhibit figures, drive and decay: speed, loads, energy, power, half-life, Foucault turn.

Notes
-----
Energy of the swing E = V(θ₀) = A(1 − cos θ₀) + kθ₀²/2 (J). Peak angular velocity from
½ I ω_max² = E; peak speed of a point at radius r is r ω_max. Pivot load at the lowest point of
a rigid body: M (g + h ω_max²); for a point mass this is m g (3 − 2 cos θ₀).

Damping of quality factor Q: drive power, energy lost per cycle and the free decay to half
the arc at any arc, from the damping torque integrated over the swing itself
(:mod:`core.decay`); for small arcs they reduce to 2πE/(QT), 2Q ln 2/ω₀ and Q ln 2/π cycles
(A. P. French, *Vibrations and Waves*, ch. 3 [pub, memory]).

Sweep of the bob centre: 2c·sin(min(θ₀, 90°)) — above 90° the centre passes the horizontal and
the width is 2c (plain geometry). The deepest point is that of the whole outline over the swing
(:mod:`core.exhibit_geometry`).

Foucault: the swing plane turns 360° sin φ per sidereal day (86164.0905 s) (Foucault 1851;
standard texts [pub, memory]), clockwise seen from above in the northern hemisphere (positive
here), counter-clockwise in the southern (negative).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .decay import decay_figures
from .exhibit_geometry import centre_sweep_width_m, deepest_and_reach_m
from .model import PendulumState

__all__ = ["ExhibitFigures", "exhibit_figures", "SIDEREAL_DAY_S"]

SIDEREAL_DAY_S = 86164.0905


@dataclass(frozen=True)
class ExhibitFigures:
    """Figures for a swing seen by people; loads are ideal dynamic loads, no safety factor.

    Attributes
    ----------
    energy_j : energy of the swing, J.
    peak_angular_velocity_rad_s : at the lowest point, rad/s.
    peak_speed_m_s : speed of the main bob's centre at the lowest point, m/s (None: no bob).
    static_load_n : weight of the pendulum, N.
    max_pivot_load_n : pivot load at the lowest point, N.
    pivot_load_ratio : max load over static weight.
    release_axial_load_n : load along the pendulum at release, N (negative: a cable would be
        slack).
    sweep_width_m : width of the path swept by the bob centre, m (2c above 90°).
    lowest_point_m : deepest point of any part's outline during the swing, m below the pivot.
    energy_lost_per_cycle_j, drive_power_w : taken by the damping in one cycle at the arc, and
        the power that sustains the arc; with Q, None without.
    cycles_to_half_amplitude, time_to_half_amplitude_s : free decay to half the arc; with Q.
    foucault_turn_h : hours for the swing plane to turn 360° (None at the equator).
    foucault_deg_per_hour : turn of the swing plane, °/h, positive clockwise seen from above.
    """

    energy_j: float
    peak_angular_velocity_rad_s: float
    peak_speed_m_s: float | None
    static_load_n: float
    max_pivot_load_n: float
    pivot_load_ratio: float
    release_axial_load_n: float
    sweep_width_m: float | None
    lowest_point_m: float
    energy_lost_per_cycle_j: float | None
    drive_power_w: float | None
    cycles_to_half_amplitude: float | None
    time_to_half_amplitude_s: float | None
    foucault_turn_h: float | None
    foucault_deg_per_hour: float = 0.0


def _damping(state: PendulumState
             ) -> tuple[float | None, float | None, float | None, float | None]:
    q = state.design.swing.quality_factor
    if q is None:
        return None, None, None, None
    d = decay_figures(state.inertia_kg_m2, state.torque_n_m, state.stiffness_n_m_per_rad,
                      state.amplitude_rad, q)
    return (d.energy_lost_per_cycle_j, d.drive_power_w, d.cycles_to_half_amplitude,
            d.time_to_half_amplitude_s)


def exhibit_figures(state: PendulumState) -> ExhibitFigures:
    """Exhibit and drive figures of ``state``."""
    theta0 = state.amplitude_rad
    energy = (state.torque_n_m * (1.0 - math.cos(theta0))
              + 0.5 * state.stiffness_n_m_per_rad * theta0**2)
    omega_max = math.sqrt(2.0 * energy / state.inertia_kg_m2)
    bob = state.main_bob()
    mass, h, g = state.mass.mass_kg, state.mass.centre_of_mass_m, state.g_m_s2
    load = mass * (g + h * omega_max**2)
    lowest = deepest_and_reach_m(state.bodies, theta0)[0]
    sin_lat = math.sin(math.radians(state.design.site.latitude_deg))
    lost, power, cycles, half_time = _damping(state)
    return ExhibitFigures(
        energy_j=energy,
        peak_angular_velocity_rad_s=omega_max,
        peak_speed_m_s=None if bob is None else abs(bob.centre_m) * omega_max,  # a magnitude
        static_load_n=mass * g,
        max_pivot_load_n=load,
        pivot_load_ratio=load / (mass * g),
        release_axial_load_n=mass * g * math.cos(theta0),
        sweep_width_m=None if bob is None else centre_sweep_width_m(bob.centre_m, theta0),
        lowest_point_m=lowest,
        energy_lost_per_cycle_j=lost,
        drive_power_w=power,
        cycles_to_half_amplitude=cycles,
        time_to_half_amplitude_s=half_time,
        foucault_turn_h=None if abs(sin_lat) < 1e-12 else SIDEREAL_DAY_S / abs(sin_lat) / 3600.0,
        foucault_deg_per_hour=360.0 * sin_lat / (SIDEREAL_DAY_S / 3600.0),
    )
