"""The design validator: a parsed design file (format 1 or 2) in, an immutable Design out.

Every refusal is a :class:`~core.errors.DesignError` whose ``field`` is the path of the offending
value (``parts[1].length_m``) and whose message says why, with the value and its allowed range.
Ranges, labels and defaults come from the field table, :mod:`core.fields`. The parts and their
references are checked in :mod:`core.validate_parts`.

An optional top-level section is one entry in :data:`SECTIONS`: its key, the ``Design``
attribute it fills, a reader and a writer.
"""

from __future__ import annotations

import math
import weakref
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from .design import (
    PURPOSES,
    Blades,
    Design,
    ExhibitSite,
    RatingNut,
    Site,
    Suspension,
    Swing,
    Target,
)
from .errors import DesignError
from .fields import FieldPath, field_spec, range_text
from .materials import MATERIALS, Material
from .rating_log import rating_log_from_dict, rating_log_to_dict

__all__ = ["FORMAT", "VERSION", "READABLE_VERSIONS", "check_number", "design_from_dict",
           "is_validated", "mark_validated", "Reader", "SECTIONS", "Section", "kind_of", "shown"]

FORMAT = "penduline-design"
VERSION = 2
READABLE_VERSIONS = (1, 2)
MAX_TEXT = 200
# Keys that only a version 2 file may hold (DESIGN §8).
V2_KEYS = frozenset({"purpose", "exhibit", "rating_log", "materials", "hangs_from", "support",
                     "hole_diameter_m", "blades"})


def kind_of(value: Any) -> str:
    """A JSON value's kind in plain words ("a number", "text", "a list"...)."""
    names = {bool: "true/false", int: "a number", float: "a number", str: "text",
             list: "a list", dict: "an object", type(None): "null"}
    return names.get(type(value), type(value).__name__)


def shown(x: float) -> str:
    """``x`` short (``%g``) when that is exact, else in full, so a refused value just past a
    limit never prints as the limit itself."""
    short = f"{x:g}"
    return short if float(short) == x else repr(x)


def check_number(path: str, value: Any, kind: str | None = None) -> float:
    """Return ``value`` as a float after checking its type, finiteness and the field's range.

    Parameters
    ----------
    path : str
        The field's path; its range comes from the field table (none for paths outside it).
    kind : str, optional
        The part kind, for paths into ``parts`` whose meaning depends on it.
    """
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise DesignError(path, f"must be a number, not {kind_of(value)}")
    try:
        x = float(value)
    except OverflowError:
        raise DesignError(path, "is too large") from None
    if not math.isfinite(x):
        raise DesignError(path, f"must be a finite number, not {x}")
    try:
        spec = field_spec(path, kind)
    except (KeyError, ValueError):
        return x
    if spec.numeric and not spec.contains(x):
        raise DesignError(path, f"{spec.label} {shown(x)} is out of range: it must be in "
                                f"{range_text(spec)}")
    return x


class Reader:
    """Reads one JSON object, tracking the path for messages and refusing unknown keys.

    ``kind`` is the part kind for readers inside ``parts[i]``; ``version`` the file's version.
    """

    def __init__(self, obj: Any, path: str, version: int = VERSION,
                 kind: str | None = None) -> None:
        if not isinstance(obj, dict):
            raise DesignError(path or "file", f"must be an object, not {kind_of(obj)}")
        self.obj = obj
        self.path = path
        self.version = version
        self.kind = kind
        self.used: set[str] = set()

    def at(self, key: str) -> str:
        shown = key if key.strip() else f"{key!r} (a key with no name)"
        return f"{self.path}.{shown}" if self.path else shown

    def has(self, key: str) -> bool:
        return key in self.obj

    def raw(self, key: str, required: bool = True) -> Any:
        self.used.add(key)
        if key not in self.obj:
            if required:
                raise DesignError(self.at(key), "is missing (required)")
            return None
        if key in V2_KEYS and self.version < 2:
            raise DesignError(self.at(key), "belongs to format version 2: set \"version\" to 2 "
                                            "to use it")
        return self.obj[key]

    def _default(self, key: str) -> Any:
        try:
            return field_spec(self.at(key), self.kind).default
        except (KeyError, ValueError):
            return None

    def number(self, key: str, required: bool = True, nullable: bool = False) -> float | None:
        """A number; an absent optional one takes the table's default."""
        value = self.raw(key, required)
        if value is None:
            if key in self.obj and not nullable:
                raise DesignError(self.at(key), "must be a number, not null")
            return None if key in self.obj else self._default(key)
        return check_number(self.at(key), value, self.kind)

    def req(self, key: str) -> float:
        """A required number (refused when missing, null or out of range)."""
        value = self.number(key)
        assert value is not None
        return value

    def opt(self, key: str) -> float:
        """An optional, non-null number with a default in the table."""
        value = self.number(key, False)
        assert value is not None
        return value

    def whole(self, key: str) -> int:
        """A required whole number within the field's range."""
        value = self.raw(key)
        x = check_number(self.at(key), value, self.kind)
        if not x.is_integer():
            raise DesignError(self.at(key), f"must be a whole number, not {x:g}")
        return int(x)

    def text(self, key: str, required: bool = True, default: str = "") -> str:
        value = self.raw(key, required)
        if value is None:
            if key in self.obj:
                raise DesignError(self.at(key), "must be text, not null")
            return default
        if not isinstance(value, str):
            raise DesignError(self.at(key), f"must be text, not {kind_of(value)}")
        if len(value) > MAX_TEXT:
            raise DesignError(self.at(key), f"is longer than {MAX_TEXT} characters")
        try:
            value.encode("utf-8")
        except UnicodeEncodeError:
            raise DesignError(self.at(key), "contains a character that is not valid text "
                                            "(an unpaired surrogate)") from None
        return value

    def choice(self, key: str, options: tuple[str, ...], required: bool = True,
               default: str | None = None) -> str:
        if default is None:
            default = self._default(key) or ""
        value = self.text(key, required, default)
        if value not in options:
            raise DesignError(self.at(key), f"{value!r} is not one of {', '.join(options)}")
        return value

    def child(self, key: str, required: bool = True) -> Reader | None:
        value = self.raw(key, required)
        if value is None and not required:
            return None
        return Reader(value, self.at(key), self.version, self.kind)

    def done(self) -> None:
        extra = sorted(set(self.obj) - self.used, key=str)
        if extra:
            raise DesignError(self.at(str(extra[0])), "is not a known key here")


