"""The workbench plots: motion, phase plane and period curve, each a ``pyqtgraph.PlotWidget``.

Every plot has the same small API, used by the window and by the headless exporter alike:
``show_result(result, baseline=None)`` draws a :class:`core.Result` (and, faintly in grey, a
pinned baseline result), and the class attributes ``title`` and ``slug`` name it. Plot items
are created once and updated with ``setData``; curves are plain, non-antialiased
``PlotCurveItem`` objects (the fastest pyqtgraph draws). Nothing here computes physics: the
arrays come from the result and are only converted from radians to degrees.

A plot's own view choices (which quantity, which range) sit in a strip of small controls laid
over its title row; the strip is a widget, not part of the drawing, so exports show the title.

Each plot frames every new result (until the person pans or zooms). While results stream in
(a live drag) the axes hold still as long as the data fit them well, and are framed exactly
again once the stream stops: steadier to read, and an axis that changes must redraw its ticks.

:func:`export_plot` writes any plot to PNG or SVG with pyqtgraph's exporters.
"""

from __future__ import annotations

import math
from pathlib import Path
from typing import Any, Callable

import numpy as np
import pyqtgraph as pg
from pyqtgraph.exporters import ImageExporter, SVGExporter
from PySide6.QtCore import QPoint, QRectF, QSize, Qt, QTimer
from PySide6.QtGui import QAction, QColor, QPainter
from PySide6.QtWidgets import (QCheckBox, QComboBox, QFileDialog, QGraphicsEllipseItem,
                               QGraphicsItem, QHBoxLayout, QLabel, QWidget)

from app import theme

__all__ = ["MotionPlot", "PhasePlot", "PeriodCurvePlot", "PLOT_CLASSES", "export_plot",
           "style_axis", "PERIOD_QUANTITIES"]

EXPORT_SUFFIXES = (".png", ".svg")
EXPORT_MIN_WIDTH_PX = 1200
LEGEND_MARGIN_PX = 120  # room taken by the left and right axes, px
TITLE_ROW_PX = 30  # pyqtgraph's fixed title row; the control strip covers it
GRID_SHADE = 0.16  # grid lines: this far from the background towards the axis colour
SMALL_PANE_PX = 460  # narrower or lower than this, axes ask for fewer ticks
SMALL_PANE_TICK_DENSITY = 0.6
STREAM_SETTLE_MS = 300  # results closer together than this are a live drag
KEEP_FILL = 0.6  # while dragging, a view range is kept while the data fill this much of it
DRAG_MARGIN = 0.2  # ... and a new one leaves this share of the data's span free each side


def _pen(color: str, width: float = 1.0, style: Qt.PenStyle = Qt.PenStyle.SolidLine) -> Any:
    return pg.mkPen(color=color, width=width, style=style)


def _deg(values: Any) -> np.ndarray:
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
    axis.setPen(_pen(color))
    axis.setTextPen(_pen(color))
    axis.enableAutoSIPrefix(False)
    if grid:
        axis.setGrid(255)
        axis.setTickPen(pg.mkPen(_mix(background, color, GRID_SHADE)))
        axis.setZValue(-1)  # behind the view box and its curves (the axis text is outside it)
    else:
        axis.setGrid(False)
        axis.setTickPen(None)


