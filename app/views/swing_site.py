"""The room in the swing preview: the floor line and the barrier posts, with the clearance.

Drawn when the design has an ``exhibit`` section (pivot height above the floor, barrier
radius); the clearance figure is the core's (``result.geometry.floor_clearance_m``). Posts are
drawn a fixed 1 m high on the floor: a sign of where the barrier stands, not its height.
"""

from __future__ import annotations

from collections.abc import Callable

import pyqtgraph as pg
from PySide6 import QtCore, QtGui, QtWidgets

from app import theme
from app.views.swing_drawing import cosmetic_pen
from core import Result

__all__ = ["SiteMarks", "POST_HEIGHT_M", "clearance_line", "LINE_COLOUR", "WARNING_COLOUR"]

POST_HEIGHT_M = 1.0
FLOOR_COLOUR = "#6b5d40"
BARRIER_COLOUR = "#7a4b00"
LINE_COLOUR = theme.MARKER  # the clearance line a person drags
WARNING_COLOUR = theme.PROBLEM  # ... when the swing reaches it


def clearance_line(view: pg.ViewBox) -> tuple[pg.InfiniteLine, pg.InfLineLabel]:
    """A horizontal line a person can drag (floor, barrier), hidden until asked for, with its
    label under it at the right edge (the bob and its paths are above a clear line)."""
    line = pg.InfiniteLine(pos=1.0, angle=0, movable=True, pen=cosmetic_pen(LINE_COLOUR, 2.0),
                           hoverPen=cosmetic_pen(LINE_COLOUR, 3.0))
    label = pg.InfLineLabel(line, text="", position=0.98, anchors=[(1, 0), (1, 0)],
                            color=LINE_COLOUR, fill=pg.mkBrush(255, 255, 255, 220))
    line.setZValue(15)
    line.setVisible(False)
    view.addItem(line, ignoreBounds=True)
    return line, label


class SiteMarks:
    """Floor line, barrier posts and their labels, made once in ``view`` and moved by each
    result (hidden without an exhibit section)."""

    def __init__(self, view: pg.ViewBox) -> None:
        self.floor = pg.PlotCurveItem(pen=cosmetic_pen(FLOOR_COLOUR, 2.5))
        self.hatch = QtWidgets.QGraphicsPathItem()
        self.hatch.setPen(cosmetic_pen(FLOOR_COLOUR, 1.0))
        self.posts = (QtWidgets.QGraphicsRectItem(), QtWidgets.QGraphicsRectItem())
        for post in self.posts:
            post.setPen(cosmetic_pen(BARRIER_COLOUR, 1.2))
            post.setBrush(pg.mkBrush(BARRIER_COLOUR))
        self.label = pg.TextItem("", color=FLOOR_COLOUR, anchor=(0.5, 0.0),
                                 fill=pg.mkBrush(255, 255, 255, 210))
        for item in (self.floor, self.hatch, *self.posts, self.label):
            item.setZValue(4)
            view.addItem(item, ignoreBounds=True)
        self._floor_m = 0.0
        self._barrier_m = 0.0

    def floor_m(self) -> float:
        """Depth the view must show below the pivot, m: the floor and the labels under it
        (0: none drawn)."""
        return self._floor_m * 1.09

    def reach_m(self) -> float:
        """Horizontal extent the marks need, m (0: none drawn)."""
        return self._barrier_m * 1.08 if self._barrier_m else 0.0

    def update(self, result: Result, text: Callable[[float, str], str]) -> None:
        """Place the floor and the posts of ``result``'s design (or hide them); ``text``
        gives a figure in SI unit as the window shows it (``figure_text`` in its units)."""
        ex = result.design.exhibit
        g = result.geometry
        floor = None if ex is None else ex.pivot_above_floor_m
        barrier = None if ex is None else ex.barrier_radius_m
        self._floor_m = floor or 0.0
        self._barrier_m = barrier or 0.0
        reach = max(barrier or 0.0, g.outer_reach_m if g is not None else 0.0) * 1.1 + 0.2
        if floor is None:
            self.floor.setData([], [])
            self.hatch.setPath(QtGui.QPainterPath())
            self.label.setVisible(False)
        else:
            self.floor.setData([-reach, reach], [floor, floor])
            path = QtGui.QPainterPath()
            step = reach / 12.0
            x = -reach
            while x < reach:
                path.moveTo(x, floor)
                path.lineTo(x + 0.5 * step, floor + 0.5 * step)
                x += step
            self.hatch.setPath(path)
            clear = "" if g is None or g.floor_clearance_m is None else \
                f" · clearance {text(g.floor_clearance_m, 'm')}"
            margin = "" if barrier is None else f"<br>Barrier radius {text(barrier, 'm')}" + (
                "" if g is None or g.barrier_margin_m is None else
                f" · margin {text(g.barrier_margin_m, 'm')}")
            self.label.setHtml(f"<div style='font-size:8pt'>Floor {text(floor, 'm')} below pivot"
                               f"{clear}{margin}</div>")
            self.label.setPos(0.0, floor + 0.01 * floor)
            self.label.setVisible(True)
        for side, post in zip((-1.0, 1.0), self.posts, strict=True):
            if barrier is None or floor is None:
                post.setVisible(False)
                continue
            w = max(0.015 * reach, 0.02)
            post.setRect(QtCore.QRectF(side * barrier - w / 2, floor - POST_HEIGHT_M, w,
                                       POST_HEIGHT_M))
            post.setVisible(True)
