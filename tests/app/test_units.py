"""Display units: plain factors, exact round trips, the file stays SI."""

from __future__ import annotations

import pytest

from app.form.units import UnitSystem, field_unit, readout_unit


@pytest.mark.parametrize("path, si, shown, unit", [
    ("parts[0].length_m", 0.0254, 1.0, "in"),          # 1 in = 0.0254 m exactly (definition)
    ("parts[2].mass_kg", 0.45359237, 1.0, "lb"),       # 1 lb = 0.45359237 kg exactly
    ("site.temperature_c", 100.0, 212.0, "°F"),        # water boils at 212 °F
    ("site.pressure_hpa", 33.8638866667, 1.0, "inHg"), # 1 inHg ≈ 33.8639 hPa
    ("site.elevation_m", 0.3048, 1.0, "ft"),           # 1 ft = 0.3048 m exactly
])
def test_inch_pound_conversions(path: str, si: float, shown: float, unit: str) -> None:
    u = field_unit(path, UnitSystem.INCH_POUND)
    assert u.text == unit
    assert u.to_display(si) == pytest.approx(shown, rel=1e-12)
    assert u.to_si(u.to_display(si)) == pytest.approx(si, rel=1e-12)


def test_metric_is_the_file_unit() -> None:
    u = field_unit("parts[0].length_m", UnitSystem.METRIC)
    assert (u.text, u.to_display(1.1131)) == ("m", 1.1131)


def test_readout_units_convert_only_in_inch_pound() -> None:
    assert readout_unit("m", UnitSystem.METRIC).convert(2.0) == 2.0
    assert readout_unit("N", UnitSystem.INCH_POUND).text == "lbf"
    assert readout_unit("s/day/K", UnitSystem.INCH_POUND).convert(1.8) == pytest.approx(1.0)
    assert readout_unit("s/day", UnitSystem.INCH_POUND).text == "s/day"


def test_a_temperature_difference_converts_without_the_offset() -> None:
    # A budget half-width of 10 K is 18 °F wide (1 K = 1.8 °F), not 50 °F.
    u = field_unit("budget.temperature_k", UnitSystem.INCH_POUND)
    assert (u.text, u.to_display(10.0), u.to_si(18.0)) == ("°F", 18.0, 10.0)
    assert field_unit("budget.temperature_k", UnitSystem.METRIC).to_display(10.0) == 10.0
    assert field_unit("budget.pressure_hpa", UnitSystem.INCH_POUND).text == "inHg"
    assert field_unit("budget.arc_deg", UnitSystem.INCH_POUND).text == "°"
