"""The recording view's three plots, drawn from a :class:`core.beats.BeatAnalysis`.

- :class:`IntervalPlot`: each beat's interval against time, as its departure from the fitted
  beat in ms. Intervals that start on a tick and those that start on a tock have their own
  marker shape (triangle, diamond) and colour, each with its fitted level (b − a, b + a) as a
  line, and the band between the two levels shaded: the wider the band, the further out of
  beat the clock is.
- :class:`ResidualPlot`: each tick's departure from the fitted beat model, µs, with the ±1 σ
  timing scatter shaded and the rejected sounds marked on the zero line.
- :class:`WaveformPlot`: the sound around one tick, raw and through the detector's high-pass,
  with the detected onset at 0.

Points can be clicked: :attr:`IntervalPlot.tickClicked` and :attr:`ResidualPlot.tickClicked`
give the tick's position in the analysis's arrays. Only unit changes (s → ms, µs) here.
"""

from __future__ import annotations

from typing import Any

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt, Signal
from PySide6.QtGui import QColor
from PySide6.QtWidgets import QWidget

from app import theme
from app.views.axes import pen
from app.views.rating_plots import style_plot
from core.beats import BeatAnalysis

__all__ = ["IntervalPlot", "ResidualPlot", "WaveformPlot", "TICK", "TOCK", "TICK_SYMBOL",
           "TOCK_SYMBOL", "REJECTED_SYMBOL"]

TICK = theme.EXACT
TOCK = theme.LINEAR
TICK_SYMBOL = "t1"  # triangle pointing up
TOCK_SYMBOL = "d"   # diamond
REJECTED_SYMBOL = "x"
BAND = QColor(theme.DIFFERENCE)
BAND.setAlpha(28)
SCATTER_BAND = QColor(theme.SEPARATRIX)
SCATTER_BAND.setAlpha(22)
CHOSEN = theme.MARKER


def _legend(plot: pg.PlotWidget, columns: int = 4) -> pg.LegendItem:
    """A legend in one row below the axes (never over the points)."""
    legend = pg.LegendItem(colCount=columns, brush=None, pen=None, verSpacing=-4,
                           labelTextColor=theme.INK, labelTextSize="8pt")
    item = plot.getPlotItem()
    item.layout.addItem(legend, 4, 1)
    item.layout.setRowSpacing(3, 2)
    return legend


def _points(color: str, symbol: str, size: float = 8.0) -> pg.ScatterPlotItem:
    return pg.ScatterPlotItem(size=size, symbol=symbol, pen=pg.mkPen(theme.INK, width=0.6),
                              brush=pg.mkBrush(color), hoverable=True,
                              hoverPen=pg.mkPen(CHOSEN, width=2), tip=None)


def _swatch(color: QColor) -> pg.BarGraphItem:
    """A legend entry for a shaded band (the band itself has no legend sample)."""
    shown = QColor(color)
    shown.setAlpha(min(255, 3 * color.alpha()))
    return pg.BarGraphItem(x=[0.0], height=[0.0], width=0.0, brush=pg.mkBrush(shown),
                           pen=pg.mkPen(None))


def _ring() -> pg.ScatterPlotItem:
    ring = pg.ScatterPlotItem(size=17, symbol="o", pen=pg.mkPen(CHOSEN, width=2.2),
                              brush=pg.mkBrush(None))
    ring.setZValue(10)
    return ring


class _TickPlot(pg.PlotWidget):
    """A plot whose points stand for ticks; clicking one emits its position."""

    tickClicked = Signal(int)

    def __init__(self, title: str, left: str, bottom: str,
                 parent: QWidget | None = None) -> None:
        super().__init__(parent=parent, background=theme.PLOT_BACKGROUND)
        style_plot(self, title, left, bottom)
        self.ring = _ring()
        self.addItem(self.ring)

    def _clickable(self, item: pg.ScatterPlotItem) -> None:
        item.sigClicked.connect(self._on_click)

    def _on_click(self, _item: Any, points: Any, _event: Any = None) -> None:
        if len(points):
            self.tickClicked.emit(int(points[0].data()))


