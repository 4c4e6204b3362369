"""Tools ▸ Solve…: vary one or two fields until the design meets a period and/or a zero
temperature coefficient, see the answer, then apply it as one undo step.

The core's :func:`core.solve.solve` scans each field's whole valid range; a two-field solve that
has no answer takes a few seconds. It therefore runs in a worker of Qt's global thread pool
while the dialog shows an indeterminate progress bar: the window keeps painting and the dialog
can be closed (a late answer is then dropped). The design is an immutable value and the core
holds no shared state, so the worker needs no locking. Applying checks that the document still
shows the design that was solved, so an answer never lands on a design it was not made for.
"""

from __future__ import annotations

from PySide6.QtCore import QObject, QRunnable, QThreadPool, Signal
from PySide6.QtWidgets import (
    QCheckBox,
    QComboBox,
    QDialog,
    QDialogButtonBox,
    QDoubleSpinBox,
    QFormLayout,
    QGroupBox,
    QHBoxLayout,
    QHeaderView,
    QLabel,
    QProgressBar,
    QPushButton,
    QTableWidget,
    QTableWidgetItem,
    QVBoxLayout,
    QWidget,
)

from app import theme
from app.document.document import Document
from app.form.units import UnitSystem, field_unit, readout_unit
from app.window.solve_choices import (
    TARGET_CHOICES,
    field_name,
    make_targets,
    relabel,
    solvable_fields,
)
from core import Design, DesignError, Result, analyse
from core.solve import Solution, solve

__all__ = ["SolveDialog"]

_NO_SECOND = ""


class _Relay(QObject):
    """Carries a worker's answer to the interface thread (queued signal)."""

    done = Signal(object, object, object)  # Design solved, Solution | None, Result | error


class _SolveJob(QRunnable):
    """One solve, run in the thread pool."""

    def __init__(self, design: Design, fields: list[str], targets: object) -> None:
        super().__init__()
        self.relay = _Relay()  # no parent: lives as long as the job, whatever the dialog does
        self.design, self.fields, self.targets = design, fields, targets

    def run(self) -> None:
        try:
            solution = solve(self.design, self.fields, self.targets)  # type: ignore[arg-type]
            self.relay.done.emit(self.design, solution, analyse(solution.design))
        except DesignError as exc:
            self.relay.done.emit(self.design, None, exc)


