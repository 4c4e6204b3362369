"""Periods of the rigid pendulum: linearised, exact at amplitude, and against amplitude.

The equation of motion is I θ̈ = −A sin θ − k θ, with I the moment of inertia about the pivot
(kg·m², air's added inertia included), A = g Σ(m − ρV) z the gravity torque coefficient (N·m)
and k the suspension spring's stiffness (N·m/rad). Every period here is a full period (s).

Notes
-----
Linearised: T₀ = 2π √(I / (A + k)).

Exact, k = 0: T = 2π √(I/A) / AGM(1, cos(θ₀/2)) — the arithmetic-geometric-mean form of
4 √(I/A) K(sin²(θ₀/2)) (Carvalhaes & Suppes, Am. J. Phys. 76, 1150 (2008); Abramowitz &
Stegun ch. 17). The AGM converges quadratically and is exact to rounding up to 179.9°.

Exact, k > 0: T = 4 ∫₀^θ₀ dθ / √(2 (V(θ₀) − V(θ)) / I), V = A(1 − cos θ) + kθ²/2. With
θ = θ₀ sin u the endpoint singularity disappears: V(θ₀) − V(θ) = cos²u · F(u),
F(u) = A G(u) + k θ₀²/2, G(u) = θ₀ sinc(x) sin((θ₀ + θ)/2) / (1 + sin u),
x = θ₀ cos²u / (2(1 + sin u)), so T = 4 θ₀ √(I/2) ∫₀^{π/2} F^(−1/2) du, evaluated by
Gauss–Legendre with the node count doubled until it converges. [computed]
"""

from __future__ import annotations

import math
from functools import lru_cache

import numpy as np
from numpy.typing import ArrayLike, NDArray

__all__ = ["period_small", "period_exact", "period_exact_and_slopes", "period_at", "agm"]

FloatArray = NDArray[np.float64]

_TOL = 2e-15


def period_small(inertia_kg_m2: float, torque_n_m: float, stiffness_n_m_per_rad: float = 0.0
                 ) -> float:
    """Linearised (vanishing-amplitude) period T₀, s."""
    return float(2.0 * np.pi * np.sqrt(inertia_kg_m2 / (torque_n_m + stiffness_n_m_per_rad)))


def agm(a: ArrayLike, b: ArrayLike) -> FloatArray:
    """Arithmetic-geometric mean of ``a`` and ``b`` (element-wise, positive)."""
    x = np.array(a, dtype=float, copy=True)
    y = np.array(b, dtype=float, copy=True)
    x, y = np.broadcast_arrays(x, y)
    x, y = x.copy(), y.copy()
    for _ in range(40):
        if np.all(np.abs(x - y) <= _TOL * x):
            break
        x, y = 0.5 * (x + y), np.sqrt(x * y)
    return 0.5 * (x + y)


@lru_cache(maxsize=16)
def _nodes(n: int) -> tuple[FloatArray, FloatArray]:
    from scipy.special import roots_legendre

    x, w = roots_legendre(n)
    u = (x + 1.0) * (np.pi / 4.0)
    return u, w * (np.pi / 4.0)


def _g(theta0: FloatArray, u: FloatArray) -> FloatArray:
    """G(u) of the module notes, shape (len(theta0), len(u))."""
    th0 = theta0[:, None]
    su = np.sin(u)[None, :]
    cu2 = np.cos(u)[None, :] ** 2
    x = th0 * cu2 / (2.0 * (1.0 + su))
    return th0 * np.sinc(x / np.pi) * np.sin(0.5 * th0 * (1.0 + su)) / (1.0 + su)


def _quadrature(inertia: float, torque: float, k: float, theta0: FloatArray, n: int
                ) -> tuple[FloatArray, FloatArray, FloatArray]:
    """(T, ∂T/∂A, ∂T/∂k) by n-point Gauss–Legendre."""
    u, w = _nodes(n)
    g = _g(theta0, u)
    f = torque * g + 0.5 * k * theta0[:, None] ** 2
    inv = f ** -0.5
    scale = 4.0 * theta0 * np.sqrt(inertia / 2.0)
    period = scale * (inv @ w)
    d_torque = scale * ((-0.5 * inv**3 * g) @ w)
    d_k = scale * ((-0.25 * inv**3 * theta0[:, None] ** 2) @ w)
    return period, d_torque, d_k


