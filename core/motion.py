"""Motion released from rest at the working semi-arc: exact and linearised.

Notes
-----
Exact, no spring and no damping (Jacobi closed form; Beléndez et al., Rev. Bras. Ensino Fís.
29, 645 (2007)): with m = sin²(θ₀/2) (the *parameter*, as ``scipy.special.ellipj`` takes it),
K = K(m), ω₀ = √(A/I),
θ(t) = 2 arcsin(√m · sn(K − ω₀ t | m)),  θ̇(t) = −2 √m ω₀ cn(K − ω₀ t | m).

Otherwise the equation I θ̈ = −A sin θ − k θ − I (ω₀/Q) θ̇ (ω₀ = √((A + k)/I), viscous damping
of quality factor Q) is integrated by LSODA (``scipy.integrate.odeint``) in scaled variables:
time τ = ω₀ t (one small-arc period is 2π whatever I, A and k are) and angle u = θ/θ₀, so

    u'' = −α sin(θ₀ u)/θ₀ − β u − u'/Q,   α = A/(A + k), β = k/(A + k), α + β = 1.

Every coefficient is at most 1, so a spring 10⁸ times stiffer than gravity, a 1 mg bob or a
microsecond period all give the same O(1) problem: the step size is a fixed fraction of a
period and the work per period is bounded — at rtol 1e-11, atol 1e-12 on u and u', three
periods took at most 2,300 LSODA steps over a grid of α ∈ [0, 1], θ₀ to 179.9° and 1/Q to 1
(a few hundred at clock arcs); ``mxstep`` (:data:`MAX_STEPS` per sample interval) is a guard
only. The accuracy kept is that of the tolerances: against the closed form over five periods,
2e-10 θ₀ at 30°, 3e-9 θ₀ at 120°, 7e-8 θ₀ at 170° (the phase error grows near the
separatrix; tests/core/test_motion.py).
Without damping the motion is periodic: one period is integrated and repeated.

Linearised (the linear oscillator released from rest, A. P. French, *Vibrations and Waves*,
ch. 3): θ(t) = θ₀ cos(ω₀ t) without damping, ω₀ = 2π/T₀; with Q, γ = ω₀/(2Q) and
ω_d = ω₀ √(1 − 1/(4Q²)),  θ(t) = θ₀ e^(−γt) (cos ω_d t + (γ/ω_d) sin ω_d t)  (θ̇(0) = 0).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray
from scipy.special import ellipj, ellipk, ellipkm1

__all__ = ["Motion", "motion", "jacobi_motion", "integrated_motion", "integrated_motion_steps",
           "linear_motion", "MAX_STEPS"]

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


MAX_STEPS = 200_000  # guard on LSODA steps per sample interval (tens are used)


def _scaled_solution(alpha: float, beta: float, theta0: float, damping: float,
                     tau: FloatArray) -> tuple[FloatArray, FloatArray, int]:
    """(u, u', steps) of u'' = −α sin(θ₀u)/θ₀ − βu − damping·u', u(0) = 1, u'(0) = 0."""
    from scipy.integrate import odeint

    small = theta0 < 1e-4  # sin(θ₀u)/θ₀ = u (1 − θ₀²u²/6): exact to rounding below 1e-4 rad
    alpha, beta, theta0, damping = float(alpha), float(beta), float(theta0), float(damping)

    # Plain floats and math (not numpy scalars): LSODA calls these hundreds of times per
    # analysis, and numpy's scalar arithmetic cost ~0.7 µs more per call.
    def rhs(y: FloatArray, _t: float) -> list[float]:
        u, v = y.tolist()
        s = u if small else math.sin(theta0 * u) / theta0
        return [v, -alpha * s - beta * u - damping * v]

    def jac(y: FloatArray, _t: float) -> list[list[float]]:
        c = 1.0 if small else math.cos(theta0 * float(y[0]))
        return [[0.0, 1.0], [-alpha * c - beta, -damping]]

    sol, info = odeint(rhs, [1.0, 0.0], tau, Dfun=jac, rtol=1e-11, atol=1e-12,
                       mxstep=MAX_STEPS, full_output=True)
    return sol[:, 0], sol[:, 1], int(info["nst"][-1]) if len(info["nst"]) else 0


def integrated_motion(inertia: float, torque: float, stiffness: float, theta0: float,
                      damping_per_s: float, time_s: FloatArray) -> tuple[FloatArray, FloatArray]:
    """(θ, θ̇) by LSODA on the scaled equation of the module notes; ``damping_per_s`` is
    ω₀/Q (0 for none), rad and rad/s."""
    theta, velocity, _steps = integrated_motion_steps(inertia, torque, stiffness, theta0,
                                                      damping_per_s, time_s)
    return theta, velocity


def integrated_motion_steps(inertia: float, torque: float, stiffness: float, theta0: float,
                            damping_per_s: float, time_s: FloatArray
                            ) -> tuple[FloatArray, FloatArray, int]:
    """As :func:`integrated_motion`, with the number of integrator steps taken."""
    total = torque + stiffness
    omega0 = float(np.sqrt(total / inertia))
    alpha, beta = torque / total, stiffness / total
    u, du, steps = _scaled_solution(alpha, beta, theta0, damping_per_s / omega0,
                                    omega0 * np.asarray(time_s, dtype=float))
    return theta0 * u, theta0 * omega0 * du, steps


def linear_motion(theta0_rad: float, period_small_s: float, quality_factor: float | None,
                  time_s: FloatArray) -> FloatArray:
    """The linear oscillator released from rest at θ₀ (module notes), rad."""
    omega0 = 2.0 * np.pi / period_small_s
    if quality_factor is None:
        return theta0_rad * np.cos(omega0 * time_s)
    gamma = 0.5 * omega0 / quality_factor
    omega_d = omega0 * np.sqrt(1.0 - 1.0 / (4.0 * quality_factor * quality_factor))
    phase = omega_d * time_s
    return theta0_rad * np.exp(-gamma * time_s) * (np.cos(phase)
                                                   + (gamma / omega_d) * np.sin(phase))


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
    linear = linear_motion(theta0_rad, period_small_s, quality_factor, time)
    if quality_factor is not None:
        decay = omega0 / quality_factor
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
