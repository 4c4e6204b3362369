"""The workbench window: design panel (left), plots (centre), readout (right).

The window holds one :class:`~app.document.Document`. Every change of the shown design starts a
single-shot zero-delay timer; when it fires, only the newest design is analysed (by
``core.analyse``, the one place figures come from) and shown, so a burst of edits never queues
stale work. A design the core cannot compute leaves the plots and figures at the last good
result and says why.

The readout's choices (the height at which to quote the trim weight, the rate budget's
ranges) are passed to ``core.analyse`` as they are; the budget's ranges are judged by the
core's ``budget_ranges`` and kept in the settings, not in the design file.
"""

from __future__ import annotations

import time
from dataclasses import asdict
from pathlib import Path
from typing import Any, Callable

from PySide6.QtCore import QByteArray, Qt, QTimer
from PySide6.QtGui import (QAction, QActionGroup, QCloseEvent, QDragEnterEvent, QDropEvent,
                           QKeySequence)
from PySide6.QtWidgets import (QFileDialog, QLabel, QMainWindow, QMenu, QMessageBox, QSplitter,
                               QWidget)

from core import Design, DesignError, Result, analyse
from core.tuning import BudgetRanges, budget_ranges

from app import theme
from app.launch import default_design_path
from app.form.design_panel import DesignPanel, field_label
from app.document.document import Document, blank_design, read_design_file
from app.views.plot_area import PlotArea
from app.views.base import MotionPlot, PeriodCurvePlot, PhasePlot, export_plot
from app.views.swing_preview import SwingPreview
from app.readout.readout_panel import ReadoutPanel
from app.views.sweep import SweepPlot
from app.document.recovery import (Autosaver, RecoveryEntry, find_orphans, read_entry, remove_entry,
                       set_aside)
from app.document.settings import (add_recent_file, app_settings, recent_files, store_budget_ranges,
                       stored_budget_ranges)
from app.form.units import UnitSystem

__all__ = ["MainWindow", "examples_folder", "example_files", "DESIGN_FILTER"]

DESIGN_FILTER = "Penduline designs (*.pendulum.json *.json);;All files (*)"
COMPUTE_DELAY_MS = 0
DEFAULT_ARRANGEMENT = "tabs"  # one large plot at a time; View ▸ Show plots together for a grid


def examples_folder() -> Path:
    """``resources/examples`` beside the ``app`` package."""
    return default_design_path().parent


def example_files() -> list[Path]:
    """Every example design, sorted by name."""
    return sorted(examples_folder().glob("*.pendulum.json"))


def _example_title(path: Path) -> str:
    return path.name.removesuffix(".pendulum.json").replace("_", " ").capitalize()


