"""The workbench plots: motion, phase plane and period curve, each a ``pyqtgraph.PlotWidget``.

Every plot has the same small API, used by the window and by the headless exporter alike:
``show_result(result, baseline=None)`` draws a :class:`core.Result` (and, faintly in grey, a
pinned baseline result), and the class attributes ``title`` and ``slug`` name it. Plot items
are created once and updated with ``setData``; curves are plain, non-antialiased
``PlotCurveItem`` objects (the fastest pyqtgraph draws). Nothing here computes physics: the
arrays come from the result and are only converted from radians to degrees.

:func:`export_plot` writes any plot to PNG or SVG with pyqtgraph's exporters.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any, Callable

import numpy as np
import pyqtgraph as pg
from pyqtgraph.exporters import ImageExporter, SVGExporter
from PySide6.QtCore import QRectF, QSize, Qt
from PySide6.QtGui import QAction, QPainter
from PySide6.QtWidgets import QFileDialog, QWidget

from . import theme

__all__ = ["MotionPlot", "PhasePlot", "PeriodCurvePlot", "PLOT_CLASSES", "export_plot"]

EXPORT_SUFFIXES = (".png", ".svg")
EXPORT_MIN_WIDTH_PX = 1200
LEGEND_MARGIN_PX = 120  # room taken by the left and right axes, px


def _pen(color: str, width: float = 1.0, style: Qt.PenStyle = Qt.PenStyle.SolidLine) -> Any:
    return pg.mkPen(color=color, width=width, style=style)


def _deg(values: Any) -> np.ndarray:
    """Radians → degrees (a unit conversion only)."""
    return np.degrees(np.asarray(values, dtype=float))


class _ResultPlot(pg.PlotWidget):
    """What every plot shares: styling, legend below the axes, export actions, view following.

    Subclasses build their items in ``_build`` and fill them in ``show_result``.
    """

    title: str = ""
    slug: str = ""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent=parent, background=theme.PLOT_BACKGROUND)
        self.setMinimumSize(QSize(240, 180))
        item = self.getPlotItem()
        item.setTitle(self.title, color=theme.INK, size="10pt")
        item.showGrid(x=True, y=True, alpha=0.16)
        for name in ("left", "bottom", "right"):
            axis = item.getAxis(name)
            axis.setStyle(maxTickLevel=0)  # grid at major ticks only: clearer and faster
            axis.setPen(_pen(theme.PLOT_FOREGROUND))
            axis.setTextPen(_pen(theme.PLOT_FOREGROUND))
            axis.enableAutoSIPrefix(False)
        self.legend = pg.LegendItem(colCount=4, brush=None, pen=None, verSpacing=-4,
                                    labelTextColor=theme.INK, labelTextSize="8pt")
        item.layout.addItem(self.legend, 4, 1)
        item.layout.setRowSpacing(3, 2)
        self.sceneObj.contextMenu = []  # our own export actions replace the generic dialog
        self._add_menu_actions(item.vb.menu)
        self._follow = True
        item.vb.sigRangeChangedManually.connect(self._stop_following)
        item.autoBtn.clicked.connect(self._start_following)

    def resizeEvent(self, event: Any) -> None:  # noqa: N802 (Qt override)
        """Fit the legend's columns to the width so no entry is cut off."""
        # pyqtgraph resizes once while its base is being built, and again while closing
        if "legend" in self.__dict__ and not getattr(self, "closed", False):
            self._fit_legend_columns()
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
        self.difference = self._curve(theme.DIFFERENCE, 1.0, "Difference (right axis)",
                                      view=self.difference_view)
        self._ghost_named = False
        self._show_difference = True
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
        m = result.motion
        t = np.asarray(m.time_s, dtype=float)
        self.exact.setData(t, _deg(m.angle_rad))
        self.linear.setData(t, _deg(m.linear_angle_rad))
        self.difference.setData(t, _deg(m.difference_rad))
        _set_ghost(self, self.ghost, None if baseline is None else
                   (baseline.motion.time_s, _deg(baseline.motion.angle_rad)))


class PhasePlot(_ResultPlot):
    """Angular velocity against angle: this swing's orbit, neighbouring semi-arcs, the
    separatrix and orbits going over the top."""

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

    def show_result(self, result: Any, baseline: Any = None) -> None:
        """Draw ``result.phase`` in degrees and degrees per second."""
        phase = result.phase
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

    def _frame(self, phase: Any) -> None:
        """Frame this swing and its neighbours (the separatrix may lie far outside)."""
        orbits = (phase.current, *phase.neighbours)
        x = max(float(np.max(np.abs(o.angle_rad))) for o in orbits)
        y = max(float(np.max(np.abs(o.angular_velocity_rad_s))) for o in orbits)
        x, y = np.degrees(x) * 1.08, np.degrees(y) * 1.08
        if x > 0 and y > 0:
            self.getPlotItem().vb.setRange(QRectF(-x, -y, 2 * x, 2 * y), padding=0)


