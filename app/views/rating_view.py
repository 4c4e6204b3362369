"""The rating view: the design's rating log as an editable table, the fit's plots and figures,
and the buttons that carry the clock's truth back into the design.

It follows the view shape (:class:`app.views.base.View`) but is not a plot of the current
swing: a tab of its own (``grid_member = False``), not in the headless export or the PDF
(``in_report = False``). The window hands it the document (:meth:`RatingView.bind_document`);
every edit — a cell, a reading added, rows pasted or deleted, a CSV imported, the model fitted
to the clock, Q set from the decay — is one undoable step through the document, made with the
core's validator (:func:`app.views.rating_edits.design_with_log`, :func:`core.with_value`).

The fit (:func:`core.rating_report.rating_report`, some 20 ms) is made lazily: only while the
view is on screen, once control returns to the event loop (so a burst of edits fits once), and
only when the design differs from the one last fitted.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

from PySide6.QtCore import QSize, Qt, QTimer
from PySide6.QtWidgets import (
    QFileDialog,
    QGroupBox,
    QHBoxLayout,
    QLabel,
    QPushButton,
    QScrollArea,
    QSplitter,
    QTabWidget,
    QVBoxLayout,
    QWidget,
)

from app import theme
from app.form.units import UnitSystem, readout_unit
from app.views.catalogue import from_card
from app.views.document_view import DocumentView
from app.views.rating_edits import design_with_log
from app.views.rating_figures import figures_html
from app.views.rating_plots import AllanPlot, ErrorPlot, RateTemperaturePlot
from app.views.rating_table import RatingTable
from core import Design, DesignError, rating_log_from_csv, rating_log_to_csv, with_value
from core.fileformat import write_text_atomic
from core.rating import Conditions
from core.rating_log import RatingLog
from core.rating_model import fit_model_to_clock
from core.rating_report import rating_report

__all__ = ["RatingView"]


@from_card("rating")
class RatingView(DocumentView, QWidget):
    """The rating log, its fit and the model beside it (see the module notes)."""

    caption = ""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setMinimumSize(QSize(420, 320))
        self.document: Any = None
        self.system = UnitSystem.METRIC
        self._design: Design | None = None
        self._fitted_key: tuple[Any, ...] | None = None
        self.report: dict[str, Any] | None = None
        self.problem = ""
        self.fit_count = 0
        self._timer = QTimer(self)
        self._timer.setSingleShot(True)
        self._timer.setInterval(0)
        self._timer.timeout.connect(self.fit_now)
        self._build()

    # ------------------------------------------------------------------ building
    def _build(self) -> None:
        self.table = RatingTable()
        self.table.logEdited.connect(self._commit_log)
        self.table.refused.connect(self._say)
        buttons = QHBoxLayout()
        buttons.setSpacing(6)
        self.add_button = self._button("Add reading now", self.add_reading_now,
                                       "A reading at the present time; type the clock's error "
                                       "(Insert in the table, Ctrl+R in the window)")
        self.fit_button = self._button("Fit model to clock", self.fit_model,
                                       "Move the bob's position so the model's rate at the "
                                       "log's mean conditions equals the measured rate")
        self.q_button = self._button("Set Q from decay", self.set_quality_factor,
                                     "Set the design's quality factor to the one fitted on "
                                     "the decay readings")
        self.import_button = self._button("Import CSV…", self.ask_import, "Replace the log "
                                          "with a CSV file's rows (bad rows are refused)")
        self.export_button = self._button("Export CSV…", self.ask_export_csv,
                                          "Write the log as CSV, units in the column names")
        for b in (self.add_button, self.fit_button, self.q_button):
            buttons.addWidget(b)
        buttons.addStretch(1)
        for b in (self.import_button, self.export_button):
            buttons.addWidget(b)

        self.message = QLabel()
        self.message.setWordWrap(True)
        theme.set_role(self.message, "hint")
        self.figures = QLabel()
        self.figures.setWordWrap(True)
        self.figures.setTextFormat(Qt.TextFormat.RichText)
        self.figures.setAlignment(Qt.AlignmentFlag.AlignTop | Qt.AlignmentFlag.AlignLeft)
        self.figures.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        scroll = QScrollArea()
        scroll.setWidgetResizable(True)
        scroll.setFrameShape(QScrollArea.Shape.NoFrame)
        scroll.setWidget(self.figures)
        scroll.viewport().setAutoFillBackground(False)
        self.figures.setAutoFillBackground(False)
        self.figures.setStyleSheet("background: transparent;")
        box = QGroupBox("Figures")
        QVBoxLayout(box).addWidget(scroll)
        self.figures_box = box

        self.error_plot = ErrorPlot()
        self.rate_plot = RateTemperaturePlot()
        self.allan_plot = AllanPlot()
        self.plot_tabs = QTabWidget()
        self.plot_tabs.setDocumentMode(True)
        self.plot_tabs.addTab(self.error_plot, "Error")
        self.plot_tabs.addTab(self.rate_plot, "Rate vs temperature")
        self.plot_tabs.addTab(self.allan_plot, "Stability")
        box.setMinimumWidth(300)
        top = QSplitter(Qt.Orientation.Horizontal)
        top.setChildrenCollapsible(False)
        top.addWidget(self.plot_tabs)
        top.addWidget(box)
        top.setStretchFactor(0, 1)
        top.setStretchFactor(1, 0)
        bottom = QWidget()
        lay = QVBoxLayout(bottom)
        lay.setContentsMargins(6, 4, 6, 6)
        lay.setSpacing(4)
        lay.addLayout(buttons)
        lay.addWidget(self.table, 1)
        lay.addWidget(self.message)
        self.splitter = QSplitter(Qt.Orientation.Vertical)
        self.splitter.setChildrenCollapsible(False)
        self.splitter.addWidget(top)
        self.splitter.addWidget(bottom)
        self.splitter.setStretchFactor(0, 1)
        self.splitter.setStretchFactor(1, 1)
        self.splitter.setSizes([520, 380])
        top.setSizes([440, 310])
        self.top_splitter = top
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(self.splitter)

    def _button(self, text: str, slot: Any, tip: str) -> QPushButton:
        button = QPushButton(text)
        button.setToolTip(tip)
        button.clicked.connect(lambda _checked=False: slot())
        return button

    # ------------------------------------------------------------------ the view shape
    def export(self, path: str | Path) -> Path:
        """Write the view (table, plots and figures) to ``path`` (.png or .svg)."""
        self.fit_now()
        return DocumentView.export(self, path)

    def set_unit_system(self, system: UnitSystem) -> None:
        """Show temperatures and pressures in ``system`` (the log stays in °C and hPa)."""
        self.system = system
        self.table.set_log(self.table.log, system)
        self._show()

    # ------------------------------------------------------------------ following the design
    @property
    def design(self) -> Design | None:
        return self._design

    def _on_design_changed(self, design: Design) -> None:
        self._design = design
        if (design.rating_log or RatingLog()) != self.table.log:  # undo, open, an edit here
            self.table.set_log(design.rating_log, self.system)
        if self.isVisible():
            self._timer.start()

    def showEvent(self, event: Any) -> None:  # Qt override
        super().showEvent(event)
        if self._design is not None:
            self.table.set_log(self._design.rating_log, self.system)
            self._timer.start()

    def fit_now(self) -> None:
        """Fit the log of the design on view, unless it is the one already fitted."""
        self._timer.stop()
        design = self._design
        if design is None:
            return
        key = (design, self.system)
        if key == self._fitted_key:
            return
        self._fitted_key = key
        self.report, self.problem = None, ""
        log = design.rating_log
        if log is None or not (log.readings or log.decay):
            self.problem = ("No rating log yet. Add a reading (Insert, or “Add reading now”), "
                            "paste rows from a spreadsheet or import a CSV file.")
        else:
            try:
                self.report = rating_report(design, log)
                self.fit_count += 1
            except DesignError as exc:
                self.problem = f"{exc.reason[:1].upper()}{exc.reason[1:]}."
        self._show()

    def _show(self) -> None:
        log = self._design.rating_log if self._design is not None else None
        temp = readout_unit("°C", self.system)
        self.error_plot.show_report(log, self.report)
        self.rate_plot.show_report(log, self.report, temp.convert)
        self.rate_plot.getPlotItem().setLabel("bottom", f"temperature ({temp.text})")
        self.allan_plot.show_report(self.report)
        self.figures.setText(figures_html(self.report, self.problem, self.system))
        has_fit = bool(self.report and self.report.get("segments"))
        self.fit_button.setEnabled(has_fit and self.document is not None)
        self.q_button.setEnabled(bool(self.report and self.report.get("quality_factor"))
                                 and self.document is not None)

    # ------------------------------------------------------------------ edits
    def _say(self, text: str) -> None:
        self.message.setText(text)

    def _commit(self, make: Any, text: str) -> bool:
        if self.document is None or self._design is None:
            self._say("There is no document to edit.")
            return False
        try:
            design = make(self.document.design)
        except DesignError as exc:
            self._say(f"{exc.field}: {exc.reason}. The design is unchanged.")
            return False
        self.document.commit(design, text, "rating_log")
        return True

    def _commit_log(self, log: RatingLog, text: str) -> None:
        if self._commit(lambda d: design_with_log(d, log), text):
            self._say("")

    def add_reading_now(self) -> None:
        """Add a reading at the present local time (one undo step)."""
        self.table.add_reading_now()

    def fit_model(self, field_path: str | None = None) -> None:
        """Move ``field_path`` (default: the bob's position) so the model's rate at the log's
        mean conditions equals the measured rate (one undo step)."""
        self.fit_now()
        report = self.report
        rate = None if report is None else \
            report.get("measured_rate_at_mean_conditions_s_per_day")
        if report is None or rate is None:
            self._say("Fit the log first: the model can only follow a measured rate.")
            return
        mean = Conditions(**report["mean_conditions"])
        fitted: dict[str, Any] = {}

        def make(design: Design) -> Design:
            fit = fit_model_to_clock(design, field_path, rate, mean)
            fitted["fit"] = fit
            return fit.design

        if self._commit(make, "Fit the model to the clock"):
            fit = fitted["fit"]
            self._say(f"{fit.field} moved from {fit.old_value:.6g} to {fit.value:.6g}: the "
                      f"model now gains {fit.rate_s_per_day:+.3f} s/day at the log's mean "
                      "conditions, as the clock does.")

    def set_quality_factor(self) -> None:
        """Set the design's quality factor to the one fitted on the decay (one undo step)."""
        self.fit_now()
        q = None if self.report is None else self.report.get("quality_factor")
        if q is None:
            self._say("The log has no usable decay readings to fit Q on.")
            return
        if self._commit(lambda d: with_value(d, "swing.quality_factor", float(q)),
                        "Set Q from the decay"):
            self._say(f"Quality factor set to {q:.4g}.")

    def import_csv(self, path: str | Path) -> list[str]:
        """Replace the log with a CSV file's rows (one undo step); returns the sentences about
        refused rows."""
        try:
            text = Path(path).read_text(encoding="utf-8")
            log, messages = rating_log_from_csv(text)
        except (OSError, UnicodeDecodeError) as exc:
            self._say(f"Cannot read {Path(path).name}: {exc}")
            return []
        except DesignError as exc:
            self._say(f"{Path(path).name}: {exc.reason}. The log is unchanged.")
            return []
        if self.document is not None and self.document.design.rating_log is not None:
            log = RatingLog(log.readings, log.adjustments,
                            log.decay or self.document.design.rating_log.decay)
        if self._commit(lambda d: design_with_log(d, log), f"Import {Path(path).name}"):
            self._say("Refused rows: " + "; ".join(messages) + "." if messages
                      else f"Imported {len(log.readings)} readings.")
        return messages

    def export_csv(self, path: str | Path) -> Path:
        """Write the log as CSV (atomically; header names the units)."""
        log = (self._design.rating_log if self._design is not None else None) or RatingLog()
        write_text_atomic(path, rating_log_to_csv(log))
        return Path(path)

    def ask_import(self) -> None:
        name, _ = QFileDialog.getOpenFileName(self, "Import rating log", "",
                                              "CSV (*.csv);;All files (*)")
        if name:
            self.import_csv(name)

    def ask_export_csv(self) -> None:
        name, _ = QFileDialog.getSaveFileName(self, "Export rating log", "rating_log.csv",
                                              "CSV (*.csv)")
        if name:
            try:
                self._say(f"Wrote {self.export_csv(name)}.")
            except (OSError, DesignError) as exc:
                self._say(f"Cannot write {name}: {exc}")
