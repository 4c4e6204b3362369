"""Reference tests for core/blades.py: a suspension spring's blades against the beam equation.

The closed forms in core/blades.py are checked against numerical solutions of the
Euler–Bernoulli beam equation under tension, E I w'''' − T w'' = 0 (Timoshenko & Gere, Theory of
Elastic Stability, ch. 1 [pub, memory]), solved by ``scipy.integrate.solve_bvp``: no formula of
the module is used to make the expected values.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import quad, solve_bvp

from core import DesignError
from core.blades import (
    SPRING_STRESS_CAUTION,
    bending_length_m,
    blade_clamp_stresses,
    blade_pivot_below_clamp_m,
    blade_stiffness_n_m_per_rad,
)
from core.materials import material

E_STEEL = material("steel").youngs_modulus_pa


def beam(ratio: float, end: tuple[str, float, str, float]):  # type: ignore[no-untyped-def]
    """Solve w'''' = ratio² w'' on [0, 1] (s/L, ratio = L/λ), clamped at 0 (w = w' = 0), with
    two conditions at 1 given as (derivative order, value) pairs."""
    (o1, v1, o2, v2) = end
    order = {"w": 0, "w1": 1, "w2": 2, "w3": 3}

    def rhs(s, y):  # type: ignore[no-untyped-def]
        return np.vstack([y[1], y[2], y[3], ratio**2 * y[2]])

    def bc(a, b):  # type: ignore[no-untyped-def]
        return np.array([a[0], a[1], b[order[o1]] - v1, b[order[o2]] - v2])

    mesh = np.linspace(0.0, 1.0, 2001)
    sol = solve_bvp(rhs, bc, mesh, np.zeros((4, mesh.size)), tol=1e-10, max_nodes=200000)
    assert sol.success, sol.message
    return sol


# A seconds-pendulum-sized spring: two steel blades 6 mm × 0.1 mm, free length 6 mm, carrying
# 8.5 kg (83.4 N); λ ≈ 1.5 mm, L/λ ≈ 4. Also a nearly untensioned and a very long blade.
CASES = [
    (2, E_STEEL, 0.006, 1e-4, 0.006, 8.5 * 9.80665),
    (1, E_STEEL, 0.01, 2e-4, 0.002, 5.0),
    (3, 1.1e11, 0.004, 5e-5, 0.03, 200.0),
]


class TestAgainstBeamEquation:
    @pytest.mark.parametrize("case", CASES)
    def test_stiffness_pivot_and_clamp_moment(self, case) -> None:  # type: ignore[no-untyped-def]
        # The pendulum's pull along its own line: w'(L) = θ, w'''(L) = 0 (shear T θ). The couple
        # the blades put on the pendulum about the point where its line meets the clamp's
        # vertical is n E I w''(L); that point is L − w(L)/θ below the clamp (plain geometry).
        n, e, b, t, length, weight = case
        ei, tension = e * b * t**3 / 12.0, weight / n
        ratio = length / math.sqrt(ei / tension)
        sol = beam(ratio, ("w1", 1.0, "w3", 0.0))  # w in units of L·θ
        w_end, curv_end = sol.sol(1.0)[0], sol.sol(1.0)[2]
        k_num = n * ei / length * curv_end
        k = blade_stiffness_n_m_per_rad(n, e, b, t, length, weight)
        assert k == pytest.approx(k_num, rel=1e-4)
        pivot = blade_pivot_below_clamp_m(n, e, b, t, length, weight)
        assert pivot == pytest.approx(length * (1.0 - w_end), rel=1e-4)
        # clamp stress: 6 M / (b t²) with M = E I w''(0) at the semi-arc (plus T / (b t))
        arc = 1.5
        moment = ei / length * sol.sol(0.0)[2] * math.radians(arc)
        stress = blade_clamp_stresses(n, e, b, t, length, weight, arc)
        assert stress.bending_pa == pytest.approx(6.0 * moment / (b * t * t), rel=1e-4)
        assert stress.tension_pa == pytest.approx(tension / (b * t), rel=1e-12)
        assert stress.peak_pa == pytest.approx(stress.bending_pa + stress.tension_pa, rel=1e-12)

    @pytest.mark.parametrize("case", CASES[:2])
    def test_swinging_pendulum_frequency(self, case) -> None:  # type: ignore[no-untyped-def]
        # Independent of the end conditions assumed above: a point mass M on a light rigid rod
        # of length d fixed in the blades' lower end. Strain energy of the blades (bending plus
        # the tension's work, ½∫(E I w''² + T w'²) ds) for end deflection u and slope θ from
        # the beam equation; gravity adds ½ M g d θ². With one inertial coordinate
        # x = u + d θ, ω² is the least potential at x = 1 over ½ M (Rayleigh). A rigid
        # pendulum about the module's pivot with the module's k must give the same ω² for
        # a long pendulum (to about (λ/d)²; 1e-7 here — taking the textbook end couple
        # √(EIT)·coth(L/λ) about the clamp instead misses by 2.4e-6 and 2.4e-4).
        n, e, b, t, length, weight = case
        mass = weight / 9.80665
        ei, tension = e * b * t**3 / 12.0, weight / n
        ratio = length / math.sqrt(ei / tension)

        def energy(u: float, th: float) -> float:
            sol = beam(ratio, ("w", u, "w1", th))  # w in units of L; s in units of L

            def density(s: float) -> float:
                y = sol.sol(s)
                return ei / length**3 * y[2] ** 2 + tension / length * y[1] ** 2

            return 0.5 * n * length**2 * quad(density, 0.0, 1.0, limit=200, epsabs=0,
                                              epsrel=1e-12)[0]

        e_u, e_t, e_ut = energy(1.0, 0.0), energy(0.0, 1.0), energy(1.0, 1.0)
        k_uu, k_tt = 2 * e_u / length**2, 2 * e_t
        k_ut = (2 * e_ut - 2 * e_u - 2 * e_t) / (2 * length)  # per metre of u, per radian
        d = 1.0
        # V(u, θ) with u = 1 − d θ, minimised over θ (a quadratic): c2 θ² + c1 θ + c0
        c2 = 0.5 * (k_uu * d * d - 2 * k_ut * d + k_tt + weight * d)
        c1 = 0.5 * (-2 * k_uu * d + 2 * k_ut)
        c0 = 0.5 * k_uu
        v_min = c0 - c1 * c1 / (4 * c2)
        omega2 = v_min / (0.5 * mass)
        k = blade_stiffness_n_m_per_rad(n, e, b, t, length, weight)
        depth = length + d - blade_pivot_below_clamp_m(n, e, b, t, length, weight)
        omega2_model = (weight * depth + k) / (mass * depth**2)
        assert omega2_model == pytest.approx(omega2, rel=1e-7)


