"""Reference tests for core/mass_properties.py: every part shape, the totals, the mount chain.

Each shape's mass, centre and moment of inertia about the pivot are checked against direct
numerical integration over the body's volume (scipy.integrate.tplquad, relative tolerance
1e-12): M = ∫ρ dV, M z_c = ∫ρ z dV, I = ∫ρ (x² + z²) dV, with z down from the pivot, x across in
the plane of swing and y along the pivot axis (the rotation axis, perpendicular to the plane of
swing). Geometry of each part as DESIGN §3 describes it.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from fractions import Fraction
from typing import Any

import pytest
from scipy.integrate import tplquad

from core import analyse, design_from_dict
from core.mass_properties import Body, layout, mass_properties
from core.materials import MATERIALS

from _core_builders import G_N, bob, clamp, design, on_sleeve, rod, sleeve, weight

EPS = dict(epsabs=0.0, epsrel=1e-12)
Integrand = Callable[[float, float], float]  # f(x, z); y never enters ρ(x² + z²)


def _integrals(volume_integral: Callable[[Integrand], float]) -> tuple[float, float, float]:
    """(V, ∫z dV, ∫(x² + z²) dV) of one body."""
    return (volume_integral(lambda x, z: 1.0), volume_integral(lambda x, z: z),
            volume_integral(lambda x, z: x * x + z * z))


def along_z_cylinder(r_in: float, r_out: float, z0: float, z1: float) -> tuple[float, float, float]:
    """Solid or hollow round body with its axis along z (rod, sleeve, upright cylinder):
    cylindrical coordinates (r, φ, z), volume element r dr dφ dz."""
    def vi(f: Integrand) -> float:
        return tplquad(lambda z, phi, r: f(r * math.cos(phi), z) * r, r_in, r_out,
                       0.0, 2.0 * math.pi, z0, z1, **EPS)[0]
    return _integrals(vi)


def sphere_body(radius: float, zc: float) -> tuple[float, float, float]:
    """Ball: Cartesian x, y, z with z inside ±√(R² − x² − y²) of the centre."""
    def vi(f: Integrand) -> float:
        return tplquad(lambda z, y, x: f(x, z), -radius, radius,
                       lambda x: -math.sqrt(max(radius**2 - x * x, 0.0)),
                       lambda x: math.sqrt(max(radius**2 - x * x, 0.0)),
                       lambda x, y: zc - math.sqrt(max(radius**2 - x * x - y * y, 0.0)),
                       lambda x, y: zc + math.sqrt(max(radius**2 - x * x - y * y, 0.0)), **EPS)[0]
    return _integrals(vi)


def flat_body(radius: float, zc: float, half_thickness: Callable[[float], float]
              ) -> tuple[float, float, float]:
    """Round outline in the plane of swing (x, z), thickness along y of 2·half(r²/R²):
    the disc (constant) or the lens (paraboloidal). Order: x, then z, then y."""
    def vi(f: Integrand) -> float:
        return tplquad(lambda y, z, x: f(x, z), -radius, radius,
                       lambda x: zc - math.sqrt(max(radius**2 - x * x, 0.0)),
                       lambda x: zc + math.sqrt(max(radius**2 - x * x, 0.0)),
                       lambda x, z: -half_thickness((x * x + (z - zc) ** 2) / radius**2),
                       lambda x, z: half_thickness((x * x + (z - zc) ** 2) / radius**2), **EPS)[0]
    return _integrals(vi)


def body_named(d: dict[str, Any], name: str, temperature_c: float | None = None) -> Body:
    bodies = layout(design_from_dict(d), temperature_c)
    return next(b for b in bodies if b.name == name)


def check_body(b: Body, integrals: tuple[float, float, float], density: float | None,
               mass_kg: float | None = None) -> None:
    """Mass (ρV, or the given mass), centre and pivot inertia against the integrals."""
    volume, first, second = integrals
    rho = mass_kg / volume if mass_kg is not None else density
    assert rho is not None
    assert b.mass_kg == pytest.approx(rho * volume, rel=1e-11, abs=0)
    assert b.volume_m3 == pytest.approx(volume, rel=1e-11, abs=0)
    assert b.centre_m == pytest.approx(first / volume, rel=1e-11, abs=1e-14)
    inertia_pivot = b.inertia_centre_kg_m2 + b.mass_kg * b.centre_m**2
    assert inertia_pivot == pytest.approx(rho * second, rel=1e-11, abs=0)


def rho(material: str) -> float:
    return MATERIALS[material].density_kg_m3  # the material table is the input, not the result


# ----------------------------------------------------------------------------------------------

class TestLayout:
    ROD = rod(material="steel", top_m=0.1, length_m=0.9, diameter_m=0.012)

    def test_rod(self) -> None:
        b = body_named(design([self.ROD]), "rod")
        check_body(b, along_z_cylinder(0.0, 0.006, 0.1, 1.0), rho("steel"))

    def test_rod_given_mass(self) -> None:
        # A given mass wins over density × volume (DESIGN §3); the distribution stays uniform.
        b = body_named(design([{**self.ROD, "mass_kg": 0.75}]), "rod")
        check_body(b, along_z_cylinder(0.0, 0.006, 0.1, 1.0), None, mass_kg=0.75)

    def test_sleeve(self) -> None:
        # A tube standing on the lower end of its rod (z = 1.0 m), 0.2 m long.
        parts = [self.ROD, sleeve(material="brass", length_m=0.2, outer_diameter_m=0.03,
                                  inner_diameter_m=0.014)]
        b = body_named(design(parts), "sleeve")
        check_body(b, along_z_cylinder(0.007, 0.015, 0.8, 1.0), rho("brass"))

    def test_disc_bob(self) -> None:
        # Flat cylinder, faces parallel to the plane of swing: round in (x, z), thickness in y.
        parts = [self.ROD, bob("disc", material="lead", diameter_m=0.15, thickness_m=0.03,
                               mount=clamp(centre_m=0.8))]
        b = body_named(design(parts), "bob")
        check_body(b, flat_body(0.075, 0.8, lambda s: 0.015), rho("lead"))

    def test_lens_bob(self) -> None:
        # Biconvex lens, outline in the plane of swing, thickness t(r) = t(1 − r²/R²).
        parts = [self.ROD, bob("lens", material="brass", diameter_m=0.2, thickness_m=0.04,
                               mount=clamp(centre_m=0.85))]
        b = body_named(design(parts), "bob")
        check_body(b, flat_body(0.1, 0.85, lambda s: 0.02 * (1.0 - s)), rho("brass"))

    def test_lens_bob_given_mass(self) -> None:
        parts = [self.ROD, bob("lens", material="brass", diameter_m=0.2, thickness_m=0.04,
                               mount=clamp(centre_m=0.85), mass_kg=4.0)]
        b = body_named(design(parts), "bob")
        check_body(b, flat_body(0.1, 0.85, lambda s: 0.02 * (1.0 - s)), None, mass_kg=4.0)

    def test_cylinder_bob(self) -> None:
        # Upright cylinder, axis along the rod.
        parts = [self.ROD, bob("cylinder", material="cast_iron", diameter_m=0.11, height_m=0.12,
                               mount=clamp(centre_m=0.9))]
        b = body_named(design(parts), "bob")
        check_body(b, along_z_cylinder(0.0, 0.055, 0.84, 0.96), rho("cast_iron"))

    def test_sphere_bob(self) -> None:
        parts = [self.ROD, bob("sphere", material="brass", diameter_m=0.1,
                               mount=clamp(centre_m=1.02))]
        b = body_named(design(parts), "bob")
        check_body(b, sphere_body(0.05, 1.02), rho("brass"))

    def test_bob_on_sleeve(self) -> None:
        # A bob resting on the sleeve top: centre = rod end − sleeve length − half height.
        parts = [self.ROD, sleeve(length_m=0.2, outer_diameter_m=0.03, inner_diameter_m=0.014),
                 bob("cylinder", material="lead", diameter_m=0.1, height_m=0.1,
                     mount=on_sleeve())]
        b = body_named(design(parts), "bob")
        check_body(b, along_z_cylinder(0.0, 0.05, 0.7, 0.8), rho("lead"))

    def test_point_weight(self) -> None:
        # A point mass: I = m z², centre at z (DOMAIN §2 table: I_c = 0).
        b = body_named(design([self.ROD, weight(mass_kg=0.02, at_m=0.4)]), "trim")
        assert b.mass_kg == 0.02
        assert b.centre_m == pytest.approx(0.4, rel=1e-15)
        assert b.inertia_centre_kg_m2 + b.mass_kg * b.centre_m**2 == pytest.approx(
            0.02 * 0.4**2, rel=1e-15)

    def test_sphere_bob_warm(self) -> None:
        # 40 K above the reference, the ball (on a clamp) is 1 + α_brass·40 larger and its centre
        # moves with the steel rod; its mass is unchanged (DESIGN §3 Temperature).
        parts = [self.ROD, bob("sphere", material="brass", diameter_m=0.1,
                               mount=clamp(centre_m=1.02))]
        b = body_named(design(parts, temperature_c=60.0), "bob")
        grow_b = 1 + MATERIALS["brass"].expansion_per_k * 40
        grow_r = 1 + MATERIALS["steel"].expansion_per_k * 40
        zc = 0.1 + 0.92 * grow_r
        integrals = sphere_body(0.05 * grow_b, zc)
        mass = rho("brass") * 4 / 3 * math.pi * 0.05**3
        check_body(b, integrals, None, mass_kg=mass)


class TestMassProperties:
    def test_totals_are_sums_of_integrals(self) -> None:
        # Σ over a rod, sleeve, bob on the sleeve and a trim weight of the integrated values.
        parts = [rod(material="steel", top_m=0.0, length_m=1.0, diameter_m=0.01),
                 sleeve(material="brass", length_m=0.1, outer_diameter_m=0.024,
                        inner_diameter_m=0.012),
                 bob("sphere", material="lead", diameter_m=0.08, mount=on_sleeve()),
                 weight(mass_kg=0.05, at_m=0.3)]
        mp = mass_properties(layout(design_from_dict(design(parts))))
        pieces = [(rho("steel"), along_z_cylinder(0.0, 0.005, 0.0, 1.0)),
                  (rho("brass"), along_z_cylinder(0.006, 0.012, 0.9, 1.0)),
                  (rho("lead"), sphere_body(0.04, 0.86))]
        mass = sum(r * v for r, (v, _, _) in pieces) + 0.05
        first = sum(r * f for r, (_, f, _) in pieces) + 0.05 * 0.3
        second = sum(r * s for r, (_, _, s) in pieces) + 0.05 * 0.3**2
        assert mp.mass_kg == pytest.approx(mass, rel=1e-11)
        assert mp.first_moment_kg_m == pytest.approx(first, rel=1e-11)
        assert mp.inertia_pivot_kg_m2 == pytest.approx(second, rel=1e-11)
        assert mp.centre_of_mass_m == pytest.approx(first / mass, rel=1e-11)
        assert mp.equivalent_length_m == pytest.approx(second / first, rel=1e-11)

    def test_vacuum_has_no_air_terms(self) -> None:
        parts = [rod(), bob("sphere", mount=clamp(centre_m=1.0))]
        mp = mass_properties(layout(design_from_dict(design(parts))), 0.0)
        assert mp.displaced_first_moment_kg_m == 0.0 and mp.added_inertia_kg_m2 == 0.0

    def test_air_terms(self) -> None:
        # Buoyancy: Σ ρ V z; added inertia of a sphere: C ρ V z² with C = 1/2 (Lamb §92
        # [pub, memory]) — the ball's volume from the integral.
        parts = [rod(diameter_m=1e-4, mass_kg=1e-6), bob("sphere", diameter_m=0.1,
                                                        mount=clamp(centre_m=1.0))]
        bodies = layout(design_from_dict(design(parts)))
        rho_air = 1.2
        mp = mass_properties(bodies, rho_air)
        v_ball = sphere_body(0.05, 1.0)[0]
        v_rod = math.pi * 0.5e-4**2 * 1.0
        assert mp.displaced_first_moment_kg_m == pytest.approx(
            rho_air * (v_ball * 1.0 + v_rod * 0.5), rel=1e-11)
        rod_body = bodies[0]
        ball_added = 0.5 * rho_air * v_ball * 1.0**2
        rod_added = rho_air * rod_body.added_mass_coefficient * v_rod * (0.5**2 + 1.0 / 12)
        assert mp.added_inertia_kg_m2 == pytest.approx(ball_added + rod_added, rel=1e-11)


class TestCompoundExample:
    # DOMAIN §3 compound example [computed]: uniform rod 1.000 m, 0.25 kg, pivoted at its top;
    # thin disc R = 0.075 m, 3.0 kg, in its own plane, centre 0.950 m down; vacuum, g = g_n.
    # The rod is 10 µm thick (its d²/16 term is 6e-13 of I).
    def _result(self) -> Any:
        parts = [rod(length_m=1.0, diameter_m=1e-5, mass_kg=0.25),
                 bob("disc", diameter_m=0.15, thickness_m=0.01, mass_kg=3.0,
                     mount=clamp(centre_m=0.95))]
        return analyse(design_from_dict(design(parts, pressure_hpa=0.0, g_m_s2=G_N)))

    def test_published_values(self) -> None:
        r = self._result()
        assert r.inertia_pivot_kg_m2 == pytest.approx(2.7992708333, rel=0, abs=6e-11)  # DOMAIN
        assert r.centre_of_mass_m == pytest.approx(0.9153846154, rel=0, abs=6e-11)  # DOMAIN
        assert r.equivalent_length_m == pytest.approx(0.9409313725, rel=0, abs=6e-11)  # DOMAIN
        assert r.period_small_s == pytest.approx(1.9462494600, rel=0, abs=6e-11)  # DOMAIN
        assert r.mass_kg == pytest.approx(3.25, rel=1e-15)

    def test_exact_fractions(self) -> None:
        # The same figures from exact fractions: I = mℓ²/3 + M(R²/2 + z²), M h = mℓ/2 + M z —
        # HRW table [pub, memory] with the parallel-axis theorem; T₀ = 2π√(I/(g M h)).
        i = Fraction(1, 4) / 3 + 3 * (Fraction(75, 1000) ** 2 / 2 + Fraction(95, 100) ** 2)
        mh = Fraction(1, 4) / 2 + 3 * Fraction(95, 100)
        r = self._result()
        assert r.inertia_pivot_kg_m2 == pytest.approx(float(i), rel=1e-12)
        assert r.centre_of_mass_m == pytest.approx(float(mh / Fraction(13, 4)), rel=1e-12)
        assert r.equivalent_length_m == pytest.approx(float(i / mh), rel=1e-12)
        assert r.centre_of_oscillation_m == pytest.approx(float(i / mh), rel=1e-12)
        assert r.period_small_s == pytest.approx(
            2 * math.pi * math.sqrt(float(i) / (G_N * float(mh))), rel=1e-12)


class TestUniformRod:
    @pytest.mark.parametrize("length", [0.3, 1.0, 4.5])
    def test_equivalent_length_two_thirds(self, length: float) -> None:
        # Uniform rod pivoted at its end: L_eq = 2ℓ/3 (DOMAIN §2 [pub, memory: HRW]); a 10 µm
        # rod's own width adds d²/(8ℓ) ≤ 4.2e-11 m (exactly, from I = m(ℓ²/3 + d²/16)).
        d = design([rod(length_m=length, diameter_m=1e-5, mass_kg=0.4)])
        r = analyse(design_from_dict(d))
        assert r.equivalent_length_m == pytest.approx(2 * length / 3, rel=0, abs=5e-11)
        assert r.equivalent_length_m == pytest.approx(2 * length / 3 + 1e-10 / (8 * length),
                                                      rel=1e-14)
        assert r.centre_of_mass_m == pytest.approx(length / 2, rel=1e-14)
        assert r.inertia_pivot_kg_m2 == pytest.approx(0.4 * (length**2 / 3 + 1e-10 / 16),
                                                      rel=1e-14)
        assert r.peak_speed_m_s is None  # no bob: documented as None


class TestMountChain:
    # DESIGN §3 Temperature: every length scales with its own material; a clamp point and a trim
    # weight move with the rod above them; a sleeve stands on the moving rod end and grows
    # upward; a bob on the sleeve rests on its top and grows about its centre. The α values are
    # the inputs from core.materials.
    DT = 30.0

    def _bodies(self) -> dict[str, Body]:
        parts = [rod(material="steel", top_m=0.1, length_m=1.0, diameter_m=0.01),
                 sleeve(material="brass", length_m=0.2, outer_diameter_m=0.03,
                        inner_diameter_m=0.012),
                 bob("cylinder", material="lead", diameter_m=0.1, height_m=0.12,
                     mount=on_sleeve()),
                 bob("disc", name="clamped", material="cast_iron", diameter_m=0.1,
                     thickness_m=0.02, mount=clamp(centre_m=0.6)),
                 weight(mass_kg=0.01, at_m=0.5)]
        d = design_from_dict(design(parts, reference_temperature_c=20.0, temperature_c=20.0))
        return {b.name: b for b in layout(d, 20.0 + self.DT)}

    @staticmethod
    def grow(material: str, dt: float) -> float:
        return 1.0 + MATERIALS[material].expansion_per_k * dt

    def test_rod_hangs_from_its_top(self) -> None:
        b = self._bodies()["rod"]
        assert b.top_m == pytest.approx(0.1, abs=1e-15)
        assert b.bottom_m == pytest.approx(0.1 + 1.0 * self.grow("steel", self.DT), abs=1e-14)

    def test_clamp_and_weight_move_with_rod(self) -> None:
        bodies = self._bodies()
        g = self.grow("steel", self.DT)
        assert bodies["clamped"].centre_m == pytest.approx(0.1 + 0.5 * g, abs=1e-14)
        assert bodies["trim"].centre_m == pytest.approx(0.1 + 0.4 * g, abs=1e-14)

    def test_bob_on_sleeve(self) -> None:
        # centre = rod end − sleeve length − half height, each with its own α.
        bodies = self._bodies()
        rod_end = 0.1 + 1.0 * self.grow("steel", self.DT)
        sleeve_top = rod_end - 0.2 * self.grow("brass", self.DT)
        assert bodies["sleeve"].bottom_m == pytest.approx(rod_end, abs=1e-14)
        assert bodies["sleeve"].top_m == pytest.approx(sleeve_top, abs=1e-14)
        assert bodies["bob"].centre_m == pytest.approx(
            sleeve_top - 0.06 * self.grow("lead", self.DT), abs=1e-14)

    def test_masses_do_not_change(self) -> None:
        warm = self._bodies()
        self.DT = 0.0
        cold = self._bodies()
        for name, b in warm.items():
            assert b.mass_kg == pytest.approx(cold[name].mass_kg, rel=1e-14), name
        # and the rod's is ρ V at the reference temperature
        assert warm["rod"].mass_kg == pytest.approx(rho("steel") * math.pi * 0.005**2 * 1.0,
                                                    rel=1e-13)
