"""A number entry in display units that never turns bad text into a number.

:class:`NumberField` is a spin box whose text is parsed by us: anything may be typed, and text
that is not a finite number is refused with a sentence instead of being coerced. It has two
change signals: ``changing`` on every arrow, wheel or button step (plots follow it live) and
``changed`` when an edit is finished (typed and confirmed, or the end of a run of steps), which
the undo history records. Values cross its boundary in SI units; the field converts with its
:class:`~app.form.units.FieldUnit`.
"""

from __future__ import annotations

import math

from PySide6.QtCore import QSize, Qt, QTimer, Signal
from PySide6.QtGui import QFocusEvent, QKeyEvent, QMouseEvent, QValidator, QWheelEvent
from PySide6.QtWidgets import QAbstractSpinBox, QWidget

from app import theme
from app.form.units import FieldUnit, format_sig

__all__ = ["NumberField", "NumberTextError", "parse_number", "format_number"]

_STEP_KEYS = {Qt.Key.Key_Up, Qt.Key.Key_Down, Qt.Key.Key_PageUp, Qt.Key.Key_PageDown}
SETTLE_MS = 400  # a run of wheel steps is one edit when no step follows within this time


class NumberTextError(ValueError):
    """Typed text that is not a usable number; the message says why in plain words."""


def parse_number(text: str) -> float:
    """The finite number written in ``text`` (surrounding spaces allowed).

    Raises
    ------
    NumberTextError
        For empty text, text that is not a number, NaN and infinities.
    """
    cleaned = text.strip().replace("−", "-")
    if not cleaned:
        raise NumberTextError("Type a number here; the field cannot be left empty.")
    try:
        value = float(cleaned)
    except ValueError:
        raise NumberTextError(f"“{text.strip()}” is not a number. Type digits, "
                              "for example 1.25 or 3e-4.") from None
    if not math.isfinite(value):
        raise NumberTextError(f"“{text.strip()}” is not a finite number.")
    return value


def format_number(value: float, decimals: int) -> str:
    """``value`` with at most ``decimals`` decimals, trailing zeros dropped (no “-0”)."""
    text = f"{value:.{decimals}f}"
    if "." in text:
        text = text.rstrip("0").rstrip(".")
    return "0" if text in ("-0", "") else text


