"""``penduline rating --json``: the object's keys, null rules and end-to-end figures."""

from __future__ import annotations

import json
import math
from datetime import datetime, timedelta, timezone
from pathlib import Path
from typing import Any

import numpy as np
import pytest

from core import analyse, load_design
from core.errors import DesignError
from core.rating import fit_rating
from core.rating_log import (
    DecayReading,
    RatingLog,
    Reading,
    rating_log_from_csv,
    rating_log_from_dict,
)
from core.rating_model import reference_conditions
from core.rating_report import RATING_KEYS, rating_report, rating_text

EXAMPLES = Path(__file__).resolve().parents[2] / "resources" / "examples"
TZ = timezone(timedelta(hours=1))


def _design():  # type: ignore[no-untyped-def]
    return load_design(EXAMPLES / "workshop_regulator.pendulum.json")


def _demo() -> RatingLog:
    raw = json.loads((EXAMPLES / "rating_log_demo.json").read_text(encoding="utf-8"))
    return rating_log_from_dict(raw["rating_log"])


def _floats(value: Any) -> list[float]:
    if isinstance(value, dict):
        return [f for v in value.values() for f in _floats(v)]
    if isinstance(value, list):
        return [f for v in value for f in _floats(v)]
    return [value] if isinstance(value, float) else []


def test_report_has_the_keys_and_only_finite_floats() -> None:
    report = rating_report(_design(), _demo())
    assert set(RATING_KEYS) <= set(report)
    assert set(report["segments"][0]) >= {"from", "to", "readings", "rate_s_per_day",
                                          "rate_sigma_s_per_day"}
    assert set(report["model"]) >= {"rate_s_per_day", "temperature_coefficient_s_per_day_per_k",
                                    "pressure_coefficient_s_per_day_per_hpa"}
    assert set(report["correction"]) >= {"rating_nut_turns", "trim_g", "bob_lowered_mm"}
    assert all(math.isfinite(f) for f in _floats(report))
    json.dumps(report, allow_nan=False)


def test_demo_log_recovers_its_invented_truth_within_three_sigma() -> None:
    # The truth is what make_rating_demo.py generated the readings from.
    report = rating_report(_design(), _demo())
    truth = [4.2, -0.15]
    for seg, rate in zip(report["segments"], truth, strict=True):
        assert abs(seg["rate_s_per_day"] - rate) < 3 * seg["rate_sigma_s_per_day"]
    for key, true in (("temperature_coefficient_s_per_day_per_k", 0.034),
                      ("pressure_coefficient_s_per_day_per_hpa", -0.0105),
                      ("arc_coefficient_s_per_day_per_deg", -5.3)):
        assert abs(report[key] - true) < 3 * report[f"{key}_sigma"]
    assert abs(report["quality_factor"] - 11500.0) < 3 * report["quality_factor_sigma"]
    assert [s["readings"] for s in report["segments"]] == [11, 20]
    assert report["allan_deviation"][0]["tau_s"] == 86400.0
    assert "segment 2" in report["allan_note"]


def test_report_segments_and_correction_agree_with_the_parts() -> None:
    design, log = _design(), _demo()
    report = rating_report(design, log)
    fit = fit_rating(log, reference_conditions(design))
    assert [s["rate_s_per_day"] for s in report["segments"]] == [
        s.rate_s_per_day for s in fit.segments]
    nut = analyse(design).sensitivities.rating_nut_s_per_day_per_turn
    latest = report["segments"][-1]["rate_s_per_day"]
    assert report["correction"]["rating_nut_turns"] == pytest.approx(-latest / nut, rel=1e-12)
    assert report["residual_rms_s"] == pytest.approx(
        math.sqrt(np.nanmean(fit.residuals_s ** 2)), rel=1e-12)


def _uneven_log_without_conditions() -> RatingLog:
    hours = [0, 26, 47, 75, 98, 121, 150, 168]
    readings = tuple(Reading(datetime(2027, 5, 1, 9, tzinfo=TZ) + timedelta(hours=h),
                             0.02 * h + 0.05 * (-1) ** k) for k, h in enumerate(hours))
    return RatingLog(readings)


