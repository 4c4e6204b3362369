"""The Recording view: the demo recording's ticks and rate, tick and tock told apart by shape,
the sound around a chosen tick, "Use this rate" as one undo step, refusals as sentences, the
window live during a long analysis, a newer request superseding an older one, a new target
re-rating without detecting again, and a stereo file's channel choice."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest
from PySide6.QtCore import QTimer
from PySide6.QtWidgets import QApplication

from app.document.settings import app_settings
from app.views.catalogue import VIEWS
from app.views.recording_plots import TICK_SYMBOL, TOCK_SYMBOL
from app.views.recording_view import LAST_PATH_KEY, RecordingView
from core import with_value
from core.beats import analyse_recording, tick_waveform
from core.rating_model import model_at_conditions, reference_conditions
from core.synthetic_ticks import TickSignalSpec, write_wav

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "resources" / "examples" / "demo_ticks.wav"
WAIT_MS = 60_000


def recording_view(win) -> RecordingView:  # type: ignore[no-untyped-def]
    view = next(p for p in win.plots if isinstance(p, RecordingView))
    win.plot_area.show_plot(win.plots.index(view))
    QApplication.processEvents()
    return view


def open_and_wait(qtbot, view: RecordingView, path: Path,  # type: ignore[no-untyped-def]
                  channel: int | None = None) -> None:
    view.open_recording(path, channel)
    qtbot.waitUntil(lambda: not view.busy, timeout=WAIT_MS)


@pytest.fixture(scope="module")
def long_recording(tmp_path_factory: pytest.TempPathFactory) -> Path:
    """Ten minutes of synthetic ticking at 8 kHz: long enough that its analysis spans many
    turns of the event loop."""
    path = tmp_path_factory.mktemp("recordings") / "ten_minutes.wav"
    write_wav(TickSignalSpec(duration_s=600.0, rate_hz=8000, beat_s=0.75, seed=3), path)
    return path


class TestOnView:
    def test_a_tab_of_its_own_registered_once(self) -> None:
        assert VIEWS.count(RecordingView) == 1
        assert RecordingView.grid_member is False and RecordingView.in_report is False

    def test_the_demo_recording_shows_its_ticks_and_rate(self, qtbot, window) -> None:  # type: ignore[no-untyped-def]
        view = recording_view(window)
        target = window.document.design.target.target_period_s
        open_and_wait(qtbot, view, DEMO)
        # the core's own analysis of the same file, against the design's target
        expected = analyse_recording(DEMO, target)
        assert view.problem == ""
        assert view.analysis is not None
        assert view.analysis.ticks == expected.ticks
        assert view.analysis.rate_s_per_day == pytest.approx(expected.rate_s_per_day, rel=1e-12)
        text = view.figures.text()
        assert f"<b>{expected.ticks}</b>" in text
        assert f"{expected.rate_s_per_day:+.2f} s/day" in text
        assert view.use_button.isEnabled()
        assert app_settings().value(LAST_PATH_KEY) == str(DEMO)
        assert "recording" not in repr(window.document.design).lower()  # not in the design

    def test_tick_and_tock_have_their_own_symbols(self, qtbot, window) -> None:  # type: ignore[no-untyped-def]
        view = recording_view(window)
        open_and_wait(qtbot, view, DEMO)
        plot = view.interval_plot
        assert TICK_SYMBOL != TOCK_SYMBOL
        assert plot.ticks.opts["symbol"] == TICK_SYMBOL
        assert plot.tocks.opts["symbol"] == TOCK_SYMBOL
        assert view.residual_plot.ticks.opts["symbol"] == TICK_SYMBOL
        assert view.residual_plot.tocks.opts["symbol"] == TOCK_SYMBOL
        labels = [label.text for _sample, label in plot.legend.items]
        assert "from a tick" in labels and "from a tock" in labels
        # every interval between neighbouring ticks is drawn, split by parity
        _mid, interval, parity = view.analysis.intervals()
        n_tick, n_tock = len(plot.ticks.data), len(plot.tocks.data)
        assert (n_tick, n_tock) == (int(np.sum(parity == 0)), int(np.sum(parity == 1)))
        assert n_tick > 5 and n_tock > 5
        # the demo's clock is out of beat by a = 1.5 ms (make_demo_recording.py): the two
        # sets of intervals sit on opposite sides of the beat
        ticks_y = plot.ticks.data["y"]
        tocks_y = plot.tocks.data["y"]
        assert np.sign(np.median(ticks_y)) == -np.sign(np.median(tocks_y))

    def test_choosing_a_tick_shows_its_sound_with_the_onset_at_zero(self, qtbot, window) -> None:  # type: ignore[no-untyped-def]
        view = recording_view(window)
        open_and_wait(qtbot, view, DEMO)
        view.tick_spin.setValue(7)  # the seventh accepted tick
        assert view.chosen == 6
        wave = view.waveform_plot
        x, y = wave.filtered.getData()
        assert wave.onset.isVisible() and wave.onset.value() == 0.0
        assert x.min() < 0.0 < x.max()
        t, _raw, filtered = tick_waveform(DEMO, float(view.analysis.tick_times_s[6]))
        np.testing.assert_allclose(x, 1e3 * t)
        np.testing.assert_allclose(y, filtered)
        # clicking a point in the residual plot chooses that tick
        points = view.residual_plot.tocks.points()
        view.residual_plot._on_click(view.residual_plot.tocks, [points[2]])
        assert view.chosen == int(points[2].data())
        assert view.tick_spin.value() == view.chosen + 1
        ring_x, _ = view.residual_plot.ring.getData()
        assert ring_x[0] == pytest.approx(view.analysis.tick_times_s[view.chosen])


class TestUseThisRate:
    def test_use_this_rate_is_one_undo_step_and_the_model_follows(self, qtbot, window) -> None:  # type: ignore[no-untyped-def]
        view = recording_view(window)
        open_and_wait(qtbot, view, DEMO)
        before = window.document.design
        steps = window.document.undo_stack.count()
        asked: list[str] = []
        view.confirm = lambda text: asked.append(text) or False  # declined: nothing happens
        view.ask_use_rate()
        assert asked and window.document.design == before
        view.confirm = lambda text: True
        view.ask_use_rate()
        fitted = window.document.design
        assert window.document.undo_stack.count() == steps + 1
        ref = reference_conditions(fitted)
        model = model_at_conditions(fitted, ref.temperature_c, ref.pressure_hpa,
                                    ref.semi_arc_deg)
        assert model.rate_s_per_day == pytest.approx(view.analysis.rate_s_per_day, abs=1e-6)
        window.document.undo_stack.undo()
        assert window.document.design == before

    def test_a_new_target_rerates_without_detecting_again(self, qtbot, window) -> None:  # type: ignore[no-untyped-def]
        view = recording_view(window)
        open_and_wait(qtbot, view, DEMO)
        started = view.analyser.started_count
        first = view.analysis
        design = with_value(window.document.design, "target.period_s", 2.001)
        window.document.commit(design, "new target")
        QApplication.processEvents()
        assert view.analysis is first  # off screen (the window is hidden): rated when shown
        window.show()
        qtbot.waitExposed(window)
        assert view.analyser.started_count == started and not view.busy
        expected = analyse_recording(DEMO, 2.001)
        assert view.analysis.rate_s_per_day == pytest.approx(expected.rate_s_per_day, rel=1e-12)
        assert f"{expected.rate_s_per_day:+.2f} s/day" in view.figures.text()


class TestRefusals:
    def test_an_unreadable_file_gives_a_sentence(self, qtbot, window, tmp_path) -> None:  # type: ignore[no-untyped-def]
        view = recording_view(window)
        bad = tmp_path / "notes.wav"
        bad.write_text("not a recording at all", encoding="utf-8")
        open_and_wait(qtbot, view, bad)
        assert view.analysis is None
        assert view.problem.startswith("notes.wav") and view.problem.endswith(".")
        assert "\n" not in view.problem and "Traceback" not in view.problem
        assert view.message.text() == view.problem
        assert not view.use_button.isEnabled()
        open_and_wait(qtbot, view, tmp_path / "missing.wav")
        assert "does not exist" in view.problem

    def test_silence_is_refused_by_the_worker_with_a_sentence(  # type: ignore[no-untyped-def]
            self, qtbot, window, tmp_path) -> None:
        from scipy.io import wavfile

        view = recording_view(window)
        quiet = tmp_path / "quiet.wav"
        wavfile.write(quiet, 8000, np.zeros(8000 * 5, dtype=np.int16))
        open_and_wait(qtbot, view, quiet)
        assert view.analysis is None and view.problem.startswith("quiet.wav")
        assert view.figures.text().startswith("<p>quiet.wav")


class TestWorker:
    def test_the_window_turns_its_event_loop_during_a_long_analysis(  # type: ignore[no-untyped-def]
            self, qtbot, window, long_recording) -> None:
        view = recording_view(window)
        seen: list[bool] = []
        timer = QTimer()
        timer.setInterval(5)
        timer.timeout.connect(lambda: seen.append(view.busy))
        timer.start()
        view.open_recording(long_recording)
        assert view.busy and view.busy_bar.isVisibleTo(view)
        qtbot.waitUntil(lambda: not view.busy, timeout=WAIT_MS)
        timer.stop()
        assert any(seen), "no timer fired while the analysis ran: the interface was blocked"
        assert view.analysis is not None
        assert view.analysis.beat_s == pytest.approx(0.75, rel=1e-5)  # the spec's beat
        assert not view.busy_bar.isVisibleTo(view)

    @pytest.mark.slow
    def test_a_newer_request_supersedes_an_older_one(  # type: ignore[no-untyped-def]
            self, qtbot, window, long_recording) -> None:
        view = recording_view(window)
        view.open_recording(long_recording)
        view.open_recording(DEMO)
        qtbot.waitUntil(lambda: not view.busy, timeout=WAIT_MS)
        view.analyser.wait(WAIT_MS)  # the long one has finished too, unheard
        QApplication.processEvents()
        assert view.path == DEMO
        assert view.analysis.ticks == analyse_recording(DEMO).ticks

    def test_a_stereo_file_offers_its_channels(self, qtbot, window, tmp_path) -> None:  # type: ignore[no-untyped-def]
        path = tmp_path / "two_microphones.wav"
        write_wav(TickSignalSpec(duration_s=20.0, rate_hz=8000, seed=5), path, channels=2)
        view = recording_view(window)
        open_and_wait(qtbot, view, DEMO)
        assert not view.channel_box.isEnabled()  # the demo is mono
        open_and_wait(qtbot, view, path, channel=1)
        assert view.channel_box.isEnabled() and view.channel_box.currentData() == 1
        right = view.analysis
        assert right.ticks == analyse_recording(path, None, 1).ticks
        view.channel_box.setCurrentIndex(0)  # mixed: analysed again
        qtbot.waitUntil(lambda: not view.busy, timeout=WAIT_MS)
        assert view.analysis is not right
        assert view.analysis.beat_s == pytest.approx(1.0, rel=1e-5)  # the spec's beat
