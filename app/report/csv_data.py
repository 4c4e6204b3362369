"""CSV tables of a result: the motion, the period curve and the parts as they hang.

Every table starts with one plain header row whose column names carry their units
(``time_s``, ``exact_angle_deg``, …), so any CSV reader takes it as is. The numbers are the
core's, converted from radians to degrees where the column says so; nothing else is computed.
Numbers are written exactly (shortest round-trip text of each float); undefined cells are empty.

Rows: the motion has as many rows as the core samples (1201 for three periods at 400 points a
period); the period curve has the core's 400 amplitudes (0.05°–179.9°).
"""

from __future__ import annotations

import csv
import io
import math
import os
from collections.abc import Iterable, Sequence
from pathlib import Path
from typing import Any

import numpy as np

from app.report.atomic_files import write_text_atomic
from core import Result

__all__ = ["MOTION_COLUMNS", "PERIOD_CURVE_COLUMNS", "PARTS_COLUMNS", "motion_csv",
           "period_curve_csv", "parts_csv", "write_motion_csv", "write_period_curve_csv",
           "write_parts_csv"]

MOTION_COLUMNS = ("time_s", "exact_angle_deg", "linear_angle_deg", "angular_velocity_deg_s",
                  "difference_deg")
# The semi-arc column is named as the window and the field table name it (core.fields:
# swing.amplitude_deg is labelled "Semi-arc"), its unit in the name like every column.
PERIOD_CURVE_COLUMNS = ("semi_arc_deg", "period_s", "circular_error_s_per_day")
PARTS_COLUMNS = ("name", "kind", "shape", "material", "mass_kg", "centre_m", "top_m",
                 "bottom_m", "width_m", "inner_width_m")


def _number(value: Any) -> str:
    """A number written exactly (the shortest text that reads back as the same float); empty
    where not defined (None, NaN)."""
    if value is None:
        return ""
    x = float(value)
    return repr(x) if math.isfinite(x) else ""


def _table(header: Sequence[str], rows: Iterable[Sequence[str]]) -> str:
    buf = io.StringIO()
    writer = csv.writer(buf, lineterminator="\n")
    writer.writerow(header)
    writer.writerows(rows)
    return buf.getvalue()


def motion_csv(result: Result) -> str:
    """The motion after release from rest at the semi-arc: time (s), exact and linearised angle
    (°), angular velocity (°/s) and exact minus linearised angle (°)."""
    m = result.motion
    columns = np.column_stack([m.time_s, np.degrees(m.angle_rad), np.degrees(m.linear_angle_rad),
                               np.degrees(m.angular_velocity_rad_s),
                               np.degrees(m.difference_rad)])
    return _table(MOTION_COLUMNS, ([_number(v) for v in row] for row in columns))


def period_curve_csv(result: Result) -> str:
    """Exact period (s) and circular error (s/day) against semi-arc (°)."""
    c = result.period_curve
    columns = np.column_stack([c.amplitude_deg, c.period_s, c.circular_error_s_per_day])
    return _table(PERIOD_CURVE_COLUMNS, ([_number(v) for v in row] for row in columns))


def parts_csv(result: Result) -> str:
    """Every part as it hangs at the site's temperature: mass (kg) and extents (m below the
    pivot; width across the plane of swing)."""
    rows = ([b.name, b.kind, b.shape, b.material, _number(b.mass_kg), _number(b.centre_m),
             _number(b.top_m), _number(b.bottom_m), _number(b.width_m),
             _number(b.inner_width_m)] for b in result.bodies)
    return _table(PARTS_COLUMNS, rows)


def write_motion_csv(result: Result, path: str | os.PathLike[str]) -> Path:
    """Write :func:`motion_csv` to ``path`` atomically; returns the path."""
    return write_text_atomic(path, motion_csv(result))


def write_period_curve_csv(result: Result, path: str | os.PathLike[str]) -> Path:
    """Write :func:`period_curve_csv` to ``path`` atomically; returns the path."""
    return write_text_atomic(path, period_curve_csv(result))


def write_parts_csv(result: Result, path: str | os.PathLike[str]) -> Path:
    """Write :func:`parts_csv` to ``path`` atomically; returns the path."""
    return write_text_atomic(path, parts_csv(result))
