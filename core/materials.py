"""Materials a part may be made of: density, linear expansion and Young's modulus.

Each value carries its source. "[pub]" marks a published handbook value whose text was
confirmed; "[pub, memory]" a handbook value cited from memory; ranges note how much real
stock varies. Values are near 20 °C.
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
    """

    key: str
    label: str
    density_kg_m3: float
    expansion_per_k: float
    youngs_modulus_pa: float
    source: str


MATERIALS: dict[str, Material] = {
    m.key: m
    for m in (
        Material("steel", "Carbon steel", 7850.0, 11.5e-6, 200e9,
                 "ASM Metals Handbook / CRC Handbook: carbon steel α 11–13e-6/K, "
                 "ρ 7850, E ≈ 200 GPa [pub, memory]"),
        Material("brass", "Brass", 8500.0, 19.0e-6, 100e9,
                 "CRC Handbook: brass α 18–21e-6/K, ρ ≈ 8500, E ≈ 100 GPa [pub, memory]"),
        Material("invar", "Invar (Fe-36Ni)", 8050.0, 1.2e-6, 141e9,
                 "ASTM F1684: α 0.6–2.7e-6/K by heat treatment; ρ ≈ 8050, E ≈ 141 GPa "
                 "[pub, memory]"),
        Material("aluminium", "Aluminium", 2700.0, 23.1e-6, 69e9,
                 "CRC Handbook: α 23.1e-6/K [pub]; ρ 2700, E ≈ 69 GPa [pub, memory]"),
        Material("lead", "Lead", 11340.0, 28.9e-6, 16e9,
                 "CRC Handbook: α 28.9e-6/K [pub]; ρ 11340, E ≈ 16 GPa [pub, memory]"),
        Material("cast_iron", "Cast iron (grey)", 7200.0, 10.5e-6, 100e9,
                 "ASM Metals Handbook, grey cast iron: α 10–11e-6/K, ρ ≈ 7200, "
                 "E 80–140 GPa [pub, memory]"),
        Material("wood", "Wood, along the grain", 550.0, 4.0e-6, 11e9,
                 "USDA Wood Handbook ch. 4–5: α along the grain 3–5e-6/K; ρ 400–700 by "
                 "species (550 taken); E along the grain ≈ 8–14 GPa [pub, memory]"),
        Material("fused_silica", "Fused silica", 2200.0, 0.52e-6, 72e9,
                 "CRC Handbook / manufacturers' data: α 0.52e-6/K, ρ 2200, E ≈ 72 GPa "
                 "[pub, memory]"),
    )
}


def material(key: str) -> Material:
    """Return the material called ``key`` (raises ``KeyError`` when unknown)."""
    return MATERIALS[key]