# ----------------------------------------------------------------------------- sections

def _parse_site(r: Reader, reference_c: float) -> Site:
    site = Site(latitude_deg=r.req("latitude_deg"), elevation_m=r.opt("elevation_m"),
                g_m_s2=r.number("g_m_s2", False, nullable=True),
                temperature_c=(r.opt("temperature_c") if r.has("temperature_c")
                               else reference_c),
                pressure_hpa=r.opt("pressure_hpa"))
    r.done()
    return site


def _parse_suspension(r: Reader | None, materials: dict[str, Material]) -> Suspension:
    if r is None:
        return Suspension()
    kind = r.choice("kind", ("knife_edge", "spring"))
    blades_reader = r.child("blades", False)
    k = r.number("stiffness_n_m_per_rad", False, nullable=blades_reader is not None)
    blades = None
    if blades_reader is not None:
        blades = Blades(count=blades_reader.whole("count"),
                        material=blades_reader.choice("material", tuple(materials)),
                        width_m=blades_reader.req("width_m"),
                        thickness_m=blades_reader.req("thickness_m"),
                        free_length_m=blades_reader.req("free_length_m"))
        blades_reader.done()
        if kind != "spring":
            raise DesignError(r.at("blades"), "only a suspension spring has blades: choose "
                                              "kind 'spring'")
        if r.has("stiffness_n_m_per_rad") and r.obj["stiffness_n_m_per_rad"] is not None:
            raise DesignError(r.at("stiffness_n_m_per_rad"), "give the stiffness or the "
                              "blades, not both (set the stiffness to null)")
        k = 0.0  # derived by the model under the pendulum's weight (core.blades)
    r.done()
    assert k is not None
    if kind == "knife_edge" and k != 0.0:
        raise DesignError(r.at("stiffness_n_m_per_rad"),
                          "a knife edge has no stiffness: set it to 0 or choose kind 'spring'")
    return Suspension(kind, k, blades)  # type: ignore[arg-type]


def _parse_target(r: Reader | None) -> Target:
    if r is None:
        return Target()
    period = r.number("period_s", False, nullable=True)
    bph = r.number("beats_per_hour", False, nullable=True)
    r.done()
    if period is not None and bph is not None:
        raise DesignError(r.at("beats_per_hour"),
                          "give the target as period_s or beats_per_hour, not both")
    return Target(period, bph)


def _parse_swing(r: Reader) -> Swing:
    swing = Swing(amplitude_deg=r.req("amplitude_deg"),
                  quality_factor=r.number("quality_factor", False, nullable=True))
    r.done()
    return swing


def _parse_nut(r: Reader | None) -> RatingNut:
    if r is None:
        return RatingNut()
    nut = RatingNut(r.number("pitch_m", False, nullable=True))
    r.done()
    return nut


def _parse_exhibit(r: Reader) -> ExhibitSite:
    ex = ExhibitSite(r.number("pivot_above_floor_m", False, nullable=True),
                     r.number("barrier_radius_m", False, nullable=True))
    r.done()
    return ex


def _parse_materials(r: Reader) -> tuple[Material, ...]:
    out = []
    for key in sorted(r.obj, key=str):
        r.used.add(key)
        path = r.at(key)
        try:
            FieldPath.parse(f"materials.{key}")
        except ValueError:
            raise DesignError(path, "a material key is letters, digits and underscores, "
                                    "starting with a letter") from None
        if len(key) > 40:
            raise DesignError(path, "a material key is at most 40 characters")
        if key in MATERIALS:
            raise DesignError(path, f"{key!r} is a built-in material: give yours another key")
        m = Reader(r.obj[key], path, r.version)
        source = m.text("source")
        if not source.strip():
            raise DesignError(m.at("source"), "must say where the values come from")
        out.append(Material(key, m.text("name", False, key), m.req("density_kg_m3"),
                            m.req("expansion_per_k"), m.req("youngs_modulus_pa"), source))
        m.done()
    return tuple(out)


