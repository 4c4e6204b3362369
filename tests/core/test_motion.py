"""Reference tests for core/motion.py: the Jacobi closed form, the integrator, damping, springs.

Closed form: Beléndez et al., Rev. Bras. Ensino Fís. 29, 645 (2007) [pub], evaluated here with
mpmath.ellipfun at 40 digits. Check values from DOMAIN §3 [computed there at 30–40 digits].

Agreement measured when these tests were written (LSODA in the core, rtol 1e-11), maximum
|θ_LSODA − θ_exact| over five periods, 201 samples: 1.1e-10 rad at 30°, 9.5e-9 rad at 120°,
1.3e-7 rad at 170° (the phase error grows near the separatrix); the tolerances below are about
three times those.
"""

from __future__ import annotations

import mpmath
import numpy as np
import pytest
from scipy.integrate import solve_ivp
from scipy.special import ellipj, ellipk

from core.motion import integrated_motion, integrated_motion_steps, jacobi_motion, motion
from core.period import period_exact, period_small

from _mp_reference import mp_jacobi_angle, mp_jacobi_velocity, mp_period

mpmath.mp.dps = 40


def mp_full_period(theta0_deg: float, omega0: float = 1.0) -> mpmath.mpf:
    """T = 4 K(sin²(θ₀/2)) / ω₀ — mpmath at 40 digits."""
    th = mpmath.radians(theta0_deg)
    return 4 * mpmath.ellipk(mpmath.sin(th / 2) ** 2) / omega0


class TestJacobiMotion:
    @pytest.mark.parametrize("deg, fraction, published_deg", [
        (170.0, 8, 145.6583583307),  # DOMAIN §3 trajectory values [computed], ω₀ = 1
        (170.0, 6, 117.1809310123),  # DOMAIN §3
        (30.0, 8, 21.27468174552),   # DOMAIN §3
    ])
    def test_trajectory_values(self, deg: float, fraction: int, published_deg: float) -> None:
        t = mp_full_period(deg) / fraction
        theta, _ = jacobi_motion(1.0, np.radians(deg), np.array([float(t)]))
        got = float(np.degrees(theta[0]))
        assert got == pytest.approx(published_deg, rel=0, abs=1e-9)  # DOMAIN, 10 decimals
        # mpmath.ellipfun at 40 digits: agreement to a few ulp of a radian.
        expected = float(mpmath.degrees(mp_jacobi_angle(mpmath.radians(deg), t)))
        assert got == pytest.approx(expected, rel=0, abs=1e-12)

    @pytest.mark.parametrize("deg", [30.0, 120.0, 170.0])
    def test_over_one_period_against_mpmath(self, deg: float) -> None:
        # θ and θ̇ over one period, ω₀ = 1.7 rad/s — mpmath.ellipfun (sn, cn) at 40 digits.
        w = 1.7
        period = mp_full_period(deg, w)
        t = np.linspace(0.0, float(period), 25)
        theta, velocity = jacobi_motion(w, np.radians(deg), t)
        th0 = mpmath.radians(deg)
        exp_theta = [float(mp_jacobi_angle(th0, w * mpmath.mpf(x))) for x in t]
        exp_velocity = [float(mp_jacobi_velocity(th0, w, mpmath.mpf(x))) for x in t]
        np.testing.assert_allclose(theta, exp_theta, rtol=0, atol=1e-12)
        np.testing.assert_allclose(velocity, exp_velocity, rtol=0, atol=1e-11)

    def test_parameter_not_modulus(self) -> None:
        # The k-vs-m trap (DOMAIN §2, §4): scipy.special.ellipj takes the parameter m = k².
        # Done right, the core matches mpmath; passing the modulus k instead is wrong by degrees
        # at a point and by radians over a few periods.
        deg = 170.0
        th0 = np.radians(deg)
        k = np.sin(th0 / 2)
        period = float(mp_full_period(deg))
        t = np.linspace(0.0, 4.0 * period, 161)
        core_theta, _ = jacobi_motion(1.0, th0, t)
        reference = np.array([float(mp_jacobi_angle(mpmath.mpf(th0), mpmath.mpf(x)))
                              for x in t])
        wrong = 2.0 * np.arcsin(np.clip(k * ellipj(ellipk(k) - t, k)[0], -1.0, 1.0))
        np.testing.assert_allclose(core_theta, reference, rtol=0, atol=1e-11)
        assert np.max(np.abs(wrong - reference)) > 4.0  # radians: the trap costs > 4 rad
        # and at a single instant (T/8) already ~9°:
        t8 = np.array([period / 8])
        wrong_t8 = 2.0 * np.arcsin(k * ellipj(ellipk(k) - t8, k)[0][0])
        assert abs(np.degrees(wrong_t8) - 145.6583583307) > 5.0  # DOMAIN §3 value
        assert float(np.degrees(jacobi_motion(1.0, th0, t8)[0][0])) == pytest.approx(
            145.6583583307, abs=1e-9)

    def test_small_amplitude_is_cosine(self) -> None:
        # At vanishing arcs θ(t) → θ₀ cos(ω₀ t) (DOMAIN §2 linearised motion); at 0.01° the
        # exact motion differs by O(θ₀³) ≈ 1e-12 rad.
        th0 = np.radians(0.01)
        t = np.linspace(0.0, 10.0, 50)
        theta, _ = jacobi_motion(2.0, th0, t)
        np.testing.assert_allclose(theta, th0 * np.cos(2.0 * t), rtol=0, atol=1e-11)


