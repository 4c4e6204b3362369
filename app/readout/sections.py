"""The readout's sections: a title that says whether it is open, a click that opens or closes
it, and an order chosen by the design's use."""

from __future__ import annotations

from PySide6.QtWidgets import QTreeWidget, QTreeWidgetItem

from app.readout.cells import TreeCells

__all__ = ["mark_section", "toggle_section", "arrange_sections", "LOADS_SECTION"]

LOADS_SECTION = "Swing and loads"


def mark_section(cells: TreeCells, head: QTreeWidgetItem) -> None:
    """A section's title says whether it is open (▾) or closed (▸)."""
    if head.parent() is None:
        title = head.text(0).lstrip("▾▸ ")
        cells.set_text(head, 0, f"{'▾' if head.isExpanded() else '▸'} {title}")


def toggle_section(item: QTreeWidgetItem, _column: int = 0) -> None:
    """A click on a section's title opens or closes it."""
    if item.parent() is None:
        item.setExpanded(not item.isExpanded())


def arrange_sections(tree: QTreeWidget, heads: dict[str, QTreeWidgetItem], cells: TreeCells,
                     purpose: str) -> None:
    """Put the figures of the design's use first, so they fit without scrolling: a clock
    opens with timekeeping, tuning and the rate budget (the swing and loads last); an exhibit
    with the swing and loads (speed, sweep, loads, Foucault turn), its tuning closed."""
    loads = heads[LOADS_SECTION]
    index = tree.indexOfTopLevelItem(loads)
    wanted = 0 if purpose == "exhibit" else tree.topLevelItemCount() - 1
    if index != wanted:
        tree.takeTopLevelItem(index)
        tree.insertTopLevelItem(wanted, loads)
        loads.setFirstColumnSpanned(True)
    closed = ("Tuning",) if purpose == "exhibit" else ()
    for title, head in heads.items():
        head.setExpanded(title not in closed)
        mark_section(cells, head)
