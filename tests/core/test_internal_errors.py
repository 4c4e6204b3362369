"""A program bug is not bad input: it escapes the core unchanged and the command exits 1.

Bad input exits 2 with one line naming the field (tests/core/test_file_robustness.py); a defect
inside ``analyse`` must exit 1 with one short line asking for a report, the traceback only with
``--debug``.
"""

from __future__ import annotations

from pathlib import Path

import pytest

import core.analysis
from app.cli import main
from core import DesignError, analyse, load_design, loads_design, save_design

EXAMPLE = Path(__file__).resolve().parents[2] / "resources" / "examples" / \
    "workshop_regulator.pendulum.json"


def _break_analyse(monkeypatch: pytest.MonkeyPatch) -> None:
    def broken(*_args: object, **_kwargs: object) -> None:
        raise ZeroDivisionError("planted defect")
    monkeypatch.setattr(core.analysis, "pendulum_state", broken)


def test_a_defect_inside_analyse_propagates_as_itself(monkeypatch: pytest.MonkeyPatch) -> None:
    _break_analyse(monkeypatch)
    with pytest.raises(ZeroDivisionError):
        analyse(load_design(EXAMPLE))


def test_a_defect_exits_1_with_one_line_and_no_traceback(
        monkeypatch: pytest.MonkeyPatch, capsys: pytest.CaptureFixture[str]) -> None:
    _break_analyse(monkeypatch)
    assert main(["report", str(EXAMPLE)]) == 1
    err = capsys.readouterr().err
    assert err.count("\n") == 1
    assert err.startswith("penduline: internal error: ZeroDivisionError: planted defect")
    assert "please report it" in err and "--debug" in err
    assert "Traceback" not in err


def test_with_debug_the_traceback_is_printed(
        monkeypatch: pytest.MonkeyPatch, capsys: pytest.CaptureFixture[str]) -> None:
    _break_analyse(monkeypatch)
    assert main(["report", str(EXAMPLE), "--debug"]) == 1
    err = capsys.readouterr().err
    assert "Traceback (most recent call last)" in err
    assert "broken" in err  # the frame that raised
    assert err.rstrip().splitlines()[-1].startswith("penduline: internal error:")


def test_bad_input_still_exits_2(tmp_path: Path, capsys: pytest.CaptureFixture[str]) -> None:
    bad = tmp_path / "bad.pendulum.json"
    bad.write_text(EXAMPLE.read_text().replace('"amplitude_deg": 1.6', '"amplitude_deg": 190'))
    assert main(["report", str(bad)]) == 2
    assert capsys.readouterr().err.startswith("penduline: swing.amplitude_deg:")


@pytest.mark.parametrize("call", [
    lambda: analyse(42),  # type: ignore[arg-type]
    lambda: load_design(3.5),  # type: ignore[arg-type]
    lambda: loads_design(None),  # type: ignore[arg-type]
    lambda: save_design("not a design", "x.json"),  # type: ignore[arg-type]
])
def test_wrong_argument_types_from_python_are_type_errors(call: object) -> None:
    with pytest.raises(TypeError) as info:
        call()  # type: ignore[operator]
    assert "needs" in str(info.value) and not isinstance(info.value, DesignError)
