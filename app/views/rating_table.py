"""The rating log as an editable table: readings and adjustments in one time order.

The table never changes the log itself: a typed cell, a reading added "now" (Insert here;
Ctrl+R in the window), pasted rows (Ctrl+V) or deleted rows (Delete) become a new log through
:mod:`app.views.rating_edits` and are offered with :attr:`RatingTable.logEdited` (the new log
and the undo step's words); a refusal is offered with :attr:`RatingTable.refused` (one
sentence naming the row and the column), and the table keeps showing the last good log.
"""

from __future__ import annotations

from typing import Any

from PySide6.QtCore import QAbstractTableModel, QModelIndex, QPersistentModelIndex, Qt, Signal
from PySide6.QtGui import QBrush, QColor, QGuiApplication, QKeySequence, QShortcut
from PySide6.QtWidgets import QAbstractItemView, QHeaderView, QTableView, QWidget

from app import theme
from app.form.units import UnitSystem, readout_unit
from app.views import rating_edits as edits
from core import DesignError
from core.rating_log import RatingLog

__all__ = ["RatingTable", "RatingTableModel"]

ADJUSTMENT_BACKGROUND = "#f1ece0"
_WIDTHS = (172, 64, 64, 64, 80, 56, 110)  # px, the usual content of each column but the note
Index = QModelIndex | QPersistentModelIndex


