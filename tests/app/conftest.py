"""Fixtures for the window tests: private settings, no blocking prompts, slot exceptions fail.

pytest-qt already fails a test on an exception raised inside a Qt slot or virtual method
(``qt_no_exception_capture`` stays off); the autouse fixture below also checks that this is so
and catches exceptions that reach ``sys.excepthook`` outside pytest-qt's capture window.
"""

from __future__ import annotations

import os
import shutil
import sys
from collections.abc import Iterator
from pathlib import Path
from types import TracebackType

import pytest
from PySide6.QtCore import QSettings

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json"

# The offscreen platform says this whenever a main window is shown; it is not our warning.
OFFSCREEN_NOISE = r"This plugin does not support propagateSizeHints\(\)"


def pytest_configure(config: pytest.Config) -> None:
    config.addinivalue_line("qt_log_ignore", OFFSCREEN_NOISE)


@pytest.fixture(scope="session", autouse=True)
def private_settings(tmp_path_factory: pytest.TempPathFactory) -> Path:
    """Point QSettings (INI, user scope) at a temporary folder: the user's file is untouched."""
    folder = tmp_path_factory.mktemp("settings")
    QSettings.setPath(QSettings.Format.IniFormat, QSettings.Scope.UserScope, str(folder))
    QSettings.setDefaultFormat(QSettings.Format.IniFormat)
    return folder


@pytest.fixture(scope="session", autouse=True)
def private_data_folder(tmp_path_factory: pytest.TempPathFactory) -> Iterator[Path]:
    """Point the application's data folder (autosaves, recovery) at a temporary folder."""
    from app.document.recovery import DATA_DIR_ENV

    folder = tmp_path_factory.mktemp("data")
    previous = os.environ.get(DATA_DIR_ENV)
    os.environ[DATA_DIR_ENV] = str(folder)
    yield folder
    if previous is None:
        os.environ.pop(DATA_DIR_ENV, None)
    else:
        os.environ[DATA_DIR_ENV] = previous


@pytest.fixture(autouse=True)
def fail_on_slot_exceptions(request: pytest.FixtureRequest) -> Iterator[None]:
    """Fail the test on any uncaught exception from a Qt slot."""
    assert not request.config.getini("qt_no_exception_capture"), \
        "pytest-qt must capture exceptions raised in Qt slots"
    assert request.node.get_closest_marker("qt_no_exception_capture") is None
    seen: list[BaseException] = []
    previous = sys.excepthook

    def hook(kind: type[BaseException], value: BaseException,
             tb: TracebackType | None) -> None:
        seen.append(value)
        previous(kind, value, tb)

    sys.excepthook = hook
    yield
    sys.excepthook = previous
    assert not seen, f"uncaught exception in a Qt slot: {seen[0]!r}"


@pytest.fixture
def example_copy(tmp_path: Path) -> Path:
    """A copy of the example design in a temporary folder."""
    target = tmp_path / "regulator.pendulum.json"
    shutil.copyfile(EXAMPLE, target)
    return target


@pytest.fixture
def window(qtbot, example_copy: Path, monkeypatch: pytest.MonkeyPatch):  # type: ignore[no-untyped-def]
    """The main window on a copy of the example, computed, with the discard prompt bypassed."""
    from app.document.settings import app_settings
    from app.window.main_window import MainWindow
    from core import load_design

    app_settings().clear()  # each window starts from the defaults
    win = MainWindow(load_design(example_copy), example_copy)
    monkeypatch.setattr(win, "confirm_discard", lambda: True)
    qtbot.addWidget(win)
    win.compute_now()
    assert win.result is not None
    return win
