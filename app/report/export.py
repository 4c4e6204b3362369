"""Headless export of one design: every plot (PNG and SVG), the data (CSV) and a PDF report.

Used by ``penduline export FILE --out DIR``. Works without a display: on Linux with neither
``DISPLAY`` nor ``WAYLAND_DISPLAY`` set, Qt's ``offscreen`` platform is chosen before the
application object is made. Each file is written to a temporary name in ``DIR`` and renamed
into place, so a failed export never leaves half a file under the final name.

Files written (``DIR`` is created when missing):
``motion``, ``phase``, ``period_curve``, ``swing_preview`` as ``.png`` and ``.svg``;
``motion.csv``, ``period_curve.csv``, ``parts.csv``; ``report.pdf``.
"""

from __future__ import annotations

import os
import sys
from collections.abc import Callable
from functools import partial
from pathlib import Path
from typing import TYPE_CHECKING, Any, cast

if TYPE_CHECKING:
    from PySide6.QtWidgets import QWidget

    from app.form.units import UnitSystem
    from app.views.base import View
    from core import Result

__all__ = ["export_all", "PLOT_SIZE_PX", "REPORT_PLOT_SIZE_PX", "ensure_application"]

PLOT_SIZE_PX = (1000, 650)
REPORT_PLOT_SIZE_PX = (800, 520)  # smaller layout → larger text relative to the plot on paper
_WRITE_ERRORS = (OSError, ValueError, RuntimeError)

_app_ref: Any = None  # keeps the application alive while exporting


def _choose_platform() -> None:
    """Use the offscreen platform when there is no display to draw on (Linux), or when the
    X11 platform's system libraries are missing (an export needs no display)."""
    from app.launch import missing_xcb_libraries

    if os.environ.get("QT_QPA_PLATFORM"):
        return
    if sys.platform.startswith("linux") and (
            not (os.environ.get("DISPLAY") or os.environ.get("WAYLAND_DISPLAY"))
            or missing_xcb_libraries()):
        os.environ["QT_QPA_PLATFORM"] = "offscreen"


def ensure_application() -> Any:
    """The running ``QApplication``, created (headless if need be) when there is none."""
    global _app_ref
    from PySide6 import QtWidgets

    app = QtWidgets.QApplication.instance()
    if app is None:
        _choose_platform()
        app = QtWidgets.QApplication(["penduline-export"])
    _app_ref = app
    return app


def _output_dir(out_dir: str | os.PathLike[str]) -> Path:
    from core import DesignError

    out = Path(out_dir)
    if out.exists() and not out.is_dir():
        raise DesignError("out", f"{out} is a file, not a folder")
    try:
        out.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise DesignError("out", f"cannot create the folder {out}: {exc.strerror or exc}"
                          ) from None
    return out


def _plot_widgets(result: Result, app: Any) -> list[View]:
    """The views the report shows (:func:`app.views.catalogue.report_views`), drawn without
    appearing on any screen."""
    from PySide6 import QtCore

    from app.views.catalogue import report_views

    widgets = report_views()
    for w in widgets:
        w.setAttribute(QtCore.Qt.WidgetAttribute.WA_DontShowOnScreen, True)
        w.show()
    _lay_out(widgets, result, app, PLOT_SIZE_PX)
    return widgets


def _lay_out(widgets: list[View], result: Result, app: Any, size: tuple[int, int]) -> None:
    """Resize every widget to ``size`` (px) and draw ``result`` in it as a still picture (the
    swing preview shows the moment of release, full semi-arc)."""
    for w in widgets:
        w.resize(*size)
    app.processEvents()
    for w in widgets:
        w.show_result(result)
        w.pose_for_export()
    app.processEvents()


def _write(path: Path, writer: Callable[[Path], Any]) -> Path:
    """Run ``writer(temporary path)`` and rename the result to ``path``; any failure becomes
    ``DesignError(field="out")``."""
    from app.report.atomic_files import atomic_path
    from core import DesignError

    try:
        with atomic_path(path) as tmp:
            writer(tmp)
    except _WRITE_ERRORS as exc:
        reason = exc.strerror if isinstance(exc, OSError) and exc.strerror else str(exc)
        raise DesignError("out", f"could not write {path}: {reason}") from None
    return path


def _write_text(path: Path, text: str) -> Path:
    """Write ``text`` through the core's atomic writer; a failure becomes
    ``DesignError(field="out")``."""
    from app.report.atomic_files import write_text_atomic
    from core import DesignError

    try:
        return write_text_atomic(path, text)
    except DesignError as exc:
        raise DesignError("out", f"could not write {path}: {exc.reason}") from None


def export_all(file: str | os.PathLike[str], out_dir: str | os.PathLike[str]) -> list[Path]:
    """Load and analyse the design in ``file`` and write every export into ``out_dir``.

    Returns
    -------
    list of Path
        The files written, in order.

    Raises
    ------
    core.DesignError
        For a bad design file (its own field), or ``field="out"`` when the output cannot be
        written.
    """
    from core import analyse, load_design

    ensure_application()
    result = analyse(load_design(file))
    return export_result(result, out_dir, Path(file).name)


def export_result(result: Result, out_dir: str | os.PathLike[str], source_name: str,
                  system: UnitSystem | None = None) -> list[Path]:
    """Write every plot (PNG and SVG), the CSVs and the PDF report of ``result`` into
    ``out_dir``; ``source_name`` is the design's file name shown in the report, ``system``
    the units of the report (metric unless given).

    Raises
    ------
    core.DesignError
        ``field="out"`` when the output cannot be written.
    """
    from app.report import csv_data as data_export
    from app.report.pdf import widget_picture

    app = ensure_application()
    out = _output_dir(out_dir)
    widgets = _plot_widgets(result, app)
    written: list[Path] = []
    try:
        for w in widgets:
            for suffix in (".png", ".svg"):
                written.append(_write(out / f"{w.slug}{suffix}", w.export))
        for name, make_csv in (("motion.csv", data_export.motion_csv),
                               ("period_curve.csv", data_export.period_curve_csv),
                               ("parts.csv", data_export.parts_csv)):
            written.append(_write_text(out / name, make_csv(result)))
        _lay_out(widgets, result, app, REPORT_PLOT_SIZE_PX)
        images = {w.title: widget_picture(cast("QWidget", w)) for w in widgets}
        captions = {w.title: w.caption for w in widgets}
        written.append(_write(out / "report.pdf", partial(
            _write_report, result, images, captions, source_name, system)))
    finally:
        _dispose(widgets)
    return written


def _write_report(result: Result, images: dict[str, Any], captions: dict[str, str],
                  source_name: str, system: UnitSystem | None, path: Path) -> Path:
    from app.form.units import UnitSystem
    from app.report.pdf import write_report_pdf

    return write_report_pdf(result, path, images, captions=captions, source_name=source_name,
                            system=system or UnitSystem.METRIC)


def _dispose(widgets: list[View]) -> None:
    """Hide the widgets and delete them now (not through ``PlotWidget.close``, which can crash
    on a shown plot whose layout holds extra view boxes)."""
    from PySide6 import QtCore

    for w in widgets:
        w.pose_for_export()  # stops an animation
        w.hide()
        w.deleteLater()
    QtCore.QCoreApplication.sendPostedEvents(None, QtCore.QEvent.Type.DeferredDelete)
