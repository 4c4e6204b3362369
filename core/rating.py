"""The rating fit (DESIGN §9): per-segment rates and shared condition coefficients.

Model, per segment s (the readings between two adjustments)::

    rate(t) = r_s + k_T (T(t) − T_ref) + k_p (p(t) − p_ref) + k_a (a(t) − a_ref)   [s/day]
    e(t)    = e_s + ∫ rate dt                                      [s; t in days from the
                                                                     segment's first reading]

with the conditions interpolated linearly between readings, so each integral is the trapezoid
rule over the readings. The unknowns (e_s, r_s for every segment, the k's shared by all
segments) come from one linear least-squares fit (``numpy.linalg.lstsq``); their 1-σ
uncertainties are the standard errors √diag(s²(XᵀX)⁻¹), s² = RSS/(n − p).

Rules (stated so the results can be read without the code):

* A segment with fewer than :data:`MIN_SEGMENT_READINGS` readings is left out of the fit with a
  warning naming its readings; when no segment has enough, the fit is refused.
* A condition noted in fewer than :data:`MIN_CONDITION_READINGS` fitted readings, or whose
  values span less than :data:`MIN_SPAN` (2 K, 5 hPa, 0.05°), is *not determined*: its
  coefficient is left out of the fit (its condition is taken as at the reference) and reported
  as None with the reason. So is one whose column cannot be told apart from the segments' own
  offsets and rates (for example a temperature that changed only between segments), or that
  would leave no reading over to judge the uncertainty.
* Where a determined condition is missing from some readings it is interpolated linearly in
  time between the readings that note it (held constant beyond the first and last).
* Rates are quoted at the reference conditions (the design's site temperature, pressure and
  working semi-arc); the residual RMS is √(mean of the squared residuals) of fitted readings.
"""

from __future__ import annotations

import bisect
import math
from dataclasses import dataclass
from datetime import datetime

import numpy as np
from numpy.typing import NDArray

from .constants import SECONDS_PER_DAY
from .errors import DesignError, guarded
from .rating_log import RatingLog, rating_log_from_dict, rating_log_to_dict

__all__ = ["Conditions", "Coefficient", "SegmentFit", "RatingFit", "fit_rating", "segments_of",
           "MIN_SEGMENT_READINGS", "MIN_CONDITION_READINGS", "MIN_SPAN", "CONDITION_NAMES"]

FloatArray = NDArray[np.float64]

MIN_SEGMENT_READINGS = 3
MIN_CONDITION_READINGS = 3
#: Smallest span of a condition over the fitted readings for its coefficient to be fitted.
MIN_SPAN = {"temperature_c": 2.0, "pressure_hpa": 5.0, "semi_arc_deg": 0.05}
CONDITION_NAMES = ("temperature_c", "pressure_hpa", "semi_arc_deg")
_WORDS = {"temperature_c": ("temperatures", "K", "temperature"),
          "pressure_hpa": ("pressures", "hPa", "pressure"),
          "semi_arc_deg": ("semi-arcs", "°", "semi-arc")}


@dataclass(frozen=True)
class Conditions:
    """Temperature (°C), air pressure (hPa) and semi-arc (degrees)."""

    temperature_c: float
    pressure_hpa: float
    semi_arc_deg: float

    def value(self, name: str) -> float:
        return float(getattr(self, name))


@dataclass(frozen=True)
class Coefficient:
    """A shared coefficient: s/day per K, per hPa or per degree of semi-arc.

    ``value`` and ``sigma`` are None when not determined; ``reason`` then says why."""

    condition: str
    value: float | None
    sigma: float | None
    reason: str = ""


@dataclass(frozen=True)
class SegmentFit:
    """One segment: readings ``first``..``last`` (indices into the log's readings).

    ``rate_s_per_day`` is at the reference conditions; None (with ``note``) when the segment
    was left out of the fit."""

    number: int
    first: int
    last: int
    start: datetime
    end: datetime
    rate_s_per_day: float | None
    rate_sigma_s_per_day: float | None
    offset_s: float | None
    note: str = ""

    @property
    def readings(self) -> int:
        return self.last - self.first + 1

    @property
    def fitted(self) -> bool:
        return self.rate_s_per_day is not None