class TestIntegratedMotion:
    @pytest.mark.parametrize("deg, atol", [(30.0, 4e-10), (120.0, 3e-8), (170.0, 4e-7)])
    def test_against_closed_form_over_five_periods(self, deg: float, atol: float) -> None:
        # LSODA against the Jacobi closed form (mpmath.ellipfun, 40 digits) over five periods.
        th0 = np.radians(deg)
        period = float(mp_full_period(deg))
        t = np.linspace(0.0, 5.0 * period, 201)
        theta, velocity = integrated_motion(1.0, 1.0, 0.0, th0, 0.0, t)
        sample = slice(None, None, 8)
        ref_theta = [float(mp_jacobi_angle(mpmath.mpf(th0), mpmath.mpf(x))) for x in t[sample]]
        ref_velocity = [float(mp_jacobi_velocity(mpmath.mpf(th0), 1, mpmath.mpf(x)))
                        for x in t[sample]]
        np.testing.assert_allclose(theta[sample], ref_theta, rtol=0, atol=atol)
        np.testing.assert_allclose(velocity[sample], ref_velocity, rtol=0, atol=2 * atol)

    @pytest.mark.parametrize("deg", [0.05, 0.5])
    def test_damped_envelope(self, deg: float) -> None:
        # θ̈ + (ω₀/Q)θ̇ + ω₀²θ = 0 (A. P. French, Vibrations and Waves, ch. 3 [pub, memory]):
        # released from rest, θ(n·T_d) = θ₀ exp(−ω₀ t / 2Q) exactly for the linear equation,
        # T_d = 2π/(ω₀√(1 − 1/4Q²)). The pendulum's nonlinearity adds ≈ 1.5e-5·θ₀²(rad) to that
        # ratio (measured 3.7e-6 at 0.5°), so the tolerance is 1e-5 at 0.5°, 1e-7 at 0.05°.
        q, w0 = 50.0, 1.3
        th0 = np.radians(deg)
        wd = w0 * np.sqrt(1.0 - 1.0 / (4.0 * q * q))
        n = np.arange(16)
        t = n * 2.0 * np.pi / wd
        theta, _ = integrated_motion(1.0, w0**2, 0.0, th0, w0 / q, t)
        envelope = th0 * np.exp(-w0 * t / (2.0 * q))
        rtol = 1e-5 if deg > 0.1 else 1e-7
        np.testing.assert_allclose(theta, envelope, rtol=rtol, atol=0)
        assert theta[-1] / th0 < 0.4  # it really did decay (e^(−15π/50) ≈ 0.39)

    @pytest.mark.parametrize("deg", [30.0, 120.0, 170.0])
    def test_spring_motion_periodic_with_quadrature_period(self, deg: float) -> None:
        # With a spring there is no closed form; the period comes from the 40-digit mpmath
        # quadrature (_mp_reference.mp_period). After each period the pendulum is back at rest
        # at θ₀, and at half periods at −θ₀ (V is even). Measured: ≤ 3e-10 rad, ≤ 2e-9 rad/s.
        inertia, torque, k = 1.0, 1.0, 0.5
        th0 = np.radians(deg)
        period = float(mp_period(inertia, torque, k, mpmath.radians(deg)))
        t = np.array([0.0, period / 2, period, 2 * period, 3 * period])
        theta, velocity = integrated_motion(inertia, torque, k, th0, 0.0, t)
        np.testing.assert_allclose(theta, [th0, -th0, th0, th0, th0], rtol=0, atol=1e-9)
        np.testing.assert_allclose(velocity, 0.0, rtol=0, atol=5e-9)


