"""Reference tests for the mount chain at temperature (core/mass_properties.py, DESIGN §3, §8).

Gridiron-style and tube-on-rod designs are worked out here by hand, independently of the core:
each part's length and diameter grow as ℓ(1 + αΔT) with its own α (DOMAIN §2 Temperature); the
chain is followed from the pivot (a rod hung from an end starts where that end is, a sleeve
stands on its rod's lower end and grows upward, a clamp point moves with its rod, a bob
supported at its centre has its centre on the sleeve's top); the inertias about each centre are
the HRW table (DOMAIN §2 [pub, memory]) with the parallel-axis theorem; the period is the
compound-pendulum T₀ = 2π√(I/(M g h)) in vacuum, and the temperature coefficient is
−86400 (dT₀/dΔT)/T₀ s/day/K, differentiated by mpmath at 40 digits. The α and ρ values are the
inputs (from the material table or the design), not results.
"""

from __future__ import annotations

import copy
from collections.abc import Callable
from typing import Any

import mpmath
import pytest

from core import analyse, design_from_dict
from core.mass_properties import Body, layout, rods_in_series
from core.materials import MATERIALS

from _core_builders import G_N, bob, clamp, design, on_sleeve, rod, sleeve

mpmath.mp.dps = 40
DAY = 86400  # s
ZINC = {"name": "Zinc tube, test stock", "density_kg_m3": 7140.0, "expansion_per_k": 3.0e-5,
        "youngs_modulus_pa": 1.08e11, "source": "test input"}
ALPHA = {key: m.expansion_per_k for key, m in MATERIALS.items()} | {
    "tube_zinc": ZINC["expansion_per_k"]}
RHO = {key: m.density_kg_m3 for key, m in MATERIALS.items()} | {
    "tube_zinc": ZINC["density_kg_m3"]}
Piece = tuple[Any, Any, Any]  # (mass kg, centre m, I about the centre kg·m²), mpmath numbers


def v2(parts: list[dict[str, Any]], **kw: Any) -> dict[str, Any]:
    d = design(parts, amplitude_deg=1.0, **kw)
    d["version"] = 2
    d["materials"] = {"tube_zinc": dict(ZINC)}
    return d


def hung(d: dict[str, Any], part: str, end: str) -> dict[str, Any]:
    d = dict(d)
    del d["top_m"]
    d["hangs_from"] = {"part": part, "end": end}
    return d


def s(material: str, dt: Any) -> Any:
    return 1 + mpmath.mpf(ALPHA[material]) * dt


def rod_piece(material: str, top: Any, length: float, diameter: float, dt: Any) -> Piece:
    m = mpmath.mpf(RHO[material]) * mpmath.pi * mpmath.mpf(diameter) ** 2 / 4 * length
    ell, d = length * s(material, dt), diameter * s(material, dt)
    return m, top + ell / 2, m * (ell**2 / 12 + d**2 / 16)


def tube_piece(material: str, bottom: Any, length: float, outer: float, inner: float,
               dt: Any) -> Piece:
    big, small = mpmath.mpf(outer) / 2, mpmath.mpf(inner) / 2
    m = mpmath.mpf(RHO[material]) * mpmath.pi * (big**2 - small**2) * length
    g = s(material, dt)
    ell = length * g
    return m, bottom - ell / 2, m * (3 * ((big * g) ** 2 + (small * g) ** 2) + ell**2) / 12


def period(pieces: list[Piece]) -> Any:
    inertia = sum(m * z * z + ic for m, z, ic in pieces)
    first = sum(m * z for m, z, _ in pieces)
    return 2 * mpmath.pi * mpmath.sqrt(inertia / (mpmath.mpf(G_N) * first))


def coefficient(pieces_at: Callable[[Any], list[Piece]]) -> float:
    """−86400 T₀'/T₀ at ΔT = 0, s/day/K — mpmath at 40 digits."""
    p0 = period(pieces_at(mpmath.mpf(0)))
    return float(-DAY * mpmath.diff(lambda dt: period(pieces_at(dt)), 0) / p0)


# --------------------------------------------------------------------------- the designs

def gridiron() -> tuple[dict[str, Any], Callable[[Any], list[Piece]]]:
    """Steel rod down 0.9 m, a brass tube 0.8 m standing up from its end, a steel rod 1.0 m
    hanging from the tube's top, a cast-iron cylinder clamped 0.95 m down that rod."""
    parts = [rod("outer", "steel", 0.0, 0.9, 0.006),
             sleeve("tube", "brass", "outer", 0.8, 0.016, 0.008),
             hung(rod("inner", "steel", 0.0, 1.0, 0.006), "tube", "upper"),
             bob("cylinder", material="cast_iron", diameter_m=0.1, height_m=0.1,
                 mount=clamp("inner", 1.05))]

    def pieces(dt: Any) -> list[Piece]:
        outer_end = 0.9 * s("steel", dt)
        tube_top = outer_end - 0.8 * s("brass", dt)
        m_bob = mpmath.mpf(RHO["cast_iron"]) * mpmath.pi * mpmath.mpf(0.05) ** 2 * 0.1
        r, h = 0.05 * s("cast_iron", dt), 0.1 * s("cast_iron", dt)
        return [rod_piece("steel", mpmath.mpf(0), 0.9, 0.006, dt),
                tube_piece("brass", outer_end, 0.8, 0.016, 0.008, dt),
                rod_piece("steel", tube_top, 1.0, 0.006, dt),
                (m_bob, tube_top + 0.95 * s("steel", dt), m_bob * (3 * r * r + h * h) / 12)]
    return v2(parts), pieces


