"""Rate between readings against temperature, and the measured and model lines, from a rating
report (core.rating_curves)."""

from __future__ import annotations

from datetime import datetime, timedelta, timezone
from pathlib import Path

import numpy as np
import pytest

from core import load_design
from core.rating_curves import rate_temperature_lines, rate_temperature_points
from core.rating_log import Adjustment, RatingLog, Reading
from core.rating_report import rating_report

ROOT = Path(__file__).resolve().parents[2]
REGULATOR = ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json"
RATES = (3.0, -0.4)  # s/day at the reference temperature, per segment
K = 0.25  # s/day per K


def clean_log() -> tuple[RatingLog, float]:
    """Two segments, readings a day apart, the temperature swinging 14–22 °C; each error is
    the trapezoid of a rate linear in temperature (exact for a linear temperature between
    readings: plain arithmetic). Returns the log and the reference temperature."""
    t_ref = load_design(REGULATOR).site.temperature_c
    start = datetime(2027, 6, 1, 8, 0, tzinfo=timezone(timedelta(hours=2)))
    readings, error = [], 0.0
    temps = [14.0, 17.0, 22.0, 19.5, 15.0, 16.0, 21.0, 20.0]
    for seg, rate in enumerate(RATES):
        for i, temp in enumerate(temps):
            day = seg * 10 + i
            if i:
                error += (rate + K * (0.5 * (temp + temps[i - 1]) - t_ref)) * 1.0
            readings.append(Reading(start + timedelta(days=day), error, temp))
        error = 0.0
    cut = Adjustment(start + timedelta(days=8), "nut", 0.5)
    return RatingLog(tuple(readings), (cut,)), t_ref


def test_points_fall_on_the_latest_segments_line() -> None:
    log, t_ref = clean_log()
    report = rating_report(load_design(REGULATOR), log)
    temps, rates = rate_temperature_points(log, report)
    assert temps.size == 14  # 7 pairs in each segment
    # plain arithmetic: the pair's rate, moved to the latest segment's rate
    expected = RATES[-1] + K * (temps - t_ref)
    np.testing.assert_allclose(rates, expected, rtol=0, atol=1e-9)


def test_measured_and_model_lines() -> None:
    log, t_ref = clean_log()
    design = load_design(REGULATOR)
    report = rating_report(design, log)
    measured, model = rate_temperature_lines(report, 10.0, 30.0)
    assert measured is not None and model is not None
    np.testing.assert_allclose(measured[1], RATES[-1] + K * (np.array([10.0, 30.0]) - t_ref),
                               atol=1e-9)
    m = report["model"]
    slope = (model[1][1] - model[1][0]) / 20.0
    assert slope == pytest.approx(m["temperature_coefficient_s_per_day_per_k"], rel=1e-12)


def test_no_temperatures_no_points_and_no_measured_line() -> None:
    log, _t = clean_log()
    bare = RatingLog(tuple(Reading(r.at, r.error_s) for r in log.readings), log.adjustments)
    report = rating_report(load_design(REGULATOR), bare)
    temps, rates = rate_temperature_points(bare, report)
    assert temps.size == 0 and rates.size == 0
    measured, model = rate_temperature_lines(report, 15.0, 25.0)
    assert measured is None and model is not None
    assert rate_temperature_points(bare, {})[0].size == 0
    assert rate_temperature_lines({}, 15.0, 25.0) == (None, None)
