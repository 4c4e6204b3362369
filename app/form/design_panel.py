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
    QLabel,
    QScrollArea,
    QVBoxLayout,
    QWidget,
)

from app import theme
from app.document.document import Document
from app.form import design_edits
from app.form.field_rows import ChoiceRow, NumberRow, Row, TextRow
from app.form.field_text import choice_label, help_of, label_of, window_message
from app.form.panel_group import PanelGroup
from app.form.part_editor import PartsSection
from app.form.pivot_control import PivotControl
from app.form.suspension_fields import SuspensionSection
from app.form.units import UnitSystem
from core import Design, DesignError, Result, design_to_dict
from core.fileformat import get_value

__all__ = ["DesignPanel"]


_TARGETS = [(k, choice_label("target", k)) for k in ("period", "beats_per_hour", "none")]
_UNSET_TEXT = {"quality_factor": "no damping", "pitch_m": "no nut"}
_OPTIONAL_DEFAULTS = {"quality_factor": 10000.0, "pitch_m": 0.001, "g_m_s2": 9.80665,
                      "hole_diameter_m": 0.008}


class DesignPanel(PartsSection, SuspensionSection, QScrollArea):
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
        theme.flat_scrollbars(self)
        self.document = document
        self._system = system
        self._result: Result | None = None
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
        self.pivot_control = PivotControl(self.document, self._system, self)
        self.pivot_control.add_to(self._suspension_form)
        self._build_parts_group()
        self._build_swing_group()
        self._build_target_group()
        self._build_exhibit_group()
        self._layout.addStretch(1)
        self.setWidget(body)
        document.designChanged.connect(self._on_design_changed)
        self._on_design_changed(document.design)

    # ================================================================== building
    def _group(self, title: str) -> QFormLayout:
        box = PanelGroup(title)
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
        label = QLabel(label_of(row.path, self._kind_at(row.path)))
        label.setBuddy(row.editor())
        tip = help_of(row.path, self._kind_at(row.path))
        if tip:
            label.setToolTip(tip)
            row.set_help(tip)
        form.addRow(label, row)
        (self._rows if registry is None else registry)[row.path] = row

    def _build_design_group(self) -> None:
        form = self._group("Design")
        self._text(form, "name")
        self._choice(form, "purpose", [("clock", "Clock"), ("exhibit", "Exhibit")])
        self._number(form, "reference_temperature_c")

    def _build_site_group(self) -> None:
        form = self._group("Site")
        self._number(form, "site.latitude_deg")
        self._number(form, "site.elevation_m")
        self._number(form, "site.g_m_s2", optional="Set")
        self._number(form, "site.temperature_c")
        self._number(form, "site.pressure_hpa")
        hint = QLabel("Air pressure 0 means the pendulum swings in vacuum.")
        theme.set_role(hint, "hint")
        hint.setWordWrap(True)
        form.addRow(hint)

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

    def _build_exhibit_group(self) -> None:
        form = self._group("Exhibit site")
        self._number(form, "exhibit.pivot_above_floor_m", optional="Floor")
        self._number(form, "exhibit.barrier_radius_m", optional="Barrier")

    # ================================================================== model → widgets
    def _on_design_changed(self, design: Design) -> None:
        self._refresh_parts_list(design)
        signature = self._signature(design)
        rebuilt = signature != self._editor_signature
        if rebuilt:
            self._editor_signature = signature
            self._rebuild_part_editor(design)
        self._write_values(design)
        if rebuilt and self._result is not None:  # new rows; the others wait for the
            self.set_result(self._result)         # analysis of this design (set_result)

    def _write_values(self, design: Design) -> None:
        d = design_to_dict(design, without=("rating_log",))  # no row of the form shows it
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
        self._write_suspension(design)
        self.parts_problem.setVisible(False)

    @staticmethod
    def _form_label(row: QWidget) -> QWidget:
        parent = row.parentWidget()
        form = parent.layout() if parent is not None else None
        if isinstance(form, QFormLayout):
            label = form.labelForField(row)
            if label is not None:
                return label
        return QWidget()

    def _kind_at(self, path: str) -> str | None:
        """The kind of the part a ``parts[i]`` path points into (None elsewhere)."""
        if not path.startswith("parts["):
            return None
        try:
            index = int(path[6:path.index("]")])
        except ValueError:
            return None
        parts = self.document.design.parts
        return parts[index].kind if 0 <= index < len(parts) else None

    def _label(self, path: str) -> str:
        return label_of(path, self._kind_at(path))

    def refusal_text(self, error: DesignError) -> str:
        """The window's sentence for ``error`` in the form's words and display units."""
        return window_message(error, self._system, self._kind_at(error.field))

    # ================================================================== public
    def all_rows(self) -> dict[str, Row]:
        """Every row now in the form, by field path."""
        return {**self._rows, **self._part_rows}

    def row(self, path: str) -> Row:
        """The row editing ``path`` (KeyError when it is not shown)."""
        return self.all_rows()[path]

    def set_result(self, result: Result) -> None:
        """Remember the latest analysis: unticked optional fields show the core's own value
        (a part's mass from its material, gravity from latitude), and ticking one starts
        from it."""
        self._result = result
        self._show_spring_figures(result)
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
        self.pivot_control.set_unit_system(system)
        self._show_spring_figures(self._result)

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
                         path, f"Change {self._label(path).lower()}", stepping)
        if not ok and stepping and self.document.design != self.document.committed_design:
            # A run of steps that ended on a refused value keeps its last valid value.
            row = self.all_rows().get(path)
            message = row.problem() if row is not None else ""
            self.document.commit(self.document.design, f"Change {self._label(path).lower()}",
                                 path, True)
            if row is not None and message:
                row.mark(message)

    def _clear_optional(self, path: str) -> None:
        self._apply(lambda: design_edits.set_value(self.document.design, path, None), path,
                    f"Clear {self._label(path).lower()}")

    def _enable_optional(self, path: str) -> None:
        value = self._optional_start(path)
        self._apply(lambda: design_edits.set_value(self.document.design, path, value), path,
                    f"Set {self._label(path).lower()}")

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
        text = f"Change {self._label(path).lower()}"
        if self._chosen_here(path, key):
            return
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
        message = window_message(error, self._system, self._kind_at(error.field))
        self._last_refusal = (path, message)
        row = self.all_rows().get(path) or self.all_rows().get(error.field)
        if row is not None:
            row.mark(message)
        else:
            self.show_parts_problem(message)
