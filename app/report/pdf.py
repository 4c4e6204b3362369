"""The PDF report of one design: Qt's own PDF writer laying out an HTML document on A4.

Contents: title, design name, file, date; the safety cautions (boxed, first page); the readout
(``app.readout.readout_format.SECTIONS``) with the sensitivities; the design (site, suspension,
swing, target, every part with its fields and units); the rate budget; the exhibit figures with
the load caution; a one-line summary of the rating log; warnings; every plot, drawn as vectors.
All numbers come from ``core.Result``; words and units are the window's
(:mod:`app.report.pdf_tables`).
"""

from __future__ import annotations

import datetime as _dt
import html
import os
from collections.abc import Mapping
from pathlib import Path

from PySide6 import QtCore, QtGui, QtWidgets

from app.form.units import UnitSystem
from app.report.atomic_files import atomic_path
from app.report.pdf_tables import (
    box,
    budget_table,
    design_tables,
    exhibit_table,
    rating_summary,
    readout_table,
)
from core import Result
from core.analysis import LOAD_CAUTION, SPRING_CAUTION

__all__ = ["write_report_pdf", "report_html", "widget_image", "widget_picture"]

REPORT_IMAGE_WIDTH_PX = 2000
BODY_FONT_PT = 9.0

_STYLE = """
body { font-family: 'DejaVu Sans', sans-serif; color: #22262a; }
h1 { font-size: 17pt; color: #1d3f5c; margin-bottom: 2px; }
h2 { font-size: 12pt; color: #1d3f5c; margin-top: 14px; margin-bottom: 4px; }
p.meta { color: #555; margin-top: 0px; }
table.grid { border-collapse: collapse; }
table.grid td, table.grid th { border: 1px solid #b9c2ca; padding: 2px 5px; }
table.grid th { background-color: #e3eaf0; text-align: left; }
td.num { text-align: right; }
tr.section td { background-color: #f0f3f6; font-weight: bold; color: #1d3f5c; }
p.caption { color: #444; margin-top: 2px; }
"""

_PLOT_MARK = "penduline-drawing:"  # a paragraph holding only this and an index becomes a plot


def _plots_html(images: Mapping[str, str], captions: Mapping[str, str]) -> str:
    """Two plots a page, each under its title with its caption; ``images`` maps a title to
    an image URL, or to ``penduline-drawing:N`` for a drawing placed as vectors."""
    parts = []
    for i, (title, url) in enumerate(images.items()):
        brk = " style='page-break-before: always'" if i % 2 == 0 else ""
        caption = captions.get(title, "")
        figure = (f"<p align='center'>{url}</p>" if url.startswith(_PLOT_MARK) else
                  f"<p align='center'><img src='{url}' width='{_IMAGE_WIDTH_HTML}'></p>")
        parts.append(f"<h2{brk}>Figure {i + 1}. {html.escape(title)}</h2>" + figure
                     + (f"<p class='caption'>{html.escape(caption)}</p>" if caption else ""))
    return "".join(parts)


_IMAGE_WIDTH_HTML = 560  # document px (96 per inch): two plots and captions a page


def report_html(result: Result, *, source_name: str | None, date: _dt.date,
                image_urls: Mapping[str, str], captions: Mapping[str, str] | None = None,
                system: UnitSystem = UnitSystem.METRIC) -> str:
    """The report as Qt rich-text HTML in ``system``'s units; ``image_urls`` maps plot titles
    to resource URLs (or to ``penduline-drawing:N`` marks for drawings placed as vectors)."""
    cautions = list(dict.fromkeys([LOAD_CAUTION, SPRING_CAUTION, *result.cautions]))
    meta = " · ".join(x for x in (f"File: {html.escape(source_name)}" if source_name else "",
                                  f"Date: {date.isoformat()}", "Penduline") if x)
    warnings = ("<ul>" + "".join(f"<li>{html.escape(w)}</li>" for w in result.warnings)
                + "</ul>") if result.warnings else "<p>None.</p>"
    return "".join([
        f"<html><head><style>{_STYLE}</style></head><body>",
        f"<h1>{html.escape(result.design.name)}</h1><p class='meta'>Pendulum design report · "
        f"{meta}</p>",
        box("Cautions — read before building or hanging", cautions, "#b3261e", "#fdecea"),
        "<h2>Readout and sensitivities</h2>", readout_table(result, system),
        "<h2>Design</h2>", design_tables(result, system), rating_summary(result),
        "<h2>Rate budget</h2>", budget_table(result, system),
        "<h2>Exhibit figures</h2>", exhibit_table(result, system),
        "<h2>Warnings</h2>", warnings,
        _plots_html(image_urls, captions or {}),
        "</body></html>"])


