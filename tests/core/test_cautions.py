"""Warnings and cautions where they apply (issue 10, issue 13, DESIGN §6).

Thresholds for the cautions are the core's own choices, common practice, no source: the load
caution from 10 kg, a pendulum reaching 3 m or an exhibit; the heavy-pendulum caution above a
200 N weight.
"""

from __future__ import annotations

import json
import math
from pathlib import Path
from typing import Any

import pytest

from core import analyse, design_from_dict, load_design
from core.analysis import AIRY_CAUTION, LOAD_CAUTION, SPRING_CAUTION

from _core_builders import bob, clamp, design, point_pendulum, rod

EXAMPLES = Path(__file__).resolve().parents[2] / "resources" / "examples"


def _example(name: str) -> Any:
    return analyse(load_design(EXAMPLES / f"{name}.pendulum.json"))


class TestCautions:
    def test_small_clock_has_no_load_or_airy_caution(self) -> None:
        for name in ("mantel_clock", "hall_clock", "workshop_regulator"):
            r = _example(name)
            assert LOAD_CAUTION not in r.cautions and AIRY_CAUTION not in r.cautions, name

    def test_spring_note_only_with_a_spring(self) -> None:
        assert SPRING_CAUTION in _example("mantel_clock").cautions
        assert SPRING_CAUTION not in _example("workshop_regulator").cautions

    def test_long_pendulum_gets_load_and_airy(self) -> None:
        r = _example("atrium_pendulum")
        assert LOAD_CAUTION in r.cautions and AIRY_CAUTION in r.cautions

    def test_heavy_caution_shows_the_mass(self) -> None:
        # Issue 10: a 222.37 kg design showed 223 kg (weight / 9.80665); the mass does not
        # depend on the site's gravity.
        for lat in (0.0, 60.0):
            parts = [rod(length_m=12.0, diameter_m=0.005),
                     bob("sphere", diameter_m=0.3, mass_kg=220.0, mount=clamp(centre_m=12.0))]
            r = analyse(design_from_dict(design(parts, g_m_s2=None, latitude_deg=lat)))
            text = [c for c in r.cautions if c.startswith("Heavy pendulum")]
            assert text and f"({r.mass_kg:.4g} kg)" in text[0]
            assert "while it runs" in text[0]


    def test_exhibit_purpose(self) -> None:
        # An exhibit, however small, carries the load and release cautions; a clock reports
        # its purpose as "clock" (the default of DESIGN §8).
        assert _example("mantel_clock").report_dict()["purpose"] == "clock"
        d = json.loads((EXAMPLES / "mantel_clock.pendulum.json").read_text())
        d.update({"version": 2, "purpose": "exhibit"})
        r = analyse(design_from_dict(d))
        assert r.purpose == "exhibit" and r.report_dict()["purpose"] == "exhibit"
        assert LOAD_CAUTION in r.cautions and AIRY_CAUTION in r.cautions


class TestWarnings:
    def test_atrium_opens_without_warnings(self) -> None:
        # A bob hung at the end of a cable is the ordinary case (issue 10).
        assert _example("atrium_pendulum").warnings == ()

    def test_unbounded_period_only_without_spring(self) -> None:
        # V(θ) = A(1 − cos θ) + kθ²/2 has V′ = A sin θ + kθ > 0 on (0, π] for k > 0: no
        # maximum by 180°, so the period stays finite (plain calculus); without a spring the
        # maximum is at 180° and the period grows without bound.
        bare = analyse(design_from_dict(point_pendulum(1.0, amplitude_deg=160.0)))
        assert any("without bound" in w for w in bare.warnings)
        sprung = analyse(design_from_dict(point_pendulum(1.0, amplitude_deg=160.0,
                                                         stiffness=5.0e4)))
        assert not any("without bound" in w for w in sprung.warnings)
        # and its period indeed stays near the small-arc one (strong spring: k ≈ 0.5 A)
        assert sprung.period_s / sprung.period_small_s < 1.5


def test_foucault_signed() -> None:
    # 360° sin φ per sidereal day (86164.0905 s [pub, memory: IERS]); positive clockwise seen
    # from above (north), negative in the south (DOMAIN §5: 15.041°/h × sin φ).
    for lat in (45.0, -33.9):
        out = analyse(design_from_dict(point_pendulum(1.0, latitude_deg=lat))).report_dict()
        expected = 360 * math.sin(math.radians(lat)) / (86164.0905 / 3600)
        assert out["foucault_deg_per_hour"] == pytest.approx(expected, rel=1e-12)
        assert out["foucault_deg_per_hour"] == pytest.approx(
            15.041 * math.sin(math.radians(lat)), rel=1e-4)
        assert out["foucault_hours_per_turn"] == pytest.approx(360 / abs(expected), rel=1e-12)
    assert analyse(design_from_dict(point_pendulum(1.0, latitude_deg=45.0))).report_dict()[
        "foucault_hours_per_turn"] == pytest.approx(33.85, abs=0.005)  # DOMAIN §2
