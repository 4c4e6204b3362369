"""Analysis off the interface thread: at most one analysis per window runs at a time, and the
newest design asked for while it runs is the one analysed next.

:class:`AnalysisRunner` hands each design to a pool thread (Qt's global thread pool) and
reports back on the interface thread through its ``finished`` signal, with the number
(*generation*) of the request, so the window can drop a result that a newer one has already
replaced on screen. A request made while an analysis runs replaces any earlier waiting one: a
burst of edits during a slow analysis costs one more analysis, not one per edit.
:func:`warm_up` imports the integrator's module on a pool thread, so the first damped or
spring design does not pay for it on the interface thread.
"""

from __future__ import annotations

import sys
import time
from collections.abc import Callable
from typing import Any

from PySide6.QtCore import QObject, QThreadPool, Signal

__all__ = ["AnalysisRunner", "warm_up", "SWITCH_INTERVAL_S"]

SWITCH_INTERVAL_S = 0.001
"""How long a thread may hold the interpreter before another may take it (Python's default
is 5 ms). An analysis holds it through LSODA's calls back into Python, so with the default the
interface thread waited up to 5 ms at a time to paint; at 1 ms "all plots" kept 64–67 edits/s
with a full repaint against 59–62 (measured, benchmarks/gui_bench.py conditions); 0.5 ms was
slower again (the switching itself)."""

Analyse = Callable[..., Any]


class _Relay(QObject):
    """Carries a finished job back to the interface thread (a queued signal)."""

    done = Signal(int, object, object, float)  # generation, key, Result or exception, ms


def _job(relay: _Relay, generation: int, key: object, analyse: Analyse,
         args: tuple[Any, ...], kwargs: dict[str, Any]) -> Callable[[], None]:
    """One analysis for a pool thread; whatever it raises is handed back, never lost."""

    def run() -> None:
        started = time.perf_counter()
        outcome: object
        try:
            outcome = analyse(*args, **kwargs)
        except Exception as exc:  # handed to the window, which says what went wrong
            outcome = exc
        try:
            relay.done.emit(generation, key, outcome, (time.perf_counter() - started) * 1000.0)
        except RuntimeError:  # the application is gone (quit while this ran): nobody to tell
            pass

    return run


class AnalysisRunner(QObject):
    """Runs one analysis at a time on a pool thread; the newest waiting request runs next.

    Signals
    -------
    finished(int, object, object, float)
        ``(generation, key, outcome, elapsed_ms)`` on the interface thread: ``outcome`` is
        what the analysis returned, or the exception it raised.
    busyChanged(bool)
        An analysis started while none ran (True), or the last one finished (False).
    """

    finished = Signal(int, object, object, float)
    busyChanged = Signal(bool)

    def __init__(self, parent: QObject | None = None) -> None:
        super().__init__(parent)
        sys.setswitchinterval(SWITCH_INTERVAL_S)
        # The relay has no parent: a job still running when the window goes keeps it alive,
        # and its late result finds no receiver.
        self._relay = _Relay()
        self._relay.done.connect(self._on_done)
        self._running = False
        self._running_key: object = None
        self._waiting: tuple[int, object, Analyse, tuple[Any, ...], dict[str, Any]] | None = None

    @property
    def busy(self) -> bool:
        """True while an analysis runs (or one waits for it)."""
        return self._running

    @property
    def running_key(self) -> object:
        """The key of the analysis running now (None when idle)."""
        return self._running_key if self._running else None

    def request(self, generation: int, key: object, analyse: Analyse, *args: Any,
                **kwargs: Any) -> None:
        """Analyse ``analyse(*args, **kwargs)`` now, or next when one is running (replacing
        any request already waiting)."""
        if self._running:
            self._waiting = (generation, key, analyse, args, kwargs)
            return
        self._start(generation, key, analyse, args, kwargs)

    def cancel_waiting(self) -> None:
        """Forget the waiting request (the one running finishes and is reported)."""
        self._waiting = None

    def _start(self, generation: int, key: object, analyse: Analyse, args: tuple[Any, ...],
               kwargs: dict[str, Any]) -> None:
        was_busy = self._running
        self._running, self._running_key = True, key
        QThreadPool.globalInstance().start(_job(self._relay, generation, key, analyse, args,
                                                kwargs))
        if not was_busy:
            self.busyChanged.emit(True)

    def _on_done(self, generation: int, key: object, outcome: object, elapsed_ms: float) -> None:
        self._running, self._running_key = False, None
        waiting, self._waiting = self._waiting, None
        if waiting is not None:
            self._start(*waiting)  # the next one runs while this result is drawn
        self.finished.emit(generation, key, outcome, elapsed_ms)
        if not self._running:
            self.busyChanged.emit(False)


def _import_integrator() -> None:
    import scipy.integrate  # noqa: F401  (the first damped or spring design needs it)


def warm_up() -> None:
    """Import the integrator's module on a pool thread (a few tenths of a second once; a
    second call while it runs waits on the import and returns)."""
    QThreadPool.globalInstance().start(_import_integrator)