class TestLimits:
    def test_no_tension_is_a_plain_strip(self) -> None:
        # Euler–Bernoulli with no tension: an end couple M turns the end of a strip by M L/(E I)
        # (any strength-of-materials text [pub, memory]); with the shear zero it bends
        # uniformly, so the point it turns about is half-way down (plain geometry).
        n, b, t, length = 2, 0.006, 1e-4, 0.006
        ei = E_STEEL * b * t**3 / 12
        assert blade_stiffness_n_m_per_rad(n, E_STEEL, b, t, length, 0.0) == pytest.approx(
            n * ei / length, rel=1e-12)
        assert blade_stiffness_n_m_per_rad(n, E_STEEL, b, t, length, 1e-12) == pytest.approx(
            n * ei / length, rel=1e-9)
        assert blade_pivot_below_clamp_m(n, E_STEEL, b, t, length, 0.0) == length / 2

    def test_bending_length(self) -> None:
        # λ = √(E I / T), I = b t³/12 per blade, T shared (definition; beam-column theory).
        lam = bending_length_m(2, 2e11, 0.006, 1e-4, 100.0)
        assert lam == pytest.approx(math.sqrt(2e11 * 0.006 * 1e-12 / 12 / 50.0), rel=1e-14)
        assert bending_length_m(1, 2e11, 0.006, 1e-4, 0.0) == math.inf

    def test_long_blade_hinges_lambda_below_the_clamp(self) -> None:
        # Many λ long: the bend is confined near the clamp, the point is λ below it and the
        # added couple vanishes (solve_bvp above at L/λ ≈ 30 agrees; here the far limit).
        lam = bending_length_m(1, 2e11, 0.01, 1e-5, 1000.0)
        assert blade_pivot_below_clamp_m(1, 2e11, 0.01, 1e-5, 0.5, 1000.0) == pytest.approx(
            lam, rel=1e-12)
        assert blade_stiffness_n_m_per_rad(1, 2e11, 0.01, 1e-5, 0.5, 1000.0) < 1e-100


class TestRefusals:
    @pytest.mark.parametrize("args, field", [
        ((0, 2e11, 0.006, 1e-4, 0.006, 80.0), "blades.count"),
        ((2.0, 2e11, 0.006, 1e-4, 0.006, 80.0), "blades.count"),
        ((2, 2e11, -0.006, 1e-4, 0.006, 80.0), "blades.width_m"),
        ((2, 2e11, 0.006, math.nan, 0.006, 80.0), "blades.thickness_m"),
        ((2, 2e11, 0.006, 1e-4, 0.0, 80.0), "blades.free_length_m"),
        ((2, math.inf, 0.006, 1e-4, 0.006, 80.0), "material.youngs_modulus_pa"),
        ((2, 2e11, 0.006, 1e-4, 0.006, -1.0), "blades.tension_n"),
    ])
    def test_bad_blades(self, args, field: str) -> None:  # type: ignore[no-untyped-def]
        with pytest.raises(DesignError) as err:
            blade_stiffness_n_m_per_rad(*args)
        assert err.value.field == field

    def test_caution_says_it_is_not_certified(self) -> None:
        assert "no safety factor" in SPRING_STRESS_CAUTION
        assert "not certify" in SPRING_STRESS_CAUTION