class MainWindow(QMainWindow):
    """The document window."""

    def __init__(self, design: Design | None = None, path: str | Path | None = None,
                 remember_layout: bool = True, autosave: bool | None = None) -> None:
        """``remember_layout=False`` neither reads nor writes the stored layout and units (for
        screenshots, which must look the same everywhere). ``autosave`` (default: as
        ``remember_layout``) keeps unsaved edits in the recovery folder (see
        :mod:`app.recovery`)."""
        super().__init__()
        self._remember = remember_layout
        self.setStyleSheet(theme.STYLE_SHEET)
        self.setAcceptDrops(True)
        self.document = Document(design if design is not None else blank_design(), path, self)
        self.result: Result | None = None
        self.baseline: Result | None = None
        self.last_message = ""
        self.compute_count = 0
        self.last_compute_ms = 0.0
        self._trim_height: float | None = None
        self._budget_ranges = stored_budget_ranges() if remember_layout else BudgetRanges()
        self._computed_key: tuple[Any, ...] | None = None
        self._problem: DesignError | None = None  # why the shown design cannot be computed
        self._system = _stored_units() if remember_layout else UnitSystem.METRIC
        self._compute_timer = QTimer(self)
        self._compute_timer.setSingleShot(True)
        self._compute_timer.setInterval(COMPUTE_DELAY_MS)
        self._compute_timer.timeout.connect(self.compute_now)
        self.autosaver: Autosaver | None = None
        if remember_layout if autosave is None else autosave:
            self.autosaver = Autosaver(self.document, parent=self)
            self.autosaver.failed.connect(lambda text: self.statusBar().showMessage(text, 10000))
        self._build_views()
        self._build_menus()
        self.document.designChanged.connect(self._on_design_changed)
        self.document.dirtyChanged.connect(self.setWindowModified)
        self.document.pathChanged.connect(lambda _path: self._update_title())
        self.readout.trimHeightChanged.connect(self._on_trim_height)
        self.readout.budgetRangeChanged.connect(self._on_budget_range)
        self._restore_layout()
        self._update_title()
        self.schedule_compute()

    # ================================================================== views
    def _build_views(self) -> None:
        self.design_panel = DesignPanel(self.document, self._system)
        preview = SwingPreview()
        preview.attach_controls()  # play, speed and clearance line on screen
        self.plots: list[QWidget] = [MotionPlot(), PhasePlot(), PeriodCurvePlot(),
                                     preview, SweepPlot()]
        self._stale_plots: set[int] = set()
        self.plot_area = PlotArea(self.plots, DEFAULT_ARRANGEMENT)
        self.plot_area.tabs.currentChanged.connect(lambda _index: self._refresh_plots())
        self.readout = ReadoutPanel(self._system)
        self.readout.set_budget_ranges(self._budget_ranges)
        self.splitter = QSplitter(Qt.Orientation.Horizontal)
        self.splitter.setChildrenCollapsible(False)
        for widget in (self.design_panel, self.plot_area, self.readout):
            self.splitter.addWidget(widget)
        self.design_panel.setMinimumWidth(320)
        self.readout.setMinimumWidth(330)
        self.plot_area.setMinimumWidth(420)
        self.splitter.setStretchFactor(0, 0)
        self.splitter.setStretchFactor(1, 1)
        self.splitter.setStretchFactor(2, 0)
        self.splitter.setSizes([360, 710, 370])
        self.setCentralWidget(self.splitter)
        self.compute_label = QLabel()
        self.compute_label.setProperty("role", "hint")
        self.statusBar().addPermanentWidget(self.compute_label)

    # ================================================================== menus
    def _build_menus(self) -> None:
        self._build_file_menu()
        self._build_edit_menu()
        self._build_view_menu()
        help_menu = self.menuBar().addMenu("&Help")
        help_menu.addAction("About Penduline", self._about)

    def _action(self, menu: QMenu, text: str, slot: Callable[[], Any],
                shortcut: QKeySequence | QKeySequence.StandardKey | str | None = None) -> QAction:
        action = QAction(text, self)
        if shortcut is not None:
            action.setShortcut(QKeySequence(shortcut))
        action.triggered.connect(lambda _checked=False: slot())
        menu.addAction(action)
        return action

    def _build_file_menu(self) -> None:
        menu = self.menuBar().addMenu("&File")
        self._action(menu, "&New", self.new_document, QKeySequence.StandardKey.New)
        self._action(menu, "&Open…", self.ask_open, QKeySequence.StandardKey.Open)
        self.examples_menu = menu.addMenu("Open &example")
        for path in example_files():
            self._action(self.examples_menu, _example_title(path), self._opener(path))
        self.recent_menu = menu.addMenu("Open &recent")
        self.recent_menu.aboutToShow.connect(self._fill_recent_menu)
        menu.addSeparator()
        self._action(menu, "&Save", self.save, QKeySequence.StandardKey.Save)
        self._action(menu, "Save &as…", self.save_as, QKeySequence.StandardKey.SaveAs)
        menu.addSeparator()
        self._action(menu, "&Export plots…", self.ask_export_plots, "Ctrl+E")
        self._action(menu, "Export plots, data and &report…", self.ask_export_all,
                     "Ctrl+Shift+E")
        menu.addSeparator()
        self._action(menu, "&Quit", self.close, QKeySequence.StandardKey.Quit)

    def _build_edit_menu(self) -> None:
        menu = self.menuBar().addMenu("&Edit")
        undo = self.document.undo_stack.createUndoAction(self, "&Undo")
        undo.setShortcut(QKeySequence.StandardKey.Undo)
        redo = self.document.undo_stack.createRedoAction(self, "&Redo")
        redo.setShortcut(QKeySequence.StandardKey.Redo)
        menu.addAction(undo)
        menu.addAction(redo)
        self.undo_action, self.redo_action = undo, redo
        menu.addSeparator()
        add = menu.addMenu("&Add part")
        for kind, label in (("rod", "Rod"), ("sleeve", "Sleeve"), ("bob", "Bob"),
                            ("weight", "Trim weight")):
            self._action(add, label, self._part_adder(kind))
        self._action(menu, "&Duplicate part", self.design_panel.duplicate_selected_part,
                     "Ctrl+D")
        self._action(menu, "&Remove part", self.design_panel.remove_selected_part)

    def _build_view_menu(self) -> None:
        menu = self.menuBar().addMenu("&View")
        units = menu.addMenu("&Units")
        group = QActionGroup(self)
        self.unit_actions: dict[UnitSystem, QAction] = {}
        for system, text in ((UnitSystem.METRIC, "&Metric (m, kg, °C, hPa)"),
                             (UnitSystem.INCH_POUND, "&Inch-pound (in, lb, °F, inHg)")):
            action = QAction(text, self, checkable=True)
            action.setChecked(system == self._system)
            action.triggered.connect(self._unit_setter(system))
            group.addAction(action)
            units.addAction(action)
            self.unit_actions[system] = action
        menu.addSeparator()
        self.grid_action = QAction("Show plots &together", self, checkable=True)
        self.grid_action.setChecked(False)
        self.grid_action.toggled.connect(self._set_grid)
        menu.addAction(self.grid_action)
        motion = self.plots[0]
        assert isinstance(motion, MotionPlot)
        self.difference_action = QAction("Show exact − small-angle &difference", self,
                                         checkable=True)
        self.difference_action.setChecked(motion.shows_difference)
        self.difference_action.toggled.connect(motion.set_show_difference)
        motion.difference_action.toggled.connect(self.difference_action.setChecked)
        menu.addAction(self.difference_action)
        menu.addSeparator()
        self._action(menu, "&Pin current design as baseline", self.pin_baseline, "Ctrl+B")
        self._action(menu, "&Clear baseline", self.clear_baseline)

    def _set_grid(self, on: bool) -> None:
        self.plot_area.set_arrangement("grid" if on else "tabs")
        self._refresh_plots()

    def _opener(self, path: Path) -> Callable[[], None]:
        def run() -> None:
            self.open_file(path, as_example=True)
        return run

    def _part_adder(self, kind: str) -> Callable[[], None]:
        def run() -> None:
            self.design_panel.add_part(kind)
        return run

    def _unit_setter(self, system: UnitSystem) -> Callable[[], None]:
        def run() -> None:
            self.set_unit_system(system)
        return run

    def _fill_recent_menu(self) -> None:
        self.recent_menu.clear()
        paths = recent_files()
        if not paths:
            self.recent_menu.addAction("(none)").setEnabled(False)
        for path in paths:
            self._action(self.recent_menu, str(path), self._recent_opener(path))

    def _recent_opener(self, path: Path) -> Callable[[], None]:
        def run() -> None:
            self.open_file(path)
        return run

    # ================================================================== computing
    def schedule_compute(self) -> None:
        """Ask for the newest design to be analysed once control returns to the event loop."""
        self._compute_timer.start()

    def compute_now(self) -> None:
        """Analyse the document's design (unless it is the one already shown) and show it."""
        self._compute_timer.stop()
        design = self.document.design
        key = (design, self._trim_height, self._budget_ranges)
        if key == self._computed_key:
            return
        self._computed_key = key
        started = time.perf_counter()
        try:
            result = analyse(design, trim_height_m=self._trim_height,
                             budget_ranges=self._budget_ranges)
        except DesignError as exc:
            self._problem = exc
            self._show_compute_problem(exc)
            return
        except Exception as exc:  # never let a defect escape into the event loop
            self.readout.show_compute_problem(f"Unexpected failure: {type(exc).__name__}: "
                                              f"{exc}. Showing the last result.")
            return
        self.last_compute_ms = (time.perf_counter() - started) * 1000.0
        self.compute_count += 1
        self._problem = None
        self._show_result(result)

    def _show_result(self, result: Result) -> None:
        self.result = result
        self._stale_plots = set(range(len(self.plots)))
        self._refresh_plots()
        self.readout.show_result(result, self.baseline)
        self.design_panel.set_result(result)
        if self.compute_count > 1:  # the first analysis also pays one-time imports
            self.compute_label.setText(f"analysis {self.last_compute_ms:.1f} ms")
        self._reshow_problem()

    def _reshow_problem(self) -> None:
        """Showing the last good result again (a baseline pinned, units changed) must not
        hide that the design on view cannot be computed."""
        if self._problem is not None:
            self._show_compute_problem(self._problem)

    def _shown_plot_indices(self) -> list[int]:
        """The plots on view: the grid's, or the current tab's."""
        return self.plot_area.shown_indices()

    def _refresh_plots(self, everything: bool = False) -> None:
        """Draw the latest result in the plots on view (or all); plots hidden behind another
        tab are drawn when they come into view, so a drag never pays for unseen plots."""
        if self.result is None:
            return
        indices = range(len(self.plots)) if everything else self._shown_plot_indices()
        for i in indices:
            if i in self._stale_plots:
                self._stale_plots.discard(i)
                self.plots[i].show_result(self.result, self.baseline)  # type: ignore[attr-defined]

    def _show_compute_problem(self, error: DesignError) -> None:
        if error.field == "trim_height_m":
            self.readout.show_trim_problem(error.reason)
            return
        where = field_label(error.field) if error.field not in ("design", "parts") else "Design"
        self.readout.show_compute_problem(
            f"{where}: {error.reason}. The plots and figures still show the last design that "
            "could be computed.")
        row = self.design_panel.all_rows().get(error.field)
        if row is not None:
            row.mark(error.reason)

    def _on_design_changed(self, _design: Design) -> None:
        self._update_title()
        self.schedule_compute()

    def _on_trim_height(self, height_m: float) -> None:
        self._trim_height = height_m
        self.schedule_compute()

    def budget_ranges(self) -> BudgetRanges:
        """The rate budget's half-widths in use (K, hPa, degrees)."""
        return self._budget_ranges

    def _on_budget_range(self, key: str, value: float) -> None:
        """A budget half-width entered: the core judges it; a refused one marks its entry and
        the budget keeps the last good ranges."""
        values = asdict(self._budget_ranges)
        values[key] = value
        try:
            ranges = budget_ranges(**values)
        except DesignError as exc:
            self.readout.show_budget_problem(key, exc.reason)
            return
        self._budget_ranges = ranges
        self.readout.set_budget_ranges(ranges)
        if self._remember:
            store_budget_ranges(ranges)
        self.schedule_compute()

    # ================================================================== baseline, units
    def pin_baseline(self) -> None:
        """Keep the current result as the grey baseline in every plot and the Δ column."""
        self.compute_now()
        if self.result is not None:
            self.baseline = self.result
            self._show_result(self.result)
            self.statusBar().showMessage("Baseline pinned: the current design is drawn in grey.",
                                         4000)

    def clear_baseline(self) -> None:
        """Remove the baseline."""
        self.baseline = None
        if self.result is not None:
            self._show_result(self.result)

    def unit_system(self) -> UnitSystem:
        """The units of entry and display."""
        return self._system

    def set_unit_system(self, system: UnitSystem) -> None:
        """Enter and show values in ``system`` (the file stays in SI)."""
        self._system = system
        self.unit_actions[system].setChecked(True)
        self.design_panel.set_unit_system(system)
        self.readout.set_unit_system(system)
        self._reshow_problem()
        if self._remember:
            app_settings().setValue("view/units", system.value)

    # ================================================================== files
    def confirm_discard(self) -> bool:
        """True when unsaved edits may be dropped (asks; Save saves first)."""
        if not self.document.is_dirty:
            return True
        answer = QMessageBox.question(
            self, "Unsaved changes",
            f"Save the changes to {self.document.display_name()} before closing it?",
            QMessageBox.StandardButton.Save | QMessageBox.StandardButton.Discard
            | QMessageBox.StandardButton.Cancel, QMessageBox.StandardButton.Save)
        if answer == QMessageBox.StandardButton.Save:
            return self.save()
        return answer == QMessageBox.StandardButton.Discard

    def new_document(self) -> bool:
        """Start a new, unsaved design."""
        if not self.confirm_discard():
            return False
        self._trim_height = None
        self.document.replace(blank_design(), None)
        return True

    def ask_open(self) -> None:
        """File ▸ Open…: choose a design file."""
        start = str(self.document.path.parent) if self.document.path else str(examples_folder())
        name, _ = QFileDialog.getOpenFileName(self, "Open design", start, DESIGN_FILTER)
        if name:
            self.open_file(name)

    def open_file(self, path: str | Path, as_example: bool = False) -> bool:
        """Open the design at ``path`` (an example opens as an untitled copy).

        The file is read first: a file that cannot be used is refused with a message naming
        the field, before any question about unsaved edits, and the open document (design,
        file, history, unsaved state) is left exactly as it was.
        """
        try:
            design = read_design_file(path)
        except DesignError as exc:
            self.show_message("Cannot open design", f"{Path(path).name}: {exc.field}: "
                                                    f"{exc.reason}")
            return False
        if not self.confirm_discard():
            return False
        self._trim_height = None
        self.document.replace(design, None if as_example else path)
        if not as_example:
            add_recent_file(path)
        return True

    def save(self) -> bool:
        """Save to the document's file (asks for a name the first time)."""
        if self.document.path is None:
            return self.save_as()
        return self._save_to(self.document.path)

    def save_as(self, path: str | Path | None = None) -> bool:
        """Save under a new name (asked for when ``path`` is None)."""
        if path is None:
            path = self.ask_save_path()
            if path is None:
                return False
        return self._save_to(Path(path))

    def ask_save_path(self) -> Path | None:
        """Ask where to save; None when cancelled."""
        start = self.document.path or Path.home() / f"{self.document.design.name}.pendulum.json"
        name, _ = QFileDialog.getSaveFileName(self, "Save design", str(start), DESIGN_FILTER)
        if not name:
            return None
        path = Path(name)
        return path if path.name.endswith(".json") else path.with_name(path.name +
                                                                       ".pendulum.json")

    def _save_to(self, path: Path) -> bool:
        try:
            self.document.save(path)
        except DesignError as exc:
            self.show_message("Cannot save design", exc.reason)
            return False
        add_recent_file(path)
        self.statusBar().showMessage(f"Saved {path.name}", 3000)
        return True

    def ask_export_plots(self) -> None:
        """File ▸ Export plots…: choose a folder."""
        folder = QFileDialog.getExistingDirectory(self, "Export plots to folder")
        if folder:
            written = self.export_plots(folder)
            if written:
                self.statusBar().showMessage(f"Wrote {len(written)} files to {folder}", 5000)

    def export_plots(self, folder: str | Path) -> list[Path]:
        """Write every plot as ``<slug>.png`` and ``<slug>.svg`` into ``folder``."""
        self.compute_now()
        self._refresh_plots(everything=True)
        target = Path(folder)
        written: list[Path] = []
        try:
            target.mkdir(parents=True, exist_ok=True)
            for plot in self.plots:
                slug = getattr(plot, "slug", "plot")
                for suffix in (".png", ".svg"):
                    written.append(export_plot(plot, target / f"{slug}{suffix}"))
        except (OSError, ValueError) as exc:
            self.show_message("Cannot export plots", str(exc))
        return written

    def ask_export_all(self) -> None:
        """File ▸ Export plots, data and report…: choose a folder."""
        folder = QFileDialog.getExistingDirectory(self, "Export plots, data and report to folder")
        if folder:
            written = self.export_all(folder)
            if written:
                self.statusBar().showMessage(f"Wrote {len(written)} files to {folder}", 5000)

    def export_all(self, folder: str | Path) -> list[Path]:
        """Write every plot, the CSV data and the PDF report of the current result."""
        from app.report.export import export_result

        self.compute_now()
        if self.result is None:
            self.show_message("Cannot export", "There is no valid design to export yet.")
            return []
        try:
            return export_result(self.result, folder, self.document.display_name())
        except DesignError as exc:
            self.show_message("Cannot export", f"{exc.field}: {exc.reason}")
            return []

    def show_message(self, title: str, text: str) -> None:
        """Tell the person something went wrong (a window-modal box that does not block)."""
        self.last_message = text
        box = QMessageBox(QMessageBox.Icon.Warning, title, text, QMessageBox.StandardButton.Ok,
                          self)
        box.setAttribute(Qt.WidgetAttribute.WA_DeleteOnClose)
        box.open()

    def _about(self) -> None:
        QMessageBox.about(self, "About Penduline",
                          "Penduline — a workbench for real pendulums.\n\nExact dynamics of "
                          "the compound pendulum, local gravity, temperature and air, with "
                          "rates in seconds per day.")

    def _update_title(self) -> None:
        self.setWindowTitle(f"{self.document.display_name()}[*] — "
                            f"{self.document.design.name} — Penduline")
        self.setWindowModified(self.document.is_dirty)

    # ================================================================== drag and drop
    def dragEnterEvent(self, event: QDragEnterEvent) -> None:  # noqa: N802 (Qt override)
        if _dropped_design(event.mimeData()) is not None:
            event.acceptProposedAction()
        else:
            event.ignore()

    def dropEvent(self, event: QDropEvent) -> None:  # noqa: N802 (Qt override)
        path = _dropped_design(event.mimeData())
        if path is None:
            event.ignore()
            return
        event.acceptProposedAction()
        self.open_file(path)

    # ================================================================== layout memory
    def _restore_layout(self) -> None:
        if not self._remember:
            self.resize(1440, 900)
            return
        settings = app_settings()
        geometry = settings.value("window/geometry")
        if isinstance(geometry, QByteArray) and not geometry.isEmpty():
            self.restoreGeometry(geometry)
        else:
            self.resize(1440, 900)
        for key, splitter in (("window/splitter", self.splitter),
                              ("window/readout_splitter", self.readout.splitter)):
            state = settings.value(key)
            if isinstance(state, QByteArray) and not state.isEmpty():
                splitter.restoreState(state)
        arrangement = settings.value("view/arrangement", DEFAULT_ARRANGEMENT)
        self.grid_action.setChecked(arrangement == "grid")

    def save_layout(self) -> None:
        """Remember window geometry, splitters and plot arrangement."""
        if not self._remember:
            return
        settings = app_settings()
        settings.setValue("window/geometry", self.saveGeometry())
        settings.setValue("window/splitter", self.splitter.saveState())
        settings.setValue("window/readout_splitter", self.readout.splitter.saveState())
        settings.setValue("view/arrangement", self.plot_area.arrangement())
        settings.sync()

    def closeEvent(self, event: QCloseEvent) -> None:  # noqa: N802 (Qt override)
        if not self.confirm_discard():
            event.ignore()
            return
        self.save_layout()
        if self.autosaver is not None:  # a clean exit: saved or dropped, nothing to recover
            self.autosaver.close()
        event.accept()

    # ================================================================== recovery
    def offer_recovery(self) -> bool:
        """At start-up: offer to restore edits autosaved by a run that did not end cleanly.

        Each left-over session is offered (newest first) until one is restored; it opens as
        an unsaved document with its original file. A declined session is deleted. An
        autosave that cannot be read is renamed ``.bad`` (never deleted) and reported.
        Returns True when a design was restored; never raises.
        """
        if self.autosaver is None:
            return False
        restored = False
        for entry in find_orphans(self.autosaver.folder()):
            try:
                design = read_entry(entry)
            except DesignError as exc:
                kept = set_aside(entry)
                where = ", ".join(str(p) for p in kept) or str(entry.design_path)
                self.show_message("Cannot recover design",
                                  f"An autosaved design could not be read ({exc.field}: "
                                  f"{exc.reason}). It was kept as {where}.")
                continue
            if restored:  # one window holds one document; the rest wait for the next start
                continue
            if not self.ask_restore(entry):
                remove_entry(entry)
                continue
            if not self.confirm_discard():
                continue
            self._trim_height = None
            self.document.restore(design, entry.original_path)
            restored = True
            if self.autosaver.autosave_now():  # safe in this session before the old one goes
                remove_entry(entry)
            self.statusBar().showMessage(f"Restored unsaved edits to {design.name}.", 8000)
        return restored

    def ask_restore(self, entry: RecoveryEntry) -> bool:
        """Ask whether to restore ``entry`` (True) or discard it (False)."""
        source = (f"from {entry.original_path}" if entry.original_path is not None
                  else "of a design never saved")
        note = f"\n\n(The file it came from is not known: {entry.info_problem}.)" \
            if entry.info_problem else ""
        answer = QMessageBox.question(
            self, "Restore unsaved edits?",
            f"Penduline did not close normally. Unsaved edits {source}"
            f"{f' ({entry.name})' if entry.name else ''}, autosaved {entry.saved_at}, "
            f"can be restored.{note}\n\nRestore them? Discard deletes them.",
            QMessageBox.StandardButton.Yes | QMessageBox.StandardButton.Discard,
            QMessageBox.StandardButton.Yes)
        return answer == QMessageBox.StandardButton.Yes


def _stored_units() -> UnitSystem:
    value = app_settings().value("view/units", UnitSystem.METRIC.value)
    try:
        return UnitSystem(str(value))
    except ValueError:
        return UnitSystem.METRIC


def _dropped_design(mime: Any) -> Path | None:
    if not mime.hasUrls():
        return None
    for url in mime.urls():
        if url.isLocalFile() and url.toLocalFile().lower().endswith(".json"):
            return Path(url.toLocalFile())
    return None
