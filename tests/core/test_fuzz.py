"""Property test: nothing but DesignError escapes the core, and what it returns is finite.

Design dicts are generated from the format-1 schema (DESIGN §3) with values drawn from valid,
boundary and hostile sets, then mutated (hostile values, missing and unknown keys, dangling or
wrong-kind `on`, duplicate names, deep nesting, wrong containers). For each:

    analyse(design_from_dict(d))  — and the same through the text path, loads_design —

either returns a result whose figures are all finite (None only where DESIGN/the core document
it: no target, no bob, no Q, no rating nut, a g override, the equator), or raises
``DesignError`` with a non-empty ``.field``. Any other exception fails the test.

Deterministic (derandomize=True, no example database) and sized to run well inside 60 s; the
number of cases run is counted and asserted at the end, and printed (`-s`) with the split
between analysed and refused designs.
"""

from __future__ import annotations

import json
import math
import time
from collections import Counter
from dataclasses import fields
from typing import Any

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from core import DesignError, Result, analyse, design_from_dict, loads_design

MAX_EXAMPLES = 2000  # ≈ 13 s of generation and analysis here; see the note in the test

HOSTILE: list[Any] = [math.nan, -math.nan, math.inf, -math.inf, 1e308, -1e308, 1e-308, 5e-324,
                      -5e-324, 0.0, -0.0, -1.0, 10**400, -(10**400), 2**63, "1.0", "", "nan",
                      True, False, None, [], [1.0], {}, {"x": 1}]
MATERIAL_KEYS = ["steel", "brass", "invar", "aluminium", "lead", "cast_iron", "wood",
                 "fused_silica"]


def number(lo: float, hi: float, extremes: tuple[float, ...] = ()) -> st.SearchStrategy[float]:
    """Realistic values (about 2/3 of draws), the range's ends and a few extremes (valid or
    just outside)."""
    realistic = st.floats(lo, hi, allow_nan=False, allow_infinity=False)
    return st.one_of(realistic, realistic, st.sampled_from([lo, hi, *extremes]))


LENGTH = number(0.05, 3.0, (1e-4, 1e-3, 1000.0, 999.9, 1e-5))
SMALL = number(0.002, 0.3, (1e-5, 1e-4, 10.0, 9.99))
MASS = st.one_of(st.none(), number(0.01, 50.0, (1e-6, 1e-5, 1e6, 3e5)))


@st.composite
def designs(draw: st.DrawFn) -> dict[str, Any]:
    """A design dict: mostly coherent geometry (so that many designs are analysed), with
    boundary values, then — for about half the cases — up to three hostile mutations."""
    fraction = st.one_of(st.floats(0.0, 1.0), st.sampled_from([0.0, 1.0]))
    parts: list[dict[str, Any]] = []
    for r in range(draw(st.integers(1, 2))):
        rod_name = f"rod{r}"
        top = draw(number(-0.1, 0.5, (-1000.0, 999.0)))
        length = draw(LENGTH)
        diameter = draw(SMALL)
        parts.append({"kind": "rod", "name": rod_name, "material": draw(st.sampled_from(
            MATERIAL_KEYS)), "top_m": top, "length_m": length, "diameter_m": diameter,
            "mass_kg": draw(MASS)})
        sleeve_name = None
        if draw(st.booleans()):
            sleeve_name = f"sleeve{r}"
            inner = diameter * draw(st.sampled_from([1.0, 1.01, 1.5, 0.99]))
            parts.append({"kind": "sleeve", "name": sleeve_name,
                          "material": draw(st.sampled_from(MATERIAL_KEYS)), "on": rod_name,
                          "length_m": max(1e-4, length * draw(fraction)),
                          "outer_diameter_m": inner * draw(st.sampled_from([1.2, 3.0, 1.0001,
                                                                            1.0])),
                          "inner_diameter_m": inner, "mass_kg": draw(MASS)})
        for b in range(draw(st.integers(0, 2))):
            shape = draw(st.sampled_from(["disc", "lens", "cylinder", "sphere"]))
            if sleeve_name is not None and b == 0 and draw(st.booleans()):
                mount: dict[str, Any] = {"kind": "on_sleeve", "on": sleeve_name}
            else:
                on_rod = fraction.map(lambda u, top=top, length=length: top + u * length)
                centre = draw(st.one_of(on_rod,
                                        number(-0.5, 3.0, (-1000.0, 1000.0))))
                mount = {"kind": "clamp", "on": rod_name, "centre_m": centre}
            bob: dict[str, Any] = {"kind": "bob", "name": f"bob{r}{b}", "shape": shape,
                                   "material": draw(st.sampled_from(MATERIAL_KEYS)),
                                   "mount": mount, "diameter_m": draw(SMALL)}
            if shape in ("disc", "lens"):
                bob["thickness_m"] = draw(SMALL)
            if shape == "cylinder":
                bob["height_m"] = draw(number(0.005, 0.5, (1e-5, 100.0)))
            bob["mass_kg"] = draw(MASS)
            parts.append(bob)
        for w in range(draw(st.integers(0, 1))):
            parts.append({"kind": "weight", "name": f"w{r}{w}",
                          "mass_kg": draw(number(1e-3, 1.0, (1e-6, 1e6))),
                          "at_m": draw(fraction.map(
                              lambda u, top=top, length=length: top + u * length)),
                          "on": rod_name})
    spring = draw(st.booleans())
    d: dict[str, Any] = {
        "format": "penduline-design", "version": 1, "name": draw(st.text(max_size=12)),
        "reference_temperature_c": draw(number(-80.0, 100.0)),
        "site": {"latitude_deg": draw(number(-90.0, 90.0, (0.0,))),
                 "elevation_m": draw(number(-500.0, 9000.0)),
                 "g_m_s2": draw(st.one_of(st.none(), number(1.0, 30.0))),
                 "temperature_c": draw(number(-80.0, 100.0)),
                 "pressure_hpa": draw(number(0.0, 1200.0, (0.0,)))},
        "suspension": ({"kind": "spring",
                        "stiffness_n_m_per_rad": draw(number(0.0, 50.0, (1e6, 1e-9)))}
                       if spring else {"kind": "knife_edge", "stiffness_n_m_per_rad": 0.0}),
        "parts": parts,
        "swing": {"amplitude_deg": draw(number(0.01, 179.9, (1e-9, 90.0, 179.89))),
                  "quality_factor": draw(st.one_of(st.none(), number(1.0, 1e9, (1.0, 1.5))))},
        "target": draw(st.sampled_from([{"period_s": 2.0}, {"period_s": None},
                                        {"beats_per_hour": 3600.0}, {"period_s": 1e4}])),
        "rating_nut": {"pitch_m": draw(st.one_of(st.none(), number(1e-4, 0.1)))},
    }
    if draw(st.booleans()):
        format2(d, draw)
    if draw(st.booleans()):
        kinds = draw(st.lists(st.sampled_from(MUTATIONS), min_size=1, max_size=3))
        for kind in sorted(kinds, key=lambda k: k == "nest"):  # nesting last: it makes d deep
            mutate(d, kind, draw)
    return d


