"""Reference tests for a bob with a central hole along the rod (``hole_diameter_m``, DESIGN §8).

The holed body is the bob less the part of it inside the bore x² + y² ≤ r² (z along the rod,
x across in the plane of swing, y along the pivot axis). Its volume, first moment and moment of
inertia about the pivot are checked against direct integration with scipy.integrate.tplquad
(relative tolerance 1e-12): the whole body as in test_mass_properties.py, less the bore region
integrated over its own limits, split where a limit changes branch so each piece is smooth.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np
import pytest
from scipy.integrate import tplquad
from scipy.optimize import brentq
from test_mass_properties import (
    EPS,
    along_z_cylinder,
    body_named,
    check_body,
    flat_body,
    rho,
    sphere_body,
)

from core import analyse, design_from_dict
from core.materials import MATERIALS

from _core_builders import bob, clamp, design, on_sleeve, rod, sleeve

Integrals = tuple[float, float, float]  # (V, ∫z dV, ∫(x² + z²) dV), z down from the pivot


def v2(parts: list[dict[str, Any]], **kw: Any) -> dict[str, Any]:
    d = design(parts, **kw)
    d["version"] = 2
    return d


def holed(b: dict[str, Any], hole_m: float) -> dict[str, Any]:
    return {**b, "hole_diameter_m": hole_m}


def minus(whole: Integrals, bore: Integrals) -> Integrals:
    return (whole[0] - bore[0], whole[1] - bore[1], whole[2] - bore[2])


def bore_of_sphere(radius: float, r: float, zc: float) -> Integrals:
    """The ball's part inside the bore: cylindrical (ρ, φ, z), ρ ≤ r, |z − zc| ≤ √(R² − ρ²)."""
    def vi(f: Any) -> float:
        return tplquad(lambda z, phi, p: f(p * math.cos(phi), z) * p, 0.0, r, 0.0, 2 * math.pi,
                       lambda p, phi: zc - math.sqrt(radius**2 - p * p),
                       lambda p, phi: zc + math.sqrt(radius**2 - p * p), **EPS)[0]
    return vi(lambda x, z: 1.0), vi(lambda x, z: z), vi(lambda x, z: x * x + z * z)


def bore_of_flat(radius: float, r: float, thickness: float, lens: bool, zc: float) -> Integrals:
    """A disc's or lens's part inside the bore. Body: x² + z² ≤ R², |y| ≤ t/2 (disc) or
    (t/2)(1 − (x² + z²)/R²) (lens). For x ∈ [0, r] (×2 by symmetry) y runs over
    [0, min(√(r² − x²), y_max(x))] (×2), with y_max the body's half-thickness on the line z = zc,
    and z over the slice |z − zc| ≤ √(A(y) − x²), A = R² or R²(1 − 2y/t)."""
    def edge(x: float) -> float:
        return math.sqrt(max(r * r - x * x, 0.0))

    def y_max(x: float) -> float:
        return thickness / 2 * (1 - x * x / radius**2) if lens else thickness / 2

    def reach(x: float, y: float) -> float:
        a = radius**2 * (1 - 2 * y / thickness) if lens else radius**2
        return math.sqrt(max(a - x * x, 0.0))

    grid = np.linspace(0.0, r, 401)
    gap = [edge(x) - y_max(x) for x in grid]
    cuts = [brentq(lambda x: edge(x) - y_max(x), grid[i], grid[i + 1], xtol=1e-16)
            for i in range(len(grid) - 1) if gap[i] * gap[i + 1] < 0]
    stops = [0.0, *cuts, r]

    def vi(f: Any) -> float:
        return 4 * sum(tplquad(lambda z, y, x: f(x, z), a, b, 0.0,
                               lambda x: min(edge(x), y_max(x)),
                               lambda x, y: zc - reach(x, y), lambda x, y: zc + reach(x, y),
                               **EPS)[0] for a, b in zip(stops[:-1], stops[1:], strict=True))
    return vi(lambda x, z: 1.0), vi(lambda x, z: z), vi(lambda x, z: x * x + z * z)


ROD = rod(material="steel", top_m=0.0, length_m=1.0, diameter_m=0.012)


