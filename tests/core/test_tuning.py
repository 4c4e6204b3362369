"""Reference tests for core/tuning.py: temperature, trim weight, bob and nut sensitivities, and
the rate budget.

Where the expected value is a whole-model change (the bob moved, the temperature changed) it is
computed here independently by editing the design (``with_value``) and re-analysing, with a
centred difference — not through the core's analytic derivatives.
"""

from __future__ import annotations

import math
from fractions import Fraction
from pathlib import Path
from typing import Any

import pytest
from scipy.optimize import brentq

from core import Design, analyse, design_from_dict, load_design, with_value
from core.materials import MATERIALS
from core.solve import solve_field

from _core_builders import (
    LIGHT_KG,
    bob,
    clamp,
    design,
    on_sleeve,
    point_pendulum,
    rod,
    sleeve,
    weight,
)

EXAMPLE = str(Path(__file__).resolve().parents[2] / "resources" / "examples"
              / "workshop_regulator.pendulum.json")


def alpha(material: str) -> float:
    return MATERIALS[material].expansion_per_k  # input data (core/materials.py, with sources)


def regulator_clamped() -> Design:
    """A regulator with its bob clamped to the rod, in air at a real site, with a target."""
    parts = [rod(material="invar", length_m=1.1, diameter_m=0.008),
             bob("cylinder", material="cast_iron", diameter_m=0.11, height_m=0.12, mass_kg=8.5,
                 mount=clamp(centre_m=1.0)),
             weight(mass_kg=0.004, at_m=0.45)]
    return design_from_dict(design(parts, g_m_s2=None, latitude_deg=52.0, elevation_m=40.0,
                                   pressure_hpa=1013.25, amplitude_deg=1.6,
                                   quality_factor=12000.0, period_s=2.0, pitch_m=0.001))


def rate(d: Design, path: str, value: Any) -> float:
    r = analyse(with_value(d, path, value)).rate_s_per_day
    assert r is not None
    return r


class TestTemperatureCoefficient:
    @pytest.mark.parametrize("material, domain_figure", [
        ("steel", 0.5),   # DOMAIN §3: carbon steel ≈ 0.5 s/day/K
        ("brass", 0.82),  # DOMAIN §3: brass ≈ 0.82
        ("invar", 0.05),  # DOMAIN §3: invar ≈ 0.05
    ])
    def test_uncompensated_rod(self, material: str, domain_figure: float) -> None:
        # A point-like bob clamped at the end of a light rod, in vacuum: the rod alone sets the
        # length, and the clock loses 86400·α/2 s/day per kelvin (DOMAIN §2). Measured agreement
        # ≤ 2.2e-10 relative; the tolerance 1e-6 leaves room for the light parts (≈ 1e-10).
        r = analyse(design_from_dict(point_pendulum(1.0, rod_material=material)))
        expected = -86400.0 * alpha(material) / 2.0
        assert r.temperature_coefficient_s_per_day_per_k == pytest.approx(expected, rel=1e-6)
        # and the trade figures of DOMAIN §3 (α varies with the stock: within 10 %)
        assert -r.temperature_coefficient_s_per_day_per_k == pytest.approx(domain_figure,
                                                                           rel=0.1)

    @pytest.mark.parametrize("make", [lambda: load_design(EXAMPLE), regulator_clamped])
    def test_against_ten_kelvin_difference(self, make: Any) -> None:
        # (rate(25 °C) − rate(15 °C))/10, re-analysing the whole design (air density and every
        # length change together). Measured agreement 3.5e-4 (example) and 6e-4 (clamped);
        # required: 0.2 %.
        d = make()
        d = with_value(d, "site.temperature_c", 20.0)
        coefficient = analyse(d).temperature_coefficient_s_per_day_per_k
        difference = (rate(d, "site.temperature_c", 25.0)
                      - rate(d, "site.temperature_c", 15.0)) / 10
        assert coefficient == pytest.approx(difference, rel=2e-3)


