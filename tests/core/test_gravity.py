"""Reference tests for core/gravity.py: WGS84 normal gravity and its height series.

Formula and constants: NIMA TR8350.2 (WGS 84), Somigliana's closed form and the second-order
height series, eqs. 4-1 and 4-3 [pub, memory for the equation numbers]. Check values: DOMAIN §3
[computed there at 30–40 digits], re-derived here with mpmath at 40 digits.
"""

from __future__ import annotations

import mpmath
import pytest

from core.gravity import STANDARD_GRAVITY, normal_gravity

mpmath.mp.dps = 40

# WGS 84 defining and derived constants, NIMA TR8350.2 [pub, memory]
GAMMA_E = mpmath.mpf("9.7803253359")
K_S = mpmath.mpf("0.00193185265241")
E2 = mpmath.mpf("0.00669437999013")
A = mpmath.mpf(6378137)
F = 1 / mpmath.mpf("298.257223563")
M = mpmath.mpf("0.00344978650684")


def mp_gravity(lat_deg: float, h: float = 0.0) -> mpmath.mpf:
    """Somigliana with the second-order height series — mpmath at 40 digits."""
    s2 = mpmath.sin(mpmath.radians(mpmath.mpf(lat_deg))) ** 2
    gamma = GAMMA_E * (1 + K_S * s2) / mpmath.sqrt(1 - E2 * s2)
    h = mpmath.mpf(h)
    return gamma * (1 - 2 / A * (1 + F + M - 2 * F * s2) * h + 3 * h * h / A**2)


class TestNormalGravity:
    @pytest.mark.parametrize("lat, h, published", [
        (0.0, 0.0, 9.7803253359),      # DOMAIN §3 (= γₑ, TR8350.2 [pub, memory])
        (30.0, 0.0, 9.79324726922),    # DOMAIN §3
        (45.0, 0.0, 9.80619776937),    # DOMAIN §3
        (60.0, 0.0, 9.81917695311),    # DOMAIN §3
        (90.0, 0.0, 9.83218493786),    # DOMAIN §3
        (45.0, 1000.0, 9.80311294355),  # DOMAIN §3, second-order height series
    ])
    def test_check_values(self, lat: float, h: float, published: float) -> None:
        got = normal_gravity(lat, h)
        assert got == pytest.approx(published, rel=0, abs=1e-9)
        assert got == pytest.approx(float(mp_gravity(lat, h)), rel=0, abs=1e-13)  # mpmath

    def test_symmetric_in_latitude(self) -> None:
        # Normal gravity depends on sin²φ only [TR8350.2].
        for lat in (10.0, 52.0, 89.0):
            assert normal_gravity(-lat, 300.0) == pytest.approx(normal_gravity(lat, 300.0),
                                                                rel=1e-15)

    def test_height_trap(self) -> None:
        # DOMAIN §4: the plain free-air gradient −3.086e-6·h is off by ≈1.1e-6 m/s² at 1000 m
        # against the second-order series. The core follows the series: it matches the series to
        # 1e-9 and is > 1e-6 away from the linear gradient.
        series = float(mp_gravity(45.0, 1000.0))
        linear = float(mp_gravity(45.0)) - 3.086e-6 * 1000.0
        got = normal_gravity(45.0, 1000.0)
        assert abs(got - series) < 1e-9
        assert abs(got - linear) > 1.0e-6
        assert abs(series - linear) == pytest.approx(1.17e-6, abs=0.05e-6)

    @pytest.mark.parametrize("h", [-400.0, 2500.0, 8800.0])
    def test_other_heights(self, h: float) -> None:
        # mpmath at 40 digits of the same published series.
        assert normal_gravity(37.5, h) == pytest.approx(float(mp_gravity(37.5, h)), rel=0,
                                                        abs=1e-13)


class TestStandardGravity:
    def test_value(self) -> None:
        assert STANDARD_GRAVITY == 9.80665  # 3rd CGPM (1901) [pub]
