"""The parts section of the design panel: the parts list, its buttons and the editor of the
selected part (rows made for that part's kind, shape and mounting)."""

from __future__ import annotations

from collections.abc import Callable
from typing import TYPE_CHECKING, Any

from PySide6.QtCore import QSignalBlocker, Qt
from PySide6.QtWidgets import (
    QFormLayout,
    QHBoxLayout,
    QLabel,
    QListWidget,
    QListWidgetItem,
    QMenu,
    QPushButton,
    QVBoxLayout,
    QWidget,
)

from app import theme
from app.form import design_edits
from app.form.field_rows import Row
from app.form.material_edits import material_choices
from app.form.panel_group import PanelGroup
from core import Design, DesignError, Result
from core.fields import choice_label

if TYPE_CHECKING:
    from app.document.document import Document
    from app.form.field_rows import ChoiceRow, NumberRow, TextRow

__all__ = ["PartsSection"]

_SHAPES = [(k, choice_label("shape", k)) for k in ("lens", "disc", "cylinder", "sphere")]
_MOUNTS = [(k, choice_label("mount", k)) for k in ("clamp", "on_sleeve")]


class PartsSection:
    """The parts list and part editor of :class:`~app.form.design_panel.DesignPanel` (a
    mixin: the panel owns the document, the row builders and the writing of values)."""

    if TYPE_CHECKING:  # the panel's
        document: Document
        partSelected: Any
        _layout: QVBoxLayout
        _part_rows: dict[str, Row]
        _selected: int
        _editor_signature: tuple[Any, ...]
        _result: Result | None

        def _number(self, form: QFormLayout, path: str, optional: str | None = None,
                    placeholder: str = "", registry: dict[str, Row] | None = None
                    ) -> NumberRow: ...

        def _choice(self, form: QFormLayout, path: str, choices: list[tuple[str, str]],
                    registry: dict[str, Row] | None = None) -> ChoiceRow: ...

        def _text(self, form: QFormLayout, path: str,
                  registry: dict[str, Row] | None = None) -> TextRow: ...

        def _write_values(self, design: Design) -> None: ...

        def set_result(self, result: Result) -> None: ...

        def _build_hang_row(self, design: Design, part: Any, at: str) -> bool: ...

        def _build_bob_extras(self, part: Any, at: str) -> None: ...

    def _build_parts_group(self) -> None:
        box = PanelGroup("Parts")
        outer = QVBoxLayout(box)
        outer.setContentsMargins(8, 6, 8, 6)
        self.parts_list = QListWidget()
        theme.colour_list(self.parts_list)
        theme.flat_scrollbars(self.parts_list)
        self.parts_list.setAccessibleName("parts")
        self.parts_list.setMaximumHeight(112)
        self.parts_list.currentRowChanged.connect(self._on_part_selected)
        outer.addWidget(self.parts_list)
        buttons = QHBoxLayout()
        self.add_button = QPushButton("Add part")
        menu = QMenu(self.add_button)
        for kind, label in design_edits.PART_KINDS.items():
            menu.addAction(label, self._add_part_action(kind))
        self.add_button.setMenu(menu)
        self.duplicate_button = QPushButton("Duplicate")
        self.duplicate_button.clicked.connect(self.duplicate_selected_part)
        self.remove_button = QPushButton("Remove")
        self.remove_button.clicked.connect(self.remove_selected_part)
        for b in (self.add_button, self.duplicate_button, self.remove_button):
            buttons.addWidget(b)
        buttons.addStretch(1)
        outer.addLayout(buttons)
        self.parts_problem = QLabel()
        theme.set_role(self.parts_problem, "problem")
        self.parts_problem.setWordWrap(True)
        self.parts_problem.setVisible(False)
        outer.addWidget(self.parts_problem)
        self.part_editor = QWidget()
        self.part_form = QFormLayout(self.part_editor)
        self.part_form.setContentsMargins(0, 4, 0, 0)
        self.part_form.setVerticalSpacing(5)
        self.part_form.setLabelAlignment(Qt.AlignmentFlag.AlignRight
                                         | Qt.AlignmentFlag.AlignVCenter)
        self.part_form.setFieldGrowthPolicy(QFormLayout.FieldGrowthPolicy.AllNonFixedFieldsGrow)
        outer.addWidget(self.part_editor)
        self._layout.addWidget(box)
    def _rebuild_part_editor(self, design: Design) -> None:
        while self.part_form.rowCount():
            self.part_form.removeRow(0)
        self._part_rows = {}
        if not 0 <= self._selected < len(design.parts):
            return
        part = design.parts[self._selected]
        at = f"parts[{self._selected}]"
        form, reg = self.part_form, self._part_rows
        self._text(form, f"{at}.name", reg)
        if part.kind == "bob":
            self._choice(form, f"{at}.shape", _SHAPES, reg)
        if part.kind != "weight":
            self._choice(form, f"{at}.material", material_choices(design), reg)
        if part.kind == "rod":
            top_given = self._build_hang_row(design, part, at)
            for key in ("top_m", "length_m", "diameter_m")[0 if top_given else 1:]:
                self._number(form, f"{at}.{key}", registry=reg)
        elif part.kind == "sleeve":
            self._choice(form, f"{at}.on", _names(design_edits.rod_names(design)), reg)
            for key in ("length_m", "outer_diameter_m", "inner_diameter_m"):
                self._number(form, f"{at}.{key}", registry=reg)
        elif part.kind == "bob":
            self._build_bob_rows(design, part, at)
        elif part.kind == "weight":
            self._choice(form, f"{at}.on", _names(design_edits.rod_names(design)), reg)
            self._number(form, f"{at}.at_m", registry=reg)
            self._number(form, f"{at}.mass_kg", registry=reg)
            return
        self._number(form, f"{at}.mass_kg", optional="Given", registry=reg)
    def _build_bob_rows(self, design: Design, part: Any, at: str) -> None:
        form, reg = self.part_form, self._part_rows
        self._choice(form, f"{at}.mount.kind", _MOUNTS, reg)
        names = (design_edits.rod_names(design) if part.mount.kind == "clamp"
                 else design_edits.sleeve_names(design))
        self._choice(form, f"{at}.mount.on", _names(names), reg)
        if part.mount.kind == "clamp":
            self._number(form, f"{at}.mount.centre_m", registry=reg)
        self._number(form, f"{at}.diameter_m", registry=reg)
        if part.shape in ("disc", "lens"):
            self._number(form, f"{at}.thickness_m", registry=reg)
        elif part.shape == "cylinder":
            self._number(form, f"{at}.height_m", registry=reg)
        self._build_bob_extras(part, at)
    def _signature(self, design: Design) -> tuple[Any, ...]:
        """What decides which rows the part editor has (rebuilt only when it changes)."""
        if not 0 <= self._selected < len(design.parts):
            return (self._selected,)
        p = design.parts[self._selected]
        return (self._selected, p.kind, getattr(p, "shape", None),
                getattr(getattr(p, "mount", None), "kind", None), getattr(p, "hangs_from", None),
                tuple((q.kind, q.name) for q in design.parts),
                tuple(m.key for m in design.materials))
    def _refresh_parts_list(self, design: Design) -> None:
        labels = [design_edits.part_label(p) for p in design.parts]
        current = [self.parts_list.item(i).text() for i in range(self.parts_list.count())]
        self._selected = min(max(self._selected, 0), len(design.parts) - 1)
        if labels != current:
            with QSignalBlocker(self.parts_list):
                self.parts_list.clear()
                for text in labels:
                    QListWidgetItem(text, self.parts_list)
        if self.parts_list.currentRow() != self._selected:
            with QSignalBlocker(self.parts_list):
                self.parts_list.setCurrentRow(self._selected)
        self.remove_button.setEnabled(len(design.parts) > 1)
    def selected_part(self) -> int:
        """Index of the part shown in the part editor."""
        return self._selected
    def select_part(self, index: int) -> None:
        """Show part ``index`` in the part editor."""
        self.parts_list.setCurrentRow(index)
    def show_parts_problem(self, message: str) -> None:
        """Say under the parts list why a part edit was refused."""
        self.parts_problem.setText(message)
        self.parts_problem.setVisible(bool(message))
    def _on_part_selected(self, index: int) -> None:
        if index < 0 or index == self._selected and self._part_rows:
            return
        self._selected = index
        design = self.document.design
        self._editor_signature = self._signature(design)
        self._rebuild_part_editor(design)
        self._write_values(design)
        if self._result is not None:
            self.set_result(self._result)
        self.partSelected.emit(index)
    def _add_part_action(self, kind: str) -> Callable[[], None]:
        def run() -> None:
            self.add_part(kind)
        return run
    def add_part(self, kind: str) -> bool:
        """Append a part of ``kind`` ("rod", "sleeve", "bob", "weight") and select it."""
        try:
            design, index = design_edits.add_part(self.document.design, kind)
        except DesignError as exc:
            self.show_parts_problem(exc.reason)
            return False
        self._selected = index
        self.document.commit(design, f"Add {design_edits.PART_KINDS[kind].lower()}", "parts")
        return True
    def duplicate_selected_part(self) -> bool:
        """Copy the selected part (with a new name) and select the copy."""
        try:
            design, index = design_edits.duplicate_part(self.document.design, self._selected)
        except DesignError as exc:
            self.show_parts_problem(f"Cannot duplicate: {exc.reason}")
            return False
        self._selected = index
        self.document.commit(design, "Duplicate part", "parts")
        return True
    def remove_selected_part(self) -> bool:
        """Remove the selected part (refused, with a reason, when another part hangs on it)."""
        try:
            design = design_edits.remove_part(self.document.design, self._selected)
        except DesignError as exc:
            self.show_parts_problem(f"Cannot remove: {exc.reason}")
            return False
        self._selected = max(0, self._selected - 1)
        self.document.commit(design, "Remove part", "parts")
        return True


def _names(names: list[str]) -> list[tuple[str, str]]:
    return [(n, n) for n in names]
