"""Swing preview: the pendulum drawn to scale (metres) and animated from the exact motion.

The drawing is made from ``Result.bodies`` (positions down from the pivot, in metres, at the
site's temperature) as one group of items whose transform origin is the pivot. The items are
made once for a set of parts and only moved and resized for each new result (a live drag);
they are made again only when parts are added, removed, renamed or change kind or shape.
Each animation frame only rotates that group (and the baseline ghost's group) to the angle of
the exact motion ``Result.motion`` at the current time; nothing is rebuilt per frame.

True speed: the swing time shown is read from a clock, not counted up frame by frame. Playing
anchors the swing time to the clock's reading; each frame shows the pose at
``anchor swing time + speed × (clock now − anchor reading)``. A late or dropped frame (a busy
event loop during a drag) therefore never slows the swing down: the next frame drawn shows
where the pendulum truly is. The clock is a small object with a ``now_s()`` method
(:class:`WallClock` by default); tests hand the preview one they move by hand.

Coordinates: x across the plane of swing (m, positive to the right), y down from the pivot
(m; the view's y axis is inverted so that "down" is down on screen). A positive swing angle
moves the bob to the right.

No physics is computed here: angles come from the core's sampled motion (interpolated in
time, and repeated every period when the design has no damping); the sweep envelope and the
clearance are geometry of the drawn outlines.
"""

from __future__ import annotations

import math
import time
from dataclasses import dataclass
from typing import Any, Protocol

import numpy as np
import pyqtgraph as pg
from PySide6 import QtCore, QtGui, QtWidgets

from core.analysis import LOAD_CAUTION, SPRING_CAUTION

from app import theme
from app.views.base import DRAG_MARGIN, KEEP_FILL, STREAM_SETTLE_MS, style_axis

__all__ = ["SwingPreview", "SwingPreviewControls", "Outline", "outlines_from_bodies",
           "deepest_point_m", "SPEEDS", "TimeSource", "WallClock"]

SPEEDS: tuple[float, ...] = (1.0, 0.5, 0.25, 0.1)
"""Playback speed factors offered: true speed, ½×, ¼× and 1/10×."""

SPEED_LABELS = {1.0: "1×", 0.5: "½×", 0.25: "¼×", 0.1: "1/10×"}
FRAME_INTERVAL_MS = 16  # ≈ 60 frames per second
CAUTION_MARGIN_PX = 24  # the caution wraps this much narrower than the widget
CAUTION_MIN_WIDTH_PX = 160
COMPACT_WIDTH_PX = 420  # narrower than this, the figures box is cut to two lines

# Colours: the workbench theme's paper, ink, ghost and marker; the parts' own colours here.
BACKGROUND = theme.PLOT_BACKGROUND
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

_ROUND_SHAPES = ("sphere", "disc", "lens")


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


def outlines_from_bodies(bodies: tuple[Any, ...]) -> tuple[Outline, ...]:
    """The drawn outline of every ``core.mass_properties.Body`` (lengths in m)."""
    return tuple(Outline(b.name, b.kind, b.shape, float(b.top_m), float(b.bottom_m),
                         float(b.width_m), float(b.inner_width_m)) for b in bodies)


def _deepest_of_rectangle(o: Outline, amplitude_rad: float) -> float:
    """Deepest point (m below the pivot) reached by a rectangle's lower corners while swinging
    through ±``amplitude_rad``: a corner at radius R and angle φ from the vertical reaches
    R·cos(φ − min(φ, θ₀))."""
    deepest = -math.inf
    for z in (o.top_m, o.bottom_m):
        radius = math.hypot(0.5 * o.width_m, z)
        phi = math.atan2(0.5 * o.width_m, z)
        deepest = max(deepest, radius * math.cos(phi - min(phi, amplitude_rad)))
    return deepest


def deepest_point_m(outlines: tuple[Outline, ...], amplitude_rad: float) -> float:
    """Deepest point below the pivot (m) that any drawn outline reaches over the swing."""
    deepest = 0.0
    for o in outlines:
        if o.kind == "weight":
            deepest = max(deepest, o.centre_m if o.centre_m >= 0 else
                          o.centre_m * math.cos(amplitude_rad))
        elif o.is_round:
            c, r = o.centre_m, 0.5 * o.width_m
            deepest = max(deepest, (c if c >= 0 else c * math.cos(amplitude_rad)) + r)
        else:
            deepest = max(deepest, _deepest_of_rectangle(o, amplitude_rad))
    return deepest


