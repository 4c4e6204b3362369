"""Every field of a design file in one table: label, unit kind, allowed range, default, help.

The validator (:mod:`core.fileformat`), the writer, the solver's search window, the form, unit
conversion, messages, the PDF, CSV headers and sweeps all read this table; adding a field means
adding its row here (and its physics), nothing else.

A field is addressed by a :class:`FieldPath` (``parts[1].mount.centre_m``). Its *pattern* replaces
list indices by the part kind (``parts[rod].length_m``) or by ``[]`` where every kind means the
same (``parts[].mass_kg``), and user-material keys by ``*`` (``materials.*.density_kg_m3``).

Ranges come from physical sense and keep every division finite: a target of 0.05–100 s
(72–144 000 beats per hour) covers everything from a toy to a tall exhibit pendulum; latitude is
a latitude; a suspension stiffness of 1e6 N·m/rad is far stiffer than any spring a pendulum
hangs from. Ranges are closed unless marked open (a pitch of 0 is no thread).
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

from .constants import BEATS_PER_PERIOD, SECONDS_PER_HOUR

__all__ = ["FieldSpec", "FieldPath", "FIELDS", "UNIT_KINDS", "CHOICES", "field_spec",
           "choice_label", "range_text", "spec_pattern", "PART_KINDS"]

UNIT_KINDS = ("length", "small_length", "mass", "angle", "temperature", "pressure", "stiffness",
              "gravity", "period", "frequency", "quality", "density", "expansion", "modulus",
              "count", "seconds", "time", "text", "choice", "section")
PART_KINDS = ("rod", "sleeve", "bob", "weight")

_SHORTEST_PERIOD_S = 0.05  # a target shorter than this is no pendulum clock (common practice)
_LONGEST_PERIOD_S = 100.0  # a 2.5 km pendulum: longer than any built (plain geometry)


@dataclass(frozen=True)
class FieldSpec:
    """What one design field is.

    Attributes
    ----------
    pattern : str
        Where it is, e.g. ``site.latitude_deg``, ``parts[rod].length_m``.
    key : str
        The last key of the path (``length_m``).
    label : str
        The trade's words for it, for forms, reports and messages.
    unit : str
        The unit kind, one of :data:`UNIT_KINDS` (``small_length`` shows in mm in metric).
    low, high : float or None
        The allowed range (None for fields that are not numbers).
    low_open, high_open : bool
        Whether the range excludes its ends.
    default : Any
        The value an optional field takes when absent (None: none, or required).
    help : str
        One sentence on what the field means.
    """

    pattern: str
    key: str
    label: str
    unit: str
    low: float | None = None
    high: float | None = None
    low_open: bool = False
    high_open: bool = False
    default: Any = None
    help: str = ""

    @property
    def numeric(self) -> bool:
        """True for a field holding a number."""
        return self.low is not None

    def contains(self, x: float) -> bool:
        """Whether ``x`` lies in the allowed range."""
        assert self.low is not None and self.high is not None
        if x < self.low or x > self.high:
            return False
        return not ((self.low_open and x == self.low) or (self.high_open and x == self.high))


_STEP = re.compile(r"([A-Za-z_][A-Za-z0-9_]*)(?:\[(\d+)\])?")


@lru_cache(maxsize=4096)  # a design has a few hundred paths; the form reads them on each edit
def _parsed_steps(text: str) -> tuple[str | int, ...]:
    steps: list[str | int] = []
    for piece in text.split("."):
        m = _STEP.fullmatch(piece)
        if not m:
            raise ValueError(f"{text!r} is not a field path (example: parts[2].mount.centre_m)")
        steps.append(m.group(1))
        if m.group(2) is not None:
            steps.append(int(m.group(2)))
    return tuple(steps)


@dataclass(frozen=True)
class FieldPath:
    """A path to a value in a design file: ``parts[1].mount.centre_m``.

    ``steps`` holds keys (str) and list indices (int) in order.
    """

    steps: tuple[str | int, ...]

    @classmethod
    def parse(cls, text: str) -> FieldPath:
        """Parse ``text``; raises ``ValueError`` when it is not a field path."""
        if not isinstance(text, str):
            raise TypeError(f"a field path is text, not {type(text).__name__}")
        return cls(_parsed_steps(text))

    @property
    def key(self) -> str:
        """The last key (``centre_m`` for ``parts[1].mount.centre_m``)."""
        for step in reversed(self.steps):
            if isinstance(step, str):
                return step
        return ""

    @property
    def part_index(self) -> int | None:
        """The part index for a path into ``parts``, else None."""
        if len(self.steps) > 1 and self.steps[0] == "parts" and isinstance(self.steps[1], int):
            return self.steps[1]
        return None

    def __str__(self) -> str:
        out = ""
        for step in self.steps:
            if isinstance(step, int):
                out += f"[{step}]"
            else:
                out += f".{step}" if out else step
        return out


def spec_pattern(path: FieldPath, kind: str | None = None) -> str:
    """The table pattern of ``path``: indices become ``[kind]`` (or ``[]``), user-material keys
    ``*``."""
    out = ""
    steps = path.steps
    for i, step in enumerate(steps):
        if isinstance(step, int):
            out += f"[{kind or ''}]"
        elif i == 1 and steps[0] == "materials":
            out += ".*"
        else:
            out += f".{step}" if out else step
    return out


def _f(pattern: str, label: str, unit: str, low: float | None = None,
       high: float | None = None, low_open: bool = False, high_open: bool = False,
       default: Any = None, help: str = "") -> FieldSpec:
    return FieldSpec(pattern, pattern.rsplit(".", 1)[-1].split("[")[0], label, unit, low, high,
                     low_open, high_open, default, help)


_POS = (-1000.0, 1000.0)  # m below the pivot: a position anywhere on a tall exhibit pendulum
_SMALL = (1e-5, 10.0)  # m: diameters and thicknesses from a hair to a wrecking ball


def _part_common(kind: str, name_help: str) -> tuple[FieldSpec, ...]:
    return (
        _f(f"parts[{kind}].kind", "Part", "choice", help="What the part is."),
        _f(f"parts[{kind}].name", "Name", "text", help=name_help),
    )


def _material(kind: str) -> FieldSpec:
    return _f(f"parts[{kind}].material", "Material", "choice",
              help="What it is made of: sets its density and how it grows with temperature.")


def _mass(kind: str) -> FieldSpec:
    return _f(f"parts[{kind}].mass_kg", "Mass", "mass", 1e-6, 1e6,
              help="The weighed mass; when left empty it is density × volume.")


FIELDS: tuple[FieldSpec, ...] = (
    _f("format", "Format", "text", default="penduline-design",
       help="Marks the file as a Penduline design."),
    _f("version", "Format version", "count", default=2,
       help="The file format's version; this Penduline reads 1 and 2 and writes 2."),
    _f("name", "Name", "text", default="Untitled", help="What the design is called."),
    _f("purpose", "Purpose", "choice", default="clock",
       help="A clock puts timekeeping first; an exhibit puts visitor figures and cautions first."),
    _f("reference_temperature_c", "Reference temperature", "temperature", -80.0, 100.0,
       default=20.0, help="The temperature at which the lengths and positions are given."),
    _f("site", "Site", "section", help="Where the pendulum swings and in what air."),
    _f("site.latitude_deg", "Latitude", "angle", -90.0, 90.0,
       help="Geodetic latitude of the site, north positive; sets normal gravity."),
    _f("site.elevation_m", "Elevation", "length", -500.0, 9000.0, default=0.0,
       help="Height above the WGS84 ellipsoid; normal gravity can differ from true local g by "
            "up to a few s/day, so give a measured g for precision work."),
    _f("site.g_m_s2", "Local gravity", "gravity", 1.0, 30.0,
       help="A measured local g, used instead of normal gravity from latitude and elevation."),
    _f("site.temperature_c", "Temperature", "temperature", -80.0, 100.0,
       help="The air temperature where the pendulum swings (default: the reference)."),
    _f("site.pressure_hpa", "Air pressure", "pressure", 0.0, 1200.0, default=1013.25,
       help="Barometric pressure at the pendulum; 0 means it swings in vacuum."),
    _f("suspension", "Suspension", "section", help="How the pendulum hangs from its pivot."),
    _f("suspension.kind", "Suspension", "choice", default="knife_edge",
       help="A knife edge is an ideal hinge; a suspension spring adds a restoring torque."),
    _f("suspension.stiffness_n_m_per_rad", "Spring stiffness", "stiffness", 0.0, 1.0e6,
       default=0.0, help="Restoring torque of the suspension spring per radian of swing."),
    _f("suspension.blades", "Spring blades", "section",
       help="The suspension spring given by its blades instead of a stiffness."),
    _f("suspension.blades.count", "Number of blades", "count", 1.0, 8.0, default=2,
       help="How many blades side by side carry the pendulum."),
    _f("suspension.blades.material", "Blade material", "choice", default="steel",
       help="What the blades are made of: sets their Young's modulus."),
    _f("suspension.blades.width_m", "Blade width", "small_length", 1e-4, 0.2,
       help="Width of one blade, across the plane of swing."),
    _f("suspension.blades.thickness_m", "Blade thickness", "small_length", 1e-6, 0.005,
       help="Thickness of one blade, in the plane of swing."),
    _f("suspension.blades.free_length_m", "Blade free length", "small_length", 1e-4, 0.1,
       help="Length of blade free to bend between the chops."),
    _f("parts", "Parts", "section", help="Everything that swings."),
    *_part_common("rod", "The rod's name, by which other parts refer to it."),
    _material("rod"),
    _f("parts[rod].top_m", "Top", "length", *_POS, default=0.0,
       help="Where the rod's top hangs, down from the pivot axis."),
    _f("parts[rod].hangs_from", "Hangs from", "section",
       help="The rod hangs from an end of another rod or sleeve instead of from the pivot."),
    _f("parts[rod].hangs_from.part", "Hangs from part", "text",
       help="The rod or sleeve whose end carries this rod."),
    _f("parts[rod].hangs_from.end", "Hangs from end", "choice", default="lower",
       help="Which end of that part carries this rod's top."),
    _f("parts[rod].length_m", "Rod length", "length", 1e-4, 1000.0,
       help="Length of the rod from its top to its lower end."),
    _f("parts[rod].diameter_m", "Rod diameter", "small_length", *_SMALL,
       help="Diameter of the round rod."),
    _mass("rod"),
    *_part_common("sleeve", "The sleeve's name, by which a bob refers to it."),
    _material("sleeve"),
    _f("parts[sleeve].on", "Stands on rod", "text",
       help="The rod on whose lower end the sleeve stands."),
    _f("parts[sleeve].length_m", "Sleeve length", "small_length", 1e-4, 1000.0,
       help="Length of the tube, standing up from the rod's lower end."),
    _f("parts[sleeve].outer_diameter_m", "Outer diameter", "small_length", *_SMALL,
       help="Outside diameter of the tube."),
    _f("parts[sleeve].inner_diameter_m", "Inner diameter", "small_length", *_SMALL,
       help="Bore of the tube; it must clear the rod."),
    _mass("sleeve"),
    *_part_common("bob", "The bob's name."),
    _material("bob"),
    _f("parts[bob].shape", "Shape", "choice",
       help="Disc or lens (faces parallel to the swing), cylinder (axis along the rod) or "
            "sphere."),
    _f("parts[bob].mount", "Mount", "section", help="How the bob is held."),
    _f("parts[bob].mount.kind", "Mount", "choice",
       help="Clamped to a rod at a set height, or resting on the top of a sleeve."),
    _f("parts[bob].mount.on", "Mounted on", "text", help="The rod or sleeve holding the bob."),
    _f("parts[bob].mount.centre_m", "Bob centre", "length", *_POS,
       help="Where the bob's centre is clamped, down from the pivot axis."),
    _f("parts[bob].diameter_m", "Bob diameter", "small_length", *_SMALL,
       help="Diameter of the bob (its outline in the plane of swing)."),
    _f("parts[bob].thickness_m", "Bob thickness", "small_length", *_SMALL,
       help="Thickness of a disc or lens bob, across the plane of swing."),
    _f("parts[bob].height_m", "Bob height", "small_length", 1e-5, 100.0,
       help="Height of a cylinder bob along the rod."),
    _f("parts[bob].support", "Rests on", "choice", default="bottom",
       help="Where a bob on a sleeve rests: on its bottom, or at its centre."),
    _f("parts[bob].hole_diameter_m", "Hole diameter", "small_length", *_SMALL,
       help="Diameter of a central hole along the rod through the bob."),
    _mass("bob"),
    *_part_common("weight", "The trim weight's name."),
    _f("parts[weight].mass_kg", "Trim mass", "mass", 1e-6, 1e6,
       help="Mass of the trim weight, taken as a point."),
    _f("parts[weight].at_m", "Position", "length", *_POS,
       help="Where the trim weight sits, down from the pivot axis."),
    _f("parts[weight].on", "Carried by rod", "text", help="The rod that carries the weight."),
    _f("swing", "Swing", "section", help="How far it swings and how fast it loses its swing."),
    _f("swing.amplitude_deg", "Semi-arc", "angle", 1e-6, 179.9,
       help="The working semi-arc: the angle from the vertical to one end of the swing."),
    _f("swing.quality_factor", "Quality factor", "quality", 1.0, 1.0e9,
       help="Q: 2π × energy stored / energy lost per period; empty for no damping."),
    _f("target", "Target", "section", help="What the clock should beat."),
    _f("target.period_s", "Target period", "period", _SHORTEST_PERIOD_S, _LONGEST_PERIOD_S,
       help="The full period (there and back) the clock should keep."),
    _f("target.beats_per_hour", "Target beats per hour", "frequency",
       BEATS_PER_PERIOD * SECONDS_PER_HOUR / _LONGEST_PERIOD_S,
       BEATS_PER_PERIOD * SECONDS_PER_HOUR / _SHORTEST_PERIOD_S,
       help="The train's count: beats per hour, two beats a full period."),
    _f("rating_nut", "Rating nut", "section", help="The nut under the bob that sets the rate."),
    _f("rating_nut.pitch_m", "Thread pitch", "small_length", 0.0, 0.01, low_open=True,
       help="How far one turn of the rating nut moves the bob."),
    _f("exhibit", "Exhibit", "section", help="Where the floor and the visitors are."),
    _f("exhibit.pivot_above_floor_m", "Pivot above floor", "length", 0.0, 1000.0,
       low_open=True, help="Height of the pivot axis above the floor, for clearance figures."),
    _f("exhibit.barrier_radius_m", "Barrier radius", "length", 0.0, 1000.0, low_open=True,
       help="Distance from the point under the pivot to the visitors' barrier."),
    _f("materials", "Your materials", "section",
       help="Your own materials, used by key like the built-in ones."),
    _f("materials.*", "Your material", "section",
       help="One material of your own: its key is how parts name it."),
    _f("materials.*.name", "Material name", "text", help="The material's name as shown."),
    _f("materials.*.density_kg_m3", "Density", "density", 10.0, 25000.0,
       help="Density, from light woods to the densest metals."),
    _f("materials.*.expansion_per_k", "Expansion coefficient", "expansion", -5e-5, 5e-4,
       help="Linear thermal expansion per kelvin (negative for a few composites)."),
    _f("materials.*.youngs_modulus_pa", "Young's modulus", "modulus", 1e6, 1.2e12,
       help="Stiffness of the material in tension, for spring blades and stretch."),
    _f("materials.*.source", "Source", "text",
       help="Where the values come from (a handbook, a data sheet, your own measurement)."),
    _f("rating_log", "Rating log", "section",
       help="The clock's observed errors against a time reference, its adjustments and decay."),
    _f("rating_log.readings", "Readings", "section", help="Comparisons with a time reference."),
    _f("rating_log.readings[].at", "Time", "time",
       help="When the clock was compared, ISO 8601 with its offset (2027-03-01T08:00+01:00)."),
    _f("rating_log.readings[].error_s", "Clock error", "seconds", -1.0e7, 1.0e7,
       help="Clock reading minus true time; positive when the clock is ahead."),
    _f("rating_log.readings[].temperature_c", "Room temperature", "temperature", -80.0, 100.0,
       help="The temperature at the pendulum when the reading was taken (optional)."),
    _f("rating_log.readings[].pressure_hpa", "Air pressure", "pressure", 0.0, 1200.0,
       help="The barometer reading when the reading was taken (optional)."),
    _f("rating_log.readings[].semi_arc_deg", "Semi-arc", "angle", 0.0, 179.9, low_open=True,
       help="The semi-arc seen on the degree plate when the reading was taken (optional)."),
    _f("rating_log.readings[].note", "Note", "text", default="", help="Anything worth noting."),
    _f("rating_log.adjustments", "Adjustments", "section",
       help="What was changed; each one starts a new segment of the log."),
    _f("rating_log.adjustments[].at", "Time", "time", help="When the change was made."),
    _f("rating_log.adjustments[].what", "Change", "choice",
       help="Rating nut (turns, positive up), trim (grams added), bob (mm lowered), set "
            "(the clock's hands were set) or other."),
    _f("rating_log.adjustments[].amount", "Amount", "count", -1.0e6, 1.0e6,
       help="Turns of the nut, grams of trim, mm of bob or seconds set, by the change."),
    _f("rating_log.adjustments[].note", "Note", "text", default="", help="Anything worth noting."),
    _f("rating_log.decay", "Decay readings", "section",
       help="Semi-arcs read with the drive removed, for the quality factor."),
    _f("rating_log.decay[].elapsed_s", "Elapsed time", "seconds", 0.0, 1.0e9,
       help="Time since the drive was removed."),
    _f("rating_log.decay[].semi_arc_deg", "Semi-arc", "angle", 0.0, 179.9, low_open=True,
       help="The semi-arc at that time."),
)

_BY_PATTERN: dict[str, FieldSpec] = {s.pattern: s for s in FIELDS}

CHOICES: dict[str, dict[str, str]] = {
    "purpose": {"clock": "Clock", "exhibit": "Exhibit"},
    "suspension": {"knife_edge": "Knife edge", "spring": "Suspension spring"},
    "part": {"rod": "Rod", "sleeve": "Sleeve", "bob": "Bob", "weight": "Trim weight"},
    "shape": {"disc": "Disc", "lens": "Lens", "cylinder": "Cylinder", "sphere": "Sphere"},
    "mount": {"clamp": "Clamped to a rod", "on_sleeve": "Resting on a sleeve"},
    "support": {"bottom": "On its bottom", "centre": "At its centre"},
    "end": {"lower": "Lower end", "upper": "Upper end"},
    "target": {"period": "Period", "beats_per_hour": "Beats per hour", "none": "No target"},
    "material": {"steel": "Steel", "brass": "Brass", "invar": "Invar",
                 "aluminium": "Aluminium", "lead": "Lead", "cast_iron": "Cast iron",
                 "wood": "Wood", "fused_silica": "Fused silica", "zinc": "Zinc",
                 "copper": "Copper", "tin": "Tin", "stainless_steel": "Stainless steel",
                 "music_wire": "Music wire", "spring_steel": "Spring steel"},
}


def choice_label(group: str, value: str) -> str:
    """Display words for a choice value: ``choice_label("material", "cast_iron")`` is
    ``"Cast iron"``. An unknown value (a user's material) shows as its key in plain words."""
    known = CHOICES.get(group, {})
    if value in known:
        return known[value]
    words = str(value).replace("_", " ").strip()
    return words[:1].upper() + words[1:]


def field_spec(path: str | FieldPath, kind: str | None = None) -> FieldSpec:
    """The table row for ``path``.

    Parameters
    ----------
    path : str or FieldPath
        A concrete path (``parts[1].length_m``) or a pattern (``parts[rod].length_m``).
    kind : str, optional
        The kind of the part a ``parts[i]`` path points into. Without it, a part field shared
        by several kinds answers with the first kind's row (their ranges are the same).

    Raises
    ------
    KeyError
        When the path names no field of a design.
    """
    text = str(path)
    if text in _BY_PATTERN:
        return _BY_PATTERN[text]
    fp = path if isinstance(path, FieldPath) else FieldPath.parse(text)
    if fp.part_index is None:
        spec = _BY_PATTERN.get(spec_pattern(fp))
        if spec is None:
            raise KeyError(text)
        return spec
    for k in ((kind,) if kind else PART_KINDS):
        spec = _BY_PATTERN.get(spec_pattern(fp, k))
        if spec is not None:
            return spec
    raise KeyError(text)


def range_text(spec: FieldSpec, factor: float = 1.0, unit: str = "") -> str:
    """The range in interval notation, ``[0.0001, 1000]`` or with ``factor`` and ``unit``
    applied (``[0.1, 1e+06] mm``)."""
    assert spec.low is not None and spec.high is not None
    lo, hi = spec.low * factor, spec.high * factor
    text = f"{'(' if spec.low_open else '['}{lo:g}, {hi:g}{')' if spec.high_open else ']'}"
    return f"{text} {unit}" if unit else text
