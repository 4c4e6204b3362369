"""A suspension spring from its blades: stiffness and pivot under the weight, clamp stress.

Each blade is a thin strip in bending under tension (a beam-column): with w(s) its sideways
deflection, s down from the clamp, E I w'''' − T w'' = 0, I = b t³/12 (width b across the
swing, thickness t along it), T the tension one blade carries (the weight shared by the
blades), λ = √(E I / T) the length over which a tensioned strip bends. The general solution is
w = A + B s + C cosh(s/λ) + D sinh(s/λ).

Boundary conditions: clamped at the top (w = w' = 0 at s = 0). At the lower end the blade is
fixed in the rigid pendulum, so its end slope is the pendulum's angle θ; for a pendulum much
longer than the blade the pull of the pendulum acts along the pendulum's own line, so the shear
at the end is T θ, i.e. w'''(L) = 0. Solving:

* the pendulum turns about a point on the clamp's vertical a distance
  ``λ·tanh(L / 2λ)`` below the clamp — the spring's bending point, which is the pivot axis
  (z = 0) of the design;
* about that point the blades add a restoring couple k θ with
  ``k = n √(E I T) / sinh(L / λ)`` (n blades); with no tension this is the plain bending
  stiffness n E I / L of a strip turned at its end, and the point is half-way down;
* the bending moment is largest at the clamp, ``√(E I T)·coth(L / λ)·θ`` per blade, which
  gives the clamp stress 6 M / (b t²) on top of the direct tension T / (b t).

(The same end couple √(E I T)·coth(L/λ) per radian is the textbook stiffness of a tensioned
strip turned at its end with no sideways force — the classic beam-column result, Timoshenko &
Gere, *Theory of Elastic Stability*, 2nd ed. 1961, ch. 1, beam-columns under tension
[pub, memory]. A swinging pendulum's end is not held so: the derivation above, checked in the
tests against ``scipy.integrate.solve_bvp`` on the beam equation, gives the figures used here.)

The stress figures are ideal elastic values with no safety factor; the tool does not certify a
spring. Fatigue under millions of swings and the clamp's edge radius decide a spring's life.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .errors import DesignError

__all__ = ["bending_length_m", "blade_stiffness_n_m_per_rad", "blade_pivot_below_clamp_m",
           "BladeStresses", "blade_clamp_stresses", "SPRING_STRESS_CAUTION"]

SPRING_STRESS_CAUTION = (
    "Spring stresses are ideal elastic figures with no safety factor; Penduline does not "
    "certify a suspension spring. Fatigue, the clamp's edges and the material's condition "
    "decide its life: have the design checked by someone qualified.")


def _check(count: int, youngs_modulus_pa: float, width_m: float, thickness_m: float,
           free_length_m: float, tension_n: float) -> None:
    if isinstance(count, bool) or not isinstance(count, int) or count < 1:
        raise DesignError("blades.count", f"must be a whole number of blades, at least 1, "
                                          f"not {count!r}")
    for name, value in (("material.youngs_modulus_pa", youngs_modulus_pa),
                        ("blades.width_m", width_m), ("blades.thickness_m", thickness_m),
                        ("blades.free_length_m", free_length_m)):
        if isinstance(value, bool) or not isinstance(value, (int, float)) \
                or not math.isfinite(value) or value <= 0.0:
            raise DesignError(name, f"must be a positive, finite number, not {value!r}")
    if isinstance(tension_n, bool) or not isinstance(tension_n, (int, float)) \
            or not math.isfinite(tension_n) or tension_n < 0.0:
        raise DesignError("blades.tension_n", f"the weight carried must be a finite number "
                                              f"of newtons, not negative: {tension_n!r}")


def _per_blade(count: int, youngs_modulus_pa: float, width_m: float, thickness_m: float,
               tension_n: float) -> tuple[float, float]:
    """(E I, T) of one blade: N·m², N."""
    inertia = width_m * thickness_m**3 / 12.0
    return youngs_modulus_pa * inertia, tension_n / count


def bending_length_m(count: int, youngs_modulus_pa: float, width_m: float, thickness_m: float,
                     tension_n: float) -> float:
    """λ = √(E I / T) of one blade, m (infinite with no tension).

    ``tension_n`` is the whole weight the spring carries, N, shared by the ``count`` blades.
    """
    _check(count, youngs_modulus_pa, width_m, thickness_m, 1.0, tension_n)
    ei, t = _per_blade(count, youngs_modulus_pa, width_m, thickness_m, tension_n)
    return math.inf if t == 0.0 else math.sqrt(ei / t)


def blade_stiffness_n_m_per_rad(count: int, youngs_modulus_pa: float, width_m: float,
                                thickness_m: float, free_length_m: float,
                                tension_n: float) -> float:
    """Restoring couple per radian the blades add about the spring's bending point, N·m/rad.

    k = n √(E I T) / sinh(L/λ), λ = √(E I / T), I = b t³ / 12, T = ``tension_n`` / n.

    Parameters
    ----------
    count : number of blades side by side, n.
    youngs_modulus_pa : E of the blade material, Pa.
    width_m : blade width b (across the plane of swing), m.
    thickness_m : blade thickness t (in the plane of swing), m.
    free_length_m : free length L between the clamps, m.
    tension_n : the whole weight the spring carries, N (shared equally).

    Raises
    ------
    DesignError
        Naming the blade field for a count below 1 or a size that is not positive and finite.
    """
    _check(count, youngs_modulus_pa, width_m, thickness_m, free_length_m, tension_n)
    ei, t = _per_blade(count, youngs_modulus_pa, width_m, thickness_m, tension_n)
    if t == 0.0:
        return count * ei / free_length_m
    x = free_length_m / math.sqrt(ei / t)
    if x > 700.0:  # sinh overflows; the couple is below 1e-300 of √(EIT)
        return 0.0
    if x < 1e-8:  # nearly untensioned: the series of x/sinh x
        return count * ei / free_length_m * (1.0 - x * x / 6.0)
    return count * math.sqrt(ei * t) / math.sinh(x)


def blade_pivot_below_clamp_m(count: int, youngs_modulus_pa: float, width_m: float,
                              thickness_m: float, free_length_m: float,
                              tension_n: float) -> float:
    """Depth of the spring's bending point (the pivot axis) below the clamp, m: λ·tanh(L/2λ).

    Half the free length with no tension; about λ for a blade many λ long.
    """
    _check(count, youngs_modulus_pa, width_m, thickness_m, free_length_m, tension_n)
    ei, t = _per_blade(count, youngs_modulus_pa, width_m, thickness_m, tension_n)
    if t == 0.0:
        return free_length_m / 2.0
    lam = math.sqrt(ei / t)
    return lam * math.tanh(free_length_m / (2.0 * lam))


@dataclass(frozen=True)
class BladeStresses:
    """Ideal elastic stresses in one blade at the clamp, Pa (no safety factor, not certified).

    Attributes
    ----------
    tension_pa : direct stress T / (b t).
    bending_pa : surface bending stress 6 M / (b t²) at the working semi-arc.
    peak_pa : their sum, on the surface in tension.
    """

    tension_pa: float
    bending_pa: float
    peak_pa: float


def blade_clamp_stresses(count: int, youngs_modulus_pa: float, width_m: float,
                         thickness_m: float, free_length_m: float, tension_n: float,
                         semi_arc_deg: float) -> BladeStresses:
    """Stresses at the clamp of one blade with the pendulum at its semi-arc, Pa.

    The clamp moment is √(E I T)·coth(L/λ)·θ₀ (E I θ₀ / L with no tension: the untensioned
    strip bends uniformly), θ₀ the semi-arc in radians (small-angle beam theory).
    """
    _check(count, youngs_modulus_pa, width_m, thickness_m, free_length_m, tension_n)
    if not math.isfinite(semi_arc_deg) or semi_arc_deg < 0.0:
        raise DesignError("swing.amplitude_deg", f"must be a finite, positive angle, not "
                                                 f"{semi_arc_deg!r}")
    ei, t = _per_blade(count, youngs_modulus_pa, width_m, thickness_m, tension_n)
    theta = math.radians(semi_arc_deg)
    if t == 0.0:
        moment = ei * theta / free_length_m
    else:
        x = free_length_m / math.sqrt(ei / t)
        moment = math.sqrt(ei * t) * theta / math.tanh(x)
    direct = t / (width_m * thickness_m)
    bending = 6.0 * moment / (width_m * thickness_m**2)
    return BladeStresses(direct, bending, direct + bending)
