"""The form's words for design fields, keyed by the last step of the field's path.

The core's field table (``core.fields``, being added) will become the one home of these words;
until then this is the app's one copy, read by the form, the window's messages and the sweep.
"""

from __future__ import annotations

__all__ = ["FIELD_LABELS", "field_label"]

FIELD_LABELS = {
    "name": "Name", "reference_temperature_c": "Reference temperature",
    "latitude_deg": "Latitude", "elevation_m": "Elevation", "g_m_s2": "Local gravity",
    "temperature_c": "Temperature", "pressure_hpa": "Air pressure",
    "kind": "Kind", "stiffness_n_m_per_rad": "Spring stiffness",
    "material": "Material", "top_m": "Top, below pivot", "length_m": "Length",
    "diameter_m": "Diameter", "mass_kg": "Mass", "on": "Carried by",
    "outer_diameter_m": "Outer diameter", "inner_diameter_m": "Inner diameter",
    "shape": "Shape", "thickness_m": "Thickness", "height_m": "Height",
    "centre_m": "Centre, below pivot", "at_m": "Position, below pivot",
    "amplitude_deg": "Semi-arc", "quality_factor": "Q factor",
    "period_s": "Target period", "beats_per_hour": "Target beats",
    "pitch_m": "Rating nut pitch",
}


def field_label(path: str) -> str:
    """A plain label for a field path (``parts[2].mount.centre_m`` → “Centre, below pivot”)."""
    return FIELD_LABELS.get(path.rsplit(".", 1)[-1], path)
