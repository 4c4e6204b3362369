"""Solving for targets: one or two numeric fields of the design varied until it meets them.

Fields are addressed by path as in the design file (``parts[2].mount.centre_m``). The targets
are a period (or beats per hour) at the working amplitude and a zero temperature coefficient.

* One field, one target: the field's whole valid range (from :func:`core.fileformat.field_range`)
  is scanned — log-spaced where the range is positive and spans decades, symmetric-log then
  linear where it crosses zero — then the part that gives usable designs is scanned again
  finely. Every sign change is closed in with Brent's method (``scipy.optimize.brentq``); the
  root nearest the current value is chosen and the others are listed. Values that give no
  usable design are skipped.
* Two fields, two targets (period and temperature): solved together by a bounded
  least-squares root finder (``scipy.optimize.least_squares``, bounds from the usable ranges),
  with the residuals scaled by their tolerances; the result is re-evaluated from scratch.

Nothing is printed. A target that cannot be met is said so, with the nearest design found:
never a silent wrong answer.
"""

from __future__ import annotations

import math

import numpy as np
from numpy.typing import NDArray

from .design import Design
from .errors import DesignError, guarded
from .fileformat import field_range
from .solve_targets import (
    PERIOD_TOLERANCE_S,
    TEMPERATURE_TOLERANCE_S_PER_DAY_PER_K,
    Solution,
    Targets,
    VariedDesign,
    goal_words,
    temperature_coefficient,
    tolerance,
    with_message,
)
from .sweep import SweepTable, shift_pivot, sweep_field

__all__ = ["Targets", "Solution", "solve", "solve_field", "temperature_coefficient",
           "PERIOD_TOLERANCE_S", "TEMPERATURE_TOLERANCE_S_PER_DAY_PER_K", "SweepTable",
           "sweep_field", "shift_pivot"]

FloatArray = NDArray[np.float64]

_SCAN_POINTS = 201
_LOCAL_POINTS = 41


# ----------------------------------------------------------------------------- the scan grid

def _spaced(a: float, b: float, n: int) -> FloatArray:
    """n values from a to b: log-spaced when both are positive and b/a ≥ 100, else linear."""
    if a > 0.0 and b / a >= 100.0:
        return np.geomspace(a, b, n)
    return np.linspace(a, b, n)


