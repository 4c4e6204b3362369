"""The readout: every figure of a result with its unit, the rate budget, warnings and cautions.

Rows, labels and formats come from :mod:`app.readout.readout_format` (shared with the report and the
PDF). Values are only converted to the chosen display units here; nothing is computed. The
tree's items are created once and their texts updated on each result.

The rate budget section starts with three entries: the half-widths of the temperature,
pressure and semi-arc ranges it spans. The panel only reports what is typed
(``budgetRangeChanged``); the window judges the value (with the core), keeps it and passes it
to the analysis.
"""

from __future__ import annotations

from typing import Any

from PySide6.QtCore import QSize, Qt, QTimer, Signal
from PySide6.QtGui import QBrush, QColor, QFont, QResizeEvent, QShowEvent
from PySide6.QtWidgets import (
    QHBoxLayout,
    QHeaderView,
    QLabel,
    QSplitter,
    QTreeWidget,
    QTreeWidgetItem,
    QVBoxLayout,
    QWidget,
)

from app import theme
from app.form.number_field import NumberField
from app.form.units import ReadoutUnit, UnitSystem, field_unit, readout_unit
from app.readout.cells import TreeCells, budget_rows, convert, delta_text
from app.readout.figure_words import figure_label
from app.readout.notes import NotesPane
from app.readout.readout_format import SECTIONS, describe, format_value
from app.readout.sections import arrange_sections, mark_section, toggle_section
from core import Result
from core.tuning import BudgetRanges

__all__ = ["ReadoutPanel", "BUDGET_RANGES"]

BUDGET_SECTION = "Rate budget: spread of the rate, end to end"
BUDGET_RANGES: tuple[tuple[str, str, str], ...] = (
    ("temperature_k", "Temperature range ±",
     "Half-width of the temperature range the budget spans, about the site's temperature"),
    ("pressure_hpa", "Pressure range ±",
     "Half-width of the air-pressure range the budget spans, about the site's pressure"),
    ("arc_deg", "Semi-arc range ±",
     "Half-width of the semi-arc range the budget spans, about the working semi-arc"),
)
"""The budget's range entries: (key as in ``core.tuning.BudgetRanges``, label, tooltip)."""
RANGE_ROW_PADDING_PX = 2  # a range entry's row is this much taller than the entry
_COLUMNS = ("Figure", "Value", "Unit", "Δ baseline")
_RIGHT = Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter
LABEL_PADDING_PX = 14  # item padding and text margins around a label, px


