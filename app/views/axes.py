"""The plots' look: pens and axes (major ticks only, plain numbers, opaque grid lines)."""

from __future__ import annotations

from typing import Any

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import Qt
from PySide6.QtGui import QColor

from app import theme
from app.form.units import METRES_PER_FOOT, ReadoutUnit, UnitSystem, readout_unit

__all__ = ["style_axis", "pen", "degrees", "GRID_SHADE", "drawing_unit", "label_length_axes"]

GRID_SHADE = 0.16  # grid lines: this far from the background towards the axis colour
FEET_OVER_M = 6 * METRES_PER_FOOT  # a to-scale drawing deeper than 6 ft is marked in feet


def pen(color: str, width: float = 1.0, style: Qt.PenStyle = Qt.PenStyle.SolidLine) -> Any:
    """A pyqtgraph pen: ``width`` in screen pixels."""
    return pg.mkPen(color=color, width=width, style=style)


def degrees(values: Any) -> np.ndarray:
    """Radians → degrees (a unit conversion only)."""
    return np.degrees(np.asarray(values, dtype=float))


def _mix(background: str, foreground: str, share: float) -> QColor:
    """The opaque colour ``share`` of the way from ``background`` to ``foreground``."""
    b, f = QColor(background), QColor(foreground)
    return QColor(*(round(getattr(b, c)() + share * (getattr(f, c)() - getattr(b, c)()))
                    for c in ("red", "green", "blue")))


def style_axis(axis: pg.AxisItem, color: str = theme.PLOT_FOREGROUND, grid: bool = True,
               background: str = theme.PLOT_BACKGROUND) -> None:
    """Our look for one axis: major ticks only, plain numbers, and (``grid``) grid lines in an
    opaque pale shade drawn beneath the curves.

    Opaque rather than translucent grid lines: Qt's raster engine draws translucent lines
    slowly (≈ 0.15 ms per line per plot here, ≈ 5 ms a paint for a plot with minor ticks),
    and beneath the curves they never cut through them.
    """
    axis.setStyle(maxTickLevel=0, tickAlpha=255)  # major ticks only: clearer and faster
    axis.setPen(pen(color))
    axis.setTextPen(pen(color))
    axis.enableAutoSIPrefix(False)
    if grid:
        axis.setGrid(255)
        axis.setTickPen(pg.mkPen(_mix(background, color, GRID_SHADE)))
        axis.setZValue(-1)  # behind the view box and its curves (the axis text is outside it)
    else:
        axis.setGrid(False)
        axis.setTickPen(None)



def drawing_unit(system: UnitSystem, extent_m: float) -> ReadoutUnit:
    """The unit of a to-scale drawing's axes: metres, or in inch-pound inches (feet when the
    drawing reaches deeper than 6 ft, ``extent_m`` in metres)."""
    if system is UnitSystem.INCH_POUND and abs(extent_m) > FEET_OVER_M:
        return ReadoutUnit("ft", 1.0 / METRES_PER_FOOT)
    return readout_unit("m", system)


def label_length_axes(item: pg.PlotItem, labels: dict[str, str], unit: ReadoutUnit,
                      color: str = theme.INK) -> None:
    """Label the axes ``labels`` (axis name → words) of a plot drawn in metres with ``unit``,
    and number their ticks in it (the scene stays in metres; only the numbers are scaled)."""
    for name, words in labels.items():
        item.setLabel(name, words, units=unit.text, color=color)
        axis = item.getAxis(name)
        axis.enableAutoSIPrefix(False)
        axis.setScale(unit.scale)
