"""What a solve aims at and what it returns, and designs that differ in their varied fields.

:class:`Targets` (a period or beats per hour, a temperature null) and :class:`Solution` are the
public values of :mod:`core.solve`; :class:`VariedDesign` evaluates the design with its varied
fields set, for the solver's scans and root finders.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace
from typing import Any

from .design import Design
from .errors import DesignError
from .fileformat import check_number, design_from_dict, design_to_dict, field_range, get_value
from .model import SECONDS_PER_DAY, pendulum_state

__all__ = ["Targets", "Solution", "VariedDesign", "temperature_coefficient", "tolerance",
           "goal_words", "with_message", "PERIOD_TOLERANCE_S",
           "TEMPERATURE_TOLERANCE_S_PER_DAY_PER_K"]

PERIOD_TOLERANCE_S = 1e-9
"""A period target counts as met within this many seconds."""
TEMPERATURE_TOLERANCE_S_PER_DAY_PER_K = 1e-6
"""A temperature null counts as met within this many s/day/K."""

_TEMPERATURE_STEP_K = 0.5  # the centred step of the report's temperature coefficient


@dataclass(frozen=True)
class Targets:
    """What a solve must meet.

    Attributes
    ----------
    period_s : float or None
        Period to meet at the working amplitude, s (full period).
    beats_per_hour : float or None
        The same as beats per hour (period = 7200 / bph); give at most one of the two.
    null_temperature : bool
        Make the temperature coefficient zero (s/day/K).

    With no period given, a period target is taken from the design's own target whenever one
    is needed: for a one-field solve that does not null the temperature, and for a two-field
    solve.

    Raises
    ------
    DesignError
        Naming the option (``--target-period``, ``--target-bph``) when a target is zero,
        negative or not finite, or both are given.
    """

    period_s: float | None = None
    beats_per_hour: float | None = None
    null_temperature: bool = False

    def __post_init__(self) -> None:
        for option, value, unit, top in (("--target-period", self.period_s, "s", 1.0e4),
                                         ("--target-bph", self.beats_per_hour,
                                          "beats per hour", 1.0e7)):
            if value is None:
                continue
            if isinstance(value, bool) or not isinstance(value, (int, float)):
                raise DesignError(option, f"must be a number of {unit}, not {value!r}")
            if not math.isfinite(value) or value <= 0.0:
                raise DesignError(option, f"must be a positive, finite number of {unit}, "
                                          f"not {value:g}")
            if value > top:
                raise DesignError(option, f"{value:g} {unit} is out of range: at most {top:g}")
        if self.period_s is not None and self.beats_per_hour is not None:
            raise DesignError("--target-bph", "give a target period or beats per hour, "
                                              "not both")

    @property
    def given_period_s(self) -> float | None:
        """The period asked for, s (from beats per hour if given so), or None."""
        if self.beats_per_hour is not None:
            return 7200.0 / self.beats_per_hour
        return self.period_s


@dataclass(frozen=True)
class Solution:
    """The outcome of a solve (met or not). Nothing here is printed.

    Attributes
    ----------
    fields, old_values, values : the varied field paths, their values before and after.
    design : the design with only those fields changed (the nearest one when not met).
    met : whether every target is met within its tolerance.
    goals : "period" and/or "temperature", in the order of ``residuals``.
    residuals : per goal: period − target, s; temperature coefficient, s/day/K.
    target_period_s : the period aimed at, s (None when the period was not a goal).
    period_s, temperature_coefficient_s_per_day_per_k : of ``design``, evaluated anew.
    searched : per field, the range searched (the field's whole valid range).
    usable : per field, the part of that range where the scan found usable designs.
    other_roots : one-field solves: the other values that also meet the target.
    message : one plain sentence or two saying what was done and found.
    """

    fields: tuple[str, ...]
    old_values: tuple[float, ...]
    values: tuple[float, ...]
    design: Design
    met: bool
    goals: tuple[str, ...]
    residuals: tuple[float, ...]
    target_period_s: float | None
    period_s: float
    temperature_coefficient_s_per_day_per_k: float
    searched: tuple[tuple[float, float], ...]
    usable: tuple[tuple[float, float], ...]
    other_roots: tuple[float, ...] = field(default=())
    message: str = ""

    @property
    def field(self) -> str:
        """The first (for a one-field solve, the only) field varied."""
        return self.fields[0]

    @property
    def old_value(self) -> float:
        """Its value before."""
        return self.old_values[0]

    @property
    def value(self) -> float:
        """Its solved value."""
        return self.values[0]


# ----------------------------------------------------------------------------- evaluation

def temperature_coefficient(design: Design) -> float:
    """d(rate)/dT of ``design`` at its site temperature, s/day/K — the report's figure.

    Centred over 0.5 K; the rate is against the design's target (its own period when none).
    """
    t = design.site.temperature_c
    half = _TEMPERATURE_STEP_K / 2.0
    lo = pendulum_state(design, slopes=False, temperature_c=t - half).period_s
    hi = pendulum_state(design, slopes=False, temperature_c=t + half).period_s
    ref = design.target.target_period_s or pendulum_state(design, slopes=False).period_s
    return SECONDS_PER_DAY * (ref / hi - ref / lo) / _TEMPERATURE_STEP_K


class VariedDesign:
    """Designs that differ from a base design in the varied fields only, and their goals."""

    def __init__(self, design: Design, paths: list[str], goals: list[str],
                 target_period_s: float | None) -> None:
        self.source = design
        self.base = design_to_dict(design)
        self.paths = paths
        self.goals = goals
        self.target = target_period_s
        self.old: list[float] = []
        for path in paths:
            value = get_value(self.base, path)
            if isinstance(value, bool) or not isinstance(value, (int, float)):
                raise DesignError(path, "is not a numeric field of this design")
            field_range(path)
            self.old.append(float(value))

    def design(self, xs: tuple[float, ...] | list[float]) -> Design:
        obj = _copy(self.base)
        for path, x in zip(self.paths, xs, strict=True):
            check_number(path, float(x))
            _set_in_place(obj, path, float(x))
        return design_from_dict(obj)

    def goal_values(self, d: Design) -> list[float]:
        """Per goal: period − target (s) or the temperature coefficient (s/day/K)."""
        out = []
        for goal in self.goals:
            if goal == "period":
                assert self.target is not None
                out.append(pendulum_state(d, slopes=False).period_s - self.target)
            else:
                out.append(temperature_coefficient(d))
        return out

    def safe(self, xs: list[float]) -> list[float] | None:
        """Goal values, or None where the values give no usable design."""
        try:
            ys = self.goal_values(self.design(xs))
        except (ValueError, ArithmeticError):  # DesignError is a ValueError
            return None
        return ys if all(math.isfinite(y) for y in ys) else None

    def solution(self, xs: list[float], met: bool | None, searched: list[tuple[float, float]],
                 usable: list[tuple[float, float]], others: tuple[float, ...],
                 message: str) -> Solution:
        d = self.design(xs)
        st = pendulum_state(d, slopes=False)
        tc = temperature_coefficient(d)
        res = tuple(st.period_s - self.target if g == "period" else tc  # type: ignore[operator]
                    for g in self.goals)
        if met is None:
            met = all(abs(r) <= tolerance(g) for g, r in zip(self.goals, res, strict=True))
        return Solution(tuple(self.paths), tuple(self.old), tuple(float(x) for x in xs), d,
                        met, tuple(self.goals), res,
                        self.target if "period" in self.goals else None, st.period_s, tc,
                        tuple(searched), tuple(usable), others, message)


def _copy(obj: Any) -> Any:
    """A copy of a design dict (JSON values only): faster than ``copy.deepcopy``."""
    if isinstance(obj, dict):
        return {k: _copy(v) for k, v in obj.items()}
    if isinstance(obj, list):
        return [_copy(v) for v in obj]
    return obj


def _set_in_place(obj: Any, path: str, value: float) -> None:
    """Set an existing numeric field (checked by ``get_value`` beforehand) in ``obj``."""
    if path.endswith("]"):
        parent, index = path[:path.rindex("[")], int(path[path.rindex("[") + 1:-1])
        get_value(obj, parent)[index] = value
    elif "." in path:
        parent, key = path.rsplit(".", 1)
        get_value(obj, parent)[key] = value
    else:
        obj[path] = value


def tolerance(goal: str) -> float:
    return PERIOD_TOLERANCE_S if goal == "period" else TEMPERATURE_TOLERANCE_S_PER_DAY_PER_K


def goal_words(goal: str, target: float | None) -> str:
    return (f"a period of {target:.10g} s" if goal == "period"
            else "a zero temperature coefficient")



def with_message(sol: Solution, message: str) -> Solution:
    """``sol`` with its message replaced."""
    return replace(sol, message=message)