def _pen(colour: Any, width: float = 1.5, style: QtCore.Qt.PenStyle = QtCore.Qt.PenStyle.SolidLine
         ) -> QtGui.QPen:
    """A cosmetic pen: ``width`` in screen pixels whatever the zoom."""
    pen = QtGui.QPen(pg.mkColor(colour), width)
    pen.setCosmetic(True)
    pen.setStyle(style)
    return pen


class _Drawing:
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
            item.setPen(_pen(GHOST_COLOUR, 1.5, QtCore.Qt.PenStyle.DashLine))
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

    def set_angle(self, angle_rad: float) -> None:
        """Rotate the drawing about the pivot; positive angles move the bob to the right."""
        self.group.setRotation(-math.degrees(angle_rad))

    def angle_rad(self) -> float:
        """The angle the drawing shows, rad."""
        return -math.radians(self.group.rotation())


def _drawing_signature(outlines: tuple[Outline, ...]) -> tuple[tuple[Any, ...], ...]:
    """What decides which items a drawing is made of: each part's name, kind and shape, and
    whether it has a bore (a sleeve) — not its size or position."""
    return tuple((o.name, o.kind, o.shape, o.kind == "sleeve" and o.inner_width_m > 0)
                 for o in sorted(outlines, key=_draw_order))


def _draw_order(o: Outline) -> int:
    return {"rod": 0, "sleeve": 1, "bob": 2, "weight": 3}.get(o.kind, 4)


def _style_part(item: QtWidgets.QAbstractGraphicsShapeItem, o: Outline) -> None:
    if o.kind == "rod":
        item.setPen(_pen(ROD_COLOUR, 2.0))
        item.setBrush(pg.mkBrush(ROD_COLOUR))
    elif o.kind == "sleeve":
        item.setPen(_pen("#5e4525", 1.2))
        item.setBrush(pg.mkBrush(SLEEVE_COLOUR))
    else:
        item.setPen(_pen(BOB_RIM[o.shape], 3.0 if o.shape == "lens" else 1.5))
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
    bore.setPen(_pen("#5e4525", 0.8, QtCore.Qt.PenStyle.DotLine))
    bore.setBrush(pg.mkBrush(BORE_COLOUR))
    return bore


def _lens_face_item() -> QtWidgets.QGraphicsEllipseItem:
    """An inner ring marking the lens's convex face (tells a lens from a flat disc)."""
    ring = QtWidgets.QGraphicsEllipseItem()
    ring.setPen(_pen(BOB_RIM["lens"], 1.0))
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
    item.setPen(_pen(GHOST_COLOUR if ghost else "#7a1f16", 1.2))
    item.setBrush(QtGui.QBrush(QtCore.Qt.BrushStyle.NoBrush) if ghost
                  else pg.mkBrush(WEIGHT_COLOUR))
    return item


def _pivot_item() -> QtWidgets.QGraphicsPathItem:
    """Pivot: a small hatched bracket and a dot, fixed screen size, at the origin."""
    path = QtGui.QPainterPath()
    path.moveTo(-14, 0)
    path.lineTo(14, 0)
    for x in range(-12, 15, 6):
        path.moveTo(x, 0)
        path.lineTo(x - 5, -6)
    path.addEllipse(QtCore.QPointF(0, 0), 3.0, 3.0)
    item = QtWidgets.QGraphicsPathItem(path)
    item.setFlag(QtWidgets.QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations, True)
    item.setPen(_pen(INK, 1.5))
    item.setBrush(pg.mkBrush(INK))
    item.setZValue(10)
    return item


class TimeSource(Protocol):
    """Where the animation reads the time."""

    def now_s(self) -> float:
        """Seconds on a clock that never goes back (any origin)."""
        ...


class WallClock:
    """The animation's time source in the window: the monotonic performance counter, s."""

    def now_s(self) -> float:
        """Seconds on the monotonic performance counter (arbitrary origin)."""
        return time.perf_counter()


class _MotionClock:
    """Angle against time from the core's sampled motion; loops for display.

    Without damping the motion is periodic and is repeated every ``period_s``; with damping the
    sampled span is played from release and then restarted.
    """

    def __init__(self, result: Any) -> None:
        m = result.motion
        self.time_s = np.asarray(m.time_s, dtype=float)
        self.angle_rad = np.asarray(m.angle_rad, dtype=float)
        damped = result.design.swing.quality_factor is not None
        self.loop_s = float(self.time_s[-1] if damped else result.period_s)
        self.amplitude_rad = math.radians(float(result.amplitude_deg))

    def angle_at(self, time_s: float) -> float:
        """Exact angle (rad) at ``time_s`` after release, interpolated between samples."""
        t = math.fmod(time_s, self.loop_s)
        if t < 0:
            t += self.loop_s
        return float(np.interp(t, self.time_s, self.angle_rad))


