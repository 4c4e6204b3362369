"""Computing in the window: the newest design is analysed once control returns to the event
loop, however many edits arrived meanwhile; plots hidden behind another tab are drawn when they
come into view. Also the baseline and the unit system, which re-show the last result.

The readout's choices (the height at which to quote the trim weight, the rate budget's
ranges) are passed to ``core.analyse`` as they are; the budget's ranges are judged by the
core's ``budget_ranges`` and kept in the settings, not in the design file.
"""

from __future__ import annotations

import time
from dataclasses import asdict

from app.document.settings import app_settings, store_budget_ranges
from app.form.labels import field_label
from app.form.units import UnitSystem
from app.window.exhibit_focus import focus_for_purpose
from app.window.parts import WindowParts
from core import Design, DesignError, Result, analyse
from core.tuning import BudgetRanges, budget_ranges

__all__ = ["WindowComputing", "COMPUTE_DELAY_MS"]

COMPUTE_DELAY_MS = 0


class WindowComputing(WindowParts):
    """Coalesced analysis of the document's design, and showing its result everywhere."""

    def schedule_compute(self) -> None:
        """Ask for the newest design to be analysed once control returns to the event loop."""
        self._compute_timer.start()

    def compute_now(self) -> None:
        """Analyse the document's design (unless it is the one already shown) and show it."""
        self._compute_timer.stop()
        design = self.document.design
        key = (design, self._trim_height, self._budget_ranges)
        if key == self._computed_key:
            return
        self._computed_key = key
        started = time.perf_counter()
        try:
            result = analyse(design, trim_height_m=self._trim_height,
                             budget_ranges=self._budget_ranges)
        except DesignError as exc:
            self._problem = exc
            self._show_compute_problem(exc)
            return
        except Exception as exc:  # never let a defect escape into the event loop
            self.readout.show_compute_problem(f"Unexpected failure: {type(exc).__name__}: "
                                              f"{exc}. Showing the last result.")
            return
        self.last_compute_ms = (time.perf_counter() - started) * 1000.0
        self.compute_count += 1
        self._problem = None
        self._show_result(result)

    def _show_result(self, result: Result) -> None:
        self.result = result
        focus_for_purpose(self, result)
        self._stale_plots = set(range(len(self.plots)))
        self._refresh_plots()
        self.readout.show_result(result, self.baseline)
        self.design_panel.set_result(result)
        if self.compute_count > 1:  # the first analysis also pays one-time imports
            self.compute_label.setText(f"analysis {self.last_compute_ms:.1f} ms")
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
        where = field_label(error.field) if error.field not in ("design", "parts") else "Design"
        self.readout.show_compute_problem(
            f"{where}: {error.reason}. The plots and figures still show the last design that "
            "could be computed.")
        row = self.design_panel.all_rows().get(error.field)
        if row is not None:
            row.mark(error.reason)

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
            self.readout.show_budget_problem(key, exc.reason)
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
        for view in self.plots:
            if hasattr(view, "set_unit_system"):  # the rating view's temperatures, pressures
                view.set_unit_system(system)
        self._reshow_problem()
        if self._remember:
            app_settings().setValue("view/units", system.value)

