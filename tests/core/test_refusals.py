"""Refusals that name the real cause: buoyancy, and a rate-budget range that would float the
design.

The designs are a light rod with a large, light sphere at its end (a balloon-like bob): whether
it hangs depends on the air's density, which the core takes from pressure and temperature.
Archimedes' principle: a body in air is pushed up by the weight of the air it displaces.
"""

from __future__ import annotations

import math
from typing import Any

import pytest

from core import DesignError, analyse
from core.air import air_density
from core.tuning import budget_ranges

SPHERE_D = 0.3
SPHERE_V = math.pi * SPHERE_D**3 / 6.0  # plain geometry


def balloon(bob_mass_kg: float, pressure_hpa: float = 1013.25) -> dict[str, Any]:
    return {"format": "penduline-design", "version": 1, "name": "balloon",
            "site": {"latitude_deg": 45.0, "temperature_c": 20.0, "pressure_hpa": pressure_hpa},
            "parts": [{"kind": "rod", "name": "thread", "material": "wood", "top_m": 0.0,
                       "length_m": 1.0, "diameter_m": 0.001, "mass_kg": 1e-5},
                      {"kind": "bob", "name": "globe", "shape": "sphere", "material": "brass",
                       "mount": {"kind": "clamp", "on": "thread", "centre_m": 1.0},
                       "diameter_m": SPHERE_D, "mass_kg": bob_mass_kg}],
            "swing": {"amplitude_deg": 2.0, "quality_factor": 50.0},
            "target": {"period_s": 2.0}}


def air_mass(pressure_hpa: float = 1013.25, temperature_c: float = 20.0) -> float:
    return air_density(pressure_hpa, temperature_c) * SPHERE_V


class TestBuoyancy:
    def test_lighter_than_air_part_named(self) -> None:
        # Half the mass of the air it displaces: the globe floats (Archimedes).
        with pytest.raises(DesignError) as info:
            analyse(balloon(0.5 * air_mass()))
        assert info.value.field == "parts[1]"
        assert "the part 'globe' is lighter than the air it displaces" in info.value.reason
        assert "centre of mass" not in info.value.reason

    def test_centre_of_mass_above_pivot_still_says_so(self) -> None:
        d = balloon(1.0)
        d["parts"][0]["top_m"] = -1.0
        d["parts"][1]["mount"]["centre_m"] = -1.0
        with pytest.raises(DesignError) as info:
            analyse(d)
        assert info.value.field == "parts"
        assert "centre of mass must hang below the pivot" in info.value.reason

    def test_heavier_than_air_hangs(self) -> None:
        result = analyse(balloon(2.0 * air_mass()))
        assert result.period_s > 0


class TestBudgetRangeThatWouldFloat:
    # 2 % heavier than its air at 1013.25 hPa and 20 °C. At 1043.25 hPa the air is 3.0 % denser
    # (density ∝ p at fixed temperature, ideal gas), so the globe would float; 5 K colder makes
    # it only 1.7 % denser (∝ 1/T), so the temperature line stays.
    MASS_FACTOR = 1.02

    def test_default_ranges_do_not_refuse_a_valid_design(self) -> None:
        result = analyse(balloon(self.MASS_FACTOR * air_mass()))
        causes = [line.cause for line in result.budget.lines]
        assert causes == ["Temperature", "Semi-arc"]
        notes = [w for w in result.warnings if w.startswith("Rate budget")]
        assert len(notes) == 1
        assert "at 1043.25 hPa" in notes[0] and "would" in notes[0]
        assert "lighter than the air it displaces" in notes[0]
        assert result.report_dict()["rate_budget"][0]["cause"] == "Temperature"

    def test_chosen_range_refused_naming_it(self) -> None:
        with pytest.raises(DesignError) as info:
            analyse(balloon(self.MASS_FACTOR * air_mass()),
                    budget_ranges=budget_ranges(5.0, 40.0, 0.1))
        assert info.value.field == "budget.pressure_hpa"
        assert info.value.reason.startswith("at 1053.25 hPa (the air pressure range 973.25 "
                                            "to 1053.25 hPa) the design would not hang")
        assert "'globe' is lighter than the air it displaces" in info.value.reason

    def test_range_that_keeps_it_hanging_is_used(self) -> None:
        result = analyse(balloon(self.MASS_FACTOR * air_mass()),
                         budget_ranges=budget_ranges(5.0, 10.0, 0.1))
        assert [line.cause for line in result.budget.lines] == ["Temperature", "Air pressure",
                                                               "Semi-arc"]
        assert not [w for w in result.warnings if w.startswith("Rate budget")]


class TestSensitivityAtTheEdge:
    def test_design_that_floats_half_a_hectopascal_higher_is_analysed(self) -> None:
        # 0.01 % heavier than its air: +0.5 hPa (the centred pressure step's upper end) adds
        # 0.05 % to the air's density (ideal gas, ∝ p) and would float it. The design hangs at
        # its site, so it is analysed; the pressure slope comes from the side that hangs, and
        # its sign is physical: denser air buoys the globe more and slows it (the clock loses).
        m = 1.0001 * air_mass()
        result = analyse(balloon(m))
        slope = result.pressure_coefficient_s_per_day_per_hpa
        assert math.isfinite(slope) and slope < 0.0
        assert [line.cause for line in result.budget.lines] == ["Semi-arc"]
