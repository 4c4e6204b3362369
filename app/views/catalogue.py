"""The one list of views: the tabs, the "All plots" grid, File ▸ Export and the headless
exporter all read :data:`CARDS`, in the order of the tabs and of the grid.

A :class:`ViewCard` holds what must be known about a view before it exists — its slug (the
export's file name and ``--view``), its tab title, whether it sits in the grid and in the
report — and where its class lives. The class takes these facts from its card
(``@from_card("motion")``), so they have one home; the module is imported only when the
view is first made, and the window starts with the modules of the one view on show
(:class:`app.views.view_list.ViewList`).

To add a view, subclass :class:`app.views.base.ResultView` (or follow
:class:`app.views.base.View`), decorate it with ``@from_card(slug)``, give it a ``caption``
and implement ``show_result(result, baseline)``; then add its card here. ``grid_member=False``
keeps it out of the grid (a tab of its own); ``in_report=False`` keeps it out of the headless
export and the PDF. :data:`VIEWS` (every class, imported on first use) serves code that needs
the classes themselves.
"""

from __future__ import annotations

import importlib
from collections.abc import Callable
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any, TypeVar

from app.import_path import without_feature_scan

if TYPE_CHECKING:
    from app.views.base import View

__all__ = ["ViewCard", "CARDS", "card", "from_card", "report_views"]  # and VIEWS, PLOT_CLASSES


@dataclass(frozen=True)
class ViewCard:
    """A view before it is made: its facts and where its class is."""

    slug: str
    title: str
    module: str
    class_name: str
    grid_member: bool = True
    in_report: bool = True

    def load(self) -> type[View]:
        """The view's class (its module imported now if it was not, without PySide's feature
        scan: :mod:`app.import_path`)."""
        with without_feature_scan():
            module = importlib.import_module(self.module)
        cls: type[View] = getattr(module, self.class_name)
        return cls

    def __call__(self) -> View:
        """A new view of this card's class."""
        return self.load()()


CARDS: tuple[ViewCard, ...] = (
    ViewCard("motion", "Motion", "app.views.motion", "MotionPlot"),
    ViewCard("phase", "Phase plane", "app.views.phase", "PhasePlot"),
    ViewCard("period_curve", "Period curve", "app.views.period_curve",
             "PeriodCurvePlot"),
    ViewCard("swing_preview", "Swing preview", "app.views.swing_preview", "SwingPreview"),
    ViewCard("plan_view", "Plan view", "app.views.plan_view", "PlanView", grid_member=False),
    # a study with its own controls: a tab of its own; it depends on choices made on screen
    ViewCard("sweep", "Sweep", "app.views.sweep", "SweepPlot", grid_member=False,
             in_report=False),
    # not a plot of the current swing; it needs a log and choices made on screen
    ViewCard("rating", "Rating", "app.views.rating_view", "RatingView", grid_member=False,
             in_report=False),
    # the recording is not part of the design
    ViewCard("recording", "Recording", "app.views.recording_view", "RecordingView",
             grid_member=False, in_report=False),
)
"""Every view, in the order of the tabs and of the grid."""

_PLOT_SLUGS = ("motion", "phase", "period_curve")  # the chart views (curves on axes)

C = TypeVar("C", bound=type)


def card(slug: str) -> ViewCard:
    """The card of the view ``slug`` (KeyError when there is none)."""
    for entry in CARDS:
        if entry.slug == slug:
            return entry
    raise KeyError(slug)


def from_card(slug: str) -> Callable[[C], C]:
    """Class decorator: the class's ``slug``, ``title``, ``grid_member`` and ``in_report``
    from the card ``slug``."""
    entry = card(slug)

    def decorate(cls: C) -> C:
        for name in ("slug", "title", "grid_member", "in_report"):
            setattr(cls, name, getattr(entry, name))
        return cls

    return decorate


def report_views() -> list[View]:
    """One of each view the headless export and the PDF report show."""
    return [entry() for entry in CARDS if entry.in_report]


def __getattr__(name: str) -> Any:
    """``VIEWS`` (every view class) and ``PLOT_CLASSES`` (the chart views), imported when
    first asked for (PEP 562)."""
    if name == "VIEWS":
        return tuple(entry.load() for entry in CARDS)
    if name == "PLOT_CLASSES":
        return tuple(card(slug).load() for slug in _PLOT_SLUGS)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