class SolveDialog(QDialog):
    """Choose fields and targets, run the solve, read the answer, apply it.

    Signals
    -------
    solved(object) : the :class:`core.solve.Solution` shown (met or not).
    """

    solved = Signal(object)

    def __init__(self, document: Document, system: UnitSystem = UnitSystem.METRIC,
                 parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setWindowTitle("Solve")
        self.setObjectName("SolveDialog")
        self.setStyleSheet(theme.STYLE_SHEET)  # the window itself carries none (app.theme)
        self.document = document
        self._system = system
        self.solution: Solution | None = None
        self.solved_result: Result | None = None
        self._solved_from: Design | None = None
        self._job: _SolveJob | None = None
        layout = QVBoxLayout(self)
        layout.setSpacing(8)
        layout.addWidget(self._build_choices())
        layout.addLayout(self._build_run_line())
        layout.addWidget(self._build_answer(), 1)
        self.buttons = QDialogButtonBox()
        self.apply_button = self.buttons.addButton("Apply to the design",
                                                   QDialogButtonBox.ButtonRole.AcceptRole)
        self.apply_button.setEnabled(False)
        self.apply_button.clicked.connect(self.apply)
        close = self.buttons.addButton(QDialogButtonBox.StandardButton.Close)
        close.clicked.connect(self.reject)
        layout.addWidget(self.buttons)
        self.resize(640, 620)
        self.refill(document.design)

    # ------------------------------------------------------------------ building
    def _build_choices(self) -> QGroupBox:
        box = QGroupBox("Vary and aim for")
        form = QFormLayout(box)
        form.setFieldGrowthPolicy(QFormLayout.FieldGrowthPolicy.AllNonFixedFieldsGrow)
        self.first_combo = QComboBox()
        self.first_combo.setAccessibleName("first field")
        self.second_combo = QComboBox()
        self.second_combo.setAccessibleName("second field")
        form.addRow("Vary", self.first_combo)
        form.addRow("and", self.second_combo)
        line = QHBoxLayout()
        self.target_combo = QComboBox()
        self.target_combo.setAccessibleName("period target")
        for key, words in TARGET_CHOICES:
            self.target_combo.addItem(words, key)
        self.target_value = QDoubleSpinBox()
        self.target_value.setAccessibleName("target value")
        self.target_value.setMinimumWidth(140)
        self.target_unit = QLabel()
        self.target_unit.setMinimumWidth(50)
        line.addWidget(self.target_combo, 1)
        line.addWidget(self.target_value)
        line.addWidget(self.target_unit)
        form.addRow("Period", line)
        self.null_check = QCheckBox("Null the temperature coefficient (rate independent of "
                                    "temperature)")
        form.addRow("", self.null_check)
        hint = QLabel("One field meets one target; two fields meet a period and the "
                      "temperature null together. Each field's whole valid range is searched.")
        theme.set_role(hint, "hint")
        hint.setWordWrap(True)
        form.addRow(hint)
        self.target_combo.currentIndexChanged.connect(self._on_target_kind)
        return box

    def _build_run_line(self) -> QHBoxLayout:
        line = QHBoxLayout()
        self.run_button = QPushButton("Solve")
        self.run_button.setDefault(True)
        self.run_button.clicked.connect(self.run)
        self.busy = QProgressBar()
        self.busy.setRange(0, 0)  # indeterminate: the core gives no progress
        self.busy.setTextVisible(False)
        self.busy.setMaximumHeight(10)
        self.busy.setVisible(False)
        self.status = QLabel()
        self.status.setWordWrap(True)
        line.addWidget(self.run_button)
        line.addWidget(self.busy, 1)
        line.addWidget(self.status, 3)
        return line

    def _build_answer(self) -> QGroupBox:
        box = QGroupBox("Answer")
        outer = QVBoxLayout(box)
        self.table = QTableWidget(0, 4)
        self.table.setHorizontalHeaderLabels(["Field", "Now", "Solved", "Change"])
        self.table.verticalHeader().setVisible(False)
        header = self.table.horizontalHeader()
        header.setSectionResizeMode(0, QHeaderView.ResizeMode.Stretch)
        for col in (1, 2, 3):
            header.setSectionResizeMode(col, QHeaderView.ResizeMode.ResizeToContents)
        self.table.setEditTriggers(QTableWidget.EditTrigger.NoEditTriggers)
        self.table.setMaximumHeight(92)
        outer.addWidget(self.table)
        figures = QFormLayout()
        self.figure_labels: dict[str, QLabel] = {}
        for key, words in (("period", "Period"), ("rate", "Rate"),
                           ("temperature", "Temperature coefficient"),
                           ("residuals", "Left over"), ("searched", "Searched"),
                           ("others", "Other values")):
            label = QLabel("–")
            label.setWordWrap(True)
            self.figure_labels[key] = label
            figures.addRow(words, label)
        outer.addLayout(figures)
        self.message = QLabel()
        self.message.setWordWrap(True)
        theme.set_role(self.message, "hint")
        outer.addWidget(self.message)
        outer.addStretch(1)
        return box

    # ------------------------------------------------------------------ choices
    def refill(self, design: Design) -> None:
        """Offer ``design``'s fields and its own target; clears any answer shown."""
        fields = solvable_fields(design)
        for combo, blank in ((self.first_combo, None), (self.second_combo, "— none —")):
            current = combo.currentData()
            combo.clear()
            if blank is not None:
                combo.addItem(blank, _NO_SECOND)
            for f in fields:
                combo.addItem(f.label, f.path)
            index = combo.findData(current)
            combo.setCurrentIndex(max(index, 0))
        own = design.target.target_period_s
        words = dict(TARGET_CHOICES)["design"]
        self.target_combo.setItemText(0, f"{words} ({own:.9g} s)" if own else
                                      f"{words} (none)")
        if own is None and self.target_combo.currentIndex() == 0:
            self.target_combo.setCurrentIndex(1)
        self._on_target_kind()
        self._clear_answer()

    def choose(self, first: str, second: str | None = None,
               target: str = "design", value: float | None = None,
               null_temperature: bool = False) -> None:
        """Set the dialog's choices (field paths, a key of ``TARGET_CHOICES``)."""
        self.first_combo.setCurrentIndex(self.first_combo.findData(first))
        self.second_combo.setCurrentIndex(self.second_combo.findData(second or _NO_SECOND))
        self.target_combo.setCurrentIndex(self.target_combo.findData(target))
        if value is not None:
            self.target_value.setValue(value)
        self.null_check.setChecked(null_temperature)

    def _on_target_kind(self) -> None:
        kind = self.target_combo.currentData()
        own = self.document.design.target.target_period_s or 2.0
        shown = kind in ("period", "beats_per_hour")
        self.target_value.setVisible(shown)
        self.target_unit.setVisible(shown)
        if kind == "period":
            self.target_value.setDecimals(9)
            self.target_value.setRange(0.05, 100.0)
            self.target_value.setSingleStep(0.001)
            self.target_value.setValue(own)
            self.target_unit.setText("s")
        elif kind == "beats_per_hour":
            self.target_value.setDecimals(4)
            self.target_value.setRange(72.0, 144000.0)
            self.target_value.setSingleStep(1.0)
            self.target_value.setValue(7200.0 / own)
            self.target_unit.setText("beats/h")

    def _chosen_fields(self) -> list[str]:
        out = [str(self.first_combo.currentData())]
        second = self.second_combo.currentData()
        if second and second != out[0]:
            out.append(str(second))
        return out

    # ------------------------------------------------------------------ running
    def run(self) -> bool:
        """Start the solve in the thread pool; False (with a sentence) when refused at once."""
        design = self.document.design
        fields = self._chosen_fields()
        if self.second_combo.currentData() == fields[0]:
            self._say("Choose two different fields.", problem=True)
            return False
        kind = str(self.target_combo.currentData())
        value = self.target_value.value() if kind in ("period", "beats_per_hour") else None
        try:
            targets = make_targets(design, fields, kind, value, self.null_check.isChecked())
        except DesignError as exc:
            self._say(_sentence(exc.reason), problem=True)
            return False
        self._clear_answer()
        self._job = _SolveJob(design, fields, targets)
        self._job.relay.done.connect(self._on_done)
        self.run_button.setEnabled(False)
        self.busy.setVisible(True)
        self._say("Solving…")
        QThreadPool.globalInstance().start(self._job)
        return True

    def is_running(self) -> bool:
        """True while a solve is under way."""
        return self._job is not None

    def _on_done(self, design: Design, solution: Solution | None, extra: object) -> None:
        self._job = None
        self.run_button.setEnabled(True)
        self.busy.setVisible(False)
        if solution is None:
            assert isinstance(extra, DesignError)
            self._say(_sentence(f"{field_name(design, extra.field)}: {extra.reason}"
                                if extra.field.startswith("parts[") else extra.reason),
                      problem=True)
            return
        assert isinstance(extra, Result)
        self.solution, self.solved_result, self._solved_from = solution, extra, design
        self._show_answer(design, solution, extra)
        self.solved.emit(solution)

    # ------------------------------------------------------------------ the answer
    def _clear_answer(self) -> None:
        self.solution = self.solved_result = self._solved_from = None
        self.apply_button.setEnabled(False)
        self.table.setRowCount(0)
        for label in self.figure_labels.values():
            label.setText("–")
        self.message.setText("")
        self._say("")

    def _length(self, path: str, si: float) -> str:
        unit = field_unit(path, self._system)
        return f"{unit.to_display(si):.{min(unit.decimals, 6)}f} {unit.text}".rstrip()

    def _bound(self, path: str, si: float) -> str:
        unit = field_unit(path, self._system)
        return f"{unit.to_display(si):.6g} {unit.text}".rstrip()

    def _show_answer(self, design: Design, sol: Solution, result: Result) -> None:
        self.table.setRowCount(len(sol.fields))
        for row, (path, old, new) in enumerate(zip(sol.fields, sol.old_values, sol.values,
                                                   strict=True)):
            unit = field_unit(path, self._system)
            change = (new - old) * unit.scale
            cells = (field_name(design, path), self._length(path, old), self._length(path, new),
                     f"{change:+.{min(unit.decimals, 6)}f} {unit.text}".rstrip())
            for col, text in enumerate(cells):
                self.table.setItem(row, col, QTableWidgetItem(text))
        target = f" (target {sol.target_period_s:.9g} s)" if sol.target_period_s else ""
        self.figure_labels["period"].setText(f"{sol.period_s:.9f} s{target}")
        rate = result.rate_s_per_day
        self.figure_labels["rate"].setText("no target" if rate is None else
                                           f"{rate + 0.0:+.4f} s/day".replace("-0.0000", "+0.0000"))
        tc = readout_unit("s/day/K", self._system)
        self.figure_labels["temperature"].setText(
            f"{tc.convert(sol.temperature_coefficient_s_per_day_per_k):+.6f} {tc.text}")
        self.figure_labels["residuals"].setText(", ".join(
            f"{r:+.2e} s" if goal == "period" else f"{r:+.2e} s/day/K"
            for goal, r in zip(sol.goals, sol.residuals, strict=True)))
        self.figure_labels["searched"].setText("\n".join(
            f"{field_name(design, p)}: {self._bound(p, lo)} to {self._bound(p, hi)} "
            f"(usable {self._bound(p, ulo)} to {self._bound(p, uhi)})"
            for p, (lo, hi), (ulo, uhi) in zip(sol.fields, sol.searched, sol.usable,
                                               strict=True)))
        self.figure_labels["others"].setText(
            ", ".join(self._length(sol.field, x) for x in sol.other_roots)
            if sol.other_roots else "none")
        self.message.setText(relabel(design, sol))
        if sol.met:
            self._say("Met. Apply it to change the design (one undo step).")
        else:
            self._say("Not met: the nearest design found is shown; applying it is allowed.",
                      problem=True)
        self.apply_button.setEnabled(True)

    def _say(self, text: str, problem: bool = False) -> None:
        self.status.setText(text)
        theme.set_role(self.status, "problem" if problem else "")

    # ------------------------------------------------------------------ applying
    def apply(self) -> bool:
        """Put the solved design into the document as one undo step and close."""
        sol = self.solution
        if sol is None:
            return False
        if self.document.design != self._solved_from:
            self._say("The design changed since this solve: solve again.", problem=True)
            self.apply_button.setEnabled(False)
            return False
        names = " and ".join(field_name(sol.design, p).split(" (")[0].lower()
                             for p in sol.fields)
        self.document.commit(sol.design, f"Solve for {names}", "solve")
        self.accept()
        return True


def _sentence(text: str) -> str:
    text = text.strip()
    if not text:
        return text
    text = text[0].upper() + text[1:]
    return text if text.endswith((".", "!", "?")) else text + "."
