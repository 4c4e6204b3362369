"""The suspension group of the design form, with a spring given by its stiffness or by its
blades, and the rows of format-2 mountings in the part editor (a rod hanging from another
part's end, a bob's support on a sleeve, a bob's hole).

A mixin of :class:`~app.form.design_panel.DesignPanel`: the panel owns the document, the row
builders and the refusal marks. The derived stiffness and the blades' clamp stresses are the
core's figures (:attr:`core.Result.suspension_stiffness_n_m_per_rad`,
:attr:`core.Result.blade_stresses`), shown with the core's caution.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

from PySide6.QtCore import QSignalBlocker
from PySide6.QtWidgets import QFormLayout, QLabel, QWidget

from app import theme
from app.form import mounting_edits
from app.form.field_rows import ChoiceRow, Row
from app.form.material_edits import material_choices
from app.form.units import UnitSystem, figure_text
from core import Design, DesignError, Result
from core.blades import SPRING_STRESS_CAUTION
from core.fields import CHOICES, choice_label, field_spec

if TYPE_CHECKING:
    from app.document.document import Document
    from app.form.field_rows import NumberRow

__all__ = ["SuspensionSection", "KeyedChoiceRow"]

_SUSPENSIONS = [(k, choice_label("suspension", k)) for k in ("knife_edge", "spring")]
_BLADE_KEYS = ("count", "material", "width_m", "thickness_m", "free_length_m")
GIVEN_PATH = "suspension.given"
_SHORT_CAUTION = ("Ideal elastic figures with no safety factor; Penduline does not certify a "
                  "suspension spring (see the cautions).")


class KeyedChoiceRow(ChoiceRow):
    """A choice whose key is not a value of the file (where a rod hangs, how the spring is
    given): the panel's generic writer leaves it alone and :meth:`select` sets it."""

    def set_from_design(self, value: Any) -> None:
        self.mark("")

    def select(self, key: str) -> None:
        """Show the choice ``key`` without emitting."""
        with QSignalBlocker(self.combo):
            self.combo.setCurrentIndex(self.combo.findData(key))


def set_label(form: QFormLayout, row: QWidget, text: str) -> None:
    """Put ``text`` in the form's label of ``row``."""
    label = form.labelForField(row)
    if isinstance(label, QLabel):
        label.setText(text)


