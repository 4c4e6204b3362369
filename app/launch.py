"""Starting the workbench window, or drawing it once offscreen for a screenshot.

The window opens first and is filled after: reading a design file is plain Python, so the file
is checked, the application made and a light first window (:func:`first_window`: the title,
the window's colours, where it was last placed, "Opening …") painted before numpy, scipy,
pyqtgraph and the views are imported; then the workbench replaces it at the same place and
the analysis is shown as soon as it is done. A screenshot skips the first window and waits
for every result.
"""

from __future__ import annotations

import os
import sys
from pathlib import Path
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from PySide6.QtWidgets import QApplication, QMainWindow

    from app.window.main_window import MainWindow
    from core import Design

__all__ = ["run_window", "open_window", "first_window", "default_design_path",
           "SCREENSHOT_SIZE", "WINDOW_SIZE"]

SCREENSHOT_SIZE = (1440, 900)
WINDOW_SIZE = (1440, 900)
"""The window's size when no layout is remembered (px)."""


def default_design_path() -> Path:
    """The built-in example opened when no file is given."""
    return (Path(__file__).resolve().parent.parent / "resources" / "examples"
            / "workshop_regulator.pendulum.json")


def run_window(path: str | None, screenshot: str | None) -> int:
    """Open the workbench on the design at ``path`` (default: the built-in example).

    With ``screenshot``, the window is drawn offscreen (when there is no display) at
    1440×900 once everything is computed, saved as PNG to ``screenshot``, and 0 is returned.

    Raises
    ------
    core.DesignError
        When the file cannot be used (the command line prints it and exits with 2).
    """
    from core import load_design

    design_path = Path(path) if path else default_design_path()
    design = load_design(design_path)  # refuse a bad file before any window appears
    if screenshot and not (os.environ.get("DISPLAY") or os.environ.get("WAYLAND_DISPLAY")):
        os.environ["QT_QPA_PLATFORM"] = "offscreen"

    from PySide6.QtWidgets import QApplication

    app = QApplication.instance() or QApplication(sys.argv[:1])
    assert isinstance(app, QApplication)
    window = open_window(app, design, design_path if path else None,
                         remember_layout=not screenshot, first=not screenshot)
    if screenshot:
        return _screenshot(app, window, Path(screenshot))
    window.offer_recovery()  # edits autosaved by a run that crashed
    return int(app.exec())


def open_window(app: QApplication, design: Design, path: Path | None,
                remember_layout: bool = True, first: bool = True) -> MainWindow:
    """Show the workbench on ``design`` (read from ``path``; None: an example, unnamed).

    With ``first``, a light window (:func:`first_window`) is painted before the heavy
    imports and replaced by the workbench, which is shown before its analysis (queued by the
    window) is done. Without it (a screenshot), the workbench is made but not shown.
    """
    shell = first_window(app, design.name, remember_layout) if first else None
    from app.document.settings import APPLICATION, ORGANISATION  # numpy, scipy: the heavy part
    from app.window.main_window import MainWindow

    app.setOrganizationName(ORGANISATION)
    app.setApplicationName(APPLICATION)
    window = MainWindow(design, path, remember_layout=remember_layout)
    if shell is not None:
        if not remember_layout:
            window.setGeometry(shell.geometry())
        window.show()
        shell.close()
        shell.deleteLater()
    return window


def first_window(app: QApplication, name: str, remember_layout: bool = True) -> QMainWindow:
    """A window with the workbench's title, colours and place, saying the design is opening;
    painted before returning. It imports only Qt and the theme (no numpy, no scipy)."""
    from PySide6.QtCore import QByteArray, QEventLoop, QSettings, Qt
    from PySide6.QtWidgets import QLabel, QMainWindow

    from app.theme import STYLE_SHEET

    shell = QMainWindow()
    shell.setStyleSheet(STYLE_SHEET)
    shell.setWindowTitle(f"{name} — Penduline")
    label = QLabel(f"Opening {name}…")
    label.setProperty("role", "hint")
    label.setAlignment(Qt.AlignmentFlag.AlignCenter)
    shell.setCentralWidget(label)
    geometry = None
    if remember_layout:  # where the workbench will restore itself (app.document.settings)
        geometry = QSettings(QSettings.Format.IniFormat, QSettings.Scope.UserScope, "Penduline",
                             "Penduline").value("window/geometry")
    if isinstance(geometry, QByteArray) and not geometry.isEmpty():
        shell.restoreGeometry(geometry)
    else:
        shell.resize(*WINDOW_SIZE)
    shell.show()
    shell.repaint()
    app.processEvents(QEventLoop.ProcessEventsFlag.ExcludeUserInputEvents)
    return shell


def _screenshot(app: object, window: object, out: Path) -> int:
    """Compute, paint and save the window as PNG; 0 on success, 1 when it cannot be saved."""
    from PySide6.QtWidgets import QApplication

    assert isinstance(app, QApplication)
    window.resize(*SCREENSHOT_SIZE)  # type: ignore[attr-defined]
    window.show()  # type: ignore[attr-defined]
    window.compute_now()  # type: ignore[attr-defined]
    for _ in range(3):
        app.processEvents()
    image = window.grab()  # type: ignore[attr-defined]
    ok = image.save(str(out), "PNG")
    window.document.undo_stack.setClean()  # type: ignore[attr-defined]
    window.close()  # type: ignore[attr-defined]
    if not ok:
        print(f"penduline: file: could not write the screenshot {out}", file=sys.stderr)
        return 1
    return 0
