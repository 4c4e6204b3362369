"""Solving for a target and sweeping a field: one numeric field of the design varied.

Fields are addressed by path as in the design file (``parts[2].mount.centre_m``). The solver
scans the field's usable range around its current value for a sign change of the goal, then
closes in with Brent's method (``scipy.optimize.brentq``). When no value reaches the goal it says
so, with the nearest value it could reach: never a silent wrong answer.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any, Literal

import numpy as np
from numpy.typing import NDArray

from .design import Design
from .errors import DesignError, guarded
from .fileformat import (
    check_number,
    design_from_dict,
    design_to_dict,
    field_range,
    get_value,
    set_in_dict,
)
from .model import SECONDS_PER_DAY, pendulum_state
from .tuning import sensitivities

__all__ = ["Solution", "solve_field", "SweepTable", "sweep_field", "shift_pivot"]

FloatArray = NDArray[np.float64]
Goal = Literal["period", "temperature"]


@dataclass(frozen=True)
class Solution:
    """A solved field: its path, old and new values, and the design with only it changed."""

    field: str
    old_value: float
    value: float
    design: Design
    period_s: float
    temperature_coefficient_s_per_day_per_k: float


class _Field:
    """Evaluates designs that differ from a base design in one numeric field only."""

    def __init__(self, design: Design, path: str) -> None:
        self.base = design_to_dict(design)
        self.path = path
        value = get_value(self.base, path)
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise DesignError(path, "is not a numeric field of this design")
        field_range(path)
        self.value = float(value)

    def design(self, x: float) -> Design:
        check_number(self.path, x)
        return design_from_dict(set_in_dict(self.base, self.path, float(x)))

    def window(self) -> tuple[float, float]:
        """The part of the field's range searched: valid values within a factor of ~20."""
        lo, hi, _lo_open, _hi_open = field_range(self.path)
        x = self.value
        span = max(abs(x) * 5.0, 0.05)
        a, b = max(lo, x - span), min(hi, x + span)
        if lo == 0.0:  # a positive quantity: also reach down towards zero
            a = max(a, x / 50.0 if x > 0 else 1e-9)
            a = min(a, x / 20.0 if x > 0 else a)
        return a, b


def _goal_function(goal: Goal, target_period_s: float | None) -> Callable[[Design], float]:
    if goal == "period":
        if target_period_s is None:
            raise DesignError("target.period_s", "give a target period to solve for")

        def period_gap(d: Design) -> float:
            return pendulum_state(d, slopes=False).period_s / target_period_s - 1.0
        return period_gap

    def temperature(d: Design) -> float:
        st = pendulum_state(d)
        return sensitivities(d, st).temperature_s_per_day_per_k
    return temperature


@guarded("field")
def solve_field(design: Design, path: str, goal: Goal = "period",
                target_period_s: float | None = None, scan_points: int = 161) -> Solution:
    """Find the value of field ``path`` that meets the goal.

    Parameters
    ----------
    goal : "period" or "temperature"
        Meet ``target_period_s`` (s) at the working amplitude (default: the design's target), or
        null the temperature coefficient.

    Raises
    ------
    DesignError
        Naming the field when no value in its usable range reaches the goal (the message gives
        the nearest reachable value and what it achieves).
    """
    field = _Field(design, path)
    if goal == "period" and target_period_s is None:
        target_period_s = design.target.target_period_s
    f = _goal_function(goal, target_period_s)

    def safe(x: float) -> float:
        try:
            return f(field.design(x))
        except DesignError:
            return math.nan

    a, b = field.window()
    xs = np.unique(np.concatenate([np.linspace(a, b, scan_points), [field.value]]))
    ys = np.array([safe(float(x)) for x in xs])
    root = _bracketed_root(xs, ys, field.value, safe)
    if root is None:
        _no_solution(field, goal, xs, ys, target_period_s)
    solved = field.design(root)  # type: ignore[arg-type]
    st = pendulum_state(solved)
    return Solution(path, field.value, float(root), solved, st.period_s,  # type: ignore[arg-type]
                    sensitivities(solved, st).temperature_s_per_day_per_k)


