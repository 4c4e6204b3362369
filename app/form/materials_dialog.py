"""Tools ▸ Your materials…: the design's own materials (add, edit, remove) and stock measured
in the workshop (a built-in material copied with the expansion measured).

Every change goes through :mod:`app.form.material_edits` and the core's validator and becomes
one undo step of the document; a refused change shows the core's sentence and changes nothing.
Values are typed in the units named beside them (SI, with expansion in 10⁻⁶/K and Young's
modulus in GPa, as handbooks list them).
"""

from __future__ import annotations

from PySide6.QtCore import QSignalBlocker, Qt
from PySide6.QtWidgets import (
    QCheckBox,
    QComboBox,
    QDialog,
    QDialogButtonBox,
    QDoubleSpinBox,
    QFormLayout,
    QGroupBox,
    QHBoxLayout,
    QLabel,
    QLineEdit,
    QListWidget,
    QPushButton,
    QVBoxLayout,
    QWidget,
)

from app import theme
from app.document.document import Document
from app.form.material_edits import (
    MaterialValues,
    key_from_name,
    measured_copy,
    remove_material,
    set_material,
)
from core import Design, DesignError
from core.materials import MATERIALS

__all__ = ["MaterialsDialog"]

_PER_MICRO = 1e-6
_PER_GIGA = 1e9


def _spin(low: float, high: float, decimals: int, unit: str, name: str) -> QDoubleSpinBox:
    box = QDoubleSpinBox()
    box.setRange(low, high)
    box.setDecimals(decimals)
    box.setSuffix(f" {unit}")
    box.setAccessibleName(name)
    box.setMinimumWidth(150)
    return box