class _ResultPlot(pg.PlotWidget):
    """What every plot shares: styling, legend below the axes, export actions, view following,
    and an optional strip of controls over the title row.

    Subclasses build their items in ``__init__`` and fill them in ``show_result``.
    """

    title: str = ""
    slug: str = ""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent=parent, background=theme.PLOT_BACKGROUND)
        self.setMinimumSize(QSize(240, 180))
        self.strip: QWidget | None = None
        self._tick_density = 1.0
        item = self.getPlotItem()
        item.setTitle(self.title, color=theme.INK, size="10pt")
        for name in ("left", "bottom"):
            style_axis(item.getAxis(name))
        style_axis(item.getAxis("right"), grid=False)
        self.legend = pg.LegendItem(colCount=4, brush=None, pen=None, verSpacing=-4,
                                    labelTextColor=theme.INK, labelTextSize="8pt")
        item.layout.addItem(self.legend, 4, 1)
        item.layout.setRowSpacing(3, 2)
        self.sceneObj.contextMenu = []  # our own export actions replace the generic dialog
        self._add_menu_actions(item.vb.menu)
        self._follow = True
        item.vb.sigRangeChangedManually.connect(self._stop_following)
        item.autoBtn.clicked.connect(self._start_following)
        # While results stream in (a drag), the axes hold still unless the data outgrow them
        # or shrink well inside them: steadier to read, and each axis change costs a redraw
        # of its ticks. Once the stream stops the view is framed exactly again.
        self._streaming = False
        self._last_shown: Any = None
        self._stream_timer = QTimer(self)
        self._stream_timer.setSingleShot(True)
        self._stream_timer.setInterval(STREAM_SETTLE_MS)
        self._stream_timer.timeout.connect(self._stream_ended)

    def _result_arrived(self, result: Any) -> None:
        """Call first in ``show_result``: notes whether new results are streaming in (the
        same result shown again, as for a baseline or an export, is not a stream)."""
        visible = self.isVisible()
        fresh = result is not self._last_shown
        self._last_shown = result
        self._streaming = visible and fresh and self._stream_timer.isActive()
        if visible and fresh:
            self._stream_timer.start()

    def _stream_ended(self) -> None:
        self._streaming = False
        alive = not getattr(self, "closed", False) and self.__dict__.get("plotItem") is not None
        if self._follow and alive:
            self._reframe()

    def hideEvent(self, event: Any) -> None:  # noqa: N802 (Qt override)
        """Hidden (another tab, or closing) in a stream: frame exactly now, not later."""
        if self._stream_timer.isActive():
            self._stream_timer.stop()
            self._stream_ended()
        super().hideEvent(event)

    def _show_range(self, view: pg.ViewBox, axis: int, lo: float, hi: float) -> None:
        """Show ``[lo, hi]`` on ``view``'s x (0) or y (1) axis; while results stream in,
        keep the current range as long as it frames ``[lo, hi]`` well."""
        if not (np.isfinite(lo) and np.isfinite(hi) and hi > lo):
            return
        if self._streaming:
            now_lo, now_hi = view.viewRange()[axis]
            if now_lo <= lo and hi <= now_hi and hi - lo >= KEEP_FILL * (now_hi - now_lo):
                return
            margin = DRAG_MARGIN * (hi - lo)
            lo, hi = lo - margin, hi + margin
        if axis == 0:
            view.setXRange(lo, hi, padding=0)
        else:
            view.setYRange(lo, hi, padding=0)

    def resizeEvent(self, event: Any) -> None:  # noqa: N802 (Qt override)
        """Fit the legend's columns and the tick density to the size; keep the control strip
        over the title row."""
        # pyqtgraph resizes once while its base is being built, and again while closing
        if "legend" in self.__dict__ and not getattr(self, "closed", False):
            self._fit_legend_columns()
            self._fit_tick_density()
            if self.strip is not None:
                self._fit_strip()
        super().resizeEvent(event)

    def _fit_strip(self) -> None:
        """Keep the control strip over the title row; drop its title when the controls need
        the room (the tab or the grid cell already says which plot it is)."""
        assert self.strip is not None
        self.strip.setGeometry(0, 0, self.width(), TITLE_ROW_PX)
        layout = self._strip_layout
        items = [layout.itemAt(i) for i in range(layout.count())]
        widgets = [item.widget() for item in items if item is not None]
        controls = sum(w.sizeHint().width() + layout.spacing() for w in widgets
                       if w is not None and w is not self.title_label)
        margins = layout.contentsMargins()
        room = self.width() - controls - margins.left() - margins.right() - layout.spacing()
        self.title_label.setVisible(self.title_label.sizeHint().width() <= room)

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

    # -------------------------------------------------------------- building blocks
    def _curve(self, color: str, width: float = 1.5, name: str | None = None, z: float = 0.0,
               view: pg.ViewBox | None = None) -> pg.PlotCurveItem:
        """A plain curve added once; later updated with ``setData``."""
        curve = pg.PlotCurveItem(pen=_pen(color, width), antialias=False)
        curve.setZValue(z)
        if view is None:
            self.getPlotItem().addItem(curve)
        else:
            view.addItem(curve)
        if name is not None:
            self.legend.addItem(curve, name)
        return curve

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

    def _control_strip(self) -> QHBoxLayout:
        """A strip over the title row holding the title (again, as a label) and this plot's
        controls; returns its layout for the subclass to fill. The strip is not part of the
        scene, so exports show the plot's own title instead."""
        strip = QWidget(self)
        strip.setObjectName("PlotControls")
        strip.setAutoFillBackground(True)
        palette = strip.palette()
        palette.setColor(strip.backgroundRole(), QColor(theme.PLOT_BACKGROUND))
        strip.setPalette(palette)
        layout = QHBoxLayout(strip)
        layout.setContentsMargins(6, 2, 6, 2)
        layout.setSpacing(8)
        self.title_label = QLabel(self.title)
        self.title_label.setStyleSheet(f"color: {theme.INK}; font-size: 10pt;")
        layout.addWidget(self.title_label)
        layout.addStretch(1)
        strip.show()
        self.strip = strip
        self._strip_layout = layout
        self._fit_strip()
        return layout

    def _set_title(self, text: str) -> None:
        """The title in the drawing (exports) and in the control strip (screen)."""
        self.getPlotItem().setTitle(text, color=theme.INK, size="10pt")
        if self.strip is not None:
            self.title_label.setText(text)
            self._fit_strip()

    def _add_menu_actions(self, menu: Any) -> None:
        menu.addSeparator()
        for suffix, text in ((".png", "Export PNG…"), (".svg", "Export SVG…")):
            action = QAction(text, menu)
            action.triggered.connect(self._export_action(suffix))
            menu.addAction(action)

    def _export_action(self, suffix: str) -> Callable[[], None]:
        def run() -> None:
            self.ask_export(suffix)
        return run

    def ask_export(self, suffix: str) -> Path | None:
        """Ask for a file name, then export this plot as ``suffix`` (".png" or ".svg")."""
        kind = "PNG image (*.png)" if suffix == ".png" else "SVG drawing (*.svg)"
        name, _ = QFileDialog.getSaveFileName(self, f"Export {self.title}",
                                              f"{self.slug}{suffix}", kind)
        if not name:
            return None
        path = Path(name)
        if path.suffix.lower() != suffix:
            path = path.with_name(path.name + suffix)
        export_plot(self, path)
        return path

    # -------------------------------------------------------------- view following
    def _stop_following(self, *_args: Any) -> None:
        self._follow = False

    def _start_following(self) -> None:
        self._follow = True
        self._reframe()

    def _reframe(self) -> None:
        """Frame the last result again (plots that frame themselves override this)."""

    def _settle(self) -> None:
        """Bring the view boxes' transforms up to date now.

        pyqtgraph defers them to the start of the next paint; changing them there marks every
        curve dirty again, and Qt paints the plot a second time straight after. Settling them
        here, once the new data and ranges are set, makes one paint per result.
        """
        if not self.isVisible():
            return
        views = [self.getPlotItem().vb] + [v for v in self.getPlotItem().scene().items()
                                            if isinstance(v, pg.ViewBox)]
        for view in views:
            view.prepareForPaint()

    @property
    def follows_result(self) -> bool:
        """True while the view frames each new result (until the person pans or zooms)."""
        return self._follow

    def show_result(self, result: Any, baseline: Any = None) -> None:  # pragma: no cover
        raise NotImplementedError


