"""Writing a view to PNG or SVG: pyqtgraph's exporters, with the fall-backs they need.

:func:`export_plot` is the one way any view is written to a file, in the window (a view's
context menu, File ▸ Export) and in the headless exporter alike.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

import pyqtgraph as pg
from pyqtgraph.exporters import ImageExporter, SVGExporter
from PySide6.QtCore import QPoint, QRectF
from PySide6.QtGui import QPainter
from PySide6.QtWidgets import QWidget

__all__ = ["export_plot", "EXPORT_SUFFIXES", "EXPORT_MIN_WIDTH_PX"]

EXPORT_SUFFIXES = (".png", ".svg")
EXPORT_MIN_WIDTH_PX = 1200


def export_plot(widget: QWidget, path: str | Path) -> Path:
    """Write ``widget`` (a plot, or any widget with a ``plotItem``) to ``path``.

    The suffix chooses the format: ``.png`` through pyqtgraph's ``ImageExporter`` (at least
    1200 px wide), ``.svg`` through its ``SVGExporter`` or, where that fails, ``QSvgGenerator``.
    A widget without a plot item is drawn with ``QWidget.grab`` (PNG) or ``QSvgGenerator``
    (SVG). An SVG's view box is the plot's size in pixels and it is written at the screen's
    resolution, so its text, axes and curves keep the positions they have on screen.

    Raises
    ------
    ValueError
        For any other suffix.
    OSError
        When the file cannot be written.
    """
    target = Path(path)
    suffix = target.suffix.lower()
    if suffix not in EXPORT_SUFFIXES:
        raise ValueError(f"cannot export {target.name}: use a .png or .svg file name")
    item = getattr(widget, "plotItem", None)
    if item is None:
        _export_plain_widget(widget, target, suffix)
    elif suffix == ".png":
        exporter = ImageExporter(item)
        width = max(int(item.sceneBoundingRect().width()), EXPORT_MIN_WIDTH_PX)
        exporter.parameters()["width"] = width
        exporter.parameters()["antialias"] = True
        exporter.export(str(target))
    else:
        _export_svg(item, target)
    if not target.exists():
        raise OSError(f"could not write {target}")
    return target


def _export_svg(item: Any, target: Path) -> None:
    """SVG through pyqtgraph's ``SVGExporter``; where it cannot parse the closed paths that
    newer Qt writes (pyqtgraph issue #3495) the same scene area is drawn through
    ``QSvgGenerator`` instead, still as vectors."""
    # Each wide curve as one polyline, not one element per segment (pyqtgraph draws wide pens
    # segment by segment on screen, which is faster there but bloats an SVG and shows joins).
    curves = [c for c in item.scene().items() if isinstance(c, pg.PlotCurveItem)]
    modes = [c.opts["segmentedLineMode"] for c in curves]
    for curve in curves:
        curve.setSegmentedLineMode("off")
    try:
        _export_svg_drawing(item, target)
    finally:
        for curve, mode in zip(curves, modes, strict=True):
            curve.setSegmentedLineMode(mode)


def _export_svg_drawing(item: Any, target: Path) -> None:
    try:
        SVGExporter(item).export(str(target))
        return
    except ValueError:
        pass
    from PySide6.QtSvg import QSvgGenerator

    source = item.sceneBoundingRect()
    generator = QSvgGenerator()
    generator.setFileName(str(target))
    generator.setResolution(_widget_dpi(item))
    generator.setSize(source.size().toSize())
    generator.setViewBox(QRectF(0.0, 0.0, source.width(), source.height()))
    generator.setTitle(getattr(item, "titleLabel", None) and item.titleLabel.text or "plot")
    painter = QPainter(generator)
    try:
        item.scene().render(painter, QRectF(0.0, 0.0, source.width(), source.height()), source)
    finally:
        painter.end()


def _widget_dpi(source: Any) -> int:
    """The logical dots per inch of the screen ``source`` (a widget, or a plot item through
    its scene's view) is drawn on.

    ``QSvgGenerator`` assumes 72 dpi unless told; axis text and ticks drawn at the screen's
    resolution (pyqtgraph records them as ``QPicture``s) would then be scaled by 72/96 and part
    from the curves. Writing at the screen's own resolution keeps one coordinate frame.
    """
    widget = source if isinstance(source, QWidget) else None
    if widget is None:
        scene = source.scene() if hasattr(source, "scene") else None
        views = scene.views() if scene is not None else []
        widget = views[0] if views else None
    dpi = widget.logicalDpiX() if widget is not None else 0
    return int(dpi) if dpi > 0 else 96


def _export_plain_widget(widget: QWidget, target: Path, suffix: str) -> None:
    if suffix == ".png":
        if not widget.grab().save(str(target), "PNG"):
            raise OSError(f"could not write {target}")
        return
    from PySide6.QtSvg import QSvgGenerator

    generator = QSvgGenerator()
    generator.setFileName(str(target))
    generator.setResolution(_widget_dpi(widget))
    generator.setSize(widget.size())
    generator.setViewBox(widget.rect())
    generator.setTitle(getattr(widget, "title", "Penduline plot"))
    painter = QPainter(generator)
    try:
        widget.render(painter, QPoint())  # PySide6 needs the offset with a painter
    finally:
        painter.end()
