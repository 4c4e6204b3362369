"""The rating view's three plots, drawn from a :func:`core.rating_report.rating_report` object:
the error against date with the fitted segments and the residuals under it; the rate against
temperature with the measured and the model's lines; the Allan deviation, log-log.

Plain ``PlotCurveItem``/``ScatterPlotItem`` objects, made once and filled with ``setData``.
Nothing here computes physics: points and lines come from the report and from
:mod:`core.rating_curves`.
"""

from __future__ import annotations

from typing import Any

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QSize, Qt
from PySide6.QtWidgets import QVBoxLayout, QWidget

from app import theme
from app.views.axes import pen, style_axis
from core.constants import SECONDS_PER_DAY
from core.rating_curves import rate_temperature_lines, rate_temperature_points
from core.rating_log import RatingLog

__all__ = ["ErrorPlot", "RateTemperaturePlot", "AllanPlot", "make_plot", "style_plot"]

READING = theme.EXACT
FIT = theme.LINEAR
MODEL = theme.DIFFERENCE
ADJUSTMENT = theme.SEPARATRIX


def make_plot(title: str, left: str, bottom: str, date_axis: bool = False) -> pg.PlotWidget:
    """A small plot in the views' look: styled axes, the title in the drawing."""
    axes = {"bottom": pg.DateAxisItem(orientation="bottom")} if date_axis else None
    widget = pg.PlotWidget(background=theme.PLOT_BACKGROUND, axisItems=axes)
    style_plot(widget, title, left, bottom)
    return widget


def style_plot(widget: pg.PlotWidget, title: str, left: str, bottom: str) -> None:
    """Our look on ``widget``: styled axes, the title in the drawing, no generic menu."""
    widget.setMinimumSize(QSize(200, 120))
    item = widget.getPlotItem()
    item.setTitle(title, color=theme.INK, size="9pt")
    for name in ("left", "bottom"):
        style_axis(item.getAxis(name))
    item.setLabel("left", left, color=theme.PLOT_FOREGROUND)
    item.setLabel("bottom", bottom, color=theme.PLOT_FOREGROUND)
    item.setMenuEnabled(False)


def _scatter(color: str, size: float = 6.0) -> pg.ScatterPlotItem:
    return pg.ScatterPlotItem(size=size, pen=pg.mkPen(None), brush=pg.mkBrush(color))


def _legend(plot: pg.PlotWidget) -> pg.LegendItem:
    """A legend in one row below the axes (never over the points)."""
    legend = pg.LegendItem(colCount=4, brush=None, pen=None, verSpacing=-4,
                           labelTextColor=theme.INK, labelTextSize="8pt")
    item = plot.getPlotItem()
    item.layout.addItem(legend, 4, 1)
    item.layout.setRowSpacing(3, 2)
    return legend


def _note(plot: pg.PlotWidget) -> pg.TextItem:
    note = pg.TextItem("", color=theme.PLOT_FOREGROUND, anchor=(0.5, 0.5))
    note.setParentItem(plot.getPlotItem().vb)
    return note


def _place_note(plot: pg.PlotWidget, note: pg.TextItem) -> None:
    rect = plot.getPlotItem().vb.boundingRect()
    note.setPos(rect.center())


