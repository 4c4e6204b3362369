"""Display units: the metric and inch-pound choices of the window.

The design file and the core stay in SI. Only what a person types and reads is converted, here,
by plain unit factors (no physics): lengths m ↔ in (elevation m ↔ ft), masses kg ↔ lb,
temperatures °C ↔ °F, temperature differences K ↔ °F (a factor, no offset), pressures
hPa ↔ inHg.
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import StrEnum

__all__ = ["UnitSystem", "FieldUnit", "field_unit", "ReadoutUnit", "readout_unit"]

METRES_PER_INCH = 0.0254
METRES_PER_FOOT = 0.3048
KILOGRAMS_PER_POUND = 0.45359237
HPA_PER_INHG = 33.8638866667
NEWTONS_PER_LBF = 4.4482216152605


class UnitSystem(StrEnum):
    """The two unit systems a person may choose for entry and display."""

    METRIC = "metric"
    INCH_POUND = "inch_pound"


@dataclass(frozen=True)
class FieldUnit:
    """How one numeric design field is shown: unit text, scale, offset, decimals and step.

    ``display = si * scale + offset``; ``decimals`` is the most shown after the point (trailing
    zeros are dropped); ``step`` is one arrow-key or wheel step, in display units.
    """

    text: str
    scale: float = 1.0
    offset: float = 0.0
    decimals: int = 6
    step: float = 1.0

    def to_display(self, si: float) -> float:
        """SI value → displayed value."""
        return si * self.scale + self.offset

    def to_si(self, shown: float) -> float:
        """Displayed value → SI value."""
        return (shown - self.offset) / self.scale


_LENGTH = {UnitSystem.METRIC: FieldUnit("m", 1.0, 0.0, 6, 0.001),
           UnitSystem.INCH_POUND: FieldUnit("in", 1.0 / METRES_PER_INCH, 0.0, 5, 0.05)}
_ELEVATION = {UnitSystem.METRIC: FieldUnit("m", 1.0, 0.0, 2, 10.0),
              UnitSystem.INCH_POUND: FieldUnit("ft", 1.0 / METRES_PER_FOOT, 0.0, 1, 25.0)}
_MASS = {UnitSystem.METRIC: FieldUnit("kg", 1.0, 0.0, 6, 0.1),
         UnitSystem.INCH_POUND: FieldUnit("lb", 1.0 / KILOGRAMS_PER_POUND, 0.0, 6, 0.25)}
_TEMPERATURE = {UnitSystem.METRIC: FieldUnit("°C", 1.0, 0.0, 2, 1.0),
                UnitSystem.INCH_POUND: FieldUnit("°F", 1.8, 32.0, 2, 1.0)}
# A temperature difference (a range's half-width, ``*_k``): 1 K = 1 °C = 1.8 °F, no offset.
_TEMPERATURE_DIFFERENCE = {UnitSystem.METRIC: FieldUnit("°C", 1.0, 0.0, 2, 1.0),
                           UnitSystem.INCH_POUND: FieldUnit("°F", 1.8, 0.0, 2, 1.0)}
_PRESSURE = {UnitSystem.METRIC: FieldUnit("hPa", 1.0, 0.0, 2, 1.0),
             UnitSystem.INCH_POUND: FieldUnit("inHg", 1.0 / HPA_PER_INHG, 0.0, 3, 0.05)}

# Fields whose unit is the same in both systems, by the last key of their path.
_FIXED = {
    "latitude_deg": FieldUnit("°", decimals=5, step=1.0),
    "amplitude_deg": FieldUnit("°", decimals=4, step=0.1),
    "arc_deg": FieldUnit("°", decimals=3, step=0.05),
    "g_m_s2": FieldUnit("m/s²", decimals=6, step=0.001),
    "stiffness_n_m_per_rad": FieldUnit("N·m/rad", decimals=6, step=0.01),
    "quality_factor": FieldUnit("", decimals=1, step=100.0),
    "period_s": FieldUnit("s", decimals=9, step=0.001),
    "beats_per_hour": FieldUnit("beats/h", decimals=4, step=1.0),
}

_PITCH = {UnitSystem.METRIC: FieldUnit("m", 1.0, 0.0, 7, 0.0001),
          UnitSystem.INCH_POUND: FieldUnit("in", 1.0 / METRES_PER_INCH, 0.0, 6, 0.001)}


def field_unit(path: str, system: UnitSystem) -> FieldUnit:
    """The display unit of the numeric field at ``path``: a design field (e.g.
    ``parts[0].length_m``) or a readout setting (``budget.temperature_k``)."""
    key = path.rsplit(".", 1)[-1]
    if key in _FIXED:
        return _FIXED[key]
    if key == "elevation_m":
        return _ELEVATION[system]
    if key == "pitch_m":
        return _PITCH[system]
    if key.endswith("_m"):
        return _LENGTH[system]
    if key.endswith("_kg"):
        return _MASS[system]
    if key.endswith("_c"):
        return _TEMPERATURE[system]
    if key.endswith("_k"):
        return _TEMPERATURE_DIFFERENCE[system]
    if key.endswith("_hpa"):
        return _PRESSURE[system]
    return FieldUnit("")


@dataclass(frozen=True)
class ReadoutUnit:
    """A readout figure's unit in the chosen system: ``shown = si * scale + offset``."""

    text: str
    scale: float = 1.0
    offset: float = 0.0

    def convert(self, si: float) -> float:
        """SI value → displayed value."""
        return si * self.scale + self.offset


_INCH_POUND_READOUT = {
    "m": ReadoutUnit("in", 1.0 / METRES_PER_INCH),
    "kg": ReadoutUnit("lb", 1.0 / KILOGRAMS_PER_POUND),
    "kg·m²": ReadoutUnit("lb·in²", 1.0 / (KILOGRAMS_PER_POUND * METRES_PER_INCH**2)),
    "kg/m³": ReadoutUnit("lb/ft³", METRES_PER_FOOT**3 / KILOGRAMS_PER_POUND),
    "m/s": ReadoutUnit("ft/s", 1.0 / METRES_PER_FOOT),
    "N": ReadoutUnit("lbf", 1.0 / NEWTONS_PER_LBF),
    "s/day/K": ReadoutUnit("s/day/°F", 1.0 / 1.8),
    "s/day/hPa": ReadoutUnit("s/day/inHg", HPA_PER_INHG),
    "°C": ReadoutUnit("°F", 1.8, 32.0),
    "hPa": ReadoutUnit("inHg", 1.0 / HPA_PER_INHG),
}


def readout_unit(unit: str, system: UnitSystem) -> ReadoutUnit:
    """How a readout figure given in SI ``unit`` is shown in ``system``."""
    if system is UnitSystem.INCH_POUND and unit in _INCH_POUND_READOUT:
        return _INCH_POUND_READOUT[unit]
    return ReadoutUnit(unit)
