"""Computing in the window: the newest design is analysed once control returns to the event
loop, however many edits arrived meanwhile, on a pool thread (:mod:`app.window.analysis_worker`)
so the window never waits for it: at most one analysis runs, the newest design asked for
meanwhile runs next, and a result older than the one on view is dropped. An analysis that
takes longer than ``BUSY_NOTICE_MS`` shows "Computing…" in the status bar. Plots hidden behind
another tab are drawn when they come into view. Also the baseline and the unit system, which
re-show the last result.

The readout's choices (the height at which to quote the trim weight, the rate budget's
ranges) are passed to ``core.analyse`` as they are; the budget's ranges are judged by the
core's ``budget_ranges`` and kept in the settings, not in the design file.
"""

from __future__ import annotations

import time
from dataclasses import asdict
from typing import Any

from PySide6.QtCore import QTimer

from app.document.settings import app_settings, store_budget_ranges
from app.form.field_text import setting_reason
from app.form.units import UnitSystem
from app.window.analysis_worker import AnalysisRunner, warm_up
from app.window.exhibit_focus import focus_for_purpose
from app.window.parts import WindowParts
from core import Design, DesignError, Result, analyse
from core.tuning import BudgetRanges, budget_ranges

__all__ = ["WindowComputing", "COMPUTE_DELAY_MS", "BUSY_NOTICE_MS", "COMPUTING_TEXT"]

COMPUTE_DELAY_MS = 0
BUSY_NOTICE_MS = 150  # an analysis longer than this shows COMPUTING_TEXT in the status bar
COMPUTING_TEXT = "Computing…"