def _paint_widget(widget: QtWidgets.QWidget, device: QtGui.QPaintDevice, fill: bool) -> None:
    """Paint ``widget`` onto ``device`` at its own size (white behind it when ``fill``); a
    graphics view (every plot) through its scene, other widgets through ``QWidget.render``."""
    size = widget.size()
    painter = QtGui.QPainter(device)
    try:
        painter.setRenderHint(QtGui.QPainter.RenderHint.Antialiasing, True)
        painter.setRenderHint(QtGui.QPainter.RenderHint.TextAntialiasing, True)
        if fill:
            painter.fillRect(QtCore.QRectF(0, 0, size.width(), size.height()),
                             QtGui.QColor("white"))
        if isinstance(widget, QtWidgets.QGraphicsView):
            target = QtCore.QRectF(0, 0, size.width(), size.height())
            QtWidgets.QGraphicsView.render(widget, painter, target, widget.viewport().rect())
        else:
            widget.render(painter, QtCore.QPoint())
    finally:
        painter.end()


def widget_picture(widget: QtWidgets.QWidget) -> QtGui.QPicture:
    """Record ``widget`` (laid out and sized) as drawing commands: placed in the PDF, lines
    and text stay vectors (sharp at any zoom, and small)."""
    picture = QtGui.QPicture()
    size = widget.size()
    _paint_widget(widget, picture, fill=True)
    picture.setBoundingRect(QtCore.QRect(0, 0, size.width(), size.height()))
    return picture


_PLOT_OBJECT = QtGui.QTextFormat.ObjectTypes.UserObject + 1
_PLOT_INDEX = QtGui.QTextFormat.Property.UserProperty + 1


class _PlotObject(QtGui.QPyTextObject):
    """Draws a recorded plot (:class:`QPicture`) inline, scaled to the report's width."""

    def __init__(self, parent: QtCore.QObject, pictures: list[QtGui.QPicture]) -> None:
        super().__init__(parent)
        self._pictures = pictures

    def intrinsicSize(self, doc: QtGui.QTextDocument, pos: int,  # Qt override
                      fmt: QtGui.QTextFormat) -> QtCore.QSizeF:
        box = self._pictures[int(fmt.property(_PLOT_INDEX))].boundingRect()
        # Laid out for print, the document measures in the printer's pixels.
        device = doc.documentLayout().paintDevice()
        width = _IMAGE_WIDTH_HTML * (device.logicalDpiX() / 96.0 if device else 1.0)
        return QtCore.QSizeF(width, width * box.height() / max(1, box.width()))

    def drawObject(self, painter: QtGui.QPainter,  # Qt override
                   rect: QtCore.QRectF | QtCore.QRect,
                   doc: QtGui.QTextDocument, pos: int, fmt: QtGui.QTextFormat) -> None:
        picture = self._pictures[int(fmt.property(_PLOT_INDEX))]
        box = picture.boundingRect()
        rect = QtCore.QRectF(rect)
        painter.save()
        painter.translate(rect.topLeft())
        # A picture replayed on a device of another resolution is scaled by the ratio of the
        # two; undo that, so the drawing fills ``rect`` exactly.
        device = painter.device()
        dpi_x = picture.logicalDpiX() / device.logicalDpiX() if device else 1.0
        dpi_y = picture.logicalDpiY() / device.logicalDpiY() if device else 1.0
        painter.scale(dpi_x * rect.width() / max(1, box.width()),
                      dpi_y * rect.height() / max(1, box.height()))
        painter.drawPicture(0, 0, picture)
        painter.restore()


