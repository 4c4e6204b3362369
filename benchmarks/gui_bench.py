"""How many full window updates per second a drag sustains, against the cost of the analysis.

Opens the example offscreen at 1440×900 in each plot arrangement: "tabs" (the default, one
plot on view) and "grid" (View ▸ Show plots together: motion, phase plane, period curve and
swing preview on view at once). In each it drags the rod length through successive values
along the path a spin box uses (``stepBy`` → live preview → coalesced analysis → ``setData``
on the plots on view and the readout), twice:

- "full repaint": the whole window is repainted after every step (the pessimistic figure:
  the design panel and the readout are redrawn whole each time);
- "Qt repaint": Qt repaints what changed, as it does on a real drag.

In the same run it times ``core.analyse`` alone on the same designs, and the swing preview's
``show_result`` for a geometry-only change. Prints plain lines.

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
EXAMPLE = ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json"


def main() -> int:
    """Run the drag in each arrangement; print one block of plain lines per arrangement."""
    for arrangement in ARRANGEMENTS:
        bench(arrangement)
    bench_preview()
    return 0


def bench(arrangement: str) -> None:
    """Drag the rod length through ``STEPS`` values with the plots arranged as given."""
    from PySide6.QtWidgets import QApplication

    from app.main_window import MainWindow
    from app.number_field import NumberField
    from core import analyse, load_design

    app = QApplication.instance() or QApplication(sys.argv[:1])
    window = MainWindow(load_design(EXAMPLE), None, remember_layout=False)
    window.resize(1440, 900)
    window.grid_action.setChecked(arrangement == "grid")
    window.show()
    window.compute_now()
    app.processEvents()
    field = window.design_panel.row("parts[0].length_m").editor()
    assert isinstance(field, NumberField)

    def drag(steps: int, full_repaint: bool) -> float:
        started = time.perf_counter()
        for _ in range(steps):
            field.stepBy(1)
            app.processEvents()
            if full_repaint:
                window.repaint()
            designs.append(window.document.design)
        return time.perf_counter() - started

    designs: list = []
    drag(10, True)  # warm up: imports, caches, first paints
    start_count = window.compute_count
    full_s = drag(STEPS, True)
    qt_s = drag(STEPS, False)
    field.finish_steps()
    updates = window.compute_count - start_count

    analyse_s = []
    for design in designs[10:]:
        t0 = time.perf_counter()
        analyse(design)
        analyse_s.append(time.perf_counter() - t0)
    median_analyse_ms = statistics.median(analyse_s) * 1000.0
    full_ms = full_s / STEPS * 1000.0

    print(f"arrangement: {arrangement} (window 1440x900)")
    print(f"steps: {STEPS} + {STEPS}")
    print(f"full updates computed: {updates}")
    print(f"updates per second, full repaint after every step: {STEPS / full_s:.1f}")
    print(f"updates per second, Qt repaint of what changed: {STEPS / qt_s:.1f}")
    print(f"mean time per update (full repaint): {full_ms:.2f} ms")
    print(f"median core.analyse: {median_analyse_ms:.2f} ms")
    print(f"update / analyse ratio (full repaint): {full_ms / median_analyse_ms:.1f}")
    print()
    window.document.undo_stack.setClean()
    window.confirm_discard = lambda: True  # type: ignore[method-assign]
    window.close()


def bench_preview() -> None:
    """The swing preview's ``show_result`` for results that differ only in geometry."""
    from PySide6.QtWidgets import QApplication

    from app.preview import SwingPreview
    from core import analyse, load_design, with_value

    app = QApplication.instance() or QApplication(sys.argv[:1])
    design = load_design(EXAMPLE)
    results = [analyse(with_value(design, "parts[0].length_m", 1.1 + 0.001 * i))
               for i in range(60)]
    preview = SwingPreview()
    preview.resize(700, 450)
    preview.show()
    app.processEvents()
    times = []
    for result in results:
        t0 = time.perf_counter()
        preview.show_result(result)
        times.append(time.perf_counter() - t0)
        app.processEvents()
    print("swing preview show_result, geometry change: "
          f"median {statistics.median(times[5:]) * 1000.0:.2f} ms, "
          f"max {max(times[5:]) * 1000.0:.2f} ms")
    preview.hide()
    preview.deleteLater()


if __name__ == "__main__":
    raise SystemExit(main())
