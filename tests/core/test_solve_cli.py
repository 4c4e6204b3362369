"""`penduline solve` (DESIGN §4): one or two fields, the README's compensation command, refusals.

The command prints what core.solve returns; the solved designs are re-analysed here from the
written file, not taken from the command's own output. No Qt is involved.
"""

from __future__ import annotations

import argparse
import json
import shlex
from pathlib import Path

import pytest

from app.cli import _tools_parser, main
from core import analyse, load_design
from core.solve import PERIOD_TOLERANCE_S, TEMPERATURE_TOLERANCE_S_PER_DAY_PER_K

ROOT = Path(__file__).resolve().parents[2]
REGULATOR = ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json"
ZINC = ROOT / "resources" / "examples" / "zinc_tube_regulator.pendulum.json"


def run(capsys: pytest.CaptureFixture[str], *args: str) -> tuple[int, str, str]:
    code = main(list(args))
    out, err = capsys.readouterr()
    return code, out, err


def readme_compensation_command() -> list[str]:
    """The README's two-field `solve … --null temperature` line, as words."""
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    lines = [ln for ln in text.splitlines()
             if ln.startswith("penduline solve") and "--null temperature" in ln]
    assert len(lines) == 1, lines
    words = shlex.split(lines[0], comments=True)
    assert words[0] == "penduline"
    return words[1:]


class TestReadmeCommand:
    def test_runs_and_meets_both_targets(self, capsys: pytest.CaptureFixture[str],
                                         monkeypatch: pytest.MonkeyPatch,
                                         tmp_path: Path) -> None:
        words = readme_compensation_command()
        assert words.count("--vary") == 2
        monkeypatch.chdir(ROOT)  # the README's paths are relative to the repository
        out_file = tmp_path / "solved.pendulum.json"
        code, out, err = run(capsys, *words, "--write", str(out_file))
        assert code == 0 and err == ""
        assert "searched 0.0001 to 1000" in out
        assert "residual: period" in out and "residual: temperature coefficient" in out
        # the written file, re-analysed: the design's own 2 s target and a zero coefficient
        result = analyse(load_design(out_file))
        assert abs(result.period_s - 2.0) <= PERIOD_TOLERANCE_S
        assert abs(result.temperature_coefficient_s_per_day_per_k) \
            <= TEMPERATURE_TOLERANCE_S_PER_DAY_PER_K
        # only the two varied fields changed
        before = json.loads(ZINC.read_text(encoding="utf-8"))
        after = json.loads(out_file.read_text(encoding="utf-8"))
        for k in (0, 1):
            assert after["parts"][k]["length_m"] != before["parts"][k]["length_m"]
            after["parts"][k]["length_m"] = before["parts"][k]["length_m"]
        assert after == before


class TestSolveCommand:
    def test_one_field_bph(self, capsys: pytest.CaptureFixture[str], tmp_path: Path) -> None:
        out_file = tmp_path / "out.json"
        code, out, _ = run(capsys, "solve", str(REGULATOR), "--vary", "parts[0].length_m",
                           "--target-bph", "3750", "--write", str(out_file))
        assert code == 0
        # 3750 beats per hour: a period of 7200/3750 = 1.92 s (DESIGN §4)
        assert analyse(load_design(out_file)).period_s == pytest.approx(1.92, rel=1e-12)

    @pytest.mark.slow
    def test_no_solution_exit_2(self, capsys: pytest.CaptureFixture[str]) -> None:
        code, out, err = run(capsys, "solve", str(REGULATOR), "--vary", "parts[0].length_m",
                             "--vary", "parts[1].length_m", "--null", "temperature")
        assert code == 2
        assert err.count("\n") == 1 and err.startswith("penduline: parts[0].length_m: no pair")
        assert "nearest" in err and "residual" in out  # the nearest design is still shown

    @pytest.mark.parametrize("args, option", [
        (["--target-bph", "0"], "--target-bph"),
        (["--target-period", "-2"], "--target-period"),
        (["--target-period", "nan"], "--target-period"),
        (["--target-period", "2", "--null", "temperature"], "--vary"),
    ])
    def test_refused(self, capsys: pytest.CaptureFixture[str], args: list[str],
                     option: str) -> None:
        code, out, err = run(capsys, "solve", str(REGULATOR), "--vary", "parts[0].length_m",
                             *args)
        assert code == 2 and out == ""
        assert err.startswith(f"penduline: {option}: ") and err.count("\n") == 1

    def test_every_option_has_a_help_line(self) -> None:
        tools = _tools_parser()
        sub = next(a for a in tools._actions if isinstance(a, argparse._SubParsersAction))
        solve = sub.choices["solve"]
        for action in solve._actions:
            assert action.help, action.dest
