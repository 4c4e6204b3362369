"""The design: an immutable description of one pendulum, its site and its swing.

All lengths in metres, masses in kilograms, angles in degrees, temperatures in °C, pressures in
hPa. Positions are distances *down* from the pivot axis at the reference temperature. A design is
made by :func:`core.fileformat.design_from_dict` (which validates it); editing makes a new one
(:func:`core.fileformat.with_value`).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Literal

from .constants import BEATS_PER_PERIOD, SECONDS_PER_HOUR
from .materials import MATERIALS, Material
from .rating_log import RatingLog

__all__ = [
    "Site", "Suspension", "Rod", "Sleeve", "ClampMount", "SleeveMount", "Bob", "Weight",
    "Swing", "Target", "RatingNut", "Design", "Part", "BOB_SHAPES", "beats_per_hour",
    "period_from_beats_per_hour", "Blades", "HangsFrom", "ExhibitSite", "PURPOSES",
]

BOB_SHAPES = ("disc", "lens", "cylinder", "sphere")
PURPOSES = ("clock", "exhibit")
_BEAT_SECONDS_PER_HOUR = BEATS_PER_PERIOD * SECONDS_PER_HOUR  # 7200


def beats_per_hour(period_s: float) -> float:
    """Beats per hour of a full period (s): two beats a period, 7200 / T."""
    return _BEAT_SECONDS_PER_HOUR / period_s


def period_from_beats_per_hour(beats: float) -> float:
    """Full period, s, of a pendulum beating ``beats`` times an hour."""
    return _BEAT_SECONDS_PER_HOUR / beats


@dataclass(frozen=True)
class Site:
    """Where and in what air the pendulum swings."""

    latitude_deg: float
    elevation_m: float = 0.0
    g_m_s2: float | None = None
    temperature_c: float = 20.0
    pressure_hpa: float = 1013.25


@dataclass(frozen=True)
class Blades:
    """A suspension spring given by its blades (format 2); lengths in m.

    ``count`` blades side by side, each ``width_m`` wide, ``thickness_m`` thick, bending over
    ``free_length_m`` between the chops, of material ``material``.
    """

    count: int
    material: str
    width_m: float
    thickness_m: float
    free_length_m: float


@dataclass(frozen=True)
class Suspension:
    """``knife_edge`` (ideal hinge) or ``spring`` (restoring torque stiffness·θ, N·m/rad).

    A spring may be given by its ``blades`` (format 2); ``stiffness_n_m_per_rad`` is then 0 here,
    the file keeps it null, and the model derives the stiffness from the blades under the
    pendulum's weight (:func:`core.model.suspension_stiffness`).
    """

    kind: Literal["knife_edge", "spring"] = "knife_edge"
    stiffness_n_m_per_rad: float = 0.0
    blades: Blades | None = None


@dataclass(frozen=True)
class HangsFrom:
    """Where a rod hangs when not from the pivot: the ``end`` of rod or sleeve ``part``."""

    part: str
    end: Literal["lower", "upper"] = "lower"


@dataclass(frozen=True)
class Rod:
    """A round uniform rod hanging from ``top_m`` below the pivot.

    When the rod ``hangs_from`` the end of another rod or sleeve (format 2), ``top_m`` is where
    that end is at the reference temperature, worked out when the design is read; how the top
    follows that end as temperatures change belongs to the mount-chain physics in
    :mod:`core.mass_properties`.
    """

    name: str
    material: str
    top_m: float
    length_m: float
    diameter_m: float
    mass_kg: float | None = None
    kind: Literal["rod"] = "rod"
    hangs_from: HangsFrom | None = None


@dataclass(frozen=True)
class Sleeve:
    """A tube standing on the lower end of rod ``on``; a bob may rest on its top."""

    name: str
    material: str
    on: str
    length_m: float
    outer_diameter_m: float
    inner_diameter_m: float
    mass_kg: float | None = None
    kind: Literal["sleeve"] = "sleeve"


@dataclass(frozen=True)
class ClampMount:
    """Bob centre fixed to rod ``on`` at ``centre_m`` below the pivot."""

    on: str
    centre_m: float
    kind: Literal["clamp"] = "clamp"


@dataclass(frozen=True)
class SleeveMount:
    """Bob resting on the top of sleeve ``on``."""

    on: str
    kind: Literal["on_sleeve"] = "on_sleeve"


@dataclass(frozen=True)
class Bob:
    """The bob: ``disc`` and ``lens`` use diameter and thickness, ``cylinder`` diameter and
    height, ``sphere`` diameter only."""

    name: str
    shape: Literal["disc", "lens", "cylinder", "sphere"]
    material: str
    mount: ClampMount | SleeveMount
    diameter_m: float
    thickness_m: float | None = None
    height_m: float | None = None
    mass_kg: float | None = None
    kind: Literal["bob"] = "bob"
    support: Literal["bottom", "centre"] = "bottom"
    hole_diameter_m: float | None = None

    @property
    def half_height_m(self) -> float:
        """Half the bob's vertical extent at the reference temperature, m."""
        if self.shape == "cylinder":
            assert self.height_m is not None
            return self.height_m / 2.0
        return self.diameter_m / 2.0


@dataclass(frozen=True)
class Weight:
    """A point mass (trim weight) at ``at_m`` below the pivot, carried by rod ``on``."""

    name: str
    mass_kg: float
    at_m: float
    on: str
    kind: Literal["weight"] = "weight"


Part = Rod | Sleeve | Bob | Weight


@dataclass(frozen=True)
class Swing:
    """Working semi-arc (degrees) and quality factor (None: no damping)."""

    amplitude_deg: float
    quality_factor: float | None = None


@dataclass(frozen=True)
class Target:
    """What the clock should beat: a period (s) or beats per hour; both None: no target."""

    period_s: float | None = None
    beats_per_hour: float | None = None

    @property
    def target_period_s(self) -> float | None:
        """The target full period, s, whichever way it was given."""
        if self.period_s is not None:
            return self.period_s
        if self.beats_per_hour is not None:
            return period_from_beats_per_hour(self.beats_per_hour)
        return None


@dataclass(frozen=True)
class RatingNut:
    """Thread pitch of the rating nut, m per turn (None: no nut)."""

    pitch_m: float | None = None


@dataclass(frozen=True)
class ExhibitSite:
    """Where the floor and the visitors are (format 2), m; None where not given."""

    pivot_above_floor_m: float | None = None
    barrier_radius_m: float | None = None


@dataclass(frozen=True)
class Design:
    """One pendulum design (see DESIGN §3 and §8 for the file form).

    Every field after ``swing`` is optional with a default, so an optional file section is
    added as one more defaulted field here plus its reader and writer in
    :data:`core.validate.SECTIONS`.
    """

    name: str
    reference_temperature_c: float
    site: Site
    suspension: Suspension
    parts: tuple[Part, ...]
    swing: Swing
    target: Target = Target()
    rating_nut: RatingNut = RatingNut()
    purpose: Literal["clock", "exhibit"] = "clock"
    exhibit: ExhibitSite | None = None
    materials: tuple[Material, ...] = ()
    rating_log: RatingLog | None = None

    def material(self, key: str) -> Material:
        """The material called ``key``: one of the user's, else a built-in one (``KeyError``
        when neither)."""
        for m in self.materials:
            if m.key == key:
                return m
        return MATERIALS[key]

    def part(self, name: str) -> Part:
        """The part called ``name`` (``KeyError`` when absent)."""
        for p in self.parts:
            if p.name == name:
                return p
        raise KeyError(name)
