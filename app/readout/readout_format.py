"""How the readout's figures are labelled and formatted, shared by the window, the report
table and the PDF: (key, label, unit, format) rows over ``Result.report_dict()``.

Labels are kept short enough for the readout's narrow label column; :data:`DESCRIPTIONS`
says in full what each figure is (the window shows it, with the JSON key, as a tooltip).
"""

from __future__ import annotations

from typing import Any

from app.form.units import format_sig

__all__ = ["SECTIONS", "DESCRIPTIONS", "describe", "format_value", "no_signed_zero", "rows",
           "format_sig"]

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
        ("temperature_coefficient_s_per_day_per_k", "Temperature coefficient", "s/day/K",
         "{:+.4f}"),
        ("pressure_coefficient_s_per_day_per_hpa", "Pressure coefficient", "s/day/hPa", "{:+.5f}"),
        ("arc_s_per_day_per_0_1_deg", "Semi-arc +0.1°", "s/day", "{:+.3f}"),
        ("elevation_s_per_day_per_100_m", "Site 100 m higher", "s/day", "{:+.3f}"),
    )),
    ("Mass properties", (
        ("mass_kg", "Mass", "kg", "sig6"),
        ("centre_of_mass_m", "Centre of mass", "m", "{:.6f}"),
        ("inertia_pivot_kg_m2", "Inertia about pivot", "kg·m²", "sig6"),
        ("centre_of_oscillation_m", "Centre of oscillation", "m", "{:.6f}"),
        ("radius_of_gyration_m", "Radius of gyration", "m", "{:.6f}"),
        ("shortest_period_pivot_m", "Shortest-period pivot", "m", "{:.6f}"),
        ("shortest_period_small_s", "Shortest period", "s", "{:.9f}"),
        ("conjugate_pivot_m", "Conjugate pivot", "m", "{:.6f}"),
        ("pivot_sensitivity_s_per_day_per_mm", "Pivot 1 mm up the body", "s/day", "{:+.3f}"),
        ("g_m_s2", "Local gravity", "m/s²", "{:.6f}"),
        ("air_density_kg_m3", "Air density", "kg/m³", "{:.4f}"),
    )),
    ("Swing and loads", (
        ("peak_speed_m_s", "Bob peak speed", "m/s", "{:.4f}"),
        ("sweep_width_m", "Bob sweep width", "m", "{:.4f}"),
        ("static_load_n", "Static weight", "N", "{:.2f}"),
        ("max_pivot_load_n", "Peak pivot load", "N", "{:.2f}"),
        ("pivot_load_ratio", "Peak / static load", "", "{:.5f}"),
        ("energy_j", "Swing energy", "J", "sig5"),
        ("drive_power_w", "Drive power to sustain", "W", "sig4"),
        ("cycles_to_half_amplitude", "Cycles to half arc", "", "{:.1f}"),
        ("time_to_half_amplitude_s", "Time to half arc", "s", "{:.1f}"),
        ("foucault_turn_h", "Foucault full turn", "h", "{:.3f}"),
    )),
    ("Exhibit planning", (
        ("foucault_deg_per_hour", "Plane turns (+ clockwise)", "°/h", "{:+.3f}"),
        ("bob_rise_m", "Bob rise at the ends", "m", "sig4"),
        ("lowest_point_m", "Deepest point in swing", "m", "{:.4f}"),
        ("outer_sweep_m", "Outer sweep of body", "m", "{:.4f}"),
        ("floor_clearance_m", "Floor clearance", "m", "{:.4f}"),
        ("barrier_margin_m", "Barrier margin", "m", "{:.4f}"),
        ("stretch_m", "Static stretch", "m", "sig4"),
        ("stretch_rate_s_per_day", "Rate lost to stretch", "s/day", "{:+.3f}"),
        ("peak_stress_pa", "Peak stress (ideal)", "Pa", "sig4"),
        ("peak_stress_ratio", "Stress / strength", "", "{:.3f}"),
    )),
)