def five_bar_gridiron() -> tuple[dict[str, Any], Callable[[Any], list[Piece]]]:
    """Steel, brass, steel, brass, steel in series (nearly compensated); a lead ball clamped on
    the last rod."""
    parts = [rod("a", "steel", 0.0, 0.86, 0.005),
             sleeve("s1", "brass", "a", 0.76, 0.012, 0.006),
             hung(rod("b", "steel", 0.0, 0.86, 0.005), "s1", "upper"),
             sleeve("s2", "brass", "b", 0.76, 0.012, 0.006),
             hung(rod("c", "steel", 0.0, 0.85, 0.005), "s2", "upper"),
             bob("sphere", material="lead", diameter_m=0.1, mount=clamp("c", 1.0))]

    def pieces(dt: Any) -> list[Piece]:
        a_end = 0.86 * s("steel", dt)
        s1_top = a_end - 0.76 * s("brass", dt)
        b_end = s1_top + 0.86 * s("steel", dt)
        s2_top = b_end - 0.76 * s("brass", dt)
        m_bob = mpmath.mpf(RHO["lead"]) * 4 * mpmath.pi / 3 * mpmath.mpf(0.05) ** 3
        r = 0.05 * s("lead", dt)
        return [rod_piece("steel", mpmath.mpf(0), 0.86, 0.005, dt),
                tube_piece("brass", a_end, 0.76, 0.012, 0.006, dt),
                rod_piece("steel", s1_top, 0.86, 0.005, dt),
                tube_piece("brass", b_end, 0.76, 0.012, 0.006, dt),
                rod_piece("steel", s2_top, 0.85, 0.005, dt),
                (m_bob, s2_top + 0.8 * s("steel", dt), m_bob * 2 * r * r / 5)]
    return v2(parts), pieces


def tube_on_rod() -> tuple[dict[str, Any], Callable[[Any], list[Piece]]]:
    """Steel rod 1.2 m, a zinc tube 0.4 m standing on its end, a lead cylinder with a 21 mm
    bore over the tube, supported at its centre on the tube's top."""
    holed = {**bob("cylinder", material="lead", diameter_m=0.12, height_m=0.14,
                   mount=on_sleeve("tube")), "support": "centre", "hole_diameter_m": 0.021}
    parts = [rod("rod", "steel", 0.0, 1.2, 0.008),
             sleeve("tube", "tube_zinc", "rod", 0.4, 0.02, 0.009), holed]

    def pieces(dt: Any) -> list[Piece]:
        rod_end = 1.2 * s("steel", dt)
        # the bob is a coaxial tube (HRW table): m(3(R² + r²) + h²)/12
        return [rod_piece("steel", mpmath.mpf(0), 1.2, 0.008, dt),
                tube_piece("tube_zinc", rod_end, 0.4, 0.02, 0.009, dt),
                tube_piece("lead", rod_end - 0.4 * s("tube_zinc", dt) + 0.07 * s("lead", dt),
                           0.14, 0.12, 0.021, dt)]
    return v2(parts), pieces


def rods_end_to_end() -> tuple[dict[str, Any], Callable[[Any], list[Piece]]]:
    """A brass rod 0.5 m hanging from the lower end of a steel rod 0.6 m; a brass disc clamped
    on it."""
    parts = [rod("upper", "steel", 0.0, 0.6, 0.006),
             hung(rod("lower", "brass", 0.0, 0.5, 0.004), "upper", "lower"),
             bob("disc", material="brass", diameter_m=0.08, thickness_m=0.01,
                 mount=clamp("lower", 1.05))]

    def pieces(dt: Any) -> list[Piece]:
        top = 0.6 * s("steel", dt)
        m_bob = mpmath.mpf(RHO["brass"]) * mpmath.pi * mpmath.mpf(0.04) ** 2 * 0.01
        r = 0.04 * s("brass", dt)
        return [rod_piece("steel", mpmath.mpf(0), 0.6, 0.006, dt),
                rod_piece("brass", top, 0.5, 0.004, dt),
                (m_bob, top + 0.45 * s("brass", dt), m_bob * r * r / 2)]
    return v2(parts), pieces


DESIGNS = {"gridiron": gridiron, "five bars": five_bar_gridiron, "tube on rod": tube_on_rod,
           "rods end to end": rods_end_to_end}