class TestSleeveCompensation:
    # Steel rod 1.2 m, brass sleeve, sphere bob (100 kg) resting on the sleeve; rod and sleeve
    # 1e-6 kg each; vacuum. The solver nulls the temperature coefficient by the sleeve length.
    def _design(self, bob_diameter: float, bob_material: str = "brass") -> Design:
        parts = [rod(material="steel", length_m=1.2, diameter_m=0.004, mass_kg=LIGHT_KG),
                 sleeve(material="brass", length_m=0.5, outer_diameter_m=0.012,
                        inner_diameter_m=0.005, mass_kg=LIGHT_KG),
                 bob("sphere", material=bob_material, diameter_m=bob_diameter, mass_kg=100.0,
                     mount=on_sleeve())]
        return design_from_dict(design(parts, pressure_hpa=0.0))

    def test_point_bob_limit(self) -> None:
        # α_rod·L_rod = α_sleeve·L_sleeve + α_bob·h/2 (DOMAIN §1/§2 compensation, point bob).
        # A 20 mm ball's own radius of gyration (k_c² = 0.4 r²) moves the exact null by 2.4e-4
        # of the sleeve length (see the next test); tolerance 5e-4.
        sol = solve_field(self._design(0.02), "parts[1].length_m", goal="temperature")
        expected = (alpha("steel") * 1.2 - alpha("brass") * 0.01) / alpha("brass")
        assert sol.value == pytest.approx(expected, rel=5e-4)
        assert abs(sol.temperature_coefficient_s_per_day_per_k) < 1e-9

    @pytest.mark.parametrize("bob_material", ["brass", "lead"])
    def test_with_bob_radius_of_gyration(self, bob_material: str) -> None:
        # Exact null for a 100 mm ball: L_eq = z + c/z, c = 0.4 r²(1 + α_b ΔT)²,
        # z = L_r(1 + α_r ΔT) − L_s(1 + α_s ΔT) − r(1 + α_b ΔT); dL_eq/dΔT = 0 gives
        # z'(1 − c/z²) + c'/z = 0 — solved here with scipy brentq [computed].
        r = 0.05
        a_r, a_s, a_b = alpha("steel"), alpha("brass"), alpha(bob_material)

        def condition(ls: float) -> float:
            z = 1.2 - ls - r
            c = 0.4 * r * r
            z_dot = a_r * 1.2 - a_s * ls - a_b * r
            return z_dot * (1 - c / z**2) + 0.8 * r * r * a_b / z

        expected = brentq(condition, 0.3, 1.0, xtol=1e-15)
        sol = solve_field(self._design(2 * r, bob_material), "parts[1].length_m",
                          goal="temperature")
        assert sol.value == pytest.approx(expected, rel=1e-6)
        # the point-bob formula is 0.6 % off at this size: the test distinguishes the two
        point = (a_r * 1.2 - a_b * r) / a_s
        assert abs(point / expected - 1) > 1e-3


class TestTrimWeight:
    # DOMAIN §3 compound example (vacuum, g_n): L_eq = I/(M h) = 0.9409313725 m, from exact
    # fractions here. DOMAIN §1: a small mass at the centre of oscillation changes nothing;
    # above it the clock gains, below it loses.
    INERTIA = Fraction(1, 4) / 3 + 3 * (Fraction(75, 1000) ** 2 / 2 + Fraction(95, 100) ** 2)
    MH = Fraction(1, 4) / 2 + 3 * Fraction(95, 100)

    def _parts(self) -> list[dict[str, Any]]:
        return [rod(length_m=1.0, diameter_m=1e-5, mass_kg=0.25),
                bob("disc", diameter_m=0.15, thickness_m=0.01, mass_kg=3.0,
                    mount=clamp(centre_m=0.95))]

    def _period(self, extra: list[dict[str, Any]]) -> float:
        return analyse(design_from_dict(design(self._parts() + extra))).period_s

    def test_null_at_centre_of_oscillation(self) -> None:
        l_eq = float(self.INERTIA / self.MH)
        assert l_eq == pytest.approx(0.9409313725, abs=6e-11)  # DOMAIN §3
        base = self._period([])
        with_trim = self._period([weight(mass_kg=0.01, at_m=l_eq)])
        assert with_trim == pytest.approx(base, rel=1e-13)
        r = analyse(design_from_dict(design(self._parts())), trim_height_m=l_eq)
        assert r.centre_of_oscillation_m == pytest.approx(l_eq, rel=1e-12)
        assert r.sensitivities.null_height_m == pytest.approx(l_eq, rel=1e-9)
        assert abs(r.sensitivities.trim_s_per_day_per_g) < 1e-9

    @pytest.mark.parametrize("z", [0.3, 0.6, 0.99])
    def test_above_gains_below_loses(self, z: float) -> None:
        # Exactly: T'/T = √((I + δm z²)/I · M h/(M h + δm z)) [computed from the equation of
        # motion, vacuum, no spring].
        dm = 0.01
        base = self._period([])
        got = self._period([weight(mass_kg=dm, at_m=z)])
        i, mh = float(self.INERTIA), float(self.MH)
        expected = math.sqrt((i + dm * z * z) / i * mh / (mh + dm * z))
        assert got / base == pytest.approx(expected, rel=1e-12)
        l_eq = i / mh
        assert (got < base) == (z < l_eq)  # above: shorter period (gains)

    def test_trim_sensitivity_per_gram(self) -> None:
        # 1 g at 0.6 m, to first order in the added mass (the readout's figure): from the exact
        # model above, d ln T/dm = ½(z²/I − z/(M h)), and rate = 86400(T_target/T − 1). An
        # actual 1 g differs from this by ~2e-4 relative (second order), checked as well.
        i, mh, z = float(self.INERTIA), float(self.MH), 0.6
        r = analyse(design_from_dict(design(self._parts(), period_s=2.0)), trim_height_m=z)
        first_order = -86400.0 * 2.0 / r.period_s * 0.5 * (z * z / i - z / mh) * 1e-3
        assert r.sensitivities.trim_s_per_day_per_g == pytest.approx(first_order, rel=1e-9)
        ratio = math.sqrt((i + 1e-3 * z * z) / i * mh / (mh + 1e-3 * z))
        exact_change = 86400.0 * 2.0 / r.period_s * (1 / ratio - 1)
        assert r.sensitivities.trim_s_per_day_per_g == pytest.approx(exact_change, rel=5e-4)
        assert r.sensitivities.trim_s_per_day_per_g > 0


