"""Plan view: the exhibit seen from above, to scale — floor, barrier, swept area, the swing
plane now and after each of the next hours, and an optional ring of pins.

Every figure comes from the :class:`core.Result`: the outer reach and sweep of the body
(``result.geometry``), the barrier radius and pivot height (the design's ``exhibit`` section),
the signed turn of the swing plane (``result.exhibit.foucault_deg_per_hour``, positive
clockwise seen from above). Drawing a line turned by an angle, and dividing a pin's angle by
the turn rate to say when the plane reaches it, is presentation.

Coordinates: seen from above, x to the right and y up the page, in the chosen display unit
(metres or inches, :func:`app.form.units.readout_unit`). The swing starts along the page's
vertical; a clockwise turn by α draws the plane along (sin α, cos α).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from html import escape

import numpy as np
import pyqtgraph as pg
from PySide6 import QtCore, QtGui, QtWidgets

from app import theme
from app.form.units import UnitSystem, readout_unit
from app.views.axes import style_axis
from app.views.base import ResultView
from app.views.catalogue import from_card
from app.views.swing_drawing import cosmetic_pen
from core import Result

__all__ = ["PlanView", "PlaneLine", "pin_fall_hours", "DEFAULT_HOURS", "DEFAULT_PINS"]

DEFAULT_HOURS = 6
DEFAULT_PINS = 12
MAX_HOURS = 24
MAX_PINS = 36
INK = theme.INK
FLOOR_FILL = "#efe9dd"
FLOOR_EDGE = "#cfc5b1"
SWEPT_FILL = (31, 95, 153, 38)   # theme.EXACT, faint: the disc the turning plane sweeps
BAND_FILL = (31, 95, 153, 90)    # theme.EXACT: the band swept now
BARRIER_COLOUR = "#7a4b00"
HEADROOM_COLOUR = theme.PROBLEM
NOW_COLOUR = theme.EXACT
HOUR_COLOUR = theme.LINEAR
PIN_COLOUR = theme.DIFFERENCE


@dataclass(frozen=True)
class PlaneLine:
    """One swing-plane line as drawn: hours from now, and its angle clockwise from the page's
    vertical in degrees (read back from the drawn item)."""

    hours: float
    angle_deg: float


def pin_fall_hours(pin_angle_deg: float, turn_deg_per_hour: float) -> float | None:
    """Hours until a plane turning at ``turn_deg_per_hour`` (positive clockwise) first lies
    along a pin standing ``pin_angle_deg`` clockwise from the plane now (None: it never
    turns). The plane is a line, so it reaches the pin's angle modulo 180°."""
    if turn_deg_per_hour == 0.0:
        return None
    ahead = math.fmod(pin_angle_deg if turn_deg_per_hour > 0 else -pin_angle_deg, 180.0)
    if ahead <= 0.0:
        ahead += 180.0
    return ahead / abs(turn_deg_per_hour)


def _circle(radius: float, n: int = 241) -> tuple[np.ndarray, np.ndarray]:
    t = np.linspace(0.0, 2.0 * math.pi, n)
    return radius * np.sin(t), radius * np.cos(t)


