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
temperature. Positions follow the mount chain (DESIGN §3, §8): a rod hung from the pivot keeps
its top; a rod that ``hangs_from`` the lower or upper end of another rod or sleeve has its top
where that end is at the temperature, and grows downward from there; a sleeve stands on the
(moving) lower end of its rod and grows upward; a clamp point and a trim weight move with the
rod above them; a bob on a sleeve rests on its top by its bottom, or at its centre
(``support: "centre"``), and grows about its centre. Masses do not change.

A bob's central hole along the rod (``hole_diameter_m``, radius r) removes the part of the body
with x² + y² ≤ r² (z along the rod, x across in the plane of swing, y along the pivot axis):

- cylinder (radius R, height h): a coaxial tube, V = π(R² − r²)h, I_c = m(3(R² + r²) + h²)/12
  (HRW table [pub, memory]);
- sphere: the bore removes V_h = (4π/3)(R³ − a³), a = √(R² − r²), leaving the napkin ring
  (π/6)(2a)³ (plain geometry), and J_h = ∫(x² + z²) dV = π[(2/3)R²(R³ − a³) − (2/5)(R⁵ − a⁵)]
  + (4π/15)(R⁵ − a⁵) [computed, cylindrical shells];
- disc and lens (outline radius R in the plane of swing, half-thickness along y of t/2, or
  (t/2)(1 − ρ²/R²) for the lens): at a depth y the body's slice is the circle x² + z² ≤ A(y),
  A = R² (disc) or R²(1 − 2|y|/t) (lens), and the bore keeps |x| ≤ X = min(√(r² − y²), √A).
  With c = √(A − X²) and φ = atan2(X, c) the slice's area is 2(Xc + Aφ) and its ∫(x² + z²) is
  Xc(2X² + A)/3 + A²φ (plain geometry); these are integrated over |y| ≤ min(r, t/2) with
  scipy.integrate.quad.

The holed body's mass is ρ(V − V_h) (a given mass wins) and I_c = m (J − J_h)/(V − V_h).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

from scipy.integrate import quad

from .air import ellipsoid_added_mass_coefficient
from .design import Bob, ClampMount, Design, Rod, Sleeve, Weight
from .materials import Material

__all__ = ["Body", "MassProperties", "layout", "mass_properties", "rods_in_series"]


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


def _rod_body(rod: Rod, mat: Material, delta_k: float, top_m: float) -> Body:
    """The rod hanging from ``top_m`` (m below the pivot, at the temperature)."""
    s = _grow(mat, delta_k)
    length, d = rod.length_m * s, rod.diameter_m * s
    volume = math.pi * d * d / 4.0 * length
    mass = rod.mass_kg if rod.mass_kg is not None else (
        mat.density_kg_m3 * volume / s**3)
    centre = top_m + length / 2.0
    return Body(rod.name, "rod", "rod", mass, centre, mass * (length**2 / 12.0 + d * d / 16.0),
                volume, ellipsoid_added_mass_coefficient(d / 2, d / 2, length / 2), length,
                top_m, top_m + length, d, 0.0, rod.material)


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


def _slice(y: float, r: float, radius: float, thickness: float, lens: bool) -> tuple[float, float]:
    """(area, ∫(x² + z²) dx dz) of the bore's share of a disc or lens slice at depth y, m², m⁴."""
    a = radius * radius * (1.0 - 2.0 * abs(y) / thickness) if lens else radius * radius
    if a <= 0.0:
        return 0.0, 0.0
    x = min(math.sqrt(max(r * r - y * y, 0.0)), math.sqrt(a))
    c = math.sqrt(max(a - x * x, 0.0))
    phi = math.atan2(x, c)
    return 2.0 * (x * c + a * phi), x * c * (2.0 * x * x + a) / 3.0 + a * a * phi


