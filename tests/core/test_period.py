"""Reference tests for core/period.py: linearised and exact periods, the AGM, the slopes.

Expected values come from published tables (marked [pub] / [pub, memory]) or are computed here
independently with mpmath at 40 digits (tanh-sinh quadrature of the period integral with
θ = θ₀ − w², not the core's θ = θ₀ sin u and Gauss–Legendre rule; see _mp_reference.py).
"""

from __future__ import annotations

from fractions import Fraction

import mpmath
import numpy as np
import pytest

from core.period import agm, period_exact, period_exact_and_slopes, period_small

from _mp_reference import mp_period, mp_ratio

mpmath.mp.dps = 40


# ----------------------------------------------------------------------------------------------

class TestPeriodSmall:
    def test_textbook_point_pendulum(self) -> None:
        # T₀ = 2π√(L/g) for I = m L², A = m g L — DOMAIN §2, textbook result [pub, memory].
        m, length, g = 2.5, 0.75, 9.80665
        assert period_small(m * length**2, m * g * length) == pytest.approx(
            float(2 * mpmath.pi * mpmath.sqrt(mpmath.mpf(length) / mpmath.mpf(g))),
            rel=1e-15, abs=0)

    def test_spring_adds_to_gravity_torque(self) -> None:
        # T₀ = 2π√(I/(A + k)) — DOMAIN §2 [computed from the linearised equation of motion].
        expected = float(2 * mpmath.pi * mpmath.sqrt(mpmath.mpf("1.7") / (mpmath.mpf("3.1") + 2)))
        assert period_small(1.7, 3.1, 2.0) == pytest.approx(expected, rel=1e-15, abs=0)


class TestAgm:
    # K(m) = π / (2 AGM(1, √(1 − m))) — Abramowitz & Stegun 17.6 [pub, memory]; the table values
    # of K are A&S ch. 17 [pub, memory], re-checked against mpmath.ellipk at 40 digits.
    @pytest.mark.parametrize("m, published", [
        (0.1, 1.612441348720219),  # A&S ch. 17 [pub, memory]
        (0.5, 1.854074677301372),  # A&S ch. 17 [pub, memory]; = Γ(¼)²/(4√π)
        (0.9, 2.578092113348173),  # A&S ch. 17 [pub, memory]
    ])
    def test_complete_elliptic_integral_via_agm(self, m: float, published: float) -> None:
        k_agm = float(np.pi / (2.0 * agm(1.0, np.sqrt(1.0 - m))))
        assert k_agm == pytest.approx(published, rel=1e-15, abs=0)
        assert k_agm == pytest.approx(float(mpmath.ellipk(m)), rel=1e-15, abs=0)  # mpmath, 40 dig.

    def test_k_half_closed_form(self) -> None:
        # K(1/2) = Γ(¼)² / (4√π) — A&S 17.3 [pub, memory]; evaluated with mpmath at 40 digits.
        expected = float(mpmath.gamma(mpmath.mpf(1) / 4) ** 2 / (4 * mpmath.sqrt(mpmath.pi)))
        assert float(np.pi / (2.0 * agm(1.0, np.sqrt(0.5)))) == pytest.approx(
            expected, rel=1e-15, abs=0)

    def test_elementwise_against_mpmath(self) -> None:
        # AGM of arrays, element by element — mpmath.agm at 40 digits.
        a = np.array([1.0, 2.0, 1e-3, 5.0])
        b = np.array([1e-8, 3.0, 1e3, 5.0])
        expected = [float(mpmath.agm(x, y)) for x, y in zip(a, b, strict=True)]
        np.testing.assert_allclose(agm(a, b), expected, rtol=2e-15, atol=0)


