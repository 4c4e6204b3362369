"""The pivot position control of the design panel's suspension group.

The pivot's place along the body is not a field of the file: every position in a design is
measured down from the pivot, so moving the pivot moves every part. The control shows that
place as the distance from the top of the first rod down to the pivot (0: the rod hangs from
its top, as in the examples; more moves the pivot down the body) and turns a new value into one
edit through ``core.pivot.shift_pivot``, judged first by ``core.pivot.check_pivot_shift`` and
then by the core's validator. A value being stepped is previewed live; the finished edit is one
undo step (a run of steps merges into one); a refused value marks the row with the core's
sentence while the document keeps its last good design.

Every shift starts from the committed design (not from the live preview), so a drag never
accumulates rounding and undo restores the positions exactly.
"""

from __future__ import annotations

from PySide6.QtCore import QObject
from PySide6.QtWidgets import QFormLayout, QLabel, QWidget

from app.document.document import Document
from app.form.field_rows import NumberRow
from app.form.units import UnitSystem, field_unit
from core import Design, DesignError, design_from_dict, design_to_dict
from core.model import PendulumState, pendulum_state
from core.pivot import check_pivot_shift, shift_pivot

__all__ = ["PivotControl", "PivotRow", "PIVOT_PATH", "PIVOT_LABEL", "first_rod_index",
           "pivot_below_rod_top_m"]

PIVOT_PATH = "pivot"
"""What the control edits, as the core names it in its refusals (``DesignError.field``)."""
PIVOT_LABEL = "Pivot, below rod top"
_LENGTH_FIELD = "parts[0].top_m"  # a length of the design: the control shows the same unit
_EDIT_TEXT = "Move pivot"


def first_rod_index(design: Design) -> int | None:
    """Index of the first rod that hangs from the pivot (not from another part), or None."""
    for i, part in enumerate(design.parts):
        if part.kind == "rod" and getattr(part, "hangs_from", None) is None:
            return i
    return None


def pivot_below_rod_top_m(design: Design) -> float | None:
    """Distance from the first rod's top down to the pivot, m (None without such a rod)."""
    index = first_rod_index(design)
    return None if index is None else -float(design.parts[index].top_m)  # type: ignore[union-attr]


class PivotRow(NumberRow):
    """A number row showing a length in the window's unit system, for the pivot."""

    def __init__(self, system: UnitSystem, parent: QWidget | None = None) -> None:
        super().__init__(PIVOT_PATH, system, parent=parent)
        self.set_unit_system(system)

    def set_unit_system(self, system: UnitSystem) -> None:
        """Show the position in ``system``'s length unit."""
        self.field.set_unit(field_unit(_LENGTH_FIELD, system))
        self.unit_label.setText(self.field.unit().text)


class PivotControl(QObject):
    """The pivot row and the edits it makes on ``document``.

    Attributes
    ----------
    row : PivotRow, the row shown in the form (its ``field`` is the number entry).
    label : QLabel, the row's label.
    """

    def __init__(self, document: Document, system: UnitSystem,
                 parent: QObject | None = None) -> None:
        super().__init__(parent)
        self.document = document
        self.row = PivotRow(system)
        self.label = QLabel(PIVOT_LABEL)
        self.label.setBuddy(self.row.field)
        self._state_for: Design | None = None
        self._state: PendulumState | DesignError | None = None
        self.row.changing.connect(lambda _path, si: self.preview(si))
        self.row.changed.connect(lambda _path, si, stepping: self.commit(si, stepping))
        document.designChanged.connect(self.show_design)
        self.show_design(document.design)

    def add_to(self, form: QFormLayout) -> None:
        """Put the label and the row in ``form``."""
        form.addRow(self.label, self.row)

    def set_unit_system(self, system: UnitSystem) -> None:
        """Show the position in ``system``'s units."""
        self.row.set_unit_system(system)

    # ------------------------------------------------------------------ model → widget
    def show_design(self, design: Design) -> None:
        """Show where the pivot sits on ``design`` (disabled without a rod to measure from)."""
        index = first_rod_index(design)
        value = pivot_below_rod_top_m(design)
        self.row.setEnabled(value is not None)
        if value is None:
            self.row.field.clear_value()
            tip = "The pivot is measured from the top of a rod; this design has none."
        else:
            self.row.set_from_design(value)
            name = design.parts[index].name  # type: ignore[index]
            tip = (f"Where the pivot sits on the body: its distance down from the top of the "
                   f"rod “{name}” (0: the rod hangs from its top). A new value moves every "
                   "part at once; the pivot must stay on the body and above the centre of "
                   "mass.")
        self.label.setToolTip(tip)
        if not self.row.field.problem():
            self.row.field.setToolTip(tip)

    # ------------------------------------------------------------------ widget → model
    def moved(self, below_rod_top_m: float) -> Design:
        """The committed design with the pivot ``below_rod_top_m`` below the first rod's top.

        Raises
        ------
        DesignError
            ``field='pivot'`` (or the field the validator names) when it is refused.
        """
        base = self.document.committed_design
        now = pivot_below_rod_top_m(base)
        if now is None:
            raise DesignError(PIVOT_PATH, "the pivot is measured from the top of a rod, and "
                                          "this design has none")
        shift = float(below_rod_top_m) - now
        check_pivot_shift(self._committed_state(base), shift)
        return design_from_dict(shift_pivot(design_to_dict(base), shift))

    def _committed_state(self, base: Design) -> PendulumState:
        """The committed design evaluated once (kept while it stays the committed one)."""
        if self._state_for is not base:
            self._state_for = base
            try:
                self._state = pendulum_state(base, slopes=False)
            except DesignError as exc:
                self._state = exc
        if isinstance(self._state, DesignError):
            raise DesignError(PIVOT_PATH, self._state.reason)
        assert self._state is not None
        return self._state

    def preview(self, below_rod_top_m: float) -> None:
        """Show the design with the pivot there live (a step of a drag)."""
        try:
            design = self.moved(below_rod_top_m)
        except DesignError as exc:
            self.refuse(exc)
            return
        self.document.preview(design)

    def commit(self, below_rod_top_m: float, stepping: bool) -> None:
        """Record the move as one undo step; a run of steps that ends on a refused value
        keeps (and records) its last good value, still marked."""
        try:
            design = self.moved(below_rod_top_m)
        except DesignError as exc:
            if stepping and self.document.design != self.document.committed_design:
                self.document.commit(self.document.design, _EDIT_TEXT, PIVOT_PATH, True)
            self.refuse(exc)
            return
        self.document.commit(design, _EDIT_TEXT, PIVOT_PATH, stepping)

    def refuse(self, error: DesignError) -> None:
        """Mark the row with the core's reason (the design is left as it was)."""
        reason = error.reason
        if error.field not in (PIVOT_PATH, "design", "file"):
            reason = f"{error.field}: {reason}"
        self.row.mark(reason[:1].upper() + reason[1:])
