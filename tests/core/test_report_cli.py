"""The core's report through the command line (DESIGN §4): `penduline report FILE --json`.

The CLI calls the core and prints what it returns; these tests hold it to DESIGN §4's keys and
exit codes (0 success, 2 bad input with one stderr line naming the field, no traceback). No Qt
is involved.
"""

from __future__ import annotations

import json
import math
from pathlib import Path
from typing import Any

import pytest

from app.cli import main
from core import analyse, load_design

from _core_builders import DESIGN_KEYS

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json"



def run(capsys: pytest.CaptureFixture[str], *args: str) -> tuple[int, str, str]:
    code = main(list(args))
    out, err = capsys.readouterr()
    return code, out, err


def write_bad(tmp_path: Path, path: list[Any], value: Any) -> Path:
    d = json.loads(EXAMPLE.read_text(encoding="utf-8"))
    cur = d
    for step in path[:-1]:
        cur = cur[step]
    cur[path[-1]] = value
    f = tmp_path / "bad.pendulum.json"
    f.write_text(json.dumps(d), encoding="utf-8")
    return f


class TestReportJson:
    def test_keys_and_values(self, capsys: pytest.CaptureFixture[str]) -> None:
        code, out, err = run(capsys, "report", str(EXAMPLE), "--json")
        assert code == 0 and err == ""
        report = json.loads(out)
        assert isinstance(report, dict)
        for key in DESIGN_KEYS:
            assert key in report, key
            value = report[key]
            if key == "warnings":
                assert isinstance(value, list) and all(isinstance(w, str) for w in value)
            else:
                assert value is None or (isinstance(value, float) and math.isfinite(value)), key
        # the same numbers as the core's own result for the same file
        result = analyse(load_design(EXAMPLE))
        for key in DESIGN_KEYS[:-1]:
            assert report[key] == getattr(result, key), key
        # DESIGN §4 conventions on the printed figures
        assert report["beats_per_hour"] == pytest.approx(7200 / report["period_s"], rel=1e-15)
        assert report["rate_s_per_day"] == pytest.approx(
            86400 * (2.0 / report["period_s"] - 1), rel=1e-12)
        assert report["circular_error_s_per_day"] == pytest.approx(
            86400 * (1 - report["period_small_s"] / report["period_s"]), rel=1e-12)

    def test_plain_report(self, capsys: pytest.CaptureFixture[str]) -> None:
        code, out, err = run(capsys, "report", str(EXAMPLE))
        assert code == 0 and err == ""
        assert "Workshop regulator" in out


class TestReportBadInput:
    @pytest.mark.parametrize("path, value, field", [
        (["parts", 1, "length_m"], -1.0, "parts[1].length_m"),
        (["parts", 2, "mount", "on"], "nowhere", "parts[2].mount.on"),
        (["site", "latitude_deg"], "north", "site.latitude_deg"),
        (["swing", "amplitude_deg"], 200.0, "swing.amplitude_deg"),
        (["version"], 7, "version"),
        (["format"], "something-else", "format"),
        (["parts", 0, "colour"], "red", "parts[0].colour"),
    ])
    def test_one_line_naming_field(self, tmp_path: Path, capsys: pytest.CaptureFixture[str],
                                   path: list[Any], value: Any, field: str) -> None:
        f = write_bad(tmp_path, path, value)
        code, out, err = run(capsys, "report", str(f), "--json")
        assert code == 2
        assert out == ""
        lines = err.strip().splitlines()
        assert len(lines) == 1, err
        assert field in lines[0]
        assert "Traceback" not in err

    @pytest.mark.parametrize("content", [None, "", "{not json", "[1, 2]", '{"a": NaN}'])
    def test_unreadable_file(self, tmp_path: Path, capsys: pytest.CaptureFixture[str],
                             content: str | None) -> None:
        f = tmp_path / "x.pendulum.json"
        if content is not None:
            f.write_text(content, encoding="utf-8")
        code, out, err = run(capsys, "report", str(f), "--json")
        assert code == 2 and out == ""
        lines = err.strip().splitlines()
        assert len(lines) == 1 and "file" in lines[0] and "Traceback" not in err


class TestBudgetAndTrimOptions:
    def test_budget_ranges_and_trim_height_reach_the_core(self, capsys) -> None:  # type: ignore[no-untyped-def]
        from core.tuning import BudgetRanges

        code, out, _ = run(capsys, "report", str(EXAMPLE), "--json", "--budget-temperature",
                           "10", "--budget-arc", "0.2", "--trim-height", "0.3")
        assert code == 0
        got = json.loads(out)
        want = analyse(load_design(EXAMPLE), trim_height_m=0.3,
                       budget_ranges=BudgetRanges(temperature_k=10.0, arc_deg=0.2))
        lines = {line["cause"]: line for line in got["rate_budget"]}
        assert lines["Temperature"]["low"] == pytest.approx(10.0)  # 20 °C − 10 K
        for line, expected in zip(got["rate_budget"], want.budget.lines, strict=True):
            assert line["spread_s_per_day"] == expected.spread_s_per_day
        assert got["trim_height_m"] == 0.3
        assert got["trim_s_per_day_per_g"] == want.sensitivities.trim_s_per_day_per_g

    @pytest.mark.parametrize("option, value, field", [
        ("--budget-temperature", "-1", "budget.temperature_k"),
        ("--budget-pressure", "nan", "budget.pressure_hpa"),
        ("--trim-height", "inf", "trim_height_m"),
    ])
    def test_bad_options_exit_2_naming_the_field(self, capsys, option, value, field) -> None:  # type: ignore[no-untyped-def]
        code, out, err = run(capsys, "report", str(EXAMPLE), option, value)
        assert code == 2 and out == ""
        assert err.count("\n") == 1 and err.startswith(f"penduline: {field}: ")
