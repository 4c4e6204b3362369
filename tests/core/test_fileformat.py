"""Reference tests for core/fileformat.py: validation of every field, reading, atomic saving.

DESIGN §3: a file with another format, a newer version, a missing required field, an unknown
key, a wrong type or a value out of range is refused with a message naming the field; reading
never changes the file; saving writes a temporary file and renames it over the old one. Every
refusal is a ``core.DesignError`` whose ``.field`` is the exact path (``parts[1].length_m``).

The base design below uses every part kind, every bob shape and both mounts, so that every
field of format 1 appears in it at least once.
"""

from __future__ import annotations

import copy
import glob
import json
import math
import os
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import pytest

from core import (
    Design,
    DesignError,
    analyse,
    design_from_dict,
    design_to_dict,
    dumps_design,
    load_design,
    loads_design,
    save_design,
    with_value,
)

ROOT = Path(__file__).resolve().parents[2]
EXAMPLES = sorted(glob.glob(str(ROOT / "resources" / "examples" / "*.pendulum.json")))


def base() -> dict[str, Any]:
    return {
        "format": "penduline-design",
        "version": 1,
        "name": "Every field",
        "reference_temperature_c": 20.0,
        "site": {"latitude_deg": 52.0, "elevation_m": 40.0, "g_m_s2": None,
                 "temperature_c": 21.0, "pressure_hpa": 1013.25},
        "suspension": {"kind": "spring", "stiffness_n_m_per_rad": 0.5},
        "parts": [
            {"kind": "rod", "name": "rod", "material": "invar", "top_m": 0.0,
             "length_m": 1.1, "diameter_m": 0.008, "mass_kg": None},
            {"kind": "sleeve", "name": "sleeve", "material": "steel", "on": "rod",
             "length_m": 0.055, "outer_diameter_m": 0.02, "inner_diameter_m": 0.009,
             "mass_kg": None},
            {"kind": "bob", "name": "bob", "shape": "cylinder", "material": "cast_iron",
             "mount": {"kind": "on_sleeve", "on": "sleeve"},
             "diameter_m": 0.11, "height_m": 0.12, "mass_kg": 8.5},
            {"kind": "weight", "name": "trim", "mass_kg": 0.004, "at_m": 0.45, "on": "rod"},
            {"kind": "bob", "name": "disc", "shape": "disc", "material": "brass",
             "mount": {"kind": "clamp", "on": "rod", "centre_m": 0.6},
             "diameter_m": 0.1, "thickness_m": 0.02, "mass_kg": None},
            {"kind": "rod", "name": "rod2", "material": "brass", "top_m": 0.05,
             "length_m": 0.8, "diameter_m": 0.006, "mass_kg": 0.2},
            {"kind": "bob", "name": "lens", "shape": "lens", "material": "lead",
             "mount": {"kind": "clamp", "on": "rod2", "centre_m": 0.7},
             "diameter_m": 0.12, "thickness_m": 0.03, "mass_kg": None},
            {"kind": "bob", "name": "ball", "shape": "sphere", "material": "aluminium",
             "mount": {"kind": "clamp", "on": "rod2", "centre_m": 0.8},
             "diameter_m": 0.05, "mass_kg": 0.3},
        ],
        "swing": {"amplitude_deg": 2.0, "quality_factor": 10000.0},
        "target": {"period_s": 2.0},
        "rating_nut": {"pitch_m": 0.001},
    }


NUMERIC_KEYS = {"reference_temperature_c", "latitude_deg", "elevation_m", "g_m_s2",
                "temperature_c", "pressure_hpa", "stiffness_n_m_per_rad", "top_m", "length_m",
                "diameter_m", "outer_diameter_m", "inner_diameter_m", "thickness_m", "height_m",
                "mass_kg", "at_m", "centre_m", "amplitude_deg", "quality_factor", "period_s",
                "beats_per_hour", "pitch_m"}