class MotionPlot(_ResultPlot):
    """Angle against time from release at the working semi-arc: exact and linearised, and
    their difference on the right axis (can be hidden)."""

    title = "Motion"
    slug = "motion"

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        item = self.getPlotItem()
        item.setLabel("bottom", "Time (s)")
        item.setLabel("left", "Angle (°)")
        self.ghost = self._curve(theme.GHOST, 2.0, None, z=-10)
        self.exact = self._curve(theme.EXACT, 2.0, "Exact", z=2)
        self.linear = self._curve(theme.LINEAR, 1.5, "Small-angle model", z=1)
        self.difference_view = self._right_view("Exact − small-angle (°)", theme.DIFFERENCE)
        self.difference = self._curve(theme.DIFFERENCE, 1.0, "Exact − small-angle",
                                      view=self.difference_view)
        self._ghost_named = False
        self._show_difference = True
        self._result: Any = None
        self._baseline: Any = None
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

    @property
    def shows_difference(self) -> bool:
        return self._show_difference

    def show_result(self, result: Any, baseline: Any = None) -> None:
        """Draw ``result.motion`` (angles in degrees against time in s)."""
        self._result_arrived(result)
        m = result.motion
        t = np.asarray(m.time_s, dtype=float)
        self.exact.setData(t, _deg(m.angle_rad))
        self.linear.setData(t, _deg(m.linear_angle_rad))
        self.difference.setData(t, _deg(m.difference_rad))
        _set_ghost(self, self.ghost, None if baseline is None else
                   (baseline.motion.time_s, _deg(baseline.motion.angle_rad)))
        self._result, self._baseline = result, baseline
        if self.follows_result:
            self._frame()
        self._settle()

    def _reframe(self) -> None:
        if self._result is not None:
            self._frame()
            self._settle()

    def _frame(self) -> None:
        """The whole time span; angles symmetric about zero, with a little room."""
        curves = [self.exact, self.linear] + ([self.ghost] if self._baseline is not None
                                              else [])
        spans = [(float(x[0]), float(x[-1]), _abs_max(y)) for x, y in
                 (c.getData() for c in curves) if x is not None and len(x) > 1]
        if not spans:
            return
        t_lo, t_hi = min(s[0] for s in spans), max(s[1] for s in spans)
        top = max(s[2] for s in spans)
        vb = self.getPlotItem().vb
        pad = 0.01 * (t_hi - t_lo)
        self._show_range(vb, 0, t_lo - pad, t_hi + pad)
        self._show_range(vb, 1, -1.06 * top, 1.06 * top)
        diff = _abs_max(self.difference.getData()[1]) or 1e-9  # none: a flat line at 0
        self._show_range(self.difference_view, 1, -1.1 * diff, 1.1 * diff)


