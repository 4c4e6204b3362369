"""What the solve dialog offers and how it words the core's answer (no Qt, no physics).

The fields a person may vary are the design's numeric values that the core's field table gives
a range for; each is shown with the table's label and the part it belongs to
("Rod length (rod)"). The targets become a :class:`core.solve.Targets`; the number of goals is
checked here so the person reads a sentence about the dialog rather than about the command
line's options.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from core import Design, DesignError, design_to_dict
from core.fields import field_spec
from core.fileformat import field_range
from core.solve import Solution, Targets

__all__ = ["SolveField", "solvable_fields", "field_name", "make_targets", "relabel",
           "TARGET_CHOICES"]

# Sections whose numbers are not the pendulum's shape or make: never offered.
_SKIPPED_SECTIONS = ("format", "version", "target", "rating_log", "rating_nut", "materials",
                     "exhibit", "reference_temperature_c")
_SKIPPED_KEYS = ("count",)  # whole numbers: a root finder cannot vary them

TARGET_CHOICES = (("design", "The design's own target"), ("period", "Period"),
                  ("beats_per_hour", "Beats per hour"), ("none", "No period target"))
"""How the period goal is given: (key, words)."""


@dataclass(frozen=True)
class SolveField:
    """One field offered for solving: its path, its words, and its value now (SI)."""

    path: str
    label: str
    value: float


def _leaves(obj: Any, prefix: str = "") -> list[tuple[str, Any]]:
    out: list[tuple[str, Any]] = []
    if isinstance(obj, dict):
        for key, value in obj.items():
            out += _leaves(value, f"{prefix}.{key}" if prefix else key)
    elif isinstance(obj, list):
        for i, value in enumerate(obj):
            out += _leaves(value, f"{prefix}[{i}]")
    else:
        out.append((prefix, obj))
    return out


def field_name(design: Design, path: str) -> str:
    """The table's label for ``path``, with the part's name for a part field
    (``parts[0].length_m`` → “Rod length (rod)”)."""
    kind, part = None, None
    if path.startswith("parts["):
        index = int(path[6:path.index("]")])
        if index < len(design.parts):
            part = design.parts[index]
            kind = part.kind
    try:
        label = field_spec(path, kind).label
    except (KeyError, ValueError):
        label = path
    return f"{label} ({part.name})" if part is not None else label


def solvable_fields(design: Design) -> list[SolveField]:
    """The design's numeric fields a solve may vary, parts first, in file order."""
    out: list[SolveField] = []
    for path, value in _leaves(design_to_dict(design)):
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            continue
        if path.split(".", 1)[0].split("[", 1)[0] in _SKIPPED_SECTIONS:
            continue
        if path.rsplit(".", 1)[-1] in _SKIPPED_KEYS:
            continue
        try:
            field_range(path)
        except DesignError:
            continue
        out.append(SolveField(path, field_name(design, path), float(value)))
    out.sort(key=lambda f: not f.path.startswith("parts["))
    return out


def make_targets(design: Design, fields: list[str], choice: str, value: float | None,
                 null_temperature: bool) -> Targets:
    """The core's targets for the dialog's choice.

    Parameters
    ----------
    fields : the one or two field paths chosen.
    choice : one of :data:`TARGET_CHOICES`' keys.
    value : the period (s) or beats per hour typed, for ``period`` / ``beats_per_hour``.
    null_temperature : whether the temperature coefficient is to be made zero.

    Raises
    ------
    DesignError
        When the number of goals does not match the number of fields, or the design has no
        target of its own; the sentence speaks of the dialog's choices.
    """
    wants_period = choice != "none"
    goals = int(wants_period) + int(null_temperature)
    if goals == 0:
        raise DesignError("target", "choose a period target or tick “Null the temperature "
                                    "coefficient”: there is nothing to solve for")
    if goals != len(fields):
        if len(fields) == 1:
            raise DesignError("field", "a period and a temperature null need two fields: "
                                       "choose a second field, or drop one of the targets")
        raise DesignError("field", "two fields need two targets: a period and the "
                                   "temperature null (or choose one field only)")
    if choice == "design":
        period = design.target.target_period_s
        if period is None:
            raise DesignError("target", "the design has no target of its own: give a period "
                                        "or beats per hour")
        return Targets(period_s=period, null_temperature=null_temperature)
    if choice == "period":
        return Targets(period_s=value, null_temperature=null_temperature)
    if choice == "beats_per_hour":
        return Targets(beats_per_hour=value, null_temperature=null_temperature)
    return Targets(null_temperature=null_temperature)


def relabel(design: Design, solution: Solution) -> str:
    """The core's message with each field path replaced by its words."""
    text = solution.message
    for path in sorted(solution.fields, key=len, reverse=True):
        text = text.replace(path, field_name(design, path))
    return text
