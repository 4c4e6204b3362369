"""Every `penduline` line in README.md's code blocks runs and exits 0.

The commands are read from the README itself, so the test follows the document: ``FILE`` is
an example design (the first whose parts have the field a command names), ``OUT``, ``DIR`` and
``*.png`` are files in a temporary folder, an optional ``[...]`` is run both without and with
its words, and a line that would open the window draws it offscreen (``--screenshot``).
"""

from __future__ import annotations

import re
import shlex
from pathlib import Path

import pytest

from app.cli import COMMANDS, main
from app.launch import view_names
from core.fileformat import get_value, read_design_dict

ROOT = Path(__file__).resolve().parents[2]
README = ROOT / "README.md"
EXAMPLES = [ROOT / "resources" / "examples" / f"{name}.pendulum.json" for name in (
    "workshop_regulator", "hall_clock", "mantel_clock", "atrium_pendulum")]  # README's order


def readme_commands() -> list[str]:
    """The `penduline ...` lines of the README's code blocks, comments removed."""
    text = README.read_text(encoding="utf-8")
    lines = []
    for block in re.findall(r"```(?:bash|sh)?\n(.*?)```", text, re.S):
        for line in block.splitlines():
            line = line.split("  #", 1)[0].strip()
            if line.startswith("penduline"):
                lines.append(line)
    return lines


def _variants(line: str) -> list[str]:
    """The line without its optional ``[...]`` words, and with each of them."""
    optional = re.findall(r"\[(--[^\]]*)\]", line)
    bare = re.sub(r"\s*\[--[^\]]*\]", "", line)
    return [bare] + [re.sub(r"\s*\[--[^\]]*\]", "", line.replace(f"[{o}]", o, 1))
                     for o in optional]


def _example_for(words: list[str]) -> Path:
    """The first example design holding every field path the command names."""
    paths = [w for w in words if re.match(r"parts\[\d+\]\.", w)]
    for example in EXAMPLES:
        raw = read_design_dict(example)
        try:
            for path in paths:
                get_value(raw, path)
        except (KeyError, IndexError, TypeError, ValueError):
            continue
        return example
    raise AssertionError(f"no example design has {paths}")


def _argv(line: str, tmp: Path) -> list[str]:
    words = shlex.split(line)[1:]
    example = _example_for(words)
    out = []
    for word in words:
        if word == "FILE":
            word = str(example)
        elif word in ("OUT", "DIR"):
            word = str(tmp / word.lower())
        elif word.endswith(".png"):
            word = str(tmp / word)
        out.append(word)
    window = not out or out[0] not in COMMANDS
    if window and "--help" not in out and "--screenshot" not in out:
        out += ["--screenshot", str(tmp / "window.png")]  # the window, drawn offscreen
    return out


def test_the_readme_has_commands_to_run() -> None:
    lines = readme_commands()
    assert len(lines) >= 8
    assert {shlex.split(line)[1] for line in lines} >= {"report", "solve", "sweep", "export"}


def _quick_or_slow(lines: list[str]) -> list[object]:
    """Each line as a case; the exports (each renders every plot and a PDF) are marked
    ``slow`` and run in the full suite (`export` runs in ``test_export.py``'s quick tests)."""
    return [pytest.param(line, marks=pytest.mark.slow)
            if shlex.split(line)[1:2] == ["export"] else line for line in lines]


@pytest.mark.parametrize("line", _quick_or_slow(
    [v for line in readme_commands() for v in _variants(line)]))
def test_readme_command_exits_0(line: str, tmp_path: Path, capsys) -> None:  # type: ignore[no-untyped-def]
    argv = _argv(line, tmp_path)
    try:
        code = main(argv)
    except SystemExit as done:  # --help prints and exits
        code = int(done.code or 0)
    err = capsys.readouterr().err
    assert code == 0, f"{line!r} as {argv}: {err}"
    if "--screenshot" in argv:
        assert Path(argv[argv.index("--screenshot") + 1]).stat().st_size > 0


def test_the_readme_names_every_view() -> None:
    text = README.read_text(encoding="utf-8")
    for name in view_names():
        assert f"`{name}`" in text
