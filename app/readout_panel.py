"""The readout: every figure of a result with its unit, the rate budget, warnings and cautions.

Rows, labels and formats come from :mod:`app.readout_format` (shared with the report and the
PDF). Values are only converted to the chosen display units here; nothing is computed. The
tree's items are created once and their texts updated on each result.
"""

from __future__ import annotations

from typing import Any

from PySide6.QtCore import Qt, Signal
from PySide6.QtGui import QBrush, QColor, QFont
from PySide6.QtWidgets import (QFrame, QHBoxLayout, QHeaderView, QLabel, QScrollArea,
                               QSplitter, QTreeWidget, QTreeWidgetItem, QVBoxLayout, QWidget)

from .number_field import NumberField
from .readout_format import SECTIONS, describe, format_value
from .units import UnitSystem, field_unit, readout_unit

__all__ = ["ReadoutPanel"]

BUDGET_SECTION = "Rate budget"
_COLUMNS = ("Figure", "Value", "Unit", "Δ baseline")
_RIGHT = Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter
LABEL_PADDING_PX = 14  # item padding and text margins around a label, px


def _signed(fmt: str) -> str:
    """The same format with an explicit sign (for differences)."""
    return fmt if fmt.startswith("{:+") else fmt.replace("{:", "{:+", 1)


