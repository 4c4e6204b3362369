"""Where every part hangs at a given temperature, and the pendulum's mass properties.

Notes
-----
Moments of inertia about each part's own centre, for rotation about an axis perpendicular to
the plane of swing (Halliday, Resnick & Walker, table of rotational inertias [pub, memory]):
round rod m(ℓ²/12 + d²/16); tube m(3(R² + r²) + ℓ²)/12; disc in its own plane m R²/2; upright
cylinder m(3R² + ℓ²)/12; sphere 2mR²/5; lens with a paraboloidal thickness profile m R²/3
(mass ρ π R² t / 2) [computed]; point weight 0. About the pivot: I = Σ(I_c + m z²); first
moment M h = Σ m z.

Temperature: every length of a part scales with its own material, (1 + α ΔT) from the reference
temperature. A rod's top stays where it hangs from; a clamp point and a trim weight move with
the rod above them; a sleeve stands on the (moving) lower end of its rod and grows upward; a
bob on a sleeve rests on its top and grows about its centre. Masses do not change.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .air import ellipsoid_added_mass_coefficient
from .design import Bob, ClampMount, Design, Rod, Sleeve, Weight
from .materials import Material

__all__ = ["Body", "MassProperties", "layout", "mass_properties"]


@dataclass(frozen=True)
class Body:
    """One part as it hangs: mass, position, inertia and the extents used for air and drawing.

    All lengths in m (positions down from the pivot), masses in kg, inertia in kg·m².
    """

    name: str
    kind: str
    shape: str
    mass_kg: float
    centre_m: float
    inertia_centre_kg_m2: float
    volume_m3: float
    added_mass_coefficient: float
    length_along_m: float  # extent along the rod (for distributed added inertia), 0 for compact
    top_m: float
    bottom_m: float
    width_m: float  # extent across, in the plane of swing
    inner_width_m: float = 0.0
    material: str = ""

    @property
    def added_inertia_per_density(self) -> float:
        """Added moment of inertia about the pivot per unit air density, m⁵."""
        spread = self.length_along_m**2 / 12.0 if self.length_along_m else 0.0
        return self.added_mass_coefficient * self.volume_m3 * (self.centre_m**2 + spread)


@dataclass(frozen=True)
class MassProperties:
    """Totals over the bodies, in vacuum and in air.

    Attributes
    ----------
    mass_kg : float
        Total mass M, kg.
    first_moment_kg_m : float
        M h = Σ m z, kg·m.
    inertia_pivot_kg_m2 : float
        I about the pivot, kg·m².
    displaced_first_moment_kg_m : float
        Σ ρ V z with ρ the air density: buoyancy's share of the first moment, kg·m.
    added_inertia_kg_m2 : float
        Moment of inertia of the air carried along, kg·m².
    """

    mass_kg: float
    first_moment_kg_m: float
    inertia_pivot_kg_m2: float
    volume_m3: float
    displaced_first_moment_kg_m: float
    added_inertia_kg_m2: float

    @property
    def centre_of_mass_m(self) -> float:
        return self.first_moment_kg_m / self.mass_kg

    @property
    def equivalent_length_m(self) -> float:
        """L_eq = I / (M h), m (in vacuum, no spring)."""
        return self.inertia_pivot_kg_m2 / self.first_moment_kg_m

    @property
    def effective_inertia_kg_m2(self) -> float:
        return self.inertia_pivot_kg_m2 + self.added_inertia_kg_m2

    @property
    def effective_first_moment_kg_m(self) -> float:
        return self.first_moment_kg_m - self.displaced_first_moment_kg_m


def _grow(material: Material, delta_k: float) -> float:
    return 1.0 + material.expansion_per_k * delta_k


def _rod_body(rod: Rod, mat: Material, delta_k: float) -> Body:
    s = _grow(mat, delta_k)
    length, d = rod.length_m * s, rod.diameter_m * s
    volume = math.pi * d * d / 4.0 * length
    mass = rod.mass_kg if rod.mass_kg is not None else (
        mat.density_kg_m3 * volume / s**3)
    centre = rod.top_m + length / 2.0
    return Body(rod.name, "rod", "rod", mass, centre, mass * (length**2 / 12.0 + d * d / 16.0),
                volume, ellipsoid_added_mass_coefficient(d / 2, d / 2, length / 2), length,
                rod.top_m, rod.top_m + length, d, 0.0, rod.material)


def _sleeve_body(sleeve: Sleeve, mat: Material, rod: Body, delta_k: float) -> Body:
    s = _grow(mat, delta_k)
    length = sleeve.length_m * s
    big, small = sleeve.outer_diameter_m * s / 2.0, sleeve.inner_diameter_m * s / 2.0
    volume = math.pi * (big * big - small * small) * length
    mass = sleeve.mass_kg if sleeve.mass_kg is not None else (
        mat.density_kg_m3 * volume / s**3)
    bottom = rod.bottom_m
    centre = bottom - length / 2.0
    inertia = mass * (3.0 * (big * big + small * small) + length**2) / 12.0
    return Body(sleeve.name, "sleeve", "tube", mass, centre, inertia, volume,
                ellipsoid_added_mass_coefficient(big, big, length / 2), length,
                bottom - length, bottom, 2 * big, 2 * small, sleeve.material)


def _bob_shape(bob: Bob, s: float) -> tuple[float, float, float, tuple[float, float, float]]:
    """(volume m³, I_c per kg m², half-height m, ellipsoid semi-axes) at scale ``s``."""
    r = bob.diameter_m * s / 2.0
    if bob.shape == "sphere":
        return 4.0 / 3.0 * math.pi * r**3, 0.4 * r * r, r, (r, r, r)
    if bob.shape == "cylinder":
        assert bob.height_m is not None
        h = bob.height_m * s
        return math.pi * r * r * h, (3 * r * r + h * h) / 12.0, h / 2.0, (r, r, h / 2.0)
    assert bob.thickness_m is not None
    t = bob.thickness_m * s
    if bob.shape == "disc":
        return math.pi * r * r * t, r * r / 2.0, r, (r, t / 2.0, r)
    return math.pi * r * r * t / 2.0, r * r / 3.0, r, (r, t / 2.0, r)  # lens


def _bob_body(bob: Bob, design: Design, bodies: dict[str, Body], delta_k: float) -> Body:
    mat = design.material(bob.material)
    s = _grow(mat, delta_k)
    volume, k2, half, axes = _bob_shape(bob, s)
    mass = bob.mass_kg if bob.mass_kg is not None else (
        mat.density_kg_m3 * volume / s**3)
    if isinstance(bob.mount, ClampMount):
        rod = design.part(bob.mount.on)
        assert isinstance(rod, Rod)
        centre = rod.top_m + (bob.mount.centre_m - rod.top_m) * _grow(
            design.material(rod.material), delta_k)
    else:  # resting on the sleeve's top: by its bottom (default) or at its centre
        centre = bodies[bob.mount.on].top_m - (0.0 if bob.support == "centre" else half)
    width = bob.diameter_m * s
    return Body(bob.name, "bob", bob.shape, mass, centre, mass * k2, volume,
                ellipsoid_added_mass_coefficient(*axes), 0.0, centre - half, centre + half,
                width, 0.0, bob.material)


def _weight_body(weight: Weight, design: Design, delta_k: float) -> Body:
    rod = design.part(weight.on)
    assert isinstance(rod, Rod)
    z = rod.top_m + (weight.at_m - rod.top_m) * _grow(design.material(rod.material), delta_k)
    return Body(weight.name, "weight", "point", weight.mass_kg, z, 0.0, 0.0, 0.0, 0.0, z, z, 0.0)


def layout(design: Design, temperature_c: float | None = None) -> tuple[Body, ...]:
    """Every part of ``design`` as it hangs at ``temperature_c`` (default: the site's), in the
    order of the design's part list."""
    t = design.site.temperature_c if temperature_c is None else temperature_c
    delta_k = t - design.reference_temperature_c
    bodies: dict[str, Body] = {}
    for p in design.parts:  # rods first: everything else hangs from them
        if isinstance(p, Rod):
            bodies[p.name] = _rod_body(p, design.material(p.material), delta_k)
    for p in design.parts:
        if isinstance(p, Sleeve):
            bodies[p.name] = _sleeve_body(p, design.material(p.material), bodies[p.on],
                                          delta_k)
    for p in design.parts:
        if isinstance(p, Bob):
            bodies[p.name] = _bob_body(p, design, bodies, delta_k)
        elif isinstance(p, Weight):
            bodies[p.name] = _weight_body(p, design, delta_k)
    return tuple(bodies[p.name] for p in design.parts)


def mass_properties(bodies: tuple[Body, ...], air_density_kg_m3: float = 0.0) -> MassProperties:
    """Totals of ``bodies`` in air of the given density (0: vacuum)."""
    mass = sum(b.mass_kg for b in bodies)
    first = sum(b.mass_kg * b.centre_m for b in bodies)
    inertia = sum(b.inertia_centre_kg_m2 + b.mass_kg * b.centre_m**2 for b in bodies)
    volume = sum(b.volume_m3 for b in bodies)
    displaced = air_density_kg_m3 * sum(b.volume_m3 * b.centre_m for b in bodies)
    added = air_density_kg_m3 * sum(b.added_inertia_per_density for b in bodies)
    return MassProperties(mass, first, inertia, volume, displaced, added)