class PhasePlot(_ResultPlot):
    """Angular velocity against angle: this swing's orbit, neighbouring semi-arcs, the
    separatrix and orbits going over the top.

    The view frames this swing and its neighbours; "Show separatrix" frames ±180° and the
    separatrix instead (a clock's ±2° orbit is then a small ellipse in the middle).
    """

    title = "Phase plane"
    slug = "phase"
    NEIGHBOUR_SLOTS = 8
    OVER_THE_TOP_SLOTS = 4

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        item = self.getPlotItem()
        item.setLabel("bottom", "Angle (°)")
        item.setLabel("left", "Angular velocity (°/s)")
        self.ghost = self._curve(theme.GHOST, 2.0, None, z=-10)
        self.current = self._curve(theme.EXACT, 2.5, "This swing", z=3)
        self.neighbours = [self._curve(theme.NEIGHBOUR, 1.0, "Other semi-arcs" if i == 0
                                       else None, z=1) for i in range(self.NEIGHBOUR_SLOTS)]
        self.separatrix = self._curve(theme.SEPARATRIX, 1.5, "Separatrix", z=2)
        self.over_the_top = [self._curve(theme.OVER_THE_TOP, 1.0, "Over the top" if i == 0
                                         else None, z=0) for i in range(self.OVER_THE_TOP_SLOTS)]
        self._ghost_named = False
        self._phase: Any = None
        self._show_separatrix = False
        strip = self._control_strip()
        self.separatrix_box = QCheckBox("Show separatrix")
        self.separatrix_box.setToolTip("Zoom out to ±180° to see the separatrix between "
                                       "swinging and going over the top")
        self.separatrix_box.toggled.connect(self.set_show_separatrix)
        strip.addWidget(self.separatrix_box)
        action = QAction("Show separatrix (±180°)", item.vb.menu)
        action.setCheckable(True)
        action.toggled.connect(self.set_show_separatrix)
        item.vb.menu.addAction(action)
        self.separatrix_action = action

    def set_show_separatrix(self, show: bool) -> None:
        """Frame ±180° and the separatrix (True) or this swing and its neighbours (False);
        the view follows each new result again."""
        self._show_separatrix = bool(show)
        for control in (self.separatrix_box, self.separatrix_action):
            if control.isChecked() != self._show_separatrix:
                control.blockSignals(True)
                control.setChecked(self._show_separatrix)
                control.blockSignals(False)
        self._follow = True
        self._reframe()

    @property
    def shows_separatrix(self) -> bool:
        """True while the view is zoomed out to the separatrix."""
        return self._show_separatrix

    def show_result(self, result: Any, baseline: Any = None) -> None:
        """Draw ``result.phase`` in degrees and degrees per second."""
        self._result_arrived(result)
        phase = result.phase
        self._phase = phase
        self.current.setData(_deg(phase.current.angle_rad),
                             _deg(phase.current.angular_velocity_rad_s))
        _fill_slots(self.neighbours, phase.neighbours)
        if phase.separatrix is None:
            self.separatrix.setData([], [])
        else:
            self.separatrix.setData(_deg(phase.separatrix.angle_rad),
                                    _deg(phase.separatrix.angular_velocity_rad_s))
        _fill_slots(self.over_the_top, phase.rotating)
        _set_ghost(self, self.ghost, None if baseline is None else
                   (_deg(baseline.phase.current.angle_rad),
                    _deg(baseline.phase.current.angular_velocity_rad_s)))
        if self.follows_result:
            self._frame(phase)
        self._settle()

    def _reframe(self) -> None:
        if self._phase is not None:
            self._frame(self._phase)
            self._settle()

    def _frame(self, phase: Any) -> None:
        """Frame this swing and its neighbours, or ±180° and the separatrix."""
        orbits = (phase.current, *phase.neighbours)
        if self._show_separatrix:
            if phase.separatrix is not None:
                orbits = (*orbits, phase.separatrix)
            x = 180.0
        else:
            x = float(np.degrees(max(float(np.max(np.abs(o.angle_rad))) for o in orbits)))
        y = float(np.degrees(max(float(np.max(np.abs(o.angular_velocity_rad_s)))
                                 for o in orbits)))
        x, y = x * (1.0 if self._show_separatrix else 1.08), y * 1.08
        vb = self.getPlotItem().vb
        self._show_range(vb, 0, -x, x)
        self._show_range(vb, 1, -y, y)


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
X_PADDING = 0.02  # of the x span, each side
LABEL_RIGHT, LABEL_LEFT = (-0.04, 0.0), (1.04, 0.0)  # text anchors beside the marker line
NEAR_FACTOR = 4.0  # "near the working arc": up to this many times the working semi-arc
NEAR_MIN_DEG = 10.0
WHOLE_DEG = 180.0


