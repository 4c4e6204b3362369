"""The period-curve view: exact period, circular error or rate against semi-arc."""

from __future__ import annotations

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QComboBox, QGraphicsEllipseItem, QGraphicsItem, QWidget

from app import theme
from app.views.axes import pen
from app.views.base import select_quietly
from app.views.catalogue import from_card
from app.views.chart import ChartView, y_extent
from core import Result
from core.analysis import PeriodCurve

__all__ = ["PeriodCurvePlot", "PERIOD_QUANTITIES", "X_RANGES", "NO_TARGET_NOTE"]


PERIOD_QUANTITIES: tuple[tuple[str, str, str], ...] = (
    ("period", "Period (s)", "Period"),
    ("circular_error", "Circular error (s/day)", "Circular error"),
    ("rate", "Rate against target (s/day)", "Rate"),
)
"""(key, axis label, name) of the quantities the period-curve plot can show, all fields of
``Result.period_curve``. Each is a monotone transform of period, so they are shown one at a
time rather than as curves that look like one. Rate needs a target; without one its curve is
empty."""

X_RANGES = ("near", "whole")
X_RANGE_NAMES = {"near": "Near the working arc", "whole": "Whole range"}
X_RANGE_SHORT_NAMES = {"near": "Near the arc", "whole": "To 180°"}  # in a small pane
SHORT_NAMES_BELOW_PX = 420
NOTE_COLOUR = "#6b7178"  # a plain remark, not a refusal
NO_TARGET_NOTE = ("No rate without a target: set a target period or beats per hour\n"
                  "in Target, or show the period or the circular error.")
X_PADDING = 0.02  # of the x span, each side
LABEL_RIGHT, LABEL_LEFT = (-0.04, 0.0), (1.04, 0.0)  # text anchors beside the marker line
NEAR_FACTOR = 4.0  # "near the working arc": up to this many times the working semi-arc
NEAR_MIN_DEG = 10.0
WHOLE_DEG = 180.0


