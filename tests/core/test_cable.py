"""Reference tests for core/cable.py: elastic stretch, its rate change, and peak stress.

Hooke's law with the handbook modulus: ΔL = ∫T(z)dz/(EA); steel E = 200 GPa (ASM / CRC
handbooks [pub, memory]); steel density 7850 kg/m³ (same sources).
"""

from __future__ import annotations

import math
import types
from typing import Any

import pytest

from core import analyse, design_from_dict
from core.materials import MATERIALS

from _core_builders import G_N, LIGHT_KG, bob, clamp, design, point_pendulum, rod, weight

E_STEEL = 200e9  # Pa, ASM / CRC [pub, memory]
RHO_STEEL = 7850.0  # kg/m³, ASM / CRC [pub, memory]


def _exhibit(amplitude_deg: float = 3.0, wire_kg: float | None = None) -> Any:
    """DOMAIN §5's case: a 24 m steel wire 4 mm across carrying a 220 kg sphere at its end."""
    parts = [rod(length_m=24.0, diameter_m=0.004, mass_kg=wire_kg),
             bob("sphere", diameter_m=1e-5, mass_kg=220.0, mount=clamp(centre_m=24.0))]
    return analyse(design_from_dict(design(parts, amplitude_deg=amplitude_deg)))


class TestStretch:
    def test_hookes_law_wire_and_bob(self) -> None:
        # ΔL = g (m_bob L + m_wire L/2) / (E A): the bob's weight over the whole length, the
        # wire's own weight on average over half of it (Hooke's law).
        r = _exhibit()
        area = math.pi * 0.004**2 / 4
        m_wire = RHO_STEEL * area * 24.0
        expected = G_N * (220.0 * 24.0 + m_wire * 24.0 / 2) / (E_STEEL * area)
        assert r.cable.stretch_m == pytest.approx(expected, rel=1e-12)
        assert r.report_dict()["stretch_m"] == pytest.approx(expected, rel=1e-12)
        assert r.cable.stretch_m == pytest.approx(0.021, abs=0.001)  # DOMAIN §5: ≈ 21 mm

    def test_load_part_way_down(self) -> None:
        # A 5 kg weight 0.4 m down a 1 m light steel rod carrying a 10 kg bob at its end:
        # ΔL = g (5 × 0.4 + 10 × 1.0) / (E A) (Hooke's law, load entering at each point).
        parts = [rod(length_m=1.0, diameter_m=0.002, mass_kg=LIGHT_KG),
                 weight(mass_kg=5.0, at_m=0.4),
                 bob("sphere", diameter_m=1e-5, mass_kg=10.0, mount=clamp(centre_m=1.0))]
        r = analyse(design_from_dict(design(parts)))
        area = math.pi * 0.002**2 / 4
        expected = G_N * (5.0 * 0.4 + 10.0 * 1.0 + LIGHT_KG / 2) / (E_STEEL * area)
        assert r.cable.stretch_m == pytest.approx(expected, rel=1e-12)

    def test_stretch_rate_point_pendulum(self) -> None:
        # A 220 kg point bob on a 24 m light wire drops by ΔL = g m L/(EA); a point pendulum's
        # period is 2π√(L/g) [pub], so the clock loses 86400 (√(L/(L + ΔL)) − 1) s/day.
        r = _exhibit(wire_kg=LIGHT_KG)
        area = math.pi * 0.004**2 / 4
        stretch = G_N * 220.0 * 24.0 / (E_STEEL * area)
        expected = 86400 * (math.sqrt(24.0 / (24.0 + stretch)) - 1)
        assert r.cable.stretch_rate_s_per_day == pytest.approx(expected, rel=1e-6)
        # DOMAIN §5: ≈ 37 s/day for the 24 m wire with its own weight
        assert _exhibit().cable.stretch_rate_s_per_day == pytest.approx(-37.0, abs=1.5)