def format2(d: dict[str, Any], draw: st.DrawFn) -> None:
    """Turn ``d`` into a version 2 file with some of DESIGN §8's data (in place)."""
    d["version"] = 2
    d["purpose"] = draw(st.sampled_from(["clock", "exhibit"]))
    if draw(st.booleans()):
        d["exhibit"] = {"pivot_above_floor_m": draw(number(0.5, 30.0, (1e-9, 1000.0))),
                        "barrier_radius_m": draw(st.one_of(st.none(), number(0.1, 10.0)))}
    if draw(st.booleans()):
        d["materials"] = {"own_zinc": {"name": "Zinc", "density_kg_m3": draw(number(10.0, 25000.0)),
                                   "expansion_per_k": draw(number(-5e-5, 5e-4)),
                                   "youngs_modulus_pa": draw(number(1e6, 1.2e12)),
                                   "source": "invented"}}
        d["parts"][0]["material"] = "own_zinc"
    if d["suspension"]["kind"] == "spring" and draw(st.booleans()):
        d["suspension"] = {"kind": "spring", "stiffness_n_m_per_rad": None, "blades": {
            "count": draw(st.integers(1, 8)), "material": "steel",
            "width_m": draw(number(1e-4, 0.2)), "thickness_m": draw(number(1e-6, 0.005)),
            "free_length_m": draw(number(1e-4, 0.1))}}
    rods = [p for p in d["parts"] if p["kind"] == "rod"]
    if len(rods) > 1 and draw(st.booleans()):
        del rods[1]["top_m"]
        rods[1]["hangs_from"] = {"part": draw(st.sampled_from([p["name"] for p in d["parts"]])),
                                 "end": draw(st.sampled_from(["lower", "upper"]))}
    for p in d["parts"]:
        if p["kind"] == "bob" and draw(st.booleans()):
            p["support"] = draw(st.sampled_from(["bottom", "centre"]))
            p["hole_diameter_m"] = draw(st.one_of(st.none(), number(1e-3, 0.05)))


MUTATIONS = ["hostile", "delete", "unknown", "dangling", "duplicate", "nest", "container",
             "retype_on"]


def _containers(obj: Any, out: list[Any], depth: int = 0) -> list[Any]:
    if isinstance(obj, (dict, list)) and depth < 6:
        out.append(obj)
        for v in (obj.values() if isinstance(obj, dict) else obj):
            _containers(v, out, depth + 1)
    return out


