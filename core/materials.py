"""Materials a part may be made of: density, linear expansion, Young's modulus and strength.

Each value carries its source. "[pub]" marks a published handbook value whose text was
confirmed; "[pub, memory]" a handbook value cited from memory; ranges note how much real
stock varies. Values are near 20 °C. Strengths are minimum or typical figures for the
condition named (softest common temper where tempers differ), for cautions only: ideal figures
with no safety factor. Liquids (a mercury jar) are out of scope: a part here is a solid body.
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["Material", "MATERIALS", "material"]


@dataclass(frozen=True)
class Material:
    """Bulk properties of one material.

    Attributes
    ----------
    key : str
        The name used in design files.
    density_kg_m3 : float
        Density, kg/m³.
    expansion_per_k : float
        Linear thermal expansion coefficient α, 1/K.
    youngs_modulus_pa : float
        Young's modulus E, Pa.
    source : str
        Where the values come from.
    yield_strength_pa : float or None
        Yield (0.2 % proof) strength, Pa, where the material has one and it is sourced.
    tensile_strength_pa : float or None
        Ultimate tensile strength, Pa, where sourced.
    """

    key: str
    label: str
    density_kg_m3: float
    expansion_per_k: float
    youngs_modulus_pa: float
    source: str
    yield_strength_pa: float | None = None
    tensile_strength_pa: float | None = None

    @property
    def strength_pa(self) -> float | None:
        """The stress a part must stay well below, Pa: the yield strength where known, else
        the tensile strength (brittle materials), else None. No safety factor."""
        return self.yield_strength_pa if self.yield_strength_pa is not None \
            else self.tensile_strength_pa


MATERIALS: dict[str, Material] = {
    m.key: m
    for m in (
        Material("steel", "Carbon steel", 7850.0, 11.5e-6, 200e9,
                 "ASM Metals Handbook / CRC Handbook: carbon steel α 11–13e-6/K, "
                 "ρ 7850, E ≈ 200 GPa [pub, memory]; strength: ASTM A36 minimum yield "
                 "250 MPa, tensile 400–550 MPa [pub, memory]", 250e6, 400e6),
        Material("brass", "Brass", 8500.0, 19.0e-6, 100e9,
                 "CRC Handbook: brass α 18–21e-6/K, ρ ≈ 8500, E ≈ 100 GPa [pub, memory]; "
                 "strength: ASM, cartridge brass C26000 annealed, yield ≈ 75 MPa, tensile "
                 "≈ 300 MPa (hard tempers far higher) [pub, memory]", 75e6, 300e6),
        Material("invar", "Invar (Fe-36Ni)", 8050.0, 1.2e-6, 141e9,
                 "ASTM F1684: α 0.6–2.7e-6/K by heat treatment; ρ ≈ 8050, E ≈ 141 GPa "
                 "[pub, memory]; strength annealed: yield ≈ 240 MPa, tensile ≈ 450 MPa "
                 "(manufacturers' data [pub, memory])", 240e6, 450e6),
        Material("aluminium", "Aluminium", 2700.0, 23.1e-6, 69e9,
                 "CRC Handbook: α 23.1e-6/K [pub]; ρ 2700, E ≈ 69 GPa [pub, memory]; "
                 "strength: ASM, 1100-O (soft, nearly pure) yield ≈ 34 MPa, tensile ≈ 90 MPa; "
                 "alloys such as 6061-T6 reach 275/310 MPa [pub, memory]", 34e6, 90e6),
        Material("lead", "Lead", 11340.0, 28.9e-6, 16e9,
                 "CRC Handbook: α 28.9e-6/K [pub]; ρ 11340, E ≈ 16 GPa [pub, memory]; "
                 "strength: tensile ≈ 12–18 MPa, creeps under steady load at room "
                 "temperature (ASM [pub, memory])", None, 12e6),
        Material("cast_iron", "Cast iron (grey)", 7200.0, 10.5e-6, 100e9,
                 "ASM Metals Handbook, grey cast iron: α 10–11e-6/K, ρ ≈ 7200, "
                 "E 80–140 GPa [pub, memory]; strength: ASTM A48 class 20 minimum tensile "
                 "138 MPa, brittle, no yield [pub, memory]", None, 138e6),
        Material("wood", "Wood, along the grain", 550.0, 4.0e-6, 11e9,
                 "USDA Wood Handbook ch. 4–5: α along the grain 3–5e-6/K; ρ 400–700 by "
                 "species (550 taken); E along the grain ≈ 8–14 GPa [pub, memory]"),
        Material("fused_silica", "Fused silica", 2200.0, 0.52e-6, 72e9,
                 "CRC Handbook / manufacturers' data: α 0.52e-6/K, ρ 2200, E ≈ 72 GPa "
                 "[pub, memory]"),
        # Compensation metals and wires
        Material("zinc", "Zinc", 7140.0, 30.2e-6, 108e9,
                 "CRC Handbook: α 30.2e-6/K at 25 °C, ρ 7140, E ≈ 108 GPa [pub, memory]; "
                 "rolled zinc is anisotropic (α 23–35e-6/K by direction; one trade table "
                 "gives 31.2e-6/K over 20–100 °C) — measure the stock for a null; tensile "
                 "≈ 28 MPa cast, ≈ 126 MPa rolled along the grain (zinc industry data "
                 "[pub])", None, 28e6),
        Material("copper", "Copper", 8960.0, 16.5e-6, 117e9,
                 "CRC Handbook: α 16.5e-6/K, ρ 8960, E 110–128 GPa (117 taken) "
                 "[pub, memory]; strength annealed: yield ≈ 70 MPa, tensile ≈ 220 MPa "
                 "(ASM, C11000 [pub, memory])", 70e6, 220e6),
        Material("tin", "Tin (white)", 7287.0, 22.0e-6, 50e9,
                 "CRC Handbook: α 22.0e-6/K, ρ 7287, E ≈ 50 GPa [pub, memory]; tensile "
                 "≈ 15 MPa, creeps [pub, memory]; pewter varies with its alloy and is "
                 "not listed", None, 15e6),
        Material("stainless_steel", "Stainless steel (304)", 8000.0, 17.3e-6, 193e9,
                 "ASM / ASTM A240 type 304: α 17.3e-6/K (0–100 °C), ρ 8000, E 193 GPa; "
                 "minimum yield 205 MPa, tensile 515 MPa, annealed [pub, memory]",
                 205e6, 515e6),
        Material("music_wire", "Music wire (ASTM A228)", 7850.0, 11.5e-6, 207e9,
                 "ASTM A228 music spring wire: ρ 7850, E ≈ 207 GPa, α as carbon steel; "
                 "minimum tensile strength ≈ 2.0 GPa near 2 mm diameter, higher for "
                 "thinner wire, lower for thicker [pub, memory]", None, 2.0e9),
        Material("spring_steel", "Spring steel (hardened)", 7850.0, 11.5e-6, 205e9,
                 "ASM, hardened and tempered high-carbon steel strip (AISI 1095 class): "
                 "ρ 7850, E ≈ 205 GPa, α as carbon steel, tensile 1.5–2.0 GPa (1.5 taken), "
                 "yield ≈ 1.2 GPa [pub, memory]", 1.2e9, 1.5e9),
    )
}


def material(key: str) -> Material:
    """Return the material called ``key`` (raises ``KeyError`` when unknown)."""
    return MATERIALS[key]
