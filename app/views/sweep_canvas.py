"""The sweep's plot: the curve the core returned and the marks on it.

A :class:`~app.views.base.ResultView` (so it has the shared export menu and title), drawn into
by :class:`app.views.sweep.SweepPlot`, which owns the controls and the sweeping.
"""

from __future__ import annotations

import math

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QGraphicsEllipseItem, QGraphicsItem, QWidget

from app import theme
from app.form.units import ReadoutUnit, format_sig
from app.views.axes import style_axis
from app.views.base import ResultView
from app.views.catalogue import from_card
from app.views.sweep_fields import PIVOT, SweepField
from core import Result
from core.solve import SweepTable

__all__ = ["SweepCanvas"]

NOTE_COLOUR = "#6b7178"  # a plain remark, not a refusal


@from_card("sweep")
class SweepCanvas(ResultView):
    """The sweep's plot: the shared view base (export menu, title) under the sweep's own
    two-row control bar; :class:`SweepPlot` draws into it."""

    follows_pan = False  # the sweep frames its range itself

    def show_result(self, result: Result, baseline: Result | None = None) -> None:
        """Nothing: :class:`SweepPlot` sweeps and draws."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        item = self.getPlotItem()
        for name in ("left", "bottom"):
            style_axis(item.getAxis(name))
        self.curve = pg.PlotCurveItem(pen=pg.mkPen(theme.EXACT, width=2.0), antialias=True)
        item.addItem(self.curve)
        self.marker = pg.InfiniteLine(angle=90, movable=False,
                                      pen=pg.mkPen(theme.MARKER, width=1.0,
                                                   style=Qt.PenStyle.DashLine))
        item.addItem(self.marker, ignoreBounds=True)
        # Pivot sweep: the conjugate pivot, where the turned-over pendulum keeps the period.
        self.conjugate = pg.InfiniteLine(angle=90, movable=False,
                                         pen=pg.mkPen(theme.DIFFERENCE, width=1.0,
                                                      style=Qt.PenStyle.DotLine))
        self.conjugate_label = pg.InfLineLabel(self.conjugate, "", position=0.9,
                                               anchors=[(1.03, 0.5), (1.03, 0.5)],
                                               color=theme.DIFFERENCE,
                                               fill=pg.mkBrush(252, 251, 248, 225))
        item.addItem(self.conjugate, ignoreBounds=True)
        self.conjugate.setVisible(False)
        self.dot = _dot(theme.MARKER)
        self.least_dot = _dot(theme.DIFFERENCE)
        self.marker_label = pg.TextItem("", color=theme.MARKER, anchor=(0, 1),
                                        fill=pg.mkBrush(252, 251, 248, 225))
        self.least_label = pg.TextItem("", color=theme.DIFFERENCE, anchor=(0.5, -0.3),
                                       fill=pg.mkBrush(252, 251, 248, 225))
        for extra in (self.dot, self.least_dot, self.marker_label, self.least_label):
            extra.setZValue(6)
            item.vb.addItem(extra, ignoreBounds=True)
        self.note = pg.TextItem("", color=NOTE_COLOUR, anchor=(0, 0))
        self.note.setParentItem(item.vb)
        self.note.setPos(8, 8)

    def set_note(self, text: str) -> None:
        """A remark in the plot's corner (none when ``text`` is empty)."""
        self.note.setText(text)
        self.note.setVisible(bool(text))

    def mark_current(self, result: Result, rate: bool, field: SweepField | None,
                     sweep_range: tuple[float, float], unit: ReadoutUnit) -> None:
        """The current value: a line, and a dot at the core's own figure for the design;
        its label gives the value in ``unit`` (the display unit; the plot is in SI)."""
        value = 0.0 if field is None else field.value
        here: float | None = result.period_s
        if rate and result.design.target.target_period_s is not None:
            here = result.rate_s_per_day
        elif rate:  # against the design as it is, the design itself is the zero
            here = None if field is None or field.path == PIVOT else 0.0
        self.marker.setValue(value)
        shown = here is not None and math.isfinite(here)
        self.dot.setVisible(shown)
        self.marker_label.setVisible(shown)
        if here is not None and shown:
            self.dot.setPos(value, here)
            self.marker_label.setPos(value, here)
            at = ("as designed" if field is None or field.path == PIVOT
                  else f"now {_shown(value, unit)}")
            self.marker_label.setText(f"{at}: " + (f"{here:+.2f} s/day" if rate
                                                   else f"{here:.6f} s"))
            self.marker_label.setAnchor(self._label_anchor(value, *sweep_range))

    def _label_anchor(self, value: float, lo: float, hi: float) -> tuple[float, float]:
        """Where the current value's label goes, clear of the curve: beside the mark on the
        side with more room, below the curve where it rises that way, above where it falls."""
        xs, ys = (np.asarray(a, dtype=float) for a in self.curve.getData())
        right = value <= lo + 0.6 * (hi - lo)  # the label goes right of the mark
        i = int(np.clip(np.searchsorted(xs, value), 1, len(xs) - 1)) if len(xs) > 1 else 0
        near = ys[max(i - 2, 0):i + 2]
        near = near[np.isfinite(near)]
        rising = bool(near.size < 2 or near[-1] >= near[0])
        below = rising == right  # the curve climbs away from the label's side
        return (-0.03 if right else 1.03, -0.1 if below else 1.1)

    def mark_least(self, xs: np.ndarray, ys: np.ndarray, table: SweepTable,
                   unit: ReadoutUnit, least: float | None, rate: bool) -> None:
        """For the pivot sweep, the value of least period ``least`` (the core's sample of
        least period, picked out by :meth:`SweepPlot.least_period_value`)."""
        self.least_dot.setVisible(least is not None)
        self.least_label.setVisible(least is not None)
        if least is None:
            return
        i = int(np.nanargmin(np.asarray(table.period_s, dtype=float)))
        if not math.isfinite(ys[i]):
            self.least_dot.setVisible(False)
            self.least_label.setVisible(False)
            return
        self.least_dot.setPos(xs[i], ys[i])
        self.least_label.setPos(xs[i], ys[i])
        # Least period is the lowest point of the period curve and the highest of the rate:
        # the label goes on the open side, and leans inwards near either end of the range.
        share = (xs[i] - xs[0]) / (xs[-1] - xs[0]) if xs[-1] != xs[0] else 0.5
        across = 0.0 if share < 0.3 else 1.0 if share > 0.7 else 0.5
        self.least_label.setAnchor((across, 1.3) if rate else (across, -0.3))
        self.least_label.setText(f"shortest period {table.period_s[i]:.6f} s "
                                 f"at {_shown(xs[i], unit)}")

    def mark_conjugate(self, result: Result, pivot_sweep: bool, unit: ReadoutUnit) -> None:
        """For the pivot sweep, the centre of oscillation (the core's figure): hung from
        there, turned over, the pendulum swings with the design's own period (Kater)."""
        self.conjugate.setVisible(pivot_sweep)
        if pivot_sweep:
            at = float(result.centre_of_oscillation_m)
            self.conjugate.setValue(at)
            self.conjugate_label.setFormat(f"conjugate pivot {unit.convert(at):.4f} {unit.text}")
            self.conjugate_label.valueChanged()


def _shown(si: float, unit: ReadoutUnit, sig: int = 4) -> str:
    """An SI value as text in ``unit``: “0.9936 m”, “39.12 in”."""
    return f"{format_sig(unit.convert(float(si)), sig)} {unit.text}".rstrip()


def _dot(colour: str) -> QGraphicsEllipseItem:
    """A ring of fixed screen size, placed in data coordinates."""
    dot = QGraphicsEllipseItem(-4.5, -4.5, 9.0, 9.0)
    dot.setFlag(QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations, True)
    dot.setPen(pg.mkPen(colour, width=1.5))
    dot.setBrush(pg.mkBrush(theme.PLOT_BACKGROUND))
    return dot
