"""The one list of views: the tabs, the "All plots" grid, File ▸ Export and the headless
exporter all read :data:`VIEWS`. The window makes each view when it first comes on view
(:class:`app.views.view_list.ViewList`).

To add a view, subclass :class:`app.views.base.ResultView` (or follow
:class:`app.views.base.View`), give it a ``title``, a ``slug`` and a ``caption`` and implement
``show_result(result, baseline)``; then add its class here. ``grid_member = False`` keeps it
out of the grid (a tab of its own); ``in_report = False`` keeps it out of the headless export
and the PDF.
"""

from __future__ import annotations

from app.views.base import View
from app.views.motion import MotionPlot
from app.views.period_curve import PeriodCurvePlot
from app.views.phase import PhasePlot
from app.views.plan_view import PlanView
from app.views.rating_view import RatingView
from app.views.recording_view import RecordingView
from app.views.sweep import SweepPlot
from app.views.swing_preview import SwingPreview

__all__ = ["VIEWS", "PLOT_CLASSES", "report_views"]

VIEWS: tuple[type[View], ...] = (MotionPlot, PhasePlot, PeriodCurvePlot, SwingPreview,
                                 PlanView, SweepPlot, RatingView, RecordingView)
"""Every view, in the order of the tabs and of the grid."""

PLOT_CLASSES = (MotionPlot, PhasePlot, PeriodCurvePlot)
"""The chart views (curves on axes), for tests and benchmarks that treat them alike."""


def report_views() -> list[View]:
    """One of each view the headless export and the PDF report show."""
    return [cls() for cls in VIEWS if cls.in_report]
