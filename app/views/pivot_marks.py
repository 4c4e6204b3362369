"""Marks on the swing preview's hanging axis: the centre of mass, the centre of oscillation and
the shortest-period pivot.

Each mark is a small symbol of fixed screen size and its own shape (not told apart by colour
alone), named in the key under the drawing by a like-shaped character. The marks are children
of the drawing's group, so they swing with the body; the centre of oscillation and the
shortest-period pivot sit beside the axis on short leaders, so that marks a few pixels apart on
a small drawing stay apart. Their depths below the pivot are the core's figures (``Result``);
nothing is computed here but a difference of two of them.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import pyqtgraph as pg
from PySide6 import QtCore, QtGui, QtWidgets

from app import theme
from app.views.swing_drawing import cosmetic_pen
from core import Result

__all__ = ["PivotMarks", "Mark", "MARKS", "mark_depths_m"]


@dataclass(frozen=True)
class Mark:
    """One mark: its key, legend text, symbol (a pyqtgraph name or a path in the unit square),
    size (px), colours and where it is drawn across the axis (px; 0 on the axis, else beside
    it at the end of a short leader, so marks close together stay apart)."""

    key: str
    label: str
    symbol: str | QtGui.QPainterPath
    size: float
    pen: str
    brush: str
    beside_px: float = 0.0
    glyph: str = ""


def _centre_of_mass_symbol() -> QtGui.QPainterPath:
    """A circle with two opposite quarters filled (the drafting sign for a centre of mass),
    in pyqtgraph's unit square (−0.5 … 0.5)."""
    path = QtGui.QPainterPath()
    path.addEllipse(QtCore.QPointF(0.0, 0.0), 0.5, 0.5)
    for start in (0.0, 180.0):
        path.moveTo(0.0, 0.0)
        path.arcTo(QtCore.QRectF(-0.5, -0.5, 1.0, 1.0), start, 90.0)
        path.closeSubpath()
    return path


def _unit_symbol(symbol: str | QtGui.QPainterPath) -> QtGui.QPainterPath:
    """A symbol as a path in pyqtgraph's unit square."""
    return symbol if isinstance(symbol, QtGui.QPainterPath) else pg.graphicsItems.\
        ScatterPlotItem.Symbols[symbol]


MARKS: tuple[Mark, ...] = (
    Mark("centre_of_mass", "Centre of mass", _centre_of_mass_symbol(), 14.0,
         theme.INK, theme.INK, glyph="◐"),
    Mark("centre_of_oscillation", "Centre of oscillation", "d", 12.0,
         theme.DIFFERENCE, "#f4e8f2", beside_px=20.0, glyph="◇"),
    Mark("shortest_period_pivot", "Shortest-period pivot", "t1", 12.0,
         theme.MARKER, "#e3f1ea", beside_px=-20.0, glyph="△"),
)


def mark_depths_m(result: Result) -> dict[str, float | None]:
    """Depth below the pivot of each mark, m (None where the core gives no figure)."""
    h = float(result.centre_of_mass_m)
    p = result.pivot
    shortest = None if p is None or p.shortest_period_pivot_m is None \
        else h - float(p.shortest_period_pivot_m)
    return {"centre_of_mass": h,
            "centre_of_oscillation": float(result.centre_of_oscillation_m),
            "shortest_period_pivot": shortest}


def _mark_item(mark: Mark) -> QtWidgets.QGraphicsPathItem:
    """A mark as drawn: its symbol (``size`` px) ``beside_px`` across the axis, joined to the
    axis by a short leader; fixed screen size and upright whatever the swing."""
    unit = _unit_symbol(mark.symbol)
    path = QtGui.QPainterPath()
    if mark.beside_px:
        edge = mark.beside_px - math.copysign(0.5 * mark.size, mark.beside_px)
        path.moveTo(0.0, 0.0)
        path.lineTo(edge, 0.0)
    place = QtGui.QTransform()
    place.translate(mark.beside_px, 0.0)
    place.scale(mark.size, mark.size)
    path.addPath(place.map(unit))
    item = QtWidgets.QGraphicsPathItem(path)
    item.setFlag(QtWidgets.QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations, True)
    item.setPen(cosmetic_pen(mark.pen, 1.6))
    item.setBrush(pg.mkBrush(mark.brush))
    item.setZValue(12)
    return item


class PivotMarks:
    """The marks' items: made once, moved for each result, carried by the drawing's group.

    Attributes
    ----------
    items : the drawn marks by key (their position is the point marked, m).
    """

    def __init__(self) -> None:
        self.items = {mark.key: _mark_item(mark) for mark in MARKS}
        self._depths: dict[str, float | None] = {}

    def attach(self, group: QtWidgets.QGraphicsItem) -> None:
        """Make the marks children of ``group`` (the drawing that swings)."""
        for item in self.items.values():
            if item.parentItem() is not group:
                item.setParentItem(group)

    def release(self, group: QtWidgets.QGraphicsItem) -> None:
        """Take the marks off ``group`` (a drawing about to be dropped) so they outlive it."""
        for item in self.items.values():
            if item.parentItem() is group:
                item.setParentItem(None)  # type: ignore[arg-type]  # None: no parent
                if item.scene() is not None:
                    item.scene().removeItem(item)

    def update(self, result: Result) -> None:
        """Place each mark on the hanging axis at its depth (hidden where it has none)."""
        depths = mark_depths_m(result)
        if depths == self._depths:
            return
        self._depths = depths
        for key, item in self.items.items():
            depth = depths[key]
            item.setVisible(depth is not None)
            item.setPos(0.0, 0.0 if depth is None else depth)

    def depths_m(self) -> dict[str, float | None]:
        """Where each mark is drawn, m below the pivot, at rest (None: not shown)."""
        return dict(self._depths)

    def key_names(self) -> list[str]:
        """The names of the marks shown, in the key's order."""
        return [m.label for m in MARKS if self._depths.get(m.key) is not None]

    def key_html(self) -> str:
        """The marks' part of the key under the drawing: " · " and, for each mark shown, its
        character in its colour and its name ("" when none is shown)."""
        parts = [f"<span style='color:{m.pen}'>{m.glyph}</span> {m.label.lower()}"
                 for m in MARKS if self._depths.get(m.key) is not None]
        return "".join(f" · {part}" for part in parts)