class PeriodCurvePlot(_ResultPlot):
    """Exact period or circular error (the person's choice) against semi-arc, the working
    semi-arc marked on the curve and labelled with its values; x near the working arc or over
    the whole range to 180°."""

    title = "Period against semi-arc"
    slug = "period_curve"

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        item = self.getPlotItem()
        item.setLabel("bottom", "Semi-arc (°)")
        self.ghost = self._curve(theme.GHOST, 2.0, None, z=-10)
        # One curve per quantity; only the chosen one is shown (both hold the core's arrays).
        self.period = self._curve(theme.EXACT, 2.0, None, z=2)
        self.error = self._curve(theme.DIFFERENCE, 2.0, None, z=2)
        self.rate = self._curve(theme.EXACT, 2.0, None, z=2)
        self.marker = pg.InfiniteLine(angle=90, movable=False,
                                      pen=_pen(theme.MARKER, 1.0, Qt.PenStyle.DashLine))
        self.marker.setZValue(4)
        item.addItem(self.marker, ignoreBounds=True)
        self.dot = QGraphicsEllipseItem(-4.5, -4.5, 9.0, 9.0)
        self.dot.setFlag(QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations, True)
        self.dot.setPen(_pen(theme.MARKER, 1.5))
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
        self._ghost_named = False
        self._result: Any = None
        self._baseline: Any = None
        self._quantity = "period"
        self._x_range = "near"
        strip = self._control_strip()
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
        _select(self.quantity_box, self._quantity)
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
        _select(self.range_box, choice)
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
    def show_result(self, result: Any, baseline: Any = None) -> None:
        """Draw ``result.period_curve`` and mark ``result.amplitude_deg`` on it."""
        self._result_arrived(result)
        self._result, self._baseline = result, baseline
        curve = result.period_curve
        amps = np.asarray(curve.amplitude_deg, dtype=float)
        self.period.setData(amps, np.asarray(curve.period_s, dtype=float))
        self.error.setData(amps, np.asarray(curve.circular_error_s_per_day, dtype=float))
        self.rate.setData(amps, _rate_values(curve))
        amp = float(result.amplitude_deg)
        here = self._here(result)
        self.marker.setValue(amp)
        self.dot.setPos(amp, here)
        text = (f"{amp:.4g}°\n{result.period_s:.6f} s\n"
                f"{result.circular_error_s_per_day:.3f} s/day")
        self.marker_label.setFormat(text.replace("{", "{{").replace("}", "}}"))
        self.marker_label.valueChanged()
        _set_ghost(self, self.ghost, None if baseline is None else
                   (baseline.period_curve.amplitude_deg, self._values(baseline.period_curve)))
        if self.follows_result:
            self._frame(result)
        self._settle()

    def _values(self, curve: Any) -> np.ndarray:
        if self._quantity == "period":
            return np.asarray(curve.period_s, dtype=float)
        if self._quantity == "rate":
            return _rate_values(curve)
        return np.asarray(curve.circular_error_s_per_day, dtype=float)

    def _here(self, result: Any) -> float:
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

    def _frame(self, result: Any) -> None:
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
        self._show_range(vb, 0, -X_PADDING * top, (1.0 + X_PADDING) * top)
        self._show_range(vb, 1, *_y_extent(self._values(curve)[seen]))
        side = LABEL_LEFT if result.amplitude_deg > 0.6 * top else LABEL_RIGHT
        self.marker_label.anchors = [side, side]
        self.marker_label.updatePosition()


