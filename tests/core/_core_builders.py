"""Small builders of design dicts (file format 1, DESIGN §3) for the core's reference tests.

They write the file form directly, so every test goes through the one validator
(:func:`core.design_from_dict`). Defaults: vacuum, g overridden to g_n, site temperature equal
to the reference temperature, no damping, no target.
"""

from __future__ import annotations

import copy
from typing import Any

G_N = 9.80665  # m/s², standard gravity, 3rd CGPM (1901) [pub]

# The lightest mass the format accepts is of the order of a milligram; a "very light" rod or
# sleeve in these tests is given 1e-6 kg, and the bob is made heavy enough that the light part's
# share of I and M h is below the tolerance each test states.
LIGHT_KG = 1e-6


def rod(name: str = "rod", material: str = "steel", top_m: float = 0.0, length_m: float = 1.0,
        diameter_m: float = 0.008, mass_kg: float | None = None) -> dict[str, Any]:
    return {"kind": "rod", "name": name, "material": material, "top_m": top_m,
            "length_m": length_m, "diameter_m": diameter_m, "mass_kg": mass_kg}


def sleeve(name: str = "sleeve", material: str = "brass", on: str = "rod",
           length_m: float = 0.1, outer_diameter_m: float = 0.02,
           inner_diameter_m: float = 0.009, mass_kg: float | None = None) -> dict[str, Any]:
    return {"kind": "sleeve", "name": name, "material": material, "on": on,
            "length_m": length_m, "outer_diameter_m": outer_diameter_m,
            "inner_diameter_m": inner_diameter_m, "mass_kg": mass_kg}


def clamp(on: str = "rod", centre_m: float = 1.0) -> dict[str, Any]:
    return {"kind": "clamp", "on": on, "centre_m": centre_m}


def on_sleeve(on: str = "sleeve") -> dict[str, Any]:
    return {"kind": "on_sleeve", "on": on}


def bob(shape: str = "sphere", name: str = "bob", material: str = "brass",
        mount: dict[str, Any] | None = None, diameter_m: float = 0.1,
        thickness_m: float | None = None, height_m: float | None = None,
        mass_kg: float | None = None) -> dict[str, Any]:
    d: dict[str, Any] = {"kind": "bob", "name": name, "shape": shape, "material": material,
                         "mount": mount if mount is not None else clamp(),
                         "diameter_m": diameter_m}
    if shape in ("disc", "lens"):
        d["thickness_m"] = 0.02 if thickness_m is None else thickness_m
    if shape == "cylinder":
        d["height_m"] = 0.1 if height_m is None else height_m
    d["mass_kg"] = mass_kg
    return d


def weight(name: str = "trim", mass_kg: float = 0.01, at_m: float = 0.5, on: str = "rod"
           ) -> dict[str, Any]:
    return {"kind": "weight", "name": name, "mass_kg": mass_kg, "at_m": at_m, "on": on}


def design(parts: list[dict[str, Any]], *, amplitude_deg: float = 1.0,
           quality_factor: float | None = None, g_m_s2: float | None = G_N,
           latitude_deg: float = 45.0, elevation_m: float = 0.0,
           temperature_c: float = 20.0, reference_temperature_c: float = 20.0,
           pressure_hpa: float = 0.0, stiffness: float | None = None,
           period_s: float | None = None, pitch_m: float | None = None,
           name: str = "test") -> dict[str, Any]:
    """A design dict; ``stiffness`` not None makes a spring suspension."""
    suspension = ({"kind": "knife_edge", "stiffness_n_m_per_rad": 0.0} if stiffness is None
                  else {"kind": "spring", "stiffness_n_m_per_rad": stiffness})
    return {
        "format": "penduline-design", "version": 1, "name": name,
        "reference_temperature_c": reference_temperature_c,
        "site": {"latitude_deg": latitude_deg, "elevation_m": elevation_m, "g_m_s2": g_m_s2,
                 "temperature_c": temperature_c, "pressure_hpa": pressure_hpa},
        "suspension": suspension,
        "parts": copy.deepcopy(parts),
        "swing": {"amplitude_deg": amplitude_deg, "quality_factor": quality_factor},
        "target": {"period_s": period_s},
        "rating_nut": {"pitch_m": pitch_m},
    }


def point_pendulum(length_m: float, *, bob_kg: float = 1.0e4, **kw: Any) -> dict[str, Any]:
    """A 'point' bob on a very light rod: a 10 t sphere 10 µm across hung at ``length_m``.

    Its share of I beyond m L² is 0.4 r²/L² ≈ 1e-11 L⁻²; the rod's (1e-6 kg) is ≈ 3e-11 of I.
    Both are far below the tolerances of the tests that use it.
    """
    parts = [rod(length_m=length_m, diameter_m=1e-4, mass_kg=LIGHT_KG, material=kw.pop(
                 "rod_material", "steel")),
             bob("sphere", diameter_m=1e-5, mass_kg=bob_kg, mount=clamp(centre_m=length_m))]
    return design(parts, **kw)


# DESIGN §4, the keys `report --json` must carry (copied from the design brief, not the core)
DESIGN_KEYS = ("mass_kg", "centre_of_mass_m", "inertia_pivot_kg_m2", "equivalent_length_m",
               "centre_of_oscillation_m", "g_m_s2", "period_small_s", "period_s",
               "beats_per_hour", "circular_error_s_per_day", "rate_s_per_day",
               "temperature_coefficient_s_per_day_per_k",
               "pressure_coefficient_s_per_day_per_hpa", "bob_sensitivity_s_per_day_per_mm",
               "peak_speed_m_s", "max_pivot_load_n", "warnings")
