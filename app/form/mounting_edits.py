"""Edits of how parts are held (format 2): a rod hanging from another part's end, a bob's
support on a sleeve, and a suspension spring given by its stiffness or by its blades.

Each function returns a new design through the core's validator or raises its
:class:`core.DesignError`. Starting values are plain workshop sizes, not computed figures.
No Qt here.
"""

from __future__ import annotations

import copy
from typing import Any

from core import Design, DesignError, design_from_dict, design_to_dict

__all__ = ["PIVOT", "hang_choices", "hang_key", "set_hangs_from", "set_spring_given",
           "SPRING_GIVEN", "START_BLADES"]

PIVOT = "pivot"
SPRING_GIVEN = [("stiffness", "Stiffness"), ("blades", "Blades")]
START_BLADES: dict[str, Any] = {"count": 2, "material": "spring_steel", "width_m": 0.006,
                                "thickness_m": 0.0001, "free_length_m": 0.006}
"""A first spring when switching to blades: two blades 6 mm wide, 0.1 mm thick, 6 mm free."""

_END_WORDS = {"lower": "Lower end", "upper": "Upper end"}


def hang_key(part: str, end: str) -> str:
    """The choice key of “hangs from ``end`` of ``part``”."""
    return f"{end}\x1f{part}"


def hang_choices(design: Design, index: int) -> list[tuple[str, str]]:
    """(key, words) for where rod ``index`` may hang: the pivot, or an end of another rod or
    sleeve."""
    out = [(PIVOT, "The pivot (top given)")]
    me = design.parts[index].name
    for p in design.parts:
        if p.kind in ("rod", "sleeve") and p.name != me:
            for end in ("lower", "upper"):
                out.append((hang_key(p.name, end), f"{_END_WORDS[end]} of {p.kind} “{p.name}”"))
    return out


def set_hangs_from(design: Design, index: int, key: str) -> Design:
    """Rod ``index`` hanging from the pivot (its top where it is now) or from the end in
    ``key`` (see :func:`hang_key`)."""
    d = copy.deepcopy(design_to_dict(design))
    rod = d["parts"][index]
    if rod.get("kind") != "rod":
        raise DesignError(f"parts[{index}].hangs_from", "only a rod hangs from another part")
    if key == PIVOT:
        rod.pop("hangs_from", None)
        rod["top_m"] = design.parts[index].top_m  # type: ignore[union-attr]
    else:
        end, _, part = key.partition("\x1f")
        rod.pop("top_m", None)
        rod["hangs_from"] = {"part": part, "end": end}
    return design_from_dict(_ordered_rod(d, index))


def _ordered_rod(d: dict[str, Any], index: int) -> dict[str, Any]:
    """Keep the rod's keys in the writer's order (cosmetic for the saved file)."""
    rod = d["parts"][index]
    order = ["kind", "name", "material", "hangs_from", "top_m", "length_m", "diameter_m",
             "mass_kg"]
    d["parts"][index] = {k: rod[k] for k in order if k in rod}
    return d


def set_spring_given(design: Design, given: str, stiffness: float | None = None) -> Design:
    """The suspension spring given by its ``"stiffness"`` (``stiffness`` N·m/rad, e.g. the
    one the blades gave) or by its ``"blades"`` (starting from :data:`START_BLADES`)."""
    d = copy.deepcopy(design_to_dict(design))
    sus = d["suspension"]
    if sus.get("kind") != "spring":
        raise DesignError("suspension.kind", "choose a suspension spring first")
    if given == "blades":
        if sus.get("blades") is None:
            sus["blades"] = dict(START_BLADES)
        sus["stiffness_n_m_per_rad"] = None
    elif given == "stiffness":
        sus.pop("blades", None)
        sus["stiffness_n_m_per_rad"] = stiffness if stiffness and stiffness > 0 else 0.02
    else:
        raise DesignError("suspension.blades", f"{given!r} is not a way to give the spring")
    return design_from_dict(d)