NULLABLE = {"g_m_s2", "quality_factor", "period_s", "beats_per_hour", "pitch_m"}  # + rod,
# sleeve and bob mass_kg (null: density × volume); a weight's mass_kg is required.

# Values no physical reading allows (below absolute zero, beyond the poles, a zero or negative
# size, mass, arc, period, Q or pitch), in addition to 1e12 for every field (beyond any range).
LOW_BAD = {
    "reference_temperature_c": [-300.0], "temperature_c": [-300.0],
    "latitude_deg": [-91.0, 90.5], "elevation_m": [-1.0e7], "g_m_s2": [0.0, -9.8],
    "pressure_hpa": [-1.0], "stiffness_n_m_per_rad": [-0.1], "top_m": [-1.0e12],
    "length_m": [0.0, -1.0], "diameter_m": [0.0, -0.01], "outer_diameter_m": [0.0],
    "inner_diameter_m": [0.0, -0.01], "thickness_m": [0.0], "height_m": [0.0],
    "mass_kg": [0.0, -1.0], "at_m": [-1.0e12], "centre_m": [-1.0e12],
    "amplitude_deg": [0.0, -5.0, 180.0, 360.0], "quality_factor": [0.0, -10.0],
    "period_s": [0.0, -2.0], "beats_per_hour": [0.0], "pitch_m": [0.0, -0.001],
}
HOSTILE = ["1.0", "", True, False, [], [1.0], {}, {"value": 1.0}, math.nan, -math.nan,
           math.inf, -math.inf, 10**400, -(10**400), 1.0e12, -1.0e300]


def leaves(obj: Any, path: str = "") -> Iterator[tuple[str, Any]]:
    """(path, value) of every scalar in a design dict, paths as DesignError.field spells them."""
    if isinstance(obj, dict):
        for k, v in obj.items():
            yield from leaves(v, f"{path}.{k}" if path else k)
    elif isinstance(obj, list):
        for i, v in enumerate(obj):
            yield from leaves(v, f"{path}[{i}]")
    else:
        yield path, obj


def objects(obj: Any, path: str = "") -> Iterator[tuple[str, dict[str, Any]]]:
    """(path, dict) of every object in a design dict."""
    if isinstance(obj, dict):
        yield path, obj
        for k, v in obj.items():
            yield from objects(v, f"{path}.{k}" if path else k)
    elif isinstance(obj, list):
        for i, v in enumerate(obj):
            yield from objects(v, f"{path}[{i}]")


def put(d: dict[str, Any], path: str, value: Any, delete: bool = False) -> dict[str, Any]:
    """A copy of ``d`` with ``path`` set (or deleted) — written here, not the core's helper."""
    new = copy.deepcopy(d)
    steps: list[Any] = []
    for piece in path.split("."):
        if "[" in piece:
            name, index = piece[:-1].split("[")
            steps += [name, int(index)]
        else:
            steps.append(piece)
    cur: Any = new
    for s in steps[:-1]:
        cur = cur[s]
    if delete:
        del cur[steps[-1]]
    else:
        cur[steps[-1]] = value
    return new


def refused(d: Any) -> DesignError:
    with pytest.raises(DesignError) as err:
        design_from_dict(d)
    return err.value


NUMERIC_PATHS = [p for p, _ in leaves(base()) if p.rsplit(".", 1)[-1] in NUMERIC_KEYS]
TEXT_PATHS = [p for p, _ in leaves(base()) if p.rsplit(".", 1)[-1] not in NUMERIC_KEYS
              and p not in ("format", "version")]
OBJECT_PATHS = [p for p, _ in objects(base())]


def _nullable(path: str) -> bool:
    key = path.rsplit(".", 1)[-1]
    if key in NULLABLE:
        return True
    if key == "mass_kg":
        return not path.startswith("parts[3]")  # the weight's mass is required
    return False


