"""What the rating view draws beyond the report itself: the rate between readings against
temperature, and the measured and modelled lines of rate against temperature.

Both work on a :func:`core.rating_report.rating_report` object, so the fit is not made twice.

Rules (so the points can be read without the code):

* A point is the rate between two consecutive readings of one fitted segment, (e₂ − e₁)/Δt in
  s/day, at the mean of their two temperatures (pairs without both temperatures are skipped).
* Every point is referred to the latest fitted segment (the difference of the two segments'
  fitted rates is added) and, where the fit determined them, to the log's mean pressure and
  semi-arc (the fitted pressure and arc terms are removed), so all points sit on one line.
* The measured line is the latest segment's rate at the log's mean conditions plus the fitted
  temperature coefficient times (T − mean T); the model's line is the model's rate there plus
  its own temperature coefficient times the same.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

import numpy as np
from numpy.typing import NDArray

from .constants import SECONDS_PER_DAY
from .rating_log import RatingLog

__all__ = ["RatePoints", "rate_temperature_points", "rate_temperature_lines"]

FloatArray = NDArray[np.float64]
RatePoints = tuple[FloatArray, FloatArray]
_TERMS = (("pressure_hpa", "pressure_coefficient_s_per_day_per_hpa"),
          ("semi_arc_deg", "arc_coefficient_s_per_day_per_deg"))


def _mid(a: float | None, b: float | None) -> float | None:
    return None if a is None or b is None else 0.5 * (a + b)


def rate_temperature_points(log: RatingLog, report: Mapping[str, Any]) -> RatePoints:
    """Temperatures (°C) and rates (s/day) between consecutive readings (see the module notes).

    Returns empty arrays when no segment was fitted or no pair notes both temperatures.
    """
    segments = [s for s in report.get("segments") or [] if s.get("rate_s_per_day") is not None]
    mean = report.get("mean_conditions") or {}
    if not segments or not mean:
        return np.empty(0), np.empty(0)
    latest = segments[-1]["rate_s_per_day"]
    temps: list[float] = []
    rates: list[float] = []
    for seg in segments:
        shift = latest - seg["rate_s_per_day"]
        rows = log.readings[seg["first_reading"]:seg["last_reading"] + 1]
        for r1, r2 in zip(rows[:-1], rows[1:], strict=True):
            t = _mid(r1.temperature_c, r2.temperature_c)
            days = (r2.at - r1.at).total_seconds() / SECONDS_PER_DAY
            if t is None or days <= 0.0:
                continue
            rate = (r2.error_s - r1.error_s) / days + shift
            for cond, key in _TERMS:
                k = report.get(key)
                x = _mid(getattr(r1, cond), getattr(r2, cond))
                if k is not None and x is not None:
                    rate -= k * (x - mean[cond])
            temps.append(t)
            rates.append(rate)
    return np.asarray(temps, dtype=float), np.asarray(rates, dtype=float)


def rate_temperature_lines(report: Mapping[str, Any], low_c: float, high_c: float
                           ) -> tuple[RatePoints | None, RatePoints | None]:
    """The measured and the model's rate (s/day) against temperature from ``low_c`` to
    ``high_c`` (°C), at the log's mean pressure and semi-arc; None where not known (no
    determined temperature coefficient, or a model without a target)."""
    mean = report.get("mean_conditions") or {}
    if not mean:
        return None, None
    t = np.array([low_c, high_c], dtype=float)
    dt = t - mean["temperature_c"]
    measured = None
    rate = report.get("measured_rate_at_mean_conditions_s_per_day")
    k = report.get("temperature_coefficient_s_per_day_per_k")
    if rate is not None and k is not None:
        measured = (t, rate + k * dt)
    model = report.get("model") or {}
    modelled = None
    if model.get("rate_s_per_day") is not None and \
            model.get("temperature_coefficient_s_per_day_per_k") is not None:
        modelled = (t, model["rate_s_per_day"]
                    + model["temperature_coefficient_s_per_day_per_k"] * dt)
    return measured, modelled
