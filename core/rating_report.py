"""``penduline rating``: the rating fit, the model beside it, the correction, stability and Q,
as one JSON-ready object (:func:`rating_report`) and as text (:func:`rating_text`).

Rules: rates are at the design's reference conditions (site temperature and pressure, working
semi-arc); the model is quoted at the log's mean conditions (the mean over fitted readings of
each noted condition, the reference where none is noted); the correction is for the latest
fitted segment's rate, from the model's sensitivities at the reference conditions; the Allan
deviation comes from the fitted segment with the most readings among those evenly spaced;
Q needs three decay readings. Every float is finite or null.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Any

import numpy as np

from .analysis import analyse
from .constants import SECONDS_PER_DAY
from .design import Design
from .errors import DesignError, guarded
from .rating import CONDITION_NAMES, Conditions, RatingFit, fit_rating
from .rating_log import RatingLog
from .rating_model import correction, model_at_conditions, reference_conditions
from .rating_stability import AllanDeviation, allan_deviation, fit_quality_factor

__all__ = ["RATING_KEYS", "rating_report", "rating_text", "rate_at"]

#: Keys of the ``penduline rating --json`` object that the issue asks for (more follow them).
RATING_KEYS = (
    "segments", "temperature_coefficient_s_per_day_per_k",
    "temperature_coefficient_s_per_day_per_k_sigma", "pressure_coefficient_s_per_day_per_hpa",
    "pressure_coefficient_s_per_day_per_hpa_sigma", "arc_coefficient_s_per_day_per_deg",
    "arc_coefficient_s_per_day_per_deg_sigma", "residual_rms_s", "model", "correction",
    "allan_deviation", "allan_note", "quality_factor", "quality_factor_sigma", "warnings",
)
_COEFFICIENT_KEYS = {"temperature_c": "temperature_coefficient_s_per_day_per_k",
                     "pressure_hpa": "pressure_coefficient_s_per_day_per_hpa",
                     "semi_arc_deg": "arc_coefficient_s_per_day_per_deg"}


def _clean(value: Any) -> Any:
    """Plain JSON values: numpy scalars to Python, non-finite floats to None."""
    if isinstance(value, dict):
        return {k: _clean(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_clean(v) for v in value]
    if isinstance(value, (bool, np.bool_)):
        return bool(value)
    if isinstance(value, (int, np.integer)):
        return int(value)
    if isinstance(value, (float, np.floating)):
        return float(value) if math.isfinite(value) else None
    return value


def _conditions(c: Conditions) -> dict[str, float]:
    return {"temperature_c": c.temperature_c, "pressure_hpa": c.pressure_hpa,
            "semi_arc_deg": c.semi_arc_deg}


def _allan(log: RatingLog, fit: RatingFit) -> AllanDeviation:
    fitted = sorted((s for s in fit.segments if s.fitted), key=lambda s: -s.readings)
    results = [allan_deviation(log.readings[s.first:s.last + 1], f"the readings of segment "
                               f"{s.number + 1}") for s in fitted]
    for res in results:
        if res.adev is not None and res.adev.size:
            return res
    return results[0]


def _fit_part(design: Design, log: RatingLog, fit: RatingFit) -> dict[str, Any]:
    out: dict[str, Any] = {
        "segments": [{"from": s.start.isoformat(), "to": s.end.isoformat(),
                      "readings": s.readings, "rate_s_per_day": s.rate_s_per_day,
                      "rate_sigma_s_per_day": s.rate_sigma_s_per_day, "offset_s": s.offset_s,
                      "first_reading": s.first, "last_reading": s.last, "note": s.note}
                     for s in fit.segments]}
    for cond in CONDITION_NAMES:
        c, key = fit.coefficient(cond), _COEFFICIENT_KEYS[cond]
        out[key], out[f"{key}_sigma"] = c.value, c.sigma
        out[f"{key}_reason"] = c.reason or None
    out["residual_rms_s"] = fit.residual_rms_s
    out["degrees_of_freedom"] = fit.degrees_of_freedom
    out["residuals"] = [{"at": r.at.isoformat(), "error_s": r.error_s,
                         "fitted_error_s": float(fit.fitted_error_s[i]),
                         "residual_s": float(fit.residuals_s[i])}
                        for i, r in enumerate(log.readings)]
    mean = fit.mean_conditions
    model = model_at_conditions(design, mean.temperature_c, mean.pressure_hpa,
                                mean.semi_arc_deg)
    out["mean_conditions"] = _conditions(mean)
    out["model"] = {"rate_s_per_day": model.rate_s_per_day,
                    "temperature_coefficient_s_per_day_per_k":
                        model.temperature_coefficient_s_per_day_per_k,
                    "pressure_coefficient_s_per_day_per_hpa":
                        model.pressure_coefficient_s_per_day_per_hpa,
                    "arc_coefficient_s_per_day_per_deg": model.arc_coefficient_s_per_day_per_deg,
                    **_conditions(mean)}
    latest = fit.latest_fitted()
    out["measured_rate_at_mean_conditions_s_per_day"] = rate_at(fit, latest.number, mean)
    assert latest.rate_s_per_day is not None
    corr = correction(design, analyse(design), latest.rate_s_per_day)
    out["correction"] = {"segment": latest.number + 1,
                         "measured_rate_s_per_day": corr.measured_rate_s_per_day,
                         "rating_nut_turns": corr.rating_nut_turns,
                         "rating_nut_direction": corr.rating_nut_direction,
                         "trim_g": corr.trim_g, "trim_height_m": corr.trim_height_m,
                         "trim_limit_g": corr.trim_limit_g,
                         "bob_lowered_mm": corr.bob_lowered_mm}
    allan = _allan(log, fit)
    out["allan_deviation"] = None if allan.adev is None or allan.tau_s is None else [
        {"tau_s": t, "adev": a} for t, a in zip(allan.tau_s, allan.adev, strict=True)]
    out["allan_note"] = allan.note
    out["warnings"] = list(fit.warnings) + list(corr.warnings)
    return out


def rate_at(fit: RatingFit, segment: int, conditions: Conditions) -> float | None:
    """A fitted segment's rate, s/day, at other conditions (determined coefficients only)."""
    seg = fit.segments[segment]
    if seg.rate_s_per_day is None:
        return None
    rate = seg.rate_s_per_day
    for cond in CONDITION_NAMES:
        k = fit.coefficient(cond).value
        if k is not None:
            rate += k * (conditions.value(cond) - fit.reference.value(cond))
    return rate