class TestHoledShapes:
    def test_cylinder_is_a_coaxial_tube(self) -> None:
        b = holed(bob("cylinder", material="cast_iron", diameter_m=0.11, height_m=0.12,
                      mount=clamp(centre_m=0.9)), 0.014)
        got = body_named(v2([ROD, b]), "bob")
        check_body(got, along_z_cylinder(0.007, 0.055, 0.84, 0.96), rho("cast_iron"))

    def test_sphere(self) -> None:
        b = holed(bob("sphere", material="brass", diameter_m=0.1, mount=clamp(centre_m=0.95)),
                  0.02)
        got = body_named(v2([ROD, b]), "bob")
        check_body(got, minus(sphere_body(0.05, 0.95), bore_of_sphere(0.05, 0.01, 0.95)),
                   rho("brass"))
        # What is left is the napkin ring, (π/6)H³ with H its height (plain geometry).
        height = 2 * math.sqrt(0.05**2 - 0.01**2)
        assert got.volume_m3 == pytest.approx(math.pi / 6 * height**3, rel=1e-13)

    def test_sphere_given_mass(self) -> None:
        b = holed(bob("sphere", material="lead", diameter_m=0.08, mount=clamp(centre_m=1.0),
                      mass_kg=2.5), 0.03)
        got = body_named(v2([ROD, b]), "bob")
        check_body(got, minus(sphere_body(0.04, 1.0), bore_of_sphere(0.04, 0.015, 1.0)), None,
                   mass_kg=2.5)

    @pytest.mark.parametrize("hole", [0.01, 0.05], ids=["inside the faces", "through them"])
    def test_disc(self, hole: float) -> None:
        # The disc is 30 mm thick: a 10 mm bore stays inside it; a 50 mm bore opens a slot.
        b = holed(bob("disc", material="lead", diameter_m=0.15, thickness_m=0.03,
                      mount=clamp(centre_m=0.8)), hole)
        got = body_named(v2([ROD, b]), "bob")
        whole = flat_body(0.075, 0.8, lambda q: 0.015)
        check_body(got, minus(whole, bore_of_flat(0.075, hole / 2, 0.03, False, 0.8)),
                   rho("lead"))

    @pytest.mark.parametrize("hole", [0.012, pytest.param(0.06, marks=pytest.mark.slow)],
                             ids=["inside the faces", "through them"])
    def test_lens(self, hole: float) -> None:
        b = holed(bob("lens", material="brass", diameter_m=0.2, thickness_m=0.04,
                      mount=clamp(centre_m=0.85)), hole)
        got = body_named(v2([ROD, b]), "bob")
        whole = flat_body(0.1, 0.85, lambda q: 0.02 * (1.0 - q))
        check_body(got, minus(whole, bore_of_flat(0.1, hole / 2, 0.04, True, 0.85)),
                   rho("brass"))

    def test_warm_holed_cylinder_on_its_centre(self) -> None:
        # 40 K warm: every length of the bob ×(1 + α_lead·40), mass as at the reference; it
        # sits with its centre on the sleeve's top (DESIGN §8).
        parts = [ROD, sleeve(material="brass", length_m=0.2, outer_diameter_m=0.03,
                             inner_diameter_m=0.014),
                 {**holed(bob("cylinder", material="lead", diameter_m=0.1, height_m=0.1,
                              mount=on_sleeve()), 0.032), "support": "centre"}]
        got = body_named(v2(parts, temperature_c=60.0), "bob")
        g_lead = 1 + MATERIALS["lead"].expansion_per_k * 40
        g_steel = 1 + MATERIALS["steel"].expansion_per_k * 40
        g_brass = 1 + MATERIALS["brass"].expansion_per_k * 40
        zc = 1.0 * g_steel - 0.2 * g_brass
        mass = rho("lead") * math.pi * (0.05**2 - 0.016**2) * 0.1
        check_body(got, along_z_cylinder(0.016 * g_lead, 0.05 * g_lead, zc - 0.05 * g_lead,
                                         zc + 0.05 * g_lead), None, mass_kg=mass)

    def test_warm_holed_lens(self) -> None:
        # The bore scales with the lens: the integrals at the grown size, the mass at the
        # reference one.
        b = holed(bob("lens", material="brass", diameter_m=0.2, thickness_m=0.04,
                      mount=clamp(centre_m=0.85)), 0.03)
        got = body_named(v2([ROD, b], temperature_c=-10.0), "bob")
        g = 1 - MATERIALS["brass"].expansion_per_k * 30
        zc = 0.85 * (1 - MATERIALS["steel"].expansion_per_k * 30)
        cold = minus(flat_body(0.1 * g, zc, lambda q: 0.02 * g * (1.0 - q)),
                     bore_of_flat(0.1 * g, 0.015 * g, 0.04 * g, True, zc))
        reference = minus(flat_body(0.1, 0.85, lambda q: 0.02 * (1.0 - q)),
                          bore_of_flat(0.1, 0.015, 0.04, True, 0.85))
        check_body(got, cold, None, mass_kg=rho("brass") * reference[0])


def test_a_hole_changes_the_period_only_through_mass_and_inertia() -> None:
    # Same bob with and without a bore, given mass: M h is unchanged (the centre stays), and
    # I falls by m·(k²_solid − k²_holed) for the coaxial tube (HRW table [pub, memory]).
    solid = bob("cylinder", material="lead", diameter_m=0.1, height_m=0.1, mass_kg=5.0,
                mount=clamp(centre_m=0.95))
    a = analyse(design_from_dict(v2([ROD, solid])))
    b = analyse(design_from_dict(v2([ROD, holed(solid, 0.02)])))
    assert b.centre_of_mass_m == pytest.approx(a.centre_of_mass_m, rel=1e-15)
    assert a.inertia_pivot_kg_m2 - b.inertia_pivot_kg_m2 == pytest.approx(
        5.0 * (3 * 0.05**2 + 0.1**2) / 12 - 5.0 * (3 * (0.05**2 + 0.01**2) + 0.1**2) / 12,
        rel=1e-9)
