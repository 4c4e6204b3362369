"""The client sheet: one page for the person who commissions an exhibit pendulum.

Contents: the design's name; the swing preview and the plan view drawn to scale with the floor
and the barrier (each view's scene painted straight onto the PDF page, so the drawings stay
vectors); the key figures in the chosen units; the cautions and warnings from the
:class:`core.Result`. A4 for metric units, US Letter for inch-pound. The views' control bars
are widgets outside their scenes and the preview's figures box (which names the animation's
state) is hidden, so no window state is printed. ``write_sheet_files`` also writes the
animated swing (:mod:`app.report.swing_animation_export`).
"""

from __future__ import annotations

import os
from pathlib import Path

from PySide6 import QtCore, QtGui, QtWidgets

from app.form.units import UnitSystem, readout_unit
from core import Result

__all__ = ["write_client_sheet", "sheet_figures", "write_sheet_files", "export_sheet_files",
           "SHEET_NAME",
           "ANIMATION_NAME"]

SHEET_NAME = "client_sheet.pdf"
ANIMATION_NAME = "swing.gif"
DPI = 96  # layout units: cosmetic pens keep their on-screen width on paper
PA_PER_KSI = 6.894757293168e6
INK = QtGui.QColor("#22262a")
HEAD = QtGui.QColor("#1d3f5c")
CAUTION_FILL = QtGui.QColor("#fff5dc")
CAUTION_EDGE = QtGui.QColor("#d39a1c")


def _length(value: float | None, system: UnitSystem, digits: int = 4) -> str:
    if value is None:
        return "—"
    u = readout_unit("m", system)
    return f"{u.convert(value):.{digits}g} {u.text}"


def sheet_figures(r: Result, system: UnitSystem) -> list[tuple[str, str]]:
    """(label, value with unit) of the sheet's key figures, in ``system``'s units."""
    g, c, e = r.geometry, r.cable, r.exhibit
    mass = readout_unit("kg", system)
    force = readout_unit("N", system)
    speed = readout_unit("m/s", system)
    out = [("Period", f"{r.period_s:.5g} s"), ("Semi-arc", f"±{r.amplitude_deg:.3g}°"),
           ("Mass", f"{mass.convert(r.mass_kg):.4g} {mass.text}")]
    if r.peak_speed_m_s is not None:
        out.append(("Peak speed of the bob", f"{speed.convert(r.peak_speed_m_s):.3g} "
                                             f"{speed.text}"))
    out.append(("Peak pivot load (ideal)", f"{force.convert(r.max_pivot_load_n):.4g} "
                                           f"{force.text}"))
    if g is not None:
        out += [("Lowest point below pivot", _length(g.lowest_point_m, system)),
                ("Bob rise at end of swing", _length(g.bob_rise_m, system, 3)),
                ("Outer sweep (body included)", _length(g.outer_sweep_m, system)),
                ("Floor clearance", _length(g.floor_clearance_m, system, 3)),
                ("Barrier margin", _length(g.barrier_margin_m, system, 3))]
        if g.reach_below_headroom_m is not None:
            out.append(("Under head height out to", _length(g.reach_below_headroom_m, system,
                                                            3)))
    turn = e.foucault_deg_per_hour
    if e.foucault_turn_h is None or turn == 0.0:
        out.append(("Swing plane", "does not turn (equator)"))
    else:
        sense = "clockwise" if turn > 0 else "counter-clockwise"
        out.append(("Plane turns, seen from above", f"{abs(turn):.3g}°/h {sense}"))
        out.append(("One full turn", f"{e.foucault_turn_h:.4g} h"))
    if e.time_to_half_amplitude_s is not None:
        out.append(("Free decay to half the arc", f"{e.time_to_half_amplitude_s / 3600:.3g} h"))
    if e.drive_power_w is not None:
        out.append(("Drive power to keep the arc", f"{e.drive_power_w:.3g} W"))
    if c is not None and c.stretch_m is not None:
        out.append(("Cable stretch under load", _length(c.stretch_m, system, 3)))
    if c is not None and c.peak_stress_pa is not None:
        stress = (f"{c.peak_stress_pa / 1e6:.3g} MPa" if system is UnitSystem.METRIC
                  else f"{c.peak_stress_pa / PA_PER_KSI:.3g} ksi")
        if c.peak_stress_ratio is not None:
            stress += f" ({100 * c.peak_stress_ratio:.3g} % of {c.peak_stress_ratio_basis})"
        out.append(("Peak cable stress", stress))
    return out


