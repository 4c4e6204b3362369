"""How many full window updates per second a drag sustains, against the cost of the analysis.

Opens the example offscreen at 1440×900 in each plot arrangement: "tabs" (the default, one
plot on view) and "grid" (View ▸ Show plots together: motion, phase plane, period curve and
swing preview on view at once). In each it drags the rod length through successive values
along the path a spin box uses (``stepBy`` → live preview → coalesced analysis → ``setData``
on the plots on view and the readout), with the analysis on the interface thread and on the
worker thread alternately (inline, worker, inline, worker: compare within one run, the machine
may be busy); then drags the pivot along the body the same way (each step moves every part),
once inline and once on the worker. "Edits per second" counts the steps the drag made;
"results shown per second" the analyses that reached the screen (on the worker, edits made
while an analysis runs are coalesced into the next one). Each drag runs twice:

- "full repaint": the whole window is repainted after every step (the pessimistic figure:
  the design panel and the readout are redrawn whole each time);
- "Qt repaint": Qt repaints what changed, as it does on a real drag.

In the same run it times ``core.analyse`` alone on the same designs, the longest the
interface thread is held by one drag step on a damped spring design (inline against worker),
and the swing preview's ``show_result`` for a geometry-only change.

Then, in each arrangement with the swing preview on view, the animation at true speed (1×):
for ``ANIMATION_S`` seconds of wall time each it counts the animation frames actually painted
(paints of the preview showing a new swing time) and the edits per second the window sustains
while the rod length is dragged (each step followed by event processing, so frames and edits
share the one event loop as on a real drag): with the animation stopped, playing while idle,
and playing during the drag. Prints plain lines.

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
ANIMATION_S = 3.0  # wall time of each animation measurement, s
DRAG_RUN = 40  # steps in one direction before the drag turns back
EXAMPLE = ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json"
SLOW_EXAMPLE = ROOT / "resources" / "examples" / "hall_clock.pendulum.json"


def main() -> int:
    """Run the drag in each arrangement; print one block of plain lines per arrangement."""
    for arrangement in ARRANGEMENTS:
        bench(arrangement)
        bench_mode(arrangement, True, "pivot")
        bench_mode(arrangement, False, "pivot")
    bench_slow()
    bench_preview()
    print()
    for arrangement in ARRANGEMENTS:
        bench_animation(arrangement)
    return 0


def _open_window(arrangement: str):  # type: ignore[no-untyped-def]
    """The example in a shown 1440×900 window with the plots arranged as given; returns the
    application, the window and the rod-length field."""
    from PySide6.QtWidgets import QApplication

    from app.form.number_field import NumberField
    from app.window.main_window import MainWindow
    from core import load_design

    app = QApplication.instance() or QApplication(sys.argv[:1])
    window = MainWindow(load_design(EXAMPLE), None, remember_layout=False)
    window.resize(1440, 900)
    window.grid_action.setChecked(arrangement == "grid")
    window.show()
    window.compute_now()
    app.processEvents()
    field = window.design_panel.row("parts[0].length_m").editor()
    assert isinstance(field, NumberField)
    return app, window, field


def _close_window(window) -> None:  # type: ignore[no-untyped-def]
    window.document.undo_stack.setClean()
    window.confirm_discard = lambda: True
    window.close()


def _wait_idle(app, window) -> None:  # type: ignore[no-untyped-def]
    """Process events until the newest design's analysis is on view."""
    while not window.computing_idle():
        app.processEvents()
        time.sleep(0.001)
    app.processEvents()


def bench(arrangement: str) -> None:
    """Drag the rod length through ``STEPS`` values with the plots arranged as given, with
    the analysis on the interface thread and on the worker, alternately, in the same run."""
    for inline in (True, False, True, False):
        bench_mode(arrangement, inline)


def bench_mode(arrangement: str, inline: bool, dragged: str = "rod length") -> None:
    """One drag of ``STEPS`` + ``STEPS`` values; ``inline`` analyses on the interface thread.
    ``dragged="pivot"`` drags the pivot position (1 mm down the body a step, every part
    moved) instead of the rod length."""
    from core import analyse

    app, window, field = _open_window(arrangement)
    window.analyse_inline = inline
    if dragged == "pivot":
        field = window.design_panel.pivot_control.row.field

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
    _wait_idle(app, window)
    start_count = window.compute_count
    full_s = drag(STEPS, True)
    shown_full = window.compute_count - start_count
    qt_s = drag(STEPS, False)
    shown_qt = window.compute_count - start_count - shown_full
    field.finish_steps()
    _wait_idle(app, window)
    assert window.result.design == window.document.design  # the last edit is on view
    updates = window.compute_count - start_count

    analyse_s = []
    for design in designs[10:]:
        t0 = time.perf_counter()
        analyse(design)
        analyse_s.append(time.perf_counter() - t0)
    median_analyse_ms = statistics.median(analyse_s) * 1000.0
    full_ms = full_s / STEPS * 1000.0

    print(f"arrangement: {arrangement} (window 1440x900), dragging the {dragged}, analysis "
          f"{'on the interface thread' if inline else 'on the worker'}")
    print(f"steps: {STEPS} + {STEPS}")
    print(f"full updates shown: {updates}")
    print(f"edits per second, full repaint after every step: {STEPS / full_s:.1f}")
    print(f"edits per second, Qt repaint of what changed: {STEPS / qt_s:.1f}")
    print(f"results shown per second, full repaint: {shown_full / full_s:.1f}")
    print(f"results shown per second, Qt repaint: {shown_qt / qt_s:.1f}")
    print(f"mean time per update (full repaint): {full_ms:.2f} ms")
    print(f"median core.analyse: {median_analyse_ms:.2f} ms")
    print(f"update / analyse ratio (full repaint): {full_ms / median_analyse_ms:.1f}")
    print()
    _close_window(window)


