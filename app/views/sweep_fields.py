"""What the sweep can vary: the fields of a design worth sweeping and their default ranges.

Only choices are made here (which fields, which range); every value drawn comes from
:func:`core.solve.sweep_field`.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from app.form.field_text import label_of
from core import Design, design_to_dict
from core.fileformat import field_range

__all__ = ["SweepField", "sweep_fields", "default_field", "default_range", "PIVOT", "SWEEP_POINTS",
           "SWEEP_INTERVAL_MS", "QUANTITIES"]

PIVOT = "pivot"  # core.solve.sweep_field's name for moving the pivot down the pendulum
SWEEP_POINTS = 101
SWEEP_INTERVAL_MS = 60
AROUND_FRACTION = 0.2  # default range: ±20 % around the current value
PIVOT_RANGE = (-0.1, 1.0)  # default pivot range, as fractions of the deepest rod end
QUANTITIES = (("period", "Period (s)"), ("rate", "Rate (s/day)"))
_SWEPT_KEYS = ("length_m", "at_m", "top_m", "mass_kg")  # in the order offered
_UNITS = {"m": "m", "kg": "kg", "n_m_per_rad": "N·m/rad"}


@dataclass(frozen=True)
class SweepField:
    """One field that can be swept: its path (as in the design file, or ``"pivot"``), a
    label, its unit and its value in the current design (SI)."""

    path: str
    label: str
    unit: str
    value: float


def _unit(key: str) -> str:
    for suffix, unit in _UNITS.items():
        if key.endswith("_" + suffix):
            return unit
    return ""


def sweep_fields(design: Design) -> list[SweepField]:
    """The fields of ``design`` worth sweeping: each part's position, length and (given)
    mass, a clamped bob's centre, the spring's stiffness, and the pivot's position."""
    data = design_to_dict(design)
    out: list[SweepField] = []
    for i, part in enumerate(data.get("parts", [])):
        name = part.get("name", f"part {i + 1}")
        entries = [(f"parts[{i}].{k}", k, part[k]) for k in _SWEPT_KEYS if k in part]
        mount = part.get("mount")
        if isinstance(mount, dict) and "centre_m" in mount:
            entries.insert(0, (f"parts[{i}].mount.centre_m", "centre_m", mount["centre_m"]))
        for path, key, value in entries:
            if isinstance(value, (int, float)) and not isinstance(value, bool):
                label = label_of(path, part.get("kind"))
                out.append(SweepField(path, f"{name}: {label}", _unit(key), float(value)))
    suspension = data.get("suspension", {})
    if suspension.get("kind") == "spring":
        out.append(SweepField("suspension.stiffness_n_m_per_rad",
                              label_of("suspension.stiffness_n_m_per_rad"),
                              "N·m/rad", float(suspension["stiffness_n_m_per_rad"])))
    out.append(SweepField(PIVOT, "Pivot position along the pendulum", "m", 0.0))
    return out


def default_field(fields: list[SweepField]) -> SweepField:
    """The field swept unless the person chooses: the bob's position where it has one (a
    clamped bob: the rod's length would leave the bob off the rod for half the range), else
    the first field."""
    return next((f for f in fields if f.path.endswith(".mount.centre_m")), fields[0])


def _longest_rod_end(design: Design) -> float:
    """The deepest rod end below the pivot, m (the reference length for the pivot sweep)."""
    ends = [p.top_m + p.length_m for p in design.parts if p.kind == "rod"]
    return max(ends) if ends else 1.0


def _rod_span(design: Design, path: str) -> tuple[float, float] | None:
    """(top, end) below the pivot, m, of the rod a clamped bob (``parts[i].mount.centre_m``)
    or a weight (``parts[i].at_m``) sits on; None for other fields."""
    match = re.fullmatch(r"parts\[(\d+)\]\.(mount\.centre_m|at_m)", path)
    if match is None:
        return None
    part = design_to_dict(design)["parts"][int(match.group(1))]
    mount = part.get("mount")
    on = part.get("on") if match.group(2) == "at_m" else (
        mount.get("on") if isinstance(mount, dict) else None)
    rod = next((p for p in design.parts if p.kind == "rod" and p.name == on), None)
    return None if rod is None else (rod.top_m, rod.top_m + rod.length_m)


def default_range(design: Design, field: SweepField) -> tuple[float, float]:
    """The range swept unless the person sets one: ±20 % around the current value (inside
    the field's allowed range, and a clamped bob or a weight on its rod); for the pivot,
    from −0.1 L to L, L the deepest rod end."""
    if field.path == PIVOT:
        length = _longest_rod_end(design)
        return PIVOT_RANGE[0] * length, PIVOT_RANGE[1] * length
    half = abs(field.value) * AROUND_FRACTION or AROUND_FRACTION * _longest_rod_end(design)
    lo, hi = field.value - half, field.value + half
    span = _rod_span(design, field.path)
    if span is not None:  # a clamped bob or a weight stays on its rod over the whole sweep
        lo, hi = max(lo, span[0]), min(hi, span[1])
    allowed_lo, allowed_hi, lo_open, hi_open = field_range(field.path)
    if lo <= allowed_lo:
        lo = allowed_lo + (abs(field.value) * 1e-3 if lo_open or allowed_lo == 0 else 0.0)
    return lo, min(hi, allowed_hi)