CONTROL_STRIP_PX = 30  # the strip of on-screen controls covers pyqtgraph's title row


class SwingPreview(pg.PlotWidget):
    """The pendulum to scale, animated at true speed or slowed, with its sweep envelope.

    Signals
    -------
    playingChanged(bool), speedChanged(float), clearanceChanged()
    """

    title = "Swing preview"
    slug = "swing_preview"

    playingChanged = QtCore.Signal(bool)
    speedChanged = QtCore.Signal(float)
    clearanceChanged = QtCore.Signal()

    def __init__(self, parent: QtWidgets.QWidget | None = None,
                 clock: TimeSource | None = None) -> None:
        """``clock``: where the animation reads the time (default :class:`WallClock`)."""
        super().__init__(parent=parent, background=BACKGROUND)
        self._result: Any = None
        self._drawing: _Drawing | None = None
        self._ghost: _Drawing | None = None
        self._clock: _MotionClock | None = None
        self._ghost_clock: _MotionClock | None = None
        self._deepest_m = 0.0
        self._time_s = 0.0
        self._speed = 1.0
        self._playing = False
        self._wall_clock: TimeSource = clock if clock is not None else WallClock()
        # While playing, the swing time shown is _anchor_time_s + speed × (now − _anchor_wall_s)
        self._anchor_wall_s = 0.0
        self._anchor_time_s = 0.0
        self._baseline: Any = None
        self._legend_names: tuple[str, ...] = ()
        self._shown_range: tuple[float, float, float, float] | None = None
        self._timer = QtCore.QTimer(self)
        self._timer.setTimerType(QtCore.Qt.TimerType.PreciseTimer)
        self._timer.setInterval(FRAME_INTERVAL_MS)
        self._timer.timeout.connect(self.draw_frame)
        # Results streaming in (a drag): the view holds still while the drawing fits it well
        # (as in the plots); framed exactly again once the stream stops.
        self._streaming = False
        self._stream_timer = QtCore.QTimer(self)
        self._stream_timer.setSingleShot(True)
        self._stream_timer.setInterval(STREAM_SETTLE_MS)
        self._stream_timer.timeout.connect(self._stream_ended)
        self._setup_axes()
        self._setup_envelope()
        self._setup_overlay()
        self._setup_clearance_line()
        self._setup_menu()

    # ------------------------------------------------------------------ set-up
    def _setup_axes(self) -> None:
        item = self.getPlotItem()
        item.setTitle(self.title, color=INK, size="10pt")
        item.setLabel("left", "Below pivot", units="m", color=INK)
        item.setLabel("bottom", "Across the swing", units="m", color=INK)
        for name in ("left", "bottom"):
            # Both axes stay in metres (no SI prefix): the drawing is to scale. Major ticks
            # only and opaque grid lines: the fast way to draw a grid (see ``style_axis``).
            style_axis(item.getAxis(name), color=INK)
        vb = item.getViewBox()
        vb.invertY(True)
        vb.setAspectLocked(True, ratio=1.0)
        vb.disableAutoRange()
        self._legend = item.addLegend(offset=(-10, 10), labelTextColor=INK,
                                      brush=pg.mkBrush(255, 255, 255, 210), pen=pg.mkPen("#bbbbbb"))

    def _setup_envelope(self) -> None:
        """The paths of the bob centre and of the lowest point, the rays to the bob centre's
        extreme positions and the pivot: made once, moved by each result."""
        vb = self.getPlotItem().getViewBox()
        dashed = QtCore.Qt.PenStyle.DashLine
        self._centre_arc = pg.PlotCurveItem(pen=pg.mkPen(CENTRE_PATH_COLOUR, width=2,
                                                         style=dashed))
        self._lowest_arc = pg.PlotCurveItem(pen=pg.mkPen(LOWEST_PATH_COLOUR, width=2,
                                                         style=dashed))
        ray_pen = pg.mkPen(CENTRE_PATH_COLOUR, width=1, style=QtCore.Qt.PenStyle.DotLine)
        self._rays = (pg.PlotCurveItem(pen=ray_pen), pg.PlotCurveItem(pen=ray_pen))
        for curve in (self._centre_arc, self._lowest_arc, *self._rays):
            vb.addItem(curve, ignoreBounds=True)
        self._pivot = _pivot_item()
        vb.addItem(self._pivot, ignoreBounds=True)

    def _setup_overlay(self) -> None:
        """Figures in a box fixed to the view's top-left corner; the load caution under the
        plot, wrapped to the plot's width, where it never hides the drawing."""
        item = self.getPlotItem()
        self._info = pg.TextItem(anchor=(0, 0), color=INK, fill=pg.mkBrush(255, 255, 255, 215),
                                 border=pg.mkPen("#bbbbbb"))
        self._info.setParentItem(item.getViewBox())
        self._info.setPos(8, 8)
        self._info.setZValue(20)
        self._info_html = ""
        self._compact_shown = False
        self._caution = pg.LabelItem("", justify="left", color="#7a4b00", size="8pt")
        item.layout.addItem(self._caution, 5, 0, 1, 5)
        self._wrap_caution()

    def _setup_clearance_line(self) -> None:
        self._line = pg.InfiniteLine(pos=1.0, angle=0, movable=True, pen=_pen(LINE_COLOUR, 2.0),
                                     hoverPen=_pen(LINE_COLOUR, 3.0))
        self._line_label = pg.InfLineLabel(self._line, text="", position=0.7,
                                           anchors=[(0.5, 1), (0.5, 1)], color=LINE_COLOUR,
                                           fill=pg.mkBrush(255, 255, 255, 220))
        self._line.setZValue(15)
        self._line.sigPositionChanged.connect(self._on_line_moved)
        self._line.setVisible(False)
        self.getPlotItem().getViewBox().addItem(self._line, ignoreBounds=True)

    def _setup_menu(self) -> None:
        """Play/pause and speed in the view's context menu."""
        menu = self.getPlotItem().getViewBox().menu
        menu.addSeparator()
        self._play_action = menu.addAction("Play swing")
        self._play_action.setCheckable(True)
        self._play_action.toggled.connect(self.set_playing)
        speed_menu = menu.addMenu("Swing speed")
        group = QtGui.QActionGroup(self)
        self._speed_actions: dict[float, QtGui.QAction] = {}
        for factor in SPEEDS:
            action = speed_menu.addAction(SPEED_LABELS[factor])
            action.setCheckable(True)
            action.setChecked(factor == self._speed)
            action.triggered.connect(lambda _=False, f=factor: self.set_speed(f))
            group.addAction(action)
            self._speed_actions[factor] = action

    # ------------------------------------------------------------------ public API
    def show_result(self, result: Any, baseline: Any = None) -> None:
        """Draw ``result`` (a ``core.Result``) to scale; ``baseline`` as a grey ghost.

        The items are made once and moved to each new result; they are made again only when
        the set of parts (names, kinds, shapes) changes.
        """
        visible = self.isVisible()
        fresh = result is not self._result
        self._streaming = visible and fresh and self._stream_timer.isActive()
        if visible and fresh:
            self._stream_timer.start()
        self._result = result
        outlines = outlines_from_bodies(result.bodies)
        self._clock = _MotionClock(result)
        self._deepest_m = max(deepest_point_m(outlines, self._clock.amplitude_rad),
                              float(result.exhibit.lowest_point_m))
        self._drawing = self._placed(self._drawing, outlines, ghost=False)
        if baseline is None:
            if self._ghost is not None:
                self.getPlotItem().getViewBox().removeItem(self._ghost.group)
            self._ghost = self._ghost_clock = None
        elif baseline is not self._baseline or self._ghost is None:
            self._ghost = self._placed(self._ghost, outlines_from_bodies(baseline.bodies),
                                       ghost=True)
            self._ghost_clock = _MotionClock(baseline)
        self._baseline = baseline
        self._update_envelope(result, outlines)
        self._update_info()
        self._fit_view()
        self._apply_time()
        self._on_line_moved()
        if self.isVisible():  # the view's transform now, not at the next paint (see plots)
            self.getPlotItem().getViewBox().prepareForPaint()

    def set_playing(self, playing: bool) -> None:
        """Start or stop the animation (the timer runs only while playing)."""
        playing = bool(playing) and self._clock is not None
        if playing == self._playing:
            return
        if playing:
            self._anchor()
            self._playing = True
            self._timer.start()
        else:
            self._catch_up()  # pause where the swing truly is now
            self._playing = False
            self._timer.stop()
        self._play_action.blockSignals(True)
        self._play_action.setChecked(playing)
        self._play_action.blockSignals(False)
        self._update_info()
        self.playingChanged.emit(playing)

    def is_playing(self) -> bool:
        """True while the animation timer runs."""
        return self._playing and self._timer.isActive()

    @property
    def speed(self) -> float:
        """Playback speed factor: 1.0 is true speed (one of ``SPEEDS``)."""
        return self._speed

    def set_speed(self, factor: float) -> None:
        """Set the playback speed factor; it must be one of ``SPEEDS``."""
        if factor not in SPEEDS:
            raise ValueError(f"speed={factor!r} is not offered: choose one of {SPEEDS}")
        if factor == self._speed:
            return
        self._catch_up()  # the time so far at the old speed, from now on at the new one
        self._speed = factor
        self._speed_actions[factor].setChecked(True)
        self._update_info()
        self.speedChanged.emit(factor)

    @property
    def time_s(self) -> float:
        """Swing time shown by the last frame, s after release (while playing it runs at
        ``speed`` × the clock's time)."""
        return self._time_s

    def set_time(self, time_s: float) -> None:
        """Show the pendulum as it is ``time_s`` seconds after release from rest at θ₀ (while
        playing, the swing runs on from there)."""
        self._time_s = float(time_s)
        self._anchor()
        self._apply_time()

    def shown_angle_rad(self) -> float:
        """The angle the drawing currently shows, rad (positive: bob to the right)."""
        return 0.0 if self._drawing is None else self._drawing.angle_rad()

    def angle_at(self, time_s: float) -> float:
        """Exact angle (rad) of the shown design at ``time_s`` after release."""
        if self._clock is None:
            return 0.0
        return self._clock.angle_at(time_s)

    def set_clearance_line(self, depth_m: float | None) -> None:
        """Show a horizontal line (floor, barrier) ``depth_m`` metres below the pivot, or hide
        it with None."""
        if depth_m is None:
            self._line.setVisible(False)
        else:
            self._line.setVisible(True)
            self._line.setValue(float(depth_m))
        if self._drawing is not None:
            self._fit_view()
        self._on_line_moved()

    def clearance_line_m(self) -> float | None:
        """Depth of the clearance line below the pivot, m (None: no line)."""
        return float(self._line.value()) if self._line.isVisible() else None

    def clearance_m(self) -> float | None:
        """Clearance between the deepest point of the swing and the line, m (None: no line);
        zero or negative when the swing reaches the line."""
        depth = self.clearance_line_m()
        return None if depth is None or self._result is None else depth - self._deepest_m

    def deepest_point_m(self) -> float:
        """Deepest point (m below the pivot) reached by the drawn pendulum over the swing."""
        return self._deepest_m

    def drawn_extents(self) -> dict[str, tuple[float, float, float]]:
        """Each drawn part's (top, bottom, width) in metres, as drawn at rest (unrotated)."""
        if self._drawing is None:
            return {}
        out = {}
        for name, item in self._drawing.items.items():
            if item.flags() & QtWidgets.QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations:
                z = float(item.pos().y())
                out[name] = (z, z, 0.0)
            else:
                r = item.rect()  # type: ignore[attr-defined]
                out[name] = (float(r.top()), float(r.bottom()), float(r.width()))
        return out

    def drawn_shape(self, name: str) -> str:
        """How part ``name`` is drawn: "circle", "rectangle" or "point"."""
        assert self._drawing is not None
        item = self._drawing.items[name]
        if item.flags() & QtWidgets.QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations:
            return "point"
        return "circle" if isinstance(item, QtWidgets.QGraphicsEllipseItem) else "rectangle"

    @property
    def shows_baseline(self) -> bool:
        """True while a pinned baseline is drawn as a grey ghost."""
        return self._ghost is not None

    def info_text(self) -> str:
        """The figures box as plain text (design name, swing, speed, peak load)."""
        return self._info.textItem.toPlainText()

    def caution_text(self) -> str:
        """The caution printed under the drawing (the load caution), as plain text."""
        doc = QtGui.QTextDocument()
        doc.setHtml(self._caution.text)
        return doc.toPlainText().replace("\n", " ").replace("\u2029", " ")

    def drawn_point(self, name: str) -> tuple[float, float]:
        """Where the centre of part ``name`` is drawn now, (across, below pivot) in metres."""
        assert self._drawing is not None
        o = self._drawing.outlines[name]
        p = self._drawing.group.mapToParent(QtCore.QPointF(0.0, o.centre_m))
        return float(p.x()), float(p.y())

    # ------------------------------------------------------------------ drawing
    def _placed(self, drawing: _Drawing | None, outlines: tuple[Outline, ...],
                ghost: bool) -> _Drawing:
        """``drawing`` moved to ``outlines``, or a new drawing in its place when the set of
        parts has changed."""
        if drawing is not None and drawing.update(outlines):
            return drawing
        vb = self.getPlotItem().getViewBox()
        if drawing is not None:
            vb.removeItem(drawing.group)
        new = _Drawing(outlines, ghost=ghost)
        new.group.setZValue(-5 if ghost else 0)
        vb.addItem(new.group, ignoreBounds=True)
        return new

    def _update_envelope(self, result: Any, outlines: tuple[Outline, ...]) -> None:
        """Arcs traced at ±θ₀ by the bob centre and by the deepest point; radial lines to the
        bob centre's extreme positions."""
        theta0 = math.radians(float(result.amplitude_deg))
        phi = np.linspace(-theta0, theta0, 181)
        sin_phi, cos_phi = np.sin(phi), np.cos(phi)
        bob = next((o for o in outlines if o.kind == "bob"), None)
        self._lowest_arc.setData(self._deepest_m * sin_phi, self._deepest_m * cos_phi)
        if bob is None:
            self._centre_arc.setData([], [])
            for ray in self._rays:
                ray.setData([], [])
        else:
            r = bob.centre_m
            self._centre_arc.setData(r * sin_phi, r * cos_phi)
            for side, ray in zip((-1.0, 1.0), self._rays):
                ray.setData([0.0, side * r * math.sin(theta0)], [0.0, r * math.cos(theta0)])
        names = (("Path of bob centre",) if bob is not None else ()) + ("Path of lowest point",)
        if names != self._legend_names:
            self._legend_names = names
            self._legend.clear()
            if bob is not None:
                self._legend.addItem(self._centre_arc, names[0])
            self._legend.addItem(self._lowest_arc, names[-1])

    def _fit_view(self) -> None:
        """Show the whole pendulum, its sweep and the clearance line, to scale."""
        assert self._drawing is not None and self._clock is not None
        outlines = list(self._drawing.outlines.values())
        theta0 = min(self._clock.amplitude_rad, math.pi / 2)
        half_width = max([0.5 * o.width_m for o in outlines] + [0.01])
        reach = self._deepest_m * math.sin(theta0) + half_width
        top = min([o.top_m for o in outlines] + [0.0])
        if self._clock.amplitude_rad > math.pi / 2:
            top = min(top, -self._deepest_m * math.sin(self._clock.amplitude_rad - math.pi / 2))
        bottom = max(self._deepest_m, self.clearance_line_m() or 0.0)
        span = max(bottom - top, 2 * reach, 0.05)
        shown = (-reach - 0.04 * span, reach + 0.04 * span, top - 0.06 * span,
                 bottom + 0.05 * span)
        if shown == self._shown_range:
            return
        if self._streaming:
            (x0, x1), (y0, y1) = self.getPlotItem().getViewBox().viewRange()
            inside = x0 <= shown[0] and shown[1] <= x1 and y0 <= shown[2] and shown[3] <= y1
            fills = (shown[1] - shown[0] >= KEEP_FILL * (x1 - x0)
                     or shown[3] - shown[2] >= KEEP_FILL * (y1 - y0))
            if inside and fills:
                return
            mx, my = DRAG_MARGIN * (shown[1] - shown[0]), DRAG_MARGIN * (shown[3] - shown[2])
            shown = (shown[0] - mx, shown[1] + mx, shown[2] - my, shown[3] + my)
        self._shown_range = shown
        self.getPlotItem().getViewBox().setRange(xRange=shown[:2], yRange=shown[2:],
                                                 padding=0.0)

    @property
    def compact(self) -> bool:
        """True in a small pane: the figures box keeps two short lines and the legend of the
        paths is hidden, so neither covers the drawing."""
        return self.width() < COMPACT_WIDTH_PX

    def _update_info(self) -> None:
        if self._result is None:
            return
        r, e = self._result, self._result.exhibit
        self._legend.setVisible(not self.compact)
        if self.compact:
            lines = [f"±{r.amplitude_deg:.3g}° · period {r.period_s:.4f} s",
                     f"Peak pivot load {r.max_pivot_load_n:.4g} N (ideal)"]
            if self._ghost is not None:
                lines.append("Grey: pinned baseline")
            self._set_info(f"<div style='font-size:8pt'>{'<br>'.join(lines)}</div>")
            self._set_caution(r)
            return
        lines = [f"<b>{_escape(r.design.name)}</b>",
                 f"Semi-arc ±{r.amplitude_deg:.3g}° · period {r.period_s:.4f} s",
                 f"Deepest point {self._deepest_m:.3f} m below pivot"]
        if e.sweep_width_m is not None and r.peak_speed_m_s is not None:
            lines.append(f"Bob centre sweep {e.sweep_width_m:.3f} m · "
                         f"peak speed {r.peak_speed_m_s:.3f} m/s")
        lines.append(f"Peak pivot load {r.max_pivot_load_n:.4g} N (ideal, no safety factor)")
        state = "playing" if self._playing else "paused"
        lines.append(f"Animation {state} at {SPEED_LABELS[self._speed]}"
                     + (" · grey: pinned baseline" if self._ghost is not None else ""))
        self._set_info(f"<div style='font-size:9pt'>{'<br>'.join(lines)}</div>")
        self._set_caution(r)

    def _set_info(self, html: str) -> None:
        if html != self._info_html:
            self._info_html = html
            self._info.setHtml(html)

    def _set_caution(self, r: Any) -> None:
        cautions = [LOAD_CAUTION] + [c for c in r.cautions if c == SPRING_CAUTION]
        text = "<b>Caution.</b> " + "<br>".join(_escape(c) for c in cautions)
        if text != self._caution.text:
            self._caution.setText(text)

    def _stream_ended(self) -> None:
        self._streaming = False
        alive = not getattr(self, "closed", False) and self.__dict__.get("plotItem") is not None
        if self._drawing is not None and alive:
            self._fit_view()

    # ------------------------------------------------------------------ animation
    def draw_frame(self) -> None:
        """One animation frame (the frame timer calls this): pose the drawing at the swing
        time the clock says it is now. Does nothing while paused."""
        if not self._playing:
            return
        self._time_s = self._swing_time_now()
        self._apply_time()

    def _swing_time_now(self) -> float:
        """Swing time (s after release) at the clock's reading now, while playing."""
        elapsed = max(self._wall_clock.now_s() - self._anchor_wall_s, 0.0)
        return self._anchor_time_s + self._speed * elapsed

    def _anchor(self) -> None:
        """From now on, the swing time runs on from the one shown."""
        self._anchor_wall_s = self._wall_clock.now_s()
        self._anchor_time_s = self._time_s

    def _catch_up(self) -> None:
        """While the animation runs: bring the shown swing time up to the clock's now and
        anchor there (before a change of speed, a pause or hiding). While hidden the swing
        time holds, and nothing is caught up."""
        if not (self._playing and self._timer.isActive()):
            return
        self._time_s = self._swing_time_now()
        self._anchor()
        if not getattr(self, "closed", False) and self.__dict__.get("plotItem") is not None:
            self._apply_time()

    def advance(self, wall_s: float) -> None:
        """Step the swing on by ``speed`` × ``wall_s`` seconds (by hand, whether playing or
        not; a playing animation runs on from the new time)."""
        self._time_s += self._speed * max(float(wall_s), 0.0)
        self._anchor()
        self._apply_time()

    def _apply_time(self) -> None:
        if self._drawing is not None and self._clock is not None:
            self._drawing.set_angle(self._clock.angle_at(self._time_s))
        if self._ghost is not None and self._ghost_clock is not None:
            self._ghost.set_angle(self._ghost_clock.angle_at(self._time_s))

    def attach_controls(self) -> "SwingPreviewControls":
        """Put play/pause, speed and clearance-line controls in a strip over the title row
        (on screen only: the strip is not part of the scene, so exports keep the title)."""
        controls = SwingPreviewControls(self, parent=self)
        controls.setAutoFillBackground(True)
        palette = controls.palette()
        palette.setColor(controls.backgroundRole(), QtGui.QColor(BACKGROUND))
        controls.setPalette(palette)
        title = QtWidgets.QLabel(self.title)
        title.setStyleSheet(f"color: {INK}; font-size: 10pt;")
        controls.layout().insertWidget(0, title)
        controls.layout().insertSpacing(1, 12)
        controls.show()
        self.controls = controls
        self._place_controls()
        return controls

    def _place_controls(self) -> None:
        controls = self.__dict__.get("controls")
        if controls is not None:
            controls.setGeometry(0, 0, self.width(), CONTROL_STRIP_PX)

    def resizeEvent(self, event: QtGui.QResizeEvent) -> None:  # noqa: N802 (Qt name)
        """Wrap the caution to the new width before the plot's layout is redone."""
        self._place_controls()
        # pyqtgraph resizes while the base is being built, and again while closing (its items
        # are deleted by then)
        if "_caution" in self.__dict__ and not getattr(self, "closed", False):
            compact = self.compact
            self._wrap_caution()
            super().resizeEvent(event)
            if compact != self._compact_shown:
                self._compact_shown = compact
                self._update_info()
            return
        super().resizeEvent(event)

    def _wrap_caution(self) -> None:
        """Let the caution wrap within the widget's width (it sets the plot's least width
        otherwise, and the preview could not share a small pane)."""
        width = float(max(self.width() - CAUTION_MARGIN_PX, CAUTION_MIN_WIDTH_PX))
        if abs(self._caution.item.textWidth() - width) > 0.5:
            self._caution.item.setTextWidth(width)
            self._caution.updateMin()

    def hideEvent(self, event: QtGui.QHideEvent) -> None:  # noqa: N802 (Qt name)
        """Stop the timer while hidden (the swing time holds); it resumes when shown if still
        playing."""
        self._catch_up()
        self._timer.stop()
        if self._stream_timer.isActive():  # in a stream: frame exactly now, not later
            self._stream_timer.stop()
            self._stream_ended()
        super().hideEvent(event)

    def showEvent(self, event: QtGui.QShowEvent) -> None:  # noqa: N802 (Qt name)
        super().showEvent(event)
        if self._playing and not self._timer.isActive():
            self._anchor()
            self._timer.start()

    # ------------------------------------------------------------------ clearance
    def _on_line_moved(self) -> None:
        clearance = self.clearance_m()
        if clearance is None:
            self.clearanceChanged.emit()
            return
        depth = self.clearance_line_m() or 0.0
        reached = clearance <= 0.0
        colour = WARNING_COLOUR if reached else LINE_COLOUR
        if reached:
            text = f"Line at {depth:.3f} m: the swing reaches it ({-clearance:.3f} m over)"
        else:
            text = f"Line at {depth:.3f} m · clearance {clearance:.3f} m"
        self._line.setPen(_pen(colour, 2.5 if reached else 2.0))
        self._line_label.setColor(colour)
        self._line_label.setFormat(text.replace("{", "{{").replace("}", "}}"))
        self._line_label.valueChanged()
        self.clearanceChanged.emit()

    def clearance_reached(self) -> bool:
        """True when a clearance line is shown and the swing reaches it."""
        c = self.clearance_m()
        return c is not None and c <= 0.0

    def clearance_colour(self) -> str:
        """Colour of the clearance line now (warning colour when reached), '#rrggbb'."""
        return self._line.pen.color().name()


