"""The centre of the window: the plots, shown together in a grid or one at a time in tabs.

A plot whose class sets ``grid_member = False`` (the sweep, a study with its own controls) is
never squeezed into the grid: it keeps a tab of its own beside the grid page ("All plots").
Each view sits in a page of its own; a view is made (see :mod:`app.views.view_list`) when its
page first comes on view, or when anyone asks for it.
"""

from __future__ import annotations

from PySide6.QtCore import QSignalBlocker
from PySide6.QtWidgets import QGridLayout, QTabWidget, QVBoxLayout, QWidget

from app.views.view_list import ViewList

__all__ = ["PlotArea", "ARRANGEMENTS", "GRID_PAGE_TITLE"]

ARRANGEMENTS = ("grid", "tabs")
GRID_PAGE_TITLE = "All plots"


class PlotArea(QWidget):
    """Holds the views' pages; :meth:`set_arrangement` moves them between a grid and tabs.

    One tab widget serves both arrangements: in "tabs" every view has its tab; in "grid" the
    first tab holds every grid member together and the others keep tabs of their own (the tab
    bar hides itself when the grid page is the only tab).
    """

    def __init__(self, plots: ViewList[QWidget], arrangement: str = "grid",
                 parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.plots = plots
        self._arrangement = ""
        self._pages = [self._make_page() for _ in range(len(plots))]
        self._grid_page = QWidget()
        self._grid = QGridLayout(self._grid_page)
        self._grid.setContentsMargins(0, 0, 0, 0)
        self._grid.setSpacing(4)
        self.tabs = QTabWidget()
        self.tabs.setDocumentMode(True)
        self.tabs.setTabBarAutoHide(True)
        layout = QGridLayout(self)
        layout.setContentsMargins(0, 0, 0, 0)
        layout.addWidget(self.tabs)
        plots.when_made(self._place)
        self.tabs.currentChanged.connect(self._make_shown)
        self.set_arrangement(arrangement)

    @staticmethod
    def _make_page() -> QWidget:
        page = QWidget()
        column = QVBoxLayout(page)
        column.setContentsMargins(0, 0, 0, 0)
        return page

    def _place(self, index: int, view: QWidget) -> None:
        layout = self._pages[index].layout()
        assert layout is not None
        layout.addWidget(view)
        view.show()  # at once, not when the layout's queued show comes round

    def _make_shown(self, _index: int = 0) -> None:
        for i in self.shown_indices():
            self.plots[i]  # made on first use (app.views.view_list)

    def _title(self, index: int) -> str:
        return str(getattr(self.plots.classes[index], "title", "Plot"))

    def _in_grid(self, index: int) -> bool:
        return bool(getattr(self.plots.classes[index], "grid_member", True))

    def page(self, index: int) -> QWidget:
        """The page holding view ``index`` (a tab, or a cell of the grid page)."""
        return self._pages[index]

    def current_view(self) -> QWidget | None:
        """The view whose tab is current; the grid's first member on the grid page."""
        index = self._current_index()
        return None if index is None else self.plots[index]

    def arrangement(self) -> str:
        """"grid" or "tabs"."""
        return self._arrangement

    def set_arrangement(self, arrangement: str) -> None:
        """Show the plots together in a grid, or one per tab (the plot on view stays on
        view where it can)."""
        if arrangement not in ARRANGEMENTS:
            raise ValueError(f"arrangement must be one of {ARRANGEMENTS}, not {arrangement!r}")
        if arrangement == self._arrangement:
            return
        current = self._current_index()
        self._arrangement = arrangement
        with QSignalBlocker(self.tabs):
            while self.tabs.count():
                self.tabs.removeTab(0)
            members = [i for i in range(len(self._pages)) if self._in_grid(i)]
            if arrangement == "grid":
                for n, i in enumerate(members):
                    row, column, span = self._cell(n, len(members))
                    self._grid.addWidget(self._pages[i], row, column, 1, span)
                    self._pages[i].show()
                self.tabs.addTab(self._grid_page, GRID_PAGE_TITLE)
                tabbed = [i for i in range(len(self._pages)) if not self._in_grid(i)]
            else:
                for i in members:
                    self._grid.removeWidget(self._pages[i])
                tabbed = list(range(len(self._pages)))
            for i in tabbed:
                self.tabs.addTab(self._pages[i], self._title(i))
        if current is not None:
            self.show_plot(current)
        self.tabs.currentChanged.emit(self.tabs.currentIndex())

    @staticmethod
    def _cell(index: int, count: int) -> tuple[int, int, int]:
        """(row, column, column span): three plots put the first across the top row."""
        if count == 3:
            return ((0, 0, 2), (1, 0, 1), (1, 1, 1))[index]
        return index // 2, index % 2, 1

    def _current_index(self) -> int | None:
        widget = self.tabs.currentWidget()
        if widget is None:
            return None
        if widget is self._grid_page:
            return next((i for i in range(len(self._pages)) if self._in_grid(i)), None)
        return next((i for i, page in enumerate(self._pages) if page is widget), None)

    def show_plot(self, index: int) -> None:
        """Bring plot ``index`` on view (its tab, or the grid page holding it)."""
        if self._arrangement == "grid" and self._in_grid(index):
            self.tabs.setCurrentWidget(self._grid_page)
        else:
            self.tabs.setCurrentWidget(self._pages[index])

    def shown_indices(self) -> list[int]:
        """Indices of the plots on view now: the grid's members while the grid page is
        current, otherwise the current tab's plot."""
        widget = self.tabs.currentWidget()
        if widget is self._grid_page:
            return [i for i in range(len(self._pages)) if self._in_grid(i)]
        return [i for i, page in enumerate(self._pages) if page is widget]
