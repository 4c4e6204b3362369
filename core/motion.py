"""Motion released from rest at the working semi-arc: exact and linearised.

Notes
-----
Exact, no spring and no damping (Jacobi closed form; Beléndez et al., Rev. Bras. Ensino Fís.
29, 645 (2007)): with m = sin²(θ₀/2) (the *parameter*, as ``scipy.special.ellipj`` takes it),
K = K(m), ω₀ = √(A/I),
θ(t) = 2 arcsin(√m · sn(K − ω₀ t | m)),  θ̇(t) = −2 √m ω₀ cn(K − ω₀ t | m).

Otherwise the equation I θ̈ = −A sin θ − k θ − I (ω₀/Q) θ̇ (ω₀ = √((A + k)/I), viscous damping
of quality factor Q) is integrated by LSODA (``scipy.integrate.odeint``) at rtol 1e-11. Without
damping the motion is periodic: one period is integrated and repeated.

Linearised: θ(t) = θ₀ cos(2π t / T₀), damped by exp(−ω₀ t / (2Q)) when Q is given.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray
from scipy.special import ellipj, ellipk, ellipkm1

__all__ = ["Motion", "motion", "jacobi_motion", "integrated_motion"]

FloatArray = NDArray[np.float64]


@dataclass(frozen=True)
class Motion:
    """Sampled motion from rest at θ₀.

    Attributes
    ----------
    time_s : time, s.
    angle_rad : exact angle, rad.
    angular_velocity_rad_s : exact angular velocity, rad/s.
    linear_angle_rad : linearised angle, rad.
    method : "jacobi" or "lsoda".
    """

    time_s: FloatArray
    angle_rad: FloatArray
    angular_velocity_rad_s: FloatArray
    linear_angle_rad: FloatArray
    method: str

    @property
    def difference_rad(self) -> FloatArray:
        """Exact minus linearised angle, rad."""
        return self.angle_rad - self.linear_angle_rad


def _quarter_period_k(theta0: float) -> float:
    """K(sin²(θ₀/2)), accurate up to 180° (via ellipkm1 past 90°)."""
    if theta0 > np.pi / 2:
        return float(ellipkm1(np.cos(theta0 / 2.0) ** 2))
    return float(ellipk(np.sin(theta0 / 2.0) ** 2))


def jacobi_motion(omega0_rad_s: float, theta0_rad: float, time_s: FloatArray
                  ) -> tuple[FloatArray, FloatArray]:
    """Exact (θ, θ̇) of the undamped pendulum without spring; ω₀ = √(A/I), rad/s."""
    k = np.sin(theta0_rad / 2.0)
    m = k * k
    sn, cn, _dn, _ph = ellipj(_quarter_period_k(theta0_rad) - omega0_rad_s * time_s, m)
    return 2.0 * np.arcsin(np.clip(k * sn, -1.0, 1.0)), -2.0 * k * omega0_rad_s * cn


def integrated_motion(inertia: float, torque: float, stiffness: float, theta0: float,
                      damping_per_s: float, time_s: FloatArray) -> tuple[FloatArray, FloatArray]:
    """(θ, θ̇) by LSODA at rtol 1e-11; ``damping_per_s`` is ω₀/Q (0 for none)."""
    from scipy.integrate import odeint

    a, c, k = torque / inertia, damping_per_s, stiffness / inertia

    def rhs(_t: float, y: FloatArray) -> list[float]:
        return [y[1], -a * np.sin(y[0]) - k * y[0] - c * y[1]]

    def jac(_t: float, y: FloatArray) -> list[list[float]]:
        return [[0.0, 1.0], [-a * np.cos(y[0]) - k, -c]]

    sol = odeint(rhs, [theta0, 0.0], time_s, Dfun=jac, tfirst=True, rtol=1e-11,
                 atol=1e-13 * max(theta0, 1e-3), mxstep=200000)
    return sol[:, 0], sol[:, 1]


def motion(inertia_kg_m2: float, torque_n_m: float, stiffness_n_m_per_rad: float,
           theta0_rad: float, period_s: float, period_small_s: float,
           quality_factor: float | None, periods: int = 3, points_per_period: int = 400
           ) -> Motion:
    """Motion from rest at θ₀ over ``periods`` exact periods.

    Parameters
    ----------
    inertia_kg_m2, torque_n_m, stiffness_n_m_per_rad : float
        I, A and k of the equation of motion.
    theta0_rad : float
        Semi-arc, rad.
    period_s, period_small_s : float
        Exact and linearised periods, s (already computed by :mod:`core.period`).
    quality_factor : float or None
        Q; None for no damping.
    """
    n = periods * points_per_period
    time = np.linspace(0.0, periods * period_s, n + 1)
    omega0 = np.sqrt((torque_n_m + stiffness_n_m_per_rad) / inertia_kg_m2)
    linear = theta0_rad * np.cos(2.0 * np.pi * time / period_small_s)
    if quality_factor is not None:
        decay = omega0 / quality_factor
        linear = linear * np.exp(-0.5 * decay * time)
        angle, velocity = integrated_motion(inertia_kg_m2, torque_n_m, stiffness_n_m_per_rad,
                                            theta0_rad, decay, time)
        return Motion(time, angle, velocity, linear, "lsoda")
    if stiffness_n_m_per_rad == 0.0:
        angle, velocity = jacobi_motion(float(np.sqrt(torque_n_m / inertia_kg_m2)), theta0_rad,
                                        time)
        return Motion(time, angle, velocity, linear, "jacobi")
    one = time[: points_per_period + 1]
    a1, v1 = integrated_motion(inertia_kg_m2, torque_n_m, stiffness_n_m_per_rad, theta0_rad,
                               0.0, one)
    angle = np.concatenate([np.tile(a1[:-1], periods), a1[-1:]])
    velocity = np.concatenate([np.tile(v1[:-1], periods), v1[-1:]])
    return Motion(time, angle, velocity, linear, "lsoda")