def widget_image(widget: QtWidgets.QWidget, width_px: int = REPORT_IMAGE_WIDTH_PX
                 ) -> QtGui.QImage:
    """Render ``widget`` (laid out and sized) into an image ``width_px`` wide.

    The image has a device pixel ratio of ``width_px`` / widget width, so text, markers and
    lines keep their on-screen proportions and come out sharp. A graphics view (every plot) is
    rendered through its scene; other widgets through ``QWidget.render``.
    """
    size = widget.size()
    ratio = width_px / max(1, size.width())
    image = QtGui.QImage(round(size.width() * ratio), round(size.height() * ratio),
                         QtGui.QImage.Format.Format_ARGB32)
    image.setDevicePixelRatio(ratio)
    image.fill(QtGui.QColor("white"))
    _paint_widget(widget, image, fill=False)
    return image


def _document(result: Result, images: Mapping[str, QtGui.QImage | QtGui.QPicture],
              captions: Mapping[str, str], source_name: str | None, date: _dt.date,
              system: UnitSystem) -> QtGui.QTextDocument:
    doc = QtGui.QTextDocument()
    font = QtGui.QFont("DejaVu Sans")
    font.setPointSizeF(BODY_FONT_PT)
    doc.setDefaultFont(font)
    urls = {}
    pictures: list[QtGui.QPicture] = []
    for i, (title, image) in enumerate(images.items()):
        if isinstance(image, QtGui.QPicture):
            urls[title] = f"{_PLOT_MARK}{len(pictures)}"
            pictures.append(image)
            continue
        url = f"penduline-plot://{i}.png"
        doc.addResource(QtGui.QTextDocument.ResourceType.ImageResource, QtCore.QUrl(url), image)
        urls[title] = url
    handler = _PlotObject(doc, pictures)
    doc.documentLayout().registerHandler(_PLOT_OBJECT, handler)
    doc.setHtml(report_html(result, source_name=source_name, date=date, image_urls=urls,
                            captions=captions, system=system))
    for i in range(len(pictures)):
        cursor = doc.find(f"{_PLOT_MARK}{i}")
        if cursor.isNull():
            continue
        fmt = QtGui.QTextCharFormat()
        fmt.setObjectType(_PLOT_OBJECT)
        fmt.setProperty(_PLOT_INDEX, i)
        cursor.insertText("\ufffc", fmt)
    return doc


def write_report_pdf(result: Result, path: str | os.PathLike[str],
                     images: Mapping[str, QtGui.QImage | QtGui.QPicture], *,
                     captions: Mapping[str, str] | None = None, source_name: str | None = None,
                     date: _dt.date | None = None,
                     system: UnitSystem = UnitSystem.METRIC) -> Path:
    """Write the A4 PDF report of ``result`` to ``path`` (atomically); returns the path.

    Parameters
    ----------
    result : core.Result
    images : plot title → a drawing (from :func:`widget_picture`: placed as vectors) or an
        image (from :func:`widget_image`), in report order.
    captions : plot title → a sentence shown under the plot.
    source_name : design file name shown in the header.
    date : report date (default today).
    system : the units the figures are given in.
    """
    doc = _document(result, images, captions or {}, source_name, date or _dt.date.today(),
                    system)
    with atomic_path(path) as tmp:
        writer = QtGui.QPdfWriter(str(tmp))
        writer.setPageSize(QtGui.QPageSize(QtGui.QPageSize.PageSizeId.A4))
        writer.setPageOrientation(QtGui.QPageLayout.Orientation.Portrait)
        writer.setPageMargins(QtCore.QMarginsF(0, 0, 0, 0))  # the layout adds 2 cm margins
        writer.setResolution(300)
        writer.setTitle(f"Penduline report: {result.design.name}")
        writer.setCreator("Penduline")
        doc.print_(writer)
        del writer  # finishes the file
    return Path(path)
