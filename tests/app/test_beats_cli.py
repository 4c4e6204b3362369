"""``penduline beats RECORDING.wav``: the command line over core.beats (DESIGN §9)."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest

from app.cli import main
from core.synthetic_ticks import TickSignalSpec, write_wav

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "resources" / "examples" / "demo_ticks.wav"
HALL = ROOT / "resources" / "examples" / "hall_clock.pendulum.json"


def test_json_has_the_issue_keys_and_rates_against_the_design(capsys: pytest.CaptureFixture[str]
                                                               ) -> None:
    assert main(["beats", str(DEMO), "--design", str(HALL), "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    for key in ("ticks", "rejected", "duration_s", "beat_s", "period_s", "beat_asymmetry_ms",
                "beat_asymmetry_percent", "rate_s_per_day", "rate_sigma_s_per_day",
                "timing_scatter_ms", "warnings"):
        assert key in out
    # Plain arithmetic: rate = 86400 (T_target / T − 1), T = two beats, target from the design.
    assert out["period_s"] == pytest.approx(2 * out["beat_s"], rel=1e-15)
    assert out["rate_s_per_day"] == pytest.approx(86400 * (2.0 / out["period_s"] - 1), rel=1e-9)


def test_without_a_target_there_is_no_rate(tmp_path: Path,
                                           capsys: pytest.CaptureFixture[str]) -> None:
    wav = tmp_path / "ticks.wav"
    write_wav(TickSignalSpec(duration_s=20.0, rate_hz=8000, beat_s=0.5), wav, bits=16)
    assert main(["beats", str(wav), "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    assert out["rate_s_per_day"] is None and out["rate_sigma_s_per_day"] is None
    assert out["beat_s"] == pytest.approx(0.5, rel=1e-5)


def test_an_unsuitable_file_exits_2_with_one_line(tmp_path: Path) -> None:
    bad = tmp_path / "notes.wav"
    bad.write_text("not a recording", encoding="utf-8")
    code = "import sys; from app.cli import main; sys.exit(main(sys.argv[1:]))"
    done = subprocess.run([sys.executable, "-c", code, "beats", str(bad)], cwd=ROOT,
                          capture_output=True, text=True, timeout=120)
    lines = done.stderr.strip().splitlines()
    assert done.returncode == 2 and len(lines) == 1
    assert lines[0].startswith("penduline: recording:")


def test_every_option_has_a_help_line(capsys: pytest.CaptureFixture[str]) -> None:
    with pytest.raises(SystemExit):
        main(["beats", "--help"])
    text = capsys.readouterr().out
    for option in ("--design", "--target-period", "--channel", "--json"):
        assert option in text