def _numeric_cases() -> list[tuple[str, Any]]:
    cases = []
    for path in NUMERIC_PATHS:
        key = path.rsplit(".", 1)[-1]
        for value in HOSTILE + LOW_BAD[key]:
            cases.append((path, value))
        if not _nullable(path):
            cases.append((path, None))
    return cases


class TestBaseDesign:
    def test_base_is_valid_and_complete(self) -> None:
        d = design_from_dict(base())
        assert analyse(d).period_s > 0
        keys = {p.rsplit(".", 1)[-1] for p in NUMERIC_PATHS}
        assert keys == NUMERIC_KEYS - {"beats_per_hour"}  # the target uses period_s here
        assert {p.shape for p in d.parts if p.kind == "bob"} == {  # type: ignore[union-attr]
            "disc", "lens", "cylinder", "sphere"}


class TestDesignFromDict:
    @pytest.mark.parametrize("path, value", _numeric_cases(),
                             ids=lambda x: repr(x)[:30])
    def test_bad_number(self, path: str, value: Any) -> None:
        err = refused(put(base(), path, value))
        assert err.field == path
        assert err.reason

    @pytest.mark.parametrize("value", HOSTILE + LOW_BAD["beats_per_hour"] + [None])
    def test_bad_beats_per_hour(self, value: Any) -> None:
        d = put(base(), "target", {"beats_per_hour": value})
        if value is None:  # null is allowed: no target
            design_from_dict(d)
            return
        assert refused(d).field == "target.beats_per_hour"

    def test_good_beats_per_hour(self) -> None:
        d = design_from_dict(put(base(), "target", {"beats_per_hour": 3600.0}))
        assert d.target.target_period_s == 2.0

    @pytest.mark.parametrize("path", TEXT_PATHS)
    @pytest.mark.parametrize("value", [5, 1.5, True, None, [], {}, ["rod"], math.nan])
    def test_text_of_wrong_type(self, path: str, value: Any) -> None:
        # names, kinds, materials, shapes and `on` references must be text
        assert refused(put(base(), path, value)).field == path

    CHOICE_PATHS = [p for p in TEXT_PATHS if p.rsplit(".", 1)[-1] in (
        "kind", "material", "shape", "on")]

    @pytest.mark.parametrize("path", CHOICE_PATHS)
    @pytest.mark.parametrize("value", ["no-such-thing", "", "ROD", " steel"])
    def test_unknown_choice_or_reference(self, path: str, value: str) -> None:
        # a kind, material or shape not in the format, or an `on` naming no part
        assert refused(put(base(), path, value)).field == path

    def test_any_design_name(self) -> None:
        assert design_from_dict(put(base(), "name", "")).name == ""
        assert design_from_dict(put(base(), "name", "Régulateur ✓")).name == "Régulateur ✓"

    def test_long_text_refused(self) -> None:
        assert refused(put(base(), "name", "x" * 5000)).field == "name"
        assert refused(put(base(), "parts[3].name", "x" * 5000)).field == "parts[3].name"

    @pytest.mark.parametrize("i", range(8))
    def test_blank_part_name(self, i: int) -> None:
        assert refused(put(base(), f"parts[{i}].name", "   ")).field == f"parts[{i}].name"

    REQUIRED = ["format", "version", "site", "parts", "swing", "site.latitude_deg",
                "suspension.kind", "swing.amplitude_deg",
                "parts[0].kind", "parts[0].name", "parts[0].material", "parts[0].top_m",
                "parts[0].length_m", "parts[0].diameter_m",
                "parts[1].on", "parts[1].length_m", "parts[1].outer_diameter_m",
                "parts[1].inner_diameter_m", "parts[1].material", "parts[1].name",
                "parts[2].shape", "parts[2].mount", "parts[2].diameter_m", "parts[2].height_m",
                "parts[2].material", "parts[2].mount.kind", "parts[2].mount.on",
                "parts[3].mass_kg", "parts[3].at_m", "parts[3].on", "parts[3].name",
                "parts[4].thickness_m", "parts[4].mount.centre_m", "parts[4].mount.on",
                "parts[6].thickness_m", "parts[7].diameter_m"]
    OPTIONAL = ["name", "reference_temperature_c", "site.elevation_m", "site.g_m_s2",
                "site.temperature_c", "site.pressure_hpa", "suspension", "parts[0].mass_kg",
                "parts[1].mass_kg", "parts[2].mass_kg", "swing.quality_factor", "target",
                "target.period_s", "rating_nut", "rating_nut.pitch_m"]

    @pytest.mark.parametrize("path", REQUIRED)
    def test_missing_required(self, path: str) -> None:
        err = refused(put(base(), path, None, delete=True))
        assert err.field == path
        assert "missing" in err.reason

    @pytest.mark.parametrize("path", OPTIONAL)
    def test_missing_optional(self, path: str) -> None:
        design_from_dict(put(base(), path, None, delete=True))

    def test_defaults(self) -> None:
        # DESIGN §3 defaults: site temperature = reference, pressure 1013.25 hPa, knife edge.
        d = base()
        for p in ("site.temperature_c", "site.pressure_hpa", "suspension"):
            d = put(d, p, None, delete=True)
        design = design_from_dict(d)
        assert design.site.temperature_c == 20.0
        assert design.site.pressure_hpa == 1013.25
        assert design.suspension.kind == "knife_edge"

    @pytest.mark.parametrize("path", OBJECT_PATHS)
    def test_unknown_key(self, path: str) -> None:
        # an extra key in any object of the file (top level, site, a part, a mount, …)
        d = put(base(), f"{path}.colour" if path else "colour", "red")
        err = refused(d)
        assert err.field == (f"{path}.colour" if path else "colour")
        assert "not a known key" in err.reason

    @pytest.mark.parametrize("path, key, value", [
        ("parts[4]", "height_m", 0.1),      # a disc has a thickness, not a height
        ("parts[7]", "thickness_m", 0.01),  # a sphere has a diameter only
        ("parts[2]", "thickness_m", 0.01),  # a cylinder has a height
        ("parts[3]", "material", "lead"),   # a weight is a point mass, no material
        ("parts[2].mount", "centre_m", 0.9),  # on_sleeve: the centre is derived
    ])
    def test_key_of_another_kind(self, path: str, key: str, value: Any) -> None:
        d = base()
        obj = put(d, f"{path}.{key}", value)
        assert refused(obj).field == f"{path}.{key}"

    @pytest.mark.parametrize("path", ["parts[1].on", "parts[2].mount.on", "parts[3].on",
                                      "parts[4].mount.on", "parts[6].mount.on"])
    def test_dangling_on(self, path: str) -> None:
        err = refused(put(base(), path, "nowhere"))
        assert err.field == path
        assert "nowhere" in err.reason

    @pytest.mark.parametrize("path, other", [
        ("parts[1].on", "bob"),            # a sleeve stands on a rod
        ("parts[1].on", "trim"),
        ("parts[3].on", "sleeve"),         # a weight is carried by a rod
        ("parts[4].mount.on", "sleeve"),   # a clamp grips a rod
        ("parts[4].mount.on", "ball"),
        ("parts[2].mount.on", "rod"),      # on_sleeve rests on a sleeve
    ])
    def test_on_wrong_kind(self, path: str, other: str) -> None:
        assert refused(put(base(), path, other)).field == path

    @pytest.mark.parametrize("i, name", [(1, "rod"), (3, "bob"), (5, "rod"), (7, "lens")])
    def test_duplicate_names(self, i: int, name: str) -> None:
        assert refused(put(base(), f"parts[{i}].name", name)).field == f"parts[{i}].name"

    def test_second_sleeve_on_one_rod(self) -> None:
        d = base()
        d["parts"].append({**d["parts"][1], "name": "sleeve2"})
        assert refused(d).field == "parts[8].on"

    def test_second_bob_on_one_sleeve(self) -> None:
        d = base()
        d["parts"].append({**d["parts"][2], "name": "bob2"})
        assert refused(d).field == "parts[8].mount.on"

    @pytest.mark.parametrize("path, value", [
        ("parts[1].inner_diameter_m", 0.02),    # not smaller than the outer diameter
        ("parts[1].inner_diameter_m", 0.005),   # does not slide over the 8 mm rod
        ("parts[1].length_m", 1.2),             # longer than its rod
        ("parts[3].at_m", 1.5),                 # off the rod
        ("parts[3].at_m", -0.1),
        ("parts[4].mount.centre_m", 1.5),       # the bob does not reach the rod
        ("parts[6].mount.centre_m", -0.2),
        ("suspension.stiffness_n_m_per_rad", 0.5),  # (with kind knife_edge, below)
    ])
    def test_geometry(self, path: str, value: Any) -> None:
        d = put(base(), path, value)
        if path.startswith("suspension"):
            d = put(d, "suspension.kind", "knife_edge")
        assert refused(d).field == path

    def test_target_given_twice(self) -> None:
        d = put(base(), "target", {"period_s": 2.0, "beats_per_hour": 3600.0})
        assert refused(d).field == "target.beats_per_hour"

    @pytest.mark.parametrize("path, value", [
        ("site", []), ("site", None), ("site", "here"), ("suspension", []), ("swing", 2.0),
        ("swing", None), ("target", [2.0]), ("rating_nut", 0.001), ("parts", {}),
        ("parts", None), ("parts", "rod"), ("parts", []), ("parts[0]", 5), ("parts[0]", None),
        ("parts[0]", ["rod"]), ("parts[2].mount", "on_sleeve"), ("parts[4].mount", None),
    ])
    def test_wrong_container(self, path: str, value: Any) -> None:
        assert refused(put(base(), path, value)).field == path

    @pytest.mark.parametrize("value", [None, [], "design", 3, 2.5, True])
    def test_not_an_object(self, value: Any) -> None:
        assert refused(value).field == "file"

    @pytest.mark.parametrize("value", ["other-design", "Penduline-Design", None, 1, ""])
    def test_another_format(self, value: Any) -> None:
        assert refused(put(base(), "format", value)).field == "format"

    @pytest.mark.parametrize("value", [3, 99, 10**30, 0, -1, "1", 1.5, True, None, math.nan, []])
    def test_bad_version(self, value: Any) -> None:
        err = refused(put(base(), "version", value))
        assert err.field == "version"

    def test_newer_version_message(self) -> None:
        assert "newer" in refused(put(base(), "version", 3)).reason

    def test_a_whole_version_written_with_a_decimal_point_is_read(self) -> None:
        assert design_from_dict(put(base(), "version", 1.0)) == design_from_dict(base())

    def test_a_fractional_version_is_refused_in_a_sentence(self) -> None:
        reason = refused(put(base(), "version", 1.5)).reason
        assert reason == "must be a whole number such as 2, not 1.5"

    def test_deep_nesting(self) -> None:
        # A value nested thousands of levels deep, where a number or an object is expected.
        deep: Any = 1.0
        for _ in range(5000):
            deep = {"a": deep}
        assert refused(put(base(), "parts[0].length_m", deep)).field == "parts[0].length_m"
        assert refused(put(base(), "site", {"latitude_deg": 1.0, "x": deep})).field == "site.x"

    def test_non_string_keys(self) -> None:
        d = base()
        d["site"][3] = 1.0  # type: ignore[index]
        assert refused(d).field.startswith("site")


