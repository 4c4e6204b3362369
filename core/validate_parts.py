"""The parts of a design file: each part's fields, then names, references and geometry.

Part of the validator (:mod:`core.validate`); every refusal is a ``DesignError`` naming the
field (``parts[2].mount.on``).
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Callable
from typing import Any

from .design import BOB_SHAPES, Bob, ClampMount, HangsFrom, Part, Rod, Sleeve, SleeveMount, Weight
from .errors import DesignError
from .fields import field_spec, range_text
from .validate import Reader, kind_of

__all__ = ["parse_parts", "MAX_PARTS", "BOB_SIZE_KEYS"]

MAX_PARTS = 200
BOB_SIZE_KEYS: dict[str, tuple[str, ...]] = {
    "disc": ("thickness_m",), "lens": ("thickness_m",), "cylinder": ("height_m",), "sphere": ()}


def _parse_rod(r: Reader, materials: tuple[str, ...]) -> Rod:
    name, material = r.text("name"), r.choice("material", materials)
    hangs = r.child("hangs_from", False)
    hangs_from = None
    if hangs is not None:
        hangs_from = HangsFrom(hangs.text("part"),
                               hangs.choice("end", ("lower", "upper"), False))  # type: ignore[arg-type]
        hangs.done()
        if r.has("top_m"):
            raise DesignError(r.at("top_m"), "a rod hangs from the pivot (top_m) or from "
                                             "another part (hangs_from), not both")
        top = math.nan  # placed once every part is read
    else:
        top = r.req("top_m")
    return Rod(name=name, material=material, top_m=top, length_m=r.req("length_m"),
               diameter_m=r.req("diameter_m"), mass_kg=r.number("mass_kg", False, nullable=True),
               hangs_from=hangs_from)


def _parse_sleeve(r: Reader, materials: tuple[str, ...]) -> Sleeve:
    s = Sleeve(name=r.text("name"), material=r.choice("material", materials), on=r.text("on"),
               length_m=r.req("length_m"), outer_diameter_m=r.req("outer_diameter_m"),
               inner_diameter_m=r.req("inner_diameter_m"),
               mass_kg=r.number("mass_kg", False, nullable=True))
    if s.inner_diameter_m >= s.outer_diameter_m:
        raise DesignError(r.at("inner_diameter_m"),
                          f"inner diameter {s.inner_diameter_m:g} m must be smaller than the "
                          f"outer diameter {s.outer_diameter_m:g} m")
    return s


def _parse_mount(r: Reader) -> ClampMount | SleeveMount:
    kind = r.choice("kind", ("clamp", "on_sleeve"))
    on = r.text("on")
    mount: ClampMount | SleeveMount
    if kind == "clamp":
        mount = ClampMount(on=on, centre_m=r.req("centre_m"))
    else:
        mount = SleeveMount(on=on)
    r.done()
    return mount


def _parse_bob(r: Reader, materials: tuple[str, ...]) -> Bob:
    name = r.text("name")
    shape = r.choice("shape", BOB_SHAPES)
    mount_reader = r.child("mount")
    assert mount_reader is not None
    sizes = {key: r.req(key) for key in BOB_SIZE_KEYS[shape]}
    bob = Bob(name=name, shape=shape, material=r.choice("material", materials),  # type: ignore[arg-type]
              mount=_parse_mount(mount_reader), diameter_m=r.req("diameter_m"),
              mass_kg=r.number("mass_kg", False, nullable=True),
              thickness_m=sizes.get("thickness_m"), height_m=sizes.get("height_m"),
              support=r.choice("support", ("bottom", "centre"), False),  # type: ignore[arg-type]
              hole_diameter_m=r.number("hole_diameter_m", False, nullable=True))
    if bob.support == "centre" and not isinstance(bob.mount, SleeveMount):
        raise DesignError(r.at("support"), "only a bob resting on a sleeve has a support: "
                                           "remove it or mount the bob on a sleeve")
    if bob.hole_diameter_m is not None and bob.hole_diameter_m >= bob.diameter_m:
        raise DesignError(r.at("hole_diameter_m"), f"a hole of {bob.hole_diameter_m:g} m does "
                          f"not fit in a bob {bob.diameter_m:g} m across")
    return bob


def _parse_weight(r: Reader, materials: tuple[str, ...]) -> Weight:
    del materials  # a trim weight is a point mass: no material
    return Weight(name=r.text("name"), mass_kg=r.req("mass_kg"), at_m=r.req("at_m"),
                  on=r.text("on"))


_PART_PARSERS: dict[str, Callable[[Reader, tuple[str, ...]], Part]] = {
    "rod": _parse_rod, "sleeve": _parse_sleeve, "bob": _parse_bob, "weight": _parse_weight,
}


def parse_parts(value: Any, version: int, materials: tuple[str, ...]) -> tuple[Part, ...]:
    """Validate the ``parts`` list; ``materials`` are the keys a part may name."""
    if not isinstance(value, list):
        raise DesignError("parts", f"must be a list, not {kind_of(value)}")
    if not value:
        raise DesignError("parts", "the pendulum needs at least one part")
    if len(value) > MAX_PARTS:
        raise DesignError("parts", f"has {len(value)} parts; at most {MAX_PARTS} are allowed")
    parts: list[Part] = []
    for i, item in enumerate(value):
        r = Reader(item, f"parts[{i}]", version)
        kind = r.choice("kind", tuple(_PART_PARSERS))
        r.kind = kind
        part = _PART_PARSERS[kind](r, materials)
        r.done()
        if not part.name.strip():
            raise DesignError(f"parts[{i}].name", "must not be empty")
        parts.append(part)
    placed = _place_hanging_rods(parts)
    _check_references(placed)
    return placed


def _place_hanging_rods(parts: list[Part]) -> tuple[Part, ...]:
    """Give every rod that hangs from another part its top at the reference temperature.

    A rod's lower end is its top + length; a sleeve's lower end is its rod's lower end and its
    upper end is that less the sleeve's length. Chains are followed until every rod is placed;
    a part that is missing, of the wrong kind, or a loop is refused.
    """
    index = {p.name: i for i, p in enumerate(parts)}
    waiting = [i for i, p in enumerate(parts) if isinstance(p, Rod) and p.hangs_from]
    while waiting:
        progress = False
        for i in list(waiting):
            rod = parts[i]
            assert isinstance(rod, Rod) and rod.hangs_from is not None
            field = f"parts[{i}].hangs_from.part"
            name = rod.hangs_from.part
            if name not in index:
                raise DesignError(field, f"there is no part named {name!r}")
            if name == rod.name:
                raise DesignError(field, "a rod cannot hang from itself")
            top = _end_of(parts, index, name, rod.hangs_from.end, field)
            if top is None:
                continue
            spec = field_spec("parts[rod].top_m")
            if not spec.contains(top):
                raise DesignError(field, f"hanging there puts the rod's top at {top:g} m, "
                                         f"outside {range_text(spec)} m from the pivot")
            parts[i] = dataclasses.replace(rod, top_m=top)
            waiting.remove(i)
            progress = True
        if not progress:
            i = waiting[0]
            raise DesignError(f"parts[{i}].hangs_from.part", "the rods hang from each other in "
                              "a loop: one of them must hang from the pivot (top_m)")
    return tuple(parts)


def _end_of(parts: list[Part], index: dict[str, int], name: str, end: str,
            field: str) -> float | None:
    """Where ``end`` of part ``name`` is (m below the pivot), None while not yet placed."""
    other = parts[index[name]]
    if isinstance(other, Rod):
        if math.isnan(other.top_m):
            return None
        return other.top_m + (other.length_m if end == "lower" else 0.0)
    if isinstance(other, Sleeve):
        if other.on not in index or not isinstance(parts[index[other.on]], Rod):
            _missing_rod(other, index, parts)
        carrier = parts[index[other.on]]
        assert isinstance(carrier, Rod)
        if math.isnan(carrier.top_m):
            return None
        bottom = carrier.top_m + carrier.length_m
        return bottom if end == "lower" else bottom - other.length_m
    raise DesignError(field, f"{name!r} is a {other.kind}, but a rod hangs from a rod or a "
                             "sleeve")


def _missing_rod(sleeve: Sleeve, index: dict[str, int], parts: list[Part]) -> None:
    i = next(j for j, p in enumerate(parts) if p is sleeve)
    if sleeve.on not in index:
        raise DesignError(f"parts[{i}].on", f"there is no part named {sleeve.on!r}")
    raise DesignError(f"parts[{i}].on", f"{sleeve.on!r} is a {parts[index[sleeve.on]].kind}, "
                                        "but must be a rod")


def _check_references(parts: tuple[Part, ...]) -> None:
    """Names unique, ``on`` references to parts of the right kind, geometry that fits."""
    index: dict[str, int] = {}
    for i, p in enumerate(parts):
        if p.name in index:
            raise DesignError(f"parts[{i}].name",
                              f"{p.name!r} is already the name of parts[{index[p.name]}]")
        index[p.name] = i

    def target(i: int, field: str, name: str, kind: str) -> Part:
        if name not in index:
            raise DesignError(f"parts[{i}].{field}", f"there is no part named {name!r}")
        other = parts[index[name]]
        if other.kind != kind:
            raise DesignError(f"parts[{i}].{field}",
                              f"{name!r} is a {other.kind}, but must be a {kind}")
        return other

    sleeve_on_rod: dict[str, int] = {}
    bob_on_sleeve: dict[str, int] = {}
    for i, p in enumerate(parts):
        if isinstance(p, Sleeve):
            rod = target(i, "on", p.on, "rod")
            assert isinstance(rod, Rod)
            if p.on in sleeve_on_rod:
                raise DesignError(f"parts[{i}].on", f"rod {p.on!r} already carries sleeve "
                                  f"parts[{sleeve_on_rod[p.on]}]")
            sleeve_on_rod[p.on] = i
            if p.length_m > rod.length_m:
                raise DesignError(f"parts[{i}].length_m", f"the sleeve ({p.length_m:g} m) is "
                                  f"longer than its rod ({rod.length_m:g} m)")
            if p.inner_diameter_m < rod.diameter_m:
                raise DesignError(f"parts[{i}].inner_diameter_m",
                                  f"{p.inner_diameter_m:g} m is too small to slide over rod "
                                  f"{rod.name!r} ({rod.diameter_m:g} m)")
        elif isinstance(p, Weight):
            rod = target(i, "on", p.on, "rod")
            assert isinstance(rod, Rod)
            lo, hi = rod.top_m, rod.top_m + rod.length_m
            if not lo - 1e-12 <= p.at_m <= hi + 1e-12:
                raise DesignError(f"parts[{i}].at_m", f"{p.at_m:g} m is off rod {rod.name!r}, "
                                  f"which spans {lo:g} to {hi:g} m below the pivot")
        elif isinstance(p, Bob):
            if isinstance(p.mount, ClampMount):
                rod = target(i, "mount.on", p.mount.on, "rod")
                assert isinstance(rod, Rod)
                half = p.half_height_m
                lo, hi = rod.top_m, rod.top_m + rod.length_m
                if p.mount.centre_m - half > hi or p.mount.centre_m + half < lo:
                    raise DesignError(f"parts[{i}].mount.centre_m",
                                      f"a bob centred at {p.mount.centre_m:g} m does not reach "
                                      f"rod {rod.name!r}, which spans {lo:g} to {hi:g} m")
            else:
                target(i, "mount.on", p.mount.on, "sleeve")
                if p.mount.on in bob_on_sleeve:
                    raise DesignError(f"parts[{i}].mount.on", f"sleeve {p.mount.on!r} already "
                                      f"carries parts[{bob_on_sleeve[p.mount.on]}]")
                bob_on_sleeve[p.mount.on] = i