class TestPeriodExact:
    # T/T₀ table, DOMAIN §3 [computed there at 30–40 digits]; each entry is re-derived here as
    # (2/π) K(sin²(θ₀/2)) with mpmath at 40 digits. The table has 11 decimals (±5e-12).
    TABLE = [(1, 1.00001903892), (2, 1.00007615967), (5, 1.00047617249),
             (10, 1.00190718814), (20, 1.00766902579), (30, 1.01740879760),
             (45, 1.03997334320), (60, 1.07318200715), (90, 1.18034059902),
             (120, 1.37288050062), (150, 1.76220372950), (179, 3.90106516039)]

    @pytest.mark.parametrize("deg, table_ratio", TABLE)
    def test_ratio_table(self, deg: int, table_ratio: float) -> None:
        ratio = float(period_exact(1.0, 1.0, 0.0, [np.radians(deg)])[0] / (2.0 * np.pi))
        assert abs(ratio - table_ratio) <= 6e-12  # DOMAIN §3 table, 11 decimals
        # mpmath at 40 digits; the AGM form is exact to rounding up to 179°.
        assert ratio == pytest.approx(float(mp_ratio(deg)), rel=4e-15, abs=0)

    def test_double_period_angle(self) -> None:
        # T = 2 T₀ at θ₀ = 159.75387571836° — OEIS A256514 [pub]; 11 decimals of a degree
        # (±5e-12°) move T/T₀ by < 1e-12 there.
        ratio = period_exact(1.0, 1.0, 0.0, [np.radians(159.75387571836)])[0] / (2.0 * np.pi)
        assert ratio == pytest.approx(2.0, rel=1e-12, abs=0)
        # mpmath at 40 digits agrees that this is the root of T/T₀ = 2.
        root = mpmath.findroot(lambda d: mp_ratio(d) - 2, mpmath.mpf("159.7"))
        assert float(root) == pytest.approx(159.75387571836, rel=0, abs=1e-11)

    def test_small_angle_series(self) -> None:
        # T/T₀ = 1 + θ²/16 + 11θ⁴/3072 + 173θ⁶/737280 + 22931θ⁸/1321205760 + … —
        # OEIS A223067 (numerators) / A223068 (denominators) [pub].
        coeffs = [Fraction(1), Fraction(1, 16), Fraction(11, 3072), Fraction(173, 737280),
                  Fraction(22931, 1321205760)]
        # The published coefficients are the Taylor coefficients of (2/π)K(sin²(θ/2)):
        # mpmath.taylor at 40 digits.
        taylor = mpmath.taylor(lambda t: mp_ratio(mpmath.degrees(t)), 0, 10)
        for n, c in enumerate(coeffs):
            assert abs(taylor[2 * n] - mpmath.mpf(c.numerator) / c.denominator) < 1e-25
        next_coeff = abs(float(taylor[10]))  # θ¹⁰ term, ≈ 1.39e-6: the truncation error
        for theta in (1e-3, 0.01, 0.05, 0.1, 0.2, 0.3):
            series = sum(float(c) * theta ** (2 * n) for n, c in enumerate(coeffs))
            core = float(period_exact(1.0, 1.0, 0.0, [theta])[0] / (2.0 * np.pi))
            assert abs(core - series) <= 1.5 * next_coeff * theta**10 + 4e-16

    def test_scales_with_inertia_and_torque(self) -> None:
        # T = 2π √(I/A) · (2/π) K(m): scaling of the exact period [computed], mpmath reference.
        i, a, th = 3.7, 0.42, 1.234
        expected = 2 * mpmath.pi * mpmath.sqrt(mpmath.mpf(i) / mpmath.mpf(a)) * mp_ratio(
            mpmath.degrees(mpmath.mpf(th)))
        assert float(period_exact(i, a, 0.0, th)[0]) == pytest.approx(float(expected),
                                                                      rel=2e-15, abs=0)

    SPRING_CASES = [(ratio, deg) for ratio in (0.05, 1.0, 20.0)
                    for deg in (1.0, 30.0, 90.0, 150.0, 170.0)]

    @pytest.mark.parametrize("k_over_a, deg", SPRING_CASES)
    def test_with_spring_against_quadrature(self, k_over_a: float, deg: float) -> None:
        # mpmath.quad at 40 digits of 4∫dθ/√(2(V(θ₀)−V(θ))/I) — tolerance 1e-12 relative.
        inertia, torque = 1.3, 2.0
        k = k_over_a * torque
        expected = mp_period(inertia, torque, k, mpmath.radians(deg))
        got = period_exact(inertia, torque, k, [np.radians(deg)])[0]
        assert float(got) == pytest.approx(float(expected), rel=1e-12, abs=0)

    def test_knife_edge_quadrature_agrees_with_agm(self) -> None:
        # With k = 0 the same mpmath quadrature must reproduce 4√(I/A) K(m) — consistency of the
        # two independent references (mpmath, 40 digits).
        for deg in (10, 120, 170):
            q = mp_period(1.0, 1.0, 0.0, mpmath.radians(deg))
            assert abs(q / (2 * mpmath.pi) - mp_ratio(deg)) < mpmath.mpf("1e-30")
            got = period_exact(1.0, 1.0, 0.0, [np.radians(deg)])[0]
            assert float(got) == pytest.approx(float(q), rel=1e-14, abs=0)

    def test_spring_period_curve_is_bounded_and_accurate(self, monkeypatch: pytest.MonkeyPatch
                                                         ) -> None:
        # DESIGN §2/§5: every edit recomputes within a frame, so the quadrature's work must be
        # bounded. The window's period curve asks for 400 amplitudes up to 179.9°; for this
        # ordinary weak spring (k/A = 3.1e-6) the node doubling must stop at its rounding floor
        # (at most 2048 Gauss–Legendre nodes) and still be right to 1e-12 at 179.9° (mpmath at
        # 40 digits). Work is counted, not timed.
        import core.period as period_module

        used: list[int] = []
        original = period_module._quadrature

        def counting(inertia, torque, k, theta0, n):  # type: ignore[no-untyped-def]
            used.append(n)
            return original(inertia, torque, k, theta0, n)

        monkeypatch.setattr(period_module, "_quadrature", counting)
        inertia, torque, k = 15.877107424199318, 347.5322498541615, 0.0010935444529847087
        amps = np.concatenate([np.linspace(0.05, 170.0, 340), np.linspace(170.5, 179.9, 60)])
        p = period_exact(inertia, torque, k, np.radians(amps))
        assert max(used) <= 2048
        expected = mp_period(inertia, torque, k, mpmath.radians(mpmath.mpf("179.9")))
        assert float(p[-1]) == pytest.approx(float(expected), rel=1e-12, abs=0)
        mid = mp_period(inertia, torque, k, mpmath.radians(mpmath.mpf(str(amps[200]))))
        assert float(p[200]) == pytest.approx(float(mid), rel=1e-14, abs=0)

    def test_vectorised_over_amplitudes(self) -> None:
        # One call, many amplitudes, each matching mpmath (40 digits).
        degs = np.array([0.5, 45.0, 100.0, 175.0])
        got = period_exact(1.0, 1.0, 0.0, np.radians(degs)) / (2 * np.pi)
        np.testing.assert_allclose(got, [float(mp_ratio(d)) for d in degs], rtol=4e-15, atol=0)


