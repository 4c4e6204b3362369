"""Design file format 1: reading, validating, writing (atomically) and editing by field path.

Every refusal is a :class:`~core.errors.DesignError` whose ``field`` is the path of the offending
value in the file (``parts[1].length_m``). Reading never changes the file; saving writes a
temporary file beside the target and renames it over the old one.
"""

from __future__ import annotations

import copy
import json
import math
import os
import re
import stat
import tempfile
from pathlib import Path
from typing import Any, Callable

from .design import (BOB_SHAPES, Bob, ClampMount, Design, Part, RatingNut, Rod, Site, Sleeve,
                     SleeveMount, Suspension, Swing, Target, Weight)
from .atomic_write import write_text_atomic as _atomic_write
from .errors import DesignError, guarded
from .materials import MATERIALS

__all__ = [
    "FORMAT", "VERSION", "MAX_FILE_BYTES", "design_from_dict", "design_to_dict", "loads_design",
    "dumps_design", "load_design", "save_design", "with_value", "get_value", "set_in_dict",
    "field_range",
]

FORMAT = "penduline-design"
VERSION = 1
MAX_FILE_BYTES = 5_000_000
MAX_PARTS = 200

# (low, high, low_open, high_open) per numeric field name; one table serves the parser, the
# solver's search window and the window's spin boxes.
RANGES: dict[str, tuple[float, float, bool, bool]] = {
    "reference_temperature_c": (-80.0, 100.0, False, False),
    "latitude_deg": (-90.0, 90.0, False, False),
    "elevation_m": (-500.0, 9000.0, False, False),
    "g_m_s2": (1.0, 30.0, False, False),
    "temperature_c": (-80.0, 100.0, False, False),
    "pressure_hpa": (0.0, 1200.0, False, False),
    "stiffness_n_m_per_rad": (0.0, 1.0e6, False, False),
    "top_m": (-1000.0, 1000.0, False, False),
    "length_m": (1e-4, 1000.0, False, False),
    "diameter_m": (1e-5, 10.0, False, False),
    "outer_diameter_m": (1e-5, 10.0, False, False),
    "inner_diameter_m": (1e-5, 10.0, False, False),
    "thickness_m": (1e-5, 10.0, False, False),
    "height_m": (1e-5, 100.0, False, False),
    "mass_kg": (1e-6, 1.0e6, False, False),
    "at_m": (-1000.0, 1000.0, False, False),
    "centre_m": (-1000.0, 1000.0, False, False),
    "amplitude_deg": (1e-6, 179.9, False, False),
    "quality_factor": (1.0, 1.0e9, False, False),
    "period_s": (0.0, 1.0e4, True, False),
    "beats_per_hour": (0.0, 1.0e7, True, False),
    "pitch_m": (0.0, 0.1, True, False),
}


def field_range(path: str) -> tuple[float, float, bool, bool]:
    """The allowed range of the numeric field at ``path`` (by its last key)."""
    key = path.rsplit(".", 1)[-1]
    if key not in RANGES:
        raise DesignError(path, "is not a numeric field of the design")
    return RANGES[key]


def _range_text(lo: float, hi: float, lo_open: bool, hi_open: bool) -> str:
    return f"{'(' if lo_open else '['}{lo:g}, {hi:g}{')' if hi_open else ']'}"


class _Reader:
    """Reads one JSON object, tracking the path for messages and refusing unknown keys."""

    def __init__(self, obj: Any, path: str) -> None:
        if not isinstance(obj, dict):
            raise DesignError(path or "file", f"must be an object, not {_kind(obj)}")
        self.obj = obj
        self.path = path
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
        return self.obj[key]

    def number(self, key: str, required: bool = True, default: float | None = None,
               nullable: bool = False) -> float | None:
        value = self.raw(key, required)
        if value is None:
            if key in self.obj and not nullable:
                raise DesignError(self.at(key), "must be a number, not null")
            return default
        return check_number(self.at(key), value)

    def req(self, key: str) -> float:
        """A required number (refused when missing, null or out of range)."""
        value = self.number(key)
        assert value is not None
        return value

    def text(self, key: str, required: bool = True, default: str = "") -> str:
        value = self.raw(key, required)
        if value is None:
            if key in self.obj:
                raise DesignError(self.at(key), "must be text, not null")
            return default
        if not isinstance(value, str):
            raise DesignError(self.at(key), f"must be text, not {_kind(value)}")
        if len(value) > 200:
            raise DesignError(self.at(key), "is longer than 200 characters")
        try:
            value.encode("utf-8")
        except UnicodeEncodeError:
            raise DesignError(self.at(key), "contains a character that is not valid text "
                                            "(an unpaired surrogate)") from None
        return value

    def choice(self, key: str, options: tuple[str, ...], required: bool = True,
               default: str = "") -> str:
        value = self.text(key, required, default)
        if value not in options:
            raise DesignError(self.at(key), f"{value!r} is not one of {', '.join(options)}")
        return value

    def child(self, key: str, required: bool = True) -> "_Reader | None":
        value = self.raw(key, required)
        if value is None and not required:
            return None
        return _Reader(value, self.at(key))

    def done(self) -> None:
        extra = sorted(set(self.obj) - self.used, key=str)
        if extra:
            raise DesignError(self.at(str(extra[0])), "is not a known key here")