def test_missing_conditions_and_uneven_spacing_give_nulls_with_sentences() -> None:
    report = rating_report(_design(), _uneven_log_without_conditions())
    for key in ("temperature_coefficient_s_per_day_per_k", "pressure_coefficient_s_per_day_per_hpa",
                "arc_coefficient_s_per_day_per_deg"):
        assert report[key] is None and report[f"{key}_sigma"] is None
        assert "no fitted reading notes" in report[f"{key}_reason"]
    assert report["allan_deviation"] is None and "evenly spaced" in report["allan_note"]
    assert report["quality_factor"] is None and report["quality_factor_sigma"] is None
    assert report["model"]["temperature_c"] == 20.0  # no readings note it: the reference
    assert report["segments"][0]["rate_s_per_day"] == pytest.approx(0.48, abs=0.05)
    text = rating_text(report)
    assert "not determined: no fitted reading notes the temperature" in text
    assert "evenly spaced" in text


def test_csv_log_with_bad_rows_reports_them_as_warnings() -> None:
    text = ("at,error_s,temperature_c\n"
            "2027-05-01T09:00:00+02:00,0.0,18\n"
            "2027-05-02T09:00:00+02:00,0.5,x\n"
            "2027-05-03T09:00:00+02:00,1.1,19\n"
            "2027-05-04T09:00:00+02:00,1.4,21\n"
            "2027-05-05T09:00:00+02:00,2.1,22\n")
    log, messages = rating_log_from_csv(text)
    report = rating_report(_design(), log, messages)
    assert report["warnings"][0].startswith("row 3: temperature_c 'x' is not a number")
    assert report["segments"][0]["readings"] == 4


def test_short_latest_segment_is_reported_and_the_correction_uses_the_last_fitted() -> None:
    log = _demo()
    extra = tuple(Reading(log.readings[-1].at + timedelta(days=1, hours=k), 0.1 * k)
                  for k in range(2))
    from core.rating_log import Adjustment
    log = RatingLog(log.readings + extra, log.adjustments + (
        Adjustment(log.readings[-1].at + timedelta(hours=2), "set", 0.0),), log.decay)
    report = rating_report(_design(), log)
    assert [s["rate_s_per_day"] is None for s in report["segments"]] == [False, False, True]
    assert report["correction"]["segment"] == 2
    assert any("Segment 3 (readings 31–32" in w for w in report["warnings"])


def test_decay_only_log_gives_q_and_empty_segments() -> None:
    decay = tuple(DecayReading(600.0 * k, 1.6 * math.exp(-math.pi * 600.0 * k / (2 * 9000.0)))
                  for k in range(8))
    report = rating_report(_design(), RatingLog(decay=decay))
    assert report["segments"] == [] and report["residual_rms_s"] is None
    # Small arcs: the envelope e^(−ω₀t/(2Q)) (DOMAIN §2, French ch. 3 [pub, memory]); the
    # design's small-arc period is ~2 s, not exactly the 2 s used above.
    t_small = analyse(_design()).period_small_s
    assert report["quality_factor"] == pytest.approx(9000.0 * 2.0 / t_small, rel=1e-4)


def test_empty_log_is_refused() -> None:
    with pytest.raises(DesignError) as info:
        rating_report(_design(), RatingLog())
    assert info.value.field == "rating_log"


def test_text_form_names_segments_and_correction() -> None:
    text = rating_text(rating_report(_design(), _demo()))
    assert "segment 1:" in text and "segment 2:" in text
    assert "turn the rating nut" in text and "Q:" in text


def test_the_function_rating_report_is_not_hidden_by_its_module() -> None:
    # Python binds a submodule on its package; the package's function keeps the name
    import importlib

    import core

    importlib.import_module("core.rating_report")
    from core import rating_report, rating_text

    assert callable(rating_report) and callable(rating_text)
    assert core.rating_report is rating_report
