"""How the readout's figures are labelled and formatted, shared by the window, the report
table and the PDF: (key, label, unit, format) rows over ``Result.report_dict()``."""

from __future__ import annotations

from typing import Any

__all__ = ["SECTIONS", "format_value", "rows"]

Row = tuple[str, str, str, str]

SECTIONS: tuple[tuple[str, tuple[Row, ...]], ...] = (
    ("Timekeeping", (
        ("period_s", "Period (exact)", "s", "{:.9f}"),
        ("period_small_s", "Period (small arcs)", "s", "{:.9f}"),
        ("target_period_s", "Target period", "s", "{:.9f}"),
        ("rate_s_per_day", "Rate", "s/day", "{:+.2f}"),
        ("beats_per_hour", "Beats per hour", "/h", "{:.3f}"),
        ("circular_error_s_per_day", "Circular error", "s/day", "{:.3f}"),
        ("amplitude_deg", "Semi-arc", "°", "{:.3f}"),
    )),
    ("Tuning", (
        ("bob_sensitivity_s_per_day_per_mm", "Bob lowered 1 mm", "s/day", "{:+.3f}"),
        ("rating_nut_s_per_day_per_turn", "Rating nut, one turn up", "s/day", "{:+.3f}"),
        ("trim_s_per_day_per_g", "1 g trim at tray", "s/day", "{:+.4f}"),
        ("trim_height_m", "Trim tray height", "m", "{:.4f}"),
        ("trim_null_height_m", "Trim has no effect at", "m", "{:.6f}"),
        ("temperature_coefficient_s_per_day_per_k", "Temperature", "s/day/K", "{:+.4f}"),
        ("pressure_coefficient_s_per_day_per_hpa", "Air pressure", "s/day/hPa", "{:+.5f}"),
        ("arc_s_per_day_per_0_1_deg", "Semi-arc +0.1°", "s/day", "{:+.3f}"),
        ("elevation_s_per_day_per_100_m", "Site 100 m higher", "s/day", "{:+.3f}"),
    )),
    ("Mass properties", (
        ("mass_kg", "Mass", "kg", "{:.4f}"),
        ("centre_of_mass_m", "Centre of mass", "m", "{:.6f}"),
        ("inertia_pivot_kg_m2", "Inertia about pivot", "kg·m²", "{:.6f}"),
        ("centre_of_oscillation_m", "Centre of oscillation I/Mh", "m", "{:.6f}"),
        ("g_m_s2", "Local gravity", "m/s²", "{:.6f}"),
        ("air_density_kg_m3", "Air density", "kg/m³", "{:.4f}"),
    )),
    ("Swing and loads", (
        ("peak_speed_m_s", "Bob peak speed", "m/s", "{:.4f}"),
        ("sweep_width_m", "Sweep width (bob centre)", "m", "{:.4f}"),
        ("static_load_n", "Static weight", "N", "{:.2f}"),
        ("max_pivot_load_n", "Peak pivot load", "N", "{:.2f}"),
        ("pivot_load_ratio", "Peak / static load", "", "{:.5f}"),
        ("energy_j", "Swing energy", "J", "{:.5g}"),
        ("drive_power_w", "Drive power to sustain", "W", "{:.4g}"),
        ("cycles_to_half_amplitude", "Cycles to half arc", "", "{:.1f}"),
        ("time_to_half_amplitude_s", "Time to half arc", "s", "{:.1f}"),
        ("foucault_turn_h", "Foucault full turn", "h", "{:.3f}"),
    )),
)


def format_value(value: Any, fmt: str) -> str:
    """``value`` formatted with ``fmt``; an em dash where it is not defined."""
    if value is None:
        return "—"
    try:
        return fmt.format(value)
    except (TypeError, ValueError):
        return str(value)


def rows(report: dict[str, Any]) -> list[tuple[str, str, str, str]]:
    """(section, label, formatted value, unit) for every figure of a report dict."""
    out = []
    for section, items in SECTIONS:
        for key, label, unit, fmt in items:
            out.append((section, label, format_value(report.get(key), fmt), unit))
    return out