class TestPeakStress:
    @pytest.mark.parametrize("deg", [5.0, 60.0])
    def test_point_mass(self, deg: float) -> None:
        # The cable of a point pendulum pulls m g (3 − 2 cos θ₀) at the bottom of the swing
        # (DOMAIN §2); stress = that over πd²/4.
        r = analyse(design_from_dict(point_pendulum(1.3, amplitude_deg=deg)))
        area = math.pi * 1e-4**2 / 4
        expected = 1.0e4 * G_N * (3 - 2 * math.cos(math.radians(deg))) / area
        assert r.cable.peak_stress_pa == pytest.approx(expected, rel=1e-9)
        assert r.report_dict()["peak_stress_pa"] == pytest.approx(expected, rel=1e-9)

    def test_ratio_only_with_a_strength(self, monkeypatch: Any) -> None:
        # With the strengths taken out of the table: no ratio. With a yield strength of
        # 250 MPa (a value given here, not a material claim) the ratio is stress / 250 MPa.
        steel = MATERIALS["steel"]
        weak = types.SimpleNamespace(**{**vars(steel), "yield_strength_pa": None,
                                        "tensile_strength_pa": None})
        monkeypatch.setitem(MATERIALS, "steel", weak)
        r = _exhibit()
        assert r.cable.peak_stress_ratio is None
        assert r.report_dict()["peak_stress_ratio"] is None
        fake = types.SimpleNamespace(**{**vars(steel), "yield_strength_pa": 250e6})
        monkeypatch.setitem(MATERIALS, "steel", fake)
        r = _exhibit()
        assert r.cable.peak_stress_ratio == pytest.approx(r.cable.peak_stress_pa / 250e6,
                                                          rel=1e-15)
        assert r.cable.peak_stress_ratio_basis == "yield"
        assert r.cable.peak_stress_ratio > 0.2
        assert any("safety factor" in w for w in r.warnings)


class TestFormat2:
    def test_rods_in_series_and_a_users_material(self) -> None:
        # An upper steel rod carries a lower rod of the user's own material (E = 1.08e11 Pa,
        # given in the file) hanging from its lower end, and a bob at the bottom (DESIGN §8).
        # Hooke's law per rod: the upper one carries the lower rod and the bob over its whole
        # length, each its own weight over half of it.
        parts = [rod(name="upper", length_m=10.0, diameter_m=0.003, mass_kg=0.5),
                 rod(name="lower", material="own_zinc", length_m=10.0, diameter_m=0.004,
                     mass_kg=0.8),
                 bob("sphere", diameter_m=1e-5, mass_kg=50.0,
                     mount=clamp(on="lower", centre_m=20.0))]
        del parts[1]["top_m"]
        parts[1]["hangs_from"] = {"part": "upper", "end": "lower"}
        d = design(parts)
        d.update({"version": 2, "materials": {"own_zinc": {
            "name": "Zinc", "density_kg_m3": 7140.0, "expansion_per_k": 3.0e-5,
            "youngs_modulus_pa": 1.08e11, "source": "invented for the test"}}})
        r = analyse(design_from_dict(d))
        a_up, a_low = math.pi * 0.003**2 / 4, math.pi * 0.004**2 / 4
        up = G_N * (0.5 * 5.0 + (0.8 + 50.0) * 10.0) / (E_STEEL * a_up)
        low = G_N * (0.8 * 5.0 + 50.0 * 10.0) / (1.08e11 * a_low)
        by_name = {x.name: x for x in r.cable.rods}
        assert by_name["upper"].stretch_m == pytest.approx(up, rel=1e-9)
        assert by_name["lower"].stretch_m == pytest.approx(low, rel=1e-9)
        assert r.cable.stretch_m == pytest.approx(up + low, rel=1e-9)
        # the bob drops by both stretches: a point pendulum 20 m long [pub] with light rods
        # would lose 86400 (√(L/(L + ΔL)) − 1); the rods' own 1.3 kg shift this by < 3 %.
        expected = 86400 * (math.sqrt(20.0 / (20.0 + up + low)) - 1)
        assert r.cable.stretch_rate_s_per_day == pytest.approx(expected, rel=0.03)