class SuspensionSection:
    """Builds the suspension group and the mounting rows; handles their choices."""

    if TYPE_CHECKING:  # the panel's
        document: Document
        _rows: dict[str, Row]
        _part_rows: dict[str, Row]
        _selected: int
        _result: Result | None
        _system: UnitSystem
        part_form: QFormLayout

        def _group(self, title: str) -> QFormLayout: ...

        def _number(self, form: QFormLayout, path: str, optional: str | None = None,
                    placeholder: str = "", registry: dict[str, Row] | None = None
                    ) -> NumberRow: ...

        def _choice(self, form: QFormLayout, path: str, choices: list[tuple[str, str]],
                    registry: dict[str, Row] | None = None) -> ChoiceRow: ...

        def _add(self, form: QFormLayout, row: Row, registry: dict[str, Row] | None) -> None: ...

        def _on_chosen(self, path: str, key: str) -> None: ...

        def _apply(self, make: Any, path: str, text: str, mergeable: bool = False) -> bool: ...

        def show_refusal(self, path: str, error: DesignError) -> None: ...

        def _write_values(self, design: Design) -> None: ...

    # ------------------------------------------------------------------ building
    def _keyed(self, form: QFormLayout, path: str, choices: list[tuple[str, str]], label: str,
               registry: dict[str, Row] | None = None) -> KeyedChoiceRow:
        row = KeyedChoiceRow(path, choices)
        row.chosen.connect(self._on_chosen)
        self._add(form, row, registry)
        set_label(form, row, label)
        return row

    def _build_suspension_group(self) -> None:
        form = self._group("Suspension")
        self._suspension_form = form
        self._choice(form, "suspension.kind", _SUSPENSIONS)
        self._given_row = self._keyed(form, GIVEN_PATH, mounting_edits.SPRING_GIVEN,
                                      "Spring given by")
        self._number(form, "suspension.stiffness_n_m_per_rad")
        self._blade_rows: list[Row] = []
        for key in _BLADE_KEYS:
            path = f"suspension.blades.{key}"
            row: Row = (self._choice(form, path, material_choices(self.document.design))
                        if key == "material" else self._number(form, path))
            set_label(form, row, field_spec(path).label)
            self._blade_rows.append(row)
        self.spring_figures = QLabel()
        self.spring_figures.setObjectName("SpringFigures")
        self.spring_figures.setWordWrap(True)
        form.addRow(self.spring_figures)
        self.spring_caution = QLabel(_SHORT_CAUTION)
        self.spring_caution.setToolTip(SPRING_STRESS_CAUTION)
        theme.set_role(self.spring_caution, "hint")
        self.spring_caution.setWordWrap(True)
        form.addRow(self.spring_caution)

    def _build_hang_row(self, design: Design, part: Any, at: str) -> bool:
        """The rod's “hangs from” choice; True when its top is given (hangs from the pivot)."""
        row = self._keyed(self.part_form, f"{at}.hangs_from",
                          mounting_edits.hang_choices(design, self._selected), "Hangs from",
                          self._part_rows)
        key = (mounting_edits.PIVOT if part.hangs_from is None else
               mounting_edits.hang_key(part.hangs_from.part, part.hangs_from.end))
        row.select(key)
        return part.hangs_from is None

    def _build_bob_extras(self, part: Any, at: str) -> None:
        """A bob on a sleeve rests on its bottom or its centre; any bob may have a hole."""
        form, reg = self.part_form, self._part_rows
        if part.mount.kind == "on_sleeve":
            row = self._choice(form, f"{at}.support", list(CHOICES["support"].items()), reg)
            set_label(form, row, field_spec(f"{at}.support", "bob").label)
        hole = self._number(form, f"{at}.hole_diameter_m", optional="Hole",
                            placeholder="no hole", registry=reg)
        set_label(form, hole, field_spec(f"{at}.hole_diameter_m", "bob").label)

    # ------------------------------------------------------------------ model → widgets
    def _write_suspension(self, design: Design) -> None:
        spring = design.suspension.kind == "spring"
        blades = design.suspension.blades is not None
        self._given_row.select("blades" if blades else "stiffness")
        material_row = self._rows["suspension.blades.material"]
        assert isinstance(material_row, ChoiceRow)
        material_row.set_choices(material_choices(design))
        if blades:
            material_row.set_from_design(design.suspension.blades.material)  # type: ignore[union-attr]
        shown = {GIVEN_PATH: spring, "suspension.stiffness_n_m_per_rad": spring and not blades}
        shown.update({row.path: spring and blades for row in self._blade_rows})
        for path, visible in shown.items():
            self._show_row(self._rows[path], visible)
        self.spring_figures.setVisible(spring)
        self.spring_caution.setVisible(spring and blades)
        self._show_spring_figures(self._result)

    def _show_row(self, row: QWidget, visible: bool) -> None:
        row.setVisible(visible)
        label = self._suspension_form.labelForField(row)
        if label is not None:
            label.setVisible(visible)

    def _show_spring_figures(self, result: Result | None) -> None:
        """The spring's stiffness the model uses, and the blades' clamp stresses."""
        design = self.document.design
        if result is None or result.design != design or design.suspension.kind != "spring":
            self.spring_figures.setText("")
            return
        system = self._system
        k = figure_text(result.suspension_stiffness_n_m_per_rad, "N·m/rad", system)
        text = f"Stiffness used: {k}"
        if design.suspension.blades is not None:
            text = f"Stiffness from the blades: {k} (under the pendulum's weight)"
        s = result.blade_stresses
        if s is not None:
            m = design.material(design.suspension.blades.material)  # type: ignore[union-attr]
            peak, tension, bending = (figure_text(x / 1e6, "MPa", system, 3)
                                      for x in (s.peak_pa, s.tension_pa, s.bending_pa))
            text += f"\nClamp stress at the semi-arc: {peak} peak ({tension} tension + " \
                    f"{bending} bending)"
            if m.strength_pa is not None:
                text += (f"\nStrength of {m.label.lower()}: "
                         f"{figure_text(m.strength_pa / 1e6, 'MPa', system)}")
        self.spring_figures.setText(text)

    # ------------------------------------------------------------------ widgets → model
    def _chosen_here(self, path: str, key: str) -> bool:
        """Handle the choices this section owns; False for the panel's own."""
        design = self.document.design
        if path == "suspension.kind" and key == design.suspension.kind:
            return True  # unchanged (a spring keeps its blades)
        if path == GIVEN_PATH:
            k = self._result.suspension_stiffness_n_m_per_rad if self._result else None
            self._apply(lambda: mounting_edits.set_spring_given(design, key, k), path,
                        "Change how the spring is given")
            return True
        if path.endswith(".hangs_from"):
            index = self._selected
            if not self._apply(lambda: mounting_edits.set_hangs_from(design, index, key), path,
                               "Change where the rod hangs"):
                refusal = self._part_rows[path].problem()
                self._write_values(self.document.design)
                self._part_rows[path].mark(refusal)
            return True
        return False
