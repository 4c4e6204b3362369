"""The window analyses off the interface thread: it keeps processing events while a slow
analysis runs, shows that it is computing, analyses only the newest design and never shows a
result older than the one on view. Wiring only: figures come from ``core.analyse`` itself."""

from __future__ import annotations

import threading
import time
from typing import Any

import pytest
from PySide6.QtCore import QTimer
from PySide6.QtWidgets import QPushButton

import app.window.computing as computing
from app.window.computing import COMPUTING_TEXT
from app.window.main_window import MainWindow
from core import Design, DesignError, analyse, with_value

LENGTH = "parts[0].length_m"


class SlowAnalysis:
    """A stand-in for ``core.analyse`` that sleeps first and records what it was given and
    on which thread."""

    def __init__(self, delay_s: float) -> None:
        self.delay_s = delay_s
        self.designs: list[Design] = []
        self.threads: list[int] = []

    def __call__(self, design: Design, **kwargs: Any) -> Any:
        self.designs.append(design)
        self.threads.append(threading.get_ident())
        time.sleep(self.delay_s)
        return analyse(design, **kwargs)


def edit(window: MainWindow, length_m: float) -> Design:
    design = with_value(window.document.design, LENGTH, length_m)
    window.document.commit(design, "length", LENGTH)
    return design


def wait_idle(qtbot, window: MainWindow) -> None:  # type: ignore[no-untyped-def]
    qtbot.waitUntil(window.computing_idle, timeout=10000)


def test_the_window_processes_events_while_a_slow_analysis_runs(
        window: MainWindow, qtbot, monkeypatch: pytest.MonkeyPatch) -> None:  # type: ignore[no-untyped-def]
    slow = SlowAnalysis(1.0)
    monkeypatch.setattr(computing, "analyse", slow)
    window.show()
    before = window.result
    ticks: list[float] = []
    timer = QTimer()
    timer.setInterval(20)
    timer.timeout.connect(lambda: ticks.append(time.perf_counter()))
    clicks: list[bool] = []
    button = QPushButton("press")
    qtbot.addWidget(button)
    button.clicked.connect(lambda: clicks.append(window.analysis_runner.busy))

    design = edit(window, 1.25)
    timer.start()
    qtbot.waitUntil(lambda: window.analysis_runner.busy)
    qtbot.waitUntil(lambda: len(ticks) >= 10, timeout=900)  # the timer fires meanwhile
    button.click()  # and a click is handled
    assert window.analysis_runner.busy and window.result is before  # still analysing
    assert clicks == [True]
    qtbot.waitUntil(lambda: window.compute_label.text() == COMPUTING_TEXT, timeout=900)
    wait_idle(qtbot, window)
    timer.stop()
    assert slow.threads and threading.get_ident() not in slow.threads  # on another thread
    assert window.result is not before and window.result.design == design
    assert window.compute_label.text() != COMPUTING_TEXT


def test_a_quick_analysis_shows_no_computing_notice(window: MainWindow, qtbot) -> None:  # type: ignore[no-untyped-def]
    seen: list[str] = []
    window.compute_label.setText("")
    window.analysis_runner.busyChanged.connect(
        lambda _busy: seen.append(window.compute_label.text()))
    edit(window, 1.2)
    wait_idle(qtbot, window)
    # 150 ms is far longer than the example's analysis; the notice never appeared
    assert COMPUTING_TEXT not in seen and window.compute_label.text() != COMPUTING_TEXT


@pytest.mark.slow
def test_only_the_newest_design_is_analysed_next_and_none_older_is_shown(
        window: MainWindow, qtbot, monkeypatch: pytest.MonkeyPatch) -> None:  # type: ignore[no-untyped-def]
    slow = SlowAnalysis(0.4)
    monkeypatch.setattr(computing, "analyse", slow)
    shown: list[Design] = []
    real_show = window._show_result
    monkeypatch.setattr(window, "_show_result",
                        lambda result: (shown.append(result.design), real_show(result)))
    first = edit(window, 1.21)
    qtbot.waitUntil(lambda: window.analysis_runner.busy)
    edit(window, 1.22)
    qtbot.wait(10)
    last = edit(window, 1.23)
    wait_idle(qtbot, window)
    assert slow.designs == [first, last]  # 1.22 was superseded while 1.21 ran
    assert shown == [first, last]
    assert window.result.design == last


@pytest.mark.slow
def test_an_older_result_arriving_after_compute_now_is_dropped(
        window: MainWindow, qtbot, monkeypatch: pytest.MonkeyPatch) -> None:  # type: ignore[no-untyped-def]
    slow = SlowAnalysis(0.5)
    monkeypatch.setattr(computing, "analyse", slow)
    edit(window, 1.3)
    qtbot.waitUntil(lambda: window.analysis_runner.busy)
    newest = edit(window, 1.4)
    window.compute_now()  # on this thread, now
    assert window.result.design == newest
    count = window.compute_count
    wait_idle(qtbot, window)
    qtbot.wait(50)
    assert window.result.design == newest and window.compute_count == count


def test_a_refused_design_marks_its_field_and_keeps_the_result(
        window: MainWindow, qtbot, monkeypatch: pytest.MonkeyPatch) -> None:  # type: ignore[no-untyped-def]
    def refuse(design: Design, **kwargs: Any) -> Any:
        time.sleep(0.05)
        raise DesignError(LENGTH, "is refused by the stand-in")

    before = window.result
    monkeypatch.setattr(computing, "analyse", refuse)
    edit(window, 1.5)
    wait_idle(qtbot, window)
    assert window.result is before
    assert window.design_panel.all_rows()[LENGTH].problem() == \
        "Rod length is refused by the stand-in."
    assert "is refused by the stand-in" in window.readout.compute_problem.text()


def test_a_failure_on_the_worker_is_said_not_raised(
        window: MainWindow, qtbot, monkeypatch: pytest.MonkeyPatch) -> None:  # type: ignore[no-untyped-def]
    def broken(design: Design, **kwargs: Any) -> Any:
        raise ZeroDivisionError("stand-in defect")

    before = window.result
    monkeypatch.setattr(computing, "analyse", broken)
    edit(window, 1.6)
    wait_idle(qtbot, window)
    assert window.result is before
    assert "Unexpected failure: ZeroDivisionError" in window.readout.compute_problem.text()
