"""The pinned baseline: kept through undo/redo, shown as exact deltas in the readout."""

from __future__ import annotations

import pytest

from app.main_window import MainWindow
from core import analyse, with_value


def _edit(window: MainWindow, path: str, value: float) -> None:
    window.document.commit(with_value(window.document.design, path, value), f"Set {path}")
    window.compute_now()


def test_baseline_survives_undo_and_redo(window: MainWindow) -> None:
    pinned_design = window.document.design
    window.pin_baseline()
    _edit(window, "parts[0].length_m", 1.2)
    _edit(window, "swing.amplitude_deg", 3.0)
    for _ in range(2):
        window.document.undo_stack.undo()
    window.compute_now()
    assert window.document.design == pinned_design
    assert window.baseline is not None and window.baseline.design == pinned_design
    for _ in range(2):
        window.document.undo_stack.redo()
    window.compute_now()
    assert window.baseline.design == pinned_design
    assert window.document.design.swing.amplitude_deg == 3.0


def test_delta_column_is_the_exact_difference(window: MainWindow) -> None:
    window.pin_baseline()
    _edit(window, "parts[2].mass_kg", 9.5)
    now, base = analyse(window.document.design), window.baseline
    assert base is not None
    # Exact difference of the two core results, shown at the readout's precision.
    assert window.result.period_s - base.period_s == now.period_s - base.period_s
    text = window.readout._items["rate_s_per_day"][0].text(3)
    assert float(text) == pytest.approx(now.rate_s_per_day - base.rate_s_per_day, abs=0.005)