class TestMotion:
    def test_knife_edge_undamped_uses_closed_form(self) -> None:
        # The sampled motion must be the Jacobi closed form (mpmath, 40 digits) and the linear
        # curve θ₀ cos(2πt/T₀) (DOMAIN §2).
        inertia, torque, deg = 2.0, 8.0, 60.0
        th0 = np.radians(deg)
        w = 2.0
        period = float(mp_full_period(deg, w))
        t0 = 2 * np.pi / w
        m = motion(inertia, torque, 0.0, th0, period, t0, None, periods=2, points_per_period=40)
        assert m.method == "jacobi"
        assert m.time_s[-1] == pytest.approx(2 * period, rel=1e-15)
        ref = [float(mp_jacobi_angle(mpmath.mpf(th0), w * mpmath.mpf(x))) for x in m.time_s]
        np.testing.assert_allclose(m.angle_rad, ref, rtol=0, atol=1e-12)
        np.testing.assert_allclose(m.linear_angle_rad, th0 * np.cos(w * m.time_s), rtol=0,
                                   atol=1e-14)
        np.testing.assert_allclose(m.difference_rad, m.angle_rad - m.linear_angle_rad)

    def test_spring_motion_tiled_from_one_period(self) -> None:
        # Undamped with a spring: one period is integrated and repeated; the repeated curve must
        # match a straight integration over three periods, and return to θ₀ (mpmath period).
        inertia, torque, k, deg = 1.0, 1.0, 0.5, 120.0
        th0 = np.radians(deg)
        period = float(mp_period(inertia, torque, k, mpmath.radians(deg)))
        m = motion(inertia, torque, k, th0, period, period_small(inertia, torque, k), None)
        assert m.method == "lsoda"
        straight, _ = integrated_motion(inertia, torque, k, th0, 0.0, m.time_s)
        np.testing.assert_allclose(m.angle_rad, straight, rtol=0, atol=3e-9)
        assert m.angle_rad[-1] == pytest.approx(th0, abs=1e-9)

    def test_damped_linear_curve_starts_from_rest(self) -> None:
        # With Q the linear curve is the linear damped oscillator released from rest. Reference:
        # scipy.integrate.solve_ivp (DOP853, rtol 1e-12) of θ̈ + (ω₀/Q)θ̇ + ω₀²θ = 0,
        # θ(0) = θ₀, θ̇(0) = 0 — the linear equation integrated, not the closed form again.
        inertia, torque, q, deg = 1.0, 4.0, 3.0, 0.05
        th0 = np.radians(deg)
        t0 = period_small(inertia, torque)
        t_exact = float(period_exact(inertia, torque, 0.0, [th0])[0])
        m = motion(inertia, torque, 0.0, th0, t_exact, t0, q, periods=3, points_per_period=400)
        assert m.method == "lsoda"
        w0 = 2.0
        ref = solve_ivp(lambda _t, y: [y[1], -w0 / q * y[1] - w0**2 * y[0]],
                        (0.0, float(m.time_s[-1])), [th0, 0.0], method="DOP853",
                        t_eval=m.time_s, rtol=1e-12, atol=1e-16 * th0)
        np.testing.assert_allclose(m.linear_angle_rad, ref.y[0], rtol=0, atol=1e-12 * th0)
        # The old curve θ₀ cos(ω₀t)e^(−γt) leaves rest with θ̇(0) = −γθ₀ and is off by up to
        # ~γ/ω_d·θ₀ — far outside the tolerance above, so this test tells them apart.
        old = th0 * np.cos(w0 * m.time_s) * np.exp(-w0 * m.time_s / (2 * q))
        assert np.max(np.abs(old - ref.y[0])) > 0.05 * th0
        # and the pendulum itself, at 0.05°, follows the linear curve to O(θ₀³) (≈ 1e-8 θ₀ here;
        # tolerance 1e-6 θ₀):
        np.testing.assert_allclose(m.angle_rad, ref.y[0], rtol=0, atol=1e-6 * th0)

    def test_undamped_linear_curve_is_cosine(self) -> None:
        # Without Q: θ₀ cos(2πt/T₀) (linear oscillator, French ch. 3 [pub, memory]).
        m = motion(1.0, 1.0, 0.5, 0.1, 5.2, period_small(1.0, 1.0, 0.5), None, periods=1,
                   points_per_period=50)
        np.testing.assert_allclose(m.linear_angle_rad,
                                   0.1 * np.cos(np.sqrt(1.5) * m.time_s), rtol=0, atol=1e-15)


