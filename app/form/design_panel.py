"""The design panel: the scrollable form on the left (site, suspension, parts, swing, target).

It is handed the :class:`~app.document.Document`, listens to ``designChanged`` and writes the
design's values into its rows with their signals blocked (so model → widget never loops).
Requests from rows become new designs through the core's validator: a value being stepped is
previewed live, a finished edit is committed to the undo history, and a refused value marks its
row with the core's reason while the document keeps its last valid design.
"""

from __future__ import annotations

from collections.abc import Callable
from functools import partial
from typing import Any

from PySide6.QtCore import Qt, Signal
from PySide6.QtWidgets import (
    QFormLayout,
    QGroupBox,
    QHBoxLayout,
    QLabel,
    QListWidget,
    QListWidgetItem,
    QMenu,
    QPushButton,
    QScrollArea,
    QVBoxLayout,
    QWidget,
)

from app.document.document import Document
from app.form import design_edits
from app.form.field_rows import ChoiceRow, NumberRow, Row, TextRow
from app.form.labels import FIELD_LABELS, field_label
from app.form.units import UnitSystem
from core import Design, DesignError, design_to_dict
from core.fileformat import get_value
from core.materials import MATERIALS

__all__ = ["DesignPanel", "FIELD_LABELS", "field_label"]


_SHAPES = [("lens", "Lens"), ("disc", "Disc"), ("cylinder", "Cylinder"), ("sphere", "Sphere")]
_MOUNTS = [("clamp", "Clamped to a rod"), ("on_sleeve", "Resting on a sleeve")]
_SUSPENSIONS = [("knife_edge", "Knife edge"), ("spring", "Suspension spring")]
_TARGETS = [("period", "Period"), ("beats_per_hour", "Beats per hour"), ("none", "No target")]
_UNSET_TEXT = {"quality_factor": "no damping", "pitch_m": "no nut"}
_OPTIONAL_DEFAULTS = {"quality_factor": 10000.0, "pitch_m": 0.001, "g_m_s2": 9.80665}