class TestRoundTrip:
    def test_dict_round_trip(self) -> None:
        d = design_from_dict(base())
        assert design_from_dict(design_to_dict(d)) == d
        assert loads_design(dumps_design(d)) == d

    @pytest.mark.parametrize("path", EXAMPLES, ids=lambda p: Path(p).name)
    def test_examples_round_trip(self, path: str, tmp_path: Path) -> None:
        d = load_design(path)
        out = tmp_path / "copy.pendulum.json"
        save_design(d, out)
        assert load_design(out) == d

    def test_examples_exist(self) -> None:
        assert EXAMPLES


class TestLoadDesign:
    def _files(self, tmp_path: Path) -> list[Path]:
        good = tmp_path / "good.pendulum.json"
        good.write_text(json.dumps(base(), indent=1), encoding="utf-8")
        bad = tmp_path / "bad.pendulum.json"
        bad.write_text(json.dumps(put(base(), "parts[1].length_m", -1.0)), encoding="utf-8")
        broken = tmp_path / "broken.pendulum.json"
        broken.write_bytes(b'{"format": "penduline-design", "version": 1, ')
        return [good, bad, broken]

    def test_never_modifies_the_file(self, tmp_path: Path) -> None:
        for f in self._files(tmp_path):
            os.utime(f, ns=(1_000_000_000_000_000_000, 1_000_000_000_000_000_000))
            before = (f.read_bytes(), f.stat().st_mtime_ns, f.stat().st_size)
            try:
                load_design(f)
            except DesignError:
                pass
            assert (f.read_bytes(), f.stat().st_mtime_ns, f.stat().st_size) == before
        assert sorted(p.name for p in tmp_path.iterdir()) == [
            "bad.pendulum.json", "broken.pendulum.json", "good.pendulum.json"]

    def test_refusals_name_the_field(self, tmp_path: Path) -> None:
        good, bad, broken = self._files(tmp_path)
        assert load_design(good) == design_from_dict(base())
        with pytest.raises(DesignError) as err:
            load_design(bad)
        assert err.value.field == "parts[1].length_m"
        for f in (broken, tmp_path / "missing.json", tmp_path):
            with pytest.raises(DesignError) as err:
                load_design(f)
            assert err.value.field == "file"

    @pytest.mark.parametrize("text", [
        "", "   ", "[", "NaN", '{"a": NaN}', '{"a": Infinity}', "\x00\x01", "[" * 100000,
        '{"format": "penduline-design", "version": 1, "site": {"latitude_deg": -Infinity}}',
    ])
    def test_bad_text(self, text: str) -> None:
        with pytest.raises(DesignError) as err:
            loads_design(text)
        assert err.value.field

    def test_not_utf8(self) -> None:
        with pytest.raises(DesignError) as err:
            loads_design(b'{"name": "\xff"}')
        assert err.value.field == "file"