def _rate_values(curve: Any) -> np.ndarray:
    """The curve's rate against the target (s/day), NaN throughout when there is no target."""
    if curve.rate_s_per_day is None:
        return np.full(np.shape(curve.amplitude_deg), np.nan)
    return np.asarray(curve.rate_s_per_day, dtype=float)


PLOT_CLASSES: tuple[type[_ResultPlot], ...] = (MotionPlot, PhasePlot, PeriodCurvePlot)


# ------------------------------------------------------------------ helpers
def _select(box: QComboBox, key: Any) -> None:
    """Show ``key``'s entry in ``box`` without emitting its change signal."""
    index = box.findData(key)
    if index >= 0 and index != box.currentIndex():
        box.blockSignals(True)
        box.setCurrentIndex(index)
        box.blockSignals(False)


def _abs_max(values: Any) -> float:
    """Largest finite magnitude in ``values`` (0 when there is none)."""
    if values is None:
        return 0.0
    a = np.abs(np.asarray(values, dtype=float))
    a = a[np.isfinite(a)]
    return float(a.max()) if a.size else 0.0


def _y_extent(values: np.ndarray) -> tuple[float, float]:
    """The finite values' range with 6 % to spare each side (NaNs when there are none)."""
    finite = values[np.isfinite(values)]
    if finite.size == 0:
        return math.nan, math.nan
    lo, hi = float(finite.min()), float(finite.max())
    span = hi - lo
    pad = span * 0.06 if span > 0 else max(abs(hi) * 1e-6, 1e-9)
    return lo - pad, hi + pad


def _fill_slots(slots: list[pg.PlotCurveItem], orbits: Any) -> None:
    """Put each orbit into its preallocated curve; empty the slots left over."""
    for i, curve in enumerate(slots):
        if i < len(orbits):
            curve.setData(_deg(orbits[i].angle_rad), _deg(orbits[i].angular_velocity_rad_s))
        else:
            curve.setData([], [])


def _set_ghost(plot: Any, curve: pg.PlotCurveItem, data: tuple[Any, Any] | None) -> None:
    """Show the baseline's curve in grey, or hide it; its legend entry follows."""
    if data is None:
        curve.setData([], [])
        if plot._ghost_named:
            plot.legend.removeItem(curve)
            plot._ghost_named = False
        return
    curve.setData(np.asarray(data[0], dtype=float), np.asarray(data[1], dtype=float))
    if not plot._ghost_named:
        plot.legend.addItem(curve, "Baseline")
        plot._ghost_named = True


