"""Format 2 (DESIGN §8): version 1 still read, version 2 read and written, and its data —
purpose, the exhibit section, the user's materials, mount chains, bob support and hole, spring
blades — validated with messages naming the field. Also the file-level refusals: duplicate keys,
huge whole numbers, and saving only a valid design."""

from __future__ import annotations

import dataclasses
import json
import math
from pathlib import Path
from typing import Any

import pytest

from core import (
    DesignError,
    analyse,
    design_from_dict,
    design_to_dict,
    dumps_design,
    loads_design,
    save_design,
)
from core.blades import blade_stiffness_n_m_per_rad
from core.mass_properties import layout
from core.materials import MATERIALS
from core.model import pendulum_state

from _core_builders import bob, clamp, design, on_sleeve, rod, sleeve
from test_fields import sample_a, sample_b

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json"
# The workshop regulator as it was saved in format 1 (before it carried a rating log).
EXAMPLE_V1 = ROOT / "tests" / "data" / "workshop_regulator_v1.pendulum.json"


def refused(d: Any) -> DesignError:
    with pytest.raises(DesignError) as info:
        design_from_dict(d)
    return info.value


def v2(parts: list[dict[str, Any]], **kw: Any) -> dict[str, Any]:
    d = design(parts, **kw)
    d["version"] = 2
    return d


class TestVersions:
    def test_version_1_still_reads_and_saving_writes_version_2(self) -> None:
        d = json.loads(EXAMPLE_V1.read_text())
        assert d["version"] == 1
        written = design_to_dict(design_from_dict(d))
        assert written["version"] == 2 and written["purpose"] == "clock"
        assert design_from_dict(written) == design_from_dict(d)

    @pytest.mark.parametrize("make", [sample_a, sample_b])
    def test_a_version_2_file_round_trips(self, make: Any) -> None:
        first = design_from_dict(make())
        assert loads_design(dumps_design(first)) == first

    @pytest.mark.parametrize("path, value", [
        ("purpose", "clock"), ("exhibit", {"pivot_above_floor_m": 3.0}),
        ("materials", {}),
    ])
    def test_format_2_keys_in_a_version_1_file_are_refused(self, path: str, value: Any) -> None:
        d = json.loads(EXAMPLE_V1.read_text())
        d[path] = value
        err = refused(d)
        assert err.field == path and "version 2" in err.reason

    def test_a_version_1_bob_with_a_support_is_refused(self) -> None:
        d = json.loads(EXAMPLE_V1.read_text())
        d["parts"][2]["support"] = "bottom"
        assert refused(d).field == "parts[2].support"


class TestPurposeAndExhibit:
    def test_defaults(self) -> None:
        d = design_from_dict(v2([rod(), bob()]))
        assert d.purpose == "clock" and d.exhibit is None

    def test_exhibit_values_and_nulls(self) -> None:
        d = v2([rod(), bob()])
        d["purpose"] = "exhibit"
        d["exhibit"] = {"pivot_above_floor_m": 26.0, "barrier_radius_m": None}
        got = design_from_dict(d)
        assert got.purpose == "exhibit"
        assert got.exhibit is not None and got.exhibit.pivot_above_floor_m == 26.0
        assert got.exhibit.barrier_radius_m is None
        d["exhibit"] = None
        assert design_from_dict(d).exhibit is None

    @pytest.mark.parametrize("path, value", [
        ("purpose", "toy"), ("purpose", None), ("exhibit", []),
        ("exhibit", {"pivot_above_floor_m": 0.0}), ("exhibit", {"floor_m": 1.0}),
    ])
    def test_refusals(self, path: str, value: Any) -> None:
        d = v2([rod(), bob()])
        d[path] = value
        assert refused(d).field.startswith(path)


ZINC = {"name": "Zinc", "density_kg_m3": 7140.0, "expansion_per_k": 3.0e-5,
        "youngs_modulus_pa": 1.08e11, "source": "invented for a test"}


