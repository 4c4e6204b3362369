"""The plot area: plots together in a grid page or one per tab; a plot that is not a grid
member (the sweep) keeps a tab of its own either way."""

from __future__ import annotations

import pytest
from PySide6.QtWidgets import QWidget

from app.views.plot_area import GRID_PAGE_TITLE, PlotArea
from app.views.view_list import ViewList


def _plot_class(title: str, grid_member: bool = True) -> type[QWidget]:
    return type(f"Plot{title}", (QWidget,), {"title": title, "grid_member": grid_member})


@pytest.fixture
def area(qtbot):  # type: ignore[no-untyped-def]
    plots: ViewList[QWidget] = ViewList([_plot_class("A"), _plot_class("B"), _plot_class("C"),
                                         _plot_class("D"), _plot_class("Sweep", False)])
    view = PlotArea(plots, "tabs")
    qtbot.addWidget(view)
    return view


def _tab_titles(area: PlotArea) -> list[str]:
    return [area.tabs.tabText(i) for i in range(area.tabs.count())]


def test_tabs_hold_every_plot(area: PlotArea) -> None:
    assert _tab_titles(area) == ["A", "B", "C", "D", "Sweep"]
    assert area.shown_indices() == [0]
    area.show_plot(4)
    assert area.shown_indices() == [4]


def test_grid_page_holds_the_members_and_the_sweep_keeps_its_tab(area: PlotArea) -> None:
    area.show_plot(2)
    area.set_arrangement("grid")
    assert _tab_titles(area) == [GRID_PAGE_TITLE, "Sweep"]
    assert area.shown_indices() == [0, 1, 2, 3]  # C was on view: its page is
    area.show_plot(4)
    assert area.shown_indices() == [4]
    area.set_arrangement("tabs")  # the sweep stays on view
    assert _tab_titles(area) == ["A", "B", "C", "D", "Sweep"]
    assert area.shown_indices() == [4]
    with pytest.raises(ValueError, match="arrangement"):
        area.set_arrangement("stack")


def test_switching_arrangement_announces_the_page_on_view(qtbot, area: PlotArea) -> None:  # type: ignore[no-untyped-def]
    with qtbot.waitSignal(area.tabs.currentChanged):
        area.set_arrangement("grid")
    with qtbot.waitSignal(area.tabs.currentChanged):
        area.set_arrangement("tabs")


def test_a_view_is_made_when_its_page_first_comes_on_view(area: PlotArea) -> None:
    plots = area.plots
    assert [plots.made(i) for i in range(5)] == [True, False, False, False, False]
    area.show_plot(3)
    assert plots.made(3) and not plots.made(2)
    assert area.current_view() is plots[3]
    assert plots[3].parentWidget() is area.page(3)  # placed in its page
    area.set_arrangement("grid")  # the grid's members come on view together
    assert [plots.made(i) for i in range(5)] == [True, True, True, True, False]
    assert plots.index(plots[4]) == 4 and plots[4].parentWidget() is area.page(4)