class PeriodCurvePlot(_ResultPlot):
    """Exact period (left axis) and circular error (right axis) against semi-arc, with the
    working semi-arc marked."""

    title = "Period against semi-arc"
    slug = "period_curve"

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        item = self.getPlotItem()
        item.setLabel("bottom", "Semi-arc (°)")
        item.setLabel("left", "Period (s)")
        self.ghost = self._curve(theme.GHOST, 2.0, None, z=-10)
        self.period = self._curve(theme.EXACT, 2.0, "Period", z=2)
        self.error_view = self._right_view("Circular error (s/day)", theme.DIFFERENCE)
        self.error = self._curve(theme.DIFFERENCE, 1.5, "Circular error (right axis)",
                                 view=self.error_view)
        # The two curves nearly coincide (both grow as the square of the arc): dash the error
        # curve so both stay visible where they overlap.
        self.error.setPen(_pen(theme.DIFFERENCE, 1.5, Qt.PenStyle.DashLine))
        self.marker = pg.InfiniteLine(angle=90, movable=False,
                                      pen=_pen(theme.MARKER, 1.5, Qt.PenStyle.DashLine),
                                      label="{value:.3g}°",
                                      labelOpts={"position": 0.94, "color": theme.MARKER,
                                                 "anchors": [(0, 0), (0, 0)],
                                                 "fill": (252, 251, 248, 220)})
        self.marker.setZValue(5)
        item.addItem(self.marker, ignoreBounds=True)
        self._ghost_named = False

    def show_result(self, result: Any, baseline: Any = None) -> None:
        """Draw ``result.period_curve`` and mark ``result.amplitude_deg``."""
        curve = result.period_curve
        amps = np.asarray(curve.amplitude_deg, dtype=float)
        self.period.setData(amps, np.asarray(curve.period_s, dtype=float))
        self.error.setData(amps, np.asarray(curve.circular_error_s_per_day, dtype=float))
        self.marker.setValue(float(result.amplitude_deg))
        text = (f"{result.amplitude_deg:.4g}°: {result.period_s:.6f} s, "
                f"{result.circular_error_s_per_day:.2f} s/day")
        self.marker.label.setFormat(text.replace("{", "{{").replace("}", "}}"))
        _set_ghost(self, self.ghost, None if baseline is None else
                   (baseline.period_curve.amplitude_deg, baseline.period_curve.period_s))
        if self.follows_result:
            self._frame(result)

    def _frame(self, result: Any) -> None:
        """Show semi-arcs from 0 to a few times the working one; y follows what is visible."""
        top = float(min(179.9, max(4.0 * result.amplitude_deg, 10.0)))
        curve = result.period_curve
        amps = np.asarray(curve.amplitude_deg, dtype=float)
        seen = amps <= top
        if not np.any(seen):
            return
        vb = self.getPlotItem().vb
        vb.setXRange(0.0, top, padding=0.02)
        _fit_y(vb, np.asarray(curve.period_s, dtype=float)[seen])
        _fit_y(self.error_view, np.asarray(curve.circular_error_s_per_day, dtype=float)[seen])


PLOT_CLASSES: tuple[type[_ResultPlot], ...] = (MotionPlot, PhasePlot, PeriodCurvePlot)


# ------------------------------------------------------------------ helpers
def _fit_y(view: pg.ViewBox, values: np.ndarray) -> None:
    finite = values[np.isfinite(values)]
    if finite.size == 0:
        return
    lo, hi = float(finite.min()), float(finite.max())
    span = hi - lo
    pad = span * 0.06 if span > 0 else max(abs(hi) * 1e-6, 1e-9)
    view.setYRange(lo - pad, hi + pad, padding=0)


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
    1200 px wide), ``.svg`` through its ``SVGExporter``. A widget without a plot item is drawn
    with ``QWidget.grab`` (PNG) or ``QSvgGenerator`` (SVG).

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
    try:
        SVGExporter(item).export(str(target))
        return
    except ValueError:
        pass
    from PySide6.QtSvg import QSvgGenerator

    source = item.sceneBoundingRect()
    generator = QSvgGenerator()
    generator.setFileName(str(target))
    generator.setSize(source.size().toSize())
    generator.setViewBox(QRectF(0.0, 0.0, source.width(), source.height()))
    generator.setTitle(getattr(item, "titleLabel", None) and item.titleLabel.text or "plot")
    painter = QPainter(generator)
    try:
        item.scene().render(painter, QRectF(0.0, 0.0, source.width(), source.height()), source)
    finally:
        painter.end()


def _export_plain_widget(widget: QWidget, target: Path, suffix: str) -> None:
    if suffix == ".png":
        if not widget.grab().save(str(target), "PNG"):
            raise OSError(f"could not write {target}")
        return
    from PySide6.QtSvg import QSvgGenerator

    generator = QSvgGenerator()
    generator.setFileName(str(target))
    generator.setSize(widget.size())
    generator.setViewBox(widget.rect())
    generator.setTitle(getattr(widget, "title", "Penduline plot"))
    painter = QPainter(generator)
    try:
        widget.render(painter)
    finally:
        painter.end()
