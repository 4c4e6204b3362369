"""The recording's analysis off the interface thread.

:class:`RecordingAnalyser` runs :func:`core.beats.analyse_recording` in a thread pool of its
own (an hour of sound takes seconds) and hands the result back on the interface thread as a
signal. Each request gets a serial number; a newer request supersedes every older one: requests
still queued are dropped, and the result of one already running is ignored when it arrives. The
analysis is made without a target period — the view rates it against the design's target with
:meth:`core.beats.BeatAnalysis.rated`, so a new target never means detecting the ticks again.

No physics here: the core analyses, this module only carries requests and answers.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from PySide6.QtCore import QObject, QRunnable, QThreadPool, Signal

from core import DesignError
from core.beats import BeatAnalysis, analyse_recording

__all__ = ["Request", "RecordingAnalyser", "refusal_sentence"]


@dataclass(frozen=True)
class Request:
    """What to analyse: the WAV file and its channel (None: the channels mixed)."""

    path: Path
    channel: int | None = None


def refusal_sentence(path: Path, exc: DesignError) -> str:
    """A core refusal as one sentence about ``path``."""
    reason = exc.reason.rstrip(".")
    if not reason.startswith(path.name):
        reason = f"{path.name}: {reason}"
    return f"{reason}."


class _Signals(QObject):
    """Carries a job's answer back; owned by Python (no parent), so a job may outlive the
    analyser without emitting on a deleted object."""

    done = Signal(int, object, object)  # serial, request, BeatAnalysis
    failed = Signal(int, object, str)  # serial, request, sentence


class _Job(QRunnable):
    def __init__(self, serial: int, request: Request, signals: _Signals) -> None:
        super().__init__()
        self.serial, self.request, self.signals = serial, request, signals

    def run(self) -> None:  # on a pool thread
        request = self.request
        try:
            analysis = analyse_recording(request.path, None, request.channel)
        except DesignError as exc:
            self.signals.failed.emit(self.serial, request, refusal_sentence(request.path, exc))
            return
        except Exception as exc:  # a program bug: say so rather than lose it in the thread
            self.signals.failed.emit(self.serial, request,
                                     f"{request.path.name} could not be analysed because of a "
                                     f"program error ({type(exc).__name__}: {exc}); please "
                                     "report it.")
            return
        self.signals.done.emit(self.serial, request, analysis)


class RecordingAnalyser(QObject):
    """Analyses recordings on a worker thread; only the newest request's answer is passed on.

    Signals
    -------
    analysed(request, analysis) : the newest request's :class:`core.beats.BeatAnalysis`.
    refused(request, sentence) : the newest request could not be analysed; why, in a sentence.
    busyChanged(bool) : an analysis whose answer is awaited started (True) or ended (False).
    """

    analysed = Signal(object, object)
    refused = Signal(object, str)
    busyChanged = Signal(bool)

    def __init__(self, parent: QObject | None = None) -> None:
        super().__init__(parent)
        self.pool = QThreadPool(self)
        self.pool.setMaxThreadCount(2)
        self._signals = _Signals()
        self._signals.done.connect(self._on_done)
        self._signals.failed.connect(self._on_failed)
        self._serial = 0
        self._awaited: int | None = None
        self.started_count = 0

    @property
    def busy(self) -> bool:
        """True while the newest request's answer is awaited."""
        return self._awaited is not None

    def request(self, request: Request) -> int:
        """Analyse ``request`` (superseding any earlier one); returns its serial number."""
        self.pool.clear()  # older requests not yet started are dropped
        self._serial += 1
        was_busy = self.busy
        self._awaited = self._serial
        self.started_count += 1
        self.pool.start(_Job(self._serial, request, self._signals))
        if not was_busy:
            self.busyChanged.emit(True)
        return self._serial

    def cancel(self) -> None:
        """Forget the awaited request (a running analysis finishes unheard)."""
        self.pool.clear()
        if self._awaited is not None:
            self._awaited = None
            self.busyChanged.emit(False)

    def wait(self, msecs: int = -1) -> bool:
        """Block until the pool's threads are idle (for closing and tests)."""
        return bool(self.pool.waitForDone(msecs))

    def _finish(self, serial: int) -> bool:
        if serial != self._awaited:
            return False  # superseded
        self._awaited = None
        self.busyChanged.emit(False)
        return True

    def _on_done(self, serial: int, request: Request, analysis: BeatAnalysis) -> None:
        if self._finish(serial):
            self.analysed.emit(request, analysis)

    def _on_failed(self, serial: int, request: Request, sentence: str) -> None:
        if self._finish(serial):
            self.refused.emit(request, sentence)
