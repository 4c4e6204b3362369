"""Starting the workbench window, or drawing it once offscreen for a screenshot."""

from __future__ import annotations

import os
import sys
from pathlib import Path

__all__ = ["run_window", "default_design_path", "SCREENSHOT_SIZE"]

SCREENSHOT_SIZE = (1440, 900)


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

    from app.document.settings import APPLICATION, ORGANISATION
    from app.window.main_window import MainWindow

    app = QApplication.instance() or QApplication(sys.argv[:1])
    app.setOrganizationName(ORGANISATION)
    app.setApplicationName(APPLICATION)
    window = MainWindow(design, design_path if path else None,
                        remember_layout=not screenshot)
    if screenshot:
        return _screenshot(app, window, Path(screenshot))
    window.show()
    window.offer_recovery()  # edits autosaved by a run that crashed
    return int(app.exec())


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