@lru_cache(maxsize=256)
def _flat_hole(r: float, radius: float, thickness: float, lens: bool) -> tuple[float, float]:
    """(V_h m³, J_h m⁵) of the bore through a disc or lens (module notes), by quadrature over
    y = r sin ψ so the integrand stays smooth where the bore's edge leaves the slice."""
    psi_max = math.asin(min(1.0, thickness / (2.0 * r)))
    points = []
    if lens:  # where √(r² − y²) = √A(y): y² − (2R²/t) y + R² − r² = 0
        b = radius * radius / thickness
        disc = b * b - (radius * radius - r * r)
        if disc >= 0.0:
            for y in (b - math.sqrt(disc), b + math.sqrt(disc)):
                if 0.0 < y < r * math.sin(psi_max):
                    points.append(math.asin(y / r))

    def part(k: int) -> float:
        def f(psi: float) -> float:
            y = r * math.sin(psi)
            return _slice(y, r, radius, thickness, lens)[k] * r * math.cos(psi)
        return 2.0 * quad(f, 0.0, psi_max, points=points or None, epsabs=0.0, epsrel=1e-13,
                          limit=200)[0]

    return part(0), part(1)


def _sphere_hole(r: float, radius: float) -> tuple[float, float]:
    """(V_h m³, J_h m⁵) of the bore through a ball (module notes), free of cancellation."""
    q = math.log1p(-(r / radius) ** 2)  # ln(a²/R²)
    d3, d5 = -math.expm1(1.5 * q) * radius**3, -math.expm1(2.5 * q) * radius**5  # R³−a³, R⁵−a⁵
    return (4.0 * math.pi / 3.0 * d3,
            math.pi * (2.0 / 3.0 * radius**2 * d3 - 0.4 * d5) + 4.0 * math.pi / 15.0 * d5)


def _bob_shape(bob: Bob, s: float) -> tuple[float, float, float, tuple[float, float, float]]:
    """(volume m³, I_c per kg m², half-height m, ellipsoid semi-axes) at scale ``s``."""
    r = bob.diameter_m * s / 2.0
    hole = 0.0 if bob.hole_diameter_m is None else bob.hole_diameter_m / 2.0
    if bob.shape == "cylinder":
        assert bob.height_m is not None
        h, bore = bob.height_m * s, hole * s
        if hole == 0.0:
            return math.pi * r * r * h, (3 * r * r + h * h) / 12.0, h / 2.0, (r, r, h / 2.0)
        return (math.pi * (r * r - bore * bore) * h, (3 * (r * r + bore * bore) + h * h) / 12.0,
                h / 2.0, (r, r, h / 2.0))  # a coaxial tube
    if bob.shape == "sphere":
        volume, k2, half, axes = 4.0 / 3.0 * math.pi * r**3, 0.4 * r * r, r, (r, r, r)
    else:
        assert bob.thickness_m is not None
        t = bob.thickness_m * s
        half, axes = r, (r, t / 2.0, r)
        volume, k2 = ((math.pi * r * r * t, r * r / 2.0) if bob.shape == "disc"
                      else (math.pi * r * r * t / 2.0, r * r / 3.0))  # lens
    if hole == 0.0:
        return volume, k2, half, axes
    radius = bob.diameter_m / 2.0  # the bore at the reference size, then scaled: V ∝ s³, J ∝ s⁵
    if bob.shape == "sphere":
        v_h, j_h = _sphere_hole(hole, radius)
    else:
        assert bob.thickness_m is not None
        v_h, j_h = _flat_hole(hole, radius, bob.thickness_m, bob.shape == "lens")
    v_h, j_h = v_h * s**3, j_h * s**5
    return volume - v_h, (volume * k2 - j_h) / (volume - v_h), half, axes


def _bob_body(bob: Bob, design: Design, bodies: dict[str, Body], delta_k: float) -> Body:
    mat = design.material(bob.material)
    s = _grow(mat, delta_k)
    volume, k2, half, axes = _bob_shape(bob, s)
    mass = bob.mass_kg if bob.mass_kg is not None else (
        mat.density_kg_m3 * volume / s**3)
    if isinstance(bob.mount, ClampMount):
        centre = _on_rod(design, bodies, bob.mount.on, bob.mount.centre_m, delta_k)
    else:  # resting on the sleeve's top: by its bottom (default) or at its centre
        centre = bodies[bob.mount.on].top_m - (0.0 if bob.support == "centre" else half)
    width = bob.diameter_m * s
    bore = 0.0 if bob.hole_diameter_m is None else bob.hole_diameter_m * s
    return Body(bob.name, "bob", bob.shape, mass, centre, mass * k2, volume,
                ellipsoid_added_mass_coefficient(*axes), 0.0, centre - half, centre + half,
                width, bore, bob.material)