def _kind(value: Any) -> str:
    names = {bool: "true/false", int: "a number", float: "a number", str: "text",
             list: "a list", dict: "an object", type(None): "null"}
    return names.get(type(value), type(value).__name__)


def check_number(path: str, value: Any) -> float:
    """Return ``value`` as a float after checking its type, finiteness and range."""
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise DesignError(path, f"must be a number, not {_kind(value)}")
    try:
        x = float(value)
    except OverflowError:
        raise DesignError(path, "is too large") from None
    if not math.isfinite(x):
        raise DesignError(path, f"must be a finite number, not {x}")
    key = path.rsplit(".", 1)[-1]
    if key in RANGES:
        lo, hi, lo_open, hi_open = RANGES[key]
        bad = (x < lo or x > hi or (lo_open and x == lo) or (hi_open and x == hi))
        if bad:
            raise DesignError(path, f"{key}={x:g} is out of range: it must be in "
                                    f"{_range_text(lo, hi, lo_open, hi_open)}")
    return x


# ----------------------------------------------------------------------------- parsing

def _parse_site(r: _Reader, reference_c: float) -> Site:
    site = Site(
        latitude_deg=r.number("latitude_deg"),  # type: ignore[arg-type]
        elevation_m=r.number("elevation_m", False, 0.0),  # type: ignore[arg-type]
        g_m_s2=r.number("g_m_s2", False, None, nullable=True),
        temperature_c=r.number("temperature_c", False, reference_c),  # type: ignore[arg-type]
        pressure_hpa=r.number("pressure_hpa", False, 1013.25),  # type: ignore[arg-type]
    )
    r.done()
    return site


def _parse_suspension(r: _Reader | None) -> Suspension:
    if r is None:
        return Suspension()
    kind = r.choice("kind", ("knife_edge", "spring"))
    k = r.number("stiffness_n_m_per_rad", False, 0.0)
    r.done()
    assert k is not None
    if kind == "knife_edge" and k != 0.0:
        raise DesignError(r.at("stiffness_n_m_per_rad"),
                          "a knife edge has no stiffness: set it to 0 or choose kind 'spring'")
    return Suspension(kind, k)  # type: ignore[arg-type]


def _material(r: _Reader) -> str:
    return r.choice("material", tuple(MATERIALS))


def _parse_rod(r: _Reader) -> Rod:
    return Rod(name=r.text("name"), material=_material(r), top_m=r.req("top_m"),
               length_m=r.req("length_m"), diameter_m=r.req("diameter_m"),
               mass_kg=r.number("mass_kg", False, None, nullable=True))


def _parse_sleeve(r: _Reader) -> Sleeve:
    s = Sleeve(name=r.text("name"), material=_material(r), on=r.text("on"),
               length_m=r.req("length_m"), outer_diameter_m=r.req("outer_diameter_m"),
               inner_diameter_m=r.req("inner_diameter_m"),
               mass_kg=r.number("mass_kg", False, None, nullable=True))
    if s.inner_diameter_m >= s.outer_diameter_m:
        raise DesignError(r.at("inner_diameter_m"),
                          f"inner diameter {s.inner_diameter_m:g} m must be smaller than the "
                          f"outer diameter {s.outer_diameter_m:g} m")
    return s


def _parse_mount(r: _Reader) -> ClampMount | SleeveMount:
    kind = r.choice("kind", ("clamp", "on_sleeve"))
    on = r.text("on")
    mount: ClampMount | SleeveMount
    if kind == "clamp":
        mount = ClampMount(on=on, centre_m=r.number("centre_m"))  # type: ignore[arg-type]
    else:
        mount = SleeveMount(on=on)
    r.done()
    return mount


