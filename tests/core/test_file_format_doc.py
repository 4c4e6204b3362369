"""docs/file-format.md: its key table is the field table's, and every example in it loads."""

from __future__ import annotations

import copy
import importlib.util
import json
import re
from pathlib import Path
from typing import Any

import pytest

from core import loads_design
from core.fields import FIELDS

ROOT = Path(__file__).resolve().parents[2]
DOC = ROOT / "docs" / "file-format.md"


def _generator() -> Any:
    spec = importlib.util.spec_from_file_location("make_file_format",
                                                  ROOT / "docs" / "make_file_format.py")
    assert spec is not None and spec.loader is not None
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def _examples() -> list[Any]:
    blocks = re.findall(r"```json\n(.*?)```", DOC.read_text(encoding="utf-8"), re.S)
    return [json.loads(block) for block in blocks]


BASE: dict[str, Any] = {
    "format": "penduline-design", "version": 2,
    "site": {"latitude_deg": 50.0},
    "parts": [{"kind": "rod", "name": "rod", "material": "steel", "top_m": 0.0,
               "length_m": 1.0, "diameter_m": 0.006},
              {"kind": "bob", "name": "bob", "shape": "disc", "material": "brass",
               "mount": {"kind": "clamp", "on": "rod", "centre_m": 0.95},
               "diameter_m": 0.1, "thickness_m": 0.02}],
    "swing": {"amplitude_deg": 2.0},
}


def test_the_committed_key_table_is_the_generated_one() -> None:
    make = _generator()
    assert make.main(["--check"]) == 0, "run python3 docs/make_file_format.py"
    table = make.key_table()
    assert table in DOC.read_text(encoding="utf-8")
    # one row per field of the table the program reads, each with its help sentence
    rows = [line for line in table.splitlines()[2:] if line.startswith("| `")]
    assert len(rows) == len(FIELDS)
    for spec, row in zip(FIELDS, rows, strict=True):
        assert row.startswith(f"| `{spec.pattern}` |") and spec.help.replace("|", "\\|") in row


def test_a_stale_table_is_caught(tmp_path: Path, monkeypatch: pytest.MonkeyPatch) -> None:
    make = _generator()
    stale = tmp_path / "file-format.md"
    stale.write_text(DOC.read_text(encoding="utf-8").replace("| `site.latitude_deg` |",
                                                             "| `site.latitude` |"),
                     encoding="utf-8")
    monkeypatch.setattr(make, "DOC", stale)
    assert make.main(["--check"]) == 1


@pytest.mark.parametrize("index", range(len(_examples())))
def test_every_example_loads(index: int) -> None:
    example = _examples()[index]
    design = copy.deepcopy(BASE)
    if isinstance(example, list):  # a whole parts list
        design["parts"] = example
    elif "format" in example:  # a whole file
        design = example
    else:  # top-level sections of a version 2 file
        design.update(example)
    loaded = loads_design(json.dumps(design))
    assert len(loaded.parts) == len(design["parts"])


def test_every_part_kind_has_an_example() -> None:
    kinds = {part["kind"] for ex in _examples() if isinstance(ex, list) for part in ex}
    mounts = {part["mount"]["kind"] for ex in _examples() if isinstance(ex, list)
              for part in ex if part["kind"] == "bob"}
    assert kinds == {"rod", "sleeve", "bob", "weight"} and mounts == {"clamp", "on_sleeve"}
