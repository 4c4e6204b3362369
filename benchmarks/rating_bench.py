"""Benchmark: the rating fit of a 200-reading log against a naive baseline.

Run from the repository root: ``python3 benchmarks/rating_bench.py`` (a few seconds). A plain
script: it prints, it asserts nothing. Run it on a quiet machine for timing figures.

Log: 200 readings every 6 h in three segments (two nut adjustments), temperature, pressure and
semi-arc noted at every reading, 0.05 s of reading noise; invented, fixed seed.

* fit — median of RUNS calls of ``core.rating.fit_rating`` (which checks the log again, builds
  the design matrix with vectorised trapezoid sums, solves with ``numpy.linalg.lstsq`` and
  forms s²(XᵀX)⁻¹), after WARMUP calls.
* naive — median of NAIVE_RUNS of the same fit written plainly: a Python loop over readings,
  each condition integral from the segment's first reading by ``scipy.integrate.quad`` over
  the linearly interpolated condition (``numpy.interp``), then ``lstsq`` and ``inv(XᵀX)``.
* agreement — the largest relative difference of the fitted unknowns and of their standard
  errors between the two.
* report — median of a few ``core.rating_report.rating_report`` calls on the same log with the
  workshop regulator (the fit plus the model's analyses at the log's conditions), for scale.

Goal: fit ≤ 20 ms.
"""

from __future__ import annotations

import statistics
import sys
import time
import warnings
from datetime import datetime, timedelta, timezone
from pathlib import Path

import numpy as np
from scipy.integrate import IntegrationWarning, quad

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from core import load_design  # noqa: E402
from core.rating import CONDITION_NAMES, Conditions, fit_rating  # noqa: E402
from core.rating_log import Adjustment, RatingLog, Reading  # noqa: E402
from core.rating_report import rating_report  # noqa: E402

N_READINGS = 200
WARMUP, RUNS, NAIVE_RUNS, REPORT_RUNS = 5, 200, 5, 5
REFERENCE = Conditions(20.0, 1013.25, 1.6)


def make_log(seed: int = 2027) -> RatingLog:
    rng = np.random.default_rng(seed)
    start = datetime(2027, 1, 1, 6, tzinfo=timezone(timedelta(hours=1)))
    days = np.arange(N_READINGS) * 0.25
    temps = 18.0 + 3.0 * np.sin(days / 5.0) + rng.normal(0, 0.3, days.size)
    press = 1012.0 + 12.0 * np.cos(days / 4.0) + rng.normal(0, 1.0, days.size)
    arcs = 1.6 + 0.04 * np.sin(days / 3.0) + rng.normal(0, 0.005, days.size)
    cuts = (days[-1] / 3 + 0.1, 2 * days[-1] / 3 + 0.1)
    rates = (2.0, -0.5, 0.3)
    errors = np.empty(days.size)
    for i, d in enumerate(days):
        s = int(np.searchsorted(cuts, d))
        if i == 0 or int(np.searchsorted(cuts, days[i - 1])) != s:
            errors[i] = 0.0
            continue
        mean = [(v[i] + v[i - 1]) / 2 for v in (temps, press, arcs)]
        rate = (rates[s] + 0.03 * (mean[0] - 20.0) - 0.01 * (mean[1] - 1013.25)
                - 5.0 * (mean[2] - 1.6))
        errors[i] = errors[i - 1] + rate * (d - days[i - 1])
    errors += rng.normal(0, 0.05, days.size)
    readings = tuple(Reading(start + timedelta(days=float(d)), float(errors[i]), float(temps[i]),
                             float(press[i]), float(arcs[i])) for i, d in enumerate(days))
    adjustments = tuple(Adjustment(start + timedelta(days=float(c)), "nut", 0.05) for c in cuts)
    return RatingLog(readings, adjustments)


def naive_fit(log: RatingLog, ref: Conditions) -> tuple[np.ndarray, np.ndarray]:
    """The same fit, plainly: loops and ``quad`` per reading and condition."""
    cuts = [a.at for a in log.adjustments]
    seg = [sum(1 for c in cuts if c < r.at) for r in log.readings]
    labels = sorted(set(seg))
    rows = []
    for s in labels:
        members = [r for r, k in zip(log.readings, seg, strict=True) if k == s]
        t = np.array([(r.at - members[0].at).total_seconds() / 86400.0 for r in members])
        for j in range(len(members)):
            row = [1.0 if q == s else 0.0 for q in labels]
            row += [t[j] if q == s else 0.0 for q in labels]
            for name in CONDITION_NAMES:
                values = np.array([getattr(r, name) for r in members]) - getattr(ref, name)
                row.append(quad(lambda x, t=t, v=values: float(np.interp(x, t, v)), 0.0, t[j],
                                points=list(t[1:j]), limit=500)[0] if j else 0.0)
            rows.append(row)
    x = np.array(rows)
    y = np.array([r.error_s for r in log.readings])
    beta = np.linalg.lstsq(x, y, rcond=None)[0]
    resid = y - x @ beta
    cov = resid @ resid / (len(y) - x.shape[1]) * np.linalg.inv(x.T @ x)
    return beta, np.sqrt(np.diag(cov))


def median_ms(func, runs: int) -> float:  # type: ignore[no-untyped-def]
    times = []
    for _ in range(runs):
        t0 = time.perf_counter()
        func()
        times.append(time.perf_counter() - t0)
    return 1000.0 * statistics.median(times)


def main() -> None:
    log = make_log()
    design = load_design(ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json")
    for _ in range(WARMUP):
        fit = fit_rating(log, REFERENCE)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", IntegrationWarning)
        beta, sigma = naive_fit(log, REFERENCE)
        fit_ms = median_ms(lambda: fit_rating(log, REFERENCE), RUNS)
        naive_ms = median_ms(lambda: naive_fit(log, REFERENCE), NAIVE_RUNS)
    m = len(fit.segments)
    ours = np.array([s.offset_s for s in fit.segments] + [s.rate_s_per_day for s in fit.segments]
                    + [fit.coefficient(c).value for c in CONDITION_NAMES], dtype=float)
    ours_sigma = np.sqrt(np.diag(fit.covariance))
    report_ms = median_ms(lambda: rating_report(design, log), REPORT_RUNS)
    print(f"log: {len(log.readings)} readings, {m} segments, {fit.degrees_of_freedom} dof")
    print(f"fit       median {fit_ms:8.3f} ms   (goal ≤ 20 ms: "
          f"{'met' if fit_ms <= 20.0 else 'MISSED'})")
    print(f"naive     median {naive_ms:8.3f} ms   ratio naive/fit = {naive_ms / fit_ms:.1f}")
    print(f"agreement max relative difference: unknowns "
          f"{np.max(np.abs(ours / beta - 1)):.2e}, standard errors "
          f"{np.max(np.abs(ours_sigma / sigma - 1)):.2e}")
    print(f"report    median {report_ms:8.3f} ms   (fit + model at the log's conditions)")


if __name__ == "__main__":
    main()