class TestBobAndNutSensitivity:
    def test_bob_against_centred_difference(self) -> None:
        # Move the bob ±0.5 mm with with_value and re-analyse. Required 0.2 %; measured 1.4e-7.
        d = regulator_clamped()
        h = 0.5e-3
        centred = (rate(d, "parts[1].mount.centre_m", 1.0 + h)
                   - rate(d, "parts[1].mount.centre_m", 1.0 - h)) / (2 * h) * 1e-3
        r = analyse(d)
        assert r.bob_sensitivity_s_per_day_per_mm == pytest.approx(centred, rel=1e-5)
        assert r.bob_sensitivity_s_per_day_per_mm < 0  # lowering the bob loses

    def test_rating_nut_turn(self) -> None:
        # One turn raises a clamped bob by the pitch (1 mm): the rate rises by the same amount
        # the bob sensitivity loses per mm (DOMAIN §1: rate per turn = pitch × rate per mm).
        d = regulator_clamped()
        h = 0.5e-3
        centred = (rate(d, "parts[1].mount.centre_m", 1.0 - h)
                   - rate(d, "parts[1].mount.centre_m", 1.0 + h)) / (2 * h) * 1e-3
        nut = analyse(d).sensitivities.rating_nut_s_per_day_per_turn
        assert nut == pytest.approx(centred, rel=1e-5)

    def test_seconds_pendulum_per_mm(self) -> None:
        # Point bob at L: d(rate)/dL = −86400/(2L) per m (DOMAIN §3: 43.477 s/day per mm at
        # the seconds length).
        r = analyse(design_from_dict(point_pendulum(0.993621385566, amplitude_deg=0.01,
                                                    period_s=2.0)))
        assert r.bob_sensitivity_s_per_day_per_mm == pytest.approx(-43.477, abs=6e-4)


class TestRateBudget:
    def test_lines_and_totals(self) -> None:
        # Each line's rates re-computed by editing the design (±5 K, ±30 hPa, ±0.1°), and the
        # worst case = Σ|spread|, root-sum-square = √Σ spread².
        d = load_design(EXAMPLE)
        r = analyse(d)
        site_t, site_p = d.site.temperature_c, d.site.pressure_hpa
        amp = d.swing.amplitude_deg
        expected = [
            (rate(d, "site.temperature_c", site_t - 5), rate(d, "site.temperature_c", site_t + 5)),
            (rate(d, "site.pressure_hpa", site_p - 30), rate(d, "site.pressure_hpa", site_p + 30)),
            (rate(d, "swing.amplitude_deg", amp - 0.1), rate(d, "swing.amplitude_deg", amp + 0.1)),
        ]
        lines = r.budget.lines
        assert [line.cause for line in lines] == ["Temperature", "Air pressure", "Semi-arc"]
        for line, (lo, hi) in zip(lines, expected, strict=True):
            assert line.rate_at_low_s_per_day == pytest.approx(lo, rel=1e-9, abs=1e-9)
            assert line.rate_at_high_s_per_day == pytest.approx(hi, rel=1e-9, abs=1e-9)
            assert line.spread_s_per_day == pytest.approx(hi - lo, rel=1e-7, abs=1e-9)
        spreads = [hi - lo for lo, hi in expected]
        assert r.budget.worst_case_s_per_day == pytest.approx(sum(abs(s) for s in spreads),
                                                              rel=1e-7)
        assert r.budget.root_sum_square_s_per_day == pytest.approx(
            math.sqrt(sum(s * s for s in spreads)), rel=1e-7)
        report = r.report_dict()
        assert report["rate_budget_worst_case_s_per_day"] == pytest.approx(
            sum(abs(line["spread_s_per_day"]) for line in report["rate_budget"]), rel=1e-14)
