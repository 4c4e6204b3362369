"""The PDF report of one design: Qt's own PDF writer laying out an HTML document on A4.

Contents: title, design name, file, date; the safety cautions (boxed, first page); the readout
(``app.readout.readout_format.SECTIONS``) with the sensitivities; the design (site, suspension,
swing, target, every part with its fields and units); the rate budget; the exhibit figures with
the load caution; warnings; every plot as an image. All numbers come from ``core.Result``.
"""

from __future__ import annotations

import datetime as _dt
import html
import os
from collections.abc import Mapping, Sequence
from pathlib import Path
from typing import Any

from PySide6 import QtCore, QtGui, QtWidgets

from app.readout.readout_format import SECTIONS, format_value
from app.report.atomic_files import atomic_path
from core import Result
from core.analysis import LOAD_CAUTION, SPRING_CAUTION
from core.fileformat import design_to_dict

__all__ = ["write_report_pdf", "report_html", "widget_image", "field_label"]

REPORT_IMAGE_WIDTH_PX = 2000
BODY_FONT_PT = 9.0

# (suffix of a file key, unit shown); longest suffixes first.
_UNIT_SUFFIXES = (("_n_m_per_rad", "N·m/rad"), ("_m_s2", "m/s²"), ("_hpa", "hPa"),
                  ("_deg", "°"), ("_kg", "kg"), ("_c", "°C"), ("_m", "m"), ("_s", "s"))

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

_EXHIBIT_SECTION = "Swing and loads"
_EXHIBIT_EXTRA = (
    ("peak_angular_velocity_rad_s", "Peak angular velocity", "rad/s", "{:.5g}"),
    ("release_axial_load_n", "Load along pendulum at release", "N", "{:.2f}"),
    ("lowest_point_m", "Lowest point below pivot (hanging)", "m", "{:.4f}"),
    ("energy_lost_per_cycle_j", "Energy lost per period", "J", "{:.4g}"),
)


def field_label(key: str) -> tuple[str, str]:
    """A file key's plain label and unit: ``"outer_diameter_m"`` → ``("outer diameter", "m")``."""
    for suffix, unit in _UNIT_SUFFIXES:
        if key.endswith(suffix):
            return key[: -len(suffix)].replace("_", " "), unit
    return key.replace("_", " "), ""


_NONE_TEXT = {"mass_kg": "from material", "g_m_s2": "from latitude and elevation",
              "period_s": "none", "beats_per_hour": "none", "pitch_m": "no rating nut",
              "quality_factor": "no damping"}


def _value_text(key: str, value: Any) -> str:
    if value is None:
        return _NONE_TEXT.get(key, "—")
    if isinstance(value, float):
        return f"{value:.6g}"
    return html.escape(str(value))


def _fields_text(d: Mapping[str, Any], skip: Sequence[str] = ()) -> str:
    """``label value unit`` for every key of a part or section, separated by middle dots."""
    pieces = []
    for key, value in d.items():
        if key in skip:
            continue
        if isinstance(value, Mapping):
            pieces.append(f"{html.escape(key)}: {_fields_text(value)}")
            continue
        label, unit = field_label(key)
        shown = _value_text(key, value)
        unit_text = "" if not unit or value is None else unit if unit == "°" else f" {unit}"
        pieces.append(f"{html.escape(label)} <b>{shown}</b>{unit_text}")
    return " · ".join(pieces)


def _table(header: Sequence[str], rows: Sequence[Sequence[str]], widths: Sequence[int] = ()
           ) -> str:
    cols = "".join(f"<th width='{w}%'>{h}</th>" if widths else f"<th>{h}</th>"
                   for h, w in zip(header, widths or [0] * len(header), strict=False))
    body = "".join("<tr>" + "".join(cell for cell in row) + "</tr>" for row in rows)
    return (f"<table class='grid' width='100%' cellspacing='0' cellpadding='3'>"
            f"<tr>{cols}</tr>{body}</table>")


def _td(text: str, num: bool = False) -> str:
    return f"<td class='num'>{text}</td>" if num else f"<td>{text}</td>"


