"""What the window's mixins share: the attributes and methods each may use of the others.

At run time :class:`WindowParts` is a plain class; for the type checker it is the assembled
window, so each mixin is checked against the attributes the window really has.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

__all__ = ["WindowParts"]

if TYPE_CHECKING:
    from pathlib import Path

    from PySide6.QtCore import QTimer
    from PySide6.QtGui import QAction
    from PySide6.QtWidgets import QLabel, QMainWindow, QMenu, QSplitter

    from app.document.document import Document
    from app.document.recovery import Autosaver
    from app.form.design_panel import DesignPanel
    from app.form.units import UnitSystem
    from app.readout.readout_panel import ReadoutPanel
    from app.views.base import View
    from app.views.plot_area import PlotArea
    from app.views.view_list import ViewList
    from app.window.analysis_worker import AnalysisRunner
    from core import DesignError, Result
    from core.tuning import BudgetRanges

    class WindowParts(QMainWindow):
        """The window as the mixins see it (type checking only)."""

        document: Document
        result: Result | None
        baseline: Result | None
        last_message: str
        compute_count: int
        last_compute_ms: float
        autosaver: Autosaver | None
        design_panel: DesignPanel
        readout: ReadoutPanel
        plots: ViewList[View]
        plot_area: PlotArea
        splitter: QSplitter
        compute_label: QLabel
        grid_action: QAction
        unit_actions: dict[UnitSystem, QAction]
        recent_menu: QMenu
        _remember: bool
        _trim_height: float | None
        _budget_ranges: BudgetRanges
        _computed_key: tuple[object, ...] | None
        _problem: DesignError | None
        _system: UnitSystem
        _compute_timer: QTimer
        _busy_timer: QTimer
        _generation: int
        _shown_generation: int
        analysis_runner: AnalysisRunner
        _stale_plots: set[int]

        def compute_now(self) -> None: ...
        def computing_idle(self) -> bool: ...
        def schedule_compute(self) -> None: ...
        def _refresh_plots(self, everything: bool = False) -> None: ...
        def show_message(self, title: str, text: str) -> None: ...
        def confirm_discard(self) -> bool: ...
        def open_file(self, path: str | Path, as_example: bool = False) -> bool: ...
        def new_document(self) -> bool: ...
        def ask_open(self) -> None: ...
        def save(self) -> bool: ...
        def save_as(self, path: str | Path | None = None) -> bool: ...
        def ask_export_plots(self) -> None: ...
        def ask_export_all(self) -> None: ...
        def pin_baseline(self) -> None: ...
        def clear_baseline(self) -> None: ...
        def set_unit_system(self, system: UnitSystem) -> None: ...
        def save_layout(self) -> None: ...
        def _about(self) -> None: ...
        def _update_title(self) -> None: ...
else:
    class WindowParts:
        """A plain base at run time (see the module notes)."""
