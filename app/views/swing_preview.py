"""Swing preview: the pendulum drawn to scale (metres) and animated from the exact motion.

The drawing (:mod:`app.views.swing_drawing`) is one group of items per design, rotated about
the pivot by the animation (:mod:`app.views.swing_animation`) to the angle of the exact motion
``Result.motion`` at the current swing time; nothing is rebuilt per frame. A pinned baseline
is drawn as a grey ghost swinging beside it. The sweep envelope and the clearance line are
geometry of the drawn outlines; no physics is computed here.
"""

from __future__ import annotations

import math

import pyqtgraph as pg
from PySide6 import QtCore, QtGui, QtWidgets

from app import theme
from app.form.units import ReadoutUnit, UnitSystem, figure_text
from app.views.axes import drawing_unit, label_length_axes, style_axis
from app.views.base import DRAG_MARGIN, KEEP_FILL, ResultView
from app.views.catalogue import from_card
from app.views.pivot_marks import PivotMarks
from app.views.swing_animation import (
    SPEEDS,
    MotionClock,
    SwingAnimation,
    TimeSource,
    WallClock,
)
from app.views.swing_controls import SwingPreviewControls
from app.views.swing_drawing import (
    Drawing,
    Envelope,
    Outline,
    cosmetic_pen,
    outlines_from_bodies,
)
from app.views.swing_figures import caution_html, figures_html
from app.views.swing_site import LINE_COLOUR, WARNING_COLOUR, SiteMarks, clearance_line
from core import Result

__all__ = ["SwingPreview", "SwingPreviewControls", "Outline", "outlines_from_bodies",
           "SPEEDS", "TimeSource", "WallClock"]

CAUTION_MARGIN_PX = 24  # the caution wraps this much narrower than the widget
CAUTION_MIN_WIDTH_PX = 160
COMPACT_WIDTH_PX = 420  # narrower than this, the figures box is cut to two lines
INK = theme.INK
CENTRE_PATH_COLOUR = theme.EXACT
LOWEST_PATH_COLOUR = theme.LINEAR
NARROW_CONTROLS_PX = 520  # narrower than this, the control bar uses its short words
AXIS_WORDS = {"left": "Below pivot", "bottom": "Across the swing"}
SMOOTH_DRAWING = True  # antialiased drawing (benchmarks/gui_bench.py measures its cost)


