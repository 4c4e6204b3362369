"""Rows of the design form: a number with its unit, an optional number, a choice, a name.

Each row knows the field path it edits (``parts[2].mount.centre_m``), emits requests to change
it, and can be marked with a sentence saying why an entry was refused. Rows never edit the
design themselves; the design panel applies their requests to the document.
"""

from __future__ import annotations

from typing import Any

from PySide6.QtCore import QSignalBlocker, Qt, Signal
from PySide6.QtWidgets import (
    QCheckBox,
    QComboBox,
    QHBoxLayout,
    QLabel,
    QLineEdit,
    QSizePolicy,
    QVBoxLayout,
    QWidget,
)

from app import theme
from app.form.number_field import NumberField
from app.form.units import UnitSystem, field_unit, format_sig

__all__ = ["Row", "NumberRow", "ChoiceRow", "TextRow"]


class Row(QWidget):
    """Base of every form row: the editing widgets on one line, a refusal sentence below."""

    def __init__(self, path: str, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.path = path
        outer = QVBoxLayout(self)
        outer.setContentsMargins(0, 0, 0, 0)
        outer.setSpacing(2)
        self.line = QHBoxLayout()
        self.line.setContentsMargins(0, 0, 0, 0)
        self.line.setSpacing(6)
        outer.addLayout(self.line)
        self.problem_label = QLabel(self)
        theme.set_role(self.problem_label, "problem")
        self.problem_label.setWordWrap(True)
        self.problem_label.setVisible(False)
        self.problem_label.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        outer.addWidget(self.problem_label)

    def editor(self) -> QWidget:  # pragma: no cover - every row overrides it
        raise NotImplementedError

    def set_help(self, text: str) -> None:
        """The field table's help sentence, as the tooltip of the row's entry."""
        widget = self.editor()
        if isinstance(widget, NumberField):
            widget.set_help(text)
        else:
            widget.setToolTip(text)

    def mark(self, message: str) -> None:
        """Outline the entry in red and say why below it; "" clears the mark."""
        self.problem_label.setText(message)
        self.problem_label.setVisible(bool(message))
        widget = self.editor()
        if isinstance(widget, NumberField):
            widget.set_problem(message)
        elif bool(widget.property("invalid")) != bool(message):
            theme.mark_invalid(widget, bool(message))

    def problem(self) -> str:
        """The refusal sentence shown ("" when none)."""
        return "" if self.problem_label.isHidden() else self.problem_label.text()

    def set_from_design(self, value: Any) -> None:  # pragma: no cover - overridden
        raise NotImplementedError


class NumberRow(Row):
    """A numeric field with its unit; optionally preceded by a check box for fields that may
    be null in the file (null shown as ``placeholder``).

    Signals
    -------
    changing(str, float) : path and SI value while stepping (live).
    changed(str, float, bool) : path, SI value and whether it ends a run of steps.
    cleared(str) : path whose check box was unticked (the field becomes null).
    enabled(str) : path whose check box was ticked (the field needs a value).
    """

    changing = Signal(str, float)
    changed = Signal(str, float, bool)
    cleared = Signal(str)
    enabled = Signal(str)

    def __init__(self, path: str, system: UnitSystem, optional: str | None = None,
                 placeholder: str = "", parent: QWidget | None = None) -> None:
        super().__init__(path, parent)
        self.check: QCheckBox | None = None
        self._core_shown: tuple[float | None, str] = (None, "")
        self._written: tuple[Any, ...] | None = None  # what set_from_design last left shown
        if optional is not None:
            self.check = QCheckBox(optional, self)
            self.check.toggled.connect(self._on_toggled)
            self.line.addWidget(self.check)
        self.field = NumberField(field_unit(path, system), self)
        self.field.setSizePolicy(QSizePolicy.Policy.Expanding, QSizePolicy.Policy.Fixed)
        self.field.setAccessibleName(path)
        self.field.lineEdit().setPlaceholderText(placeholder)
        self.unit_label = QLabel(self)
        theme.set_role(self.unit_label, "unit")
        self.unit_label.setMinimumWidth(34)
        self.line.addWidget(self.field, 1)
        self.line.addWidget(self.unit_label)
        self._update_unit_label()
        self.field.changing.connect(lambda v: self.changing.emit(self.path, v))
        self.field.changed.connect(lambda v, stepping: self.changed.emit(self.path, v, stepping))
        self.field.problemChanged.connect(self._on_field_problem)

    def editor(self) -> QWidget:
        return self.field

    def set_unit_system(self, system: UnitSystem) -> None:
        """Show the value in ``system``'s unit."""
        self.field.set_unit(field_unit(self.path, system))
        self._update_unit_label()
        self.show_core_value(*self._core_shown)

    def _update_unit_label(self) -> None:
        self.unit_label.setText(self.field.unit().text)

    def set_from_design(self, value: Any) -> None:
        """Show the design's value (None: an optional field left to the core). Nothing is
        redone when the row still shows what the last call left (a drag changes one field
        at a time; rewriting the other ~30 cost ~1 ms a step)."""
        if self._written is not None and self._written == self._shown_state(value):
            return
        if self.check is not None:
            with QSignalBlocker(self.check):
                self.check.setChecked(value is not None)
            self.field.setEnabled(value is not None)
        if value is None:
            self.field.clear_value()
        else:
            self.field.set_value(float(value))
        self.mark("")
        self._written = self._shown_state(value)

    def _shown_state(self, value: Any) -> tuple[Any, ...]:
        """The design's value with what the row shows now: its text, tick and mark."""
        checked = None if self.check is None else self.check.isChecked()
        return (value, self.field.text(), checked, self.field.isEnabled(), self.problem())

    def show_core_value(self, si: float | None, fallback: str) -> None:
        """While the optional field is unticked, show the core's own value greyed out (or
        ``fallback`` text when it has none)."""
        self._core_shown = (si, fallback)
        if si is None:
            text = fallback
        else:
            text = format_sig(self.field.unit().to_display(si), 5)
        if self.field.lineEdit().placeholderText() != text:
            self.field.lineEdit().setPlaceholderText(text)

    def _on_toggled(self, checked: bool) -> None:
        self.field.setEnabled(checked)
        if checked:
            self.enabled.emit(self.path)
        else:
            self.cleared.emit(self.path)

    def _on_field_problem(self, message: str) -> None:
        self.problem_label.setText(message)
        self.problem_label.setVisible(bool(message))


class ChoiceRow(Row):
    """A drop-down choice: shown labels, stored keys.

    Signals
    -------
    chosen(str, str) : path and the chosen key.
    """

    chosen = Signal(str, str)

    def __init__(self, path: str, choices: list[tuple[str, str]],
                 parent: QWidget | None = None) -> None:
        super().__init__(path, parent)
        self.combo = QComboBox(self)
        self.combo.setAccessibleName(path)
        self.combo.setSizePolicy(QSizePolicy.Policy.Expanding, QSizePolicy.Policy.Fixed)
        self.combo.setSizeAdjustPolicy(
            QComboBox.SizeAdjustPolicy.AdjustToMinimumContentsLengthWithIcon)
        self.combo.setMinimumContentsLength(10)
        self.line.addWidget(self.combo, 1)
        self._choices: tuple[tuple[str, str], ...] = ()
        self.set_choices(choices)
        self.combo.activated.connect(self._on_activated)

    def editor(self) -> QWidget:
        return self.combo

    def set_choices(self, choices: list[tuple[str, str]]) -> None:
        """Replace the (key, label) choices without emitting (nothing is redone when they are
        the ones listed: a drag writes the whole form on each step)."""
        if tuple(choices) == self._choices and self.combo.count() == len(choices):
            return
        self._choices = tuple(choices)
        with QSignalBlocker(self.combo):
            current = self.combo.currentData()
            self.combo.clear()
            for key, label in choices:
                self.combo.addItem(label, key)
            index = self.combo.findData(current)
            if index >= 0:
                self.combo.setCurrentIndex(index)

    def set_from_design(self, value: Any) -> None:
        """Select the choice whose key is ``value``."""
        with QSignalBlocker(self.combo):
            index = self.combo.findData(value)
            if index < 0 and value is not None:
                self.combo.addItem(str(value), value)
                index = self.combo.count() - 1
            self.combo.setCurrentIndex(index)
        self.mark("")

    def _on_activated(self, index: int) -> None:
        self.chosen.emit(self.path, str(self.combo.itemData(index)))


class TextRow(Row):
    """A short text (a name), applied when editing is finished.

    Signals
    -------
    edited(str, str) : path and the new text.
    """

    edited = Signal(str, str)

    def __init__(self, path: str, parent: QWidget | None = None) -> None:
        super().__init__(path, parent)
        self.edit = QLineEdit(self)
        self.edit.setAccessibleName(path)
        self.edit.setMaxLength(200)
        self.line.addWidget(self.edit, 1)
        self._shown = ""
        self.edit.editingFinished.connect(self._on_finished)

    def editor(self) -> QWidget:
        return self.edit

    def set_from_design(self, value: Any) -> None:
        """Show the design's text."""
        self._shown = str(value)
        if self.edit.text() != self._shown:
            with QSignalBlocker(self.edit):
                self.edit.setText(self._shown)
                if not self.edit.hasFocus():
                    self.edit.setCursorPosition(0)  # a long name shows its beginning
        self.mark("")

    def _on_finished(self) -> None:
        if self.edit.text() != self._shown:
            self.edited.emit(self.path, self.edit.text())