class TestPeriodExactAndSlopes:
    # Slopes against centred differences (step 1e-12) of the 40-digit mpmath integral: the
    # difference formula's own error is ~1e-24, far below the 1e-11 tolerance.
    CASES = [(0.0, 30.0), (0.0, 170.0), (0.1, 60.0), (1.0, 120.0), (10.0, 170.0)]

    @pytest.mark.parametrize("k_over_a, deg", CASES)
    def test_slopes_against_centred_differences(self, k_over_a: float, deg: float) -> None:
        inertia, torque = 0.8, 1.5
        k = k_over_a * torque
        th = mpmath.radians(deg)
        h = mpmath.mpf("1e-12")
        d_torque = (mp_period(inertia, torque + h, k, th)
                    - mp_period(inertia, torque - h, k, th)) / (2 * h)
        d_k = (mp_period(inertia, torque, k + h, th)
               - mp_period(inertia, torque, k - h, th)) / (2 * h)
        t, s_torque, s_k = period_exact_and_slopes(inertia, torque, k, [np.radians(deg)])
        assert float(t[0]) == pytest.approx(float(mp_period(inertia, torque, k, th)),
                                            rel=1e-12, abs=0)
        assert float(s_torque[0]) == pytest.approx(float(d_torque), rel=1e-11, abs=0)
        assert float(s_k[0]) == pytest.approx(float(d_k), rel=1e-11, abs=0)

    def test_slopes_are_negative(self) -> None:
        # More restoring torque or stiffness always shortens the period [computed].
        _t, s_a, s_k = period_exact_and_slopes(1.0, 1.0, 0.3, np.radians([5.0, 90.0, 170.0]))
        assert np.all(s_a < 0) and np.all(s_k < 0)