class TestSaveDesign:
    def test_atomic_write(self, tmp_path: Path) -> None:
        d = design_from_dict(base())
        target = tmp_path / "d.pendulum.json"
        target.write_text("old contents", encoding="utf-8")
        inode = target.stat().st_ino
        save_design(d, target)
        assert [p.name for p in tmp_path.iterdir()] == ["d.pendulum.json"]  # no temp file left
        assert target.read_text(encoding="utf-8") == dumps_design(d)
        assert load_design(target) == d
        # renamed over the old file, not written into it
        assert target.stat().st_ino != inode

    def test_failed_rename_keeps_old_file(self, tmp_path: Path,
                                          monkeypatch: pytest.MonkeyPatch) -> None:
        d = design_from_dict(base())
        target = tmp_path / "d.pendulum.json"
        target.write_text("old contents", encoding="utf-8")

        def refuse(*_args: Any) -> None:
            raise OSError(28, "No space left on device")

        monkeypatch.setattr(os, "replace", refuse)
        with pytest.raises(DesignError) as err:
            save_design(d, target)
        assert err.value.field == "file"
        assert target.read_text(encoding="utf-8") == "old contents"
        assert [p.name for p in tmp_path.iterdir()] == ["d.pendulum.json"]

    def test_unwritable_folder(self, tmp_path: Path) -> None:
        with pytest.raises(DesignError) as err:
            save_design(design_from_dict(base()), tmp_path / "no" / "such" / "folder" / "d.json")
        assert err.value.field == "file"