@from_card("period_curve")
class PeriodCurvePlot(ChartView):
    """Exact period or circular error (the person's choice) against semi-arc, the working
    semi-arc marked on the curve and labelled with its values; x near the working arc or over
    the whole range to 180°."""

    caption = ("Exact period and circular error against semi-arc; the working semi-arc "
               "is marked.")

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        item = self.getPlotItem()
        item.setLabel("bottom", "Semi-arc (°)")
        self.ghost = self._curve(theme.GHOST, 2.0, None, z=-10)
        # One curve per quantity; only the chosen one is shown (both hold the core's arrays).
        self.period = self._curve(theme.EXACT, 2.0, None, z=2, smooth=True)
        self.error = self._curve(theme.DIFFERENCE, 2.0, None, z=2, smooth=True)
        self.rate = self._curve(theme.EXACT, 2.0, None, z=2, smooth=True)
        self.marker = pg.InfiniteLine(angle=90, movable=False,
                                      pen=pen(theme.MARKER, 1.0, Qt.PenStyle.DashLine))
        self.marker.setZValue(4)
        item.addItem(self.marker, ignoreBounds=True)
        self.dot = QGraphicsEllipseItem(-4.5, -4.5, 9.0, 9.0)
        self.dot.setFlag(QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations, True)
        self.dot.setPen(pen(theme.MARKER, 1.5))
        self.dot.setBrush(pg.mkBrush(theme.PLOT_BACKGROUND))
        self.dot.setZValue(6)
        item.vb.addItem(self.dot, ignoreBounds=True)
        # The values, on the marker line near the top of the view: the curve rises with the
        # arc, so the top of the line is clear of it.
        self.marker_label = pg.InfLineLabel(self.marker, "", position=0.97,
                                            anchors=[LABEL_RIGHT, LABEL_RIGHT],
                                            color=theme.MARKER,
                                            fill=pg.mkBrush(252, 251, 248, 225))
        self.marker_label.setZValue(7)
        self.note = pg.TextItem("", color=NOTE_COLOUR, anchor=(0.5, 0.5))
        self.note.setParentItem(item.vb)
        self.note.setVisible(False)
        item.vb.sigResized.connect(self._place_note)
        self._quantity = "period"
        self._x_range = "near"
        strip = self.control_bar()
        self.quantity_box = QComboBox()
        for key, _label, name in PERIOD_QUANTITIES:  # units are on the axis beside it
            self.quantity_box.addItem(name, key)
        self.quantity_box.setToolTip("What to draw against semi-arc: the exact period (s), "
                                     "the circular error (s/day), the rate lost to the "
                                     "swing's amplitude, or the clock's rate against its "
                                     "target (s/day)")
        self.quantity_box.currentIndexChanged.connect(
            lambda i: self.set_quantity(self.quantity_box.itemData(i)))
        self.range_box = QComboBox()
        for key in X_RANGES:
            self.range_box.addItem(X_RANGE_NAMES[key], key)
        self.range_box.setToolTip("Semi-arcs shown: near the working arc (up to 4× it, at "
                                  "least 10°), or the whole range to 180°")
        self.range_box.currentIndexChanged.connect(
            lambda i: self.set_x_range(self.range_box.itemData(i)))
        strip.addWidget(self.quantity_box)
        strip.addWidget(self.range_box)
        self._apply_quantity()
        self._fit_strip()

    def _fit_strip(self) -> None:
        """Shorter range names in a small pane, so both choices keep their words."""
        if "range_box" in self.__dict__:
            names = (X_RANGE_SHORT_NAMES if self.width() < SHORT_NAMES_BELOW_PX
                     else X_RANGE_NAMES)
            for i in range(self.range_box.count()):
                self.range_box.setItemText(i, names[self.range_box.itemData(i)])
        super()._fit_strip()

    # -------------------------------------------------------------- choices
    @property
    def quantity(self) -> str:
        """The quantity drawn: "period" or "circular_error"."""
        return self._quantity

    def set_quantity(self, key: str) -> None:
        """Draw ``key`` ("period" or "circular_error") against semi-arc."""
        keys = [k for k, _label, _short in PERIOD_QUANTITIES]
        if key not in keys:
            raise ValueError(f"quantity={key!r} is not offered: choose one of {keys}")
        if key == self._quantity:
            return
        self._quantity = key
        self._apply_quantity()
        if self._result is not None:
            self.show_result(self._result, self._baseline)

    def _apply_quantity(self) -> None:
        _key, label, short = next(q for q in PERIOD_QUANTITIES if q[0] == self._quantity)
        self.period.setVisible(self._quantity == "period")
        self.error.setVisible(self._quantity == "circular_error")
        self.rate.setVisible(self._quantity == "rate")
        self.getPlotItem().setLabel("left", label)
        self._set_title(f"{short} against semi-arc")
        select_quietly(self.quantity_box, self._quantity)
        self._follow = True

    @property
    def x_range(self) -> str:
        """Semi-arcs shown: "near" (0 to a few times the working arc) or "whole" (to 180°)."""
        return self._x_range

    def set_x_range(self, choice: str) -> None:
        """Show semi-arcs "near" the working one or the "whole" range; follows results
        again."""
        if choice not in X_RANGES:
            raise ValueError(f"x range {choice!r} is not offered: choose one of {X_RANGES}")
        self._x_range = choice
        select_quietly(self.range_box, choice)
        self._follow = True
        self._reframe()

    def shown_values(self) -> np.ndarray:
        """The y values of the curve on view (the chosen quantity), as drawn."""
        curve = {"period": self.period, "circular_error": self.error,
                 "rate": self.rate}[self._quantity]
        return np.asarray(curve.getData()[1], dtype=float)

    def marker_text(self) -> str:
        """The label at the working semi-arc, as plain text."""
        return self.marker_label.textItem.toPlainText()

    # -------------------------------------------------------------- drawing
    def show_result(self, result: Result, baseline: Result | None = None) -> None:
        """Draw ``result.period_curve`` and mark ``result.amplitude_deg`` on it."""
        self._result_arrived(result, baseline)
        curve = result.period_curve
        amps = np.asarray(curve.amplitude_deg, dtype=float)
        shown = {"period": self.period, "circular_error": self.error,
                 "rate": self.rate}[self._quantity]
        shown.setData(amps, self._values(curve))  # the hidden two are filled when chosen
        amp = float(result.amplitude_deg)
        here = self._here(result)
        self.marker.setValue(amp)
        self.dot.setPos(amp, here)
        text = (f"{amp:.4g}°\n{result.period_s:.6f} s\n"
                f"{result.circular_error_s_per_day:.3f} s/day lost to the arc\n"
                f"(against vanishing arcs)")
        self.marker_label.setFormat(text.replace("{", "{{").replace("}", "}}"))
        self.marker_label.valueChanged()
        self._show_ghost(self.ghost, None if baseline is None else
                   (baseline.period_curve.amplitude_deg, self._values(baseline.period_curve)))
        self._explain(result)
        if self.follows_result:
            self._frame(result)
        self._settle()

    def _explain(self, result: Result) -> None:
        """Rate without a target: say so in the plot, and draw no axis values that mean
        nothing."""
        empty = self._quantity == "rate" and result.period_curve.rate_s_per_day is None
        self.note.setText(NO_TARGET_NOTE if empty else "")
        self.note.setVisible(empty)
        self.marker.setVisible(not empty)
        self.dot.setVisible(not empty)
        self.getPlotItem().getAxis("left").setStyle(showValues=not empty)
        self._place_note()

    def _place_note(self) -> None:
        rect = self.getPlotItem().vb.boundingRect()
        self.note.setPos(rect.center())

    def note_text(self) -> str:
        """The remark in the plot (rate without a target), or ""."""
        return self.note.textItem.toPlainText() if self.note.isVisible() else ""

    def _values(self, curve: PeriodCurve) -> np.ndarray:
        if self._quantity == "period":
            return np.asarray(curve.period_s, dtype=float)
        if self._quantity == "rate":
            return _rate_values(curve)
        return np.asarray(curve.circular_error_s_per_day, dtype=float)

    def _here(self, result: Result) -> float:
        """The chosen quantity at the working semi-arc (the core's own figure)."""
        if self._quantity == "period":
            return float(result.period_s)
        if self._quantity == "rate":
            return np.nan if result.rate_s_per_day is None else float(result.rate_s_per_day)
        return float(result.circular_error_s_per_day)

    def _reframe(self) -> None:
        if self._result is not None:
            self._frame(self._result)
            self._settle()

    def _frame(self, result: Result) -> None:
        """x near the working arc or over the whole range; y fits the curve on view."""
        if self._x_range == "whole":
            top = WHOLE_DEG
        else:
            top = float(min(WHOLE_DEG, max(NEAR_FACTOR * result.amplitude_deg, NEAR_MIN_DEG)))
        curve = result.period_curve
        amps = np.asarray(curve.amplitude_deg, dtype=float)
        seen = amps <= top * (1.0 + X_PADDING)
        if not np.any(seen):
            return
        vb = self.getPlotItem().vb
        x_lo, x_hi = -X_PADDING * top, (1.0 + X_PADDING) * top
        self._show_range(vb, 0, x_lo, x_hi)
        shown = [_on_x_range(amps, self._values(curve), x_hi)]
        if self._baseline is not None:  # the pinned baseline stays on the scale
            ghost = self._baseline.period_curve
            shown.append(_on_x_range(np.asarray(ghost.amplitude_deg, dtype=float),
                                     self._values(ghost), x_hi))
        self._show_range(vb, 1, *y_extent(np.concatenate(shown)))
        side = LABEL_LEFT if result.amplitude_deg > 0.6 * top else LABEL_RIGHT
        self.marker_label.anchors = [side, side]
        self.marker_label.updatePosition()


def _on_x_range(amps: np.ndarray, values: np.ndarray, x_hi: float) -> np.ndarray:
    """The values drawn up to ``x_hi``: the samples there, and the line's height where it
    leaves the view (the next sample lies beyond, often far higher)."""
    inside = amps <= x_hi
    edge = np.interp(x_hi, amps, values) if amps.size and x_hi < amps[-1] else np.nan
    return np.append(values[inside], edge)


def _rate_values(curve: PeriodCurve) -> np.ndarray:
    """The curve's rate against the target (s/day), NaN throughout when there is no target."""
    if curve.rate_s_per_day is None:
        return np.full(np.shape(curve.amplitude_deg), np.nan)
    return np.asarray(curve.rate_s_per_day, dtype=float)