def _escape(text: str) -> str:
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;")


class SwingPreviewControls(QtWidgets.QWidget):
    """Play/pause, speed and clearance-line controls for a :class:`SwingPreview`."""

    def __init__(self, preview: SwingPreview, parent: QtWidgets.QWidget | None = None) -> None:
        super().__init__(parent)
        self.preview = preview
        self.play_button = QtWidgets.QToolButton()
        self.play_button.setText("Play")
        self.play_button.setCheckable(True)
        self.speed_box = QtWidgets.QComboBox()
        for factor in SPEEDS:
            self.speed_box.addItem(SPEED_LABELS[factor], factor)
        self.line_check = QtWidgets.QCheckBox("Line below pivot")
        self.line_depth = QtWidgets.QDoubleSpinBox(suffix=" m", decimals=3, minimum=0.0,
                                                   maximum=1000.0, singleStep=0.05)
        self.line_depth.setEnabled(False)
        layout = QtWidgets.QHBoxLayout(self)
        layout.setContentsMargins(4, 2, 4, 2)
        for w in (self.play_button, QtWidgets.QLabel("Speed"), self.speed_box,
                  self.line_check, self.line_depth):
            layout.addWidget(w)
        layout.addStretch(1)
        self.play_button.toggled.connect(preview.set_playing)
        self.speed_box.currentIndexChanged.connect(
            lambda i: preview.set_speed(self.speed_box.itemData(i)))
        self.line_check.toggled.connect(self._on_line_toggled)
        self.line_depth.valueChanged.connect(self._on_depth_edited)
        preview.playingChanged.connect(self._on_playing_changed)
        preview.speedChanged.connect(self._on_speed_changed)
        preview.clearanceChanged.connect(self._on_clearance_changed)

    def _on_line_toggled(self, on: bool) -> None:
        self.line_depth.setEnabled(on)
        if on and self.line_depth.value() <= 0.0:
            self.line_depth.setValue(round(self.preview.deepest_point_m() + 0.5, 3))
        self.preview.set_clearance_line(self.line_depth.value() if on else None)

    def _on_depth_edited(self, value: float) -> None:
        if self.line_check.isChecked():
            self.preview.set_clearance_line(value)

    def _on_playing_changed(self, playing: bool) -> None:
        self.play_button.blockSignals(True)
        self.play_button.setChecked(playing)
        self.play_button.setText("Pause" if playing else "Play")
        self.play_button.blockSignals(False)

    def _on_speed_changed(self, factor: float) -> None:
        self.speed_box.blockSignals(True)
        self.speed_box.setCurrentIndex(SPEEDS.index(factor))
        self.speed_box.blockSignals(False)

    def _on_clearance_changed(self) -> None:
        depth = self.preview.clearance_line_m()
        if depth is not None and abs(depth - self.line_depth.value()) > 5e-4:
            self.line_depth.blockSignals(True)
            self.line_depth.setValue(depth)
            self.line_depth.blockSignals(False)