class DesignPanel(QScrollArea):
    """Left panel: every design field, grouped, with the parts list and the part editor.

    Signals
    -------
    partSelected(int) : the part whose fields the editor shows.
    """

    partSelected = Signal(int)

    def __init__(self, document: Document, system: UnitSystem = UnitSystem.METRIC,
                 parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setObjectName("DesignScroll")
        self.document = document
        self._system = system
        self._result: Any = None
        self._rows: dict[str, Row] = {}
        self._part_rows: dict[str, Row] = {}
        self._selected = 0
        self._editor_signature: tuple[Any, ...] = ()
        self.setWidgetResizable(True)
        self.setHorizontalScrollBarPolicy(Qt.ScrollBarPolicy.ScrollBarAlwaysOff)
        body = QWidget()
        body.setObjectName("DesignPanel")
        self._layout = QVBoxLayout(body)
        self._layout.setContentsMargins(8, 4, 8, 8)
        self._layout.setSpacing(6)
        self._build_design_group()
        self._build_site_group()
        self._build_suspension_group()
        self._build_parts_group()
        self._build_swing_group()
        self._build_target_group()
        self._layout.addStretch(1)
        self.setWidget(body)
        document.designChanged.connect(self._on_design_changed)
        self._on_design_changed(document.design)

    # ================================================================== building
    def _group(self, title: str) -> QFormLayout:
        box = QGroupBox(title)
        form = QFormLayout(box)
        form.setContentsMargins(8, 6, 8, 6)
        form.setHorizontalSpacing(8)
        form.setVerticalSpacing(5)
        form.setLabelAlignment(Qt.AlignmentFlag.AlignRight | Qt.AlignmentFlag.AlignVCenter)
        form.setFieldGrowthPolicy(QFormLayout.FieldGrowthPolicy.AllNonFixedFieldsGrow)
        self._layout.addWidget(box)
        return form

    def _number(self, form: QFormLayout, path: str, optional: str | None = None,
                placeholder: str = "", registry: dict[str, Row] | None = None) -> NumberRow:
        row = NumberRow(path, self._system, optional, placeholder)
        row.changing.connect(self._preview_number)
        row.changed.connect(self._commit_number)
        row.cleared.connect(self._clear_optional)
        row.enabled.connect(self._enable_optional)
        self._add(form, row, registry)
        return row

    def _choice(self, form: QFormLayout, path: str, choices: list[tuple[str, str]],
                registry: dict[str, Row] | None = None) -> ChoiceRow:
        row = ChoiceRow(path, choices)
        row.chosen.connect(self._on_chosen)
        self._add(form, row, registry)
        return row

    def _text(self, form: QFormLayout, path: str,
              registry: dict[str, Row] | None = None) -> TextRow:
        row = TextRow(path)
        row.edited.connect(self._on_text)
        self._add(form, row, registry)
        return row

    def _add(self, form: QFormLayout, row: Row, registry: dict[str, Row] | None) -> None:
        label = QLabel(field_label(row.path))
        label.setBuddy(row.editor())
        form.addRow(label, row)
        (self._rows if registry is None else registry)[row.path] = row

    def _build_design_group(self) -> None:
        form = self._group("Design")
        self._text(form, "name")
        self._number(form, "reference_temperature_c")

    def _build_site_group(self) -> None:
        form = self._group("Site")
        self._number(form, "site.latitude_deg")
        self._number(form, "site.elevation_m")
        self._number(form, "site.g_m_s2", optional="Set")
        self._number(form, "site.temperature_c")
        self._number(form, "site.pressure_hpa")
        hint = QLabel("Air pressure 0 means the pendulum swings in vacuum.")
        hint.setProperty("role", "hint")
        hint.setWordWrap(True)
        form.addRow(hint)

    def _build_suspension_group(self) -> None:
        form = self._group("Suspension")
        self._choice(form, "suspension.kind", _SUSPENSIONS)
        self._number(form, "suspension.stiffness_n_m_per_rad")

    def _build_parts_group(self) -> None:
        box = QGroupBox("Parts")
        outer = QVBoxLayout(box)
        outer.setContentsMargins(8, 6, 8, 6)
        self.parts_list = QListWidget()
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
        self.parts_problem.setProperty("role", "problem")
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

    def _build_swing_group(self) -> None:
        form = self._group("Swing")
        self._number(form, "swing.amplitude_deg")
        self._number(form, "swing.quality_factor", optional="Damped")

    def _build_target_group(self) -> None:
        form = self._group("Target")
        self._choice(form, "target.kind", _TARGETS)
        self._period_row = self._number(form, "target.period_s")
        self._bph_row = self._number(form, "target.beats_per_hour")
        self._number(form, "rating_nut.pitch_m", optional="Fitted")

    # ================================================================== part editor
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
            self._choice(form, f"{at}.material", _material_choices(), reg)
        if part.kind == "rod":
            for key in ("top_m", "length_m", "diameter_m"):
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
        mount = self._choice(form, f"{at}.mount.kind", _MOUNTS, reg)
        mount_label = form.labelForField(mount)
        if isinstance(mount_label, QLabel):
            mount_label.setText("Mounting")
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

    def _signature(self, design: Design) -> tuple[Any, ...]:
        """What decides which rows the part editor has (rebuilt only when it changes)."""
        if not 0 <= self._selected < len(design.parts):
            return (self._selected,)
        p = design.parts[self._selected]
        return (self._selected, p.kind, getattr(p, "shape", None),
                getattr(getattr(p, "mount", None), "kind", None),
                tuple((q.kind, q.name) for q in design.parts))

    # ================================================================== model → widgets
    def _on_design_changed(self, design: Design) -> None:
        self._refresh_parts_list(design)
        signature = self._signature(design)
        if signature != self._editor_signature:
            self._editor_signature = signature
            self._rebuild_part_editor(design)
        self._write_values(design)
        if self._result is not None:
            self.set_result(self._result)

    def _refresh_parts_list(self, design: Design) -> None:
        labels = [design_edits.part_label(p) for p in design.parts]
        current = [self.parts_list.item(i).text() for i in range(self.parts_list.count())]
        self._selected = min(max(self._selected, 0), len(design.parts) - 1)
        if labels != current:
            self.parts_list.blockSignals(True)
            self.parts_list.clear()
            for text in labels:
                QListWidgetItem(text, self.parts_list)
            self.parts_list.blockSignals(False)
        if self.parts_list.currentRow() != self._selected:
            self.parts_list.blockSignals(True)
            self.parts_list.setCurrentRow(self._selected)
            self.parts_list.blockSignals(False)
        self.remove_button.setEnabled(len(design.parts) > 1)

    def _write_values(self, design: Design) -> None:
        d = design_to_dict(design)
        target_kind = ("beats_per_hour" if "beats_per_hour" in d["target"] else
                       "none" if d["target"].get("period_s") is None else "period")
        for path, row in self.all_rows().items():
            if path == "target.kind":
                row.set_from_design(target_kind)
                continue
            try:
                value = get_value(d, path)
            except DesignError:
                value = None
            row.set_from_design(value)
        self._period_row.setVisible(target_kind == "period")
        self._form_label(self._period_row).setVisible(target_kind == "period")
        self._bph_row.setVisible(target_kind == "beats_per_hour")
        self._form_label(self._bph_row).setVisible(target_kind == "beats_per_hour")
        stiffness = self._rows["suspension.stiffness_n_m_per_rad"]
        stiffness.setEnabled(design.suspension.kind == "spring")
        self.parts_problem.setVisible(False)

    @staticmethod
    def _form_label(row: QWidget) -> QWidget:
        form = row.parentWidget().layout() if row.parentWidget() else None
        if isinstance(form, QFormLayout):
            label = form.labelForField(row)
            if label is not None:
                return label
        return QWidget()

    # ================================================================== public
    def all_rows(self) -> dict[str, Row]:
        """Every row now in the form, by field path."""
        return {**self._rows, **self._part_rows}

    def row(self, path: str) -> Row:
        """The row editing ``path`` (KeyError when it is not shown)."""
        return self.all_rows()[path]

    def selected_part(self) -> int:
        """Index of the part shown in the part editor."""
        return self._selected

    def select_part(self, index: int) -> None:
        """Show part ``index`` in the part editor."""
        self.parts_list.setCurrentRow(index)

    def set_result(self, result: Any) -> None:
        """Remember the latest analysis: unticked optional fields show the core's own value
        (a part's mass from its material, gravity from latitude), and ticking one starts
        from it."""
        self._result = result
        for path, row in self.all_rows().items():
            if isinstance(row, NumberRow) and row.check is not None \
                    and not row.check.isChecked():
                row.show_core_value(self._core_value(path), _UNSET_TEXT.get(
                    path.rsplit(".", 1)[-1], ""))

    def set_unit_system(self, system: UnitSystem) -> None:
        """Show every number in ``system``'s units."""
        self._system = system
        for row in self.all_rows().values():
            if isinstance(row, NumberRow):
                row.set_unit_system(system)

    # ================================================================== widgets → model
    def _apply(self, make: Callable[[], Design], path: str, text: str,
               mergeable: bool = False) -> bool:
        """Commit the design ``make`` returns; mark ``path``'s row when it is refused."""
        try:
            design = make()
        except DesignError as exc:
            self.show_refusal(path, exc)
            return False
        self.document.commit(design, text, path, mergeable)
        return True

    def _preview_number(self, path: str, si: float) -> None:
        try:
            design = design_edits.set_value(self.document.design, path, si)
        except DesignError as exc:
            self.show_refusal(path, exc)
            return
        self.document.preview(design)

    def _commit_number(self, path: str, si: float, stepping: bool) -> None:
        ok = self._apply(lambda: design_edits.set_value(self.document.design, path, si),
                         path, f"Change {field_label(path).lower()}", stepping)
        if not ok and stepping and self.document.design != self.document.committed_design:
            # A run of steps that ended on a refused value keeps its last valid value.
            row = self.all_rows().get(path)
            message = row.problem() if row is not None else ""
            self.document.commit(self.document.design, f"Change {field_label(path).lower()}",
                                 path, True)
            if row is not None and message:
                row.mark(message)

    def _clear_optional(self, path: str) -> None:
        self._apply(lambda: design_edits.set_value(self.document.design, path, None), path,
                    f"Clear {field_label(path).lower()}")

    def _enable_optional(self, path: str) -> None:
        value = self._optional_start(path)
        self._apply(lambda: design_edits.set_value(self.document.design, path, value), path,
                    f"Set {field_label(path).lower()}")

    def _optional_start(self, path: str) -> float:
        """A starting value when an optional field is ticked: the core's current figure where
        it has one (a part's mass, local gravity), else a plain default."""
        value = self._core_value(path)
        return value if value is not None else _OPTIONAL_DEFAULTS.get(
            path.rsplit(".", 1)[-1], 1.0)

    def _core_value(self, path: str) -> float | None:
        """The latest result's value for an optional field left to the core, if it has one."""
        key = path.rsplit(".", 1)[-1]
        r = self._result
        if r is None:
            return None
        if key == "mass_kg" and path.startswith("parts["):
            index = int(path[6:path.index("]")])
            parts = self.document.design.parts
            name = parts[index].name if index < len(parts) else None
            for body in r.bodies:
                if body.name == name:
                    return float(body.mass_kg)
        if key == "g_m_s2":
            return float(r.g_m_s2)
        return None

    def _on_chosen(self, path: str, key: str) -> None:
        design = self.document.design
        text = f"Change {field_label(path).lower()}"
        if path == "suspension.kind":
            make: Callable[[], Design] = partial(design_edits.set_suspension_kind, design, key)
        elif path == "target.kind":
            make = partial(design_edits.set_target_kind, design, key)
        elif path.endswith(".shape"):
            make = partial(design_edits.set_bob_shape, design, self._selected, key)
        elif path.endswith(".mount.kind"):
            make = partial(design_edits.set_bob_mount, design, self._selected, key)
            text = "Change mounting"
        else:
            make = partial(design_edits.set_value, design, path, key)
        if not self._apply(make, path, text):
            self._write_values(self.document.design)
            self._mark_again(path)

    def _on_text(self, path: str, text: str) -> None:
        design = self.document.design
        if path == "name":
            self._apply(lambda: design_edits.set_value(design, "name", text), path, "Rename design")
        else:
            self._apply(lambda: design_edits.rename_part(design, self._selected, text), path,
                        "Rename part")

    def _mark_again(self, path: str) -> None:
        row = self.all_rows().get(path)
        if row is not None and getattr(self, "_last_refusal", ("", ""))[0] == path:
            row.mark(self._last_refusal[1])

    def show_refusal(self, path: str, error: DesignError) -> None:
        """Mark the row of ``path`` with why ``error`` refused it (naming another field when
        the problem lies there)."""
        message = error.reason
        if error.field != path and error.field not in ("design", "file"):
            message = f"{field_label(error.field)}: {error.reason}"
        self._last_refusal = (path, message)
        row = self.all_rows().get(path) or self.all_rows().get(error.field)
        if row is not None:
            row.mark(message)
        else:
            self.show_parts_problem(message)

    def show_parts_problem(self, message: str) -> None:
        """Say under the parts list why a part edit was refused."""
        self.parts_problem.setText(message)
        self.parts_problem.setVisible(bool(message))

    # ================================================================== parts list
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


def _material_choices() -> list[tuple[str, str]]:
    return [(key, m.label) for key, m in MATERIALS.items()]


def _names(names: list[str]) -> list[tuple[str, str]]:
    return [(n, n) for n in names]
