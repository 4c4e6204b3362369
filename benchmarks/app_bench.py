"""Benchmark: start-up to the first painted window, peak memory, and the import of the core.

Run from the repository root: ``python3 benchmarks/app_bench.py`` (≈ 30 s on 2 cores). A plain
script: it prints, it asserts nothing. Every measurement is a fresh Python process (this file
run with ``--child MODE``), so each run pays its own imports; the files are in the OS cache after
the first run, so these are "warm disk, cold interpreter" figures.

Measured, in one run, RUNS times each, interleaved:

* window — what ``penduline FILE`` does (``app.launch.open_window``): read the example, make
  the ``QApplication``, paint the light first window, import the workbench, make the
  ``MainWindow`` (offscreen, 1440×900, stored layout not read) in its place and enter the event
  loop; the run ends at the first paint event that arrives after the analysis has been shown
  (the window the person sees, with figures and curves). Also printed: the first paint of any
  kind (the first window), when the workbench was made (its imports included) and the
  number of modules imported.
* bare Qt (baseline) — ``QApplication`` plus an empty ``QWidget`` shown, to its first paint.
* libraries (the floor) — the bare Qt window, then the libraries this example's window cannot
  show its results without: numpy, scipy.special (the elliptic functions), scipy.integrate
  (LSODA: the example is damped) and pyqtgraph, to the next paint, imported the way the
  window imports them (``app.import_path.start_up``: without PySide's feature scan, the
  cyclic collector paused). No window of ours can open with results faster or in less
  memory than this.
* core import — ``from core import analyse`` alone; baseline: ``import numpy, scipy.special``
  alone (what the core cannot avoid).

The project's own modules are run as the tree holds them: with ``PYTHONDONTWRITEBYTECODE`` set
(as on the development machine) each start compiles them again, as a run from a fresh checkout
does. The window is also measured with their bytecode compiled first (``compileall``, as
``pip install`` does for an installed program); the compiled files are removed afterwards.

Start-up is measured from the parent's ``time.perf_counter()`` just before it starts the child
to the child's ``time.perf_counter()`` at the paint (``CLOCK_MONOTONIC``, one clock for every
process on Linux), so it includes the interpreter's own start. Peak memory is the child's
``ru_maxrss`` (``resource.getrusage(RUSAGE_SELF)``) when it stops.

Goals: the first window painted ≤ 0.4 s, the window with all results ≤ 0.6 s (median), peak
RSS ≤ 130 MB.
"""

import time as _time

_T0 = _time.perf_counter()  # the child's first instant (nothing but the docstring before it)

import compileall  # noqa: E402 - after the first instant
import os  # noqa: E402
import shutil  # noqa: E402
import statistics  # noqa: E402
import subprocess  # noqa: E402
import sys  # noqa: E402
from pathlib import Path  # noqa: E402

ROOT = Path(__file__).resolve().parent.parent
EXAMPLE = ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json"
RUNS = 5
FIRST_PAINT_GOAL_S = 0.4
STARTUP_GOAL_S = 0.6
RSS_GOAL_MB = 130.0


# ============================================================================ children

def _rss_mb() -> float:
    import resource

    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0  # KiB on Linux


def _child_window() -> None:
    sys.path.insert(0, str(ROOT))
    from core import load_design

    design = load_design(EXAMPLE)
    from PySide6.QtCore import QEvent, QObject
    from PySide6.QtWidgets import QApplication

    from app.launch import open_window

    app = QApplication(sys.argv[:1])
    marks: dict[str, float] = {}
    made: list = []  # the workbench, once open_window returns

    class PaintWatch(QObject):
        def eventFilter(self, obj: QObject, event: QEvent) -> bool:
            if event.type() == QEvent.Type.Paint:
                now = _time.perf_counter()
                marks.setdefault("first_paint", now)
                if made and made[0].result is not None and "ready" not in marks:
                    marks["ready"] = now
                    app.quit()
            return False

    watch = PaintWatch()
    app.installEventFilter(watch)
    window = open_window(app, design, EXAMPLE, remember_layout=False)  # as `penduline FILE`
    made.append(window)
    marks["constructed"] = _time.perf_counter()
    app.exec()
    app.removeEventFilter(watch)
    print(f"imported {marks['constructed']:.6f}")
    print(f"constructed {marks['constructed']:.6f}")
    print(f"first_paint {marks['first_paint']:.6f}")
    print(f"ready {marks['ready']:.6f}")
    print(f"modules {len(sys.modules)}")
    print(f"rss_mb {_rss_mb():.1f}")
    window.document.undo_stack.setClean()
    window.close()