_BOB_SIZE_KEYS = {"disc": ("thickness_m",), "lens": ("thickness_m",),
                  "cylinder": ("height_m",), "sphere": ()}


def _parse_bob(r: _Reader) -> Bob:
    name = r.text("name")
    shape = r.choice("shape", BOB_SHAPES)
    mount_reader = r.child("mount")
    assert mount_reader is not None
    sizes = {key: r.req(key) for key in _BOB_SIZE_KEYS[shape]}
    return Bob(name=name, shape=shape, material=_material(r),  # type: ignore[arg-type]
               mount=_parse_mount(mount_reader), diameter_m=r.req("diameter_m"),
               mass_kg=r.number("mass_kg", False, None, nullable=True),
               thickness_m=sizes.get("thickness_m"), height_m=sizes.get("height_m"))


def _parse_weight(r: _Reader) -> Weight:
    return Weight(name=r.text("name"), mass_kg=r.number("mass_kg"),  # type: ignore[arg-type]
                  at_m=r.number("at_m"), on=r.text("on"))  # type: ignore[arg-type]


_PART_PARSERS: dict[str, Callable[[_Reader], Part]] = {
    "rod": _parse_rod, "sleeve": _parse_sleeve, "bob": _parse_bob, "weight": _parse_weight,
}


def _parse_parts(value: Any) -> tuple[Part, ...]:
    if not isinstance(value, list):
        raise DesignError("parts", f"must be a list, not {_kind(value)}")
    if not value:
        raise DesignError("parts", "the pendulum needs at least one part")
    if len(value) > MAX_PARTS:
        raise DesignError("parts", f"has {len(value)} parts; at most {MAX_PARTS} are allowed")
    parts: list[Part] = []
    for i, item in enumerate(value):
        r = _Reader(item, f"parts[{i}]")
        kind = r.choice("kind", tuple(_PART_PARSERS))
        part = _PART_PARSERS[kind](r)
        r.done()
        if not part.name.strip():
            raise DesignError(f"parts[{i}].name", "must not be empty")
        parts.append(part)
    _check_references(tuple(parts))
    return tuple(parts)


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


def design_from_dict(obj: Any) -> Design:
    """Validate a parsed design file (format 1) and return the design.

    Raises
    ------
    DesignError
        For any problem, naming the field.
    """
    try:
        return _design_from_dict(obj)
    except DesignError:
        raise
    except RecursionError:
        raise DesignError("file", "is nested too deeply to be a design") from None
    except Exception as exc:  # a defect here must still reach the user as a field message
        raise DesignError("file", f"could not be read as a design ({type(exc).__name__})") from None


def _design_from_dict(obj: Any) -> Design:
    r = _Reader(obj, "")
    fmt = r.raw("format")
    if fmt != FORMAT:
        raise DesignError("format", f"{fmt!r} is not a Penduline design (expected {FORMAT!r})")
    version = r.raw("version")
    if isinstance(version, bool) or not isinstance(version, int):
        raise DesignError("version", f"must be a whole number, not {_kind(version)}")
    if version > VERSION:
        raise DesignError("version", f"version {version} is newer than this Penduline reads "
                                     f"(up to {VERSION}); update Penduline")
    if version < 1:
        raise DesignError("version", f"version {version} is not a design file version")
    name = r.text("name", False, "Untitled")
    ref = r.number("reference_temperature_c", False, 20.0)
    assert ref is not None
    site_reader = r.child("site")
    assert site_reader is not None
    site = _parse_site(site_reader, ref)
    suspension = _parse_suspension(r.child("suspension", False))
    parts = _parse_parts(r.raw("parts"))
    swing_reader = r.child("swing")
    assert swing_reader is not None
    swing = Swing(amplitude_deg=swing_reader.number("amplitude_deg"),  # type: ignore[arg-type]
                  quality_factor=swing_reader.number("quality_factor", False, None,
                                                     nullable=True))
    swing_reader.done()
    target = _parse_target(r.child("target", False))
    nut_reader = r.child("rating_nut", False)
    nut = RatingNut()
    if nut_reader is not None:
        nut = RatingNut(nut_reader.number("pitch_m", False, None, nullable=True))
        nut_reader.done()
    r.done()
    return Design(name, ref, site, suspension, parts, swing, target, nut)