@guarded("rating_log")
def rating_report(design: Design, log: RatingLog,
                  extra_warnings: Sequence[str] = ()) -> dict[str, Any]:
    """The ``penduline rating --json`` object for ``design`` and its rating ``log``.

    Parameters
    ----------
    design : the design (its site conditions and semi-arc are the reference).
    log : the rating log (from the design file, or :func:`core.rating_log.rating_log_from_csv`).
    extra_warnings : sentences to pass on (e.g. the CSV rows refused).

    Raises
    ------
    DesignError
        When the log has nothing to fit (no readings and no decay readings), or readings but no
        segment with three (naming ``rating_log.readings``), or a bad design.
    """
    if not log.readings and not log.decay:
        raise DesignError("rating_log", "has no readings and no decay readings")
    ref = reference_conditions(design)
    out: dict[str, Any] = {key: None for key in RATING_KEYS}
    out.update({"name": design.name, "reference_conditions": _conditions(ref),
                "segments": [], "allan_note": "The log has no readings.", "warnings": []})
    if log.readings:
        out.update(_fit_part(design, log, fit_rating(log, ref)))
    out["quality_note"] = "No decay readings."
    if log.decay:
        if len(log.decay) < 3:
            out["warnings"].append(f"Only {len(log.decay)} decay reading(s): Q needs at least 3.")
        else:
            q = fit_quality_factor(log.decay, analyse(design).period_small_s)
            out["quality_factor"], out["quality_factor_sigma"] = q.quality_factor, q.sigma
            out["quality_note"] = q.note
    out["warnings"] = list(extra_warnings) + out["warnings"]
    return _clean(out)  # type: ignore[no-any-return]