class _FrameCounter:
    """Counts the paints of a swing preview that show a new swing time (animation frames
    actually drawn), by watching its viewport's paint events."""

    def __init__(self, preview) -> None:  # type: ignore[no-untyped-def]
        from PySide6.QtCore import QEvent, QObject

        counter = self

        class Filter(QObject):
            def eventFilter(self, _obj, event) -> bool:  # type: ignore[no-untyped-def]
                if event.type() == QEvent.Type.Paint:
                    counter.seen(preview.time_s)
                return False

        self.frames = 0
        self._last_time_s: float | None = None
        self._filter = Filter()
        preview.viewport().installEventFilter(self._filter)

    def seen(self, time_s: float) -> None:
        if time_s != self._last_time_s:
            self._last_time_s = time_s
            self.frames += 1


def bench_animation(arrangement: str) -> None:
    """Animation frames drawn and edits sustained, with the swing preview on view at 1×."""
    from PySide6.QtCore import QEventLoop, QTimer

    from app.views.swing_preview import SwingPreview

    app, window, field = _open_window(arrangement)
    index = next(i for i, p in enumerate(window.plots) if isinstance(p, SwingPreview))
    window.plot_area.show_plot(index)
    app.processEvents()
    preview = window.plots[index]
    assert isinstance(preview, SwingPreview) and preview.isVisible()
    preview.set_speed(1.0)
    counter = _FrameCounter(preview)

    def idle() -> tuple[float, float]:
        """(frames/s, edits/s) over ANIMATION_S of the event loop left to itself."""
        loop = QEventLoop()
        QTimer.singleShot(int(ANIMATION_S * 1000), loop.quit)
        frames0, started = counter.frames, time.perf_counter()
        loop.exec()
        wall = time.perf_counter() - started
        return (counter.frames - frames0) / wall, 0.0

    def drag() -> tuple[float, float]:
        """(frames/s, edits/s) over ANIMATION_S of stepping the rod length, processing the
        events after each step."""
        frames0 = counter.frames
        steps = 0
        started = time.perf_counter()
        while time.perf_counter() - started < ANIMATION_S:
            field.stepBy(1 if (steps // DRAG_RUN) % 2 == 0 else -1)
            app.processEvents()
            steps += 1
        wall = time.perf_counter() - started
        field.finish_steps()
        _wait_idle(app, window)
        assert window.result.design == window.document.design  # the last edit is on view
        return (counter.frames - frames0) / wall, steps / wall

    drag()  # warm up: imports, caches, first paints
    preview.set_playing(False)
    preview.set_time(0.0)
    still_fps, still_edits = drag()
    preview.set_playing(True)
    idle_fps, _ = idle()
    play_fps, play_edits = drag()
    preview.set_playing(False)

    print(f"animation at 1x, arrangement: {arrangement} (window 1440x900, swing preview on "
          f"view), {ANIMATION_S:.0f} s of wall time each")
    print(f"animation stopped, dragging: {still_edits:.1f} edits/s, "
          f"{still_fps:.1f} animation frames/s drawn")
    print(f"animation playing, idle: {idle_fps:.1f} animation frames/s drawn")
    print(f"animation playing, dragging: {play_edits:.1f} edits/s, "
          f"{play_fps:.1f} animation frames/s drawn")
    print(f"edits/s kept while the animation plays: {100.0 * play_edits / still_edits:.0f} %")
    print()
    _close_window(window)


def bench_slow() -> None:
    """The longest the interface thread is held by one step of a drag on a spring design with
    damping (the slowest kind to analyse), analysis inline against on the worker."""
    from PySide6.QtWidgets import QApplication

    from app.form.number_field import NumberField
    from app.window.main_window import MainWindow
    from core import load_design

    app = QApplication.instance() or QApplication(sys.argv[:1])
    for inline in (True, False):
        window = MainWindow(load_design(SLOW_EXAMPLE), None, remember_layout=False)
        window.analyse_inline = inline
        window.resize(1440, 900)
        window.show()
        window.compute_now()
        field = window.design_panel.row("parts[0].length_m").editor()
        assert isinstance(field, NumberField)
        held = []
        for i in range(60):
            t0 = time.perf_counter()
            field.stepBy(1 if (i // 20) % 2 == 0 else -1)
            app.processEvents()
            held.append(time.perf_counter() - t0)
        field.finish_steps()
        _wait_idle(app, window)
        print(f"{SLOW_EXAMPLE.name}, analysis "
              f"{'on the interface thread' if inline else 'on the worker'}: interface thread "
              f"held per step median {statistics.median(held) * 1000:.1f} ms, "
              f"max {max(held) * 1000:.1f} ms")
        _close_window(window)
    print()


def bench_preview() -> None:
    """The swing preview's ``show_result`` for results that differ only in geometry."""
    from PySide6.QtWidgets import QApplication

    from app.views.swing_preview import SwingPreview
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