def _box(title: str, items: Sequence[str], colour: str, fill: str) -> str:
    """A framed box (a one-cell table) holding a title and a bulleted list."""
    bullets = "".join(f"<li>{html.escape(t)}</li>" for t in items)
    return (f"<table width='100%' cellspacing='0' cellpadding='8' border='2' "
            f"style='border-color:{colour}; border-style:solid; background-color:{fill};'>"
            f"<tr><td><b style='color:{colour}'>{html.escape(title)}</b>"
            f"<ul style='margin-top:3px; margin-bottom:0px'>{bullets}</ul></td></tr></table>")


def _readout_html(report: Mapping[str, Any], spring: bool) -> str:
    """The readout table; the stiffness sensitivity only for a spring suspension."""
    rows: list[list[str]] = []
    for section, items in SECTIONS:
        if section == _EXHIBIT_SECTION:
            continue  # shown with the exhibit figures, beside the load caution
        rows.append([f"<td colspan='3'>{html.escape(section)}</td>"])
        extra = ([("stiffness_s_per_day_per_n_m_per_rad", "Spring stiffness +1 N·m/rad",
                   "s/day", "{:+.4f}")] if section == "Tuning" and spring else [])
        for key, label, unit, fmt in list(items) + extra:
            rows.append([_td(html.escape(label)), _td(format_value(report.get(key), fmt), True),
                         _td(html.escape(unit))])
    table = _table(["Figure", "Value", "Unit"], rows, (55, 28, 17))
    return table.replace("<tr><td colspan='3'>", "<tr class='section'><td colspan='3'>")


def _design_html(result: Result) -> str:
    d = design_to_dict(result.design)
    rows = [[_td("Reference temperature"),
             _td(f"<b>{d['reference_temperature_c']:.6g}</b> °C")]]
    for key in ("site", "suspension", "swing", "target", "rating_nut"):
        rows.append([_td(html.escape(key.replace("_", " ").capitalize())),
                     _td(_fields_text(d[key]))])
    general = _table(["Section", "Fields"], rows, (22, 78))
    masses = {b.name: b for b in result.bodies}
    part_rows = []
    for p in d["parts"]:
        body = masses.get(p["name"])
        kind = p["kind"] + (f" ({p['shape']})" if "shape" in p else "")
        part_rows.append([
            _td(f"<b>{html.escape(p['name'])}</b>"), _td(html.escape(kind)),
            _td(_fields_text(p, skip=("kind", "name", "shape"))),
            _td("—" if body is None else f"{body.mass_kg:.5g}", True),
            _td("—" if body is None else f"{body.centre_m:.5g}", True)])
    parts = _table(["Part", "Kind", "Fields (file values, reference temperature)",
                    "Mass kg", "Centre m"], part_rows, (11, 12, 55, 11, 11))
    return (general + "<p class='caption'>Parts, top to bottom as listed in the design; mass "
            "and centre as hung at the site temperature (used in every figure).</p>" + parts)


def _budget_html(report: Mapping[str, Any]) -> str:
    rows = []
    for line in report["rate_budget"]:
        rows.append([_td(html.escape(line["cause"])),
                     _td(f"{line['low']:.5g} to {line['high']:.5g} {html.escape(line['unit'])}"),
                     _td(f"{line['rate_at_low_s_per_day']:+.3f}", True),
                     _td(f"{line['rate_at_high_s_per_day']:+.3f}", True),
                     _td(f"{line['spread_s_per_day']:+.3f}", True)])
    rows.append([_td("<b>Total, worst case</b>"), _td(""), _td(""), _td(""),
                 _td(f"<b>{report['rate_budget_worst_case_s_per_day']:.3f}</b>", True)])
    rows.append([_td("<b>Total, root sum square</b>"), _td(""), _td(""), _td(""),
                 _td(f"<b>{report['rate_budget_rss_s_per_day']:.3f}</b>", True)])
    note = ("<p class='caption'>Rate (s/day) at each end of each range, the other conditions "
            "held at the site's values; against the target period, or against the design's "
            "own period when no target is set.</p>")
    return _table(["Cause", "Range", "Rate at low", "Rate at high", "Spread s/day"], rows,
                  (22, 30, 16, 16, 16)) + note


def _exhibit_html(report: Mapping[str, Any]) -> str:
    items = [i for s, rows in SECTIONS if s == _EXHIBIT_SECTION for i in rows]
    items += list(_EXHIBIT_EXTRA)
    rows = [[_td(html.escape(label)), _td(format_value(report.get(key), fmt), True),
             _td(html.escape(unit))] for key, label, unit, fmt in items]
    table = _table(["Figure", "Value", "Unit"], rows, (55, 28, 17))
    return table + _box("Loads", [LOAD_CAUTION], "#9a5b00", "#fff6e0")