def mutate(d: dict[str, Any], kind: str, draw: st.DrawFn) -> None:
    """Apply one mutation of ``kind`` to ``d`` in place."""
    holders = [c for c in _containers(d, []) if c]
    holder = draw(st.sampled_from(holders))
    keys = list(holder.keys()) if isinstance(holder, dict) else list(range(len(holder)))
    key = draw(st.sampled_from(keys))
    if kind == "hostile":
        holder[key] = draw(st.sampled_from(HOSTILE))
    elif kind == "delete":
        del holder[key]
    elif kind == "unknown" and isinstance(holder, dict):
        holder[draw(st.sampled_from(["colour", "", "mass", "KIND", "parts"]))] = 1.0
    elif kind == "dangling" and isinstance(d.get("parts"), list):
        for p in d["parts"]:
            if isinstance(p, dict) and "on" in p:
                p["on"] = "nowhere"
                break
    elif kind == "duplicate" and isinstance(d.get("parts"), list) and len(d["parts"]) > 1:
        a, b = d["parts"][0], d["parts"][-1]
        if isinstance(a, dict) and isinstance(b, dict):
            b["name"] = a.get("name")
    elif kind == "nest":
        deep: Any = holder[key]
        as_list = draw(st.booleans())
        for _ in range(draw(st.sampled_from([10, 300, 3000]))):
            deep = [deep] if as_list else {"a": deep}
        holder[key] = deep
    elif kind == "container":
        holder[key] = draw(st.sampled_from([[], {}, "text", 3, None]))
    elif kind == "retype_on" and isinstance(d.get("parts"), list):
        names = [p.get("name") for p in d["parts"] if isinstance(p, dict)]
        for p in d["parts"]:
            if isinstance(p, dict) and "on" in p and names:
                p["on"] = draw(st.sampled_from(names))
                break


# ----------------------------------------------------------------------------------------------

ALLOWED_NONE = {"rate_s_per_day", "target_period_s", "bob_sensitivity_s_per_day_per_mm",
                "peak_speed_m_s"}


def _finite(value: Any) -> bool:
    if isinstance(value, np.ndarray):
        return bool(np.all(np.isfinite(value)))
    return isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(
        value)


def _check_planning(r: Result, has_bob: bool) -> None:
    """Exhibit-planning and pivot figures: finite, None only where documented."""
    assert r.purpose in ("clock", "exhibit")
    g, c, p = r.geometry, r.cable, r.pivot
    assert g is not None and c is not None and p is not None
    assert (g.bob_rise_m is None) == (not has_bob)
    for value in (g.lowest_point_m, g.outer_reach_m, g.outer_sweep_m, c.stretch_m,
                  c.stretch_rate_s_per_day, c.peak_stress_pa, p.radius_of_gyration_m,
                  p.pivot_sensitivity_s_per_day_per_mm, *([] if not has_bob else
                                                           [g.bob_rise_m])):
        assert _finite(value), value
    # None only for a body lighter than the air it displaces (no shortest-period pivot)
    buoyant = sum(b.mass_kg - r.air_density_kg_m3 * b.volume_m3 for b in r.bodies) <= 0
    for value in (p.shortest_period_pivot_m, p.shortest_period_small_s):
        assert (value is None) == buoyant and (value is None or _finite(value))
    assert p.conjugate_pivot_m is None or _finite(p.conjugate_pivot_m)


