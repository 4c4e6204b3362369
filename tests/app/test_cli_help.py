"""The command line explains itself: every option has a help line; `--view` chooses the view
on show; a missing X11 library is named in one line; Help ▸ About gives the version."""

from __future__ import annotations

import os
import subprocess
import sys
from importlib.metadata import version
from pathlib import Path

import pytest
from PySide6.QtGui import QImage

import app.launch as launch
from app.cli import COMMANDS, _tools_parser, _window_parser, main
from app.views.catalogue import VIEWS
from app.window.main_window import about_text

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "resources/examples/hall_clock.pendulum.json"
OWN_COMMANDS = ("report", "sweep", "export")  # `solve` and `rating` are checked beside them


def _undocumented(parser) -> list[str]:  # type: ignore[no-untyped-def]
    return [action.dest for action in parser._actions
            if not action.help and action.dest != "command"]


def _subparser(name: str):  # type: ignore[no-untyped-def]
    sub = next(a for a in _tools_parser()._actions if a.dest == "command")
    return sub.choices[name]


def test_every_window_option_has_a_help_line() -> None:
    assert _undocumented(_window_parser()) == []


@pytest.mark.parametrize("command", OWN_COMMANDS)
def test_every_option_of_a_command_has_a_help_line(command: str) -> None:
    parser = _subparser(command)
    assert _undocumented(parser) == []
    assert parser.description  # the command's own --help says what it does


def test_top_level_help_lists_the_commands_and_views(capsys) -> None:  # type: ignore[no-untyped-def]
    with pytest.raises(SystemExit) as done:  # argparse prints the help and exits 0
        main(["--help"])
    assert done.value.code == 0
    out = capsys.readouterr().out
    for command in COMMANDS:
        assert f"penduline {command}" in out
    for cls in VIEWS:
        assert cls.slug in out


def test_view_names_are_the_catalogue_slugs_and_all() -> None:
    assert launch.view_names() == [cls.slug for cls in VIEWS] + ["all"]


def test_an_unknown_view_is_refused_in_one_line(capsys) -> None:  # type: ignore[no-untyped-def]
    assert main([str(EXAMPLE), "--view", "nowhere", "--screenshot", "x.png"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "nowhere" in err[0]


@pytest.mark.slow
def test_screenshot_of_a_chosen_view(tmp_path: Path) -> None:
    env = {**os.environ, "QT_QPA_PLATFORM": "offscreen"}
    code = "import sys; from app.cli import main; sys.exit(main(sys.argv[1:]))"
    shots = {}
    for view in ("phase", "all"):
        out = tmp_path / f"{view}.png"
        done = subprocess.run([sys.executable, "-c", code, str(EXAMPLE), "--view", view,
                               "--screenshot", str(out)], cwd=ROOT, env=env,
                              capture_output=True, text=True, timeout=120)
        assert done.returncode == 0, done.stderr
        image = QImage(str(out))
        assert (image.width(), image.height()) == (1440, 900)
        shots[view] = image
    assert shots["phase"] != shots["all"]  # a different page is on show


def test_show_view_brings_the_tab_or_the_grid(qtbot) -> None:  # type: ignore[no-untyped-def]
    from app.window.main_window import MainWindow
    from core import load_design

    window = MainWindow(load_design(EXAMPLE), remember_layout=False)
    qtbot.addWidget(window)
    launch._show_view(window, "swing_preview")
    area = window.plot_area
    assert area.arrangement() == "tabs"
    assert area.current_view() is next(p for p in area.plots if p.slug == "swing_preview")
    launch._show_view(window, "all")
    assert area.arrangement() == "grid"
    assert len(area.shown_indices()) == sum(p.grid_member for p in area.plots)


class TestMissingX11Libraries:
    @pytest.fixture
    def x11(self, monkeypatch):  # type: ignore[no-untyped-def]
        monkeypatch.setattr(sys, "platform", "linux")
        monkeypatch.delenv("QT_QPA_PLATFORM", raising=False)
        monkeypatch.delenv("WAYLAND_DISPLAY", raising=False)
        monkeypatch.setenv("DISPLAY", ":0")

    def test_names_each_missing_package(self, x11) -> None:  # type: ignore[no-untyped-def]
        def finder(name: str, soname: str) -> bool:
            return name == "xcb-icccm"

        assert launch.missing_xcb_libraries(finder) == ["libxcb-cursor0", "libxcb-keysyms1"]
        assert launch.missing_xcb_libraries(lambda _n, _s: True) == []

    def test_other_platforms_need_nothing(self, x11, monkeypatch) -> None:  # type: ignore[no-untyped-def]
        missing = lambda _n, _s: False
        assert len(launch.missing_xcb_libraries(missing)) == 3
        monkeypatch.setenv("QT_QPA_PLATFORM", "offscreen")
        assert launch.missing_xcb_libraries(missing) == []
        monkeypatch.setenv("QT_QPA_PLATFORM", "xcb")
        monkeypatch.delenv("DISPLAY")
        assert launch.missing_xcb_libraries(missing) == []

    def test_the_window_refuses_in_one_line_and_exits_1(self, x11, monkeypatch, capsys):  # type: ignore[no-untyped-def]
        monkeypatch.setattr(launch, "_library_loads", lambda name, _s: name != "xcb-cursor")
        assert main([str(EXAMPLE)]) == 1
        err = capsys.readouterr().err.strip().splitlines()
        assert len(err) == 1
        assert err[0].startswith("penduline: the window needs the system libraries")
        assert "apt install libxcb-cursor0 libxcb-icccm4 libxcb-keysyms1" in err[0]
        assert "libxcb-cursor0" in err[0].split("cannot be found")[0]


def test_about_gives_the_version() -> None:
    assert f"Penduline {version('penduline')} " in about_text()
