"""The field table (core/fields.py) is the one home of each field's facts, and the validator,
the writer, field_range and check_number all read it."""

from __future__ import annotations

import copy
import math
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import pytest

from core import DesignError, design_from_dict, design_to_dict, load_design
from core.fields import (
    CHOICES,
    FIELDS,
    UNIT_KINDS,
    FieldPath,
    FieldSpec,
    choice_label,
    field_spec,
    range_text,
)
from core.fileformat import check_number, field_range, set_in_dict
from core.materials import MATERIALS

ROOT = Path(__file__).resolve().parents[2]
EXAMPLES = sorted(str(p) for p in (ROOT / "resources" / "examples").glob("*.pendulum.json"))



def sample_a() -> dict[str, Any]:
    """A format-2 design holding every field except those of sample_b."""
    return {
        "format": "penduline-design", "version": 2, "name": "Sample A", "purpose": "exhibit",
        "reference_temperature_c": 20.0,
        "materials": {"own_zinc": {"name": "Zinc", "density_kg_m3": 7140.0,
                                   "expansion_per_k": 3.0e-5, "youngs_modulus_pa": 1.08e11,
                                   "source": "invented for a test"}},
        "site": {"latitude_deg": 52.0, "elevation_m": 40.0, "g_m_s2": 9.81,
                 "temperature_c": 20.0, "pressure_hpa": 1013.25},
        "suspension": {"kind": "spring", "stiffness_n_m_per_rad": 0.5},
        "parts": [
            {"kind": "rod", "name": "rod", "material": "own_zinc", "top_m": 0.0, "length_m": 1.0,
             "diameter_m": 0.008, "mass_kg": 0.4},
            {"kind": "sleeve", "name": "sleeve", "material": "steel", "on": "rod",
             "length_m": 0.05, "outer_diameter_m": 0.02, "inner_diameter_m": 0.009,
             "mass_kg": None},
            {"kind": "bob", "name": "bob", "shape": "cylinder", "material": "cast_iron",
             "mount": {"kind": "on_sleeve", "on": "sleeve"}, "diameter_m": 0.1,
             "height_m": 0.1, "support": "centre", "hole_diameter_m": 0.01, "mass_kg": 5.0},
            {"kind": "rod", "name": "lower", "material": "brass",
             "hangs_from": {"part": "rod", "end": "lower"}, "length_m": 0.3,
             "diameter_m": 0.006, "mass_kg": None},
            {"kind": "bob", "name": "disc", "shape": "disc", "material": "brass",
             "mount": {"kind": "clamp", "on": "lower", "centre_m": 1.2}, "diameter_m": 0.08,
             "thickness_m": 0.01, "mass_kg": None},
            {"kind": "weight", "name": "trim", "mass_kg": 0.004, "at_m": 0.5, "on": "rod"},
        ],
        "swing": {"amplitude_deg": 2.0, "quality_factor": 10000.0},
        "target": {"period_s": 2.0},
        "rating_nut": {"pitch_m": 0.001},
        "exhibit": {"pivot_above_floor_m": 3.0, "barrier_radius_m": 1.0},
        "rating_log": {
            "readings": [{"at": "2027-03-01T08:00:00+01:00", "error_s": 1.25,
                          "temperature_c": 19.5, "pressure_hpa": 1008.0, "semi_arc_deg": 1.55,
                          "note": ""}],
            "adjustments": [{"at": "2027-03-04T08:05:00+01:00", "what": "nut", "amount": -0.5,
                             "note": "half a turn down"}],
            "decay": [{"elapsed_s": 0.0, "semi_arc_deg": 1.6}]},
    }


def sample_b() -> dict[str, Any]:
    """Spring blades and a target in beats per hour."""
    d = sample_a()
    d["suspension"] = {"kind": "spring", "stiffness_n_m_per_rad": None,
                       "blades": {"count": 2, "material": "steel", "width_m": 0.006,
                                  "thickness_m": 1e-4, "free_length_m": 0.006}}
    d["target"] = {"beats_per_hour": 3600.0}
    return d


