"""Reference tests for core/materials.py: each value within its published range.

Ranges: DOMAIN §3 (CRC Handbook [pub] / [pub, memory]; ASM [pub, memory]; ASTM F1684 [pub];
USDA Wood Handbook ch. 4 [pub, memory]).
"""

from __future__ import annotations

import pytest

from core.materials import MATERIALS, material

# key: (α low, α high) in 1e-6/K, (ρ low, ρ high) in kg/m³ — DOMAIN §3
PUBLISHED = {
    "steel": ((11.0, 13.0), (7800, 7900)),        # ASM/CRC [pub, memory]; ρ 7850
    "brass": ((18.0, 21.0), (8400, 8700)),        # CRC [pub, memory]; ρ ≈ 8500
    "invar": ((0.6, 2.7), (8000, 8100)),          # ASTM F1684 [pub]; ρ ≈ 8050
    "aluminium": ((23.1, 23.1), (2690, 2710)),    # CRC 23.1 [pub]; ρ 2700
    "lead": ((28.9, 28.9), (11300, 11400)),       # CRC 28.9 [pub]; ρ 11340
    "cast_iron": ((10.0, 12.0), (7000, 7400)),    # ASM [pub, memory]; ρ ≈ 7200
    "wood": ((3.0, 5.0), (400, 700)),             # USDA Wood Handbook ch. 4 [pub, memory]
    "fused_silica": ((0.5, 0.55), (2150, 2250)),  # CRC [pub, memory]: 0.52
    # compensation metals and wires
    "zinc": ((23.0, 35.0), (7100, 7180)),         # CRC 30.2, 7140; rolled zinc anisotropic
    "copper": ((16.4, 17.0), (8900, 8970)),       # CRC 16.5, 8960 [pub, memory]
    "tin": ((21.0, 23.5), (7260, 7300)),          # CRC 22.0, 7287 [pub, memory]
    "stainless_steel": ((16.0, 18.0), (7900, 8100)),  # ASTM A240 304 [pub, memory]
    "music_wire": ((11.0, 13.0), (7800, 7900)),   # as carbon steel [pub, memory]
    "spring_steel": ((11.0, 13.0), (7800, 7900)),  # as carbon steel [pub, memory]
}

# key: (E low, E high) in GPa — CRC / ASM / ASTM as in core/materials.py [pub, memory]
MODULUS = {"zinc": (90, 110), "copper": (110, 130), "tin": (40, 55),
           "stainless_steel": (190, 200), "music_wire": (200, 210), "spring_steel": (200, 210)}

# key: (tensile low, tensile high) in MPa [pub, memory]: ASTM A36 400–550; A240 304 ≥ 515;
# A228 ≈ 2000 near 2 mm; annealed copper ≈ 220; lead 12–18; A48 class 20 ≥ 138.
TENSILE = {"steel": (400, 550), "stainless_steel": (515, 620), "music_wire": (1700, 2800),
           "copper": (200, 250), "lead": (10, 20), "cast_iron": (138, 300)}


class TestMaterials:
    @pytest.mark.parametrize("key", sorted(PUBLISHED))
    def test_within_published_ranges(self, key: str) -> None:
        (a_lo, a_hi), (r_lo, r_hi) = PUBLISHED[key]
        m = material(key)
        assert a_lo * 1e-6 - 1e-12 <= m.expansion_per_k <= a_hi * 1e-6 + 1e-12
        assert r_lo <= m.density_kg_m3 <= r_hi
        assert m.source  # every value names its source

    def test_design_keys(self) -> None:
        # DESIGN §3 names these keys; more may be added.
        assert set(PUBLISHED) <= set(MATERIALS)

    def test_unknown(self) -> None:
        with pytest.raises(KeyError):
            material("unobtainium")


class TestAddedMaterials:
    # The values DESIGN §3 designs were made with must not move (results must not change).
    def test_existing_values_unchanged(self) -> None:
        got = {k: (m.density_kg_m3, m.expansion_per_k, m.youngs_modulus_pa)
               for k, m in MATERIALS.items()}
        assert got["steel"] == (7850.0, 11.5e-6, 200e9)
        assert got["invar"] == (8050.0, 1.2e-6, 141e9)
        assert got["cast_iron"] == (7200.0, 10.5e-6, 100e9)
        assert got["brass"] == (8500.0, 19.0e-6, 100e9)

    @pytest.mark.parametrize("key", sorted(MODULUS))
    def test_modulus(self, key: str) -> None:
        lo, hi = MODULUS[key]
        assert lo * 1e9 <= material(key).youngs_modulus_pa <= hi * 1e9

    @pytest.mark.parametrize("key", sorted(TENSILE))
    def test_tensile_strength(self, key: str) -> None:
        lo, hi = TENSILE[key]
        m = material(key)
        assert m.tensile_strength_pa is not None
        assert lo * 1e6 <= m.tensile_strength_pa <= hi * 1e6
        assert "tensile" in m.source

    def test_strength_is_yield_else_tensile(self) -> None:
        # Yield below tensile wherever both are given (definition of the two).
        for m in MATERIALS.values():
            if m.yield_strength_pa is not None:
                assert m.tensile_strength_pa is not None
                assert m.yield_strength_pa < m.tensile_strength_pa
                assert m.strength_pa == m.yield_strength_pa
        assert material("cast_iron").strength_pa == material("cast_iron").tensile_strength_pa
        assert material("wood").strength_pa is None

    def test_zinc_expands_most_of_the_compensation_metals(self) -> None:
        # CRC Handbook [pub, memory]: zinc 30.2 > aluminium 23.1 > brass 18–21 > copper 16.5
        a = {k: material(k).expansion_per_k for k in ("zinc", "aluminium", "brass", "copper")}
        assert a["zinc"] > a["aluminium"] > a["brass"] > a["copper"]