def _on_rod(design: Design, bodies: dict[str, Body], name: str, z_m: float,
            delta_k: float) -> float:
    """Where the point of rod ``name`` that is ``z_m`` below the pivot at the reference
    temperature is at ``delta_k``: it moves with the rod's top and the rod's growth above it."""
    rod = design.part(name)
    assert isinstance(rod, Rod)
    return bodies[name].top_m + (z_m - rod.top_m) * _grow(design.material(rod.material), delta_k)


def _weight_body(weight: Weight, design: Design, bodies: dict[str, Body], delta_k: float) -> Body:
    z = _on_rod(design, bodies, weight.on, weight.at_m, delta_k)
    return Body(weight.name, "weight", "point", weight.mass_kg, z, 0.0, 0.0, 0.0, 0.0, z, z, 0.0)


def _place_chain(design: Design, delta_k: float) -> dict[str, Body]:
    """Every rod and sleeve at ``delta_k`` from the reference temperature, following the mount
    chain from the pivot (the validator refuses loops and wrong kinds)."""
    bodies: dict[str, Body] = {}

    def place(name: str) -> Body:
        if name not in bodies:
            p = design.part(name)
            if isinstance(p, Rod):
                top = p.top_m
                if p.hangs_from is not None:
                    above = place(p.hangs_from.part)
                    top = above.bottom_m if p.hangs_from.end == "lower" else above.top_m
                bodies[name] = _rod_body(p, design.material(p.material), delta_k, top)
            else:
                assert isinstance(p, Sleeve)
                bodies[name] = _sleeve_body(p, design.material(p.material), place(p.on),
                                            delta_k)
        return bodies[name]

    for p in design.parts:
        if isinstance(p, Rod | Sleeve):
            place(p.name)
    return bodies


def layout(design: Design, temperature_c: float | None = None) -> tuple[Body, ...]:
    """Every part of ``design`` as it hangs at ``temperature_c`` (default: the site's), in the
    order of the design's part list."""
    t = design.site.temperature_c if temperature_c is None else temperature_c
    delta_k = t - design.reference_temperature_c
    bodies = _place_chain(design, delta_k)
    for p in design.parts:
        if isinstance(p, Bob):
            bodies[p.name] = _bob_body(p, design, bodies, delta_k)
        elif isinstance(p, Weight):
            bodies[p.name] = _weight_body(p, design, bodies, delta_k)
    return tuple(bodies[p.name] for p in design.parts)


def rods_in_series(design: Design) -> tuple[tuple[str, str], ...]:
    """(rod, rod above) for each rod whose top is fixed below the pivot on the span of another
    rod: its top stays put as the rod above grows, so it does not follow that rod with
    temperature (a ``hangs_from`` mount would)."""
    rods = [p for p in design.parts if isinstance(p, Rod)]
    out = []
    for lower in rods:
        if lower.hangs_from is not None or lower.top_m <= 0.0:
            continue
        for upper in rods:
            if upper.top_m < lower.top_m <= upper.top_m + upper.length_m * (1.0 + 1e-9):
                out.append((lower.name, upper.name))
                break
    return tuple(out)


def mass_properties(bodies: tuple[Body, ...], air_density_kg_m3: float = 0.0) -> MassProperties:
    """Totals of ``bodies`` in air of the given density (0: vacuum)."""
    mass = sum(b.mass_kg for b in bodies)
    first = sum(b.mass_kg * b.centre_m for b in bodies)
    inertia = sum(b.inertia_centre_kg_m2 + b.mass_kg * b.centre_m**2 for b in bodies)
    volume = sum(b.volume_m3 for b in bodies)
    displaced = air_density_kg_m3 * sum(b.volume_m3 * b.centre_m for b in bodies)
    added = air_density_kg_m3 * sum(b.added_inertia_per_density for b in bodies)
    return MassProperties(mass, first, inertia, volume, displaced, added)