def _write_materials(design: Design) -> Any:
    return {m.key: {"name": m.label, "density_kg_m3": m.density_kg_m3,
                    "expansion_per_k": m.expansion_per_k,
                    "youngs_modulus_pa": m.youngs_modulus_pa, "source": m.source}
            for m in design.materials}


def _write_exhibit(design: Design) -> Any:
    ex = design.exhibit
    assert ex is not None
    return {"pivot_above_floor_m": ex.pivot_above_floor_m,
            "barrier_radius_m": ex.barrier_radius_m}


def _write_rating_log(design: Design) -> Any:
    assert design.rating_log is not None
    return rating_log_to_dict(design.rating_log)


@dataclass(frozen=True)
class Section:
    """An optional top-level section of the file (format 2 and later).

    ``read`` turns the section's reader into the value of ``Design.<attribute>``; ``write``
    gives the section's file form, or is skipped when ``present`` says the design has none.
    """

    key: str
    attribute: str
    read: Callable[[Reader], Any]
    write: Callable[[Design], Any]
    present: Callable[[Design], bool]


SECTIONS: tuple[Section, ...] = (
    Section("exhibit", "exhibit", _parse_exhibit, _write_exhibit,
            lambda d: d.exhibit is not None),
    Section("rating_log", "rating_log", lambda r: rating_log_from_dict(r.obj, r.path),
            _write_rating_log, lambda d: d.rating_log is not None),
)


# ----------------------------------------------------------------------------- the whole file

def design_from_dict(obj: Any) -> Design:
    """Validate a parsed design file (format 1 or 2) and return the design.

    Raises
    ------
    DesignError
        For any problem, naming the field.
    """
    try:
        return mark_validated(_design_from_dict(obj))
    except RecursionError:
        raise DesignError("file", "is nested too deeply to be a design") from None


_VALIDATED: weakref.WeakValueDictionary[int, Design] = weakref.WeakValueDictionary()
"""The live designs this validator made (by identity), so they need not be checked again."""


def mark_validated(design: Design) -> Design:
    """Note that ``design`` came out of the validator (or was made from one that did, with
    a validated section put in unchanged); returns it."""
    _VALIDATED[id(design)] = design
    return design


def is_validated(design: object) -> bool:
    """Whether ``design`` is a live design this validator made (designs are immutable, so one
    that passed once passes again; a Design built by hand is not)."""
    return _VALIDATED.get(id(design)) is design


def _version(r: Reader) -> int:
    version = r.raw("version")
    if isinstance(version, float) and version.is_integer():
        version = int(version)
    if isinstance(version, bool) or not isinstance(version, int):
        what = shown(version) if isinstance(version, float) else kind_of(version)
        raise DesignError("version", f"must be a whole number such as {VERSION}, not {what}")
    if version > max(READABLE_VERSIONS):
        raise DesignError("version", f"version {version} is newer than this Penduline reads "
                                     f"(up to {VERSION}); update Penduline")
    if version not in READABLE_VERSIONS:
        raise DesignError("version", f"version {version} is not a design file version")
    return version


def _design_from_dict(obj: Any) -> Design:
    from .validate_parts import parse_parts

    r = Reader(obj, "")
    fmt = r.raw("format")
    if fmt != FORMAT:
        shown = repr(fmt) if isinstance(fmt, str) and len(fmt) <= MAX_TEXT else kind_of(fmt)
        raise DesignError("format", f"{shown} is not a Penduline design (expected {FORMAT!r})")
    r.version = _version(r)
    name = r.text("name", False, "Untitled")
    purpose = r.choice("purpose", PURPOSES, False)
    ref = r.opt("reference_temperature_c")
    mat_reader = r.child("materials", False)
    user = _parse_materials(mat_reader) if mat_reader is not None else ()
    materials = {**MATERIALS, **{m.key: m for m in user}}
    site_reader = r.child("site")
    assert site_reader is not None
    site = _parse_site(site_reader, ref)
    suspension = _parse_suspension(r.child("suspension", False), materials)
    parts = parse_parts(r.raw("parts"), r.version, tuple(materials))
    swing_reader = r.child("swing")
    assert swing_reader is not None
    swing = _parse_swing(swing_reader)
    target = _parse_target(r.child("target", False))
    nut = _parse_nut(r.child("rating_nut", False))
    extra = {}
    for section in SECTIONS:
        reader = r.child(section.key, False)
        if reader is not None:
            extra[section.attribute] = section.read(reader)
    r.done()
    return Design(name, ref, site, suspension, parts, swing, target, nut,
                  purpose=purpose, materials=user, **extra)  # type: ignore[arg-type]