def _coarse_grid(path: str, x0: float) -> tuple[FloatArray, tuple[float, float]]:
    """A first grid over the field's whole valid range, and that range."""
    lo, hi, lo_open, hi_open = field_range(path)
    n = _SCAN_POINTS
    if lo < 0.0 < hi:  # crosses zero: symmetric-log, so small and large magnitudes both show
        tiny = max(-lo, hi) * 1e-9
        xs = np.concatenate([-np.geomspace(tiny, -lo, n // 2), [0.0],
                             np.geomspace(tiny, hi, n // 2)])
    else:
        start = lo if lo > 0.0 else hi * 1e-12
        xs = _spaced(start, hi, n)
        if lo == 0.0 and not lo_open:
            xs = np.concatenate([[0.0], xs])
    xs = xs[((xs > lo) | ((xs == lo) & (not lo_open))) & ((xs < hi) | ((xs == hi) & (not hi_open)))]
    return np.unique(np.concatenate([xs, [x0]])), (lo, hi)


def _fine_grid(xs: FloatArray, ok: FloatArray, x0: float, lo: float, hi: float) -> FloatArray:
    """A second grid over the usable part found by the first (to its unusable neighbours)."""
    idx = np.flatnonzero(ok)
    i, j = max(int(idx[0]) - 1, 0), min(int(idx[-1]) + 1, xs.size - 1)
    a, b = float(xs[i]), float(xs[j])
    grids = [xs, _spaced(a, b, _SCAN_POINTS)]
    half = 0.5 * abs(x0) if x0 != 0.0 else 0.01 * (b - a)
    grids.append(np.linspace(x0 - half, x0 + half, _LOCAL_POINTS))
    out = np.unique(np.concatenate(grids))
    return out[(out >= lo) & (out <= hi)]


# ----------------------------------------------------------------------------- one field

def _evaluate(problem: VariedDesign, xs: FloatArray) -> FloatArray:
    ys = np.full(xs.size, math.nan)
    for k, x in enumerate(xs):
        y = problem.safe([float(x)])
        if y is not None:
            ys[k] = y[0]
    return ys


def _roots(problem: VariedDesign, xs: FloatArray, ys: FloatArray) -> list[float]:
    """Every root between neighbouring usable scan points (Brent), checked to be a root."""
    from scipy.optimize import brentq

    def f(x: float) -> float:
        y = problem.safe([x])
        if y is None:
            raise ValueError("unusable design inside a bracket")
        return y[0]

    ok = np.isfinite(ys)
    roots = [float(x) for x in xs[ok & (ys == 0.0)]]
    pairs = np.flatnonzero(ok[:-1] & ok[1:] & (ys[:-1] * ys[1:] < 0.0))
    tol = tolerance(problem.goals[0]) * 1e-3
    for i in pairs:
        try:
            r = float(brentq(f, xs[i], xs[i + 1], xtol=1e-15, rtol=8.9e-16, maxiter=300))
        except ValueError:
            continue
        if abs(f(r)) <= tol:  # not a jump across a discontinuity
            roots.append(r)
    return sorted(set(roots))


def _solve_one(problem: VariedDesign) -> Solution:
    path, x0, goal = problem.paths[0], problem.old[0], problem.goals[0]
    coarse, (lo, hi) = _coarse_grid(path, x0)
    ys = _evaluate(problem, coarse)
    if not np.isfinite(ys).any():
        raise DesignError(path, f"no value from {lo:g} to {hi:g} gives a usable design")
    xs = _fine_grid(coarse, np.isfinite(ys), x0, lo, hi)
    ys = _evaluate(problem, xs)
    ok = np.isfinite(ys)
    usable = (float(xs[ok][0]), float(xs[ok][-1]))
    where = (f"searched its whole range {lo:g} to {hi:g}; usable designs from {usable[0]:.6g} "
             f"to {usable[1]:.6g}")
    spread = float(np.ptp(ys[ok]))
    if spread <= tolerance(goal) * 1e-3:
        what = "the period" if goal == "period" else "the temperature coefficient"
        raise DesignError(path, f"does not change {what} of this design ({where})")
    roots = _roots(problem, xs, ys)
    if not roots:
        k = int(np.flatnonzero(ok)[np.argmin(np.abs(ys[ok]))])
        near = problem.solution([float(xs[k])], False, [(lo, hi)], [usable], (),
                                "")
        reached = (f"giving {near.period_s:.10g} s" if goal == "period" else
                   f"leaving {near.temperature_coefficient_s_per_day_per_k:.4g} s/day/K")
        msg = (f"no value gives {goal_words(goal, problem.target)} ({where}); the nearest is "
               f"{near.value:.6g}, {reached}")
        return with_message(near, msg)
    best = min(roots, key=lambda r: (abs(r - x0), r))
    others = tuple(r for r in roots if r != best)
    msg = f"{path} = {best:.12g} gives {goal_words(goal, problem.target)} ({where})"
    if others:
        msg += "; other values that also do: " + ", ".join(f"{r:.9g}" for r in others)
    return problem.solution([best], None, [(lo, hi)], [usable], others, msg)


# ----------------------------------------------------------------------------- two fields

def _usable_box(problem: VariedDesign, centre: list[float]
                ) -> tuple[list[tuple[float, float]], list[tuple[float, float]]]:
    """Each field's whole range and the part giving usable designs, the other fields held at
    ``centre``."""
    searched, usable = [], []
    held = problem.design(centre)
    for k, path in enumerate(problem.paths):
        single = VariedDesign(held, [path], ["period"], problem.target or 1.0)
        coarse, (lo, hi) = _coarse_grid(path, centre[k])
        ok = np.isfinite(_evaluate(single, coarse))
        if not ok.any():
            raise DesignError(path, f"no value from {lo:g} to {hi:g} gives a usable design")
        xs = _fine_grid(coarse, ok, centre[k], lo, hi)
        ok = np.isfinite(_evaluate(single, xs))
        searched.append((lo, hi))
        usable.append((float(xs[ok][0]), float(xs[ok][-1])))
    return searched, usable


def _solve_two(problem: VariedDesign) -> Solution:
    """Both fields together (bounded least squares), the bounds re-scanned around the best
    point while it sits on them (the usable range of one field depends on the other)."""
    from scipy.optimize import least_squares

    scale = np.array([tolerance(g) for g in problem.goals])
    penalty = 1e12

    def residual(x: FloatArray) -> FloatArray:
        y = problem.safe([float(v) for v in x])
        return np.full(2, penalty) if y is None else np.asarray(y) / scale

    def attempt(start: FloatArray, lower: FloatArray, upper: FloatArray
                ) -> tuple[float, FloatArray]:
        start = np.clip(start, lower, upper)
        fit = least_squares(residual, start, bounds=(lower, upper), method="trf",
                            x_scale=np.maximum(np.abs(start), upper - lower) * 1e-3 + 1e-300,
                            diff_step=1e-7, ftol=1e-15, xtol=1e-15, gtol=1e-15, max_nfev=200)
        return float(np.max(np.abs(residual(fit.x)))), fit.x

    centre = list(problem.old)
    best_err, best_x = math.inf, np.array(problem.old)
    box: list[tuple[float, float]] = []
    for round_ in range(6):
        searched, usable = _usable_box(problem, centre)
        box = usable if not box else [(min(a[0], b[0]), max(a[1], b[1]))
                                      for a, b in zip(box, usable, strict=True)]
        lower = np.array([u[0] for u in usable])
        upper = np.array([u[1] for u in usable])
        starts = [np.array(centre)]
        if round_ > 0:  # stuck: try the corners' inside too
            grid = [np.linspace(lower[k] + 0.1 * (upper[k] - lower[k]),
                                upper[k] - 0.1 * (upper[k] - lower[k]), 3) for k in range(2)]
            starts += [np.array([a, b]) for a in grid[0] for b in grid[1]]
        for start in starts:
            if problem.safe([float(v) for v in np.clip(start, lower, upper)]) is None:
                continue
            err, x = attempt(start, lower, upper)
            if err < best_err:
                best_err, best_x = err, x
            if best_err <= 1e-2:  # both residuals a hundredth of their tolerances
                break
        on_bound = np.any(np.isclose(best_x, lower, rtol=1e-6, atol=0)
                          | np.isclose(best_x, upper, rtol=1e-6, atol=0))
        if best_err <= 1e-2 or not on_bound or list(best_x) == centre:
            break
        centre = [float(v) for v in best_x]
    usable = box
    if not math.isfinite(best_err) or problem.safe([float(v) for v in best_x]) is None:
        raise DesignError(problem.paths[0], "no pair of values in the usable ranges gives a "
                                            "usable design")
    sol = problem.solution([float(v) for v in best_x], None, searched, usable, (), "")
    words = " and ".join(goal_words(g, problem.target) for g in problem.goals)
    ranges = "; ".join(f"{p} usable from {u[0]:.6g} to {u[1]:.6g}"
                       for p, u in zip(problem.paths, usable, strict=True))
    values = ", ".join(f"{p} = {v:.12g}" for p, v in zip(sol.fields, sol.values, strict=True))
    if sol.met:
        msg = f"{values} give {words} (searched the fields' whole ranges: {ranges})"
    else:
        msg = (f"no pair of values in the usable ranges gives {words} ({ranges}); the nearest "
               f"design found has {values}, a period of {sol.period_s:.10g} s and a "
               f"temperature coefficient of {sol.temperature_coefficient_s_per_day_per_k:.4g} "
               f"s/day/K")
    return with_message(sol, msg)


# ----------------------------------------------------------------------------- public

@guarded("field")
def solve(design: Design, fields: list[str] | tuple[str, ...], targets: Targets) -> Solution:
    """Vary one or two fields of ``design`` until it meets ``targets``.

    Parameters
    ----------
    design : Design
    fields : one or two field paths (``parts[0].length_m``), all numeric and distinct.
    targets : Targets
        One field: a period (given, or the design's own) or the temperature null. Two fields:
        a period (given, or the design's own) and the temperature null.

    Returns
    -------
    Solution
        ``met`` says whether the targets were met (period within 1e-9 s, temperature
        coefficient within 1e-6 s/day/K); when not, ``design`` is the nearest one found and
        ``message`` says so.

    Raises
    ------
    DesignError
        Naming a field that is not numeric, gives no usable design anywhere in its range, or
        does not change the target; naming the target when the design has none and none was
        given; naming ``--vary`` when the number of fields does not match the targets.
    """
    paths = list(fields)
    if not 1 <= len(paths) <= 2:
        raise DesignError("--vary", f"give one or two fields to vary, not {len(paths)}")
    if len(set(paths)) != len(paths):
        raise DesignError("--vary", f"{paths[0]} is given twice")
    period = targets.given_period_s
    goals: list[str] = []
    if period is not None or len(paths) == 2 or not targets.null_temperature:
        goals.append("period")
        if period is None:
            period = design.target.target_period_s
            if period is None:
                raise DesignError("target.period_s", "the design has no target: give a target "
                                                     "period or beats per hour to solve for")
    if targets.null_temperature:
        goals.append("temperature")
    if len(goals) != len(paths):
        need = ("two targets need two fields: add a second --vary" if len(goals) == 2 else
                "two fields need two targets: add --null temperature")
        raise DesignError("--vary", need)
    problem = VariedDesign(design, paths, goals, period)
    return _solve_one(problem) if len(paths) == 1 else _solve_two(problem)


@guarded("field")
def solve_field(design: Design, path: str, goal: str = "period",
                target_period_s: float | None = None) -> Solution:
    """One field, one goal (``"period"`` or ``"temperature"``); raises when not met.

    Raises
    ------
    DesignError
        Naming the field when no value in its valid range meets the goal (the message names
        the range searched and gives the nearest value and what it achieves).
    """
    if goal not in ("period", "temperature"):
        raise DesignError("goal", f"{goal!r} is not a goal (period or temperature)")
    targets = (Targets(null_temperature=True) if goal == "temperature"
               else Targets(period_s=target_period_s))
    sol = solve(design, [path], targets)
    if not sol.met:
        raise DesignError(path, sol.message)
    return sol

