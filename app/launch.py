"""Starting the workbench window, or drawing it once offscreen for a screenshot.

Before Qt is asked for a window on Linux's X11 platform, :func:`missing_xcb_libraries` looks
for the system libraries Qt's ``xcb`` plugin needs beyond Qt itself; when one is missing the
command prints one line naming the packages (Qt's own message names only the first).

The window opens first and is filled after: reading a design file is plain Python, so the file
is checked, the application made and a light first window (:func:`first_window`: the title,
the window's colours, where it was last placed, "Opening …") painted before numpy, scipy,
pyqtgraph and the views are imported; then the workbench replaces it at the same place and
the analysis is shown as soon as it is done. A screenshot skips the first window and waits
for every result.
"""

from __future__ import annotations

import ctypes
import ctypes.util
import os
import sys
from collections.abc import Callable
from pathlib import Path
from typing import TYPE_CHECKING

from app.import_path import start_up

if TYPE_CHECKING:
    from PySide6.QtWidgets import QApplication, QMainWindow

    from app.window.main_window import MainWindow
    from core import Design

__all__ = ["run_window", "open_window", "first_window", "default_design_path",
           "SCREENSHOT_SIZE", "WINDOW_SIZE", "view_names", "missing_xcb_libraries",
           "XCB_LIBRARIES", "XCB_HINT", "ALL_VIEWS"]

SCREENSHOT_SIZE = (1440, 900)
WINDOW_SIZE = (1440, 900)
"""The window's size when no layout is remembered (px)."""
ALL_VIEWS = "all"  # --view all: the plots together in the grid

XCB_LIBRARIES = {  # library Qt's xcb plugin loads: its Debian/Ubuntu package
    "xcb-cursor": ("libxcb-cursor.so.0", "libxcb-cursor0"),
    "xcb-icccm": ("libxcb-icccm.so.4", "libxcb-icccm4"),
    "xcb-keysyms": ("libxcb-keysyms.so.1", "libxcb-keysyms1"),
}
XCB_HINT = ("penduline: the window needs the system libraries {names} for Qt's X11 platform, "
            "and {missing} cannot be found: on Debian/Ubuntu `apt install {packages}` "
            "(other systems: the xcb-util-cursor, xcb-util-wm and xcb-util-keysyms packages)")


def default_design_path() -> Path:
    """The built-in example opened when no file is given."""
    return (Path(__file__).resolve().parent.parent / "resources" / "examples"
            / "workshop_regulator.pendulum.json")


def view_names() -> list[str]:
    """The names ``--view`` accepts: each view's slug (from the catalogue), then ``all``."""
    from app.views.catalogue import CARDS

    return [entry.slug for entry in CARDS] + [ALL_VIEWS]


def _library_loads(name: str, soname: str) -> bool:
    """True when the dynamic loader finds ``soname`` (or ``find_library`` finds ``name``)."""
    try:
        ctypes.CDLL(soname)
        return True
    except OSError:
        return ctypes.util.find_library(name) is not None


def missing_xcb_libraries(finder: Callable[[str, str], bool] | None = None) -> list[str]:
    """The Debian package names of the xcb libraries Qt's X11 plugin needs and that
    ``finder(name, soname)`` (default: the dynamic loader) cannot find; empty when Qt will
    not use X11 (another platform is chosen, no ``DISPLAY``, not Linux) or everything is
    there."""
    platform = os.environ.get("QT_QPA_PLATFORM", "")
    if not sys.platform.startswith("linux") or platform not in ("", "xcb"):
        return []
    if not os.environ.get("DISPLAY"):
        return []
    if not platform and os.environ.get("WAYLAND_DISPLAY"):
        return []  # Qt prefers Wayland when it is there
    found = finder or _library_loads
    return [package for name, (soname, package) in XCB_LIBRARIES.items()
            if not found(name, soname)]


