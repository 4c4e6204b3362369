"""Sweeping a field: the exact period and rate for a row of values of one numeric field.

``sweep_field(design, "pivot", ...)`` moves the pivot down the pendulum instead, which shows both
branches of a reversible pendulum.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np
from numpy.typing import NDArray

from .design import Design
from .errors import DesignError, guarded
from .fileformat import design_from_dict, design_to_dict, get_value, set_in_dict
from .model import SECONDS_PER_DAY, pendulum_state
from .pivot import shift_pivot

__all__ = ["SweepTable", "sweep_field", "shift_pivot"]

FloatArray = NDArray[np.float64]


def _check_numeric_field(design_dict: dict[str, Any], path: str) -> None:
    from .fileformat import field_range

    value = get_value(design_dict, path)
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise DesignError(path, "is not a numeric field of this design")
    field_range(path)


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
        _check_numeric_field(base, path)
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