@from_card("swing_preview")
class SwingPreview(ResultView, SwingAnimation):
    """The pendulum to scale, animated at true speed or slowed, with its sweep envelope.

    Signals
    -------
    playingChanged(bool), speedChanged(float), clearanceChanged()
    """

    caption = ("The pendulum to scale at release (full semi-arc), with the paths of the bob "
               "centre and of the lowest point over the swing.")
    follows_pan = False  # the drawing is framed whole for every result
    smooth_at_rest = SMOOTH_DRAWING

    playingChanged = QtCore.Signal(bool)
    speedChanged = QtCore.Signal(float)
    clearanceChanged = QtCore.Signal()

    def __init__(self, parent: QtWidgets.QWidget | None = None,
                 clock: TimeSource | None = None) -> None:
        """``clock``: where the animation reads the time (default :class:`WallClock`)."""
        super().__init__(parent=parent)
        self.controls: SwingPreviewControls | None = None
        self._system = UnitSystem.METRIC
        self._unit = ReadoutUnit("m")  # the axes' unit (the scene is drawn in metres)
        self._drawing: Drawing | None = None
        self._ghost: Drawing | None = None
        self._clock: MotionClock | None = None
        self._ghost_clock: MotionClock | None = None
        self._deepest_m = 0.0
        self._legend_names: tuple[str, ...] = ()
        self._shown_range: tuple[float, float, float, float] | None = None
        self._setup_animation(clock)
        self.setAntialiasing(SMOOTH_DRAWING)  # a rotated rod is stair-stepped without it
        self._setup_axes()
        self._envelope = Envelope(self.getPlotItem().getViewBox())
        self.marks = PivotMarks()
        self._setup_overlay()
        self._setup_clearance_line()
        self._site = SiteMarks(self.getPlotItem().getViewBox())

    # ------------------------------------------------------------------ set-up
    def _setup_axes(self) -> None:
        item = self.getPlotItem()
        for name in ("left", "bottom"):
            # Both axes in one length unit (no SI prefix): the drawing is to scale. Major
            # ticks only and opaque grid lines: the fast way to draw a grid (``style_axis``).
            style_axis(item.getAxis(name), color=INK)
        label_length_axes(item, AXIS_WORDS, self._unit, INK)
        vb = item.getViewBox()
        vb.invertY(True)
        vb.setAspectLocked(True, ratio=1.0)
        vb.disableAutoRange()

    def _setup_overlay(self) -> None:
        """The figures, the key to the paths and the load caution under the plot, wrapped to
        the plot's width: outside the drawing area, so they never hide the pivot, the bob or
        the release position."""
        item = self.getPlotItem()
        self._info = pg.LabelItem("", justify="left", color=INK, size="9pt")
        item.layout.addItem(self._info, 4, 0, 1, 5)
        self._info_html = ""
        self._compact_shown = False
        self._caution = pg.LabelItem("", justify="left", color="#7a4b00", size="8pt")
        item.layout.addItem(self._caution, 5, 0, 1, 5)
        self._wrap_caution()

    def _setup_clearance_line(self) -> None:
        self._line, self._line_label = clearance_line(self.getPlotItem().getViewBox())
        self._line.sigPositionChanged.connect(self._on_line_moved)

    # ------------------------------------------------------------------ public API
    def show_result(self, result: Result, baseline: Result | None = None) -> None:
        """Draw ``result`` (a ``core.Result``) to scale; ``baseline`` as a grey ghost.

        The items are made once and moved to each new result; they are made again only when
        the set of parts (names, kinds, shapes) changes.
        """
        old_baseline = self._baseline
        self._result_arrived(result, baseline)
        outlines = outlines_from_bodies(result.bodies)
        self._clock = MotionClock(result)
        geometry = result.geometry  # the core's deepest point and reach of the whole body
        self._deepest_m = float(geometry.lowest_point_m if geometry is not None
                                else result.exhibit.lowest_point_m)
        self._site.update(result, self._text)
        self._apply_unit()
        self._drawing = self._placed(self._drawing, outlines, ghost=False)
        self.marks.attach(self._drawing.group)
        self.marks.update(result)
        if baseline is None:
            if self._ghost is not None:
                self.getPlotItem().getViewBox().removeItem(self._ghost.group)
            self._ghost = self._ghost_clock = None
        elif baseline is not old_baseline or self._ghost is None:
            self._ghost = self._placed(self._ghost, outlines_from_bodies(baseline.bodies),
                                       ghost=True)
            self._ghost_clock = MotionClock(baseline)
        self._update_envelope(result, outlines)
        self._update_info()
        self._fit_view()
        self._apply_time()
        self._on_line_moved()
        if self.isVisible():  # the view's transform now, not at the next paint (see plots)
            self.getPlotItem().getViewBox().prepareForPaint()

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
        return {} if self._drawing is None else self._drawing.extents()

    def drawn_shape(self, name: str) -> str:
        """How part ``name`` is drawn: "circle", "rectangle" or "point"."""
        assert self._drawing is not None
        return self._drawing.shape_of(name)

    @property
    def shows_baseline(self) -> bool:
        """True while a pinned baseline is drawn as a grey ghost."""
        return self._ghost is not None

    def info_text(self) -> str:
        """The figures box as plain text (design name, swing, speed, peak load)."""
        return _plain(self._info.text)

    def caution_text(self) -> str:
        """The caution printed under the drawing (the load caution), as plain text."""
        return _plain(self._caution.text)

    def drawn_point(self, name: str) -> tuple[float, float]:
        """Where the centre of part ``name`` is drawn now, (across, below pivot) in metres."""
        assert self._drawing is not None
        return self._drawing.point_of(name)

    # ------------------------------------------------------------------ drawing
    def _placed(self, drawing: Drawing | None, outlines: tuple[Outline, ...],
                ghost: bool) -> Drawing:
        """``drawing`` moved to ``outlines``, or a new drawing in its place when the set of
        parts has changed."""
        if drawing is not None and drawing.update(outlines):
            return drawing
        vb = self.getPlotItem().getViewBox()
        if drawing is not None:
            self.marks.release(drawing.group)  # the old group's children go with it
            vb.removeItem(drawing.group)
        new = Drawing(outlines, ghost=ghost)
        new.group.setZValue(-5 if ghost else 0)
        vb.addItem(new.group, ignoreBounds=True)
        return new

    def _update_envelope(self, result: Result, outlines: tuple[Outline, ...]) -> None:
        """The paths over the swing, and their legend (the bob centre's only with a bob)."""
        bob = self._envelope.update(math.radians(float(result.amplitude_deg)), self._deepest_m,
                                    outlines, result.design.suspension.kind)
        self._legend_names = (("Path of bob centre",) if bob else ()) + ("Path of lowest point",)

    def _fit_view(self) -> None:
        """Show the whole pendulum, its sweep and the clearance line, to scale."""
        assert self._drawing is not None and self._clock is not None
        outlines = list(self._drawing.outlines.values())
        theta0 = min(self._clock.amplitude_rad, math.pi / 2)
        half_width = max([0.5 * o.width_m for o in outlines] + [0.01])
        reach = max(self._deepest_m * math.sin(theta0) + half_width, self._site.reach_m())
        top = min([o.top_m for o in outlines] + [0.0])
        if self._clock.amplitude_rad > math.pi / 2:
            top = min(top, -self._deepest_m * math.sin(self._clock.amplitude_rad - math.pi / 2))
        line = self.clearance_line_m()
        bottom = max(self._deepest_m, line or 0.0, self._site.floor_m())
        span = max(bottom - top, 2 * reach, 0.05)
        below = 0.12 if line is not None else 0.05  # room for the line's label under it
        shown = (-reach - 0.04 * span, reach + 0.04 * span, top - 0.08 * span,
                 bottom + below * span)
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
        self._fill_thin_parts()

    def _fill_thin_parts(self) -> None:
        """Outline, not fill, the rods thinner than a couple of pixels at this zoom."""
        vb = self.getPlotItem().getViewBox()
        (x0, x1), _ = vb.viewRange()
        width_px = max(float(vb.width()), 1.0)
        for drawing in (self._drawing, self._ghost):
            if drawing is not None:
                drawing.fill_thin_parts((x1 - x0) / width_px)

    @property
    def compact(self) -> bool:
        """True in a small pane: the figures under the drawing are cut to one short line."""
        return self.width() < COMPACT_WIDTH_PX

    def _update_info(self) -> None:
        """The figures under the drawing: what the design does, never the window's state
        (an export shows them as they are)."""
        if self._result is None:
            return
        r = self._result
        key = " · ".join(
            f"<span style='color:{colour}'>╌╌</span> {name.lower()}"
            for colour, name in zip((CENTRE_PATH_COLOUR, LOWEST_PATH_COLOUR)[-len(
                self._legend_names):], self._legend_names, strict=True))
        key += self.marks.key_html()
        ghost = " · grey: pinned baseline" if self._ghost is not None else ""
        self._set_info(figures_html(r, self._deepest_m, self._text, self.compact, key, ghost))
        self._set_caution(r)

    def _set_info(self, html: str) -> None:
        if html != self._info_html:
            self._info_html = html
            self._info.setText(html)

    def _set_caution(self, r: Result) -> None:
        text = caution_html(r)
        if text != self._caution.text:
            self._caution.setText(text)
            self._caution.setVisible(bool(text))

    def _reframe(self) -> None:
        if self._drawing is not None:
            self._fit_view()

    def pose_for_export(self) -> None:
        """Stop the animation and pose the pendulum at release (full semi-arc)."""
        self.set_playing(False)
        self.set_time(0.0)

    def attach_controls(self) -> None:
        """Put play/pause, speed and clearance-line controls in the control bar over the
        title row (on screen only: the bar is not part of the scene, so exports keep the
        title)."""
        if self.controls is not None:
            return
        self.controls = SwingPreviewControls(self, parent=self)
        self.controls.set_unit(self._unit)
        self.control_bar(leading=True, strip=self.controls)

    def _fit_strip(self) -> None:
        """Short control words in a narrow pane, so every control fits the bar."""
        if self.controls is not None:
            self.controls.set_narrow(self.width() < NARROW_CONTROLS_PX)
        super()._fit_strip()

    def resizeEvent(self, event: QtGui.QResizeEvent) -> None:  # Qt override
        """Wrap the caution to the new width before the plot's layout is redone."""
        # pyqtgraph resizes while the base is being built, and again while closing (its items
        # are deleted by then)
        if "_caution" in self.__dict__ and self._alive():
            compact = self.compact
            self._wrap_caution()
            super().resizeEvent(event)
            if self._drawing is not None:
                self._fill_thin_parts()
            if compact != self._compact_shown:
                self._compact_shown = compact
                self._update_info()
            return
        super().resizeEvent(event)

    def _wrap_caution(self) -> None:
        """Let the caution wrap within the widget's width (it sets the plot's least width
        otherwise, and the preview could not share a small pane)."""
        width = float(max(self.width() - CAUTION_MARGIN_PX, CAUTION_MIN_WIDTH_PX))
        for label in (self._info, self._caution):
            if abs(label.item.textWidth() - width) > 0.5:
                label.item.setTextWidth(width)
                label.updateMin()

    def close(self) -> bool:  # pyqtgraph's close clears the scene: no frame after it
        """Stop the animation, then close (the drawing's items go with the scene)."""
        self._timer.stop()
        self._playing = False
        return bool(super().close())

    def hideEvent(self, event: QtGui.QHideEvent) -> None:  # Qt override
        """Stop the timer while hidden (the swing time holds); it resumes when shown if still
        playing."""
        self._catch_up()
        self._timer.stop()
        super().hideEvent(event)  # in a stream: framed exactly now, not later

    def showEvent(self, event: QtGui.QShowEvent) -> None:  # Qt override
        super().showEvent(event)
        if self._playing and not self._timer.isActive():
            self._anchor()
            self._timer.start()

    # ------------------------------------------------------------------ units
    def set_unit_system(self, system: UnitSystem) -> None:
        """Give the figures box and the clearance line's label in ``system``'s units."""
        self._system = system
        self._apply_unit()
        if self._result is not None:
            self._site.update(self._result, self._text)
        self._update_info()
        self._on_line_moved()

    def axis_unit(self) -> ReadoutUnit:
        """The unit the axes (and the line's depth entry) are given in now."""
        return self._unit

    def _apply_unit(self) -> None:
        unit = drawing_unit(self._system, max(self._deepest_m, self.clearance_line_m() or 0.0))
        if unit != self._unit:
            self._unit = unit
            label_length_axes(self.getPlotItem(), AXIS_WORDS, unit, INK)
            if self.controls is not None:
                self.controls.set_unit(unit)

    def _text(self, si: float, unit: str) -> str:
        return figure_text(si, unit, self._system)

    # ------------------------------------------------------------------ clearance
    def _on_line_moved(self) -> None:
        clearance = self.clearance_m()
        if clearance is None:
            self.clearanceChanged.emit()
            return
        depth = self.clearance_line_m() or 0.0
        reached = clearance <= 0.0
        colour = WARNING_COLOUR if reached else LINE_COLOUR
        at, gap = self._text(depth, "m"), self._text(abs(clearance), "m")
        text = (f"Line at {at}: the swing reaches it ({gap} over)" if reached
                else f"Line at {at} · clearance {gap}")
        self._line.setPen(cosmetic_pen(colour, 2.5 if reached else 2.0))
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


def _plain(html: str) -> str:
    """Rich text as one line of plain text."""
    doc = QtGui.QTextDocument()
    doc.setHtml(html)
    return doc.toPlainText().replace("\n", " ").replace("\u2029", " ")