def _parse_target(r: _Reader | None) -> Target:
    if r is None:
        return Target()
    period = r.number("period_s", False, None, nullable=True)
    bph = r.number("beats_per_hour", False, None, nullable=True)
    r.done()
    if period is not None and bph is not None:
        raise DesignError(r.at("beats_per_hour"),
                          "give the target as period_s or beats_per_hour, not both")
    return Target(period, bph)


# ----------------------------------------------------------------------------- writing

def _part_to_dict(p: Part) -> dict[str, Any]:
    if isinstance(p, Rod):
        return {"kind": "rod", "name": p.name, "material": p.material, "top_m": p.top_m,
                "length_m": p.length_m, "diameter_m": p.diameter_m, "mass_kg": p.mass_kg}
    if isinstance(p, Sleeve):
        return {"kind": "sleeve", "name": p.name, "material": p.material, "on": p.on,
                "length_m": p.length_m, "outer_diameter_m": p.outer_diameter_m,
                "inner_diameter_m": p.inner_diameter_m, "mass_kg": p.mass_kg}
    if isinstance(p, Bob):
        mount: dict[str, Any] = {"kind": p.mount.kind, "on": p.mount.on}
        if isinstance(p.mount, ClampMount):
            mount["centre_m"] = p.mount.centre_m
        d: dict[str, Any] = {"kind": "bob", "name": p.name, "shape": p.shape,
                             "material": p.material, "mount": mount, "diameter_m": p.diameter_m}
        for key in _BOB_SIZE_KEYS[p.shape]:
            d[key] = getattr(p, key)
        d["mass_kg"] = p.mass_kg
        return d
    return {"kind": "weight", "name": p.name, "mass_kg": p.mass_kg, "at_m": p.at_m, "on": p.on}


@guarded("design")
def design_to_dict(design: Design) -> dict[str, Any]:
    """The file form (format 1) of ``design``; every key written, SI units."""
    s = design.site
    d: dict[str, Any] = {
        "format": FORMAT, "version": VERSION, "name": design.name,
        "reference_temperature_c": design.reference_temperature_c,
        "site": {"latitude_deg": s.latitude_deg, "elevation_m": s.elevation_m,
                 "g_m_s2": s.g_m_s2, "temperature_c": s.temperature_c,
                 "pressure_hpa": s.pressure_hpa},
        "suspension": {"kind": design.suspension.kind,
                       "stiffness_n_m_per_rad": design.suspension.stiffness_n_m_per_rad},
        "parts": [_part_to_dict(p) for p in design.parts],
        "swing": {"amplitude_deg": design.swing.amplitude_deg,
                  "quality_factor": design.swing.quality_factor},
    }
    t = design.target
    if t.beats_per_hour is not None:
        d["target"] = {"beats_per_hour": t.beats_per_hour}
    else:
        d["target"] = {"period_s": t.period_s}
    d["rating_nut"] = {"pitch_m": design.rating_nut.pitch_m}
    return d


@guarded("file")
def loads_design(text: str | bytes) -> Design:
    """Parse and validate design-file text."""
    return design_from_dict(_loads_json(text))


def _loads_json(text: str | bytes) -> Any:
    if isinstance(text, bytes):
        if len(text) > MAX_FILE_BYTES:
            raise DesignError("file", f"is {len(text)} bytes; a design file is at most "
                                      f"{MAX_FILE_BYTES} bytes")
        wide = text[:2] in (b"\xff\xfe", b"\xfe\xff") or b"\x00" in text[:200]
        hint = "; it looks like UTF-16 or UTF-32: save it as UTF-8" if wide else ""
        try:
            decoded = text.decode("utf-8-sig")
        except UnicodeDecodeError as exc:
            raise DesignError("file", f"is not UTF-8 text (byte {exc.start}){hint}") from None
        if "\x00" in decoded:
            raise DesignError("file", f"is not UTF-8 text (byte {text.index(0)}){hint}")
        text = decoded
    if len(text) > MAX_FILE_BYTES:
        raise DesignError("file", f"is longer than {MAX_FILE_BYTES} characters")
    if not text.strip():
        raise DesignError("file", "is empty")
    try:
        return json.loads(text, parse_constant=_refuse_constant)
    except DesignError:
        raise
    except RecursionError:
        raise DesignError("file", "is nested too deeply to be a design") from None
    except json.JSONDecodeError as exc:
        raise DesignError("file", f"is not valid JSON (line {exc.lineno}, column {exc.colno}: "
                                  f"{exc.msg})") from None
    except ValueError as exc:
        raise DesignError("file", f"is not valid JSON ({exc})") from None