class TestWithValue:
    def test_changes_one_field(self) -> None:
        d = design_from_dict(base())
        e = with_value(d, "parts[0].length_m", 1.2)
        assert e.parts[0].length_m == 1.2  # type: ignore[union-attr]
        assert design_to_dict(e) == put(design_to_dict(d), "parts[0].length_m", 1.2)
        assert d.parts[0].length_m == 1.1  # type: ignore[union-attr]  # the original stays

    @pytest.mark.parametrize("path, value", [("parts[0].length_m", -1.0),
                                             ("parts[0].length_m", math.nan),
                                             ("site.latitude_deg", "north"),
                                             ("parts[12].length_m", 1.0)])
    def test_bad_value_names_field(self, path: str, value: Any) -> None:
        with pytest.raises(DesignError) as err:
            with_value(design_from_dict(base()), path, value)
        assert err.value.field == path

    def test_design_is_immutable(self) -> None:
        d: Design = design_from_dict(base())
        with pytest.raises(AttributeError):
            d.name = "x"  # type: ignore[misc]


def test_an_edit_outside_the_rating_log_keeps_the_log_and_equals_a_full_reading() -> None:
    # plain equality: the shortcut must give the design a full validation would give
    from dataclasses import replace

    from core.fileformat import set_in_dict

    design = load_design(ROOT / "resources/examples/workshop_regulator.pendulum.json")
    assert design.rating_log is not None and design.rating_log.readings
    edited = with_value(design, "parts[0].length_m", 1.2)
    full = design_from_dict(set_in_dict(design_to_dict(design), "parts[0].length_m", 1.2))
    assert edited == full and edited.parts[0].length_m == 1.2  # type: ignore[union-attr]
    assert edited.rating_log is design.rating_log
    with pytest.raises(DesignError) as refused:  # the rest of the file is still checked
        with_value(design, "parts[0].length_m", -1.0)
    assert refused.value.field == "parts[0].length_m"
    with pytest.raises(DesignError):  # the version is checked against the whole file
        with_value(design, "version", 1)
    with pytest.raises(DesignError) as refused:  # and an edit in the log reads the log
        with_value(design, "rating_log.readings[0].temperature_c", "warm")
    assert refused.value.field == "rating_log.readings[0].temperature_c"
    # a design built by hand is not taken on trust by the analysis
    swing = replace(design.swing, amplitude_deg=-5.0)
    with pytest.raises(DesignError) as refused:
        analyse(replace(edited, swing=swing))
    assert refused.value.field == "swing.amplitude_deg"


def test_setting_a_value_leaves_the_dict_it_was_given_as_it_was() -> None:
    import copy

    from core.fileformat import set_in_dict

    design = load_design(ROOT / "resources/examples/workshop_regulator.pendulum.json")
    original = design_to_dict(design)
    untouched = copy.deepcopy(original)
    edited = set_in_dict(original, "parts[2].mount.on", "rod")
    assert original == untouched  # nothing along the path was changed in place
    assert edited["parts"][2]["mount"]["on"] == "rod"
    assert edited["site"] is original["site"]  # the rest is shared, not copied
    with pytest.raises(DesignError) as refused:
        set_in_dict(original, "name.first", 1)
    assert refused.value.field == "name.first" and original == untouched


def test_a_section_can_be_left_out_of_the_file_form() -> None:
    design = load_design(ROOT / "resources/examples/workshop_regulator.pendulum.json")
    full = design_to_dict(design)
    short = design_to_dict(design, without=("rating_log",))
    assert "rating_log" in full and "rating_log" not in short
    del full["rating_log"]
    assert short == full
