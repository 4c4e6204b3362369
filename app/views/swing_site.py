"""The room in the swing preview: the floor line and the barrier posts, with the clearance.

Drawn when the design has an ``exhibit`` section (pivot height above the floor, barrier
radius); the clearance figure is the core's (``result.geometry.floor_clearance_m``). Posts are
drawn a fixed 1 m high on the floor: a sign of where the barrier stands, not its height.
"""

from __future__ import annotations

import pyqtgraph as pg
from PySide6 import QtCore, QtGui, QtWidgets

from app.views.swing_drawing import cosmetic_pen
from core import Result

__all__ = ["SiteMarks", "POST_HEIGHT_M"]

POST_HEIGHT_M = 1.0
FLOOR_COLOUR = "#6b5d40"
BARRIER_COLOUR = "#7a4b00"


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

    def update(self, result: Result) -> None:
        """Place the floor and the posts of ``result``'s design (or hide them)."""
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
                f" · clearance {g.floor_clearance_m:.3f} m"
            margin = "" if barrier is None else f"<br>Barrier radius {barrier:.3g} m" + (
                "" if g is None or g.barrier_margin_m is None else
                f" · margin {g.barrier_margin_m:.3f} m")
            self.label.setHtml(f"<div style='font-size:8pt'>Floor {floor:.3g} m below pivot"
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