def _render_view(painter: QtGui.QPainter, view: QtWidgets.QGraphicsView,
                 target: QtCore.QRectF) -> float:
    """Paint ``view``'s scene into ``target`` keeping its proportions (vectors on a PDF);
    returns the height used."""
    source = QtCore.QRectF(0, 0, view.width(), view.height())
    scale = min(target.width() / source.width(), target.height() / source.height())
    w, h = source.width() * scale, source.height() * scale
    box = QtCore.QRectF(target.left() + (target.width() - w) / 2, target.top(), w, h)
    view.scene().render(painter, box, source)
    painter.setPen(QtGui.QPen(QtGui.QColor("#b9c2ca"), 0.8))
    painter.drawRect(box)
    return h


def _text(painter: QtGui.QPainter, rect: QtCore.QRectF, text: str, size: float,
          bold: bool = False, colour: QtGui.QColor = INK) -> float:
    """Draw wrapped ``text`` in ``rect``; returns the height used."""
    font = QtGui.QFont("DejaVu Sans")
    font.setPointSizeF(size)
    font.setBold(bold)
    painter.setFont(font)
    painter.setPen(colour)
    flags = int(QtCore.Qt.AlignmentFlag.AlignLeft | QtCore.Qt.AlignmentFlag.AlignTop) | int(
        QtCore.Qt.TextFlag.TextWordWrap)
    used = painter.boundingRect(rect, flags, text)
    painter.drawText(rect, flags, text)
    return used.height()


def _views(result: Result, system: UnitSystem) -> tuple[QtWidgets.QGraphicsView, ...]:
    from app.views.plan_view import PlanView
    from app.views.swing_preview import SwingPreview

    app = QtWidgets.QApplication.instance()
    assert app is not None
    preview, plan = SwingPreview(), PlanView()
    plan.set_unit_system(system)
    for view, size in ((preview, (420, 560)), (plan, (560, 560))):
        view.setAttribute(QtCore.Qt.WidgetAttribute.WA_DontShowOnScreen, True)
        view.resize(*size)
        view.show()
    app.processEvents()
    for view in (preview, plan):
        view.show_result(result)
        view.pose_for_export()
    preview._info.setVisible(False)  # it names the animation's state
    # the preview draws no legend over the drawing (its key is in the text under it)
    plan._info.setVisible(False)  # the key figures say it
    app.processEvents()
    return preview, plan