class TestStiffSpring:
    """A spring far stiffer than gravity: the motion is the linear spring oscillator
    θ ≈ θ₀ cos(√(k/I) t) (Hooke's law with I θ̈ = −kθ; any mechanics text). The gravity term
    shifts the frequency by A/(2k) relatively and adds A θ₀³/6 of nonlinearity."""

    @pytest.mark.parametrize("inertia, torque, k, deg", [
        (1e-10, 1e-10, 1e-3, 1.0),    # 1 mg bob on 1 cm: spring 1e7 × the gravity torque
        (4.4e-8, 3.1e-9, 1e-3, 5.0),  # spring 3e5 × gravity
        (1e-12, 1e-12, 1e4, 0.01),    # spring 1e16 × gravity, ω = 1e8 rad/s
    ])
    def test_matches_linear_spring_solution(self, inertia: float, torque: float, k: float,
                                            deg: float) -> None:
        th0 = np.radians(deg)
        w = np.sqrt(k / inertia)
        t = np.linspace(0.0, 3 * 2 * np.pi / w, 601)
        for q in (None, 1e9):
            damping = 0.0 if q is None else np.sqrt((torque + k) / inertia) / q
            theta, velocity, steps = integrated_motion_steps(inertia, torque, k, th0, damping, t)
            # Over 3 periods the phase drifts by ≤ 2π·3·A/(2k) and the cube term is A/k·θ₀²;
            # with A/k ≤ 1e-5 and rounding that is ≤ 1e-4 θ₀ (tolerance); the velocity
            # scales by ω.
            np.testing.assert_allclose(theta, th0 * np.cos(w * t), rtol=0, atol=1e-4 * th0)
            np.testing.assert_allclose(velocity, -th0 * w * np.sin(w * t), rtol=0,
                                       atol=1e-4 * th0 * w)
            # The scaled equation keeps the work per period bounded whatever the stiffness:
            # a few hundred LSODA steps per period, never a collapse of the step size.
            assert 0 < steps < 3000

    def test_stiff_design_through_motion(self) -> None:
        # The design that once collapsed the step: I = 4.408e-5 kg·m², A = 7.84e5 N·m,
        # k = 2.19e-3 N·m/rad at 0.0735°, undamped — the spring-pendulum period from the
        # 40-digit quadrature; after one and three periods the motion is back at θ₀, at rest.
        inertia, torque, k, deg = 4.4080627073315255e-05, 784002.1324071555, 0.002191561, 0.0735
        th0 = np.radians(deg)
        period = float(mp_period(inertia, torque, k, mpmath.radians(deg)))
        m = motion(inertia, torque, k, th0, period, period_small(inertia, torque, k), None)
        assert m.angle_rad[400] == pytest.approx(th0, rel=1e-9)
        assert m.angle_rad[-1] == pytest.approx(th0, rel=1e-9)
        assert m.angle_rad[200] == pytest.approx(-th0, rel=1e-9)
        omega = np.sqrt((torque + k) / inertia)
        assert abs(m.angular_velocity_rad_s[400]) < 1e-8 * th0 * omega