def _bracketed_root(xs: FloatArray, ys: FloatArray, x0: float,
                    f: Callable[[float], float]) -> float | None:
    from scipy.optimize import brentq

    ok = np.isfinite(ys)
    change = np.flatnonzero(ok[:-1] & ok[1:] & (np.sign(ys[:-1]) != np.sign(ys[1:])))
    exact = np.flatnonzero(ok & (ys == 0.0))
    if exact.size:
        return float(xs[exact[np.argmin(np.abs(xs[exact] - x0))]])
    if change.size == 0:
        return None
    i = int(change[np.argmin(np.abs(xs[change] - x0))])
    return float(brentq(f, xs[i], xs[i + 1], xtol=1e-15, rtol=1e-15, maxiter=200))


def _no_solution(field: _Field, goal: Goal, xs: FloatArray, ys: FloatArray,
                 target_period_s: float | None) -> None:
    ok = np.isfinite(ys)
    if not ok.any():
        raise DesignError(field.path, "no value near the current one gives a usable design")
    i = int(np.flatnonzero(ok)[np.argmin(np.abs(ys[ok]))])
    x, y = float(xs[i]), float(ys[i])
    if goal == "period":
        assert target_period_s is not None
        reached = target_period_s * (1.0 + y)
        raise DesignError(field.path, f"no value from {xs[ok][0]:.6g} to {xs[ok][-1]:.6g} gives "
                          f"a period of {target_period_s:.9g} s; the nearest is {x:.6g}, giving "
                          f"{reached:.9g} s")
    raise DesignError(field.path, f"no value from {xs[ok][0]:.6g} to {xs[ok][-1]:.6g} nulls the "
                      f"temperature coefficient; the nearest is {x:.6g}, leaving "
                      f"{y:.4g} s/day/K")


def shift_pivot(design_dict: dict[str, Any], shift_m: float) -> dict[str, Any]:
    """A design dict with the pivot moved ``shift_m`` down the pendulum (every position −shift)."""
    new = set_in_dict(design_dict, "name", design_dict.get("name", ""))
    for part in new.get("parts", []):
        for key in ("top_m", "at_m"):
            if key in part:
                part[key] = part[key] - shift_m
        mount = part.get("mount")
        if isinstance(mount, dict) and "centre_m" in mount:
            mount["centre_m"] = mount["centre_m"] - shift_m
    return new


@dataclass(frozen=True)
class SweepTable:
    """Period and rate against a field's value (NaN where the design is not usable)."""

    field: str
    values: FloatArray
    period_s: FloatArray
    rate_s_per_day: FloatArray
    reasons: tuple[str, ...]


@guarded("field")
def sweep_field(design: Design, path: str, start: float, stop: float, points: int = 101
                ) -> SweepTable:
    """Exact period and rate (s/day) for ``points`` values of field ``path``.

    ``path="pivot"`` shifts the pivot down the pendulum by the value (m). Past the centre of
    mass the pendulum is taken as turned over to hang from the new pivot, so the curve shows
    both branches of a reversible pendulum: the shortest period where the pivot distance equals
    the radius of gyration about the centre of mass, and the conjugate pivot (the centre of
    oscillation) with the design's own period.
    """
    if not 2 <= points <= 100000:
        raise DesignError("points", f"points={points} is out of range: it must be in [2, 100000]")
    for name, v in (("from", start), ("to", stop)):
        if not math.isfinite(v):
            raise DesignError(name, f"must be a finite number, not {v}")
    base = design_to_dict(design)
    if path != "pivot":
        _Field(design, path)
    xs = np.linspace(start, stop, points)
    periods, reasons = np.full(points, math.nan), []
    for i, x in enumerate(xs):
        try:
            d_obj = shift_pivot(base, float(x)) if path == "pivot" else set_in_dict(
                base, path, float(x))
            periods[i] = pendulum_state(design_from_dict(d_obj), slopes=False,
                                        hang_either_way=path == "pivot").period_s
            reasons.append("")
        except DesignError as exc:
            reasons.append(str(exc))
    target = design.target.target_period_s or (
        pendulum_state(design).period_s if path != "pivot" else math.nan)
    return SweepTable(path, xs, periods, SECONDS_PER_DAY * (target / periods - 1.0),
                      tuple(reasons))
