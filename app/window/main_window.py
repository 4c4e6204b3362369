"""The workbench window: design panel (left), views (centre), readout (right).

The window holds one :class:`~app.document.document.Document`. Every change of the shown design
starts a single-shot zero-delay timer; when it fires, only the newest design is analysed (by
``core.analyse``, the one place figures come from, on a pool thread) and shown, so a burst of
edits never queues stale work and a slow design never freezes the window
(:mod:`app.window.computing`). A design the core cannot compute leaves the views
and figures at the last good result and says why.
"""

from __future__ import annotations

from importlib.metadata import PackageNotFoundError, version
from pathlib import Path
from typing import Any, cast

from PySide6.QtCore import Qt
from PySide6.QtWidgets import QLabel, QMainWindow, QMessageBox, QSplitter, QWidget

from app import theme
from app.document.document import Document, blank_design
from app.document.recovery import Autosaver
from app.document.settings import stored_budget_ranges
from app.form.design_panel import DesignPanel
from app.form.units import UnitSystem
from app.readout.readout_panel import ReadoutPanel
from app.views.base import View
from app.views.catalogue import CARDS
from app.views.plot_area import PlotArea
from app.views.view_list import ViewList
from app.window.computing import WindowComputing
from app.window.files import DESIGN_FILTER, WindowFiles, example_files, examples_folder
from app.window.layout import DEFAULT_ARRANGEMENT, WindowLayout, stored_units
from app.window.menus import WindowMenus
from core import Design, DesignError, Result
from core.tuning import BudgetRanges

__all__ = ["MainWindow", "examples_folder", "example_files", "DESIGN_FILTER", "about_text",
           "app_version"]


def app_version() -> str:
    """The installed package's version ("unknown" when run from a tree never installed)."""
    try:
        return version("penduline")
    except PackageNotFoundError:
        return "unknown"


def about_text() -> str:
    """Help ▸ About: what Penduline is, and its version."""
    return (f"Penduline {app_version()} — a workbench for real pendulums.\n\nExact dynamics "
            "of the compound pendulum, local gravity, temperature and air, with rates in "
            "seconds per day.")


class MainWindow(WindowMenus, WindowComputing, WindowFiles, WindowLayout, QMainWindow):
    """The document window: design panel (left), views (centre), readout (right).

    Its concerns sit in mixins: :class:`~app.window.menus.WindowMenus`,
    :class:`~app.window.computing.WindowComputing`, :class:`~app.window.files.WindowFiles` and
    :class:`~app.window.layout.WindowLayout`; this class assembles the widgets.
    """

    def __init__(self, design: Design | None = None, path: str | Path | None = None,
                 remember_layout: bool = True, autosave: bool | None = None) -> None:
        """``remember_layout=False`` neither reads nor writes the stored layout and units (for
        screenshots, which must look the same everywhere). ``autosave`` (default: as
        ``remember_layout``) keeps unsaved edits in the recovery folder (see
        :mod:`app.document.recovery`)."""
        super().__init__()
        self._remember = remember_layout
        theme.colour_window(self)  # the style sheet goes on the readout and the plots only
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
        self._system = stored_units() if remember_layout else UnitSystem.METRIC
        self._init_computing()
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

    def _build_views(self) -> None:
        self.design_panel = DesignPanel(self.document, self._system)
        self.plots: ViewList[View] = ViewList(CARDS)  # each made when first on view
        self.plots.when_made(self._prepare_view)
        self._stale_plots: set[int] = set(range(len(self.plots)))
        self.plot_area = PlotArea(cast(ViewList[QWidget], self.plots), DEFAULT_ARRANGEMENT)
        self.plot_area.tabs.currentChanged.connect(lambda _index: self._refresh_plots())
        self.readout = ReadoutPanel(self._system)
        # the plot area only: the design panel and the readout style their parts (app.theme)
        self.plot_area.setStyleSheet(theme.STYLE_SHEET)
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
        theme.set_role(self.compute_label, "hint")
        self.statusBar().addPermanentWidget(self.compute_label)

    def _prepare_view(self, index: int, view: View) -> None:
        """Ready a view as it is made: its on-screen controls, the document for a view that
        edits it (the rating log), the units, and a mark to show the latest result."""
        view.attach_controls()  # on-screen controls (the swing preview's play, speed, line)
        bind, set_units = (getattr(view, name, None)
                           for name in ("bind_document", "set_unit_system"))
        if bind is not None:
            bind(self.document)
        if set_units is not None:
            set_units(self._system)
        self._stale_plots.add(index)

    def show_message(self, title: str, text: str) -> None:
        """Tell the person something went wrong (a window-modal box that does not block)."""
        self.last_message = text
        box = QMessageBox(QMessageBox.Icon.Warning, title, text, QMessageBox.StandardButton.Ok,
                          self)
        box.setAttribute(Qt.WidgetAttribute.WA_DeleteOnClose)
        box.open()

    def _about(self) -> None:
        QMessageBox.about(self, "About Penduline", about_text())

    def _update_title(self) -> None:
        self.setWindowTitle(f"{self.document.display_name()}[*] — "
                            f"{self.document.design.name} — Penduline")
        self.setWindowModified(self.document.is_dirty)
