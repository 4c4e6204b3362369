"""Air: density, and the added (entrained) mass of a body moving through it.

Notes
-----
Dry-air density ρ = p / (R_d T), R_d = 287.05 J/(kg·K) (ISO 2533 / ICAO standard atmosphere
[pub, memory]). ``pressure_hpa = 0`` is vacuum.

Added mass: a body of volume V moving through still air carries an extra mass C ρ V. For an
ellipsoid with semi-axes a (along the motion), b, c, ideal-flow theory gives
C = α₀ / (2 − α₀), α₀ = a b c ∫₀^∞ dλ / ((a² + λ) Δ(λ)), Δ = √((a²+λ)(b²+λ)(c²+λ))
(Lamb, *Hydrodynamics*, §114–115 [pub, memory]); in Carlson's form
α₀ = (2/3) a b c R_D(b², c², a²). It gives 1/2 for a sphere (Lamb §92) and 1 for a long
cylinder moving sideways. Every part is represented by the ellipsoid of its own extents along
the motion, across the plane of swing and along the rod — *this project's approximation* for
shapes other than the sphere. Real bobs at clock frequencies see somewhat more (C ≈ 0.6 for a
sphere, from the viscous boundary layer: Stokes 1851 [pub]); that excess is not modelled.
"""

from __future__ import annotations

import math

from scipy.special import elliprd

__all__ = ["DRY_AIR_GAS_CONSTANT", "air_density", "ellipsoid_added_mass_coefficient"]

DRY_AIR_GAS_CONSTANT = 287.05  # J/(kg·K)


def air_density(pressure_hpa: float, temperature_c: float) -> float:
    """Dry-air density, kg/m³, at pressure (hPa) and temperature (°C)."""
    return pressure_hpa * 100.0 / (DRY_AIR_GAS_CONSTANT * (temperature_c + 273.15))


def ellipsoid_added_mass_coefficient(a_m: float, b_m: float, c_m: float) -> float:
    """Added-mass coefficient C (dimensionless) of an ellipsoid moving along semi-axis ``a_m``.

    Parameters
    ----------
    a_m : float
        Semi-axis along the motion, m.
    b_m, c_m : float
        The other two semi-axes, m.
    """
    scale = max(a_m, b_m, c_m)
    a, b, c = a_m / scale, b_m / scale, c_m / scale
    alpha0 = (2.0 / 3.0) * a * b * c * float(elliprd(b * b, c * c, a * a))
    if not math.isfinite(alpha0):
        return 0.0
    return alpha0 / (2.0 - alpha0)
