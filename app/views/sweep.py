"""The sweep: period or rate against one field of the design, varied over a range.

Every number drawn comes from :func:`core.solve.sweep_field` (the core evaluates the design at
each value; where a value gives no usable design it returns NaN, drawn as a gap). The app only
chooses which field, over which range, and marks what the core returned: the current value,
and for the pivot sweep the value of least period.

A sweep costs the core about 0.1–0.2 ms per point, so it is computed only while the plot is on
view, only when the design or the sweep's own settings changed, and at most once per
``SWEEP_INTERVAL_MS`` however fast the design changes (the newest design is swept).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QSize, Qt, QTimer
from PySide6.QtGui import QAction
from PySide6.QtWidgets import (QComboBox, QDoubleSpinBox, QGraphicsEllipseItem, QGraphicsItem,
                               QGridLayout, QLabel, QPushButton, QVBoxLayout, QWidget)

from core import DesignError, design_to_dict
from core.fileformat import field_range
from core.solve import sweep_field

from app import theme
from app.form.design_panel import FIELD_LABELS
from app.views.base import export_plot, style_axis

__all__ = ["SweepPlot", "SweepField", "sweep_fields", "default_range", "PIVOT",
           "SWEEP_POINTS", "SWEEP_INTERVAL_MS"]

PIVOT = "pivot"  # core.solve.sweep_field's name for moving the pivot down the pendulum
SWEEP_POINTS = 101
SWEEP_INTERVAL_MS = 60
AROUND_FRACTION = 0.2  # default range: ±20 % around the current value
PIVOT_RANGE = (-0.1, 1.0)  # default pivot range, as fractions of the deepest rod end
QUANTITIES = (("period", "Period (s)"), ("rate", "Rate (s/day)"))
_SWEPT_KEYS = ("length_m", "at_m", "top_m", "mass_kg")  # in the order offered
_UNITS = {"m": "m", "kg": "kg", "n_m_per_rad": "N·m/rad"}
NOTE_COLOUR = "#6b7178"  # a plain remark, not a refusal


@dataclass(frozen=True)
class SweepField:
    """One field that can be swept: its path (as in the design file, or ``"pivot"``), a
    label, its unit and its value in the current design (SI)."""

    path: str
    label: str
    unit: str
    value: float


def _unit(key: str) -> str:
    for suffix, unit in _UNITS.items():
        if key.endswith("_" + suffix):
            return unit
    return ""


def sweep_fields(design: Any) -> list[SweepField]:
    """The fields of ``design`` worth sweeping: each part's position, length and (given)
    mass, a clamped bob's centre, the spring's stiffness, and the pivot's position."""
    data = design_to_dict(design)
    out: list[SweepField] = []
    for i, part in enumerate(data.get("parts", [])):
        name = part.get("name", f"part {i + 1}")
        entries = [(f"parts[{i}].{k}", k, part[k]) for k in _SWEPT_KEYS if k in part]
        mount = part.get("mount")
        if isinstance(mount, dict) and "centre_m" in mount:
            entries.insert(0, (f"parts[{i}].mount.centre_m", "centre_m", mount["centre_m"]))
        for path, key, value in entries:
            if isinstance(value, (int, float)) and not isinstance(value, bool):
                label = FIELD_LABELS.get(key, key)
                if key == "centre_m" and part.get("kind") == "bob":
                    label = "Bob centre, below pivot"
                out.append(SweepField(path, f"{name}: {label}", _unit(key), float(value)))
    suspension = data.get("suspension", {})
    if suspension.get("kind") == "spring":
        out.append(SweepField("suspension.stiffness_n_m_per_rad", "Spring stiffness",
                              "N·m/rad", float(suspension["stiffness_n_m_per_rad"])))
    out.append(SweepField(PIVOT, "Pivot position along the pendulum", "m", 0.0))
    return out


def _longest_rod_end(design: Any) -> float:
    """The deepest rod end below the pivot, m (the reference length for the pivot sweep)."""
    ends = [p.top_m + p.length_m for p in design.parts if p.kind == "rod"]
    return max(ends) if ends else 1.0


