"""Phase-portrait data: orbits (level sets of the energy) and the separatrix.

Notes
-----
E(θ, θ̇) = ½ I θ̇² + V(θ), V = A(1 − cos θ) + kθ²/2, is conserved without damping. A swinging
orbit of amplitude θ₀ is parametrised by θ = θ₀ sin u, θ̇ = cos u · √(2 F(u) / I) with F of
:mod:`core.period` — smooth and closed, no contouring. Without a spring the separatrix is
θ̇ = ±2 √(A/I) cos(θ/2) (energy 2A); orbits above it go over the top.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from .period import _g

__all__ = ["Orbit", "PhasePortrait", "phase_portrait"]

FloatArray = NDArray[np.float64]


@dataclass(frozen=True)
class Orbit:
    """One closed curve of the phase plane: angle (rad) and angular velocity (rad/s)."""

    label: str
    angle_rad: FloatArray
    angular_velocity_rad_s: FloatArray


@dataclass(frozen=True)
class PhasePortrait:
    """The current orbit, neighbouring swinging orbits, the separatrix and rotating orbits."""

    current: Orbit
    neighbours: tuple[Orbit, ...]
    separatrix: Orbit | None
    rotating: tuple[Orbit, ...]


def swing_orbit(inertia: float, torque: float, stiffness: float, theta0: float,
                points: int = 257) -> tuple[FloatArray, FloatArray]:
    """(θ, θ̇) around the closed orbit of amplitude θ₀ (rad)."""
    u = np.linspace(0.0, 2.0 * np.pi, points)
    # V is even, so F depends on |sin u| only; θ̇ carries the sign of cos u.
    half = np.arcsin(np.abs(np.sin(u)))
    f = torque * _g(np.array([theta0]), half)[0] + 0.5 * stiffness * theta0**2
    return theta0 * np.sin(u), np.cos(u) * np.sqrt(2.0 * np.maximum(f, 0.0) / inertia)


def _separatrix_angle(torque: float, stiffness: float) -> float | None:
    """First θ > 0 where V has a maximum, rad; None when V rises for ever."""
    if stiffness == 0.0:
        return float(np.pi)
    theta = np.linspace(np.pi / 2, 20 * np.pi, 20000)
    slope = torque * np.sin(theta) + stiffness * theta
    neg = np.flatnonzero(slope <= 0.0)
    if neg.size == 0:
        return None
    from scipy.optimize import brentq
    i = int(neg[0])
    return float(brentq(lambda x: torque * np.sin(x) + stiffness * x, theta[i - 1], theta[i]))


def phase_portrait(inertia: float, torque: float, stiffness: float, theta0: float
                   ) -> PhasePortrait:
    """Orbits around the working amplitude θ₀ (rad) and the separatrix, for plotting."""
    current = Orbit(f"{np.degrees(theta0):.3g}°", *swing_orbit(inertia, torque, stiffness, theta0))
    sep_angle = _separatrix_angle(torque, stiffness)
    limit = (sep_angle if sep_angle is not None else 2 * np.pi) * 0.995
    amplitudes = sorted({min(theta0 * f, limit) for f in (0.25, 0.5, 0.75, 1.5, 2.0, 3.0)})
    neighbours = tuple(Orbit(f"{np.degrees(a):.3g}°", *swing_orbit(inertia, torque, stiffness, a))
                       for a in amplitudes if abs(a - theta0) > 1e-9)
    separatrix = None
    rotating: tuple[Orbit, ...] = ()
    if sep_angle is not None:
        theta = np.linspace(-sep_angle, sep_angle, 257)
        e_sep = torque * (1 - np.cos(sep_angle)) + 0.5 * stiffness * sep_angle**2
        v = torque * (1 - np.cos(theta)) + 0.5 * stiffness * theta**2
        speed = np.sqrt(2.0 * np.maximum(e_sep - v, 0.0) / inertia)
        separatrix = Orbit("separatrix", np.concatenate([theta, theta[::-1]]),
                           np.concatenate([speed, -speed[::-1]]))
        if stiffness == 0.0:
            rotating = tuple(
                Orbit(f"over the top, {f:g}× separatrix energy", theta,
                      sign * np.sqrt(2.0 * (f * e_sep - v) / inertia))
                for f in (1.15, 1.4) for sign in (1.0, -1.0))
    return PhasePortrait(current, neighbours, separatrix, rotating)
