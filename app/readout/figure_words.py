"""Readout labels that name a quantity of the chosen unit system, and their factors.

A sensitivity is quoted per a round step in the person's units: “Bob lowered 1 mm” in metric,
“Bob lowered 1/32 in” in inch-pound; “Site 100 m higher” or “Site 300 ft higher”. The core gives
the figure per its own SI step; the factor here rescales the linear sensitivity to the step
named (plain unit factors, no physics). The trim figure names where it is quoted: at the tray
when the design carries a trim weight there, else at the height chosen.
"""

from __future__ import annotations

from app.form.units import (
    KILOGRAMS_PER_POUND,
    METRES_PER_FOOT,
    METRES_PER_INCH,
    NM_PER_LBF_IN,
    UnitSystem,
    field_unit,
    format_sig,
)
from core import Result

__all__ = ["figure_label", "TRIM_KEY"]

TRIM_KEY = "trim_s_per_day_per_g"
_SAME_HEIGHT_M = 5e-4  # a trim weight within this of the quoted height is "at the tray"

# key → (label, factor on the SI figure) in inch-pound; the SI step of each figure is in its key.
_INCH_POUND: dict[str, tuple[str, float]] = {
    "bob_sensitivity_s_per_day_per_mm": ("Bob lowered 1/32 in", METRES_PER_INCH / 32 / 1e-3),
    "elevation_s_per_day_per_100_m": ("Site 300 ft higher", 300 * METRES_PER_FOOT / 100.0),
    TRIM_KEY: ("1/10 oz trim", 0.1 * KILOGRAMS_PER_POUND / 16 / 1e-3),
    "stiffness_s_per_day_per_n_m_per_rad": ("Spring stiffness +1 lbf·in/rad", NM_PER_LBF_IN),
}


def figure_label(key: str, label: str, result: Result | None,
                 system: UnitSystem) -> tuple[str, float]:
    """The label shown for figure ``key`` (its metric ``label`` given) and the factor that
    turns the core's figure into the figure that label names."""
    factor = 1.0
    if system is UnitSystem.INCH_POUND and key in _INCH_POUND:
        label, factor = _INCH_POUND[key]
    if key in (TRIM_KEY, "trim_height_m") and result is not None:
        height = result.sensitivities.trim_height_m
        at_tray = any(p.kind == "weight" and abs(p.at_m - height) < _SAME_HEIGHT_M
                      for p in result.design.parts)
        if key == "trim_height_m":
            return (label if at_tray else "Trim quoted at"), factor
        stem = label.removesuffix(" at tray")
        if at_tray:
            label = f"{stem} at tray"
        else:
            unit = field_unit("trim_height_m", system)
            label = f"{stem} at {format_sig(round(unit.to_display(height), unit.decimals), 4)}" \
                    f" {unit.text}"
    return label, factor