class ErrorPlot(QWidget):
    """The clock's error against date (readings, fitted segments, adjustments) over the
    residuals."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.errors = make_plot("Clock error against date", "error (s)", "", date_axis=True)
        self.residual_plot = make_plot("", "residual (s)", "date", date_axis=True)
        self.residual_plot.getPlotItem().setTitle(None)
        self.residual_plot.setXLink(self.errors)
        self.residual_plot.setMaximumHeight(150)
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.setSpacing(0)
        layout.addWidget(self.errors, 3)
        layout.addWidget(self.residual_plot, 1)
        self.readings = _scatter(READING)
        self.fit = pg.PlotCurveItem(pen=pen(FIT, 2.0))
        self.residuals = _scatter(READING, 5.0)
        self.zero = pg.InfiniteLine(0.0, angle=0, pen=pen(theme.GHOST))
        self.errors.addItem(self.fit)
        self.errors.addItem(self.readings)
        self.residual_plot.addItem(self.zero)
        self.residual_plot.addItem(self.residuals)
        self.adjustment_lines: list[pg.InfiniteLine] = []
        legend = _legend(self.errors)
        legend.addItem(self.readings, "reading")
        legend.addItem(self.fit, "fitted segment")
        self.legend = legend

    def show_report(self, log: RatingLog | None, report: dict[str, Any] | None) -> None:
        readings = log.readings if log is not None else ()
        t = np.array([r.at.timestamp() for r in readings], dtype=float)
        e = np.array([r.error_s for r in readings], dtype=float)
        self.readings.setData(t, e)
        for line in self.adjustment_lines:
            self.errors.removeItem(line)
        self.adjustment_lines = []
        for k, a in enumerate(log.adjustments if log is not None else ()):
            line = pg.InfiniteLine(a.at.timestamp(), angle=90,
                                   pen=pen(ADJUSTMENT, 1.0, Qt.PenStyle.DashLine),
                                   label=a.what, labelOpts={"position": 0.94 - 0.07 * (k % 3),
                                                            "color": ADJUSTMENT})
            self.errors.addItem(line)
            self.adjustment_lines.append(line)
        rows = (report or {}).get("residuals") or []
        if rows and len(rows) == len(t):
            fitted = np.array([r["fitted_error_s"] if r["fitted_error_s"] is not None
                               else np.nan for r in rows], dtype=float)
            resid = np.array([r["residual_s"] if r["residual_s"] is not None else np.nan
                              for r in rows], dtype=float)
            connect = np.ones(len(t), dtype=bool)
            for seg in report["segments"] if report else []:
                connect[seg["last_reading"]] = False  # no line across an adjustment
            ok = np.isfinite(fitted)
            self.fit.setData(t[ok], fitted[ok], connect=connect[ok])
            self.residuals.setData(t[np.isfinite(resid)], resid[np.isfinite(resid)])
        else:
            self.fit.setData([], [])
            self.residuals.setData([], [])
        for plot in (self.errors, self.residual_plot):
            plot.getPlotItem().enableAutoRange()


class RateTemperaturePlot(pg.PlotWidget):
    """Rate between readings against temperature, with the measured and the model's lines."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent=parent, background=theme.PLOT_BACKGROUND)
        style_plot(self, "Rate against temperature", "rate (s/day)", "temperature (°C)")
        self.points = _scatter(READING, 5.0)
        self.measured = pg.PlotCurveItem(pen=pen(FIT, 2.0))
        self.model = pg.PlotCurveItem(pen=pen(MODEL, 2.0, Qt.PenStyle.DashLine))
        for item in (self.measured, self.model, self.points):
            self.addItem(item)
        legend = _legend(self)
        legend.addItem(self.points, "between readings")
        legend.addItem(self.measured, "measured")
        legend.addItem(self.model, "model")
        self.note = _note(self)

    def show_report(self, log: RatingLog | None, report: dict[str, Any] | None,
                    to_shown: Any = None) -> None:
        """``to_shown``: °C → the temperature unit on view (a unit conversion only)."""
        convert = to_shown or (lambda x: x)
        temps, rates = (np.empty(0), np.empty(0)) if log is None or not report else \
            rate_temperature_points(log, report)
        self.points.setData(convert(temps), rates)
        lo, hi = (float(temps.min()), float(temps.max())) if temps.size else (15.0, 25.0)
        if hi - lo < 1.0:
            lo, hi = lo - 0.5, hi + 0.5
        measured, model = rate_temperature_lines(report or {}, lo, hi)
        for curve, data in ((self.measured, measured), (self.model, model)):
            curve.setData(*(convert(data[0]), data[1]) if data is not None else ([], []))
        self.note.setText("" if temps.size else "No pair of readings notes the temperature.")
        _place_note(self, self.note)
        self.getPlotItem().enableAutoRange()


class AllanPlot(pg.PlotWidget):
    """Overlapping Allan deviation against averaging time, log-log, or the report's note."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent=parent, background=theme.PLOT_BACKGROUND)
        style_plot(self, "Allan deviation of the rate", "σ<sub>y</sub>(τ)", "τ (days)")
        self.setLogMode(x=True, y=True)
        self.curve = pg.PlotDataItem(pen=pen(READING, 1.5), symbol="o", symbolSize=6,
                                     symbolBrush=READING, symbolPen=None)
        self.addItem(self.curve)
        self.note = _note(self)
        self.note.setTextWidth(260)

    def show_report(self, report: dict[str, Any] | None) -> None:
        points = (report or {}).get("allan_deviation") or []
        if points:
            tau = np.array([p["tau_s"] for p in points], dtype=float) / SECONDS_PER_DAY
            adev = np.array([p["adev"] for p in points], dtype=float)
            self.curve.setData(tau, adev)
            self.note.setText("")
        else:
            self.curve.setData([], [])
            self.note.setText((report or {}).get("allan_note") or "Not determined.")
        _place_note(self, self.note)
        self.getPlotItem().enableAutoRange()
