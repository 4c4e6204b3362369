"""Exhibit figures, drive and decay: speed, loads, energy, power, half-life, Foucault turn.

Notes
-----
Energy of the swing E = V(θ₀) = A(1 − cos θ₀) + kθ₀²/2 (J). Peak angular velocity from
½ I ω_max² = E; peak speed of a point at radius r is r ω_max. Pivot load at the lowest point of
a rigid body: M (g + h ω_max²); for a point mass this is m g (3 − 2 cos θ₀).

Damping of quality factor Q (A. P. French, *Vibrations and Waves*, ch. 3 [pub, memory]):
amplitude envelope exp(−ω₀ t / 2Q), so the time to half amplitude is 2Q ln 2 / ω₀ and the
cycles to half amplitude Q ln 2 / π. The energy fraction lost in one damped cycle is exactly
1 − exp(−2π / (Q √(1 − 1/4Q²))) (≈ 2π/Q at high Q; 0.467 at Q = 10). Drive power to sustain
the arc = energy lost per cycle / period.

Foucault: the swing plane turns 360° sin φ per sidereal day (86164.0905 s) (Foucault 1851;
standard texts [pub, memory]).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

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
    sweep_width_m : horizontal distance between the bob centre's two extreme positions, m.
    energy_lost_per_cycle_j, drive_power_w : with Q; None without.
    cycles_to_half_amplitude, time_to_half_amplitude_s : with Q; None without.
    foucault_turn_h : hours for the swing plane to turn 360° (None at the equator).
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


def _damping(state: PendulumState, energy: float
             ) -> tuple[float | None, float | None, float | None, float | None]:
    q = state.design.swing.quality_factor
    if q is None:
        return None, None, None, None
    fraction = 1.0 - math.exp(-2.0 * math.pi / (q * math.sqrt(1.0 - 1.0 / (4.0 * q * q))))
    lost = energy * fraction
    omega0 = 2.0 * math.pi / state.period_small_s
    return lost, lost / state.period_s, q * math.log(2.0) / math.pi, 2 * q * math.log(2.0) / omega0


def exhibit_figures(state: PendulumState) -> ExhibitFigures:
    """Exhibit and drive figures of ``state``."""
    theta0 = state.amplitude_rad
    energy = (state.torque_n_m * (1.0 - math.cos(theta0))
              + 0.5 * state.stiffness_n_m_per_rad * theta0**2)
    omega_max = math.sqrt(2.0 * energy / state.inertia_kg_m2)
    bob = state.main_bob()
    mass, h, g = state.mass.mass_kg, state.mass.centre_of_mass_m, state.g_m_s2
    load = mass * (g + h * omega_max**2)
    lowest = max(b.bottom_m for b in state.bodies)
    lat = state.design.site.latitude_deg
    sin_lat = abs(math.sin(math.radians(lat)))
    lost, power, cycles, half_time = _damping(state, energy)
    return ExhibitFigures(
        energy_j=energy,
        peak_angular_velocity_rad_s=omega_max,
        peak_speed_m_s=None if bob is None else abs(bob.centre_m) * omega_max,  # a magnitude
        static_load_n=mass * g,
        max_pivot_load_n=load,
        pivot_load_ratio=load / (mass * g),
        release_axial_load_n=mass * g * math.cos(theta0),
        sweep_width_m=None if bob is None else 2.0 * abs(bob.centre_m) * math.sin(theta0),
        lowest_point_m=lowest,
        energy_lost_per_cycle_j=lost,
        drive_power_w=power,
        cycles_to_half_amplitude=cycles,
        time_to_half_amplitude_s=half_time,
        foucault_turn_h=None if sin_lat < 1e-12 else SIDEREAL_DAY_S / sin_lat / 3600.0,
    )