def _child_bare() -> None:
    from PySide6.QtCore import QEvent, QObject
    from PySide6.QtWidgets import QApplication, QWidget

    app = QApplication(sys.argv[:1])
    marks: dict[str, float] = {}

    class PaintWatch(QObject):
        def eventFilter(self, obj: QObject, event: QEvent) -> bool:
            if event.type() == QEvent.Type.Paint and "ready" not in marks:
                marks["ready"] = _time.perf_counter()
                app.quit()
            return False

    watch = PaintWatch()
    app.installEventFilter(watch)
    widget = QWidget()
    widget.resize(1440, 900)
    widget.show()
    app.exec()
    app.removeEventFilter(watch)
    print(f"first_paint {marks['ready']:.6f}")
    print(f"ready {marks['ready']:.6f}")
    print(f"rss_mb {_rss_mb():.1f}")


def _child_libraries() -> None:
    from PySide6.QtCore import QEvent, QObject, QTimer
    from PySide6.QtWidgets import QApplication, QWidget

    app = QApplication(sys.argv[:1])
    marks: dict[str, float] = {}

    class PaintWatch(QObject):
        def eventFilter(self, obj: QObject, event: QEvent) -> bool:
            if event.type() == QEvent.Type.Paint and "imported" in marks:
                marks.setdefault("ready", _time.perf_counter())
                app.quit()
            return False

    def load() -> None:
        sys.path.insert(0, str(ROOT))
        from app.import_path import start_up

        with start_up(freeze=False):  # the way the window imports them
            import numpy  # noqa: F401
            import pyqtgraph  # noqa: F401
            import scipy.integrate
            import scipy.special  # noqa: F401

        marks["imported"] = _time.perf_counter()
        widget.update()

    watch = PaintWatch()
    app.installEventFilter(watch)
    widget = QWidget()
    widget.resize(1440, 900)
    widget.show()
    QTimer.singleShot(0, load)
    app.exec()
    app.removeEventFilter(watch)
    print(f"ready {marks['ready']:.6f}")
    print(f"rss_mb {_rss_mb():.1f}")


def _child_core() -> None:
    sys.path.insert(0, str(ROOT))
    start = _time.perf_counter()
    from core import analyse  # noqa: F401 - the analysis (core's own names load on first use)

    print(f"import_s {_time.perf_counter() - start:.6f}")
    print(f"rss_mb {_rss_mb():.1f}")


def _child_numeric() -> None:
    start = _time.perf_counter()
    import numpy  # noqa: F401
    import scipy.special  # noqa: F401

    print(f"import_s {_time.perf_counter() - start:.6f}")
    print(f"rss_mb {_rss_mb():.1f}")


CHILDREN = {"window": _child_window, "bare": _child_bare, "libraries": _child_libraries,
            "core": _child_core,
            "numeric": _child_numeric}


# ============================================================================ parent

def run_child(mode: str) -> dict[str, float]:
    """Start a fresh interpreter on ``mode``; its printed figures, times made relative to the
    moment just before it was started."""
    env = {**os.environ, "QT_QPA_PLATFORM": "offscreen"}
    spawned = _time.perf_counter()
    done = subprocess.run([sys.executable, str(Path(__file__).resolve()), "--child", mode],
                          cwd=ROOT, env=env, capture_output=True, text=True, timeout=120)
    if done.returncode != 0:
        raise SystemExit(f"child {mode} failed ({done.returncode}):\n{done.stderr}")
    figures: dict[str, float] = {}
    for line in done.stdout.splitlines():
        key, _, value = line.partition(" ")
        figures[key] = float(value)
    for key in ("imported", "constructed", "first_paint", "ready"):
        if key in figures:
            figures[key] -= spawned
    return figures


def import_profile() -> tuple[list[tuple[float, str]], list[tuple[float, str]]]:
    """One window child under ``-X importtime``: (top-level imports by cumulative ms, the
    modules with the largest own time in ms)."""
    env = {**os.environ, "QT_QPA_PLATFORM": "offscreen"}
    done = subprocess.run([sys.executable, "-X", "importtime", str(Path(__file__).resolve()),
                           "--child", "window"], cwd=ROOT, env=env, capture_output=True,
                          text=True, timeout=120)
    top: list[tuple[float, str]] = []
    own: list[tuple[float, str]] = []
    for line in done.stderr.splitlines():
        if not line.startswith("import time:") or "cumulative" in line:
            continue
        _, self_us, cumulative_us, name = (part for part in
                                            [line[:12]] + line[12:].split("|"))
        own.append((int(self_us) / 1000.0, name.strip()))
        if not name[1:].startswith(" "):  # no indent: imported by the program itself
            top.append((int(cumulative_us) / 1000.0, name.strip()))
    return sorted(top, reverse=True), sorted(own, reverse=True)


def _median(rows: list[dict[str, float]], key: str) -> float:
    return statistics.median(r[key] for r in rows)