class RatingTableModel(QAbstractTableModel):
    """Rows of a :class:`RatingLog` (see :func:`app.views.rating_edits.table_rows`)."""

    cellEdited = Signal(int, str, str)  # row, column key, text as typed

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.log: RatingLog = RatingLog()
        self.rows: list[edits.Row] = []
        self.system = UnitSystem.METRIC

    def set_log(self, log: RatingLog | None, system: UnitSystem | None = None) -> None:
        self.beginResetModel()
        self.log = log if log is not None else RatingLog()
        self.rows = edits.table_rows(self.log)
        if system is not None:
            self.system = system
        self.endResetModel()

    def rowCount(self, parent: Index = QModelIndex()) -> int:  # noqa: B008
        return 0 if parent.isValid() else len(self.rows)

    def columnCount(self, parent: Index = QModelIndex()) -> int:  # noqa: B008
        return 0 if parent.isValid() else len(edits.COLUMNS)

    def headerData(self, section: int, orientation: Qt.Orientation,
                   role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if orientation == Qt.Orientation.Vertical:
            return str(section + 1) if role == Qt.ItemDataRole.DisplayRole else None
        column = edits.COLUMNS[section]
        if role == Qt.ItemDataRole.DisplayRole:
            unit = readout_unit(column.unit, self.system).text if column.unit else ""
            return f"{column.heading} ({unit})" if unit else column.heading
        if role == Qt.ItemDataRole.ToolTipRole:
            return _TIPS.get(column.key)
        return None

    def flags(self, index: Index) -> Qt.ItemFlag:
        base = Qt.ItemFlag.ItemIsEnabled | Qt.ItemFlag.ItemIsSelectable
        if index.isValid() and edits.editable(self.rows[index.row()],
                                              edits.COLUMNS[index.column()].key):
            return base | Qt.ItemFlag.ItemIsEditable
        return base

    def data(self, index: Index, role: int = Qt.ItemDataRole.DisplayRole) -> Any:
        if not index.isValid():
            return None
        row, key = self.rows[index.row()], edits.COLUMNS[index.column()].key
        if role in (Qt.ItemDataRole.DisplayRole, Qt.ItemDataRole.EditRole):
            text = edits.cell_text(self.log, row, key, self.system)
            if key == "at" and role == Qt.ItemDataRole.DisplayRole:
                text = _short_time(text)
            if key == "amount" and row.kind == "adjustment" and text and \
                    role == Qt.ItemDataRole.DisplayRole:
                what = self.log.adjustments[row.index].what
                text = f"{text} {edits.AMOUNT_UNITS[what]}".strip()
            return text
        if role == Qt.ItemDataRole.BackgroundRole and row.kind == "adjustment":
            return QBrush(QColor(ADJUSTMENT_BACKGROUND))
        if role == Qt.ItemDataRole.TextAlignmentRole and key not in ("at", "what", "note"):
            return int(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        return None

    def setData(self, index: Index, value: Any, role: int = Qt.ItemDataRole.EditRole) -> bool:
        if role != Qt.ItemDataRole.EditRole or not index.isValid():
            return False
        key = edits.COLUMNS[index.column()].key
        if str(value) == edits.cell_text(self.log, self.rows[index.row()], key, self.system):
            return False
        self.cellEdited.emit(index.row(), key, str(value))
        return False  # the log changes only through the document


def _short_time(iso: str) -> str:
    """``2027-03-01T08:00:00+01:00`` shown as ``2027-03-01 08:00 +01:00`` (seconds when
    not zero); the cell's editor gets the full ISO text."""
    date, _, rest = iso.partition("T")
    clock, offset = rest[:8], rest[8:].split(".")[-1] if "." in rest[8:] else rest[8:]
    if "." in rest:
        clock, offset = rest[:8], rest[rest.index(".") + 7:]
    clock = clock[:5] if clock.endswith(":00") else clock
    return f"{date} {clock} {offset.replace('+00:00', 'UTC')}".strip()


_TIPS = {"temperature_c": "Room temperature, when noted",
         "pressure_hpa": "Air pressure, when noted",
         "semi_arc_deg": "Semi-arc (half the swing), degrees, when noted",
         "at": "When the clock was compared, ISO 8601 with its UTC offset "
               "(2027-03-01T08:00:00+01:00)",
         "what": "reading, or the adjustment: nut, trim, bob, set or other",
         "error_s": "Clock minus true time, s (positive: the clock is ahead)",
         "amount": "nut: turns up; trim: grams added; bob: mm lowered; set: s"}


class RatingTable(QTableView):
    """The table (see the module notes)."""

    logEdited = Signal(object, str)  # the new RatingLog, the undo step's text
    refused = Signal(str)

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.table_model = RatingTableModel(self)
        self.setModel(self.table_model)
        self.table_model.cellEdited.connect(self._on_cell_edited)
        self.setAlternatingRowColors(True)
        theme.colour_list(self)
        self.setSelectionBehavior(QAbstractItemView.SelectionBehavior.SelectRows)
        self.setEditTriggers(QAbstractItemView.EditTrigger.DoubleClicked
                             | QAbstractItemView.EditTrigger.EditKeyPressed
                             | QAbstractItemView.EditTrigger.AnyKeyPressed)
        self.verticalHeader().setDefaultSectionSize(22)
        header = self.horizontalHeader()
        header.setStretchLastSection(True)
        header.setSectionResizeMode(QHeaderView.ResizeMode.Interactive)
        self._fit_columns()
        # on the table itself, not its cell editor (where they keep their text meaning)
        for keys, slot in ((("Insert",), self.add_reading_now),
                           ((QKeySequence.StandardKey.Paste,), lambda: self.paste()),
                           ((QKeySequence.StandardKey.Delete, "Backspace"), self.delete_rows)):
            for key in keys:
                shortcut = QShortcut(QKeySequence(key), self)
                shortcut.setContext(Qt.ShortcutContext.WidgetShortcut)
                shortcut.activated.connect(slot)

    def _fit_columns(self) -> None:
        """Each column as wide as its usual content or its heading, whichever is wider."""
        metrics = self.horizontalHeader().fontMetrics()
        for column, width in enumerate(_WIDTHS):
            heading = str(self.table_model.headerData(column, Qt.Orientation.Horizontal))
            self.setColumnWidth(column, max(width, metrics.horizontalAdvance(heading) + 36))

    @property
    def log(self) -> RatingLog:
        return self.table_model.log

    def set_log(self, log: RatingLog | None, system: UnitSystem | None = None) -> None:
        """Show ``log`` (the current row stays where it can)."""
        current = self.currentIndex()
        changed_units = system is not None and system != self.table_model.system
        self.table_model.set_log(log, system)
        if changed_units:
            self._fit_columns()
        if current.isValid() and current.row() < self.table_model.rowCount():
            self.setCurrentIndex(self.table_model.index(current.row(), current.column()))

    # ------------------------------------------------------------------ edits
    def _offer(self, make: Any, text: str) -> bool:
        try:
            log = make()
        except DesignError as exc:
            self.refused.emit(f"{exc.field[:1].upper()}{exc.field[1:]}: {exc.reason}. "
                              "The log is unchanged.")
            return False
        self.logEdited.emit(log, text)
        return True

    def _on_cell_edited(self, row: int, key: str, text: str) -> None:
        model = self.table_model
        heading = next(c.heading for c in edits.COLUMNS if c.key == key)
        self._offer(lambda: edits.with_cell(model.log, model.rows, row, key, text, model.system),
                    f"Edit rating log: {heading.lower()}, row {row + 1}")

    def add_reading_now(self) -> None:
        """Add a reading at the present local time; the cursor goes to its error."""
        made: dict[str, int] = {}

        def make() -> RatingLog:
            log, made["row"] = edits.with_reading_now(self.table_model.log)
            return log

        before = self.table_model.rowCount()
        if self._offer(make, "Add a reading") and self.table_model.rowCount() > before:
            index = self.table_model.index(made["row"], 2)
            self.setCurrentIndex(index)
            self.scrollTo(index)
            if self.isVisible():
                self.edit(index)

    def paste(self, text: str | None = None) -> list[str]:
        """Add the rows of spreadsheet text (default: the clipboard's); returns the sentences
        about refused rows (also offered with :attr:`refused`)."""
        if text is None:
            text = QGuiApplication.clipboard().text()
        if not text.strip():
            return []
        messages: list[str] = []

        def make() -> RatingLog:
            log, messages[:] = edits.with_pasted(self.table_model.log, text)
            return log

        if self._offer(make, "Paste rows into the rating log") and messages:
            self.refused.emit("Some pasted rows were refused, the others kept: "
                              + "; ".join(messages) + ".")
        return messages

    def delete_rows(self) -> None:
        """Delete the selected rows (one undo step)."""
        numbers = sorted({i.row() for i in self.selectionModel().selectedIndexes()})
        if not numbers and self.currentIndex().isValid():
            numbers = [self.currentIndex().row()]
        if numbers:
            model = self.table_model
            self._offer(lambda: edits.with_rows_removed(model.log, model.rows, numbers),
                        f"Delete {len(numbers)} row(s) of the rating log")
