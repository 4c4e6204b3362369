"""`penduline [FILE] --screenshot OUT.png` and the window's refusal of a bad file."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import pytest
from PySide6.QtGui import QImage

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "resources/examples/workshop_regulator.pendulum.json"


def _run(*args: str) -> subprocess.CompletedProcess[str]:
    env = {**os.environ, "QT_QPA_PLATFORM": "offscreen"}
    code = "import sys; from app.cli import main; sys.exit(main(sys.argv[1:]))"
    return subprocess.run([sys.executable, "-c", code, *args], cwd=ROOT, env=env,
                          capture_output=True, text=True, timeout=120)


@pytest.mark.slow
def test_screenshot_writes_a_png_of_the_window(tmp_path: Path) -> None:
    out = tmp_path / "shot.png"
    done = _run(str(EXAMPLE), "--screenshot", str(out))
    assert done.returncode == 0, done.stderr
    assert out.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    image = QImage(str(out))
    assert (image.width(), image.height()) == (1440, 900)


def test_a_bad_file_exits_2_with_one_line_naming_the_field(tmp_path: Path) -> None:
    bad = tmp_path / "bad.pendulum.json"
    bad.write_text(EXAMPLE.read_text(encoding="utf-8").replace('"length_m": 1.1131',
                                                               '"length_m": -1'),
                   encoding="utf-8")
    done = _run(str(bad), "--screenshot", str(tmp_path / "x.png"))
    assert done.returncode == 2
    lines = done.stderr.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("penduline: parts[0].length_m:")
    assert not (tmp_path / "x.png").exists()


def test_the_first_window_is_painted_before_numpy_and_scipy_are_imported() -> None:
    code = """
import sys
from PySide6.QtCore import QEvent, QObject
from PySide6.QtWidgets import QApplication
from core import load_design
from app.launch import default_design_path, first_window

design = load_design(default_design_path())
app = QApplication(sys.argv[:1])
painted = []

class Watch(QObject):
    def eventFilter(self, obj, event):
        if event.type() == QEvent.Type.Paint:
            painted.append(obj)
        return False

watch = Watch()
app.installEventFilter(watch)
shell = first_window(app, design.name, remember_layout=False)
heavy = sorted(m for m in ("numpy", "scipy", "pyqtgraph") if m in sys.modules)
print(len(painted) > 0, shell.windowTitle(), heavy)
"""
    env = {**os.environ, "QT_QPA_PLATFORM": "offscreen"}
    done = subprocess.run([sys.executable, "-c", code], cwd=ROOT, env=env, capture_output=True,
                          text=True, timeout=120)
    assert done.returncode == 0, done.stderr
    assert done.stdout.strip() == "True Workshop regulator — Penduline []", done.stdout


def test_the_workbench_replaces_the_first_window_at_its_place(qapp) -> None:  # type: ignore[no-untyped-def]
    from PySide6.QtWidgets import QApplication, QWidget

    from app.document.settings import app_settings
    from app.launch import first_window, open_window
    from core import load_design

    app_settings().clear()
    placed = QWidget()
    placed.setGeometry(40, 60, 700, 500)  # within the offscreen screen (800×600)
    app_settings().setValue("window/geometry", placed.saveGeometry())  # as the window keeps it
    shell = first_window(qapp, "x", remember_layout=True)
    assert (shell.width(), shell.height()) == (700, 500)  # where the workbench will restore
    shell.close()
    window = open_window(qapp, load_design(EXAMPLE), EXAMPLE, remember_layout=True)
    try:
        assert window.isVisible()
        shown = [w for w in QApplication.topLevelWidgets() if w.isVisible()]
        assert shown == [window]  # the first window is gone
    finally:
        window.document.undo_stack.setClean()
        window.close()
        app_settings().clear()


@pytest.mark.slow  # a fresh interpreter
def test_start_up_steps_round_the_feature_scan_and_puts_everything_back() -> None:
    # PySide reads the source of every module imported after it (to see whether it names
    # PySide) and records the answer in its feature table; start-up steps round that for the
    # libraries, then the hook and the collector are as before, and the start-up's objects
    # are frozen out of later collections.
    code = """
import builtins, gc, sys
from PySide6.QtWidgets import QApplication
from core import load_design
from app.launch import default_design_path, open_window

hook = builtins.__import__
app = QApplication(sys.argv[:1])
window = open_window(app, load_design(default_design_path()), None, remember_layout=False)
table = sys.modules["shibokensupport.feature"].pyside_feature_dict
import colorsys  # a module first imported after start-up: scanned as PySide wants
print(builtins.__import__ is hook, gc.isenabled(), gc.get_freeze_count() > 10000,
      "numpy" in table, "pyqtgraph" in table, "colorsys" in table, window.result is not None)
window.document.undo_stack.setClean()
"""
    env = {**os.environ, "QT_QPA_PLATFORM": "offscreen"}
    done = subprocess.run([sys.executable, "-c", code], cwd=ROOT, env=env, capture_output=True,
                          text=True, timeout=120)
    assert done.returncode == 0, done.stderr
    assert done.stdout.split() == ["True", "True", "True", "False", "False", "True", "True"]


def test_a_failed_start_up_puts_the_import_hook_and_the_collector_back(qapp, monkeypatch) -> None:  # type: ignore[no-untyped-def]
    import builtins
    import gc

    from app import launch
    from core import load_design

    def refuse(*_args, **_kwargs):  # type: ignore[no-untyped-def]
        raise RuntimeError("no window today")

    monkeypatch.setattr(launch, "first_window", refuse)
    hook = builtins.__import__
    with pytest.raises(RuntimeError):
        launch.open_window(qapp, load_design(EXAMPLE), EXAMPLE, remember_layout=False)
    assert builtins.__import__ is hook and gc.isenabled()
