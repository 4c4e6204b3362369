"""`penduline rating FILE [--json] [--log CSV]`: the core's rating report through the command
line, in-process and once in a real process; exit 2 with one line naming the field on bad
input."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest

from app.cli import main
from core import load_design
from core.rating_report import RATING_KEYS

ROOT = Path(__file__).resolve().parents[2]
REGULATOR = ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json"
HALL = ROOT / "resources" / "examples" / "hall_clock.pendulum.json"


def run(capsys: pytest.CaptureFixture[str], *args: str) -> tuple[int, str, str]:
    code = main(list(args))
    out, err = capsys.readouterr()
    return code, out, err


def strict_json(text: str) -> dict:  # type: ignore[type-arg]
    def refuse(name: str) -> None:
        raise AssertionError(f"{name} in the JSON")
    return json.loads(text, parse_constant=refuse)  # type: ignore[no-any-return]


def steady_log(tmp_path: Path, rate_s_per_day: float, bad_row: bool = False) -> Path:
    """A log of a clock gaining exactly ``rate_s_per_day``: error = rate × days (plain
    arithmetic), readings a day apart, no conditions noted."""
    lines = ["at,error_s,note"]
    for day in range(1, 8):
        lines.append(f"2027-05-{day:02d}T09:00:00+02:00,{rate_s_per_day * (day - 1) + 0.5!r},")
        if bad_row and day == 3:
            lines.append("2027-05-03T12:00:00+02:00,three,typed a word")
    path = tmp_path / "log.csv"
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return path


class TestRatingCommand:
    def test_json_has_the_issue_keys_and_the_demo_segments(self, capsys) -> None:  # type: ignore[no-untyped-def]
        code, out, err = run(capsys, "rating", str(REGULATOR), "--json")
        assert code == 0 and err == ""
        report = strict_json(out)
        assert set(RATING_KEYS) <= set(report)
        demo = load_design(REGULATOR).rating_log
        assert demo is not None
        # the demo log: 11 readings, a nut turn and a setting, then 20 readings
        assert [s["readings"] for s in report["segments"]] == [11, 20]
        assert report["segments"][0]["from"] == demo.readings[0].at.isoformat()
        assert report["quality_factor"] is not None

    def test_text_names_segments_and_the_correction(self, capsys) -> None:  # type: ignore[no-untyped-def]
        code, out, err = run(capsys, "rating", str(REGULATOR))
        assert code == 0 and err == ""
        assert "segment 1:" in out and "segment 2:" in out
        assert "rating nut" in out

    def test_an_outside_log_recovers_its_steady_rate(self, capsys, tmp_path) -> None:  # type: ignore[no-untyped-def]
        code, out, _err = run(capsys, "rating", str(HALL), "--log",
                              str(steady_log(tmp_path, 3.25)), "--json")
        assert code == 0
        report = strict_json(out)
        # plain arithmetic: the error grows 3.25 s each day
        assert report["segments"][0]["rate_s_per_day"] == pytest.approx(3.25, abs=1e-9)
        assert report["temperature_coefficient_s_per_day_per_k"] is None
        assert "temperature" in report["temperature_coefficient_s_per_day_per_k_reason"]

    def test_bad_csv_rows_become_warnings_and_the_rest_is_fitted(self, capsys, tmp_path) -> None:  # type: ignore[no-untyped-def]
        code, out, _err = run(capsys, "rating", str(HALL), "--log",
                              str(steady_log(tmp_path, -1.5, bad_row=True)), "--json")
        assert code == 0
        report = strict_json(out)
        assert report["segments"][0]["readings"] == 7
        assert report["segments"][0]["rate_s_per_day"] == pytest.approx(-1.5, abs=1e-9)
        assert any(w.startswith("row 5:") and "error_s" in w for w in report["warnings"])

    def test_a_design_without_a_log_exits_2_with_one_line(self, capsys) -> None:  # type: ignore[no-untyped-def]
        code, out, err = run(capsys, "rating", str(HALL))
        assert code == 2 and out == ""
        assert err == ("penduline: rating_log: the design has no rating log; give one with "
                       "--log CSV\n")

    def test_a_missing_log_file_and_a_bad_design_name_the_field(self, capsys, tmp_path) -> None:  # type: ignore[no-untyped-def]
        code, _out, err = run(capsys, "rating", str(HALL), "--log", str(tmp_path / "no.csv"))
        assert code == 2 and err.startswith("penduline: log: cannot read") and \
            err.count("\n") == 1
        bad = json.loads(REGULATOR.read_text(encoding="utf-8"))
        bad["rating_log"]["readings"][2]["error_s"] = "fast"
        f = tmp_path / "bad.pendulum.json"
        f.write_text(json.dumps(bad), encoding="utf-8")
        code, _out, err = run(capsys, "rating", str(f), "--json")
        assert code == 2 and err.startswith("penduline: rating_log.readings[2].error_s:")
        assert err.count("\n") == 1

    def test_a_log_with_too_few_readings_exits_2(self, capsys, tmp_path) -> None:  # type: ignore[no-untyped-def]
        f = tmp_path / "short.csv"
        f.write_text("at,error_s\n2027-01-01T00:00:00Z,1\n2027-01-02T00:00:00Z,2\n",
                     encoding="utf-8")
        code, _out, err = run(capsys, "rating", str(HALL), "--log", str(f))
        assert code == 2 and err.startswith("penduline: rating_log.readings:")

    def test_help_names_every_option_with_a_line_of_help(self, capsys) -> None:  # type: ignore[no-untyped-def]
        with pytest.raises(SystemExit) as stop:
            main(["rating", "--help"])
        assert stop.value.code == 0
        out = capsys.readouterr().out
        assert "--json      one JSON object" in out
        assert "--log CSV   fit this CSV log instead of the design's" in out
        assert "file        design file" in out


def test_rating_runs_in_a_real_process(tmp_path: Path) -> None:
    proc = subprocess.run(
        [sys.executable, "-c", "import sys; from app.cli import main; sys.exit(main())",
         "rating", str(HALL), "--log", str(steady_log(tmp_path, 0.75)), "--json"],
        cwd=ROOT, capture_output=True, text=True, timeout=120, check=False)
    assert proc.returncode == 0, proc.stderr
    report = strict_json(proc.stdout)
    assert report["segments"][0]["rate_s_per_day"] == pytest.approx(0.75, abs=1e-9)
    proc = subprocess.run(
        [sys.executable, "-c", "import sys; from app.cli import main; sys.exit(main())",
         "rating", str(HALL)], cwd=ROOT, capture_output=True, text=True, timeout=120,
        check=False)
    assert proc.returncode == 2 and "Traceback" not in proc.stderr
    assert proc.stderr.startswith("penduline: rating_log:")
