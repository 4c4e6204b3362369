"""The pinned baseline (kept through undo/redo, exact deltas) and exporting from the window."""

from __future__ import annotations

import pytest

from app.window.main_window import MainWindow
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


@pytest.mark.slow
def test_window_exports_plots_data_and_report(window: MainWindow, tmp_path) -> None:  # type: ignore[no-untyped-def]
    import csv

    _edit(window, "swing.amplitude_deg", 2.0)  # the current, unsaved design is exported
    written = window.export_all(tmp_path / "out")
    names = {p.name for p in written}
    assert {"motion.png", "motion.svg", "report.pdf", "motion.csv"} <= names
    assert (tmp_path / "out" / "report.pdf").read_bytes()[:5] == b"%PDF-"
    with open(tmp_path / "out" / "motion.csv", newline="", encoding="utf-8") as fh:
        rows = list(csv.reader(fh))
    header = rows[0]
    angles = [float(r[header.index(next(h for h in header if h.startswith("exact_angle")))])
              for r in rows[1:]]
    assert max(angles) == pytest.approx(2.0, rel=1e-9)  # degrees: the edited semi-arc