class WindowComputing(WindowParts):
    """Coalesced analysis of the document's design, and showing its result everywhere."""

    def _init_computing(self) -> None:
        """Make the timers and the runner (called once by the window's constructor)."""
        self._generation = 0          # numbers every request for an analysis
        self._shown_generation = 0    # the request whose outcome is on view
        self.analyse_inline = False   # True: on the interface thread (benchmarks compare)
        self._compute_timer = QTimer(self)
        self._compute_timer.setSingleShot(True)
        self._compute_timer.setInterval(COMPUTE_DELAY_MS)
        self._compute_timer.timeout.connect(self._compute_later)
        self._busy_timer = QTimer(self)
        self._busy_timer.setSingleShot(True)
        self._busy_timer.setInterval(BUSY_NOTICE_MS)
        self._busy_timer.timeout.connect(self._show_busy)
        self.analysis_runner = AnalysisRunner(self)
        self.analysis_runner.finished.connect(self._on_analysis_finished)
        self.analysis_runner.busyChanged.connect(self._on_busy_changed)
        QTimer.singleShot(0, warm_up)  # once the event loop runs: after the first paint

    def schedule_compute(self) -> None:
        """Ask for the newest design to be analysed once control returns to the event loop."""
        self._compute_timer.start()

    def computing_idle(self) -> bool:
        """True when no analysis runs or waits: the result on view is the newest there is."""
        return not self._compute_timer.isActive() and not self.analysis_runner.busy

    def _compute_key(self) -> tuple[Any, ...]:
        return (self.document.design, self._trim_height, self._budget_ranges)

    def _compute_later(self) -> None:
        """Hand the newest design to the runner (it runs next when one is running)."""
        if self.analyse_inline:
            self.compute_now()
            return
        key = self._compute_key()
        runner = self.analysis_runner
        if key == runner.running_key:
            runner.cancel_waiting()  # the one running is the one wanted
            return
        if not runner.busy and key == self._computed_key:
            return
        self._generation += 1
        design, trim, ranges = key
        runner.request(self._generation, key, analyse, design, trim_height_m=trim,
                       budget_ranges=ranges)

    def compute_now(self) -> None:
        """Analyse the document's design here and now (unless it is the one already shown)
        and show it; an analysis still running for an older design is dropped when it ends.
        For actions that need the figures at once (export, pin a baseline) and for tests."""
        self._compute_timer.stop()
        self.analysis_runner.cancel_waiting()
        self._generation += 1
        self._shown_generation = self._generation  # whatever runs now is superseded
        key = self._compute_key()
        if key == self._computed_key:
            return
        started = time.perf_counter()
        try:
            outcome: object = analyse(key[0], trim_height_m=key[1], budget_ranges=key[2])
        except Exception as exc:  # shown as a problem, never into the event loop
            outcome = exc
        self._apply_outcome(key, outcome, (time.perf_counter() - started) * 1000.0)

    def _on_analysis_finished(self, generation: int, key: object, outcome: object,
                              elapsed_ms: float) -> None:
        if generation <= self._shown_generation:
            return  # a newer design is already on view
        self._shown_generation = generation
        self._apply_outcome(key, outcome, elapsed_ms)

    def _apply_outcome(self, key: object, outcome: object, elapsed_ms: float) -> None:
        """Show a finished analysis: its result, or why the design cannot be computed."""
        self._computed_key = key  # type: ignore[assignment]
        if isinstance(outcome, DesignError):
            self._problem = outcome
            self._show_compute_problem(outcome)
            return
        if not isinstance(outcome, Result):
            self.readout.show_compute_problem(
                f"Unexpected failure: {type(outcome).__name__}: {outcome}. Showing the last "
                "result.")
            return
        self.last_compute_ms = elapsed_ms
        self.compute_count += 1
        self._problem = None
        self._show_result(outcome)

    def _on_busy_changed(self, busy: bool) -> None:
        if busy:
            self._busy_timer.start()  # a quick analysis never shows the notice
        else:
            self._busy_timer.stop()
            if self.compute_label.text() == COMPUTING_TEXT:
                self.compute_label.setText(self._compute_label_text())

    def _show_busy(self) -> None:
        if self.analysis_runner.busy:
            self.compute_label.setText(COMPUTING_TEXT)

    def _compute_label_text(self) -> str:
        if self.compute_count > 1:  # the first analysis also pays one-time imports
            return f"analysis {self.last_compute_ms:.1f} ms"
        return ""

    def _show_result(self, result: Result) -> None:
        self.result = result
        focus_for_purpose(self, result)
        self._stale_plots = set(range(len(self.plots)))
        self._refresh_plots()
        self.readout.show_result(result, self.baseline)
        self.design_panel.set_result(result)
        if not (self.analysis_runner.busy and self.compute_label.text() == COMPUTING_TEXT):
            self.compute_label.setText(self._compute_label_text())
        self._reshow_problem()

    def _reshow_problem(self) -> None:
        """Showing the last good result again (a baseline pinned, units changed) must not
        hide that the design on view cannot be computed."""
        if self._problem is not None:
            self._show_compute_problem(self._problem)

    def _shown_plot_indices(self) -> list[int]:
        """The plots on view: the grid's, or the current tab's."""
        return self.plot_area.shown_indices()

    def _refresh_plots(self, everything: bool = False) -> None:
        """Draw the latest result in the plots on view (or all); plots hidden behind another
        tab are drawn when they come into view, so a drag never pays for unseen plots."""
        if self.result is None:
            return
        indices = range(len(self.plots)) if everything else self._shown_plot_indices()
        for i in indices:
            if i in self._stale_plots:
                self._stale_plots.discard(i)
                self.plots[i].show_result(self.result, self.baseline)  # type: ignore[attr-defined]

    def _show_compute_problem(self, error: DesignError) -> None:
        if error.field == "trim_height_m":
            self.readout.show_trim_problem(error.reason)
            return
        sentence = self.design_panel.refusal_text(error)
        self.readout.show_compute_problem(
            f"{sentence} The plots and figures still show the last design that could be "
            "computed.")
        row = self.design_panel.all_rows().get(error.field)
        if row is not None:
            row.mark(sentence)

    def _on_design_changed(self, _design: Design) -> None:
        self._update_title()
        self.schedule_compute()

    def _on_trim_height(self, height_m: float) -> None:
        self._trim_height = height_m
        self.schedule_compute()

    def budget_ranges(self) -> BudgetRanges:
        """The rate budget's half-widths in use (K, hPa, degrees)."""
        return self._budget_ranges

    def _on_budget_range(self, key: str, value: float) -> None:
        """A budget half-width entered: the core judges it; a refused one marks its entry and
        the budget keeps the last good ranges."""
        values = asdict(self._budget_ranges)
        values[key] = value
        try:
            ranges = budget_ranges(**values)
        except DesignError as exc:
            self.readout.show_budget_problem(key, setting_reason(exc, self._system))
            return
        self._budget_ranges = ranges
        self.readout.set_budget_ranges(ranges)
        if self._remember:
            store_budget_ranges(ranges)
        self.schedule_compute()

    # -------------------------------------------------------------- baseline, units
    def pin_baseline(self) -> None:
        """Keep the current result as the grey baseline in every plot and the Δ column."""
        self.compute_now()
        if self.result is not None:
            self.baseline = self.result
            self._show_result(self.result)
            self.statusBar().showMessage("Baseline pinned: the current design is drawn in grey.",
                                         4000)

    def clear_baseline(self) -> None:
        """Remove the baseline."""
        self.baseline = None
        if self.result is not None:
            self._show_result(self.result)

    def unit_system(self) -> UnitSystem:
        """The units of entry and display."""
        return self._system

    def set_unit_system(self, system: UnitSystem) -> None:
        """Enter and show values in ``system`` (the file stays in SI)."""
        self._system = system
        self.unit_actions[system].setChecked(True)
        self.design_panel.set_unit_system(system)
        self.readout.set_unit_system(system)
        for view in self.plots.made_views():  # the others take the units when made
            if hasattr(view, "set_unit_system"):  # the rating view; the swing preview
                view.set_unit_system(system)
        self._reshow_problem()
        if self._remember:
            app_settings().setValue("view/units", system.value)

