"""Edits of a design that are more than one value: parts added, removed, duplicated, renamed,
re-shaped or re-mounted, and switches between kinds of suspension or target.

Each function takes an immutable :class:`core.Design` and returns a new one through the core's
dict form and validator, so every result is a valid design or a :class:`core.DesignError`
naming the field. Defaults for new fields are plain starting values (sizes in metres), not
computed figures. No Qt here.
"""

from __future__ import annotations

import copy
import dataclasses
import re
from typing import Any

from core import Design, DesignError, design_from_dict, design_to_dict, with_value
from core.design import ExhibitSite, beats_per_hour

__all__ = ["PART_KINDS", "set_value", "add_part", "remove_part", "duplicate_part",
           "rename_part", "set_bob_shape", "set_bob_mount", "set_suspension_kind",
           "set_target_kind", "part_label", "rod_names", "sleeve_names"]

PART_KINDS = {"rod": "Rod", "sleeve": "Sleeve", "bob": "Bob", "weight": "Trim weight"}
TARGET_KINDS = ("period", "beats_per_hour", "none")


def _edit(design: Design) -> dict[str, Any]:
    return copy.deepcopy(design_to_dict(design))


def set_value(design: Design, path: str, value: Any) -> Design:
    """``design`` with the field at ``path`` (e.g. ``parts[1].mass_kg``) set to ``value``."""
    if path.startswith("exhibit.") and design.exhibit is None:  # the optional section
        design = dataclasses.replace(design, exhibit=ExhibitSite())
    return with_value(design, path, value)


def rod_names(design: Design) -> list[str]:
    """Names of the rods, in part order."""
    return [p.name for p in design.parts if p.kind == "rod"]


def sleeve_names(design: Design) -> list[str]:
    """Names of the sleeves, in part order."""
    return [p.name for p in design.parts if p.kind == "sleeve"]


def part_label(part: Any) -> str:
    """A short line for the parts list: name, kind and material or mass."""
    kind = PART_KINDS.get(part.kind, part.kind)
    if part.kind == "weight":
        return f"{part.name}  ·  {kind}"
    detail = f"{part.shape} " if part.kind == "bob" else ""
    return f"{part.name}  ·  {kind}, {detail}{part.material.replace('_', ' ')}"


def _unique_name(design: Design, base: str) -> str:
    """``base``, or ``base`` numbered (“trim 2”, “trim 3”) when the name is taken."""
    names = {p.name for p in design.parts}
    if base not in names:
        return base
    numbered = re.fullmatch(r"(.*\S) (\d+)", base)
    if numbered:
        base = numbered.group(1)
    n = 2
    while f"{base} {n}" in names:
        n += 1
    return f"{base} {n}"


def _first_rod(design: Design) -> Any:
    for p in design.parts:
        if p.kind == "rod":
            return p
    raise DesignError("parts", "add a rod first: this part hangs on a rod")


def _new_part(design: Design, kind: str) -> dict[str, Any]:
    """A starting part of ``kind`` that fits the design's first rod."""
    if kind == "rod":
        return {"kind": "rod", "name": _unique_name(design, "rod"), "material": "steel",
                "top_m": 0.0, "length_m": 1.0, "diameter_m": 0.006, "mass_kg": None}
    rod = _first_rod(design)
    end = rod.top_m + rod.length_m
    if kind == "sleeve":
        return {"kind": "sleeve", "name": _unique_name(design, "sleeve"), "material": "brass",
                "on": rod.name, "length_m": min(0.05, rod.length_m / 2),
                "outer_diameter_m": rod.diameter_m + 0.012,
                "inner_diameter_m": rod.diameter_m + 0.001, "mass_kg": None}
    if kind == "bob":
        return {"kind": "bob", "name": _unique_name(design, "bob"), "shape": "lens",
                "material": "brass", "mount": {"kind": "clamp", "on": rod.name,
                                               "centre_m": end - 0.05},
                "diameter_m": 0.15, "thickness_m": 0.03, "mass_kg": None}
    if kind == "weight":
        return {"kind": "weight", "name": _unique_name(design, "trim"), "mass_kg": 0.002,
                "at_m": rod.top_m + rod.length_m / 2, "on": rod.name}
    raise DesignError("parts", f"{kind!r} is not a kind of part")