def leaf_paths(obj: Any, path: str = "", kind: str | None = None
               ) -> Iterator[tuple[str, str | None]]:
    """(path, part kind) of every key in a design dict, sections included."""
    if isinstance(obj, dict):
        kind = obj.get("kind", kind) if path.startswith("parts[") and path.count(".") == 0 \
            else kind
        for k, v in obj.items():
            sub = f"{path}.{k}" if path else k
            yield sub, kind
            yield from leaf_paths(v, sub, kind)
    elif isinstance(obj, list):
        for i, v in enumerate(obj):
            yield from leaf_paths(v, f"{path}[{i}]", kind)


def where_numeric() -> dict[FieldSpec, tuple[dict[str, Any], str]]:
    """For each numeric spec, a sample design and a path in it that the spec governs."""
    found: dict[FieldSpec, tuple[dict[str, Any], str]] = {}
    for sample in (sample_a(), sample_b()):
        for path, kind in leaf_paths(sample):
            spec = field_spec(path, kind)
            if spec.numeric and spec not in found:
                found[spec] = (sample, path)
    return found


NUMERIC = [s for s in FIELDS if s.numeric]


def test_the_samples_are_valid_and_reach_every_numeric_field() -> None:
    design_from_dict(sample_a())
    design_from_dict(sample_b())
    assert set(where_numeric()) == set(NUMERIC)


def _outside(spec: FieldSpec) -> list[float]:
    assert spec.low is not None and spec.high is not None
    low = spec.low if spec.low_open else math.nextafter(spec.low, -math.inf)
    high = spec.high if spec.high_open else math.nextafter(spec.high, math.inf)
    return [low, high]


def _inside(spec: FieldSpec) -> list[float]:
    assert spec.low is not None and spec.high is not None
    low = math.nextafter(spec.low, math.inf) if spec.low_open else spec.low
    high = math.nextafter(spec.high, -math.inf) if spec.high_open else spec.high
    return [low, high]


@pytest.mark.parametrize("spec", NUMERIC, ids=lambda s: s.pattern)
def test_just_outside_the_range_is_refused_naming_the_field(spec: FieldSpec) -> None:
    sample, path = where_numeric()[spec]
    for value in _outside(spec):
        with pytest.raises(DesignError) as info:
            design_from_dict(set_in_dict(sample, path, value))
        assert info.value.field == path
        assert spec.label in info.value.reason and range_text(spec) in info.value.reason


@pytest.mark.parametrize("spec", NUMERIC, ids=lambda s: s.pattern)
def test_just_inside_the_range_passes_the_range_check(spec: FieldSpec) -> None:
    # The range itself accepts both ends; the design may still be refused for geometry (a
    # sleeve longer than its rod), never for the range.
    sample, path = where_numeric()[spec]
    for value in _inside(spec):
        try:
            design_from_dict(set_in_dict(sample, path, value))
        except DesignError as exc:
            assert "out of range" not in exc.reason, (path, value, exc)


@pytest.mark.parametrize("spec", FIELDS, ids=lambda s: s.pattern)
def test_every_row_is_complete(spec: FieldSpec) -> None:
    assert spec.label and "_" not in spec.label and spec.label[0].isupper()
    assert spec.unit in UNIT_KINDS
    assert spec.help.endswith(".") and "_" not in spec.help
    assert spec.key == spec.pattern.rsplit(".", 1)[-1].split("[")[0]
    if spec.numeric:
        assert spec.high is not None and spec.low < spec.high  # type: ignore[operator]


@pytest.mark.parametrize("make", [sample_a, sample_b])
def test_every_key_the_writer_writes_has_a_row(make: Any) -> None:
    written = design_to_dict(design_from_dict(make()))
    for path, kind in leaf_paths(written):
        field_spec(path, kind)  # KeyError when missing


