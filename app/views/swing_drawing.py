"""The swing preview's drawing: each part's outline (metres) and the items that draw it.

The drawing is made from ``Result.bodies`` (positions down from the pivot, in metres, at the
site's temperature) as one group of items whose transform origin is the pivot. The items are
made once for a set of parts and only moved and resized for each new result (a live drag);
they are made again only when parts are added, removed, renamed or change kind or shape.
Each animation frame only rotates the group.

Coordinates: x across the plane of swing (m, positive to the right), y down from the pivot
(m; the view's y axis is inverted so that "down" is down on screen). A positive swing angle
moves the bob to the right.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np
import pyqtgraph as pg
from PySide6 import QtCore, QtGui, QtWidgets

from app import theme
from core.mass_properties import Body

__all__ = ["Outline", "outlines_from_bodies", "Drawing", "Envelope",
           "pivot_item", "pivot_path", "cosmetic_pen", "THIN_PX"]

# Colours: the workbench theme's paper, ink, ghost and marker; the parts' own colours here.
INK = theme.INK
ROD_COLOUR = "#56616b"
SLEEVE_COLOUR = "#9a7442"
BORE_COLOUR = "#e9dcc6"
BOB_COLOURS = {"sphere": "#b8903a", "disc": "#6c8ea8", "lens": "#c9d6df", "cylinder": "#7b7f8a"}
BOB_RIM = {"sphere": "#6e5418", "disc": "#2f4e66", "lens": "#1f4f73", "cylinder": "#3d4048"}
WEIGHT_COLOUR = "#c0392b"
CENTRE_PATH_COLOUR = theme.EXACT
LOWEST_PATH_COLOUR = theme.LINEAR
LINE_COLOUR = theme.MARKER
WARNING_COLOUR = theme.PROBLEM
GHOST_COLOUR = theme.GHOST
CENTRE_PATH_COLOUR = theme.EXACT
LOWEST_PATH_COLOUR = theme.LINEAR

_ROUND_SHAPES = ("sphere", "disc", "lens")
THIN_PX = 2.0  # rods and sleeves drawn narrower than this are outlined, not filled


@dataclass(frozen=True)
class Outline:
    """One part as drawn, in metres: a rectangle, a circle or a point on the hanging axis.

    Attributes
    ----------
    name, kind, shape : the part's name, kind (rod/sleeve/bob/weight) and shape.
    top_m, bottom_m : vertical extent below the pivot, m.
    width_m : extent across, in the plane of swing, m (0 for a point weight).
    inner_width_m : bore of a tube, m (0 otherwise).
    """

    name: str
    kind: str
    shape: str
    top_m: float
    bottom_m: float
    width_m: float
    inner_width_m: float = 0.0

    @property
    def centre_m(self) -> float:
        """Middle of the vertical extent, m below the pivot."""
        return 0.5 * (self.top_m + self.bottom_m)

    @property
    def is_round(self) -> bool:
        """True for outlines drawn as circles (sphere, disc seen face-on, lens outline)."""
        return self.kind == "bob" and self.shape in _ROUND_SHAPES


def outlines_from_bodies(bodies: tuple[Body, ...]) -> tuple[Outline, ...]:
    """The drawn outline of every ``core.mass_properties.Body`` (lengths in m)."""
    return tuple(Outline(b.name, b.kind, b.shape, float(b.top_m), float(b.bottom_m),
                         float(b.width_m), float(b.inner_width_m)) for b in bodies)



def cosmetic_pen(colour: Any, width: float = 1.5,
                 style: QtCore.Qt.PenStyle = QtCore.Qt.PenStyle.SolidLine) -> QtGui.QPen:
    """A cosmetic pen: ``width`` in screen pixels whatever the zoom."""
    pen = QtGui.QPen(pg.mkColor(colour), width)
    pen.setCosmetic(True)
    pen.setStyle(style)
    return pen


class Drawing:
    """The items of one pendulum drawing, children of one group rotated about the pivot.

    The items are made once for a set of parts (their names, kinds and shapes: the drawing's
    ``signature``); a new result with the same set only moves and resizes them
    (:meth:`update`), which is what a live drag does.
    """

    def __init__(self, outlines: tuple[Outline, ...], ghost: bool) -> None:
        self.group = pg.ItemGroup()
        self.ghost = ghost
        self.signature = _drawing_signature(outlines)
        self.items: dict[str, QtWidgets.QGraphicsItem] = {}
        self._inner: dict[str, QtWidgets.QGraphicsItem] = {}  # bore of a sleeve, face of a lens
        self.outlines: dict[str, Outline] = {}
        for o in sorted(outlines, key=_draw_order):
            item = self._make_item(o)
            item.setParentItem(self.group)
            self.items[o.name] = item
        self.update(outlines)

    def _make_item(self, o: Outline) -> QtWidgets.QGraphicsItem:
        if o.kind == "weight":
            return _weight_item(self.ghost)
        item: QtWidgets.QAbstractGraphicsShapeItem
        item = QtWidgets.QGraphicsEllipseItem() if o.is_round else QtWidgets.QGraphicsRectItem()
        if self.ghost:
            item.setPen(cosmetic_pen(GHOST_COLOUR, 1.5, QtCore.Qt.PenStyle.DashLine))
            item.setBrush(QtGui.QBrush(QtCore.Qt.BrushStyle.NoBrush))
            return item
        _style_part(item, o)
        if o.kind == "sleeve" and o.inner_width_m > 0:
            self._inner[o.name] = _bore_item()
        elif o.kind == "bob" and o.shape == "lens":
            self._inner[o.name] = _lens_face_item()
        if o.name in self._inner:
            self._inner[o.name].setParentItem(item)
        return item

    def update(self, outlines: tuple[Outline, ...]) -> bool:
        """Move and resize the items to ``outlines``; False (nothing done) when the set of
        parts differs from the one the items were made for."""
        if _drawing_signature(outlines) != self.signature:
            return False
        self.outlines = {o.name: o for o in outlines}
        for o in outlines:
            item = self.items[o.name]
            if o.kind == "weight":
                item.setPos(0.0, o.centre_m)
                continue
            half = 0.5 * o.width_m
            item.setRect(QtCore.QRectF(-half, o.top_m, o.width_m,  # type: ignore[attr-defined]
                                       o.bottom_m - o.top_m))
            if not self.ghost and o.kind == "bob" and o.shape == "sphere":
                item.setBrush(_bob_brush(o))  # type: ignore[attr-defined]
            inner = self._inner.get(o.name)
            if inner is not None:
                inner.setRect(_inner_rect(o))  # type: ignore[attr-defined]
        return True

    def fill_thin_parts(self, pixel_m: float) -> None:
        """Fill a rod or sleeve only when it is drawn wider than ``THIN_PX`` pixels
        (``pixel_m``: metres per pixel); a thinner one is its outline alone. Filling a
        rectangle narrower than a pixel, rotated, leaves a faint vertical streak beside it
        (the rasteriser's), the "second line along the cable" at some zoom levels."""
        if self.ghost:
            return
        for name, o in self.outlines.items():
            if o.kind not in ("rod", "sleeve"):
                continue
            item = self.items[name]
            thin = o.width_m < THIN_PX * pixel_m
            brush = (QtGui.QBrush(QtCore.Qt.BrushStyle.NoBrush) if thin
                     else pg.mkBrush(ROD_COLOUR if o.kind == "rod" else SLEEVE_COLOUR))
            if item.brush().style() != brush.style():  # type: ignore[attr-defined]
                item.setBrush(brush)  # type: ignore[attr-defined]

    def is_filled(self, name: str) -> bool:
        """Whether part ``name`` is drawn filled."""
        brush = self.items[name].brush()  # type: ignore[attr-defined]
        return bool(brush.style() != QtCore.Qt.BrushStyle.NoBrush)

    def set_angle(self, angle_rad: float) -> None:
        """Rotate the drawing about the pivot; positive angles move the bob to the right."""
        self.group.setRotation(-math.degrees(angle_rad))

    def angle_rad(self) -> float:
        """The angle the drawing shows, rad."""
        return -math.radians(self.group.rotation())

    def extents(self) -> dict[str, tuple[float, float, float]]:
        """Each part's (top, bottom, width) in metres, as drawn at rest (unrotated)."""
        out = {}
        for name, item in self.items.items():
            if item.flags() & QtWidgets.QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations:
                z = float(item.pos().y())
                out[name] = (z, z, 0.0)
            else:
                r = item.rect()  # type: ignore[attr-defined]
                out[name] = (float(r.top()), float(r.bottom()), float(r.width()))
        return out

    def shape_of(self, name: str) -> str:
        """How part ``name`` is drawn: "circle", "rectangle" or "point"."""
        item = self.items[name]
        if item.flags() & QtWidgets.QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations:
            return "point"
        return "circle" if isinstance(item, QtWidgets.QGraphicsEllipseItem) else "rectangle"

    def point_of(self, name: str) -> tuple[float, float]:
        """Where the centre of part ``name`` is drawn now, (across, below pivot) in metres."""
        p = self.group.mapToParent(QtCore.QPointF(0.0, self.outlines[name].centre_m))
        return float(p.x()), float(p.y())


def _drawing_signature(outlines: tuple[Outline, ...]) -> tuple[tuple[Any, ...], ...]:
    """What decides which items a drawing is made of: each part's name, kind and shape, and
    whether it has a bore (a sleeve) — not its size or position."""
    return tuple((o.name, o.kind, o.shape, o.kind == "sleeve" and o.inner_width_m > 0)
                 for o in sorted(outlines, key=_draw_order))


def _draw_order(o: Outline) -> int:
    return {"rod": 0, "sleeve": 1, "bob": 2, "weight": 3}.get(o.kind, 4)


def _style_part(item: QtWidgets.QAbstractGraphicsShapeItem, o: Outline) -> None:
    if o.kind == "rod":
        item.setPen(cosmetic_pen(ROD_COLOUR, 2.0))
        item.setBrush(pg.mkBrush(ROD_COLOUR))
    elif o.kind == "sleeve":
        item.setPen(cosmetic_pen("#5e4525", 1.2))
        item.setBrush(pg.mkBrush(SLEEVE_COLOUR))
    else:
        item.setPen(cosmetic_pen(BOB_RIM[o.shape], 3.0 if o.shape == "lens" else 1.5))
        item.setBrush(_bob_brush(o))


def _bob_brush(o: Outline) -> QtGui.QBrush:
    """Sphere: shaded; other shapes: flat fill of their own colour."""
    if o.shape != "sphere":
        return pg.mkBrush(BOB_COLOURS[o.shape])
    r = 0.5 * o.width_m
    grad = QtGui.QRadialGradient(QtCore.QPointF(-0.35 * r, o.centre_m - 0.35 * r), 1.3 * r)
    grad.setColorAt(0.0, pg.mkColor("#f3e2b0"))
    grad.setColorAt(1.0, pg.mkColor(BOB_COLOURS["sphere"]))
    return QtGui.QBrush(grad)


def _bore_item() -> QtWidgets.QGraphicsRectItem:
    """The tube's bore, drawn inside the sleeve (placed by ``_inner_rect``)."""
    bore = QtWidgets.QGraphicsRectItem()
    bore.setPen(cosmetic_pen("#5e4525", 0.8, QtCore.Qt.PenStyle.DotLine))
    bore.setBrush(pg.mkBrush(BORE_COLOUR))
    return bore


def _lens_face_item() -> QtWidgets.QGraphicsEllipseItem:
    """An inner ring marking the lens's convex face (tells a lens from a flat disc)."""
    ring = QtWidgets.QGraphicsEllipseItem()
    ring.setPen(cosmetic_pen(BOB_RIM["lens"], 1.0))
    ring.setBrush(pg.mkBrush("#e8eff4"))
    return ring


def _inner_rect(o: Outline) -> QtCore.QRectF:
    """Where the bore of a sleeve, or the face ring of a lens, is drawn, m."""
    if o.kind == "sleeve":
        half = 0.5 * o.inner_width_m
        return QtCore.QRectF(-half, o.top_m, o.inner_width_m, o.bottom_m - o.top_m)
    r = 0.55 * o.width_m / 2.0
    return QtCore.QRectF(-r, o.centre_m - r, 2 * r, 2 * r)


def _weight_item(ghost: bool) -> QtWidgets.QGraphicsEllipseItem:
    """A point weight: a marker of fixed screen size, placed at its height on the axis."""
    size = 9.0
    item = QtWidgets.QGraphicsEllipseItem(QtCore.QRectF(-size / 2, -size / 2, size, size))
    item.setFlag(QtWidgets.QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations, True)
    item.setPen(cosmetic_pen(GHOST_COLOUR if ghost else "#7a1f16", 1.2))
    item.setBrush(QtGui.QBrush(QtCore.Qt.BrushStyle.NoBrush) if ghost
                  else pg.mkBrush(WEIGHT_COLOUR))
    return item


def pivot_path(suspension: str = "knife_edge") -> QtGui.QPainterPath:
    """The pivot's symbol in screen pixels (y down), the pivot at the origin.

    A knife edge: a hatched bearing plate with the edge's wedge under it, its point at the
    pivot. A suspension spring: a clamp block under the hatched support, a short flat blade
    hanging from it and the pendulum's small clamp at the blade's foot, where it bends.
    """
    path = QtGui.QPainterPath()
    if suspension == "spring":
        top = -24.0
        path.moveTo(-14, top)
        path.lineTo(14, top)
        for x in range(-12, 15, 6):
            path.moveTo(x, top)
            path.lineTo(x - 5, top - 6)
        path.addRect(QtCore.QRectF(-8, top, 16, 8))  # the chops (upper clamp)
        path.addRect(QtCore.QRectF(-1.5, top + 8, 3, -top - 11))  # the blade
        path.addRect(QtCore.QRectF(-5, -3, 10, 6))  # the pendulum's clamp
        return path
    path.moveTo(-14, 0)
    path.lineTo(14, 0)
    for x in range(-12, 15, 6):
        path.moveTo(x, 0)
        path.lineTo(x - 5, -6)
    wedge = QtGui.QPolygonF([QtCore.QPointF(0, 0), QtCore.QPointF(-5, 9),
                             QtCore.QPointF(5, 9)])
    path.addPolygon(wedge)
    path.closeSubpath()
    return path


def pivot_item(suspension: str = "knife_edge") -> QtWidgets.QGraphicsPathItem:
    """The pivot's symbol (:func:`pivot_path`), fixed screen size, at the origin."""
    item = QtWidgets.QGraphicsPathItem(pivot_path(suspension))
    item.setFlag(QtWidgets.QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations, True)
    item.setPen(cosmetic_pen(INK, 1.5))
    item.setBrush(pg.mkBrush(INK))
    item.setZValue(10)
    return item


class Envelope:
    """The paths of the bob centre and of the lowest point over the swing, and the pivot's
    symbol (knife edge or spring): made once in ``view``, moved by each result."""

    def __init__(self, view: pg.ViewBox) -> None:
        dashed = QtCore.Qt.PenStyle.DashLine
        self.centre_arc = pg.PlotCurveItem(pen=pg.mkPen(CENTRE_PATH_COLOUR, width=2,
                                                        style=dashed))
        self.lowest_arc = pg.PlotCurveItem(pen=pg.mkPen(LOWEST_PATH_COLOUR, width=2,
                                                        style=dashed))
        for curve in (self.centre_arc, self.lowest_arc):
            view.addItem(curve, ignoreBounds=True)
        self.suspension = "knife_edge"
        self.pivot = pivot_item(self.suspension)
        view.addItem(self.pivot, ignoreBounds=True)

    def update(self, amplitude_rad: float, deepest_m: float,
               outlines: tuple[Outline, ...], suspension: str = "knife_edge") -> bool:
        """Arcs traced at ±``amplitude_rad`` by the bob centre and by the deepest point
        (``deepest_m`` below the pivot), and the pivot drawn for ``suspension``
        ("knife_edge" or "spring"). Returns whether there is a bob (whose centre's path is
        drawn).

        No radial lines to the extreme positions: at small arcs they run along the rod and
        read as a second rod."""
        if suspension != self.suspension:
            self.suspension = suspension
            self.pivot.setPath(pivot_path(suspension))
        phi = np.linspace(-amplitude_rad, amplitude_rad, 181)
        sin_phi, cos_phi = np.sin(phi), np.cos(phi)
        bob = next((o for o in outlines if o.kind == "bob"), None)
        self.lowest_arc.setData(deepest_m * sin_phi, deepest_m * cos_phi)
        if bob is None:
            self.centre_arc.setData([], [])
            return False
        r = bob.centre_m
        self.centre_arc.setData(r * sin_phi, r * cos_phi)
        return True
