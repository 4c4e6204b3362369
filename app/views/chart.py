"""What the chart views (motion, phase plane, period curve) share beyond :class:`ResultView`:
styled axes, a legend below them, plain curves and a second y axis, fewer ticks in a small
pane.

Curves are plain ``PlotCurveItem`` objects made once and updated with ``setData``; only the
few thick main curves are antialiased (their stair steps show; the thin ones' do not), and
those only at rest: while results stream in (a live drag) they are drawn plain, and smoothed
again once the stream stops, so the drag keeps its speed (``benchmarks/gui_bench.py``).

The legend names only what is on view: a view calls :meth:`ChartView._name_in_legend` with
the entries it shows after framing (a curve hidden under another, or out of the range, is
dropped or said to coincide).
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QSize, Qt
from PySide6.QtWidgets import QWidget

from app import theme
from app.views.axes import degrees, pen, style_axis
from app.views.base import ResultView

__all__ = ["ChartView", "SMALL_PANE_TICK_DENSITY", "abs_max", "y_extent", "fill_slots",
           "on_view"]

LEGEND_MARGIN_PX = 120  # room taken by the left and right axes, px
SMALL_PANE_PX = 460  # narrower or lower than this, axes ask for fewer ticks
SMALL_PANE_TICK_DENSITY = 0.6


class ChartView(ResultView):
    """A result view drawn as curves on styled axes, with a legend below them."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setMinimumSize(QSize(240, 180))
        self._tick_density = 1.0
        item = self.getPlotItem()
        for name in ("left", "bottom"):
            style_axis(item.getAxis(name))
        style_axis(item.getAxis("right"), grid=False)
        self.legend = pg.LegendItem(colCount=4, brush=None, pen=None, verSpacing=-4,
                                    labelTextColor=theme.INK, labelTextSize="8pt")
        item.layout.addItem(self.legend, 4, 1)
        item.layout.setRowSpacing(3, 2)
        self._legend_key: tuple[tuple[int, str], ...] = ()
        self._smooth: list[pg.PlotCurveItem] = []

    def resizeEvent(self, event: Any) -> None:  # Qt override
        """Fit the legend's columns and the tick density to the size."""
        # pyqtgraph resizes once while its base is being built, and again while closing
        if "legend" in self.__dict__ and self._alive():
            self._fit_legend_columns()
            self._fit_tick_density()
        super().resizeEvent(event)

    def _fit_legend_columns(self) -> None:
        """The most legend columns (up to 4) whose row still fits beside the axes."""
        room = self.width() - LEGEND_MARGIN_PX
        for columns in (4, 3, 2, 1):
            if columns != self.legend.columnCount:
                self.legend.setColumnCount(columns)
            width = self.legend.effectiveSizeHint(Qt.SizeHint.MinimumSize).width()
            if width <= room:
                return

    def _fit_tick_density(self) -> None:
        """Fewer ticks in a small pane, where their labels would crowd each other."""
        small = min(self.width(), self.height()) < SMALL_PANE_PX
        density = SMALL_PANE_TICK_DENSITY if small else 1.0
        if density != self._tick_density:
            self._tick_density = density
            item = self.getPlotItem()
            for name in ("left", "bottom", "right"):
                item.getAxis(name).setTickDensity(density)

    @property
    def tick_density(self) -> float:
        """The axes' tick density now (1.0, or less in a small pane)."""
        return self._tick_density

    def _curve(self, color: str, width: float = 1.5, name: str | None = None, z: float = 0.0,
               view: pg.ViewBox | None = None, smooth: bool = False) -> pg.PlotCurveItem:
        """A plain curve added once; later updated with ``setData``. ``smooth``: antialiased
        (for the few thick main curves)."""
        curve = pg.PlotCurveItem(pen=pen(color, width), antialias=smooth)
        if smooth:
            self._smooth.append(curve)
        curve.setZValue(z)
        if view is None:
            self.getPlotItem().addItem(curve)
        else:
            view.addItem(curve)
        if name is not None:
            self.legend.addItem(curve, name)
            self._legend_key += ((id(curve), name),)
        return curve

    def _set_smooth(self, on: bool) -> None:
        if not self._alive():
            return
        for curve in self._smooth:
            if curve.opts["antialias"] != on:
                curve.opts["antialias"] = on
                curve.update()

    @property
    def smooth(self) -> bool:
        """True while the main curves are antialiased (at rest; not during a live drag)."""
        return all(curve.opts["antialias"] for curve in self._smooth)

    def _name_in_legend(self, entries: list[tuple[pg.PlotCurveItem, str]]) -> None:
        """Make the legend list exactly ``entries`` (curve, name), in order, then the
        baseline when one is shown; nothing is redone when they are already listed."""
        key = tuple((id(curve), name) for curve, name in entries)
        if key == self._legend_key:
            return
        self._legend_key = key
        self.legend.clear()
        for curve, name in entries:
            self.legend.addItem(curve, name)
        ghost = self.__dict__.get("ghost")
        if self._ghost_named and ghost is not None:
            self.legend.addItem(ghost, "Baseline")

    def legend_names(self) -> list[str]:
        """The names the legend lists now, in order."""
        return [label.text for _sample, label in self.legend.items]

    def _right_view(self, label: str, color: str) -> pg.ViewBox:
        """A second y axis on the right, sharing x, drawn in the plot's own layout (so it is
        part of exports)."""
        item = self.getPlotItem()
        view = pg.ViewBox(enableMenu=False)
        view.setParentItem(item)
        view.setMouseEnabled(x=False, y=False)
        view.setAcceptedMouseButtons(Qt.MouseButton.NoButton)
        view.setZValue(item.vb.zValue() + 1)  # drawn over the main curves; takes no mouse
        view.setXLink(item.vb)

        def follow_main_view() -> None:
            view.setGeometry(item.vb.geometry())
            view.linkedViewChanged(item.vb, view.XAxis)

        item.vb.sigResized.connect(follow_main_view)
        follow_main_view()
        axis = item.getAxis("right")
        axis.linkToView(view)
        axis.setLabel(label, color=color)
        item.showAxis("right")
        return view

    def _show_ghost(self, curve: pg.PlotCurveItem, data: tuple[Any, Any] | None) -> None:
        """The baseline's curve in grey (or none), named in the legend."""
        self._set_ghost(curve, data, self.legend)