class NumberField(QAbstractSpinBox):
    """Spin-box entry of one SI quantity shown in display units.

    Signals
    -------
    changing(float)
        SI value after each step while the person is still stepping (arrows, wheel, buttons).
    changed(float, bool)
        SI value of a finished edit; the flag is True when it ends a run of steps (consecutive
        step runs of one field may be merged into one undo step), False for a typed value.
    problemChanged(str)
        The sentence explaining why the entry is refused, or "" when it is fine.
    """

    changing = Signal(float)
    changed = Signal(float, bool)
    problemChanged = Signal(str)

    def __init__(self, unit: FieldUnit, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self._unit = unit
        self._good: float | None = None      # last value the design accepted, SI
        self._live: float | None = None      # value being stepped, SI
        self._stepping = False
        self._problem = ""
        self._help = ""
        self._settle = QTimer(self)
        self._settle.setSingleShot(True)
        self._settle.setInterval(SETTLE_MS)
        self._settle.timeout.connect(self.finish_steps)
        self.setFocusPolicy(Qt.FocusPolicy.StrongFocus)
        self.setAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        self.setAccelerated(True)
        self.setProperty("invalid", False)
        self.editingFinished.connect(self._commit_text)

    # ------------------------------------------------------------------ values
    def value(self) -> float | None:
        """The last accepted value, SI (None before one is set)."""
        return self._good

    def unit(self) -> FieldUnit:
        """The display unit."""
        return self._unit

    def set_value(self, si: float) -> None:
        """Show ``si`` as the accepted value (from the model: emits nothing, clears problems)."""
        self._good = self._live = float(si)
        text = self._format(si)
        if self.text() != text and not self._stepping_keeps_text(si):
            self.lineEdit().setText(text)
        self.set_problem("")

    def clear_value(self) -> None:
        """Show no value (an optional field left to the core); stepping is off until set."""
        self._settle.stop()
        self._stepping = False
        self._good = self._live = None
        self.lineEdit().setText("")
        self.set_problem("")

    def set_unit(self, unit: FieldUnit) -> None:
        """Change the display unit, keeping the value."""
        self._unit = unit
        if self._good is not None:
            self.lineEdit().setText(self._format(self._good))

    def _stepping_keeps_text(self, si: float) -> bool:
        return self._stepping and self._live is not None and self._live == si

    def _format(self, si: float) -> str:
        shown = self._unit.to_display(si)
        if shown and abs(shown) < 10.0 ** (2 - self._unit.decimals):
            return format_sig(shown, 6)  # a small value keeps its figures (0.000227 lb)
        return format_number(shown, self._unit.decimals)

    def set_help(self, text: str) -> None:
        """The tooltip shown while the entry is fine (a refusal sentence replaces it)."""
        self._help = text
        if not self._problem:
            self.setToolTip(text)

    # ------------------------------------------------------------------ problems
    def problem(self) -> str:
        """The current refusal sentence ("" when none)."""
        return self._problem

    def set_problem(self, message: str) -> None:
        """Mark the field (red outline via the ``invalid`` property) with ``message``; "" clears."""
        if message == self._problem:
            return
        self._problem = message
        theme.mark_invalid(self, bool(message))
        self.setToolTip(message or self._help)
        self.problemChanged.emit(message)

    # ------------------------------------------------------------------ stepping
    def stepEnabled(self) -> QAbstractSpinBox.StepEnabledFlag:  # Qt override
        if self.isReadOnly() or self._good is None:
            return QAbstractSpinBox.StepEnabledFlag.StepNone
        return (QAbstractSpinBox.StepEnabledFlag.StepUpEnabled
                | QAbstractSpinBox.StepEnabledFlag.StepDownEnabled)

    def stepBy(self, steps: int) -> None:  # Qt override
        """Move by ``steps`` display steps and emit ``changing`` (live)."""
        base = self._live if self._live is not None else self._good
        if base is None or steps == 0:
            return
        shown = round(self._unit.to_display(base) + steps * self._unit.step, self._unit.decimals)
        self.set_live_value(self._unit.to_si(shown))

    def set_live_value(self, si: float) -> None:
        """Show ``si`` as a value being dragged to and emit ``changing`` (the stepping path)."""
        self._live = float(si)
        self._stepping = True
        self.lineEdit().setText(self._format(si))
        self._settle.start()
        self.changing.emit(self._live)

    def finish_steps(self) -> None:
        """End a run of steps: emit ``changed`` once with the value reached."""
        self._settle.stop()
        if not self._stepping:
            return
        self._stepping = False
        if self._live is not None:
            self.changed.emit(self._live, True)

    def wheelEvent(self, event: QWheelEvent) -> None:  # Qt override
        """Wheel steps only a focused field, so scrolling the form never edits by accident."""
        if self.hasFocus():
            super().wheelEvent(event)
        else:
            event.ignore()

    def mouseReleaseEvent(self, event: QMouseEvent) -> None:  # Qt override
        super().mouseReleaseEvent(event)
        self.finish_steps()

    def keyPressEvent(self, event: QKeyEvent) -> None:  # Qt override
        if event.key() == Qt.Key.Key_Escape and self._good is not None:
            self.lineEdit().setText(self._format(self._good))
            self.set_problem("")
            return
        super().keyPressEvent(event)

    def keyReleaseEvent(self, event: QKeyEvent) -> None:  # Qt override
        super().keyReleaseEvent(event)
        if event.key() in _STEP_KEYS and not event.isAutoRepeat():
            self.finish_steps()

    # ------------------------------------------------------------------ typed text
    def validate(self, text: str, pos: int) -> QValidator.State:  # type: ignore[override]
        """Every text may be typed; it is judged when the edit is finished."""
        return QValidator.State.Acceptable

    def fixup(self, text: str) -> str:
        """Never rewrite the text behind the person's back."""
        return text

    def _commit_text(self) -> None:
        if self._stepping:
            self.finish_steps()
            return
        text = self.text()
        if self._good is not None and text.strip() == self._format(self._good):
            if self._problem:
                self.set_problem("")
            return
        try:
            shown = parse_number(text)
        except NumberTextError as exc:
            self.set_problem(str(exc))
            return
        self.changed.emit(self._unit.to_si(shown), False)

    def focusOutEvent(self, event: QFocusEvent) -> None:  # Qt override
        """Finish any steps; unparseable text goes back to the last good value."""
        self.finish_steps()
        super().focusOutEvent(event)
        try:
            parse_number(self.text())
        except NumberTextError:
            if self._good is not None:
                self.lineEdit().setText(self._format(self._good))
                self.set_problem("")

    # ------------------------------------------------------------------ size
    def sizeHint(self) -> QSize:  # Qt override
        return QSize(118, super().sizeHint().height())

    def minimumSizeHint(self) -> QSize:  # Qt override
        return QSize(64, super().minimumSizeHint().height())
