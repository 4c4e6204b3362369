"""The motion view: angle against time from release at the working semi-arc."""

from __future__ import annotations

import math

import numpy as np
from PySide6.QtGui import QAction
from PySide6.QtWidgets import QWidget

from app import theme
from app.views.axes import degrees
from app.views.catalogue import from_card
from app.views.chart import ChartView, abs_max
from core import Result

__all__ = ["MotionPlot", "COINCIDE_PX"]

COINCIDE_PX = 1.5  # curves closer than this on screen are drawn as one
EXACT_PEN_PX, LINEAR_PEN_PX = 2.0, 1.5
# A small-angle curve within this of the exact one lies wholly under its wider line
HIDDEN_UNDER_PX = (EXACT_PEN_PX - LINEAR_PEN_PX) / 2


@from_card("motion")
class MotionPlot(ChartView):
    """Angle against time from release at the working semi-arc: exact and linearised, and
    their difference on the right axis (can be hidden)."""

    caption = ("Angle against time after release from rest at the working semi-arc: the "
               "exact motion and the small-angle model, and their difference (right axis).")

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        item = self.getPlotItem()
        item.setLabel("bottom", "Time (s)")
        item.setLabel("left", "Angle (°)")
        self.ghost = self._curve(theme.GHOST, 2.0, None, z=-10)
        self.exact = self._curve(theme.EXACT, EXACT_PEN_PX, "Exact", z=2, smooth=True)
        self.linear = self._curve(theme.LINEAR, LINEAR_PEN_PX, "Small-angle model", z=1)
        self.difference_view = self._right_view("Exact − small-angle (°)", theme.DIFFERENCE)
        self.difference = self._curve(theme.DIFFERENCE, 1.0, "Exact − small-angle",
                                      view=self.difference_view)
        self._show_difference = True
        # Framed from the data's own extent (cheaper than pyqtgraph's auto-range, which
        # re-measures every curve on every update, and steady: the angle axis only moves
        # when the semi-arc does).
        item.vb.disableAutoRange()
        self.difference_view.disableAutoRange()
        action = QAction("Show difference (right axis)", item.vb.menu)
        action.setCheckable(True)
        action.setChecked(True)
        action.toggled.connect(self.set_show_difference)
        item.vb.menu.addAction(action)
        self.difference_action = action

    def set_show_difference(self, show: bool) -> None:
        """Show or hide the exact − linearised curve and its right axis."""
        self._show_difference = bool(show)
        self.difference.setVisible(self._show_difference)
        self.getPlotItem().showAxis("right", self._show_difference)
        if self.difference_action.isChecked() != self._show_difference:
            self.difference_action.setChecked(self._show_difference)
        if self._result is not None:
            self._frame()

    @property
    def shows_difference(self) -> bool:
        return self._show_difference

    def show_result(self, result: Result, baseline: Result | None = None) -> None:
        """Draw ``result.motion`` (angles in degrees against time in s)."""
        self._result_arrived(result, baseline)
        m = result.motion
        t = np.asarray(m.time_s, dtype=float)
        difference = degrees(m.difference_rad)
        self.exact.setData(t, degrees(m.angle_rad))
        if self._streaming and self._lies_under_exact(difference):
            self.linear.setData([], [])  # not drawn in a live drag: it could not be seen
        else:
            self.linear.setData(t, degrees(m.linear_angle_rad))
        self.difference.setData(t, difference)
        self._show_ghost(self.ghost, None if baseline is None else
                   (baseline.motion.time_s, degrees(baseline.motion.angle_rad)))
        if self.follows_result:
            self._frame()
        self._settle()

    def _lies_under_exact(self, difference_deg: np.ndarray) -> bool:
        """True when the small-angle curve would lie wholly under the exact one's wider line
        at the scale on view (the pens differ by twice ``HIDDEN_UNDER_PX``)."""
        vb = self.getPlotItem().vb
        y_lo, y_hi = vb.viewRange()[1]
        px_per_deg = float(vb.height()) / (y_hi - y_lo) if y_hi > y_lo else math.inf
        return abs_max(difference_deg) * px_per_deg <= HIDDEN_UNDER_PX

    def _stream_ended(self) -> None:
        """At rest the small-angle curve is drawn again, hidden or not."""
        if self._alive() and self._result is not None:
            m = self._result.motion
            self.linear.setData(np.asarray(m.time_s, dtype=float), degrees(m.linear_angle_rad))
        super()._stream_ended()

    def _reframe(self) -> None:
        if self._result is not None:
            self._frame()
            self._settle()

    def _frame(self) -> None:
        """The whole time span; angles symmetric about zero, with a little room."""
        curves = [self.exact, self.linear] + ([self.ghost] if self._baseline is not None
                                              else [])
        spans = [(float(x[0]), float(x[-1]), abs_max(y)) for x, y in
                 (c.getData() for c in curves) if x is not None and len(x) > 1]
        if not spans:
            return
        t_lo, t_hi = min(s[0] for s in spans), max(s[1] for s in spans)
        top = max(s[2] for s in spans)
        vb = self.getPlotItem().vb
        pad = 0.01 * (t_hi - t_lo)
        self._show_range(vb, 0, t_lo - pad, t_hi + pad)
        self._show_range(vb, 1, -1.06 * top, 1.06 * top)
        diff = abs_max(self.difference.getData()[1]) or 1e-9  # none: a flat line at 0
        self._show_range(self.difference_view, 1, -1.1 * diff, 1.1 * diff)
        self._name_curves(diff, top)

    def _name_curves(self, diff_deg: float, top_deg: float) -> None:
        """The small-angle curve is said to coincide when it lies within a pixel or so of
        the exact one (it is hidden under it); the difference is named while shown."""
        height_px = max(float(self.getPlotItem().vb.height()), 100.0)
        hidden = diff_deg <= COINCIDE_PX * (2.12 * top_deg) / height_px
        entries = [(self.exact, "Exact"),
                   (self.linear, "Small-angle model" + (" (coincides)" if hidden else ""))]
        if self._show_difference:
            entries.append((self.difference, "Exact − small-angle"))
        self._name_in_legend(entries)