# ------------------------------------------------------------------ export
def export_plot(widget: QWidget, path: str | Path) -> Path:
    """Write ``widget`` (a plot, or any widget with a ``plotItem``) to ``path``.

    The suffix chooses the format: ``.png`` through pyqtgraph's ``ImageExporter`` (at least
    1200 px wide), ``.svg`` through its ``SVGExporter`` or, where that fails, ``QSvgGenerator``.
    A widget without a plot item is drawn with ``QWidget.grab`` (PNG) or ``QSvgGenerator``
    (SVG). An SVG's view box is the plot's size in pixels and it is written at the screen's
    resolution, so its text, axes and curves keep the positions they have on screen.

    Raises
    ------
    ValueError
        For any other suffix.
    OSError
        When the file cannot be written.
    """
    target = Path(path)
    suffix = target.suffix.lower()
    if suffix not in EXPORT_SUFFIXES:
        raise ValueError(f"cannot export {target.name}: use a .png or .svg file name")
    item = getattr(widget, "plotItem", None)
    if item is None:
        _export_plain_widget(widget, target, suffix)
    elif suffix == ".png":
        exporter = ImageExporter(item)
        width = max(int(item.sceneBoundingRect().width()), EXPORT_MIN_WIDTH_PX)
        exporter.parameters()["width"] = width
        exporter.parameters()["antialias"] = True
        exporter.export(str(target))
    else:
        _export_svg(item, target)
    if not target.exists():
        raise OSError(f"could not write {target}")
    return target


def _export_svg(item: Any, target: Path) -> None:
    """SVG through pyqtgraph's ``SVGExporter``; where it cannot parse the closed paths that
    newer Qt writes (pyqtgraph issue #3495) the same scene area is drawn through
    ``QSvgGenerator`` instead, still as vectors."""
    # Each wide curve as one polyline, not one element per segment (pyqtgraph draws wide pens
    # segment by segment on screen, which is faster there but bloats an SVG and shows joins).
    curves = [c for c in item.scene().items() if isinstance(c, pg.PlotCurveItem)]
    modes = [c.opts["segmentedLineMode"] for c in curves]
    for curve in curves:
        curve.setSegmentedLineMode("off")
    try:
        _export_svg_drawing(item, target)
    finally:
        for curve, mode in zip(curves, modes):
            curve.setSegmentedLineMode(mode)


def _export_svg_drawing(item: Any, target: Path) -> None:
    try:
        SVGExporter(item).export(str(target))
        return
    except ValueError:
        pass
    from PySide6.QtSvg import QSvgGenerator

    source = item.sceneBoundingRect()
    generator = QSvgGenerator()
    generator.setFileName(str(target))
    generator.setResolution(_widget_dpi(item))
    generator.setSize(source.size().toSize())
    generator.setViewBox(QRectF(0.0, 0.0, source.width(), source.height()))
    generator.setTitle(getattr(item, "titleLabel", None) and item.titleLabel.text or "plot")
    painter = QPainter(generator)
    try:
        item.scene().render(painter, QRectF(0.0, 0.0, source.width(), source.height()), source)
    finally:
        painter.end()


def _widget_dpi(source: Any) -> int:
    """The logical dots per inch of the screen ``source`` (a widget, or a plot item through
    its scene's view) is drawn on.

    ``QSvgGenerator`` assumes 72 dpi unless told; axis text and ticks drawn at the screen's
    resolution (pyqtgraph records them as ``QPicture``s) would then be scaled by 72/96 and part
    from the curves. Writing at the screen's own resolution keeps one coordinate frame.
    """
    widget = source if isinstance(source, QWidget) else None
    if widget is None:
        scene = source.scene() if hasattr(source, "scene") else None
        views = scene.views() if scene is not None else []
        widget = views[0] if views else None
    dpi = widget.logicalDpiX() if widget is not None else 0
    return int(dpi) if dpi > 0 else 96


def _export_plain_widget(widget: QWidget, target: Path, suffix: str) -> None:
    if suffix == ".png":
        if not widget.grab().save(str(target), "PNG"):
            raise OSError(f"could not write {target}")
        return
    from PySide6.QtSvg import QSvgGenerator

    generator = QSvgGenerator()
    generator.setFileName(str(target))
    generator.setResolution(_widget_dpi(widget))
    generator.setSize(widget.size())
    generator.setViewBox(widget.rect())
    generator.setTitle(getattr(widget, "title", "Penduline plot"))
    painter = QPainter(generator)
    try:
        widget.render(painter, QPoint())  # PySide6 needs the offset with a painter
    finally:
        painter.end()
