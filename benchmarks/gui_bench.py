"""How many full window updates per second a drag sustains, against the cost of the analysis.

Opens the example offscreen at 1440×900, once with the default arrangement (plots in tabs,
one on view) and once with every plot on view (grid), then drags
the rod length through 200 successive values along the path a spin box uses (``stepBy`` →
live preview → coalesced analysis → ``setData`` on every plot and the readout), repainting the
whole window after each step. In the same run it times ``core.analyse`` alone on the same
designs. Prints plain lines.

Run: ``python3 benchmarks/gui_bench.py``
"""

from __future__ import annotations

import os
import statistics
import sys
import time
from pathlib import Path

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

STEPS = 200
ARRANGEMENTS = ("tabs", "grid")


def main() -> int:
    """Run the drag in each arrangement; print one block of plain lines per arrangement."""
    for arrangement in ARRANGEMENTS:
        bench(arrangement)
    return 0


def bench(arrangement: str) -> None:
    """Drag the rod length through ``STEPS`` values with the plots arranged as given."""
    from PySide6.QtWidgets import QApplication

    from app.main_window import MainWindow
    from app.number_field import NumberField
    from core import analyse, load_design

    app = QApplication.instance() or QApplication(sys.argv[:1])
    example = ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json"
    window = MainWindow(load_design(example), None, remember_layout=False)
    window.resize(1440, 900)
    window.grid_action.setChecked(arrangement == "grid")
    window.show()
    window.compute_now()
    app.processEvents()
    field = window.design_panel.row("parts[0].length_m").editor()
    assert isinstance(field, NumberField)

    for _ in range(10):  # warm up: imports, caches, first paints
        field.stepBy(1)
        app.processEvents()
        window.repaint()
    start_count = window.compute_count
    designs = []
    started = time.perf_counter()
    for _ in range(STEPS):
        field.stepBy(1)
        app.processEvents()
        window.repaint()
        designs.append(window.document.design)
    elapsed = time.perf_counter() - started
    field.finish_steps()
    updates = window.compute_count - start_count

    analyse_s = []
    for design in designs:
        t0 = time.perf_counter()
        analyse(design)
        analyse_s.append(time.perf_counter() - t0)
    median_analyse_ms = statistics.median(analyse_s) * 1000.0
    frame_ms = elapsed / STEPS * 1000.0

    print(f"arrangement: {arrangement} (window 1440x900, full repaint after every step)")
    print(f"steps: {STEPS}")
    print(f"full updates computed: {updates}")
    print(f"updates per second: {STEPS / elapsed:.1f}")
    print(f"mean time per update: {frame_ms:.2f} ms")
    print(f"median core.analyse: {median_analyse_ms:.2f} ms")
    print(f"update / analyse ratio: {frame_ms / median_analyse_ms:.1f}")
    print()
    window.document.undo_stack.setClean()
    window.close()


if __name__ == "__main__":
    raise SystemExit(main())