def _plots_html(images: Mapping[str, str], captions: Mapping[str, str]) -> str:
    """Two plots a page, each under its title with its caption."""
    parts = []
    for i, (title, url) in enumerate(images.items()):
        brk = " style='page-break-before: always'" if i % 2 == 0 else ""
        caption = captions.get(title, "")
        parts.append(f"<h2{brk}>Figure {i + 1}. {html.escape(title)}</h2>"
                     f"<p align='center'><img src='{url}' width='{_IMAGE_WIDTH_HTML}'></p>"
                     + (f"<p class='caption'>{html.escape(caption)}</p>" if caption else ""))
    return "".join(parts)


_IMAGE_WIDTH_HTML = 560  # document px (96 per inch): two plots and captions a page


def report_html(result: Result, *, source_name: str | None, date: _dt.date,
                image_urls: Mapping[str, str], captions: Mapping[str, str] | None = None) -> str:
    """The report as Qt rich-text HTML; ``image_urls`` maps plot titles to resource URLs."""
    report = result.report_dict()
    cautions = list(dict.fromkeys([LOAD_CAUTION, SPRING_CAUTION, *result.cautions]))
    meta = " · ".join(x for x in (f"File: {html.escape(source_name)}" if source_name else "",
                                  f"Date: {date.isoformat()}", "Penduline") if x)
    warnings = ("<ul>" + "".join(f"<li>{html.escape(w)}</li>" for w in result.warnings)
                + "</ul>") if result.warnings else "<p>None.</p>"
    return "".join([
        f"<html><head><style>{_STYLE}</style></head><body>",
        f"<h1>{html.escape(result.design.name)}</h1><p class='meta'>Pendulum design report · "
        f"{meta}</p>",
        _box("Cautions — read before building or hanging", cautions, "#b3261e", "#fdecea"),
        "<h2>Readout and sensitivities</h2>",
        _readout_html(report, result.design.suspension.kind == "spring"),
        "<h2>Design</h2>", _design_html(result),
        "<h2>Rate budget</h2>", _budget_html(report),
        "<h2>Exhibit figures</h2>", _exhibit_html(report),
        "<h2>Warnings</h2>", warnings,
        _plots_html(image_urls, captions or {}),
        "</body></html>"])


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
    painter = QtGui.QPainter(image)
    try:
        painter.setRenderHint(QtGui.QPainter.RenderHint.Antialiasing, True)
        painter.setRenderHint(QtGui.QPainter.RenderHint.TextAntialiasing, True)
        if isinstance(widget, QtWidgets.QGraphicsView):
            target = QtCore.QRectF(0, 0, size.width(), size.height())
            QtWidgets.QGraphicsView.render(widget, painter, target, widget.viewport().rect())
        else:
            widget.render(painter, QtCore.QPoint())
    finally:
        painter.end()
    return image


def _document(result: Result, images: Mapping[str, QtGui.QImage], captions: Mapping[str, str],
              source_name: str | None, date: _dt.date) -> QtGui.QTextDocument:
    doc = QtGui.QTextDocument()
    font = QtGui.QFont("DejaVu Sans")
    font.setPointSizeF(BODY_FONT_PT)
    doc.setDefaultFont(font)
    urls = {}
    for i, (title, image) in enumerate(images.items()):
        url = f"penduline-plot://{i}.png"
        doc.addResource(QtGui.QTextDocument.ResourceType.ImageResource, QtCore.QUrl(url), image)
        urls[title] = url
    doc.setHtml(report_html(result, source_name=source_name, date=date, image_urls=urls,
                            captions=captions))
    return doc


def write_report_pdf(result: Result, path: str | os.PathLike[str],
                     images: Mapping[str, QtGui.QImage], *,
                     captions: Mapping[str, str] | None = None, source_name: str | None = None,
                     date: _dt.date | None = None) -> Path:
    """Write the A4 PDF report of ``result`` to ``path`` (atomically); returns the path.

    Parameters
    ----------
    result : core.Result
    images : plot title → image (e.g. from :func:`widget_image`), in report order.
    captions : plot title → a sentence shown under the plot.
    source_name : design file name shown in the header.
    date : report date (default today).
    """
    doc = _document(result, images, captions or {}, source_name, date or _dt.date.today())
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