def _spread(rows: list[dict[str, float]], key: str) -> str:
    values = sorted(r[key] for r in rows)
    return f"(min {values[0]:.3f}, max {values[-1]:.3f})"


def _compiled_runs() -> list[dict[str, float]]:
    """RUNS window runs with the project's bytecode compiled; the compiled files made here
    are removed afterwards."""
    caches = [ROOT / package / sub / "__pycache__" for package in ("app", "core")
              for sub in ("", *(p.name for p in (ROOT / package).iterdir() if p.is_dir()
                                and p.name != "__pycache__"))]
    made = [cache for cache in caches if not cache.exists()]
    for package in ("app", "core"):
        compileall.compile_dir(str(ROOT / package), quiet=1)
    try:
        return [run_child("window") for _ in range(RUNS)]
    finally:
        for cache in made:
            shutil.rmtree(cache, ignore_errors=True)


def main() -> int:
    """Run every child RUNS times (interleaved) and print medians against the baselines."""
    results: dict[str, list[dict[str, float]]] = {mode: [] for mode in CHILDREN}
    run_child("window")  # one untimed run: puts every file in the OS cache
    for _ in range(RUNS):
        for mode in CHILDREN:
            results[mode].append(run_child(mode))
    compiled = _compiled_runs()
    win, bare = results["window"], results["bare"]
    startup, startup_bare = _median(win, "ready"), _median(bare, "ready")
    rss, rss_bare = _median(win, "rss_mb"), _median(bare, "rss_mb")
    core_s, numeric_s = _median(results["core"], "import_s"), _median(results["numeric"],
                                                                       "import_s")
    print(f"python {sys.version.split()[0]}, {os.cpu_count()} CPUs, {RUNS} runs each, "
          "offscreen, window 1440x900")
    print(f"start-up to the first painted window with results: {startup:.3f} s "
          f"{_spread(win, 'ready')}  [goal <= {STARTUP_GOAL_S:.1f} s: "
          f"{'met' if startup <= STARTUP_GOAL_S else 'MISSED'}]")
    first = _median(win, "first_paint")
    first_met = "met" if first <= FIRST_PAINT_GOAL_S else "MISSED"
    ready_compiled = _median(compiled, "ready")
    print(f"  with the project's bytecode compiled (an installed program): {ready_compiled:.3f} s "
          f"{_spread(compiled, 'ready')}  [goal <= {STARTUP_GOAL_S:.1f} s: "
          f"{'met' if ready_compiled <= STARTUP_GOAL_S else 'MISSED'}]")
    print(f"  first paint of any kind (the first window) at {first:.3f} s "
          f"[goal <= {FIRST_PAINT_GOAL_S:.1f} s: {first_met}],"
          f" workbench made (its imports included) at {_median(win, 'constructed'):.3f} s, "
          f"{_median(win, 'modules'):.0f} modules imported")
    print(f"  baseline, bare QApplication + QWidget to first paint: {startup_bare:.3f} s "
          f"{_spread(bare, 'ready')}")
    floor, floor_rss = _median(results["libraries"], "ready"), _median(results["libraries"],
                                                                       "rss_mb")
    print(f"  floor, bare window + numpy, scipy.special, scipy.integrate, pyqtgraph: {floor:.3f} s "
          f"{_spread(results['libraries'], 'ready')}, peak RSS {floor_rss:.1f} MB")
    print(f"  window minus baseline: {startup - startup_bare:.3f} s; window minus floor: "
          f"{startup - floor:.3f} s")
    print(f"peak RSS, window with the example open: {rss:.1f} MB  [goal <= {RSS_GOAL_MB:.0f} MB: "
          f"{'met' if rss <= RSS_GOAL_MB else 'MISSED'}]")
    print(f"  baseline, bare QApplication + QWidget: {rss_bare:.1f} MB; window minus baseline: "
          f"{rss - rss_bare:.1f} MB; window minus floor: {rss - floor_rss:.1f} MB")
    print(f"import core: {core_s:.3f} s {_spread(results['core'], 'import_s')}, peak RSS "
          f"{_median(results['core'], 'rss_mb'):.1f} MB")
    print(f"  baseline, import numpy + scipy.special alone: {numeric_s:.3f} s "
          f"{_spread(results['numeric'], 'import_s')}; core's own share {core_s - numeric_s:.3f} s")
    top, own = import_profile()
    print("eager imports of the window (one run, -X importtime, cumulative ms): "
          + ", ".join(f"{name} {ms:.0f}" for ms, name in top[:6]))
    print("  largest own import times (ms): "
          + ", ".join(f"{name} {ms:.0f}" for ms, name in own[:8]))
    return 0


if __name__ == "__main__":
    if len(sys.argv) == 3 and sys.argv[1] == "--child":
        CHILDREN[sys.argv[2]]()
        raise SystemExit(0)
    raise SystemExit(main())