class ReadoutPanel(QWidget):
    """Right panel: figures, rate budget, warnings and cautions of the latest result.

    Signals
    -------
    trimHeightChanged(object) : the height (m below the pivot, SI) at which to quote the trim
        weight's effect, chosen by the person.
    """

    trimHeightChanged = Signal(object)

    def __init__(self, system: UnitSystem = UnitSystem.METRIC,
                 parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setObjectName("ReadoutPanel")
        self._system = system
        self._result: Any = None
        self._baseline: Any = None
        self._items: dict[str, tuple[QTreeWidgetItem, str, str]] = {}
        self._budget_items: list[QTreeWidgetItem] = []
        self._notes_shown: tuple[Any, ...] = ()
        self._own_min_width: int | None = None
        layout = self._layout = QVBoxLayout(self)
        layout.setContentsMargins(6, 6, 8, 8)
        layout.setSpacing(6)
        self.compute_problem = QLabel()
        self.compute_problem.setObjectName("ComputeProblem")
        self.compute_problem.setWordWrap(True)
        self.compute_problem.setVisible(False)
        layout.addWidget(self.compute_problem)
        layout.addLayout(self._build_trim_row())
        self.trim_problem = QLabel()
        self.trim_problem.setProperty("role", "problem")
        self.trim_problem.setWordWrap(True)
        self.trim_problem.setVisible(False)
        layout.addWidget(self.trim_problem)
        self.splitter = QSplitter(Qt.Orientation.Vertical)
        self.splitter.setChildrenCollapsible(False)
        self.tree = self._build_tree()
        self.splitter.addWidget(self.tree)
        self.splitter.addWidget(self._build_notes())
        self.splitter.setStretchFactor(0, 3)
        self.splitter.setStretchFactor(1, 1)
        self.splitter.setSizes([560, 220])
        layout.addWidget(self.splitter, 1)

    # ================================================================== building
    def _build_trim_row(self) -> QHBoxLayout:
        row = QHBoxLayout()
        row.setSpacing(6)
        label = QLabel("Quote 1 g trim at")
        self.trim_field = NumberField(field_unit("trim_height_m", self._system))
        self.trim_field.setAccessibleName("trim_height_m")
        self.trim_field.setToolTip("Height below the pivot at which the readout quotes the "
                                   "rate change of 1 g of trim weight.")
        self.trim_field.changed.connect(self._on_trim_changed)
        self.trim_unit = QLabel(self.trim_field.unit().text)
        self.trim_unit.setProperty("role", "unit")
        below = QLabel("below pivot")
        below.setProperty("role", "hint")
        label.setBuddy(self.trim_field)
        row.addWidget(label)
        row.addWidget(self.trim_field, 1)
        row.addWidget(self.trim_unit)
        row.addWidget(below)
        return row

    def _build_tree(self) -> QTreeWidget:
        tree = QTreeWidget()
        tree.setColumnCount(len(_COLUMNS))
        tree.setHeaderLabels(list(_COLUMNS))
        tree.setRootIsDecorated(False)
        tree.setAlternatingRowColors(True)
        tree.setUniformRowHeights(True)
        tree.setIndentation(0)
        tree.setSelectionMode(QTreeWidget.SelectionMode.SingleSelection)
        header = tree.header()
        header.setStretchLastSection(False)
        header.setSectionResizeMode(0, QHeaderView.ResizeMode.Stretch)
        # Fixed widths: sizing columns to their contents would re-measure every row on every
        # update of a live drag.
        metrics = tree.fontMetrics()
        for column, sample in ((1, "−0.000000000"), (2, "s/day/inHg"),
                               (3, "+0.000000000")):
            header.setSectionResizeMode(column, QHeaderView.ResizeMode.Interactive)
            header.resizeSection(column, metrics.horizontalAdvance(sample) + 14)
        tree.headerItem().setTextAlignment(1, _RIGHT)
        tree.headerItem().setTextAlignment(3, _RIGHT)
        bold = QFont(tree.font())
        bold.setBold(True)
        section_brush = QBrush(QColor("#e9e5dc"))
        labels = []
        for section, rows in SECTIONS:
            head = self._section_item(tree, section, bold, section_brush)
            labels.append(section)
            for key, label, unit, fmt in rows:
                item = QTreeWidgetItem(head, [label, "", unit, ""])
                item.setTextAlignment(1, _RIGHT)
                item.setTextAlignment(3, _RIGHT)
                item.setToolTip(0, describe(key))
                self._items[key] = (item, unit, fmt)
                labels.append(label)
        self._budget_head = self._section_item(tree, BUDGET_SECTION, bold, section_brush)
        tree.expandAll()
        tree.setColumnHidden(3, True)
        # The label column fits the longest label, measured once here (the labels never
        # change; measuring on every update was what made live drags slow): the tree may not
        # be squeezed narrower than that plus the other columns on view.
        self._label_width = (max(metrics.horizontalAdvance(text) for text in labels)
                             + LABEL_PADDING_PX)
        self._tree_extra = tree.verticalScrollBar().sizeHint().width() + 2 * tree.frameWidth()
        tree.setMinimumWidth(self._tree_width(tree, delta=False))
        return tree

    def _tree_width(self, tree: QTreeWidget, delta: bool) -> int:
        """Least tree width that shows every label whole, px."""
        header = tree.header()
        columns = (1, 2, 3) if delta else (1, 2)
        return self._label_width + sum(header.sectionSize(c) for c in columns) + self._tree_extra

    def _show_delta_column(self, show: bool) -> None:
        """Show or hide the Δ baseline column; the panel widens to keep the labels whole."""
        self.tree.setColumnHidden(3, not show)
        if self._own_min_width is None:
            self._own_min_width = self.minimumWidth()  # what the window asked for
        self.tree.setMinimumWidth(self._tree_width(self.tree, delta=show))
        margins = self._layout.contentsMargins()
        needed = self.tree.minimumWidth() + margins.left() + margins.right()
        self.setMinimumWidth(max(self._own_min_width, needed))

    @staticmethod
    def _section_item(tree: QTreeWidget, title: str, font: QFont,
                      brush: QBrush) -> QTreeWidgetItem:
        head = QTreeWidgetItem(tree, [title])
        head.setFirstColumnSpanned(True)
        head.setFont(0, font)
        for column in range(len(_COLUMNS)):
            head.setBackground(column, brush)
        head.setFlags(Qt.ItemFlag.ItemIsEnabled)
        return head

    def _build_notes(self) -> QScrollArea:
        area = QScrollArea()
        area.setWidgetResizable(True)
        area.setFrameShape(QFrame.Shape.NoFrame)
        body = QWidget()
        self.notes_layout = QVBoxLayout(body)
        self.notes_layout.setContentsMargins(0, 0, 4, 0)
        self.notes_layout.setSpacing(6)
        self.warning_box, self.warning_text = self._note_box("Warning", "Warnings")
        self.caution_box, self.caution_text = self._note_box("Caution", "Safety cautions")
        self.notes_layout.addWidget(self.warning_box)
        self.notes_layout.addWidget(self.caution_box)
        self.notes_layout.addStretch(1)
        area.setWidget(body)
        return area

    @staticmethod
    def _note_box(name: str, heading: str) -> tuple[QFrame, QLabel]:
        box = QFrame()
        box.setObjectName(name)
        inner = QVBoxLayout(box)
        inner.setContentsMargins(10, 6, 8, 8)
        inner.setSpacing(3)
        title = QLabel(heading)
        title.setObjectName("NoteHeading")
        text = QLabel()
        text.setWordWrap(True)
        text.setTextFormat(Qt.TextFormat.RichText)
        text.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        inner.addWidget(title)
        inner.addWidget(text)
        return box, text

    # ================================================================== updates
    def set_unit_system(self, system: UnitSystem) -> None:
        """Show figures in ``system``'s units."""
        self._system = system
        self.trim_field.set_unit(field_unit("trim_height_m", system))
        self.trim_unit.setText(self.trim_field.unit().text)
        if self._result is not None:
            self.show_result(self._result, self._baseline)

    def show_result(self, result: Any, baseline: Any = None) -> None:
        """Show every figure of ``result`` (and differences from ``baseline`` when given)."""
        self._result, self._baseline = result, baseline
        report = result.report_dict()
        base = baseline.report_dict() if baseline is not None else None
        if self._own_min_width is None or self.tree.isColumnHidden(3) != (base is None):
            self._show_delta_column(base is not None)
        for key, (item, unit, fmt) in self._items.items():
            shown = readout_unit(unit, self._system)
            _set_text(item, 1, format_value(_convert(report.get(key), shown), fmt))
            _set_text(item, 2, shown.text)
            _set_text(item, 3, "" if base is None else _delta(report.get(key), base.get(key),
                                                              shown.scale, fmt))
        self._show_budget(result)
        self._show_notes(result)
        if not self.trim_field.hasFocus():
            self.trim_field.set_value(result.sensitivities.trim_height_m)
        self.show_compute_problem("")

    def _show_budget(self, result: Any) -> None:
        rows: list[tuple[str, str, str]] = []
        tips: list[str] = []
        for line in result.budget.lines:
            unit = readout_unit(line.unit, self._system)
            low, high = unit.convert(line.low), unit.convert(line.high)
            gap = "" if unit.text == "°" else " "
            rows.append((f"{line.cause} {_range_text(low, high)}{gap}{unit.text}",
                         f"{line.spread_s_per_day:+.2f}", "s/day"))
            tips.append(f"{line.cause} from {low:.6g} to {high:.6g} {unit.text}: rate "
                        f"{line.rate_at_low_s_per_day:+.2f} s/day at the low end, "
                        f"{line.rate_at_high_s_per_day:+.2f} s/day at the high end")
        rows.append(("Worst case (sum)", f"{result.budget.worst_case_s_per_day:.2f}",
                     "s/day"))
        tips.append("Sum of the spreads above: every cause pushing the same way at once")
        rows.append(("Root sum square", f"{result.budget.root_sum_square_s_per_day:.2f}",
                     "s/day"))
        tips.append("Square root of the sum of the squared spreads: the causes taken as "
                    "independent of each other")
        while len(self._budget_items) < len(rows):
            item = QTreeWidgetItem(self._budget_head, ["", "", "", ""])
            item.setTextAlignment(1, _RIGHT)
            self._budget_items.append(item)
        for i, item in enumerate(self._budget_items):
            hidden = i >= len(rows)
            if item.isHidden() != hidden:  # each setHidden lays the whole tree out again
                item.setHidden(hidden)
            if hidden:
                continue
            for column, text in enumerate(rows[i]):
                _set_text(item, column, text)
            if _TIPS.get(id(item)) != tips[i]:
                _TIPS[id(item)] = tips[i]
                item.setToolTip(0, tips[i])
        if not self._budget_head.isExpanded():
            self._budget_head.setExpanded(True)

    def _show_notes(self, result: Any) -> None:
        if (result.warnings, result.cautions) == self._notes_shown:
            return
        self._notes_shown = (result.warnings, result.cautions)
        self.warning_box.setVisible(bool(result.warnings))
        self.warning_text.setText(_bullets(result.warnings))
        self.caution_box.setVisible(bool(result.cautions))
        self.caution_text.setText(_bullets(result.cautions))

    def show_compute_problem(self, message: str) -> None:
        """Say that the design shown cannot be computed (figures stay at the last good one)."""
        self.compute_problem.setText(message)
        self.compute_problem.setVisible(bool(message))

    def show_trim_problem(self, message: str) -> None:
        """Mark the trim-height entry with a refusal sentence ("" clears)."""
        self.trim_field.set_problem(message)
        self.trim_problem.setText(message)
        self.trim_problem.setVisible(bool(message))

    def value_text(self, key: str) -> str:
        """The shown value of figure ``key`` (as in ``Result.report_dict()``)."""
        return self._items[key][0].text(1)

    def _on_trim_changed(self, si: float, _stepping: bool) -> None:
        self.show_trim_problem("")
        self.trimHeightChanged.emit(si)


_SHOWN: dict[tuple[int, int], str] = {}
_TIPS: dict[int, str] = {}


def _set_text(item: QTreeWidgetItem, column: int, text: str) -> None:
    """Set a cell's text only when it changes (each change costs a relayout and repaint);
    what was set is remembered here, as reading it back from Qt is slow."""
    key = (id(item), column)
    if _SHOWN.get(key) != text:
        _SHOWN[key] = text
        item.setText(column, text)


def _range_text(low: float, high: float) -> str:
    """A budget range shown briefly: "±5" when it is symmetric about the site's value,
    "0–30" otherwise (the exact ends are in the row's tooltip)."""
    half = 0.5 * (high - low)
    middle = 0.5 * (high + low)
    if half > 0 and abs(middle) > 2 * half:  # a range around a nominal value
        return f"±{half:.3g}"
    return f"{low:.4g}–{high:.4g}"


def _convert(value: Any, unit: Any) -> Any:
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        return unit.convert(float(value))
    return value


def _delta(value: Any, base: Any, scale: float, fmt: str) -> str:
    if not (isinstance(value, (int, float)) and isinstance(base, (int, float))):
        return ""
    return format_value((float(value) - float(base)) * scale, _signed(fmt))


def _bullets(lines: Any) -> str:
    from html import escape

    return "".join(f"<p style='margin:0 0 4px 0'>{escape(text)}</p>" for text in lines)