@dataclass(frozen=True)
class RatingFit:
    """The result of :func:`fit_rating`.

    Attributes
    ----------
    segments : every segment that holds readings, in time order.
    temperature, pressure, arc : the shared coefficients (s/day per K, hPa, degree).
    fitted_error_s, residuals_s : per reading of the log, s (NaN for readings left out).
    residual_rms_s : RMS of the residuals of fitted readings, s.
    degrees_of_freedom : n − p.
    parameter_names, covariance : the fitted unknowns and s²(XᵀX)⁻¹ (s, s/day, s/day per unit).
    reference, mean_conditions : the reference conditions; the mean of each noted condition
        over fitted readings (the reference where none is noted).
    warnings : sentences about segments left out and the like.
    """

    segments: tuple[SegmentFit, ...]
    temperature: Coefficient
    pressure: Coefficient
    arc: Coefficient
    fitted_error_s: FloatArray
    residuals_s: FloatArray
    residual_rms_s: float
    degrees_of_freedom: int
    parameter_names: tuple[str, ...]
    covariance: FloatArray
    reference: Conditions
    mean_conditions: Conditions
    warnings: tuple[str, ...]

    def coefficient(self, name: str) -> Coefficient:
        return {"temperature_c": self.temperature, "pressure_hpa": self.pressure,
                "semi_arc_deg": self.arc}[name]

    def latest_fitted(self) -> SegmentFit:
        """The latest segment that was fitted."""
        return [s for s in self.segments if s.fitted][-1]


def segments_of(log: RatingLog) -> list[tuple[int, int]]:
    """(first, last) reading indices of each segment that holds readings, in time order."""
    cuts = [a.at for a in log.adjustments]
    out: list[tuple[int, int]] = []
    current = -1
    for i, r in enumerate(log.readings):
        s = bisect.bisect_left(cuts, r.at)
        if s != current:
            out.append((i, i))
            current = s
        else:
            out[-1] = (out[-1][0], i)
    return out


def _label(number: int, first: int, last: int, start: datetime) -> str:
    span = f"reading {first}" if first == last else f"readings {first}–{last}"
    return f"segment {number + 1} ({span}, from {start.isoformat()})"


def _fill(times: FloatArray, values: list[float | None]) -> FloatArray:
    """Missing values interpolated linearly in time, held constant beyond the ends."""
    have = np.array([v is not None for v in values])
    known = np.array([v for v in values if v is not None], dtype=float)
    return np.interp(times, times[have], known)


def _integral(times_d: FloatArray, values: FloatArray, starts: FloatArray) -> FloatArray:
    """∫ values dt from each segment's first reading, trapezoid rule (``starts`` marks them)."""
    steps = np.empty_like(values)
    steps[0] = 0.0
    steps[1:] = 0.5 * (values[1:] + values[:-1]) * np.diff(times_d)
    steps[starts] = 0.0
    seg_id = np.cumsum(starts) - 1
    total = np.cumsum(steps)
    return total - (total[starts] - steps[starts])[seg_id]


