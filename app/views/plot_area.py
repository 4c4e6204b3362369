"""The centre of the window: the plots, shown together in a grid or one at a time in tabs.

A plot whose class sets ``grid_member = False`` (the sweep, a study with its own controls) is
never squeezed into the grid: it keeps a tab of its own beside the grid page ("All plots").
"""

from __future__ import annotations

from PySide6.QtCore import QSignalBlocker
from PySide6.QtWidgets import QGridLayout, QTabWidget, QWidget

__all__ = ["PlotArea", "ARRANGEMENTS", "GRID_PAGE_TITLE"]

ARRANGEMENTS = ("grid", "tabs")
GRID_PAGE_TITLE = "All plots"


def _in_grid(plot: QWidget) -> bool:
    return bool(getattr(plot, "grid_member", True))


class PlotArea(QWidget):
    """Holds the plot widgets; :meth:`set_arrangement` moves them between a grid and tabs.

    One tab widget serves both arrangements: in "tabs" every plot has its tab; in "grid" the
    first tab holds every grid member together and the others keep tabs of their own (the tab
    bar hides itself when the grid page is the only tab).
    """

    def __init__(self, plots: list[QWidget], arrangement: str = "grid",
                 parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.plots = plots
        self._arrangement = ""
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
        self.set_arrangement(arrangement)

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
        current = self._current_plot()
        self._arrangement = arrangement
        with QSignalBlocker(self.tabs):
            while self.tabs.count():
                self.tabs.removeTab(0)
            members = [p for p in self.plots if _in_grid(p)]
            if arrangement == "grid":
                for i, plot in enumerate(members):
                    row, column, span = self._cell(i, len(members))
                    self._grid.addWidget(plot, row, column, 1, span)
                    plot.show()
                self.tabs.addTab(self._grid_page, GRID_PAGE_TITLE)
                tabbed = [p for p in self.plots if not _in_grid(p)]
            else:
                for plot in members:
                    self._grid.removeWidget(plot)
                tabbed = list(self.plots)
            for plot in tabbed:
                self.tabs.addTab(plot, getattr(plot, "title", "Plot"))
        if current is not None:
            self.show_plot(self.plots.index(current))
        self.tabs.currentChanged.emit(self.tabs.currentIndex())

    @staticmethod
    def _cell(index: int, count: int) -> tuple[int, int, int]:
        """(row, column, column span): three plots put the first across the top row."""
        if count == 3:
            return ((0, 0, 2), (1, 0, 1), (1, 1, 1))[index]
        return index // 2, index % 2, 1

    def _current_plot(self) -> QWidget | None:
        widget = self.tabs.currentWidget()
        if widget is None:
            return None
        if widget is self._grid_page:
            return next((p for p in self.plots if _in_grid(p)), None)
        return widget if widget in self.plots else None

    def show_plot(self, index: int) -> None:
        """Bring plot ``index`` on view (its tab, or the grid page holding it)."""
        plot = self.plots[index]
        if self._arrangement == "grid" and _in_grid(plot):
            self.tabs.setCurrentWidget(self._grid_page)
        else:
            self.tabs.setCurrentWidget(plot)

    def shown_indices(self) -> list[int]:
        """Indices of the plots on view now: the grid's members while the grid page is
        current, otherwise the current tab's plot."""
        widget = self.tabs.currentWidget()
        if widget is self._grid_page:
            return [i for i, p in enumerate(self.plots) if _in_grid(p)]
        return [i for i, p in enumerate(self.plots) if p is widget]
