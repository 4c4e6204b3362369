"""Display units: the metric and inch-pound choices of the window.

The design file and the core stay in SI, and what each field *is* (its unit kind, range, label
and help) lives in the core's field table (:mod:`core.fields`). Only the presentation is here:
for each unit kind, the unit shown and the factor in each unit system, by plain unit factors (no
physics). Lengths m ↔ in (site heights m ↔ ft), small lengths mm ↔ in (a thread pitch in threads
per inch), masses kg ↔ lb, temperatures °C ↔ °F, temperature differences K ↔ °F (a factor, no
offset), pressures hPa ↔ inHg.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from enum import StrEnum

from core.fields import field_spec

__all__ = ["UnitSystem", "FieldUnit", "field_unit", "kind_unit", "ReadoutUnit", "readout_unit",
           "format_sig", "quantity_text", "figure_text", "METRES_PER_INCH", "METRES_PER_FOOT",
           "KILOGRAMS_PER_POUND", "NM_PER_LBF_IN"]

METRES_PER_INCH = 0.0254
METRES_PER_FOOT = 0.3048
KILOGRAMS_PER_POUND = 0.45359237
HPA_PER_INHG = 33.8638866667
NEWTONS_PER_LBF = 4.4482216152605
NM_PER_LBF_IN = NEWTONS_PER_LBF * METRES_PER_INCH
PA_PER_PSI = NEWTONS_PER_LBF / METRES_PER_INCH**2


class UnitSystem(StrEnum):
    """The two unit systems a person may choose for entry and display."""

    METRIC = "metric"
    INCH_POUND = "inch_pound"


@dataclass(frozen=True)
class FieldUnit:
    """How one numeric field is shown: unit text, scale, offset, decimals and step.

    ``display = si * scale + offset`` (or ``scale / si`` when ``reciprocal``, for threads per
    inch); ``decimals`` is the most shown after the point (trailing zeros are dropped);
    ``step`` is one arrow-key or wheel step, in display units.
    """

    text: str
    scale: float = 1.0
    offset: float = 0.0
    decimals: int = 6
    step: float = 1.0
    reciprocal: bool = False

    def to_display(self, si: float) -> float:
        """SI value → displayed value."""
        if self.reciprocal:
            return self.scale / si if si else math.inf
        return si * self.scale + self.offset

    def to_si(self, shown: float) -> float:
        """Displayed value → SI value."""
        if self.reciprocal:
            return self.scale / shown if shown else math.inf
        return (shown - self.offset) / self.scale


M, IP = UnitSystem.METRIC, UnitSystem.INCH_POUND
_Pair = dict[UnitSystem, FieldUnit]

# Unit kind (core.fields.UNIT_KINDS) → display unit in each system.
_KINDS: dict[str, _Pair] = {
    "length": {M: FieldUnit("m", 1.0, 0.0, 6, 0.001),
               IP: FieldUnit("in", 1.0 / METRES_PER_INCH, 0.0, 5, 0.05)},
    "small_length": {M: FieldUnit("mm", 1000.0, 0.0, 4, 0.1),
                     IP: FieldUnit("in", 1.0 / METRES_PER_INCH, 0.0, 5, 0.01)},
    "mass": {M: FieldUnit("kg", 1.0, 0.0, 6, 0.1),
             IP: FieldUnit("lb", 1.0 / KILOGRAMS_PER_POUND, 0.0, 6, 0.25)},
    "angle": {M: FieldUnit("°", decimals=5, step=0.1), IP: FieldUnit("°", decimals=5, step=0.1)},
    "temperature": {M: FieldUnit("°C", 1.0, 0.0, 2, 1.0), IP: FieldUnit("°F", 1.8, 32.0, 2, 1.0)},
    "temperature_difference": {M: FieldUnit("°C", 1.0, 0.0, 2, 1.0),
                               IP: FieldUnit("°F", 1.8, 0.0, 2, 1.0)},
    "pressure": {M: FieldUnit("hPa", 1.0, 0.0, 2, 1.0),
                 IP: FieldUnit("inHg", 1.0 / HPA_PER_INHG, 0.0, 3, 0.05)},
    "stiffness": {M: FieldUnit("N·m/rad", decimals=6, step=0.01),
                  IP: FieldUnit("lbf·in/rad", 1.0 / NM_PER_LBF_IN, 0.0, 6, 0.1)},
    "gravity": {M: FieldUnit("m/s²", decimals=6, step=0.001),
                IP: FieldUnit("ft/s²", 1.0 / METRES_PER_FOOT, 0.0, 5, 0.01)},
    "period": {M: FieldUnit("s", decimals=9, step=0.001), IP: FieldUnit("s", decimals=9,
                                                                        step=0.001)},
    "frequency": {M: FieldUnit("beats/h", decimals=4), IP: FieldUnit("beats/h", decimals=4)},
    "quality": {M: FieldUnit("", decimals=1, step=100.0), IP: FieldUnit("", decimals=1,
                                                                        step=100.0)},
    "density": {M: FieldUnit("kg/m³", decimals=2, step=10.0),
                IP: FieldUnit("lb/ft³", METRES_PER_FOOT**3 / KILOGRAMS_PER_POUND, 0.0, 3, 1.0)},
    "expansion": {M: FieldUnit("/K", decimals=9, step=1e-6),
                  IP: FieldUnit("/°F", 1.0 / 1.8, 0.0, 9, 1e-6)},
    "modulus": {M: FieldUnit("GPa", 1e-9, 0.0, 3, 1.0),
                IP: FieldUnit("Mpsi", 1e-6 / PA_PER_PSI, 0.0, 4, 0.1)},
    "seconds": {M: FieldUnit("s", decimals=3), IP: FieldUnit("s", decimals=3)},
}
_PLAIN = FieldUnit("", decimals=6)

# Presentation choices by path: a site height in feet, a thread pitch in threads per inch.
_BY_PATTERN: dict[str, _Pair] = {
    "site.elevation_m": {M: FieldUnit("m", 1.0, 0.0, 2, 10.0),
                         IP: FieldUnit("ft", 1.0 / METRES_PER_FOOT, 0.0, 1, 25.0)},
    "rating_nut.pitch_m": {M: FieldUnit("mm", 1000.0, 0.0, 4, 0.05),
                           IP: FieldUnit("threads/in", METRES_PER_INCH, 0.0, 3, 1.0,
                                         reciprocal=True)},
    "swing.amplitude_deg": {M: FieldUnit("°", decimals=4, step=0.1),
                            IP: FieldUnit("°", decimals=4, step=0.1)},
    "site.latitude_deg": {M: FieldUnit("°", decimals=5, step=1.0),
                          IP: FieldUnit("°", decimals=5, step=1.0)},
}

# The window's own settings (not design fields): the readout's entries.
_SETTINGS: dict[str, str] = {
    "trim_height_m": "position", "budget.temperature_k": "temperature_difference",
    "budget.pressure_hpa": "pressure", "budget.arc_deg": "arc",
}
_SETTING_UNITS: dict[str, _Pair] = {
    # A quoting height needs 0.1 mm, not the float's last digit (0.499998 for a 0.5 m tray).
    "position": {M: FieldUnit("m", 1.0, 0.0, 4, 0.001),
                 IP: FieldUnit("in", 1.0 / METRES_PER_INCH, 0.0, 3, 0.05)},
    "arc": {M: FieldUnit("°", decimals=3, step=0.05), IP: FieldUnit("°", decimals=3,
                                                                    step=0.05)},
}


def kind_unit(kind: str, system: UnitSystem) -> FieldUnit:
    """The display unit of a unit kind (``core.fields.UNIT_KINDS``) in ``system``."""
    pair = _KINDS.get(kind) or _SETTING_UNITS.get(kind)
    return pair[system] if pair else _PLAIN


def field_unit(path: str, system: UnitSystem) -> FieldUnit:
    """The display unit of the numeric field at ``path``: a design field (e.g.
    ``parts[0].length_m``, its unit kind from the core's field table) or a readout setting
    (``budget.temperature_k``, ``trim_height_m``)."""
    if path in _SETTINGS:
        return kind_unit(_SETTINGS[path], system)
    try:
        spec = field_spec(path)
    except (KeyError, ValueError, TypeError):
        return _PLAIN
    if spec.pattern in _BY_PATTERN:
        return _BY_PATTERN[spec.pattern][system]
    return kind_unit(spec.unit, system)


def format_sig(value: float, sig: int = 6, signed: bool = False) -> str:
    """``value`` to ``sig`` significant figures in plain decimal notation (no exponent for
    ordinary sizes, trailing zeros dropped, never “-0”): 0.000227 stays 0.000227."""
    if not math.isfinite(value):
        return "∞" if value > 0 else "−∞" if value < 0 else "—"
    if value == 0:
        return "0"
    magnitude = math.floor(math.log10(abs(value)))
    if magnitude >= 12 or magnitude < -9:
        text = f"{value:.{sig - 1}e}"
    else:
        decimals = max(0, sig - 1 - magnitude)
        text = f"{value:.{decimals}f}"
        if "." in text:
            text = text.rstrip("0").rstrip(".")
    if text.lstrip("+-").strip("0.") == "":
        return "0"
    return f"+{text}" if signed and not text.startswith("-") else text


def quantity_text(si: float, kind: str, system: UnitSystem, path: str = "",
                  sig: int = 4) -> str:
    """An SI value as a person reads it in ``system``: “0.1 mm”, “1000 m”, “3.94 in”.

    In metric a length under 1 cm is given in mm; in inch-pound a length over 100 ft in feet.
    ``path`` picks a field's own presentation (``site.elevation_m`` in ft).
    """
    unit = field_unit(path, system) if path else kind_unit(kind, system)
    if kind == "mass" and system is M and 0 < abs(si) < 0.01:
        unit = FieldUnit("g", 1000.0)
    if kind == "length" and not path.endswith("elevation_m"):
        if system is M and 0 < abs(si) < 0.01:
            unit = kind_unit("small_length", M)
        elif system is IP and abs(si) > 100 * METRES_PER_FOOT:
            unit = FieldUnit("ft", 1.0 / METRES_PER_FOOT)
    shown = unit.to_display(si)
    text = format_sig(shown, sig)
    if not unit.text:
        return text
    return f"{text}{unit.text}" if unit.text == "°" else f"{text} {unit.text}"


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
    "m/s²": ReadoutUnit("ft/s²", 1.0 / METRES_PER_FOOT),
    "N": ReadoutUnit("lbf", 1.0 / NEWTONS_PER_LBF),
    "N·m/rad": ReadoutUnit("lbf·in/rad", 1.0 / NM_PER_LBF_IN),
    "MPa": ReadoutUnit("ksi", 1e6 / (1000.0 * PA_PER_PSI)),
    "J": ReadoutUnit("ft·lbf", 1.0 / (NEWTONS_PER_LBF * METRES_PER_FOOT)),
    "s/day/K": ReadoutUnit("s/day/°F", 1.0 / 1.8),
    "s/day/hPa": ReadoutUnit("s/day/inHg", HPA_PER_INHG),
    "°C": ReadoutUnit("°F", 1.8, 32.0),
    "hPa": ReadoutUnit("inHg", 1.0 / HPA_PER_INHG),
}


def figure_text(si: float, unit: str, system: UnitSystem, sig: int = 4) -> str:
    """A figure given in SI ``unit`` as text in ``system``: ``figure_text(18.15, "m", IP)``
    is “59.55 ft”; a length in metric under 1 cm in mm, in inch-pound over 10 ft in feet."""
    if unit == "m":
        if system is IP and abs(si) > 10 * METRES_PER_FOOT:
            return f"{format_sig(si / METRES_PER_FOOT, sig)} ft"
        return quantity_text(si, "length", system, sig=sig)
    shown = readout_unit(unit, system)
    return f"{format_sig(shown.convert(si), sig)} {shown.text}".rstrip()


def readout_unit(unit: str, system: UnitSystem) -> ReadoutUnit:
    """How a readout figure given in SI ``unit`` is shown in ``system``."""
    if system is UnitSystem.INCH_POUND and unit in _INCH_POUND_READOUT:
        return _INCH_POUND_READOUT[unit]
    return ReadoutUnit(unit)