DESCRIPTIONS: dict[str, str] = {
    "period_s": "Exact period, one full swing there and back, at the working semi-arc",
    "period_small_s": "Period the same pendulum would have swinging through very small arcs",
    "target_period_s": "The period the clock should keep (the target period, or 7200 s divided "
                       "by the target beats per hour)",
    "rate_s_per_day": "Seconds a day gained (+) or lost (−) against the target period",
    "beats_per_hour": "Beats an hour at the exact period (two beats per period)",
    "circular_error_s_per_day": "Seconds a day lost to the size of the swing, compared with "
                                "very small arcs",
    "amplitude_deg": "Working semi-arc: how far the pendulum swings each side of vertical",
    "bob_sensitivity_s_per_day_per_mm": "Rate change when the bob is lowered by 1 mm (a "
                                        "linear sensitivity: the slope at the design, scaled)",
    "rating_nut_s_per_day_per_turn": "Rate change for one turn of the rating nut raising "
                                     "the bob (a linear sensitivity: the slope at the design, "
                                     "scaled to one turn)",
    "trim_s_per_day_per_g": "Rate change for 1 g of trim weight added at the trim tray "
                            "height",
    "trim_height_m": "Height below the pivot at which the trim-weight figure is quoted",
    "trim_null_height_m": "Height below the pivot at which added trim weight leaves the rate "
                          "unchanged",
    "temperature_coefficient_s_per_day_per_k": "Rate change for each kelvin the site warms",
    "pressure_coefficient_s_per_day_per_hpa": "Rate change for each hPa the air pressure "
                                              "rises",
    "arc_s_per_day_per_0_1_deg": "Rate change when the semi-arc grows by 0.1°",
    "elevation_s_per_day_per_100_m": "Rate change if the site were 100 m higher",
    "mass_kg": "Total mass of the pendulum",
    "centre_of_mass_m": "Centre of mass, below the pivot",
    "inertia_pivot_kg_m2": "Moment of inertia about the pivot axis",
    "centre_of_oscillation_m": "Centre of oscillation below the pivot, I/(M·h): the length "
                               "of the simple pendulum with the same small-arc period",
    "radius_of_gyration_m": "Radius of gyration about the centre of mass, √(I/M): how far "
                            "the mass is spread along the body",
    "shortest_period_pivot_m": "Height above the centre of mass (not below the pivot) of the "
                               "pivot that gives the shortest period. Hung near it, the "
                               "period hardly changes with where the knife edge sits",
    "shortest_period_small_s": "Small-arc period with the pivot at the shortest-period "
                               "distance (same site, air and suspension)",
    "conjugate_pivot_m": "Depth below the centre of mass (not below the pivot) of the other "
                         "pivot with the same period (the body turned over to hang from it, "
                         "as a reversible pendulum)",
    "pivot_sensitivity_s_per_day_per_mm": "Rate change when the pivot moves 1 mm up the body "
                                          "(every part 1 mm further below it); near zero "
                                          "close to the shortest-period pivot",
    "g_m_s2": "Gravity at the site (from latitude and elevation, or as given)",
    "air_density_kg_m3": "Density of the air at the site's temperature and pressure",
    "peak_speed_m_s": "Speed of the bob centre as it passes the lowest point",
    "sweep_width_m": "Width swept by the bob centre, from one end of the swing to the other",
    "static_load_n": "Weight of the pendulum hanging at rest",
    "max_pivot_load_n": "Largest load on the pivot during the swing: ideal, with no safety "
                        "factor",
    "pivot_load_ratio": "Peak pivot load divided by the static weight",
    "energy_j": "Energy of the swing",
    "drive_power_w": "Power the drive must supply to keep the swing up against its damping",
    "cycles_to_half_amplitude": "Full swings for the arc to fall to half, with no drive",
    "time_to_half_amplitude_s": "Time for the arc to fall to half, with no drive",
    "foucault_turn_h": "Hours for the plane of swing to turn a full circle at the site's "
                       "latitude",
    "foucault_deg_per_hour": "How fast the plane of swing turns, degrees an hour: positive "
                             "clockwise seen from above (northern hemisphere), negative "
                             "counter-clockwise (southern)",
    "bob_rise_m": "How far the bob's centre rises from the lowest point to the end of the swing",
    "lowest_point_m": "Deepest point any part of the body reaches during the swing, below the "
                      "pivot",
    "outer_sweep_m": "Width swept by the outermost points of the body, the bob's own size "
                     "included",
    "floor_clearance_m": "Gap between the floor and the deepest point of the swing (needs the "
                         "pivot's height above the floor)",
    "barrier_margin_m": "Barrier radius less the farthest the body reaches from the vertical "
                        "through the pivot (needs the barrier radius)",
    "stretch_m": "Static elastic stretch of the rods or cable under the load hanging below "
                 "each section (Hooke's law)",
    "stretch_rate_s_per_day": "Rate change the static stretch causes",
    "peak_stress_pa": "Largest tensile stress in a rod at the bottom of the swing: ideal, no "
                      "safety factor; a qualified engineer must check the cable and fixing",
    "peak_stress_ratio": "Peak stress over the material's yield (or tensile) strength, where "
                         "the material table has one",
}
"""What each figure is, in full, by its JSON key."""


def describe(key: str) -> str:
    """A tooltip for figure ``key``: its full description and its JSON key."""
    label = next((label for _s, items in SECTIONS for k, label, _u, _f in items if k == key),
                 key)
    return f"{DESCRIPTIONS.get(key, label)}.\nJSON key: {key}"


def format_value(value: Any, fmt: str) -> str:
    """``value`` formatted with ``fmt``; an em dash where it is not defined.

    ``fmt`` is a format string (``"{:+.2f}"``) or ``"sigN"``/``"+sigN"``: N significant
    figures, so a small clock's inertia (0.000227 kg·m²) keeps its digits. A value that rounds
    to zero shows as plain 0 (never “-0.00” or “+0.000”).
    """
    if value is None:
        return "—"
    try:
        if fmt.lstrip("+").startswith("sig"):
            return format_sig(float(value), int(fmt.lstrip("+")[3:]), fmt.startswith("+"))
        text = fmt.format(value)
    except (TypeError, ValueError):
        return str(value)
    return no_signed_zero(text)


def no_signed_zero(text: str) -> str:
    """“-0.00”, “+0.000”, “−0” → the same digits without a sign."""
    body = text.lstrip("+-−")
    if body != text and body and not body.strip("0.") and body[0].isdigit():
        return body
    return text


def rows(report: dict[str, Any]) -> list[tuple[str, str, str, str]]:
    """(section, label, formatted value, unit) for every figure of a report dict."""
    out = []
    for section, items in SECTIONS:
        for key, label, unit, fmt in items:
            out.append((section, label, format_value(report.get(key), fmt), unit))
    return out