@pytest.mark.parametrize("make", DESIGNS.values(), ids=DESIGNS.keys())
class TestChainAgainstHandCalculation:
    def test_temperature_coefficient(self, make: Any) -> None:
        d, pieces = make()
        got = analyse(design_from_dict(d)).temperature_coefficient_s_per_day_per_k
        assert got == pytest.approx(coefficient(pieces), rel=1e-6, abs=0)

    @pytest.mark.parametrize("dt", [-30.0, 45.0])
    def test_every_part_where_the_chain_puts_it(self, make: Any, dt: float) -> None:
        d, pieces = make()
        bodies = layout(design_from_dict(d), 20.0 + dt)
        for body, (m, z, ic) in zip(bodies, pieces(mpmath.mpf(dt)), strict=True):
            assert body.mass_kg == pytest.approx(float(m), rel=1e-13), body.name
            assert body.centre_m == pytest.approx(float(z), rel=0, abs=1e-14), body.name
            assert body.inertia_centre_kg_m2 == pytest.approx(float(ic), rel=1e-12), body.name


class TestCompensation:
    def test_the_bob_on_its_centre_stays_put_as_the_bob_grows(self) -> None:
        d, _ = tube_on_rod()
        cold, warm = (layout(design_from_dict(d), t)[2] for t in (20.0, 60.0))
        tube_cold, tube_warm = (layout(design_from_dict(d), t)[1] for t in (20.0, 60.0))
        assert warm.centre_m - cold.centre_m == pytest.approx(
            tube_warm.top_m - tube_cold.top_m, rel=1e-12)
        assert warm.top_m - cold.top_m < warm.centre_m - cold.centre_m  # grew about its centre


class TestRodsInSeriesWarning:
    def _series(self) -> dict[str, Any]:
        return design([rod("upper", "steel", 0.0, 0.6, 0.006),
                       rod("lower", "brass", 0.6, 0.5, 0.004),
                       bob("disc", material="brass", diameter_m=0.08, thickness_m=0.01,
                           mount=clamp("lower", 1.05))])

    def test_a_fixed_top_on_another_rod_is_named(self) -> None:
        r = analyse(design_from_dict(self._series()))
        said = [w for w in r.warnings if "'lower'" in w and "'upper'" in w]
        assert len(said) == 1 and "hangs_from" in said[0] and "temperature" in said[0]
        assert rods_in_series(design_from_dict(self._series())) == (("lower", "upper"),)

    def test_and_its_coefficient_is_the_fixed_top_one(self) -> None:
        # With a fixed top the lower rod's share is only its own growth: the coefficient is the
        # hand calculation with the lower rod's top held at 0.6 m, not the chain's.
        fixed = analyse(design_from_dict(self._series())).temperature_coefficient_s_per_day_per_k
        _, chained = rods_end_to_end()

        def pieces(dt: Any) -> list[Piece]:
            m_bob = mpmath.mpf(RHO["brass"]) * mpmath.pi * mpmath.mpf(0.04) ** 2 * 0.01
            r = 0.04 * s("brass", dt)
            return [rod_piece("steel", mpmath.mpf(0), 0.6, 0.006, dt),
                    rod_piece("brass", mpmath.mpf(0.6), 0.5, 0.004, dt),
                    (m_bob, 0.6 + 0.45 * s("brass", dt), m_bob * r * r / 2)]
        assert fixed == pytest.approx(coefficient(pieces), rel=1e-6)
        assert abs(fixed) < 0.6 * abs(coefficient(chained))

    def test_hung_from_the_end_no_warning(self) -> None:
        d, _ = rods_end_to_end()
        r = analyse(design_from_dict(d))
        assert not [w for w in r.warnings if "hangs_from" in w]
        assert rods_in_series(design_from_dict(d)) == ()

    def test_rods_side_by_side_from_the_pivot_are_not_in_series(self) -> None:
        d = design([rod("a"), rod("b", diameter_m=0.004), bob(mount=clamp("a", 1.0))])
        assert rods_in_series(design_from_dict(d)) == ()

    def test_a_rod_starting_part_way_down_another_is_in_series(self) -> None:
        d = copy.deepcopy(self._series())
        d["parts"][1]["top_m"] = 0.3
        d["parts"][2]["mount"]["centre_m"] = 0.75
        assert rods_in_series(design_from_dict(d)) == (("lower", "upper"),)


def test_bodies_keep_the_part_order() -> None:
    # A rod listed before the sleeve it hangs from is still placed after it.
    d, _ = gridiron()
    d["parts"] = [d["parts"][2], d["parts"][3], d["parts"][0], d["parts"][1]]
    bodies: tuple[Body, ...] = layout(design_from_dict(d), 50.0)
    assert [b.name for b in bodies] == ["inner", "bob", "outer", "tube"]
    assert bodies[0].top_m == pytest.approx(bodies[3].top_m, rel=0, abs=1e-15)
