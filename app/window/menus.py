"""The window's menus and their actions (File, Edit, View, Tools, Help)."""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path
from typing import TYPE_CHECKING, Any

from PySide6.QtGui import QAction, QActionGroup, QKeySequence
from PySide6.QtWidgets import QMenu

from app.document.settings import recent_files
from app.form.units import UnitSystem
from app.views.motion import MotionPlot
from app.window.files import example_files, example_title
from app.window.parts import WindowParts
from app.window.sheet_export import ask_export_sheet

if TYPE_CHECKING:  # imported when first used: the window opens without them
    from app.form.materials_dialog import MaterialsDialog
    from app.views.rating_view import RatingView
    from app.views.recording_view import RecordingView
    from app.window.solve_dialog import SolveDialog

__all__ = ["WindowMenus"]


class WindowMenus(WindowParts):
    """Builds the menu bar; each action calls a method of the window."""

    def _build_menus(self) -> None:
        self._build_file_menu()
        self._build_edit_menu()
        self._build_view_menu()
        tools = self.menuBar().addMenu("&Tools")
        self._action(tools, "&Solve…", self.open_solve_dialog, "Ctrl+Shift+L")
        self._action(tools, "Your &materials…", self.open_materials_dialog)
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
            self._action(self.examples_menu, example_title(path), self._opener(path))
        self.recent_menu = menu.addMenu("Open &recent")
        self.recent_menu.aboutToShow.connect(self._fill_recent_menu)
        self._action(menu, "Open a &beat recording…", self._open_recording)
        menu.addSeparator()
        self._action(menu, "&Save", self.save, QKeySequence.StandardKey.Save)
        self._action(menu, "Save &as…", self.save_as, QKeySequence.StandardKey.SaveAs)
        menu.addSeparator()
        self._action(menu, "&Export plots…", self.ask_export_plots, "Ctrl+E")
        self._action(menu, "Export plots, data and &report…", self.ask_export_all,
                     "Ctrl+Shift+E")
        self._action(menu, "Export client &sheet…", lambda: ask_export_sheet(self))
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
        menu.addSeparator()
        self._action(menu, "Add a rating &reading now", self._add_rating_reading, "Ctrl+R")

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
        motion = self.plots.of_slug("motion", MotionPlot)
        self.difference_action = QAction("Show exact − small-angle &difference", self,
                                         checkable=True)
        self.difference_action.setChecked(motion.shows_difference)
        self.difference_action.toggled.connect(motion.set_show_difference)
        motion.difference_action.toggled.connect(self.difference_action.setChecked)
        menu.addAction(self.difference_action)
        self._action(menu, "&Rating log", self._show_rating_view, "Ctrl+Shift+R")
        self._action(menu, "Beat recor&ding", self._show_recording_view)
        menu.addSeparator()
        self._action(menu, "&Pin current design as baseline", self.pin_baseline, "Ctrl+B")
        self._action(menu, "&Clear baseline", self.clear_baseline)

    def open_solve_dialog(self) -> SolveDialog:
        """Tools ▸ Solve…: the solve dialog over the window (window-modal, not blocking)."""
        from app.window.solve_dialog import SolveDialog

        dialog = SolveDialog(self.document, self._system, self)
        dialog.finished.connect(dialog.deleteLater)
        self.solve_dialog = dialog
        dialog.open()
        return dialog

    def open_materials_dialog(self) -> MaterialsDialog:
        """Tools ▸ Your materials…: add, edit and remove the design's own materials."""
        from app.form.materials_dialog import MaterialsDialog

        dialog = MaterialsDialog(self.document, self)
        dialog.finished.connect(dialog.deleteLater)
        self.materials_dialog = dialog
        dialog.open()
        return dialog

    def _rating_view(self) -> RatingView:
        from app.views.rating_view import RatingView

        return self.plots.of_slug("rating", RatingView)

    def _show_rating_view(self) -> None:
        self.plot_area.show_plot(self.plots.index_of_slug("rating"))

    def _recording_view(self) -> RecordingView:
        from app.views.recording_view import RecordingView

        return self.plots.of_slug("recording", RecordingView)

    def _show_recording_view(self) -> None:
        self.plot_area.show_plot(self.plots.index_of_slug("recording"))

    def _open_recording(self) -> None:
        """Bring the recording view on view and ask for a WAV file."""
        self._show_recording_view()
        self._recording_view().ask_open()

    def _add_rating_reading(self) -> None:
        """Bring the rating view on view and add a reading at the present time."""
        self._show_rating_view()
        view = self._rating_view()
        view.add_reading_now()

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