class TestUserMaterials:
    def test_a_part_of_a_user_material_uses_its_density(self) -> None:
        d = v2([rod(material="own_zinc", length_m=1.0, diameter_m=0.01), bob(mass_kg=1.0)])
        d["materials"] = {"own_zinc": ZINC}
        body = layout(design_from_dict(d))[0]
        # Plain geometry: a round rod's mass is ρ π d²/4 ℓ.
        assert body.mass_kg == pytest.approx(7140.0 * math.pi * 0.01**2 / 4 * 1.0, rel=1e-12)
        assert math.isfinite(analyse(d).period_s)

    def test_it_grows_with_its_own_expansion(self) -> None:
        d = v2([rod(material="own_zinc", length_m=1.0), bob(mass_kg=1.0)], temperature_c=30.0)
        d["materials"] = {"own_zinc": ZINC}
        body = layout(design_from_dict(d))[0]
        assert body.length_along_m == pytest.approx(1.0 * (1 + 3.0e-5 * 10.0), rel=1e-12)

    @pytest.mark.parametrize("key, entry, field", [
        ("steel", ZINC, "materials.steel"),
        ("own_zinc", {**ZINC, "source": ""}, "materials.own_zinc.source"),
        ("own_zinc", {k: v for k, v in ZINC.items() if k != "source"}, "materials.own_zinc.source"),
        ("own_zinc", {**ZINC, "density_kg_m3": -1.0}, "materials.own_zinc.density_kg_m3"),
        ("own_zinc", {**ZINC, "colour": "grey"}, "materials.own_zinc.colour"),
        ("Zinc metal", ZINC, "materials.Zinc metal"),
    ])
    def test_refusals(self, key: str, entry: Any, field: str) -> None:
        d = v2([rod(), bob()])
        d["materials"] = {key: entry}
        assert refused(d).field == field

    def test_an_unknown_material_is_refused(self) -> None:
        err = refused(v2([rod(material="own_zinc"), bob()]))
        assert err.field == "parts[0].material" and "'own_zinc'" in err.reason

    def test_built_in_keys_remain(self) -> None:
        assert {"steel", "invar", "cast_iron"} <= set(MATERIALS)


class TestMountChains:
    def test_a_rod_hanging_from_a_rods_lower_end_starts_there(self) -> None:
        parts = [rod("upper", top_m=0.1, length_m=0.6),
                 {**rod("lower", length_m=0.5), "hangs_from": {"part": "upper", "end": "lower"}},
                 bob(mount=clamp("lower", 1.1))]
        del parts[1]["top_m"]
        chained = design_from_dict(v2(parts))
        assert chained.part("lower").top_m == pytest.approx(0.7, abs=1e-15)  # 0.1 + 0.6
        parts[1].pop("hangs_from")
        parts[1]["top_m"] = 0.1 + 0.6
        plain = design_from_dict(v2(parts))
        assert analyse(chained).period_s == analyse(plain).period_s

    def test_from_a_sleeves_upper_end(self) -> None:
        parts = [rod(length_m=1.0), sleeve(length_m=0.2),
                 {**rod("inner", length_m=0.1), "hangs_from": {"part": "sleeve",
                                                               "end": "upper"}},
                 bob(mount=clamp("rod", 0.9))]
        del parts[2]["top_m"]
        assert design_from_dict(v2(parts)).part("inner").top_m == pytest.approx(0.8)

    @pytest.mark.parametrize("hangs, field, words", [
        ({"part": "nowhere"}, "parts[1].hangs_from.part", "no part named"),
        ({"part": "lower"}, "parts[1].hangs_from.part", "itself"),
        ({"part": "bob"}, "parts[1].hangs_from.part", "is a bob"),
        ({"part": "rod", "end": "middle"}, "parts[1].hangs_from.end", "not one of"),
    ])
    def test_refusals(self, hangs: Any, field: str, words: str) -> None:
        parts = [rod(), {**rod("lower"), "hangs_from": hangs}, bob()]
        del parts[1]["top_m"]
        err = refused(v2(parts))
        assert err.field == field and words in err.reason

    def test_a_loop_is_refused(self) -> None:
        a = {**rod("a"), "hangs_from": {"part": "b"}}
        b = {**rod("b"), "hangs_from": {"part": "a"}}
        del a["top_m"], b["top_m"]
        assert "loop" in refused(v2([a, b, bob(mount=clamp("a", 1.0))])).reason

    def test_top_and_hangs_from_together_are_refused(self) -> None:
        parts = [rod(), {**rod("lower"), "hangs_from": {"part": "rod"}}, bob()]
        assert refused(v2(parts)).field == "parts[1].top_m"


class TestBobSupportAndHole:
    def test_a_bob_supported_at_its_centre_has_its_centre_on_the_sleeve_top(self) -> None:
        parts = [rod(length_m=1.0), sleeve(length_m=0.1),
                 {**bob("cylinder", mount=on_sleeve(), height_m=0.2, mass_kg=2.0),
                  "support": "centre"}]
        bodies = layout(design_from_dict(v2(parts)))
        assert bodies[2].centre_m == pytest.approx(0.9)  # plain geometry: 1.0 − 0.1
        parts[2]["support"] = "bottom"
        assert layout(design_from_dict(v2(parts)))[2].centre_m == pytest.approx(0.8)

    def test_refusals(self) -> None:
        clamped = {**bob(), "support": "centre"}
        assert refused(v2([rod(), clamped])).field == "parts[1].support"
        holed = {**bob(diameter_m=0.1), "hole_diameter_m": 0.1}
        assert refused(v2([rod(), holed])).field == "parts[1].hole_diameter_m"


