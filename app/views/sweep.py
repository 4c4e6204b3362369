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

from pathlib import Path
from typing import Any

import numpy as np
from PySide6.QtCore import QSignalBlocker, QSize, QTimer
from PySide6.QtWidgets import (
    QComboBox,
    QDoubleSpinBox,
    QGridLayout,
    QLabel,
    QPushButton,
    QVBoxLayout,
    QWidget,
)

from app import theme
from app.form.units import ReadoutUnit, UnitSystem, readout_unit
from app.views.catalogue import from_card
from app.views.plot_export import export_plot
from app.views.sweep_canvas import SweepCanvas
from app.views.sweep_fields import (
    PIVOT,
    QUANTITIES,
    SWEEP_INTERVAL_MS,
    SWEEP_POINTS,
    SweepField,
    default_field,
    default_range,
    sweep_fields,
)
from core import Design, DesignError, Result
from core.solve import SweepTable, sweep_field

__all__ = ["SweepPlot", "SweepField", "sweep_fields", "default_range", "PIVOT",
           "SWEEP_POINTS", "SWEEP_INTERVAL_MS"]

@from_card("sweep")
class SweepPlot(QWidget):
    """Period or rate against one field of the design (see the module notes).

    Follows the view shape (:class:`app.views.base.View`): ``title``, ``slug``,
    ``show_result(result, baseline)``, ``export(path)``; its plot is a :class:`SweepCanvas`
    (a :class:`~app.views.base.ResultView`, whose export menu it has) under a control bar of
    two rows, above the plot rather than over its title row. The baseline is not swept.
    """

    title: str  # these four from the card (app.views.catalogue)
    slug: str
    grid_member: bool
    in_report: bool
    caption = ""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setMinimumSize(QSize(240, 180))
        self._result: Result | None = None
        self._fields: list[SweepField] = []
        self._path = ""
        self._range_auto = True
        self._quantity = "period"
        self._system = UnitSystem.METRIC
        self._range_si = (0.0, 0.0)  # the swept range, SI; the boxes show it in display units
        self._shown_key: tuple[Any, ...] | None = None
        self.table: SweepTable | None = None  # the last sweep drawn
        self.sweep_count = 0
        self._timer = QTimer(self)
        self._timer.setSingleShot(True)
        self._timer.setInterval(SWEEP_INTERVAL_MS)
        self._timer.timeout.connect(self.sweep_now)
        self._build_controls()
        self.plot = SweepCanvas()
        self.plotItem = self.plot.getPlotItem()
        c = self.plot  # its items, by the names the sweep has always used
        self.curve, self.marker, self.dot, self.least_dot = c.curve, c.marker, c.dot, c.least_dot
        self.marker_label, self.least_label = c.marker_label, c.least_label
        self.conjugate, self.conjugate_label, self.note = c.conjugate, c.conjugate_label, c.note
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
        theme.set_role(self.unit_label, "unit")
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

    def export(self, path: str | Path) -> Path:
        """Write the sweep's plot to ``path`` (.png or .svg); returns the path."""
        return export_plot(self, path)

    def attach_controls(self) -> None:
        """Nothing to add: the sweep's controls are always shown."""

    def pose_for_export(self) -> None:
        """Nothing moves in a sweep."""

    # ================================================================== public API
    def show_result(self, result: Result, baseline: Result | None = None) -> None:
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
        start, stop = self._range_si
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
            self.plot.set_note(f"Cannot sweep: {exc.reason}")
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
        return self._range_si

    def set_range(self, start: float, stop: float) -> None:
        """Sweep from ``start`` to ``stop`` (SI); kept until :meth:`reset_range`."""
        self._show_range(float(start), float(stop))
        self._range_auto = False
        self._settings_changed()

    def set_unit_system(self, system: UnitSystem) -> None:
        """Show the range, the axis and the marks in ``system``'s units (the core still
        sweeps in SI; the range swept stays the same)."""
        self._system = system
        if self._fields:
            self._fill_field_box()
            self.unit_label.setText(self.display_unit().text)
            self._show_range(*self._range_si)
        self._draw()

    def display_unit(self, field: SweepField | None = None) -> ReadoutUnit:
        """How the values of ``field`` (default: the swept one) are shown now."""
        if field is None:
            field = next((f for f in self._fields if f.path == self._path), None)
        return readout_unit(field.unit if field is not None else "", self._system)

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
            with QSignalBlocker(self.quantity_box):
                self.quantity_box.setCurrentIndex(index)
        self._draw()

    def least_period_value(self) -> float | None:
        """For the pivot sweep, the swept value of least period when it is a real minimum
        inside the range (both neighbours computed and longer); None otherwise (the least
        at an end of the range, or next to a gap, says nothing about a minimum)."""
        if self.table is None or self.table.field != PIVOT:
            return None
        periods = np.asarray(self.table.period_s, dtype=float)
        if not np.any(np.isfinite(periods)):
            return None
        i = int(np.nanargmin(periods))
        if not 0 < i < len(periods) - 1:
            return None
        if not (periods[i - 1] > periods[i] < periods[i + 1]):  # NaN neighbours fail too
            return None
        return float(self.table.values[i])

    # ================================================================== internals
    def _update_fields(self, design: Design) -> None:
        """Offer the fields of ``design``; keep the chosen one when it is still there."""
        fields = sweep_fields(design)
        same_choices = [(f.path, f.label) for f in fields] == [(f.path, f.label)
                                                               for f in self._fields]
        self._fields = fields
        if not same_choices:
            if not any(f.path == self._path for f in fields):
                self._path = default_field(fields).path
                self._range_auto = True
            self._fill_field_box()
        self.unit_label.setText(self.display_unit().text)
        if self._range_auto:
            self._apply_default_range()

    def _fill_field_box(self) -> None:
        """List the fields with their units in the chosen system; keep the chosen one."""
        with QSignalBlocker(self.field_box):
            self.field_box.clear()
            for f in self._fields:
                unit = self.display_unit(f).text
                self.field_box.addItem(f"{f.label} ({unit})" if unit else f.label, f.path)
            self.field_box.setCurrentIndex(self.field_box.findData(self._path))

    def _apply_default_range(self) -> None:
        if self._result is None or not self._path:
            return
        self._show_range(*default_range(self._result.design, self.field()))

    def _show_range(self, start: float, stop: float) -> None:
        """Keep (``start``, ``stop``) SI as the range and show it in the display unit."""
        self._range_si = (start, stop)
        scale = self.display_unit().scale
        for box, value in ((self.start_box, start), (self.stop_box, stop)):
            with QSignalBlocker(box):
                box.setSingleStep(max(abs(stop - start) * scale / 20.0, 1e-6))
                box.setValue(value * scale)

    def _on_field_chosen(self, index: int) -> None:
        if not 0 <= index < len(self._fields):
            return
        self._path = self._fields[index].path
        self.unit_label.setText(self.display_unit().text)
        self._range_auto = True
        self._apply_default_range()
        self._settings_changed()

    def _on_range_edited(self, _value: float) -> None:
        scale = self.display_unit().scale
        self._range_si = (self.start_box.value() / scale, self.stop_box.value() / scale)
        self._range_auto = False
        self._settings_changed()

    def _settings_changed(self) -> None:
        if self._result is None:
            return
        if self.isVisible():
            self._timer.start()
        else:
            self.sweep_now()

    def _draw(self) -> None:
        """Draw the last sweep in the chosen quantity and mark the current value (and, for
        the pivot, the value of least period)."""
        table, result = self.table, self._result
        if table is None or result is None:
            return
        field = next((f for f in self._fields if f.path == table.field), None)
        shown = readout_unit("" if field is None else field.unit, self._system)
        unit = f" ({shown.text})" if shown.text else ""
        name = field.label if field is not None else table.field
        rate = self._quantity == "rate"
        ys = np.asarray(table.rate_s_per_day if rate else table.period_s, dtype=float)
        xs = np.asarray(table.values, dtype=float)
        item = self.plotItem
        item.setLabel("bottom", f"{name}{unit}")
        item.getAxis("bottom").setScale(shown.scale)  # drawn in SI, ticks in the display unit
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
            self.plot.set_note("No rate without a target period: set one in Target, or show "
                           "the period." if rate else "No value in this range gives a "
                           "usable design.")
        elif gaps:
            self.plot.set_note(f"{gaps} of {len(ys)} values give no usable design (gaps).")
        else:
            self.plot.set_note("")
        self.plot.mark_current(result, rate, field, self.sweep_range(), shown)
        self.plot.mark_least(xs, ys, table, shown, self.least_period_value(), rate)
        self.plot.mark_conjugate(result, field is None or field.path == PIVOT, shown)
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

    def conjugate_text(self) -> str:
        """The conjugate pivot's label (pivot sweep), or "" when not shown."""
        return self.conjugate_label.textItem.toPlainText() if self.conjugate.isVisible() else ""

    def marker_text(self) -> str:
        """The label at the current value, as plain text."""
        return self.marker_label.textItem.toPlainText()

    def least_text(self) -> str:
        """The label at the least period (pivot sweep), as plain text."""
        return self.least_label.textItem.toPlainText() if self.least_label.isVisible() else ""

    def hideEvent(self, event: Any) -> None:  # Qt override
        """Nothing is swept while hidden; a pending sweep runs when shown again."""
        self._timer.stop()
        super().hideEvent(event)

    def showEvent(self, event: Any) -> None:  # Qt override
        super().showEvent(event)
        if self._result is not None:
            self._timer.start()  # does nothing new when the newest sweep is already drawn
