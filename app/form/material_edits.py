"""Edits of the design's own materials (format 2 ``materials``), through the core's validator.

A material of one's own is used by key like a built-in one. The core refuses a key that
shadows a built-in material and a material without a source; its sentence is shown as it is.
A built-in material's values are never changed: "stock as measured" makes a copy of it under a
new key with the expansion the maker measured, and may switch the parts made of the built-in
material over to the copy. No Qt here.
"""

from __future__ import annotations

import copy
import re
from dataclasses import dataclass
from typing import Any

from core import Design, DesignError, design_from_dict, design_to_dict
from core.materials import MATERIALS

__all__ = ["MaterialValues", "material_choices", "set_material", "remove_material",
           "measured_copy", "key_from_name", "uses_of"]


@dataclass(frozen=True)
class MaterialValues:
    """One material as typed: key, shown name, SI values and where they come from."""

    key: str
    name: str
    density_kg_m3: float
    expansion_per_k: float
    youngs_modulus_pa: float
    source: str

    def file_form(self) -> dict[str, Any]:
        """The ``materials`` entry of the file (without the key)."""
        return {"name": self.name, "density_kg_m3": self.density_kg_m3,
                "expansion_per_k": self.expansion_per_k,
                "youngs_modulus_pa": self.youngs_modulus_pa, "source": self.source}


def material_choices(design: Design) -> list[tuple[str, str]]:
    """(key, words) for every material a part of ``design`` may use: built-in ones, then the
    design's own (marked “yours”)."""
    out = [(key, m.label) for key, m in MATERIALS.items()]
    out += [(m.key, f"{m.label} (yours)") for m in design.materials]
    return out


def key_from_name(name: str) -> str:
    """A key made from a name: lower case, underscores, starting with a letter
    (“Invar, as measured” → ``invar_as_measured``)."""
    key = re.sub(r"[^a-z0-9]+", "_", name.lower()).strip("_")
    if not key or not key[0].isalpha():
        key = f"m_{key}" if key else "my_material"
    return key[:40]


def uses_of(design: Design, key: str) -> list[str]:
    """Where material ``key`` is used: part names, and “the spring blades”."""
    out = [p.name for p in design.parts if getattr(p, "material", None) == key]
    blades = design.suspension.blades
    if blades is not None and blades.material == key:
        out.append("the spring blades")
    return out


def _rekey(d: dict[str, Any], old: str, new: str) -> None:
    for part in d["parts"]:
        if part.get("material") == old:
            part["material"] = new
    blades = d["suspension"].get("blades")
    if isinstance(blades, dict) and blades.get("material") == old:
        blades["material"] = new


def set_material(design: Design, values: MaterialValues, old_key: str | None = None) -> Design:
    """``design`` with material ``values`` added, or replacing ``old_key`` (parts using the old
    key follow a changed key).

    Raises
    ------
    DesignError
        The core's reason (a key shadowing a built-in one, no source, a value out of range), or
        a key already used by another of the design's materials.
    """
    d = copy.deepcopy(design_to_dict(design))
    mats: dict[str, Any] = d.setdefault("materials", {})
    if values.key != old_key and values.key in mats:
        raise DesignError(f"materials.{values.key}",
                          f"you already have a material with the key {values.key!r}")
    if old_key is not None:
        mats.pop(old_key, None)
        if old_key != values.key:
            _rekey(d, old_key, values.key)
    mats[values.key] = values.file_form()
    return design_from_dict(d)


def remove_material(design: Design, key: str) -> Design:
    """``design`` without its material ``key`` (refused while a part uses it)."""
    users = uses_of(design, key)
    if users:
        raise DesignError(f"materials.{key}", f"it is used by {', '.join(users)}: choose "
                                              "another material there first")
    d = copy.deepcopy(design_to_dict(design))
    d.get("materials", {}).pop(key, None)
    if not d.get("materials"):
        d.pop("materials", None)
    return design_from_dict(d)


def measured_copy(design: Design, builtin: str, expansion_per_k: float, source: str,
                  use_for_parts: bool = True) -> tuple[Design, str]:
    """``design`` with a copy of built-in material ``builtin`` whose expansion is the one
    measured; returns it and the copy's key (``invar_as_measured``, numbered when taken).

    With ``use_for_parts``, parts (and spring blades) made of ``builtin`` are switched to the
    copy. The built-in table itself is never changed.
    """
    if builtin not in MATERIALS:
        raise DesignError("materials", f"{builtin!r} is not a built-in material")
    base = MATERIALS[builtin]
    taken = {m.key for m in design.materials}
    key, n = f"{builtin}_as_measured", 2
    while key in taken:
        key, n = f"{builtin}_as_measured_{n}", n + 1
    values = MaterialValues(key, f"{base.label}, as measured", base.density_kg_m3,
                            expansion_per_k, base.youngs_modulus_pa,
                            source.strip() or "expansion as measured by the user; density "
                            f"and Young's modulus from the built-in {base.label}")
    out = set_material(design, values)
    if use_for_parts:
        d = copy.deepcopy(design_to_dict(out))
        _rekey(d, builtin, key)
        out = design_from_dict(d)
    return out, key