class IntervalPlot(_TickPlot):
    """Interval of each beat minus the fitted beat, ms, against time; tick and tock apart."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__("Interval of each beat", "interval − beat (ms)", "time (s)", parent)
        self.band = pg.LinearRegionItem(orientation="horizontal", movable=False,
                                        brush=pg.mkBrush(BAND), pen=pg.mkPen(None))
        self.band.setZValue(-5)
        self.tick_level = pg.InfiniteLine(0.0, angle=0, pen=pen(TICK, 1.4, Qt.PenStyle.DashLine))
        self.tock_level = pg.InfiniteLine(0.0, angle=0, pen=pen(TOCK, 1.4, Qt.PenStyle.DashLine))
        self.ticks = _points(TICK, TICK_SYMBOL, 9.0)
        self.tocks = _points(TOCK, TOCK_SYMBOL, 9.0)
        for item in (self.band, self.tick_level, self.tock_level, self.ticks, self.tocks):
            self.addItem(item)
        self._clickable(self.ticks)
        self._clickable(self.tocks)
        legend = _legend(self)
        legend.addItem(self.ticks, "from a tick")
        legend.addItem(self.tocks, "from a tock")
        self.band_swatch = _swatch(BAND)
        legend.addItem(self.band_swatch, "between the fitted b − a and b + a")
        self.legend = legend
        self._start: dict[int, tuple[float, float]] = {}

    def show_analysis(self, analysis: BeatAnalysis | None) -> None:
        self._start = {}
        if analysis is None:
            for item in (self.ticks, self.tocks):
                item.setData([], [])
            self.ring.setData([], [])
            self.band.hide()
            self.tick_level.hide()
            self.tock_level.hide()
            return
        mid, interval, parity = analysis.intervals()
        ok = np.diff(analysis.tick_index) == 1
        first = np.flatnonzero(ok)  # position of each interval's first tick
        dev = 1e3 * (interval - analysis.beat_s)
        for item, p in ((self.ticks, 0), (self.tocks, 1)):
            sel = parity == p
            item.setData(mid[sel], dev[sel], data=first[sel])
        self._start = {int(k): (float(x), float(y)) for k, x, y in zip(first, mid, dev,
                                                                       strict=True)}
        # tick_index counts from the first accepted tick (0, a tick): the fitted interval
        # after a tick (even number) is b − a, after a tock b + a
        a_ms = 1e3 * analysis.asymmetry_signed_s
        even_level, odd_level = -a_ms, a_ms
        self.tick_level.setValue(even_level)
        self.tock_level.setValue(odd_level)
        self.band.setRegion(sorted((even_level, odd_level)))
        for item in (self.band, self.tick_level, self.tock_level):
            item.show()
        self.getPlotItem().enableAutoRange()

    def mark(self, position: int | None) -> None:
        """Ring the interval that starts at tick ``position`` (none: no ring)."""
        point = None if position is None else self._start.get(position)
        self.ring.setData(*(([point[0]], [point[1]]) if point else ([], [])))


class ResidualPlot(_TickPlot):
    """Each tick's residual from the fitted beat model, µs, against time."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__("Timing residuals", "residual (µs)", "time (s)", parent)
        self.scatter_band = pg.LinearRegionItem(orientation="horizontal", movable=False,
                                                brush=pg.mkBrush(SCATTER_BAND),
                                                pen=pg.mkPen(None))
        self.scatter_band.setZValue(-5)
        self.zero = pg.InfiniteLine(0.0, angle=0, pen=pen(theme.GHOST))
        self.ticks = _points(TICK, TICK_SYMBOL, 7.0)
        self.tocks = _points(TOCK, TOCK_SYMBOL, 7.0)
        self.rejected = pg.ScatterPlotItem(size=9, symbol=REJECTED_SYMBOL,
                                           pen=pg.mkPen(theme.PROBLEM, width=1.2),
                                           brush=pg.mkBrush(theme.PROBLEM))
        for item in (self.scatter_band, self.zero, self.ticks, self.tocks, self.rejected):
            self.addItem(item)
        self._clickable(self.ticks)
        self._clickable(self.tocks)
        legend = _legend(self)
        legend.addItem(self.ticks, "tick")
        legend.addItem(self.tocks, "tock")
        self.band_swatch = _swatch(SCATTER_BAND)
        legend.addItem(self.band_swatch, "± 1 σ timing scatter")
        legend.addItem(self.rejected, "rejected sound")
        self.legend = legend
        self._xy: tuple[Any, Any] = (np.empty(0), np.empty(0))

    def show_analysis(self, analysis: BeatAnalysis | None) -> None:
        if analysis is None:
            for item in (self.ticks, self.tocks, self.rejected, self.ring):
                item.setData([], [])
            self.scatter_band.hide()
            self._xy = (np.empty(0), np.empty(0))
            return
        t = analysis.tick_times_s
        r = 1e6 * analysis.residuals_s
        position = np.arange(len(t))
        for item, p in ((self.ticks, 0), (self.tocks, 1)):
            sel = analysis.tick_index % 2 == p
            item.setData(t[sel], r[sel], data=position[sel])
        rejected = analysis.rejected_times_s
        self.rejected.setData(rejected, np.zeros(len(rejected)))
        s = 1e6 * analysis.timing_scatter_s
        self.scatter_band.setRegion((-s, s))
        self.scatter_band.show()
        self._xy = (t, r)
        self.getPlotItem().enableAutoRange()

    def mark(self, position: int | None) -> None:
        """Ring tick ``position`` (none: no ring)."""
        t, r = self._xy
        if position is None or not 0 <= position < len(t):
            self.ring.setData([], [])
        else:
            self.ring.setData([t[position]], [r[position]])


class WaveformPlot(pg.PlotWidget):
    """The sound around one tick, ms from the detected onset; the onset marked at 0."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent=parent, background=theme.PLOT_BACKGROUND)
        style_plot(self, "Sound around the chosen tick", "level (full scale)",
                   "from the detected onset (ms)")
        self.raw = pg.PlotCurveItem(pen=pen(theme.NEIGHBOUR, 1.0))
        self.filtered = pg.PlotCurveItem(pen=pen(theme.EXACT, 1.3))
        self.onset = pg.InfiniteLine(0.0, angle=90, pen=pen(CHOSEN, 2.0),
                                     label="onset", labelOpts={"position": 0.92,
                                                               "color": CHOSEN})
        for item in (self.raw, self.filtered, self.onset):
            self.addItem(item)
        legend = _legend(self, 3)
        legend.addItem(self.raw, "as recorded")
        legend.addItem(self.filtered, "as the detector hears it")
        self.legend = legend
        self.onset.hide()

    def show_waveform(self, t_rel_s: Any, raw: Any, filtered: Any, title: str) -> None:
        """Draw a window of sound (times relative to the onset, s)."""
        ms = 1e3 * np.asarray(t_rel_s, dtype=float)
        self.raw.setData(ms, np.asarray(raw, dtype=float))
        self.filtered.setData(ms, np.asarray(filtered, dtype=float))
        self.onset.setVisible(len(ms) > 0)
        self.getPlotItem().setTitle(title, color=theme.INK, size="9pt")
        self.getPlotItem().enableAutoRange()

    def clear_waveform(self, title: str = "Sound around the chosen tick") -> None:
        self.show_waveform([], [], [], title)