@pytest.mark.parametrize("path", EXAMPLES)
def test_every_key_of_the_examples_has_a_row(path: str) -> None:
    for key_path, kind in leaf_paths(design_to_dict(load_design(path))):
        field_spec(key_path, kind)


def test_a_key_shared_by_part_kinds_has_one_range() -> None:
    # field_range and check_number answer without the part kind (the solver's calls).
    by_key: dict[str, set[tuple[Any, ...]]] = {}
    for s in NUMERIC:
        if s.pattern.startswith("parts["):
            by_key.setdefault(s.pattern.split("]", 1)[1], set()).add(
                (s.low, s.high, s.low_open, s.high_open))
    assert by_key and all(len(ranges) == 1 for ranges in by_key.values())


def test_kind_picks_the_meaning() -> None:
    assert field_spec("parts[0].length_m", "rod").label == "Rod length"
    assert field_spec("parts[1].length_m", "sleeve").label == "Sleeve length"
    assert field_spec("parts[1].length_m", "sleeve").unit == "small_length"
    assert field_spec("swing.amplitude_deg").label == "Semi-arc"
    with pytest.raises(KeyError):
        field_spec("site.colour")


def test_target_ranges_agree_with_two_beats_a_period() -> None:
    # Plain arithmetic: beats per hour = 2 × 3600 / period.
    period, beats = field_spec("target.period_s"), field_spec("target.beats_per_hour")
    assert (period.low, period.high) == (0.05, 100.0)
    assert beats.low == pytest.approx(7200.0 / 100.0)
    assert beats.high == pytest.approx(7200.0 / 0.05)


def test_field_range_and_check_number_read_the_table() -> None:
    spec = field_spec("swing.amplitude_deg")
    assert field_range("swing.amplitude_deg") == (spec.low, spec.high, False, False)
    assert field_range("parts[3].mount.centre_m") == (-1000.0, 1000.0, False, False)
    assert check_number("rating_nut.pitch_m", 0.002) == 0.002
    with pytest.raises(DesignError, match=r"Thread pitch 0 is out of range: it must be in "
                                          r"\(0, 0\.01\]"):
        check_number("rating_nut.pitch_m", 0)
    with pytest.raises(DesignError, match="not a numeric field"):
        field_range("parts[0].name")


def test_field_path() -> None:
    fp = FieldPath.parse("parts[1].mount.centre_m")
    assert fp.steps == ("parts", 1, "mount", "centre_m")
    assert fp.key == "centre_m" and fp.part_index == 1
    assert str(fp) == "parts[1].mount.centre_m"
    assert FieldPath.parse(str(fp)) == fp
    for bad in ("", "parts[x]", "a..b", "1abc", "parts[1]."):
        with pytest.raises(ValueError):
            FieldPath.parse(bad)


def test_choice_words() -> None:
    assert choice_label("material", "cast_iron") == "Cast iron"
    assert choice_label("suspension", "knife_edge") == "Knife edge"
    assert choice_label("material", "bell_metal") == "Bell metal"  # a user's key
    assert set(MATERIALS) <= set(CHOICES["material"])
    for group in CHOICES.values():
        assert all("_" not in label for label in group.values())


def test_range_text() -> None:
    spec = field_spec("rating_nut.pitch_m")
    assert range_text(spec) == "(0, 0.01]"
    assert range_text(spec, 1000.0, "mm") == "(0, 10] mm"


def test_defaults_come_from_the_table() -> None:
    d = sample_a()
    del d["site"]["elevation_m"], d["site"]["pressure_hpa"], d["purpose"]
    design = design_from_dict(d)
    assert design.site.elevation_m == field_spec("site.elevation_m").default == 0.0
    assert design.site.pressure_hpa == field_spec("site.pressure_hpa").default == 1013.25
    assert design.purpose == "clock"
    assert copy.deepcopy(design) == design