BLADES = {"count": 2, "material": "steel", "width_m": 0.006, "thickness_m": 1e-4,
          "free_length_m": 0.006}


class TestBlades:
    def spring(self, blades: Any, stiffness: Any = None, kind: str = "spring"
               ) -> dict[str, Any]:
        d = v2([rod(), bob()])
        d["suspension"] = {"kind": kind, "stiffness_n_m_per_rad": stiffness, "blades": blades}
        return d

    def test_stiffness_from_the_blades(self) -> None:
        d = design_from_dict(self.spring(BLADES))
        assert d.suspension.blades is not None and d.suspension.blades.count == 2
        state = pendulum_state(d)
        weight = state.mass.mass_kg * state.g_m_s2
        # The model's stiffness is the blades' bending stiffness under the pendulum's weight
        # (core.blades, itself checked against solve_bvp in test_blades.py) ...
        assert state.stiffness_n_m_per_rad == pytest.approx(blade_stiffness_n_m_per_rad(
            2, 200e9, 0.006, 1e-4, 0.006, weight), rel=1e-12)
        # ... and with a short blade under a light pull it is close to pure bending,
        # n E w t³ / (12 ℓ) (Euler–Bernoulli beam theory [pub, memory]): the tension's
        # factor x / sinh x, x = ℓ / λ, λ² = E I / (T / n), stays near 1.
        pure = 2 * 200e9 * 0.006 * 1e-4**3 / 12 / 0.006
        x = 0.006 / math.sqrt(200e9 * 0.006 * 1e-4**3 / 12 / (weight / 2))
        assert state.stiffness_n_m_per_rad == pytest.approx(pure * x / math.sinh(x), rel=1e-12)
        written = design_to_dict(design_from_dict(self.spring(BLADES)))["suspension"]
        assert written["stiffness_n_m_per_rad"] is None and written["blades"] == BLADES

    @pytest.mark.parametrize("blades, stiffness, kind, field", [
        (BLADES, 0.5, "spring", "suspension.stiffness_n_m_per_rad"),
        (BLADES, None, "knife_edge", "suspension.blades"),
        ({**BLADES, "count": 1.5}, None, "spring", "suspension.blades.count"),
        ({**BLADES, "count": 0}, None, "spring", "suspension.blades.count"),
        ({**BLADES, "material": "cheese"}, None, "spring", "suspension.blades.material"),
        ({**BLADES, "thickness_m": 0.0}, None, "spring", "suspension.blades.thickness_m"),
    ])
    def test_refusals(self, blades: Any, stiffness: Any, kind: str, field: str) -> None:
        assert refused(self.spring(blades, stiffness, kind)).field == field

    def test_null_stiffness_without_blades_is_refused(self) -> None:
        d = v2([rod(), bob()])
        d["suspension"] = {"kind": "spring", "stiffness_n_m_per_rad": None}
        assert refused(d).field == "suspension.stiffness_n_m_per_rad"


class TestFileRefusals:
    def test_a_duplicate_key_is_refused_naming_it(self) -> None:
        text = EXAMPLE.read_text().replace('"name": "', '"name": "first", "name": "', 1)
        with pytest.raises(DesignError) as info:
            loads_design(text)
        assert info.value.field == "file" and "'name' appears twice" in info.value.reason

    def test_a_huge_whole_number_is_too_large(self) -> None:
        text = EXAMPLE.read_text().replace('"amplitude_deg": 1.6', '"amplitude_deg": '
                                           + "9" * 5000)
        with pytest.raises(DesignError) as info:
            loads_design(text)
        assert "too large" in info.value.reason
        assert "int_max_str_digits" not in info.value.reason

    def test_save_refuses_an_invalid_design_and_writes_nothing(self, tmp_path: Path) -> None:
        good = loads_design(EXAMPLE.read_text())
        bad = dataclasses.replace(good, swing=dataclasses.replace(good.swing,
                                                                  amplitude_deg=500.0))
        out = tmp_path / "bad.pendulum.json"
        with pytest.raises(DesignError) as info:
            save_design(bad, out)
        assert info.value.field == "swing.amplitude_deg"
        assert list(tmp_path.iterdir()) == []