@guarded("rating_log")
def fit_rating(log: RatingLog, reference: Conditions) -> RatingFit:
    """Fit the segments' offsets and rates and the shared coefficients (DESIGN §9).

    Parameters
    ----------
    log : RatingLog
        The rating log (checked again here: times in order, conditions in range).
    reference : Conditions
        Reference temperature (°C), pressure (hPa) and semi-arc (degrees): the design's site
        temperature and pressure and its working semi-arc.

    Raises
    ------
    DesignError
        ``rating_log.readings`` when no segment has three readings.
    """
    log = rating_log_from_dict(rating_log_to_dict(log))
    warnings: list[str] = []
    segs = segments_of(log)
    used: list[tuple[int, int, int]] = []
    for number, (first, last) in enumerate(segs):
        if last - first + 1 < MIN_SEGMENT_READINGS:
            warnings.append(f"{_label(number, first, last, log.readings[first].at).capitalize()}"
                            f" has only {last - first + 1} reading(s); at least "
                            f"{MIN_SEGMENT_READINGS} are needed to rate a segment, so it is left "
                            "out of the fit.")
        else:
            used.append((number, first, last))
    if not used:
        raise DesignError("rating_log.readings",
                          f"no segment has {MIN_SEGMENT_READINGS} readings (there are "
                          f"{len(log.readings)} readings in {len(segs)} segment(s)): a rate "
                          "needs at least three readings between adjustments")
    idx = np.concatenate([np.arange(f, last + 1) for _n, f, last in used])
    readings = [log.readings[i] for i in idx]
    n, m = len(readings), len(used)
    epoch = readings[0].at
    t_all = np.array([(r.at - epoch).total_seconds() / SECONDS_PER_DAY for r in readings])
    starts = np.zeros(n, dtype=bool)
    seg_of = np.empty(n, dtype=int)
    pos = 0
    for j, (_num, f, last) in enumerate(used):
        starts[pos] = True
        seg_of[pos:pos + last - f + 1] = j
        pos += last - f + 1
    t_seg = t_all - t_all[starts][seg_of]
    columns = [(seg_of == j).astype(float) for j in range(m)] + \
              [np.where(seg_of == j, t_seg, 0.0) for j in range(m)]
    names = [f"offset_{j}" for j in range(m)] + [f"rate_{j}" for j in range(m)]
    coeffs: dict[str, Coefficient] = {}
    means: dict[str, float] = {}
    for cond in CONDITION_NAMES:
        values = [getattr(r, cond) for r in readings]
        noted = [v for v in values if v is not None]
        means[cond] = float(np.mean(noted)) if noted else reference.value(cond)
        reason = _undetermined(cond, noted)
        if not reason:
            filled = _fill(t_all, values) - reference.value(cond)
            col = _integral(t_all, filled, starts)
            reason = _identifiable(columns, col, n)
            if not reason:
                columns.append(col)
                names.append(cond)
        coeffs[cond] = Coefficient(cond, None, None, reason)
    x = np.column_stack(columns)
    y = np.array([r.error_s for r in readings])
    beta, _res, _rank, _sv = np.linalg.lstsq(x, y, rcond=None)
    fitted = x @ beta
    resid = y - fitted
    p = x.shape[1]
    dof = n - p
    if dof > 0:
        scale = np.linalg.norm(x, axis=0)
        xs = x / scale
        cov = float(resid @ resid) / dof * np.linalg.inv(xs.T @ xs) / np.outer(scale, scale)
    else:
        cov = np.full((p, p), math.nan)
        warnings.append("Every fitted unknown is fixed by exactly one reading: no reading is "
                        "left over to judge the uncertainties, so none are given.")
    sigma = np.sqrt(np.diag(cov))
    for k, name in enumerate(names[2 * m:]):
        j = 2 * m + k
        coeffs[name] = Coefficient(name, float(beta[j]), _finite(sigma[j]), "")
    fitted_all = np.full(len(log.readings), math.nan)
    resid_all = np.full(len(log.readings), math.nan)
    fitted_all[idx], resid_all[idx] = fitted, resid
    segments = _segments(log, segs, used, beta, sigma, m)
    return RatingFit(
        segments=tuple(segments), temperature=coeffs["temperature_c"],
        pressure=coeffs["pressure_hpa"], arc=coeffs["semi_arc_deg"],
        fitted_error_s=fitted_all, residuals_s=resid_all,
        residual_rms_s=float(np.sqrt(np.mean(resid**2))), degrees_of_freedom=dof,
        parameter_names=tuple(names), covariance=cov, reference=reference,
        mean_conditions=Conditions(means["temperature_c"], means["pressure_hpa"],
                                   means["semi_arc_deg"]),
        warnings=tuple(warnings))


def _finite(x: float) -> float | None:
    return float(x) if math.isfinite(x) else None


def _undetermined(cond: str, noted: list[float]) -> str:
    plural, unit, single = _WORDS[cond]
    if len(noted) < MIN_CONDITION_READINGS:
        have = "no fitted reading notes" if not noted else \
            f"only {len(noted)} fitted reading(s) note"
        return f"{have} the {single} ({MIN_CONDITION_READINGS} needed)"
    span = max(noted) - min(noted)
    if span < MIN_SPAN[cond]:
        sep = "" if unit == "°" else " "
        return (f"{plural} span only {span:.2g}{sep}{unit} (at least {MIN_SPAN[cond]:g}{sep}"
                f"{unit} needed)")
    return ""


def _identifiable(columns: list[FloatArray], col: FloatArray, n: int) -> str:
    if len(columns) + 1 >= n:
        return "too few readings: none would be left over to judge its uncertainty"
    x = np.column_stack(columns + [col])
    x = x / np.linalg.norm(x, axis=0)
    if np.linalg.matrix_rank(x, tol=1e-9 * math.sqrt(n)) < x.shape[1]:
        return ("it changed only along with the segments, so its effect cannot be told apart "
                "from the segments' own rates")
    return ""


def _segments(log: RatingLog, segs: list[tuple[int, int]], used: list[tuple[int, int, int]],
              beta: FloatArray, sigma: FloatArray, m: int) -> list[SegmentFit]:
    by_number = {num: j for j, (num, _f, _l) in enumerate(used)}
    out = []
    for number, (first, last) in enumerate(segs):
        start, end = log.readings[first].at, log.readings[last].at
        j = by_number.get(number)
        if j is None:
            out.append(SegmentFit(number, first, last, start, end, None, None, None,
                                  f"only {last - first + 1} reading(s): left out of the fit"))
        else:
            out.append(SegmentFit(number, first, last, start, end, float(beta[m + j]),
                                  _finite(sigma[m + j]), float(beta[j])))
    return out
