"""Reference tests for core/phase.py: orbits are level sets of the energy; the separatrix.

E(θ, θ̇) = ½ I θ̇² + V(θ), V = A(1 − cos θ) + kθ²/2 (DOMAIN §2) is evaluated here directly on
the returned points; the separatrix of the knife edge is θ̇ = ±2√(A/I) cos(θ/2) (energy 2A).
"""

from __future__ import annotations

import numpy as np
import pytest

from core.phase import phase_portrait


def energy(i: float, a: float, k: float, theta: np.ndarray, rate: np.ndarray) -> np.ndarray:
    return 0.5 * i * rate**2 + a * (1 - np.cos(theta)) + 0.5 * k * theta**2


class TestPhasePortrait:
    @pytest.mark.parametrize("k, deg", [(0.0, 20.0), (0.0, 170.0), (0.4, 60.0), (3.0, 150.0)])
    def test_orbits_conserve_energy(self, k: float, deg: float) -> None:
        i, a = 1.7, 2.3
        th0 = np.radians(deg)
        p = phase_portrait(i, a, k, th0)
        for orbit in (p.current, *p.neighbours):
            amp = np.max(np.abs(orbit.angle_rad))
            e0 = a * (1 - np.cos(amp)) + 0.5 * k * amp**2
            e = energy(i, a, k, orbit.angle_rad, orbit.angular_velocity_rad_s)
            np.testing.assert_allclose(e, e0, rtol=1e-12, atol=1e-14 * e0)
        assert np.max(np.abs(p.current.angle_rad)) == pytest.approx(th0, rel=1e-14)

    def test_knife_edge_separatrix(self) -> None:
        i, a = 0.5, 3.0
        p = phase_portrait(i, a, 0.0, np.radians(30.0))
        assert p.separatrix is not None
        th, rate = p.separatrix.angle_rad, p.separatrix.angular_velocity_rad_s
        np.testing.assert_allclose(np.abs(rate), 2 * np.sqrt(a / i) * np.cos(th / 2),
                                   rtol=1e-12, atol=1e-12)
        np.testing.assert_allclose(energy(i, a, 0.0, th, rate), 2 * a, rtol=1e-12)
        # rotating orbits lie above the separatrix energy
        for orbit in p.rotating:
            assert np.all(energy(i, a, 0.0, orbit.angle_rad, orbit.angular_velocity_rad_s)
                          > 2 * a)

    def test_stiff_spring_has_no_separatrix(self) -> None:
        # V' = A sin θ + kθ > 0 for all θ > 0 when k ≥ A·0.2172… (first root of tan θ = θ):
        # with k = A the potential rises for ever — no separatrix.
        p = phase_portrait(1.0, 1.0, 1.0, np.radians(90.0))
        assert p.separatrix is None

    def test_weak_spring_separatrix_energy(self) -> None:
        # With a weak spring the separatrix passes through the first maximum of V, where
        # A sin θ + kθ = 0 — found here with numpy's root finder on a fine grid.
        i, a, k = 1.0, 1.0, 0.05
        p = phase_portrait(i, a, k, np.radians(60.0))
        assert p.separatrix is not None
        grid = np.linspace(np.pi / 2, 2 * np.pi, 2_000_001)
        slope = a * np.sin(grid) + k * grid
        theta_max = grid[np.flatnonzero(slope <= 0)[0]]
        assert np.max(p.separatrix.angle_rad) == pytest.approx(theta_max, abs=1e-5)