def abs_max(values: Any) -> float:
    """Largest finite magnitude in ``values`` (0 when there is none)."""
    if values is None:
        return 0.0
    a = np.abs(np.asarray(values, dtype=float))
    a = a[np.isfinite(a)]
    return float(a.max()) if a.size else 0.0


def on_view(x: Any, y: Any, x_range: tuple[float, float], y_range: tuple[float, float]) -> bool:
    """True when some point of the curve (x, y) lies inside the ranges."""
    if x is None or y is None or len(x) == 0:
        return False
    xs, ys = np.asarray(x, dtype=float), np.asarray(y, dtype=float)
    inside = ((xs >= x_range[0]) & (xs <= x_range[1]) & (ys >= y_range[0])
              & (ys <= y_range[1]))
    return bool(np.any(inside))


def y_extent(values: np.ndarray) -> tuple[float, float]:
    """The finite values' range with 6 % to spare each side (NaNs when there are none)."""
    finite = values[np.isfinite(values)]
    if finite.size == 0:
        return math.nan, math.nan
    lo, hi = float(finite.min()), float(finite.max())
    span = hi - lo
    pad = span * 0.06 if span > 0 else max(abs(hi) * 1e-6, 1e-9)
    return lo - pad, hi + pad


def fill_slots(slots: list[pg.PlotCurveItem], orbits: Any) -> None:
    """Put each orbit into its preallocated curve; empty the slots left over."""
    for i, curve in enumerate(slots):
        if i < len(orbits):
            curve.setData(degrees(orbits[i].angle_rad),
                          degrees(orbits[i].angular_velocity_rad_s))
        elif curve.xData is not None and len(curve.xData):  # an empty slot stays as it is
            curve.setData([], [])