@from_card("plan_view")
class PlanView(ResultView):
    """The exhibit from above (see the module notes)."""

    caption = ("The exhibit seen from above, to scale: floor, barrier, the area the body "
               "sweeps, the swing plane now and after each of the next hours, and the pins "
               "with the time until each falls.")
    follows_pan = False

    def __init__(self, parent: QtWidgets.QWidget | None = None) -> None:
        super().__init__(parent=parent)
        self._system = UnitSystem.METRIC
        self._hours = DEFAULT_HOURS
        self._pins = DEFAULT_PINS
        self.controls: QtWidgets.QWidget | None = None
        item = self.getPlotItem()
        vb = item.getViewBox()
        vb.setAspectLocked(True, ratio=1.0)
        vb.disableAutoRange()
        for name in ("left", "bottom"):
            style_axis(item.getAxis(name), color=INK)
        self._floor = QtWidgets.QGraphicsRectItem()
        self._floor.setPen(cosmetic_pen(FLOOR_EDGE, 1.0))
        self._floor.setBrush(pg.mkBrush(FLOOR_FILL))
        self._floor.setZValue(-20)
        vb.addItem(self._floor, ignoreBounds=True)
        self._swept = pg.PlotCurveItem(pen=cosmetic_pen(NOW_COLOUR, 1.0,
                                                        QtCore.Qt.PenStyle.DashLine),
                                       brush=pg.mkBrush(*SWEPT_FILL), fillLevel=None)
        self._swept.setZValue(-10)
        self._band = QtWidgets.QGraphicsPolygonItem()
        self._band.setPen(cosmetic_pen(NOW_COLOUR, 1.0))
        self._band.setBrush(pg.mkBrush(*BAND_FILL))
        self._band.setZValue(-5)
        self._barrier = pg.PlotCurveItem(pen=cosmetic_pen(BARRIER_COLOUR, 2.5))
        self._headroom = pg.PlotCurveItem(pen=cosmetic_pen(HEADROOM_COLOUR, 1.5,
                                                           QtCore.Qt.PenStyle.DotLine))
        self._now = pg.PlotCurveItem(pen=cosmetic_pen(NOW_COLOUR, 3.0))
        self._pins_item = pg.ScatterPlotItem(size=9, pen=pg.mkPen("#3d1f3a"),
                                             brush=pg.mkBrush(PIN_COLOUR), symbol="o")
        self._centre = pg.ScatterPlotItem([0.0], [0.0], size=7, pen=pg.mkPen(INK),
                                          brush=pg.mkBrush(INK), symbol="+")
        for it in (self._swept, self._band, self._barrier, self._headroom, self._now,
                   self._pins_item, self._centre):
            vb.addItem(it, ignoreBounds=True)
        self._hour_lines: list[tuple[float, pg.PlotCurveItem, pg.TextItem]] = []
        self._pin_labels: list[pg.TextItem] = []
        self._pin_hours: list[float | None] = []
        self._labels: dict[str, pg.TextItem] = {}
        for key, colour, anchor in (("now", NOW_COLOUR, (1.0, 0.5)),
                                    ("barrier", BARRIER_COLOUR, (0.5, 0.0)),
                                    ("floor", "#6b5d40", (1.0, 0.0))):
            label = pg.TextItem("", color=colour, anchor=anchor,
                                fill=pg.mkBrush(255, 255, 255, 200))
            label.setZValue(12)
            vb.addItem(label, ignoreBounds=True)
            self._labels[key] = label
        self._info = pg.TextItem(anchor=(0, 0), color=INK, fill=pg.mkBrush(255, 255, 255, 220),
                                 border=pg.mkPen("#bbbbbb"))
        self._info.setParentItem(vb)
        self._info.setPos(8, 8)
        self._info.setZValue(20)
        self._extent = 1.0

    # ------------------------------------------------------------------ public API
    def set_unit_system(self, system: UnitSystem) -> None:
        """Draw lengths in ``system``'s units (the file and the core stay SI)."""
        self._system = system
        if self._result is not None:
            self.show_result(self._result, self._baseline)

    def set_hours(self, hours: int) -> None:
        """Draw the swing plane after each of the next ``hours`` hours."""
        self._hours = max(0, min(MAX_HOURS, int(hours)))
        if self._result is not None:
            self._draw(self._result)

    def set_pins(self, count: int) -> None:
        """Stand ``count`` pins evenly round the edge of the swept area (0: none)."""
        self._pins = max(0, min(MAX_PINS, int(count)))
        if self._result is not None:
            self._draw(self._result)

    def plane_lines(self) -> list[PlaneLine]:
        """The drawn swing-plane lines (now first), their angles read from the items."""
        out = []
        for hours, curve, _label in [(0.0, self._now, None), *self._hour_lines]:
            x, y = curve.getData()
            if x is None or len(x) < 2:
                continue
            angle = math.degrees(math.atan2(float(x[-1]), float(y[-1])))
            out.append(PlaneLine(hours, angle))
        return out

    def barrier_radius(self) -> float | None:
        """Radius of the drawn barrier circle in display units (None: none drawn)."""
        x, y = self._barrier.getData()
        if x is None or len(x) == 0:
            return None
        return float(np.max(np.hypot(x, y)))

    def pin_hours(self) -> list[float | None]:
        """Hours until each drawn pin falls (None: the plane does not turn)."""
        return list(self._pin_hours)

    def info_text(self) -> str:
        """The figures box as plain text."""
        return self._info.textItem.toPlainText()

    def label_texts(self) -> list[str]:
        """Every label drawn on the plan, as plain text."""
        items = [*self._labels.values(), *(lbl for _h, _c, lbl in self._hour_lines),
                 *self._pin_labels]
        return [t.textItem.toPlainText() for t in items if t.isVisible()]

    def attach_controls(self) -> None:
        """Hours and pins spin boxes in the control bar (on screen only)."""
        if self.controls is not None:
            return
        strip = QtWidgets.QWidget(self)
        layout = QtWidgets.QHBoxLayout(strip)
        self.hours_box = QtWidgets.QSpinBox(minimum=0, maximum=MAX_HOURS, value=self._hours)
        self.hours_box.setSuffix(" h")
        self.hours_box.setToolTip("Draw the swing plane after each of the next hours")
        self.pins_box = QtWidgets.QSpinBox(minimum=0, maximum=MAX_PINS, value=self._pins)
        self.pins_box.setToolTip("Pins round the edge of the swept area (0: none)")
        for text, box in (("Hours ahead", self.hours_box), ("Pins", self.pins_box)):
            layout.addWidget(QtWidgets.QLabel(text))
            layout.addWidget(box)
        self.hours_box.valueChanged.connect(self.set_hours)
        self.pins_box.valueChanged.connect(self.set_pins)
        self.controls = strip
        self.control_bar(strip=strip)

    # ------------------------------------------------------------------ drawing
    def show_result(self, result: Result, baseline: Result | None = None) -> None:
        """Draw ``result``'s exhibit from above (the baseline is not drawn here)."""
        self._result_arrived(result, baseline)
        self._draw(result)

    def _draw(self, r: Result) -> None:
        unit = readout_unit("m", self._system)
        k, u = unit.scale, unit.text
        g = r.geometry
        reach = (g.outer_reach_m if g is not None else 0.0) * k
        ex = r.design.exhibit
        barrier = None if ex is None or ex.barrier_radius_m is None else ex.barrier_radius_m * k
        floor = None if ex is None else ex.pivot_above_floor_m
        turn = float(r.exhibit.foucault_deg_per_hour)
        self._extent = max(reach, barrier or 0.0, 1e-3) * 1.22
        e = self._extent
        item = self.getPlotItem()
        item.setLabel("bottom", "Across", units=u, color=INK)
        item.setLabel("left", "Along the first swing", units=u, color=INK)
        for name in ("left", "bottom"):
            item.getAxis(name).enableAutoSIPrefix(False)
        self._floor.setVisible(floor is not None)
        self._floor.setRect(QtCore.QRectF(-e, -e, 2 * e, 2 * e))
        self._swept.setData(*_circle(reach))
        width = max([b.width_m for b in r.bodies] + [0.0]) * k
        half = 0.5 * max(width, 0.004 * e)
        self._band.setPolygon(QtGui.QPolygonF([QtCore.QPointF(x, y) for x, y in
                                               ((-half, -reach), (half, -reach),
                                                (half, reach), (-half, reach))]))
        self._now.setData([0.0, 0.0], [-reach, reach])
        now = self._labels["now"]
        now.setAnchor((1.0, 0.5) if turn >= 0 else (0.0, 0.5))  # away from the turned lines
        self._place(now, f"now · sweep {2 * reach:.3g} {u}",
                    -half * 1.5 if turn >= 0 else half * 1.5, 0.5 * reach)
        if barrier is None:
            self._barrier.setData([], [])
            self._labels["barrier"].setVisible(False)
        else:
            self._barrier.setData(*_circle(barrier))
            margin = "" if g is None or g.barrier_margin_m is None else \
                f" · margin {g.barrier_margin_m * k:.3g} {u}"
            self._place(self._labels["barrier"], f"barrier r {barrier:.3g} {u}{margin}", 0.0,
                        -barrier)
        low = None if g is None else g.reach_below_headroom_m
        self._headroom.setData(*(_circle(low * k) if low is not None else ([], [])))
        if floor is None:
            self._labels["floor"].setVisible(False)
        else:
            clear = "" if g is None or g.floor_clearance_m is None else \
                f", clearance {g.floor_clearance_m * k:.3g} {u}"
            self._place(self._labels["floor"], f"floor {floor * k:.3g} {u} below pivot{clear}",
                        e, e)
        self._draw_hours(turn, reach)
        self._draw_pins(turn, reach)
        self._update_info(r, turn, u, k)
        vb = item.getViewBox()
        vb.setRange(xRange=(-e, e), yRange=(-e, e), padding=0.02)

    def _place(self, label: pg.TextItem, text: str, x: float, y: float) -> None:
        label.setText(text)
        label.setPos(x, y)
        label.setVisible(True)

    def _draw_hours(self, turn: float, reach: float) -> None:
        vb = self.getPlotItem().getViewBox()
        while len(self._hour_lines) > self._hours:
            _h, curve, label = self._hour_lines.pop()
            vb.removeItem(curve)
            vb.removeItem(label)
        while len(self._hour_lines) < self._hours:
            n = len(self._hour_lines) + 1
            share = 1.0 - 0.6 * (n - 1) / max(MAX_HOURS - 1, 1)
            pen = cosmetic_pen(HOUR_COLOUR, 1.6 * share + 0.4, QtCore.Qt.PenStyle.DashLine)
            curve = pg.PlotCurveItem(pen=pen)
            label = pg.TextItem("", color=HOUR_COLOUR, anchor=(0.5, 0.5),
                                fill=pg.mkBrush(255, 255, 255, 170))
            label.setZValue(11)
            vb.addItem(curve, ignoreBounds=True)
            vb.addItem(label, ignoreBounds=True)
            self._hour_lines.append((float(n), curve, label))
        for hours, curve, label in self._hour_lines:
            a = math.radians(turn * hours)
            dx, dy = math.sin(a), math.cos(a)
            curve.setData([-reach * dx, reach * dx], [-reach * dy, reach * dy])
            label.setText(f"+{hours:g} h")
            # inside the sweep (the pins' labels are outside), staggered so neighbours clear
            f = 0.86 if int(hours) % 2 else 0.68
            label.setPos(reach * dx * f, reach * dy * f)

    def _draw_pins(self, turn: float, reach: float) -> None:
        vb = self.getPlotItem().getViewBox()
        for label in self._pin_labels:
            vb.removeItem(label)
        self._pin_labels = []
        self._pin_hours = []
        if self._pins == 0 or reach <= 0.0:
            self._pins_item.setData([], [])
            return
        angles = [(i + 0.5) * 360.0 / self._pins for i in range(self._pins)]
        xs = [reach * math.sin(math.radians(a)) for a in angles]
        ys = [reach * math.cos(math.radians(a)) for a in angles]
        self._pins_item.setData(xs, ys)
        for a, x, y in zip(angles, xs, ys, strict=True):
            hours = pin_fall_hours(a, turn)
            self._pin_hours.append(hours)
            text = "never" if hours is None else f"{hours:.3g} h"
            ax, ay = math.sin(math.radians(a)), math.cos(math.radians(a))
            label = pg.TextItem(text, color=PIN_COLOUR, anchor=(0.5 - 0.5 * ax, 0.5 + 0.5 * ay))
            label.setPos(x * 1.04, y * 1.04)
            label.setZValue(11)
            vb.addItem(label, ignoreBounds=True)
            self._pin_labels.append(label)

    def _update_info(self, r: Result, turn: float, u: str, k: float) -> None:
        e = r.exhibit
        if turn == 0.0:
            way = "The swing plane does not turn at the equator"
        else:
            sense = "clockwise" if turn > 0 else "counter-clockwise"
            hours = "" if e.foucault_turn_h is None else f" · {e.foucault_turn_h:.4g} h per turn"
            way = f"Plane turns {sense} seen from above, {abs(turn):.3g}°/h{hours}"
        lines = [f"<b>{escape(r.design.name, quote=False)}</b>", escape(way)]
        g = r.geometry
        if g is not None:
            lines.append(f"Outer sweep {g.outer_sweep_m * k:.3g} {u} (body included)")
            if g.reach_below_headroom_m is not None:
                lines.append(f"Dotted red: passes under head height out to "
                             f"{g.reach_below_headroom_m * k:.3g} {u}")
        if self._pins:
            lines.append("Pins: hours until the plane reaches each")
        self._info.setHtml(f"<div style='font-size:9pt'>{'<br>'.join(lines)}</div>")

    def _reframe(self) -> None:
        e = self._extent
        self.getPlotItem().getViewBox().setRange(xRange=(-e, e), yRange=(-e, e), padding=0.02)