def _refuse_without_xcb() -> bool:
    """Print the one line and return True when the X11 platform cannot load."""
    missing = missing_xcb_libraries()
    if not missing:
        return False
    names = ", ".join(soname for soname, _ in XCB_LIBRARIES.values())
    packages = " ".join(package for _, package in XCB_LIBRARIES.values())
    print(XCB_HINT.format(names=names, missing=", ".join(missing), packages=packages),
          file=sys.stderr)
    return True


def run_window(path: str | None, screenshot: str | None, view: str | None = None) -> int:
    """Open the workbench on the design at ``path`` (default: the built-in example).

    With ``screenshot``, the window is drawn offscreen (when there is no display) at
    1440×900 once everything is computed, saved as PNG to ``screenshot``, and 0 is returned.
    ``view`` names the view on show (a slug of :data:`app.views.catalogue.VIEWS`, or
    ``"all"`` for the plots together). Returns 1 when the window's system libraries are
    missing (one line on stderr says which packages to install).

    Raises
    ------
    core.DesignError
        When the file cannot be used or ``view`` names no view (the command line prints it
        and exits with 2).
    """
    from core import DesignError, load_design

    design_path = Path(path) if path else default_design_path()
    design = load_design(design_path)  # refuse a bad file before any window appears
    if view is not None and view not in view_names():
        raise DesignError("--view", f"there is no view {view!r}; the views are "
                                    f"{', '.join(view_names())}")
    if screenshot and not (os.environ.get("DISPLAY") or os.environ.get("WAYLAND_DISPLAY")):
        os.environ["QT_QPA_PLATFORM"] = "offscreen"
    if _refuse_without_xcb():
        return 1

    from PySide6.QtWidgets import QApplication

    app = QApplication.instance() or QApplication(sys.argv[:1])
    assert isinstance(app, QApplication)
    window = open_window(app, design, design_path if path else None,
                         remember_layout=not screenshot, first=not screenshot, view=view)
    if screenshot:
        return _screenshot(app, window, Path(screenshot))
    window.offer_recovery()  # edits autosaved by a run that crashed
    return int(app.exec())


def open_window(app: QApplication, design: Design, path: Path | None,
                remember_layout: bool = True, first: bool = True,
                view: str | None = None) -> MainWindow:
    """Show the workbench on ``design`` (read from ``path``; None: an example, unnamed), with
    ``view`` on show (see :func:`run_window`).

    With ``first``, a light window (:func:`first_window`) is painted before the heavy
    imports and replaced by the workbench, analysed before it is shown (a few milliseconds
    for most designs): its first paint has the figures and curves, and no paint of an empty
    workbench is spent. Without it (a screenshot), the workbench is made but not shown.
    The libraries are imported in turn on this thread: importing the integrator on a pool
    thread at the same time was measured slower (the two share one interpreter lock).
    """
    with start_up(freeze=first):  # measured: window ready 0.86 -> 0.76 s, 178 -> 162 MB
        shell = first_window(app, design.name, remember_layout) if first else None
        from app.document.settings import APPLICATION, ORGANISATION  # numpy, scipy: heavy
        from app.window.main_window import MainWindow

        app.setOrganizationName(ORGANISATION)
        app.setApplicationName(APPLICATION)
        window = MainWindow(design, path, remember_layout=remember_layout)
        if view is not None:
            _show_view(window, view)
        if shell is not None:
            window.compute_now()
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

    from app.theme import colour_window, set_role

    shell = QMainWindow()
    colour_window(shell)
    shell.setWindowTitle(f"{name} — Penduline")
    label = QLabel(f"Opening {name}…")
    set_role(label, "hint")
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


def _show_view(window: object, view: str) -> None:
    """Bring ``view`` on show: ``all`` is the grid page; a view's slug its own tab."""
    area = window.plot_area  # type: ignore[attr-defined]
    if view == ALL_VIEWS:
        area.set_arrangement("grid")
        area.show_plot(0)
        return
    index = area.plots.index_of_slug(view)
    area.set_arrangement("tabs")
    area.show_plot(index)


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