_MAX_NODES = 2048
_CONVERGED = 5e-14


def _spring_periods(inertia: float, torque: float, k: float, theta0: FloatArray
                    ) -> tuple[FloatArray, FloatArray, FloatArray]:
    """Gauss–Legendre with the node count doubled per amplitude until two estimates agree to
    5e-14, or until the difference stops shrinking (rounding floor, reached only within a
    fraction of a degree of 180° with a very weak spring: there the result is good to ~1e-12),
    at most 2048 nodes."""
    n = 32
    out = _quadrature(inertia, torque, k, theta0, n)
    todo = np.ones(theta0.shape, dtype=bool)
    last_gap = np.full(theta0.shape, np.inf)
    while n < _MAX_NODES and todo.any():
        n *= 2
        idx = np.flatnonzero(todo)
        finer = _quadrature(inertia, torque, k, theta0[idx], n)
        gap = np.abs(finer[0] - out[0][idx]) / finer[0]
        for arr, new in zip(out, finer, strict=True):
            arr[idx] = new
        done = (gap <= _CONVERGED) | (gap > 0.5 * last_gap[idx])
        last_gap[idx] = gap
        todo[idx[done]] = False
    return out


def period_exact_and_slopes(inertia_kg_m2: float, torque_n_m: float,
                            stiffness_n_m_per_rad: float, amplitude_rad: ArrayLike
                            ) -> tuple[FloatArray, FloatArray, FloatArray]:
    """Exact period T (s) at each amplitude, with ∂T/∂A (s/(N·m)) and ∂T/∂k (s·rad/(N·m)).

    ∂T/∂I is always T/(2I): the period scales as √I at fixed A and k.
    """
    theta0 = np.atleast_1d(np.asarray(amplitude_rad, dtype=float))
    if stiffness_n_m_per_rad == 0.0:
        t = 2.0 * np.pi * np.sqrt(inertia_kg_m2 / torque_n_m) / agm(1.0, np.cos(theta0 / 2.0))
        slope_k = _quadrature(inertia_kg_m2, torque_n_m, 0.0, theta0, 64)[2]
        return t, -t / (2.0 * torque_n_m), slope_k
    return _spring_periods(inertia_kg_m2, torque_n_m, stiffness_n_m_per_rad, theta0)


def period_exact(inertia_kg_m2: float, torque_n_m: float, stiffness_n_m_per_rad: float,
                 amplitude_rad: ArrayLike) -> FloatArray:
    """Exact full period, s, at each amplitude (radians, in (0, π)).

    Examples
    --------
    >>> float(period_exact(1.0, 1.0, 0.0, [1e-9])[0] / (2 * np.pi))
    1.0
    """
    theta0 = np.atleast_1d(np.asarray(amplitude_rad, dtype=float))
    if stiffness_n_m_per_rad == 0.0:
        return 2.0 * np.pi * np.sqrt(inertia_kg_m2 / torque_n_m) / agm(1.0, np.cos(theta0 / 2.0))
    return _spring_periods(inertia_kg_m2, torque_n_m, stiffness_n_m_per_rad, theta0)[0]


def period_at(inertia_kg_m2: float, torque_n_m: float, stiffness_n_m_per_rad: float,
              amplitude_rad: float) -> float:
    """Exact full period, s, at one amplitude (rad): the scalar fast path of
    :func:`period_exact`, for the many single evaluations of sensitivities and solvers."""
    if stiffness_n_m_per_rad != 0.0:
        return float(_spring_periods(inertia_kg_m2, torque_n_m, stiffness_n_m_per_rad,
                                     np.array([amplitude_rad]))[0][0])
    a, b = 1.0, math.cos(amplitude_rad / 2.0)
    for _ in range(40):
        if abs(a - b) <= _TOL * a:
            break
        a, b = 0.5 * (a + b), math.sqrt(a * b)
    return 2.0 * math.pi * math.sqrt(inertia_kg_m2 / torque_n_m) / (0.5 * (a + b))
