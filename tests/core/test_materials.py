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
}


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
