"""Write ``rating_log_demo.json``: an invented month of rating the workshop regulator.

Everything here is invented for the demo (no real clock, room or person): a regulator compared
with a time signal every morning through March while the workshop warms up, its rating nut
turned down a tenth of a turn and the clock set on the 11th, the offset changing to summer
time on the 28th, and a two-hour decay with the drive removed. The "true" behaviour below is
made up; the readings add noise from a fixed seed, so the file is the same on every run.

Run from the repository root: ``python3 resources/examples/make_rating_demo.py``.
"""

from __future__ import annotations

import json
import math
from datetime import UTC, datetime, timedelta, timezone
from pathlib import Path

import numpy as np

SEED = 20270301
OUT = Path(__file__).with_name("rating_log_demo.json")

# Invented truth, at the workshop regulator's reference conditions (20 °C, 1013.25 hPa, 1.6°).
RATES_S_PER_DAY = (4.2, -0.15)        # before and after the nut adjustment
K_T, K_P, K_A = 0.034, -0.0105, -5.3  # s/day per K, per hPa, per degree of semi-arc
REFERENCE = (20.0, 1013.25, 1.6)
READING_NOISE_S = 0.08
Q_TRUE = 11500.0
PERIOD_SMALL_S = 2.0


def _conditions(day: float, rng: np.random.Generator) -> tuple[float, float, float]:
    temperature = 14.5 + 5.0 * day / 30.0 + 1.2 * math.sin(day / 2.3) + rng.normal(0, 0.3)
    pressure = 1012.0 + 14.0 * math.sin(day / 4.1 + 1.0) + rng.normal(0, 1.5)
    arc = 1.6 + 0.04 * math.sin(day / 3.1) + rng.normal(0, 0.006)
    return temperature, pressure, arc


def build() -> dict[str, object]:
    rng = np.random.default_rng(SEED)
    winter, summer = timezone(timedelta(hours=1)), timezone(timedelta(hours=2))
    start = datetime(2027, 3, 1, 7, 0, tzinfo=UTC)  # 08:00 local every morning
    adjust_day = 10.0
    readings, true_error, last = [], 1.3, None
    for day in range(31):
        at_utc = start + timedelta(days=day)
        local = at_utc.astimezone(summer if at_utc >= datetime(2027, 3, 28, 1, tzinfo=UTC)
                                  else winter)
        cond = _conditions(day, rng)
        if last is not None:
            seg = 0 if day <= adjust_day else 1
            mean = [(a + b) / 2.0 for a, b in zip(cond, last[1], strict=True)]
            rate = (RATES_S_PER_DAY[seg] + K_T * (mean[0] - REFERENCE[0])
                    + K_P * (mean[1] - REFERENCE[1]) + K_A * (mean[2] - REFERENCE[2]))
            if day == adjust_day + 1:
                true_error = 0.2  # the clock was set after the nut was turned
            true_error += rate * (day - last[0])
        last = (day, cond)
        readings.append({"at": local.isoformat(),
                         "error_s": round(true_error + rng.normal(0, READING_NOISE_S), 2),
                         "temperature_c": round(cond[0], 1), "pressure_hpa": round(cond[1], 1),
                         "semi_arc_deg": round(cond[2], 3), "note": ""})
    readings[0]["note"] = "first comparison with the time signal"
    # Pressure was not noted on two mornings (the barometer was away).
    readings[17]["pressure_hpa"] = None
    readings[18]["pressure_hpa"] = None
    nut_at = (start + timedelta(days=adjust_day, minutes=5)).astimezone(winter)
    set_at = (start + timedelta(days=adjust_day, minutes=10)).astimezone(winter)
    adjustments = [
        {"at": nut_at.isoformat(), "what": "nut", "amount": -0.1,
         "note": "a tenth of a turn down"},
        {"at": set_at.isoformat(), "what": "set", "amount": None,
         "note": "set to the time signal"},
    ]
    omega0 = 2.0 * math.pi / PERIOD_SMALL_S
    decay = []
    for k in range(13):
        t = 600.0 * k
        arc = 1.65 * math.exp(-omega0 * t / (2.0 * Q_TRUE)) + rng.normal(0, 0.004)
        decay.append({"elapsed_s": t, "semi_arc_deg": round(arc, 3)})
    return {"comment": "Invented demo data (see make_rating_demo.py); belongs with "
                       "workshop_regulator.pendulum.json.",
            "rating_log": {"readings": readings, "adjustments": adjustments, "decay": decay}}


if __name__ == "__main__":
    OUT.write_text(json.dumps(build(), indent=1, ensure_ascii=False) + "\n", encoding="utf-8")
    print(f"wrote {OUT}")