def default_range(design: Any, field: SweepField) -> tuple[float, float]:
    """The range swept unless the person sets one: ±20 % around the current value (inside
    the field's allowed range); for the pivot, from −0.1 L to L, L the deepest rod end."""
    if field.path == PIVOT:
        length = _longest_rod_end(design)
        return PIVOT_RANGE[0] * length, PIVOT_RANGE[1] * length
    half = abs(field.value) * AROUND_FRACTION or AROUND_FRACTION * _longest_rod_end(design)
    lo, hi = field.value - half, field.value + half
    allowed_lo, allowed_hi, lo_open, hi_open = field_range(field.path)
    if lo <= allowed_lo:
        lo = allowed_lo + (abs(field.value) * 1e-3 if lo_open or allowed_lo == 0 else 0.0)
    return lo, min(hi, allowed_hi)


class SweepPlot(QWidget):
    """Period or rate against one field of the design (see the module notes).

    Shares the plots' API: ``show_result(result, baseline=None)``, ``title``, ``slug`` and a
    ``plotItem`` for :func:`app.plots.export_plot`. The baseline is not swept.
    """

    title = "Sweep"
    slug = "sweep"
    grid_member = False  # a study with its own controls: a tab of its own, not a grid cell

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setMinimumSize(QSize(240, 180))
        self._result: Any = None
        self._fields: list[SweepField] = []
        self._path = ""
        self._range_auto = True
        self._quantity = "period"
        self._shown_key: tuple[Any, ...] | None = None
        self.table: Any = None  # the last core.solve.SweepTable drawn
        self.sweep_count = 0
        self._timer = QTimer(self)
        self._timer.setSingleShot(True)
        self._timer.setInterval(SWEEP_INTERVAL_MS)
        self._timer.timeout.connect(self.sweep_now)
        self._build_controls()
        self._build_plot()
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.setSpacing(0)
        layout.addWidget(self.controls)
        layout.addWidget(self.plot, 1)

    # ================================================================== building
    def _build_controls(self) -> None:
        self.controls = QWidget()
        self.controls.setObjectName("SweepControls")
        grid = QGridLayout(self.controls)
        grid.setContentsMargins(8, 6, 8, 4)
        grid.setHorizontalSpacing(6)
        grid.setVerticalSpacing(4)
        self.field_box = QComboBox()
        self.field_box.setToolTip("The field of the design to vary; everything else stays "
                                  "as designed")
        self.field_box.currentIndexChanged.connect(self._on_field_chosen)
        self.start_box, self.stop_box = self._number_box(), self._number_box()
        self.start_box.setToolTip("First value of the sweep")
        self.stop_box.setToolTip("Last value of the sweep")
        self.unit_label = QLabel()
        self.unit_label.setProperty("role", "unit")
        self.reset_button = QPushButton("Default range")
        self.reset_button.setToolTip("±20 % around the current value (the pivot: from just "
                                     "above the rod's top to near its end)")
        self.reset_button.clicked.connect(self.reset_range)
        self.quantity_box = QComboBox()
        for key, label in QUANTITIES:
            self.quantity_box.addItem(label, key)
        self.quantity_box.currentIndexChanged.connect(
            lambda i: self.set_quantity(self.quantity_box.itemData(i)))
        grid.addWidget(QLabel("Vary"), 0, 0)
        grid.addWidget(self.field_box, 0, 1, 1, 5)
        grid.addWidget(QLabel("Show"), 0, 6)
        grid.addWidget(self.quantity_box, 0, 7)
        grid.addWidget(QLabel("from"), 1, 0)
        grid.addWidget(self.start_box, 1, 1)
        grid.addWidget(QLabel("to"), 1, 2)
        grid.addWidget(self.stop_box, 1, 3)
        grid.addWidget(self.unit_label, 1, 4)
        grid.addWidget(self.reset_button, 1, 6, 1, 2)
        grid.setColumnStretch(5, 1)

    def _number_box(self) -> QDoubleSpinBox:
        box = QDoubleSpinBox()
        box.setDecimals(6)
        box.setRange(-1.0e6, 1.0e6)
        box.setKeyboardTracking(False)  # a value counts once typed in full (Enter, focus out)
        box.setMinimumWidth(96)
        box.valueChanged.connect(self._on_range_edited)
        return box

    def _build_plot(self) -> None:
        self.plot = pg.PlotWidget(background=theme.PLOT_BACKGROUND)
        self.plotItem = self.plot.getPlotItem()
        item = self.plotItem
        item.setTitle("Sweep", color=theme.INK, size="10pt")
        for name in ("left", "bottom"):
            style_axis(item.getAxis(name))
        self.curve = pg.PlotCurveItem(pen=pg.mkPen(theme.EXACT, width=2.0), antialias=False)
        item.addItem(self.curve)
        self.marker = pg.InfiniteLine(angle=90, movable=False,
                                      pen=pg.mkPen(theme.MARKER, width=1.0,
                                                   style=Qt.PenStyle.DashLine))
        item.addItem(self.marker, ignoreBounds=True)
        # Pivot sweep: the conjugate pivot, where the turned-over pendulum keeps the period.
        self.conjugate = pg.InfiniteLine(angle=90, movable=False,
                                         pen=pg.mkPen(theme.DIFFERENCE, width=1.0,
                                                      style=Qt.PenStyle.DotLine))
        self.conjugate_label = pg.InfLineLabel(self.conjugate, "", position=0.9,
                                               anchors=[(1.03, 0.5), (1.03, 0.5)],
                                               color=theme.DIFFERENCE,
                                               fill=pg.mkBrush(252, 251, 248, 225))
        item.addItem(self.conjugate, ignoreBounds=True)
        self.conjugate.setVisible(False)
        self.dot = _dot(theme.MARKER)
        self.least_dot = _dot(theme.DIFFERENCE)
        self.marker_label = pg.TextItem("", color=theme.MARKER, anchor=(0, 1),
                                        fill=pg.mkBrush(252, 251, 248, 225))
        self.least_label = pg.TextItem("", color=theme.DIFFERENCE, anchor=(0.5, -0.3),
                                       fill=pg.mkBrush(252, 251, 248, 225))
        for extra in (self.dot, self.least_dot, self.marker_label, self.least_label):
            extra.setZValue(6)
            item.vb.addItem(extra, ignoreBounds=True)
        self.note = pg.TextItem("", color=NOTE_COLOUR, anchor=(0, 0))
        self.note.setParentItem(item.vb)
        self.note.setPos(8, 8)
        menu = item.vb.menu
        menu.addSeparator()
        for suffix, text in ((".png", "Export PNG…"), (".svg", "Export SVG…")):
            action = QAction(text, menu)
            action.triggered.connect(lambda _=False, s=suffix: self._ask_export(s))
            menu.addAction(action)

    def _ask_export(self, suffix: str) -> None:
        from pathlib import Path

        from PySide6.QtWidgets import QFileDialog

        kind = "PNG image (*.png)" if suffix == ".png" else "SVG drawing (*.svg)"
        name, _ = QFileDialog.getSaveFileName(self, "Export sweep", f"{self.slug}{suffix}",
                                              kind)
        if name:
            path = Path(name)
            export_plot(self, path if path.suffix.lower() == suffix
                        else path.with_name(path.name + suffix))

    # ================================================================== public API
    def show_result(self, result: Any, baseline: Any = None) -> None:
        """Sweep ``result.design`` (the baseline is not swept).

        Shown: swept after at most ``SWEEP_INTERVAL_MS`` (however many results arrive
        meanwhile, only the newest is swept). Hidden (an export): swept at once.
        """
        self._result = result
        self._update_fields(result.design)
        if self.isVisible():
            if not self._timer.isActive():
                self._timer.start()
        else:
            self.sweep_now()

    def sweep_now(self) -> None:
        """Sweep the newest design now, unless that exact sweep is already drawn."""
        self._timer.stop()
        if self._result is None or not self._path:
            return
        field = self.field()
        start, stop = self.start_box.value(), self.stop_box.value()
        key = (self._result.design, self._path, start, stop, SWEEP_POINTS)
        if key == self._shown_key:
            self._draw()  # only the quantity or the marks may have changed
            return
        self._shown_key = key
        try:
            table = sweep_field(self._result.design, field.path, start, stop, SWEEP_POINTS)
        except DesignError as exc:
            self.table = None
            self.curve.setData([], [])
            self._set_note(f"Cannot sweep: {exc.reason}")
            return
        self.sweep_count += 1
        self.table = table
        self._draw()

    def fields(self) -> list[SweepField]:
        """The fields offered for the current design."""
        return list(self._fields)

    def field(self) -> SweepField:
        """The field swept now."""
        return next(f for f in self._fields if f.path == self._path)

    def set_field(self, path: str) -> None:
        """Sweep field ``path`` (one of :meth:`fields`) over its default range."""
        index = next((i for i, f in enumerate(self._fields) if f.path == path), -1)
        if index < 0:
            raise ValueError(f"field {path!r} cannot be swept in this design")
        self.field_box.setCurrentIndex(index)
        if self.field_box.currentIndex() == index and self._path != path:
            self._on_field_chosen(index)

    def sweep_range(self) -> tuple[float, float]:
        """(from, to) of the sweep, SI."""
        return self.start_box.value(), self.stop_box.value()

    def set_range(self, start: float, stop: float) -> None:
        """Sweep from ``start`` to ``stop`` (SI); kept until :meth:`reset_range`."""
        for box, value in ((self.start_box, start), (self.stop_box, stop)):
            box.blockSignals(True)
            box.setValue(float(value))
            box.blockSignals(False)
        self._range_auto = False
        self._settings_changed()

    def reset_range(self) -> None:
        """Back to the default range, which then follows the current value."""
        self._range_auto = True
        self._apply_default_range()
        self._settings_changed()

    @property
    def quantity(self) -> str:
        """What is drawn against the field: "period" or "rate"."""
        return self._quantity

    def set_quantity(self, key: str) -> None:
        """Draw "period" (s) or "rate" (s/day) against the field."""
        if key not in dict(QUANTITIES):
            raise ValueError(f"quantity={key!r} is not offered: choose period or rate")
        self._quantity = key
        index = self.quantity_box.findData(key)
        if self.quantity_box.currentIndex() != index:
            self.quantity_box.blockSignals(True)
            self.quantity_box.setCurrentIndex(index)
            self.quantity_box.blockSignals(False)
        self._draw()

    def least_period_value(self) -> float | None:
        """For the pivot sweep, the swept value of least period (None otherwise)."""
        if self.table is None or self.table.field != PIVOT:
            return None
        periods = np.asarray(self.table.period_s, dtype=float)
        if not np.any(np.isfinite(periods)):
            return None
        return float(self.table.values[int(np.nanargmin(periods))])

    # ================================================================== internals
    def _update_fields(self, design: Any) -> None:
        """Offer the fields of ``design``; keep the chosen one when it is still there."""
        fields = sweep_fields(design)
        same_choices = [(f.path, f.label) for f in fields] == [(f.path, f.label)
                                                               for f in self._fields]
        self._fields = fields
        if not same_choices:
            self.field_box.blockSignals(True)
            self.field_box.clear()
            for f in fields:
                self.field_box.addItem(f"{f.label} ({f.unit})" if f.unit else f.label, f.path)
            index = self.field_box.findData(self._path)
            if index < 0:
                index = 0
                self._path = fields[0].path
                self._range_auto = True
            self.field_box.setCurrentIndex(index)
            self.field_box.blockSignals(False)
        self.unit_label.setText(self.field().unit)
        if self._range_auto:
            self._apply_default_range()

    def _apply_default_range(self) -> None:
        if self._result is None or not self._path:
            return
        start, stop = default_range(self._result.design, self.field())
        for box, value in ((self.start_box, start), (self.stop_box, stop)):
            box.blockSignals(True)
            box.setSingleStep(max(abs(stop - start) / 20.0, 1e-6))
            box.setValue(value)
            box.blockSignals(False)

    def _on_field_chosen(self, index: int) -> None:
        if not 0 <= index < len(self._fields):
            return
        self._path = self._fields[index].path
        self.unit_label.setText(self._fields[index].unit)
        self._range_auto = True
        self._apply_default_range()
        self._settings_changed()

    def _on_range_edited(self, _value: float) -> None:
        self._range_auto = False
        self._settings_changed()

    def _settings_changed(self) -> None:
        if self._result is None:
            return
        if self.isVisible():
            self._timer.start()
        else:
            self.sweep_now()

    def _set_note(self, text: str) -> None:
        self.note.setText(text)
        self.note.setVisible(bool(text))

    def _draw(self) -> None:
        """Draw the last sweep in the chosen quantity and mark the current value (and, for
        the pivot, the value of least period)."""
        table, result = self.table, self._result
        if table is None or result is None:
            return
        field = next((f for f in self._fields if f.path == table.field), None)
        unit = f" ({field.unit})" if field is not None and field.unit else ""
        name = field.label if field is not None else table.field
        rate = self._quantity == "rate"
        ys = np.asarray(table.rate_s_per_day if rate else table.period_s, dtype=float)
        xs = np.asarray(table.values, dtype=float)
        item = self.plotItem
        item.setLabel("bottom", f"{name}{unit}")
        if rate:
            against = ("target" if result.design.target.target_period_s is not None
                       else "the design as it is")
            item.setLabel("left", f"Rate against {against} (s/day)")
        else:
            item.setLabel("left", "Period (s)")
        shown_name = name if ":" in name else name[:1].lower() + name[1:]
        item.setTitle(f"{'Rate' if rate else 'Period'} against {shown_name}",
                      color=theme.INK, size="10pt")
        self.curve.setData(xs, ys, connect="finite")
        gaps = int(np.count_nonzero(~np.isfinite(ys)))
        if not np.any(np.isfinite(ys)):
            self._set_note("No rate without a target period: set one in Target, or show "
                           "the period." if rate else "No value in this range gives a "
                           "usable design.")
        elif gaps:
            self._set_note(f"{gaps} of {len(ys)} values give no usable design (gaps).")
        else:
            self._set_note("")
        self._mark_current(result, rate, field)
        self._mark_least(xs, ys, table, "" if field is None else field.unit)
        self._mark_conjugate(result, field is None or field.path == PIVOT)
        finite = ys[np.isfinite(ys)]
        vb = item.vb
        vb.setXRange(float(xs[0]), float(xs[-1]), padding=0.02)
        if finite.size:
            lo, hi = float(finite.min()), float(finite.max())
            pad = (hi - lo) * 0.08 or max(abs(hi) * 1e-6, 1e-9)
            room = 2.5 * pad if self.least_label.isVisible() else pad  # for its label
            rate_peak = self._quantity == "rate"
            vb.setYRange(lo - (pad if rate_peak else room), hi + (room if rate_peak else pad),
                         padding=0)
        if self.isVisible():
            vb.prepareForPaint()

    def _mark_current(self, result: Any, rate: bool, field: SweepField | None) -> None:
        """The current value: a line, and a dot at the core's own figure for the design."""
        value = 0.0 if field is None else field.value
        here: float | None = result.period_s
        if rate and result.design.target.target_period_s is not None:
            here = result.rate_s_per_day
        elif rate:  # against the design as it is, the design itself is the zero
            here = None if field is None or field.path == PIVOT else 0.0
        self.marker.setValue(value)
        shown = here is not None and math.isfinite(here)
        self.dot.setVisible(shown)
        self.marker_label.setVisible(shown)
        if here is not None and shown:
            self.dot.setPos(value, here)
            self.marker_label.setPos(value, here)
            at = ("as designed" if field is None or field.path == PIVOT
                  else f"now {value:.4g} {field.unit}".rstrip())
            self.marker_label.setText(f"{at}: " + (f"{here:+.2f} s/day" if rate
                                                   else f"{here:.6f} s"))
            self.marker_label.setAnchor(self._label_anchor(value))

    def _label_anchor(self, value: float) -> tuple[float, float]:
        """Where the current value's label goes, clear of the curve: beside the mark on the
        side with more room, below the curve where it rises that way, above where it falls."""
        xs, ys = (np.asarray(a, dtype=float) for a in self.curve.getData())
        lo, hi = self.sweep_range()
        right = value <= lo + 0.6 * (hi - lo)  # the label goes right of the mark
        i = int(np.clip(np.searchsorted(xs, value), 1, len(xs) - 1)) if len(xs) > 1 else 0
        near = ys[max(i - 2, 0):i + 2]
        near = near[np.isfinite(near)]
        rising = bool(near.size < 2 or near[-1] >= near[0])
        below = rising == right  # the curve climbs away from the label's side
        return (-0.03 if right else 1.03, -0.1 if below else 1.1)

    def _mark_least(self, xs: np.ndarray, ys: np.ndarray, table: Any, unit: str) -> None:
        """For the pivot sweep, the value of least period (the core's sample of least
        period, picked out here)."""
        least = self.least_period_value()
        self.least_dot.setVisible(least is not None)
        self.least_label.setVisible(least is not None)
        if least is None:
            return
        i = int(np.nanargmin(np.asarray(table.period_s, dtype=float)))
        if not math.isfinite(ys[i]):
            self.least_dot.setVisible(False)
            self.least_label.setVisible(False)
            return
        self.least_dot.setPos(xs[i], ys[i])
        self.least_label.setPos(xs[i], ys[i])
        # Least period is the lowest point of the period curve and the highest of the rate:
        # the label goes on the open side.
        self.least_label.setAnchor((0.5, 1.3) if self._quantity == "rate" else (0.5, -0.3))
        self.least_label.setText(f"shortest period {table.period_s[i]:.6f} s "
                                 f"at {xs[i]:.4g} {unit}".rstrip())

    def _mark_conjugate(self, result: Any, pivot_sweep: bool) -> None:
        """For the pivot sweep, the centre of oscillation (the core's figure): hung from
        there, turned over, the pendulum swings with the design's own period (Kater)."""
        self.conjugate.setVisible(pivot_sweep)
        if pivot_sweep:
            at = float(result.centre_of_oscillation_m)
            self.conjugate.setValue(at)
            self.conjugate_label.setFormat(f"conjugate pivot {at:.4f} m")
            self.conjugate_label.valueChanged()

    def conjugate_text(self) -> str:
        """The conjugate pivot's label (pivot sweep), or "" when not shown."""
        return self.conjugate_label.textItem.toPlainText() if self.conjugate.isVisible() else ""

    def marker_text(self) -> str:
        """The label at the current value, as plain text."""
        return self.marker_label.textItem.toPlainText()

    def least_text(self) -> str:
        """The label at the least period (pivot sweep), as plain text."""
        return self.least_label.textItem.toPlainText() if self.least_label.isVisible() else ""

    def hideEvent(self, event: Any) -> None:  # noqa: N802 (Qt override)
        """Nothing is swept while hidden; a pending sweep runs when shown again."""
        self._timer.stop()
        super().hideEvent(event)

    def showEvent(self, event: Any) -> None:  # noqa: N802 (Qt override)
        super().showEvent(event)
        if self._result is not None:
            self._timer.start()  # does nothing new when the newest sweep is already drawn


def _dot(colour: str) -> QGraphicsEllipseItem:
    """A ring of fixed screen size, placed in data coordinates."""
    dot = QGraphicsEllipseItem(-4.5, -4.5, 9.0, 9.0)
    dot.setFlag(QGraphicsItem.GraphicsItemFlag.ItemIgnoresTransformations, True)
    dot.setPen(pg.mkPen(colour, width=1.5))
    dot.setBrush(pg.mkBrush(theme.PLOT_BACKGROUND))
    return dot
