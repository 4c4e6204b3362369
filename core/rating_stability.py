"""Stability and damping from a rating log: Allan deviation of the rate, Q from a decay.

Allan deviation: overlapping ADEV of the fractional frequency (rate / 86400) with the clock's
time errors as phase data x at spacing τ₀, τ = mτ₀ (NIST SP 1065, Riley 2008, eq. 14)::

    σ²(τ) = Σᵢ (x_{i+2m} − 2x_{i+m} + x_i)² / (2 τ² (N − 2m))

It needs evenly spaced readings: when the intervals spread by more than
:data:`EVEN_SPACING_TOLERANCE` of their mean, no number is given, only a sentence.

Q: with a damping torque −I(ω₀/Q)θ̇ the nonlinear swing θ̈ + (ω₀/Q)θ̇ + ω₀² sin θ = 0 loses
per cycle the energy I(ω₀/Q)∮θ̇ dθ. Averaged over a cycle (valid at clock-like Q) the semi-arc
a obeys da/dt = −(ω₀/(2Q))/Λ′(a) with

    Λ′(a) = K(m) cos(a/2) / (π sin(a/2) ₂F₁(½, ½; 2; m)),  m = sin²(a/2)

(from ∮θ̇ dθ = 4ω₀·4[E(m) − (1 − m)K(m)], period 4K(m)/ω₀, and
E − (1 − m)K = (πm/4)·₂F₁(½, ½; 2; m)); Λ′ → 1/a as a → 0, so Λ(a) = ln a + ∫₀^a (Λ′ − 1/u)du
is the "large-arc logarithm": Λ(a(t)) = Λ(a₀) − ω₀t/(2Q) exactly falls on a straight line, and
the small-arc rule (ln a against t) is its limit. Q and its 1-σ uncertainty come from the
straight-line fit of Λ against elapsed time (``scipy.stats.linregress``). A suspension spring's
own restoring torque is not in this model.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray

from .constants import SECONDS_PER_HOUR
from .errors import DesignError, guarded
from .rating_log import DecayReading, Reading

__all__ = ["AllanDeviation", "allan_deviation", "phase_allan_deviation", "QualityFit",
           "fit_quality_factor", "large_arc_log", "EVEN_SPACING_TOLERANCE"]

FloatArray = NDArray[np.float64]
EVEN_SPACING_TOLERANCE = 0.01
_NODES, _WEIGHTS = np.polynomial.legendre.leggauss(40)


@dataclass(frozen=True)
class AllanDeviation:
    """Overlapping Allan deviation (dimensionless fractional frequency) against τ (s).

    ``tau_s`` and ``adev`` are None when it cannot be given; ``note`` says why or which
    readings it comes from."""

    tau_s: FloatArray | None
    adev: FloatArray | None
    note: str


def phase_allan_deviation(x_s: Sequence[float] | FloatArray, tau0_s: float,
                          m_values: Sequence[int] | None = None) -> tuple[FloatArray, FloatArray]:
    """Overlapping ADEV from evenly spaced phase (time-error) data, NIST SP 1065 eq. 14.

    Parameters
    ----------
    x_s : phase data, s (the clock's error at each reading).
    tau0_s : spacing of the data, s.
    m_values : averaging factors (default: 1, 2, 4, … while at least two second differences
        remain, N − 2m ≥ 2).

    Returns
    -------
    (tau_s, adev)
    """
    x = np.asarray(x_s, dtype=float)
    n = x.size
    if m_values is None:
        top = (n - 2) // 2
        m_values = [2**k for k in range(int(math.log2(top)) + 1)] if top >= 1 else []
    ms = [int(m) for m in m_values if 1 <= int(m) and n - 2 * int(m) >= 1]
    adev = np.empty(len(ms))
    for k, m in enumerate(ms):
        d = x[2 * m:] - 2.0 * x[m:n - m] + x[:n - 2 * m]
        tau = m * tau0_s
        adev[k] = math.sqrt(float(d @ d) / (2.0 * tau**2 * (n - 2 * m)))
    return np.asarray(ms, dtype=float) * tau0_s, adev


def allan_deviation(readings: Sequence[Reading], label: str = "the readings") -> AllanDeviation:
    """Overlapping ADEV of the rate from evenly spaced readings (one segment's).

    Uneven spacing (intervals spreading by more than 1 % of their mean) or fewer than four
    readings give no number, only a sentence in ``note``.
    """
    if len(readings) < 4:
        return AllanDeviation(None, None, f"{label.capitalize()} hold fewer than 4 readings: "
                                          "no Allan deviation.")
    seconds = np.array([(r.at - readings[0].at).total_seconds() for r in readings])
    steps = np.diff(seconds)
    mean = float(np.mean(steps))
    spread = float(np.max(steps) - np.min(steps)) / mean
    if spread > EVEN_SPACING_TOLERANCE:
        return AllanDeviation(None, None,
                              f"The intervals between {label} range from "
                              f"{np.min(steps) / SECONDS_PER_HOUR:.3g} h to "
                              f"{np.max(steps) / SECONDS_PER_HOUR:.3g} h "
                              f"({100 * spread:.3g} % of their mean): the Allan deviation needs "
                              f"evenly spaced readings (within {100 * EVEN_SPACING_TOLERANCE:g} "
                              "%), so none is given.")
    tau, adev = phase_allan_deviation([r.error_s for r in readings], mean)
    return AllanDeviation(tau, adev, f"From {label}: {len(readings)} readings "
                                     f"{mean / SECONDS_PER_HOUR:.4g} h apart.")


def _dlog(a: FloatArray) -> FloatArray:
    """Λ′(a), 1/rad, for semi-arcs a in (0, π) rad."""
    from scipy.special import ellipk, hyp2f1
    m = np.sin(a / 2.0) ** 2
    return ellipk(m) * np.cos(a / 2.0) / (math.pi * np.sin(a / 2.0) * hyp2f1(0.5, 0.5, 2.0, m))


def large_arc_log(semi_arc_rad: Sequence[float] | FloatArray) -> FloatArray:
    """Λ(a) = ln a + ∫₀^a (Λ′(u) − 1/u) du (Gauss–Legendre, 40 nodes; the integrand is smooth).

    Along a free decay Λ falls linearly at ω₀/(2Q) per second (see the module notes)."""
    a = np.atleast_1d(np.asarray(semi_arc_rad, dtype=float))
    u = 0.5 * a[:, None] * (_NODES[None, :] + 1.0)
    integrand = _dlog(u) - 1.0 / u
    return np.log(a) + 0.5 * a * (integrand @ _WEIGHTS)


@dataclass(frozen=True)
class QualityFit:
    """Q from a decay, its 1-σ standard error (None when it cannot be computed), the number of
    decay readings used and a sentence saying how it was fitted."""

    quality_factor: float
    sigma: float | None
    readings: int
    note: str


@guarded("rating_log.decay")
def fit_quality_factor(decay: Sequence[DecayReading], period_small_s: float) -> QualityFit:
    """Fit Q on a large-arc decay (DESIGN §9; DOMAIN §5).

    Parameters
    ----------
    decay : decay readings (elapsed s, semi-arc degrees), at least three, in time order.
    period_small_s : the pendulum's small-arc period 2π/ω₀, s (from the design's model).

    Raises
    ------
    DesignError
        ``rating_log.decay`` with fewer than three readings, or a swing that does not die away.
    """
    from scipy.stats import linregress
    if len(decay) < 3:
        raise DesignError("rating_log.decay", f"has {len(decay)} reading(s): Q needs at least 3")
    if not (isinstance(period_small_s, (int, float)) and math.isfinite(period_small_s)
            and period_small_s > 0):
        raise DesignError("period_small_s", "must be a positive number of seconds")
    t = np.array([d.elapsed_s for d in decay])
    lam = large_arc_log(np.radians([d.semi_arc_deg for d in decay]))
    fit = linregress(t, lam)
    if not fit.slope < 0:
        raise DesignError("rating_log.decay", "the semi-arc does not fall with time, so there "
                                              "is no decay to fit")
    omega0 = 2.0 * math.pi / period_small_s
    q = -omega0 / (2.0 * fit.slope)
    sigma = q * fit.stderr / abs(fit.slope) if len(decay) > 2 else None
    top = max(d.semi_arc_deg for d in decay)
    note = (f"Fitted on {len(decay)} decay readings from {top:.3g}° with the large-arc energy "
            "loss per cycle.")
    return QualityFit(float(q), None if sigma is None or not math.isfinite(sigma)
                      else float(sigma), len(decay), note)