def check_result(r: Result) -> None:
    """Every figure finite; None exactly where documented."""
    d = r.design
    has_bob = any(p.kind == "bob" for p in d.parts)
    has_target = d.target.target_period_s is not None
    for f in fields(r):
        value = getattr(r, f.name)
        if f.name in ("design", "warnings", "cautions", "sensitivities", "budget", "exhibit",
                      "bodies", "motion", "phase", "period_curve", "purpose", "geometry",
                      "cable", "pivot", "blade_stresses"):
            continue
        if value is None:
            assert f.name in ALLOWED_NONE, f.name
            if f.name in ("rate_s_per_day", "target_period_s"):
                assert not has_target
            else:
                assert not has_bob, f.name
            continue
        assert _finite(value), (f.name, value)
    assert (r.rate_s_per_day is None) == (not has_target)
    assert (r.blade_stresses is None) == (d.suspension.blades is None)
    if r.blade_stresses is not None:
        assert all(math.isfinite(getattr(r.blade_stresses, f.name))
                   for f in fields(r.blade_stresses))
    _check_planning(r, has_bob)
    assert (r.peak_speed_m_s is None) == (not has_bob)
    s = r.sensitivities
    for f in fields(s):
        value = getattr(s, f.name)
        if value is None:
            assert f.name in ("bob_s_per_day_per_mm", "rating_nut_s_per_day_per_turn",
                              "elevation_s_per_day_per_100_m"), f.name
            if f.name == "elevation_s_per_day_per_100_m":
                assert d.site.g_m_s2 is not None
            elif f.name == "rating_nut_s_per_day_per_turn":
                assert d.rating_nut.pitch_m is None or not has_bob
            else:
                assert not has_bob
            continue
        assert _finite(value), (f.name, value)
    e = r.exhibit
    for f in fields(e):
        value = getattr(e, f.name)
        if value is None:
            if f.name in ("peak_speed_m_s", "sweep_width_m"):
                assert not has_bob
            elif f.name == "foucault_turn_h":
                assert abs(math.sin(math.radians(d.site.latitude_deg))) < 1e-12
            else:
                assert f.name in ("energy_lost_per_cycle_j", "drive_power_w",
                                  "cycles_to_half_amplitude", "time_to_half_amplitude_s"), f.name
                assert d.swing.quality_factor is None
            continue
        assert _finite(value), (f.name, value)
    for line in r.budget.lines:
        assert _finite(line.rate_at_low_s_per_day) and _finite(line.rate_at_high_s_per_day)
    assert _finite(r.budget.worst_case_s_per_day)
    for arr in (r.motion.time_s, r.motion.angle_rad, r.motion.angular_velocity_rad_s,
                r.motion.linear_angle_rad, r.period_curve.period_s,
                r.period_curve.circular_error_s_per_day):
        assert _finite(arr)
    for orbit in (r.phase.current, *r.phase.neighbours):
        assert _finite(orbit.angle_rad) and _finite(orbit.angular_velocity_rad_s)
    for b in r.bodies:
        assert _finite(b.mass_kg) and _finite(b.centre_m) and _finite(b.inertia_centre_kg_m2)
    assert r.period_s > 0 and r.period_small_s > 0
    json.dumps(r.report_dict(), allow_nan=False)  # the CLI's JSON form is valid JSON


def exercise(d: Any, counts: Counter[str]) -> None:
    try:
        result = analyse(design_from_dict(d))
    except DesignError as exc:
        assert isinstance(exc.field, str) and exc.field, repr(exc)
        counts["refused"] += 1
    else:
        check_result(result)
        counts["analysed"] += 1
    # the text path: the same dict as a file (hostile floats become NaN/Infinity literals)
    try:
        text = json.dumps(d)
    except (RecursionError, ValueError):
        return
    try:
        loads_design(text)
        counts["text_loaded"] += 1
    except DesignError as exc:
        assert isinstance(exc.field, str) and exc.field, repr(exc)
        counts["text_refused"] += 1


class TestFuzzAnalyse:
    @pytest.mark.slow
    def test_only_design_error_escapes(self, record_property: Any) -> None:
        counts: Counter[str] = Counter()
        started = time.monotonic()

        @settings(max_examples=MAX_EXAMPLES, deadline=None, derandomize=True, database=None,
                  suppress_health_check=list(HealthCheck))
        @given(designs())
        def run(d: dict[str, Any]) -> None:
            counts["cases"] += 1
            exercise(d, counts)

        run()
        elapsed = time.monotonic() - started
        summary = (f"fuzz: {counts['cases']} cases in {elapsed:.1f} s — {counts['analysed']} "
                   f"analysed, {counts['refused']} refused with a field; text path "
                   f"{counts['text_loaded']} loaded, {counts['text_refused']} refused")
        print(summary)
        record_property("fuzz_summary", summary)
        assert counts["cases"] >= MAX_EXAMPLES  # every generated case ran
        assert counts["analysed"] >= MAX_EXAMPLES // 10  # the generator reaches real designs
        assert counts["refused"] >= MAX_EXAMPLES // 10  # and hostile ones
        # Time is printed, not asserted; test_period bounds the quadrature's work.


class TestFuzzRegressions:
    """Hand-picked hostile inputs, kept as plain examples."""

    @pytest.mark.parametrize("mutation", [
        ("swing", "amplitude_deg", 179.9),
        ("suspension", "stiffness_n_m_per_rad", 1e6),
        ("site", "pressure_hpa", 1200.0),
    ])
    def test_extremes_stay_finite(self, mutation: tuple[str, str, Any]) -> None:
        d = {"format": "penduline-design", "version": 1,
             "site": {"latitude_deg": 0.0, "g_m_s2": 1.0, "pressure_hpa": 0.0},
             "suspension": {"kind": "spring", "stiffness_n_m_per_rad": 0.01},
             "parts": [{"kind": "rod", "name": "r", "material": "wood", "top_m": 0.0,
                        "length_m": 1000.0, "diameter_m": 10.0, "mass_kg": None}],
             "swing": {"amplitude_deg": 1.0, "quality_factor": 1.0}}
        section, key, value = mutation
        d[section][key] = value
        counts: Counter[str] = Counter()
        exercise(d, counts)
        assert counts["analysed"] + counts["refused"] == 1