def write_client_sheet(result: Result, path: str | os.PathLike[str],
                       system: UnitSystem = UnitSystem.METRIC) -> Path:
    """Write the one-page client sheet of ``result`` to ``path`` (PDF); returns the path."""
    out = Path(path)
    writer = QtGui.QPdfWriter(str(out))
    writer.setResolution(DPI)
    page = (QtGui.QPageSize.PageSizeId.A4 if system is UnitSystem.METRIC
            else QtGui.QPageSize.PageSizeId.Letter)
    writer.setPageSize(QtGui.QPageSize(page))
    writer.setPageMargins(QtCore.QMarginsF(14, 12, 14, 12), QtGui.QPageLayout.Unit.Millimeter)
    writer.setTitle(f"{result.design.name} — client sheet")
    writer.setCreator("Penduline")
    views = _views(result, system)
    painter = QtGui.QPainter(writer)
    try:
        area = QtCore.QRectF(writer.pageLayout().paintRectPixels(DPI))
        area.moveTo(0, 0)
        x0, width = area.left(), area.width()
        y = area.top()
        y += _text(painter, QtCore.QRectF(x0, y, width, 40), result.design.name, 17, True,
                   HEAD) + 2
        kind = "Exhibit pendulum" if result.purpose == "exhibit" else "Pendulum"
        y += _text(painter, QtCore.QRectF(x0, y, width, 20),
                   f"{kind} — drawn to scale; figures computed by Penduline from the design "
                   "file", 8.5, colour=QtGui.QColor("#555555")) + 8
        drawing_h = 0.5 * area.height()
        gap = 10.0
        left_w = (width - gap) * 0.42
        used = max(_render_view(painter, views[0], QtCore.QRectF(x0, y, left_w, drawing_h)),
                   _render_view(painter, views[1], QtCore.QRectF(x0 + left_w + gap, y,
                                                                 width - left_w - gap,
                                                                 drawing_h)))
        y += used + 4
        y += _text(painter, QtCore.QRectF(x0, y, width, 30),
                   "Left: side view at release (full semi-arc) with the floor and barrier "
                   "posts; dashed, the paths of the bob centre (blue) and of the lowest point "
                   "(orange). Right: plan from above, the swing plane now and after each hour, "
                   "pins with the hours until each falls.", 7.5,
                   colour=QtGui.QColor("#444444")) + 8
        y += _text(painter, QtCore.QRectF(x0, y, width, 20), "Key figures", 11, True, HEAD) + 3
        figures = sheet_figures(result, system)
        half = (len(figures) + 1) // 2
        row_h = 15.0
        col_w = width / 2
        for i, (label, value) in enumerate(figures):
            cx = x0 + (0 if i < half else col_w)
            cy = y + (i % half) * row_h
            _text(painter, QtCore.QRectF(cx, cy, col_w * 0.5, row_h), label, 8.5)
            _text(painter, QtCore.QRectF(cx + col_w * 0.5, cy, col_w * 0.5 - 6, row_h),
                  value, 8.5, True)
        y += half * row_h + 10
        notes = list(result.cautions) + list(result.warnings)
        if notes:
            y += _text(painter, QtCore.QRectF(x0, y, width, 20), "Cautions", 11, True,
                       HEAD) + 3
            box_top = y
            inner = QtCore.QRectF(x0 + 10, y + 5, width - 16, area.bottom() - y)
            used = 0.0
            for note in notes:
                used += _text(painter, QtCore.QRectF(inner.left(), inner.top() + used,
                                                     inner.width(), inner.height() - used),
                              note, 8.0) + 4
            box = QtCore.QRectF(x0, box_top, width, used + 8)
            painter.setPen(QtGui.QPen(CAUTION_EDGE, 1.0))
            painter.setBrush(QtCore.Qt.BrushStyle.NoBrush)
            painter.drawRect(box)
            painter.fillRect(QtCore.QRectF(x0, box_top, 4, used + 8), CAUTION_EDGE)
    finally:
        painter.end()
        for view in views:
            view.hide()
            view.deleteLater()
    return out


def write_sheet_files(result: Result, out_dir: str | os.PathLike[str],
                      system: UnitSystem = UnitSystem.METRIC) -> list[Path]:
    """Write the client sheet (PDF) and the animated swing (GIF) into ``out_dir``, each
    renamed into place; returns the paths."""
    from app.report.atomic_files import atomic_path
    from app.report.export import _output_dir, ensure_application
    from app.report.swing_animation_export import write_swing_gif

    ensure_application()
    out = _output_dir(out_dir)
    written = []
    for name, write in ((SHEET_NAME, lambda p: write_client_sheet(result, p, system)),
                        (ANIMATION_NAME, lambda p: write_swing_gif(result, p))):
        target = out / name
        with atomic_path(target) as tmp:
            write(tmp)
        written.append(target)
    return written


def export_sheet_files(file: str | os.PathLike[str], out_dir: str | os.PathLike[str],
                       units: str = "metric") -> list[Path]:
    """Load and analyse the design in ``file`` and write its sheet and animation into
    ``out_dir`` (``units``: "metric" or "inch-pound")."""
    from app.report.export import ensure_application
    from core import analyse, load_design

    ensure_application()
    system = UnitSystem.INCH_POUND if units == "inch-pound" else UnitSystem.METRIC
    return write_sheet_files(analyse(load_design(file)), out_dir, system)