def _refuse_constant(name: str) -> Any:
    raise DesignError("file", f"contains {name}, which is not a number JSON allows")


def dumps_design(design: Design) -> str:
    """The file text of ``design`` (UTF-8 JSON, two-space indent, newline at the end)."""
    return json.dumps(design_to_dict(design), indent=2, ensure_ascii=False) + "\n"


@guarded("file")
def load_design(path: str | os.PathLike[str]) -> Design:
    """Read and validate a design file; the file is never changed."""
    return loads_design(_read_bytes(path))


@guarded("file")
def read_design_dict(path: str | os.PathLike[str]) -> Any:
    """The raw JSON object of a design file (not validated beyond JSON itself)."""
    return _loads_json(_read_bytes(path))


def _read_bytes(path: str | os.PathLike[str]) -> bytes:
    p = Path(path)
    try:
        info = p.stat()
        if stat.S_ISDIR(info.st_mode):
            raise DesignError("file", f"{p} is a folder, not a design file")
        if not stat.S_ISREG(info.st_mode):
            raise DesignError("file", f"{p} is not a regular file (a pipe or a device)")
        size = info.st_size
        if size > MAX_FILE_BYTES:
            raise DesignError("file", f"{p.name} is {size} bytes; a design file is at most "
                                      f"{MAX_FILE_BYTES} bytes")
        return p.read_bytes()
    except DesignError:
        raise
    except FileNotFoundError:
        raise DesignError("file", f"{p} does not exist") from None
    except IsADirectoryError:
        raise DesignError("file", f"{p} is a folder, not a design file") from None
    except OSError as exc:
        raise DesignError("file", f"{p} cannot be read ({exc.strerror or exc})") from None


@guarded("file")
def save_design(design: Design, path: str | os.PathLike[str]) -> None:
    """Write ``design`` to ``path`` atomically (temporary file, flush, rename)."""
    write_text_atomic(path, dumps_design(design))


@guarded("file")
def write_text_atomic(path: str | os.PathLike[str], text: str) -> None:
    """Write ``text`` (UTF-8) to ``path`` through a temporary file renamed over it.

    Raises
    ------
    DesignError
        ``field='file'`` when the folder cannot be written; the old file is then untouched.
    """
    _atomic_write(path, text)  # the one writer: core.atomic_write


# ----------------------------------------------------------------------------- field paths

_STEP = re.compile(r"([A-Za-z_][A-Za-z0-9_]*)(?:\[(\d+)\])?")


def _steps(path: str) -> list[str | int]:
    steps: list[str | int] = []
    for piece in path.split("."):
        m = _STEP.fullmatch(piece)
        if not m:
            raise DesignError(path, "is not a field path (example: parts[2].mount.centre_m)")
        steps.append(m.group(1))
        if m.group(2) is not None:
            steps.append(int(m.group(2)))
    return steps


@guarded("field")
def get_value(obj: Any, path: str) -> Any:
    """The value at ``path`` in a design dict."""
    cur = obj
    for step in _steps(path):
        try:
            cur = cur[step]
        except (KeyError, IndexError, TypeError):
            raise DesignError(path, "no such field in this design") from None
    return cur


@guarded("field")
def set_in_dict(obj: Any, path: str, value: Any) -> Any:
    """A deep copy of design dict ``obj`` with ``path`` set to ``value`` (the key must exist
    or its parent object must)."""
    new = copy.deepcopy(obj)
    steps = _steps(path)
    cur = new
    for step in steps[:-1]:
        try:
            cur = cur[step]
        except (KeyError, IndexError, TypeError):
            raise DesignError(path, "no such field in this design") from None
    last = steps[-1]
    if isinstance(last, int):
        if not isinstance(cur, list) or not 0 <= last < len(cur):
            raise DesignError(path, "no such field in this design")
    elif not isinstance(cur, dict):
        raise DesignError(path, "no such field in this design")
    cur[last] = value
    return new


@guarded("field")
def with_value(design: Design, path: str, value: Any) -> Design:
    """A new validated design equal to ``design`` but with ``path`` set to ``value``."""
    return design_from_dict(set_in_dict(design_to_dict(design), path, value))