def _num(value: Any, fmt: str, unit: str = "") -> str:
    return "not determined" if value is None else f"{value:{fmt}}{unit}"


def rating_text(report: dict[str, Any]) -> str:
    """The human-readable form of a :func:`rating_report` object."""
    lines = [f"Rating of {report.get('name', 'the design')}"]
    ref = report.get("reference_conditions") or {}
    if ref:
        lines.append(f"Rates at {ref['temperature_c']:g} °C, {ref['pressure_hpa']:g} hPa, "
                     f"{ref['semi_arc_deg']:g}° semi-arc (the design's site and swing)")
    for i, s in enumerate(report.get("segments") or []):
        rate = "left out" if s["rate_s_per_day"] is None else \
            f"{s['rate_s_per_day']:+.3f} ± {_num(s['rate_sigma_s_per_day'], '.3f')} s/day"
        lines.append(f"  segment {i + 1}: {s['from']} to {s['to']}, {s['readings']} readings: "
                     f"{rate}")
    units = {"temperature_coefficient_s_per_day_per_k": ("Temperature", "s/day per K"),
             "pressure_coefficient_s_per_day_per_hpa": ("Pressure", "s/day per hPa"),
             "arc_coefficient_s_per_day_per_deg": ("Semi-arc", "s/day per degree")}
    model = report.get("model") or {}
    for key, (label, unit) in units.items():
        if report.get("segments"):
            value, sigma = report.get(key), report.get(f"{key}_sigma")
            text = (f"{value:+.4g} ± {_num(sigma, '.2g')} {unit}" if value is not None
                    else f"not determined: {report.get(f'{key}_reason')}")
            if model.get(key) is not None:
                text += f" (model {model[key]:+.4g})"
            lines.append(f"{label} coefficient: {text}")
    if report.get("residual_rms_s") is not None:
        lines.append(f"Residual RMS: {report['residual_rms_s']:.3g} s")
    if model.get("rate_s_per_day") is not None:
        measured = report.get("measured_rate_at_mean_conditions_s_per_day")
        lines.append(f"At the log's mean conditions ({model['temperature_c']:.3g} °C, "
                     f"{model['pressure_hpa']:.5g} hPa, {model['semi_arc_deg']:.3g}°): model "
                     f"{model['rate_s_per_day']:+.3f} s/day, clock "
                     f"{_num(measured, '+.3f', ' s/day')}")
    corr = report.get("correction")
    if corr:
        lines.append(f"Correction for segment {corr['segment']} "
                     f"({corr['measured_rate_s_per_day']:+.3f} s/day): "
                     f"{corr['rating_nut_direction']}; or "
                     f"{_num(corr['trim_g'], '+.3g', ' g')} at {corr['trim_height_m']:.3g} m; "
                     f"or lower the bob {_num(corr['bob_lowered_mm'], '+.3g', ' mm')}")
    if report.get("allan_deviation"):
        pts = ", ".join(f"{p['adev']:.2e} at {p['tau_s'] / SECONDS_PER_DAY:.3g} d"
                        for p in report["allan_deviation"])
        lines.append(f"Allan deviation: {pts}. {report.get('allan_note', '')}")
    elif report.get("allan_note"):
        lines.append(f"Allan deviation: {report['allan_note']}")
    if report.get("quality_factor") is not None:
        lines.append(f"Q: {report['quality_factor']:.4g} ± "
                     f"{_num(report.get('quality_factor_sigma'), '.2g')}")
    for w in report.get("warnings") or []:
        lines.append(f"Warning: {w}")
    return "\n".join(lines) + "\n"
