"""The centre of the window: the plots, shown together in a grid or one at a time in tabs."""

from __future__ import annotations

from PySide6.QtWidgets import QGridLayout, QStackedLayout, QTabWidget, QWidget

__all__ = ["PlotArea", "ARRANGEMENTS"]

ARRANGEMENTS = ("grid", "tabs")


class PlotArea(QWidget):
    """Holds the plot widgets; :meth:`set_arrangement` moves them between a grid and tabs."""

    def __init__(self, plots: list[QWidget], arrangement: str = "grid",
                 parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.plots = plots
        self._arrangement = ""
        self._stack = QStackedLayout(self)
        self._grid_page = QWidget()
        self._grid = QGridLayout(self._grid_page)
        self._grid.setContentsMargins(0, 0, 0, 0)
        self._grid.setSpacing(4)
        self.tabs = QTabWidget()
        self.tabs.setDocumentMode(True)
        self._stack.addWidget(self._grid_page)
        self._stack.addWidget(self.tabs)
        self.set_arrangement(arrangement)

    def arrangement(self) -> str:
        """"grid" or "tabs"."""
        return self._arrangement

    def set_arrangement(self, arrangement: str) -> None:
        """Show the plots together in a grid, or one per tab."""
        if arrangement not in ARRANGEMENTS:
            raise ValueError(f"arrangement must be one of {ARRANGEMENTS}, not {arrangement!r}")
        if arrangement == self._arrangement:
            return
        self._arrangement = arrangement
        if arrangement == "grid":
            while self.tabs.count():
                self.tabs.removeTab(0)
            for i, plot in enumerate(self.plots):
                row, column, span = self._cell(i)
                self._grid.addWidget(plot, row, column, 1, span)
                plot.show()
            self._stack.setCurrentWidget(self._grid_page)
        else:
            for plot in self.plots:
                self._grid.removeWidget(plot)
                self.tabs.addTab(plot, getattr(plot, "title", "Plot"))
            self._stack.setCurrentWidget(self.tabs)

    def _cell(self, index: int) -> tuple[int, int, int]:
        """(row, column, column span): three plots put the first across the top row."""
        if len(self.plots) == 3:
            return ((0, 0, 2), (1, 0, 1), (1, 1, 1))[index]
        return index // 2, index % 2, 1

    def show_plot(self, index: int) -> None:
        """Bring plot ``index`` forward (its tab, when in tabs)."""
        if self._arrangement == "tabs":
            self.tabs.setCurrentIndex(index)
