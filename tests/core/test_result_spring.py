"""The Result carries the suspension's stiffness and, for a spring given by its blades, the
clamp stresses with their caution."""

from __future__ import annotations

from pathlib import Path

import pytest

from core import analyse, design_from_dict, design_to_dict, load_design
from core.blades import SPRING_STRESS_CAUTION

EXAMPLE = Path(__file__).resolve().parents[2] / "resources" / "examples" / \
    "workshop_regulator.pendulum.json"


def _with_blades(count: int = 2) -> dict:  # type: ignore[type-arg]
    d = design_to_dict(load_design(EXAMPLE))
    d["suspension"] = {"kind": "spring", "stiffness_n_m_per_rad": None,
                       "blades": {"count": count, "material": "spring_steel", "width_m": 0.006,
                                  "thickness_m": 0.0001, "free_length_m": 0.006}}
    return d


def test_knife_edge_has_no_stiffness_and_no_stresses() -> None:
    r = analyse(load_design(EXAMPLE))
    assert r.suspension_stiffness_n_m_per_rad == 0.0
    assert r.blade_stresses is None
    assert SPRING_STRESS_CAUTION not in r.cautions


def test_blade_direct_stress_is_the_weight_over_the_blades_section() -> None:
    r = analyse(design_from_dict(_with_blades(2)))
    s = r.blade_stresses
    assert s is not None
    # Plain statics: each of 2 blades carries half the weight over its 6 mm × 0.1 mm section.
    assert s.tension_pa == pytest.approx(r.mass_kg * r.g_m_s2 / 2 / (0.006 * 0.0001),
                                         rel=1e-12)
    assert s.peak_pa == pytest.approx(s.tension_pa + s.bending_pa, rel=1e-12)
    assert s.bending_pa > 0.0
    assert r.suspension_stiffness_n_m_per_rad > 0.0
    assert SPRING_STRESS_CAUTION in r.cautions


def test_more_blades_share_the_load() -> None:
    two = analyse(design_from_dict(_with_blades(2)))
    four = analyse(design_from_dict(_with_blades(4)))
    assert two.blade_stresses is not None and four.blade_stresses is not None
    # Plain statics: twice the blades, half the tension in each.
    assert four.blade_stresses.tension_pa == pytest.approx(
        two.blade_stresses.tension_pa / 2, rel=1e-12)
