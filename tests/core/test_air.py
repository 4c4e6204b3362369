"""Reference tests for core/air.py: dry-air density and the ellipsoid added-mass coefficient.

Added mass: for an ellipsoid of semi-axes a (along the motion), b, c in ideal flow,
C = α₀/(2 − α₀), α₀ = abc ∫₀^∞ dλ / ((a² + λ) Δ(λ)), Δ = √((a²+λ)(b²+λ)(c²+λ)) (Lamb,
Hydrodynamics §114–115 [pub, memory]). The integral is evaluated here with mpmath.quad at 40
digits (the core uses Carlson's R_D from scipy).
"""

from __future__ import annotations

import mpmath
import pytest

from core.air import DRY_AIR_GAS_CONSTANT, air_density, ellipsoid_added_mass_coefficient

mpmath.mp.dps = 40


def mp_added_mass(a: float, b: float, c: float) -> mpmath.mpf:
    """C = α₀/(2 − α₀) with α₀ from mpmath.quad at 40 digits."""
    a, b, c = (mpmath.mpf(x) for x in (a, b, c))

    def integrand(lam: mpmath.mpf) -> mpmath.mpf:
        delta = mpmath.sqrt((a * a + lam) * (b * b + lam) * (c * c + lam))
        return 1 / ((a * a + lam) * delta)

    scale = max(a, b, c) ** 2
    alpha0 = a * b * c * mpmath.quad(integrand, [0, scale / 100, scale, 100 * scale, mpmath.inf])
    return alpha0 / (2 - alpha0)


class TestAirDensity:
    def test_isa_sea_level(self) -> None:
        # ISA: 1.225 kg/m³ at 15 °C, 101325 Pa — ISO 2533 [pub, memory]. The core's dry-air
        # constant 287.05 (ISA: 287.05287) leaves 1.1e-5 relative.
        assert air_density(1013.25, 15.0) == pytest.approx(1.225, rel=2e-5, abs=0)

    def test_ideal_gas(self) -> None:
        # ρ = p/(R_d T), R_d = 287.05 J/(kg·K) (DOMAIN §2) — direct evaluation.
        assert DRY_AIR_GAS_CONSTANT == 287.05
        assert air_density(950.0, -10.0) == pytest.approx(95000.0 / (287.05 * 263.15),
                                                          rel=1e-15)
        assert air_density(0.0, 20.0) == 0.0  # vacuum


class TestEllipsoidAddedMassCoefficient:
    def test_sphere_one_half(self) -> None:
        # C = 1/2 for a sphere — Lamb, Hydrodynamics §92 [pub, memory].
        assert ellipsoid_added_mass_coefficient(0.05, 0.05, 0.05) == pytest.approx(
            0.5, rel=1e-14)

    def test_long_cylinder_broadside_tends_to_one(self) -> None:
        # A long circular cylinder moving sideways: C → 1 (Lamb [pub, memory]); a 1:10⁴ prolate
        # spheroid moving across its axis is within 1e-6 of it (mpmath: 1 − C ≈ 1.8e-7).
        c = ellipsoid_added_mass_coefficient(1.0, 1.0, 1.0e4)
        assert c == pytest.approx(1.0, abs=1e-6)
        assert c == pytest.approx(float(mp_added_mass(1.0, 1.0, 1.0e4)), rel=1e-12)
        assert c < 1.0

    @pytest.mark.parametrize("a, b, c", [
        (1.0, 1.0, 10.0),    # rod-like, broadside
        (10.0, 1.0, 1.0),    # rod-like, end-on
        (1.0, 0.1, 1.0),     # disc moving in its own plane
        (0.1, 1.0, 1.0),     # disc moving face-on
        (1.0, 0.5, 3.0),     # triaxial
        (0.004, 0.004, 0.5),  # a real pendulum rod, 8 mm × 1 m
    ])
    def test_against_quadrature(self, a: float, b: float, c: float) -> None:
        # mpmath.quad of the ellipsoid integral at 40 digits.
        got = ellipsoid_added_mass_coefficient(a, b, c)
        assert got == pytest.approx(float(mp_added_mass(a, b, c)), rel=1e-12)

    def test_scale_free(self) -> None:
        # C depends on the shape only [Lamb].
        assert ellipsoid_added_mass_coefficient(2e-3, 1e-3, 5e-3) == pytest.approx(
            ellipsoid_added_mass_coefficient(2.0, 1.0, 5.0), rel=1e-14)