class ReadoutPanel(QWidget):
    """Right panel: figures, rate budget, warnings and cautions of the latest result.

    Signals
    -------
    trimHeightChanged(object) : the height (m below the pivot, SI) at which to quote the trim
        weight's effect, chosen by the person.
    budgetRangeChanged(str, float) : a budget half-width typed or stepped: its key (as in
        ``core.tuning.BudgetRanges``) and value (K, hPa or degrees).
    """

    trimHeightChanged = Signal(object)
    budgetRangeChanged = Signal(str, float)

    def __init__(self, system: UnitSystem = UnitSystem.METRIC,
                 parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setObjectName("ReadoutPanel")
        self._system = system
        self._result: Result | None = None
        self._baseline: Result | None = None
        self._items: dict[str, tuple[QTreeWidgetItem, str, str]] = {}
        self._labels: dict[str, str] = {}
        self._purpose = ""
        self._budget_items: list[QTreeWidgetItem] = []
        self.budget_fields: dict[str, NumberField] = {}
        self._range_items: dict[str, QTreeWidgetItem] = {}
        self._budget_labels: list[str] = []
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
        theme.set_role(self.trim_problem, "problem")
        self.trim_problem.setWordWrap(True)
        self.trim_problem.setVisible(False)
        layout.addWidget(self.trim_problem)
        self.splitter = QSplitter(Qt.Orientation.Vertical)
        self.splitter.setChildrenCollapsible(False)
        self.tree = self._build_tree()
        self._cells = TreeCells(self.tree)
        self.splitter.addWidget(self._build_figures())
        self.notes = NotesPane()
        self.splitter.addWidget(self.notes)
        self.splitter.setStretchFactor(0, 3)
        self.splitter.setStretchFactor(1, 1)
        self.splitter.setSizes([560, 220])
        layout.addWidget(self.splitter, 1)
        self._fit_timer = QTimer(self)
        self._fit_timer.setSingleShot(True)
        self._fit_timer.setInterval(0)
        self._fit_timer.timeout.connect(lambda: self.notes.fit_in(self.splitter))
        self._style()
        self._units = self._units_in(system)  # each figure's unit, by key

    def _style(self) -> None:
        """The workbench's look, with no style sheet over the figures' tree: under one (Qt's
        style-sheet style) each repaint of the tree took 2.4 ms against 1.8 ms (measured),
        and a drag repaints it on every step. The sheet goes on the parts that need it."""
        theme.colour_window(self)
        for part in (self.compute_problem, self.notes, self.tree.header()):
            part.setStyleSheet(theme.STYLE_SHEET)
        theme.flat_scrollbars(self.tree)

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
        theme.set_role(self.trim_unit, "unit")
        below = QLabel("below pivot")
        theme.set_role(below, "hint")
        label.setBuddy(self.trim_field)
        row.addWidget(label)
        row.addWidget(self.trim_field, 1)
        row.addWidget(self.trim_unit)
        row.addWidget(below)
        return row

    def _build_figures(self) -> QWidget:
        """The tree, and under it why a budget range was refused (beside the budget, the
        tree's last section)."""
        pane = QWidget()
        column = QVBoxLayout(pane)
        column.setContentsMargins(0, 0, 0, 0)
        column.setSpacing(3)
        column.addWidget(self.tree, 1)
        self.budget_problem = QLabel()
        theme.set_role(self.budget_problem, "problem")
        self.budget_problem.setWordWrap(True)
        self.budget_problem.setVisible(False)
        self.budget_problem.setTextInteractionFlags(
            Qt.TextInteractionFlag.TextSelectableByMouse)
        column.addWidget(self.budget_problem)
        return pane

    def _build_tree(self) -> QTreeWidget:
        tree = QTreeWidget()
        tree.setColumnCount(len(_COLUMNS))
        tree.setHeaderLabels(list(_COLUMNS))
        tree.setRootIsDecorated(False)
        tree.setAlternatingRowColors(True)
        theme.colour_list(tree)
        # Rows are as tall as their text, the budget's range rows as tall as an entry; new
        # texts do not measure rows again (see :class:`app.readout.cells.TreeCells`).
        tree.setUniformRowHeights(False)
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
        self._heads: dict[str, QTreeWidgetItem] = {}
        for section, rows in SECTIONS:
            head = self._section_item(tree, section, bold, section_brush)
            self._heads[section] = head
            labels.append(section)
            if section == "Tuning":  # the budget follows the sensitivities it adds up
                self._add_budget_section(tree, bold, section_brush, labels)
            for key, label, unit, fmt in rows:
                item = QTreeWidgetItem(head, [label, "", unit, ""])
                item.setTextAlignment(1, _RIGHT)
                item.setTextAlignment(3, _RIGHT)
                item.setToolTip(0, describe(key))
                self._items[key] = (item, unit, fmt)
                self._labels[key] = label
                labels.append(label)
                labels.extend(figure_label(key, label, None, system)[0] for system in UnitSystem)
        tree.expandAll()
        tree.itemExpanded.connect(lambda head: mark_section(self._cells, head))
        tree.itemCollapsed.connect(lambda head: mark_section(self._cells, head))
        tree.itemClicked.connect(toggle_section)
        tree.setColumnHidden(3, True)
        # The label column fits the longest label, measured once here (these labels never
        # change; measuring on every update was what made live drags slow): the tree may not
        # be squeezed narrower than that plus the other columns on view. The budget's lines
        # carry their ranges and are measured when their text changes (a new range or unit).
        self._label_width = (max(metrics.horizontalAdvance(text) for text in labels)
                             + LABEL_PADDING_PX)
        self._budget_label_width = 0
        self._tree_extra = tree.verticalScrollBar().sizeHint().width() + 2 * tree.frameWidth()
        tree.setMinimumWidth(self._tree_width(tree, delta=False))
        return tree

    def _add_budget_section(self, tree: QTreeWidget, bold: QFont, brush: QBrush,
                            labels: list[str]) -> None:
        """The rate budget's head (placed after Tuning) and its range entries."""
        self._budget_head = self._section_item(tree, BUDGET_SECTION, bold, brush)
        self._heads[BUDGET_SECTION] = self._budget_head
        for key, label, tip in BUDGET_RANGES:
            labels.append(label)
            self._add_range_entry(tree, key, label, tip)

    def _add_range_entry(self, tree: QTreeWidget, key: str, label: str, tip: str) -> None:
        """A row of the budget section holding the entry of one range's half-width (in the
        Value column, its unit beside it)."""
        field = NumberField(field_unit(f"budget.{key}", self._system))
        field.setAccessibleName(f"budget.{key}")
        field.setToolTip(tip)
        field.changing.connect(lambda si, k=key: self._on_range_edited(k, si))
        field.changed.connect(lambda si, _stepping, k=key: self._on_range_edited(k, si))
        field.problemChanged.connect(lambda _text: self._show_range_problems())
        item = QTreeWidgetItem(self._budget_head, [label, "", field.unit().text, ""])
        item.setFlags(Qt.ItemFlag.ItemIsEnabled)
        item.setToolTip(0, f"{tip}.")
        tree.setItemWidget(item, 1, field)
        self.budget_fields[key] = field
        self._range_items[key] = item
        self._fit_range_row(key)

    def _fit_range_row(self, key: str) -> None:
        """Make a range entry's row as tall as the entry (styled as it will be drawn)."""
        field = self.budget_fields[key]
        field.ensurePolished()
        height = field.sizeHint().height() + RANGE_ROW_PADDING_PX
        item = self._range_items[key]
        if item.sizeHint(1).height() != height:
            item.setSizeHint(1, QSize(field.minimumSizeHint().width(), height))

    def showEvent(self, event: QShowEvent) -> None:  # Qt override
        """The entries have their final style once shown: fit their rows to it."""
        for key in self._range_items:
            self._fit_range_row(key)
        super().showEvent(event)
        self.fit_notes()

    def resizeEvent(self, event: QResizeEvent) -> None:  # Qt override
        super().resizeEvent(event)
        self.fit_notes()

    def _tree_width(self, tree: QTreeWidget, delta: bool) -> int:
        """Least tree width that shows every label whole, px."""
        header = tree.header()
        columns = (1, 2, 3) if delta else (1, 2)
        label = max(self._label_width, self._budget_label_width)
        return label + sum(header.sectionSize(c) for c in columns) + self._tree_extra

    def _show_delta_column(self, show: bool) -> None:
        """Show or hide the Δ baseline column; the panel widens to keep the labels whole."""
        self.tree.setColumnHidden(3, not show)
        self._fit_least_width()

    def _fit_least_width(self) -> None:
        """The panel's least width: whole labels and the columns on view."""
        show = not self.tree.isColumnHidden(3)
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

    # ================================================================== updates
    def set_unit_system(self, system: UnitSystem) -> None:
        """Show figures in ``system``'s units."""
        self._system = system
        self._units = self._units_in(system)
        self.trim_field.set_unit(field_unit("trim_height_m", system))
        self.trim_unit.setText(self.trim_field.unit().text)
        for key, field in self.budget_fields.items():
            field.set_unit(field_unit(f"budget.{key}", system))
            self._cells.set_text(self._range_items[key], 2, field.unit().text)
        if self._result is not None:
            self.show_result(self._result, self._baseline)

    def show_result(self, result: Result, baseline: Result | None = None) -> None:
        """Show every figure of ``result`` (and differences from ``baseline`` when given)."""
        self._result, self._baseline = result, baseline
        report = result.report_dict()
        base = baseline.report_dict() if baseline is not None else None
        if self._own_min_width is None or self.tree.isColumnHidden(3) != (base is None):
            self._show_delta_column(base is not None)
        cells: list[tuple[QTreeWidgetItem, int, str]] = []
        for key, (item, _unit, fmt) in self._items.items():
            shown = self._units[key]
            label, factor = figure_label(key, self._labels[key], result, self._system)
            if factor != 1.0:
                shown = ReadoutUnit(shown.text, shown.scale * factor)
            cells.append((item, 0, label))
            cells.append((item, 1, format_value(convert(report.get(key), shown), fmt)))
            cells.append((item, 2, shown.text))
            cells.append((item, 3, "" if base is None else delta_text(report.get(key),
                                                                      base.get(key),
                                                                      shown.scale, fmt)))
        self._cells.write(cells)
        self._show_budget(result)
        self._show_notes(result)
        design = result.design
        exhibit = (design.purpose == "exhibit" or design.exhibit is not None
                   or design.target.target_period_s is None)  # no target: no time to keep
        purpose = "exhibit" if exhibit else "clock"
        if purpose != self._purpose:  # kept otherwise: what the person opened or closed
            self._purpose = purpose
            arrange_sections(self.tree, self._heads, self._cells, purpose)
        if not self.trim_field.hasFocus():
            self.trim_field.set_value(result.sensitivities.trim_height_m)
        self.show_compute_problem("")

    def _units_in(self, system: UnitSystem) -> dict[str, ReadoutUnit]:
        """Each figure's unit in ``system`` (worked out when the system is chosen, not on every
        result)."""
        return {key: readout_unit(unit, system) for key, (_item, unit, _fmt) in self._items.items()}

    def _show_budget(self, result: Result) -> None:
        rows, tips = budget_rows(result, self._system)
        self._fit_budget_labels([label for label, _value, _unit in rows])
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
            self._cells.write([(item, column, text) for column, text in enumerate(rows[i])])
            self._cells.set_tip(item, tips[i])

    def _fit_budget_labels(self, labels: list[str]) -> None:
        """Widen the label column when a budget line's label (range and unit) needs it; the
        labels are measured only when they change."""
        if labels == self._budget_labels:
            return
        self._budget_labels = labels
        metrics = self.tree.fontMetrics()
        width = max(metrics.horizontalAdvance(text) for text in labels) + LABEL_PADDING_PX
        if width != self._budget_label_width:
            self._budget_label_width = width
            self._fit_least_width()

    def _show_notes(self, result: Result) -> None:
        if (result.warnings, result.cautions) != self._notes_shown:
            self._notes_shown = (result.warnings, result.cautions)
            self.notes.show_notes(result.warnings, result.cautions)
            self.fit_notes()

    def fit_notes(self) -> None:
        """Give the notes only the height they need (at most half the column), once the
        layout has settled (their height depends on the width)."""
        self._fit_timer.start()

    def show_compute_problem(self, message: str) -> None:
        """Say that the design shown cannot be computed (figures stay at the last good one)."""
        self.compute_problem.setText(message)
        self.compute_problem.setVisible(bool(message))

    def show_trim_problem(self, message: str) -> None:
        """Mark the trim-height entry with a refusal sentence ("" clears)."""
        self.trim_field.set_problem(message)
        self.trim_problem.setText(message)
        self.trim_problem.setVisible(bool(message))

    def set_budget_ranges(self, ranges: BudgetRanges) -> None:
        """Show the budget's half-widths in use (a ``core.tuning.BudgetRanges``); clears any
        refusal. Emits nothing."""
        for key, field in self.budget_fields.items():
            field.set_value(float(getattr(ranges, key)))

    def show_budget_problem(self, key: str, message: str) -> None:
        """Mark the half-width entry ``key`` with why it was refused ("" clears)."""
        self.budget_fields[key].set_problem(message)

    def budget_problem_text(self) -> str:
        """The refusal shown under the budget ("" when none)."""
        return self.budget_problem.text() if self.budget_problem.isVisibleTo(self) else ""

    def _show_range_problems(self) -> None:
        """Under the tree: why a range entry is refused (typed text, or the core's reason)."""
        message = next((f"{label.removesuffix(' ±')}: {self.budget_fields[key].problem()}"
                        for key, label, _tip in BUDGET_RANGES
                        if self.budget_fields[key].problem()), "")
        if message:
            message = message.rstrip()
            message += ("" if message.endswith((".", "!", "?")) else ".") + \
                " The budget still shows the last good ranges."
        self.budget_problem.setText(message)
        self.budget_problem.setVisible(bool(message))

    def _on_range_edited(self, key: str, si: float) -> None:
        self.budgetRangeChanged.emit(key, si)

    def value_text(self, key: str) -> str:
        """The shown value of figure ``key`` (as in ``Result.report_dict()``)."""
        return self._items[key][0].text(1)

    def _on_trim_changed(self, si: float, _stepping: bool) -> None:
        self.show_trim_problem("")
        self.trimHeightChanged.emit(si)