def add_part(design: Design, kind: str) -> tuple[Design, int]:
    """``design`` with a new part of ``kind`` appended; returns it and the new part's index."""
    d = _edit(design)
    d["parts"].append(_new_part(design, kind))
    return design_from_dict(d), len(d["parts"]) - 1


def remove_part(design: Design, index: int) -> Design:
    """``design`` without part ``index`` (refused when another part hangs on it)."""
    d = _edit(design)
    if not 0 <= index < len(d["parts"]):
        raise DesignError("parts", f"there is no part {index}")
    name = d["parts"][index]["name"]
    for i, p in enumerate(d["parts"]):
        on = p.get("on") or p.get("mount", {}).get("on")
        if i != index and on == name:
            raise DesignError(f"parts[{index}]", f"{p['name']!r} is carried by {name!r}: "
                                                 "remove or move it first")
    del d["parts"][index]
    return design_from_dict(d)


def duplicate_part(design: Design, index: int) -> tuple[Design, int]:
    """``design`` with a copy of part ``index`` after it; returns it and the copy's index.

    A copied sleeve or sleeve-mounted bob would sit where the original is, which the design
    refuses; such a copy is refused with the core's message.
    """
    d = _edit(design)
    part = copy.deepcopy(d["parts"][index])
    part["name"] = _unique_name(design, part["name"])
    d["parts"].insert(index + 1, part)
    return design_from_dict(d), index + 1


def rename_part(design: Design, index: int, name: str) -> Design:
    """``design`` with part ``index`` renamed and every reference to it following."""
    d = _edit(design)
    old = d["parts"][index]["name"]
    d["parts"][index]["name"] = name
    for p in d["parts"]:
        if p.get("on") == old:
            p["on"] = name
        if isinstance(p.get("mount"), dict) and p["mount"].get("on") == old:
            p["mount"]["on"] = name
    return design_from_dict(d)


def set_bob_shape(design: Design, index: int, shape: str) -> Design:
    """``design`` with bob ``index`` given ``shape``, keeping its diameter; the new size field
    starts from the old one (thickness ↔ height)."""
    d = _edit(design)
    bob = d["parts"][index]
    thickness, height = bob.pop("thickness_m", None), bob.pop("height_m", None)
    size = thickness or height or bob["diameter_m"] / 4
    bob["shape"] = shape
    if shape in ("disc", "lens"):
        bob["thickness_m"] = size
    elif shape == "cylinder":
        bob["height_m"] = size
    return design_from_dict(d)


def set_bob_mount(design: Design, index: int, kind: str, centre_m: float | None = None
                  ) -> Design:
    """``design`` with bob ``index`` clamped to the first rod (at ``centre_m``, default its
    lower end) or resting on the first sleeve."""
    d = _edit(design)
    bob = d["parts"][index]
    if kind == "clamp":
        rod = _first_rod(design)
        centre = rod.top_m + rod.length_m if centre_m is None else centre_m
        bob["mount"] = {"kind": "clamp", "on": rod.name, "centre_m": centre}
    elif kind == "on_sleeve":
        sleeves = sleeve_names(design)
        if not sleeves:
            raise DesignError(f"parts[{index}].mount.kind",
                              "there is no sleeve to rest on: add a sleeve first")
        bob["mount"] = {"kind": "on_sleeve", "on": sleeves[0]}
    else:
        raise DesignError(f"parts[{index}].mount.kind", f"{kind!r} is not a mounting")
    return design_from_dict(d)


def set_suspension_kind(design: Design, kind: str, stiffness: float = 0.02) -> Design:
    """Knife edge (stiffness 0) or spring (``stiffness``, N·m/rad, when it had none)."""
    d = _edit(design)
    old = d["suspension"]["stiffness_n_m_per_rad"]
    d["suspension"] = {"kind": kind,
                       "stiffness_n_m_per_rad": 0.0 if kind == "knife_edge" else
                       (old if old > 0 else stiffness)}
    return design_from_dict(d)


def set_target_kind(design: Design, kind: str) -> Design:
    """Target given as a period, as beats per hour, or no target; the value carries over."""
    d = _edit(design)
    period = design.target.target_period_s or 2.0
    if kind == "period":
        d["target"] = {"period_s": period}
    elif kind == "beats_per_hour":
        d["target"] = {"beats_per_hour": beats_per_hour(period)}
    elif kind == "none":
        d["target"] = {"period_s": None}
    else:
        raise DesignError("target", f"{kind!r} is not a kind of target")
    return design_from_dict(d)