class MaterialsDialog(QDialog):
    """The design's own materials: a list, the selected one's values, and measured stock."""

    def __init__(self, document: Document, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setWindowTitle("Your materials")
        self.setObjectName("MaterialsDialog")
        self.setStyleSheet(theme.STYLE_SHEET)  # the window itself carries none (app.theme)
        self.document = document
        self._editing: str | None = None  # key of the material shown; None: a new one
        outer = QVBoxLayout(self)
        top = QHBoxLayout()
        top.addLayout(self._build_list(), 2)
        top.addWidget(self._build_editor(), 3)
        outer.addLayout(top)
        outer.addWidget(self._build_measured())
        self.problem = QLabel()
        theme.set_role(self.problem, "problem")
        self.problem.setWordWrap(True)
        self.problem.setVisible(False)
        outer.addWidget(self.problem)
        buttons = QDialogButtonBox(QDialogButtonBox.StandardButton.Close)
        buttons.rejected.connect(self.reject)
        outer.addWidget(buttons)
        document.designChanged.connect(self._refill)
        self.resize(720, 560)
        self._refill(document.design)
        self.new_material()

    # ------------------------------------------------------------------ building
    def _build_list(self) -> QVBoxLayout:
        col = QVBoxLayout()
        col.addWidget(QLabel("Materials of this design"))
        self.list = QListWidget()
        theme.colour_list(self.list)
        self.list.setAccessibleName("your materials")
        self.list.currentRowChanged.connect(self._on_selected)
        col.addWidget(self.list, 1)
        line = QHBoxLayout()
        self.new_button = QPushButton("New")
        self.new_button.clicked.connect(self.new_material)
        self.remove_button = QPushButton("Remove")
        self.remove_button.clicked.connect(self.remove_selected)
        line.addWidget(self.new_button)
        line.addWidget(self.remove_button)
        line.addStretch(1)
        col.addLayout(line)
        return col

    def _build_editor(self) -> QGroupBox:
        self.editor_box = QGroupBox("New material")
        form = QFormLayout(self.editor_box)
        form.setFieldGrowthPolicy(QFormLayout.FieldGrowthPolicy.AllNonFixedFieldsGrow)
        self.name_edit = QLineEdit()
        self.name_edit.setAccessibleName("material name")
        self.name_edit.textEdited.connect(self._on_name_edited)
        self.key_edit = QLineEdit()
        self.key_edit.setAccessibleName("material key")
        self.key_edit.setToolTip("How the design file names it; letters, digits and "
                                 "underscores. A built-in material's key cannot be reused.")
        self.density = _spin(10.0, 25000.0, 1, "kg/m³", "density")
        self.expansion = _spin(-50.0, 500.0, 3, "× 10⁻⁶/K", "expansion")
        self.modulus = _spin(0.001, 1200.0, 3, "GPa", "Young's modulus")
        self.source_edit = QLineEdit()
        self.source_edit.setAccessibleName("source")
        self.source_edit.setPlaceholderText("required: a handbook, a data sheet, "
                                            "your own measurement")
        for words, widget in (("Name", self.name_edit), ("Key", self.key_edit),
                              ("Density", self.density), ("Expansion", self.expansion),
                              ("Young's modulus", self.modulus), ("Source", self.source_edit)):
            form.addRow(words, widget)
        self.save_button = QPushButton("Add material")
        self.save_button.clicked.connect(self.save_material)
        form.addRow("", self.save_button)
        return self.editor_box

    def _build_measured(self) -> QGroupBox:
        box = QGroupBox("Stock as measured")
        form = QFormLayout(box)
        note = QLabel("Built-in values stay as they are. This makes your own copy of a "
                      "built-in material, under a new key, with the expansion you measured "
                      "for the stock in hand (density and Young's modulus are copied).")
        note.setWordWrap(True)
        theme.set_role(note, "hint")
        form.addRow(note)
        self.builtin_combo = QComboBox()
        self.builtin_combo.setAccessibleName("built-in material")
        for key, m in MATERIALS.items():
            self.builtin_combo.addItem(m.label, key)
        self.builtin_combo.currentIndexChanged.connect(self._on_builtin)
        self.measured = _spin(-50.0, 500.0, 3, "× 10⁻⁶/K", "measured expansion")
        self.measured_source = QLineEdit()
        self.measured_source.setPlaceholderText("how it was measured (optional)")
        self.use_for_parts = QCheckBox("Use the copy for the parts made of it")
        self.use_for_parts.setChecked(True)
        self.copy_button = QPushButton("Add measured copy")
        self.copy_button.clicked.connect(self.add_measured_copy)
        form.addRow("Built-in", self.builtin_combo)
        form.addRow("Expansion measured", self.measured)
        form.addRow("How measured", self.measured_source)
        line = QHBoxLayout()
        line.addWidget(self.use_for_parts, 1)
        line.addWidget(self.copy_button)
        form.addRow(line)
        self._on_builtin()
        return box

    # ------------------------------------------------------------------ model → widgets
    def _refill(self, design: Design) -> None:
        with QSignalBlocker(self.list):
            self.list.clear()
            for m in design.materials:
                self.list.addItem(m.label)
                item = self.list.item(self.list.count() - 1)
                item.setData(Qt.ItemDataRole.UserRole, m.key)
                item.setToolTip(f"key {m.key}: {m.source}")
            keys = [m.key for m in design.materials]
            if self._editing in keys:
                self.list.setCurrentRow(keys.index(self._editing))
        self.remove_button.setEnabled(self._editing in keys)

    def _on_selected(self, row: int) -> None:
        if row < 0:
            return
        key = self.list.item(row).data(Qt.ItemDataRole.UserRole)
        m = self.document.design.material(key)
        self._editing = key
        self.editor_box.setTitle(f"Edit “{m.label}”")
        self.save_button.setText("Save changes")
        self.name_edit.setText(m.label)
        self.key_edit.setText(m.key)
        self.density.setValue(m.density_kg_m3)
        self.expansion.setValue(m.expansion_per_k / _PER_MICRO)
        self.modulus.setValue(m.youngs_modulus_pa / _PER_GIGA)
        self.source_edit.setText(m.source)
        self.source_edit.setCursorPosition(0)
        self.remove_button.setEnabled(True)
        self._say("")

    def _on_name_edited(self, text: str) -> None:
        if self._editing is None:
            self.key_edit.setText(key_from_name(text))

    def _on_builtin(self) -> None:
        m = MATERIALS[str(self.builtin_combo.currentData())]
        self.measured.setValue(m.expansion_per_k / _PER_MICRO)

    def _say(self, text: str) -> None:
        self.problem.setText(text)
        self.problem.setVisible(bool(text))

    # ------------------------------------------------------------------ widgets → model
    def new_material(self) -> None:
        """Clear the editor for a new material."""
        self._editing = None
        self.list.clearSelection()
        self.editor_box.setTitle("New material")
        self.save_button.setText("Add material")
        for edit in (self.name_edit, self.key_edit, self.source_edit):
            edit.clear()
        self.density.setValue(7850.0)
        self.expansion.setValue(11.5)
        self.modulus.setValue(200.0)
        self.remove_button.setEnabled(False)
        self._say("")

    def values(self) -> MaterialValues:
        """The material as typed, in SI."""
        name = self.name_edit.text().strip()
        return MaterialValues(self.key_edit.text().strip() or key_from_name(name), name,
                              self.density.value(), self.expansion.value() * _PER_MICRO,
                              self.modulus.value() * _PER_GIGA, self.source_edit.text())

    def _commit(self, make: object, text: str) -> bool:
        try:
            design = make()  # type: ignore[operator]
        except DesignError as exc:
            self._say(_sentence(exc.reason))
            return False
        self._say("")
        self.document.commit(design, text, "materials")
        return True

    def save_material(self) -> bool:
        """Add the material typed, or save the changes to the one shown."""
        values, old = self.values(), self._editing
        if not values.name:
            self._say("Give the material a name.")
            return False
        ok = self._commit(lambda: set_material(self.document.design, values, old),
                          f"{'Add' if old is None else 'Change'} material {values.name}")
        if ok:
            self._editing = values.key
            self._refill(self.document.design)
            self._on_selected(self.list.currentRow())
        return ok

    def remove_selected(self) -> bool:
        """Remove the material shown (refused while a part uses it)."""
        key = self._editing
        if key is None:
            return False
        ok = self._commit(lambda: remove_material(self.document.design, key),
                          f"Remove material {key}")
        if ok:
            self.new_material()
        return ok

    def add_measured_copy(self) -> bool:
        """Add a copy of the chosen built-in material with the measured expansion."""
        builtin = str(self.builtin_combo.currentData())
        made: list[str] = []

        def make() -> Design:
            design, key = measured_copy(self.document.design, builtin,
                                        self.measured.value() * _PER_MICRO,
                                        self.measured_source.text(),
                                        self.use_for_parts.isChecked())
            made.append(key)
            return design

        ok = self._commit(make, f"Add {MATERIALS[builtin].label.lower()} as measured")
        if ok:
            self._editing = made[0]
            self._refill(self.document.design)
            self._on_selected(self.list.currentRow())
        return ok


def _sentence(text: str) -> str:
    text = text.strip()
    return text[:1].upper() + text[1:] + ("" if text.endswith(".") else ".")
