"""Independent references computed with mpmath at 40 digits, shared by the core's tests.

Nothing here imports the core: these are the outside values the core is checked against.
"""

from __future__ import annotations

import mpmath

mpmath.mp.dps = 40


def mp_ratio(theta0_deg: float | str) -> mpmath.mpf:
    """T/T₀ of the simple pendulum = (2/π) K(sin²(θ₀/2)) — mpmath at 40 digits."""
    with mpmath.workdps(max(40, mpmath.mp.dps)):  # never below 40; more when mpmath asks
        th = mpmath.radians(mpmath.mpf(theta0_deg))
        return 2 / mpmath.pi * mpmath.ellipk(mpmath.sin(th / 2) ** 2)


def mp_period(inertia: float, torque: float, stiffness: float, theta0: mpmath.mpf
              ) -> mpmath.mpf:
    """T = 4 ∫₀^θ₀ dθ / √(2 (V(θ₀) − V(θ)) / I), V = A(1 − cos θ) + kθ²/2 — mpmath at 40
    digits, tanh-sinh quadrature.

    θ = θ₀ − w² makes the integrand smooth (dθ = −2w dw cancels the 1/√ endpoint behaviour),
    and V(θ₀) − V(θ) is written without cancellation, so the quadrature reaches ~1e-38.
    """
    with mpmath.workdps(40):
        i, a, k, th0 = (mpmath.mpf(x) for x in (inertia, torque, stiffness, theta0))

        def integrand(w: mpmath.mpf) -> mpmath.mpf:
            if w == 0:  # the limit w → 0: 2 / √(2 V'(θ₀) / I)
                return 2 / mpmath.sqrt(2 * (a * mpmath.sin(th0) + k * th0) / i)
            s = w * w
            # cos(θ₀ − s) − cos θ₀ = 2 sin(s/2) sin(θ₀ − s/2); θ₀² − (θ₀ − s)² = s(2θ₀ − s)
            dv = s * (a * mpmath.sin(th0 - s / 2) * mpmath.sin(s / 2) * 2 / s
                      + k * (2 * th0 - s) / 2)
            return 2 * w / mpmath.sqrt(2 * dv / i)

        root = mpmath.sqrt(th0)
        return 4 * mpmath.quad(integrand, [0, root / 2, root])


def mp_jacobi_angle(theta0: mpmath.mpf, omega0_t: mpmath.mpf) -> mpmath.mpf:
    """θ(t) = 2 arcsin(k sn(K − ω₀t | m)), k = sin(θ₀/2), m = k² — Beléndez et al., Rev. Bras.
    Ensino Fís. 29, 645 (2007) [pub]; mpmath.ellipfun at 40 digits (keyword m: the parameter)."""
    with mpmath.workdps(40):
        th0 = mpmath.mpf(theta0)
        k = mpmath.sin(th0 / 2)
        m = k * k
        return 2 * mpmath.asin(k * mpmath.ellipfun("sn", mpmath.ellipk(m) - omega0_t, m=m))


def mp_jacobi_velocity(theta0: mpmath.mpf, omega0: mpmath.mpf, t: mpmath.mpf) -> mpmath.mpf:
    """θ̇(t) = −2 k ω₀ cn(K − ω₀t | m) — same source; mpmath at 40 digits."""
    with mpmath.workdps(40):
        th0 = mpmath.mpf(theta0)
        k = mpmath.sin(th0 / 2)
        m = k * k
        w = mpmath.mpf(omega0)
        return -2 * k * w * mpmath.ellipfun("cn", mpmath.ellipk(m) - w * t, m=m)
