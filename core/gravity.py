"""Local gravity: WGS84 normal gravity with the second-order height series.

Notes
-----
Somigliana's closed form on the ellipsoid,
γ(φ) = γₑ (1 + k sin²φ) / √(1 − e² sin²φ), and above it
γ_h = γ [1 − (2/a)(1 + f + m − 2 f sin²φ) h + 3 h²/a²]
(NIMA TR8350.2, *Department of Defense World Geodetic System 1984*, eqs. 4-1 and 4-3).
Height is taken as the site elevation above the ellipsoid; the difference from height above sea
level (the geoid, ±100 m) changes g by at most 3e-5 relative.
"""

from __future__ import annotations

import math

from .constants import STANDARD_GRAVITY

__all__ = ["STANDARD_GRAVITY", "normal_gravity"]

_GAMMA_E = 9.7803253359  # m/s², normal gravity at the equator
_K = 0.00193185265241  # Somigliana's constant
_E2 = 0.00669437999013  # first eccentricity squared
_A = 6378137.0  # m, semi-major axis
_F = 1.0 / 298.257223563  # flattening
_M = 0.00344978650684  # ω²a²b/GM


def normal_gravity(latitude_deg: float, elevation_m: float = 0.0) -> float:
    """WGS84 normal gravity, m/s², at geodetic latitude (degrees) and height (m).

    Examples
    --------
    >>> round(normal_gravity(45.0), 9)
    9.806197769
    """
    s2 = math.sin(math.radians(latitude_deg)) ** 2
    gamma = _GAMMA_E * (1.0 + _K * s2) / math.sqrt(1.0 - _E2 * s2)
    h = elevation_m
    return gamma * (1.0 - 2.0 / _A * (1.0 + _F + _M - 2.0 * _F * s2) * h + 3.0 * h * h / _A**2)
