"""Beat analysis (core.beats): the fit, the rate and its σ, drift, the report, the exits."""

from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pytest
from scipy.io import wavfile

from core import DesignError
from core.beats import (
    BEATS_REPORT_KEYS,
    analyse_detection,
    analyse_recording,
    analyse_ticks,
    beats_text,
    fit_beats,
    tick_waveform,
)
from core.synthetic_ticks import TickSignalSpec, render, true_tick_times, write_wav
from core.ticks import TickDetection

# The issue's case: 60 s of 1-s beats at 20 dB (tick peak over broadband noise rms), mains hum
# with harmonics, reverberation, secondary sounds, level drift, a dropped tick, a stray click.
ISSUE = TickSignalSpec(rate_hz=8000, duration_s=60.0, beat_s=1.0000100, asymmetry_s=0.0030,
                       dropped=(23,), clicks_s=(31.41,), seed=11)


class TestFit:
    def test_exact_on_noiseless_ticks_with_gaps(self) -> None:
        i = np.array([0, 1, 2, 4, 5, 6, 7, 9, 10, 11])
        t = 0.3 + i * 0.8 + (-1.0) ** i * 0.002 / 2   # the model itself (plain arithmetic)
        fit = fit_beats(i, t)
        assert fit.beat_s == pytest.approx(0.8, rel=1e-14)
        assert fit.asymmetry_s == pytest.approx(0.002, rel=1e-10)
        assert fit.t0_s == pytest.approx(0.3, rel=1e-13)

    def test_against_polyfit_of_each_parity(self) -> None:
        rng = np.random.default_rng(4)
        i = np.arange(200)
        t = 1.0 + 0.5 * i + (-1.0) ** i * 0.001 + rng.normal(0, 3e-5, 200)
        fit = fit_beats(i, t)
        # independent: a straight line through the even and through the odd ticks alone
        # (numpy.polyfit); their slopes per beat average to b, their offset gives a
        even = np.polyfit(i[::2], t[::2], 1)
        odd = np.polyfit(i[1::2], t[1::2], 1)
        # the shared-slope fit lies between the two lines' slopes
        assert min(even[0], odd[0]) - 1e-9 <= fit.beat_s <= max(even[0], odd[0]) + 1e-9
        mid = 100.0
        a_lines = (np.polyval(even, mid) - np.polyval(odd, mid))
        assert fit.asymmetry_s == pytest.approx(a_lines, abs=2e-5)
        assert fit.beat_s == pytest.approx(0.5, abs=5 * fit.beat_sigma_s)

    def test_sigma_matches_the_straight_line_formula(self) -> None:
        rng = np.random.default_rng(9)
        n, sigma_t = 2000, 2e-5
        i = np.arange(n)
        t = i * 1.0 + rng.normal(0, sigma_t, n)
        fit = fit_beats(i, t)
        # σ_slope = σ_t·√(12/N³) for a straight line (DOMAIN §5; any statistics text)
        assert fit.beat_sigma_s == pytest.approx(sigma_t * np.sqrt(12.0 / n ** 3), rel=0.05)
        assert fit.scatter_s == pytest.approx(sigma_t, rel=0.05)


class TestIssueCase:
    def test_beat_asymmetry_and_rate_recovered(self) -> None:
        a = analyse_ticks(render(ISSUE), ISSUE.rate_hz, target_period_s=2.0)
        # known by construction; the issue asks 1e-6 relative and 0.1 ms
        assert abs(a.beat_s / ISSUE.beat_s - 1) < 1e-6
        assert abs(a.beat_asymmetry_s - ISSUE.asymmetry_s) < 1e-4
        assert a.period_s == pytest.approx(2 * a.beat_s, rel=1e-15)
        # rate = 86400·(T_target/T − 1), T = 2b (DESIGN §9; plain arithmetic): ≈ −0.864 s/day
        expected = 86400.0 * (2.0 / (2 * ISSUE.beat_s) - 1)
        assert a.rate_s_per_day == pytest.approx(expected, abs=0.1)
        assert abs(a.rate_s_per_day - expected) < 4 * a.rate_sigma_s_per_day
        assert a.missing == 1 and a.ticks == len(true_tick_times(ISSUE)[0])
        assert a.rejected == 1 and abs(a.rejected_times_s[0] - 31.41) < 0.01
        assert a.timing_scatter_s < 50e-6

    @pytest.mark.slow
    def test_sigma_consistent_with_repeated_trials(self) -> None:
        beats, sigmas, asym, asym_sigmas = [], [], [], []
        for seed in range(100, 124):
            spec = TickSignalSpec(**{**ISSUE.__dict__, "seed": seed})
            a = analyse_ticks(render(spec), spec.rate_hz)
            beats.append(a.beat_s)
            sigmas.append(a.beat_sigma_s)
            asym.append(a.asymmetry_signed_s)
            asym_sigmas.append(a.beat_asymmetry_sigma_s)
        ratio = np.std(beats, ddof=1) / np.mean(sigmas)
        # 24 trials: the sample std is known to ~15 %; the issue asks "consistent"
        assert 1 / 1.5 < ratio < 1.5
        # the asymmetry's σ too, its scatter taken about the known value
        rms = np.sqrt(np.mean((np.array(asym) - ISSUE.asymmetry_s) ** 2))
        assert 1 / 1.5 < rms / np.mean(asym_sigmas) < 1.5
        assert np.max(np.abs(np.array(beats) / ISSUE.beat_s - 1)) < 1e-6

    def test_drift_first_to_last_third(self) -> None:
        drift = 6e-5   # relative change of the beat over the recording
        spec = TickSignalSpec(rate_hz=8000, duration_s=60.0, beat_drift=drift, seed=2,
                              jitter_s=5e-6)
        a = analyse_ticks(render(spec), spec.rate_hz, target_period_s=2.0)
        # the beat changes linearly in time; the thirds' centres are 2/3 of the ticks' span
        # apart, so the rate changes by −86400·drift·(2/3)·span/duration (plain arithmetic)
        span = a.tick_times_s[-1] - a.tick_times_s[0]
        expected = -86400.0 * drift * (2.0 / 3.0) * span / spec.duration_s
        assert a.rate_drift_s_per_day == pytest.approx(expected, abs=0.15)
        assert any("rate changed" in w for w in a.warnings)


class TestReport:
    def test_json_keys_and_nulls(self) -> None:
        spec = TickSignalSpec(rate_hz=8000, duration_s=15.0, seed=4)
        r = analyse_ticks(render(spec), 8000).report_dict()
        for key in ("ticks", "rejected", "duration_s", "beat_s", "period_s",
                    "beat_asymmetry_ms", "beat_asymmetry_percent", "rate_s_per_day",
                    "rate_sigma_s_per_day", "timing_scatter_ms", "warnings"):
            assert key in r
        assert set(r) == set(BEATS_REPORT_KEYS)
        assert r["rate_s_per_day"] is None and r["rate_sigma_s_per_day"] is None
        assert json.loads(json.dumps(r)) == r
        text = beats_text(r)
        assert "no target period" in text and "Beat asymmetry" in text

    def test_out_of_beat_warning_and_percent(self) -> None:
        spec = TickSignalSpec(rate_hz=8000, duration_s=20.0, asymmetry_s=0.05, seed=6)
        a = analyse_ticks(render(spec), 8000, target_period_s=2.0)
        assert a.beat_asymmetry_percent == pytest.approx(5.0, abs=0.05)
        assert any("out of beat" in w for w in a.warnings)
        mid, intervals, parity = a.intervals()
        assert set(np.round(intervals, 3)) == {0.95, 1.05}

    def test_recording_file_channel_and_waveform(self, tmp_path: Path) -> None:
        ticks = TickSignalSpec(rate_hz=16000, duration_s=12.0, seed=8, snr_db=40.0)
        other = TickSignalSpec(rate_hz=16000, duration_s=12.0, beat_s=0.75, seed=9)
        path = tmp_path / "two.wav"
        stereo = np.column_stack([render(other), render(ticks)])
        wavfile.write(path, 16000, np.round(stereo * 32767).astype(np.int16))
        assert analyse_recording(path, channel=1).beat_s == pytest.approx(1.0, rel=1e-5)
        assert analyse_recording(path, channel=0).beat_s == pytest.approx(0.75, rel=1e-5)
        a = analyse_recording(path, channel=1)
        t, raw, filt = tick_waveform(path, float(a.tick_times_s[3]), channel=1)
        assert len(t) == len(raw) == len(filt)
        before = np.abs(filt[t < -1e-3]).max()
        after = np.abs(filt[(t > 0) & (t < 3e-3)]).max()
        assert after > 5 * before   # the detected onset is where the sound starts

    def test_24_bit_file(self, tmp_path: Path) -> None:
        spec = TickSignalSpec(rate_hz=8000, duration_s=12.0, seed=12)
        path = tmp_path / "t24.wav"
        write_wav(spec, path, bits=24)
        assert analyse_recording(path).beat_s == pytest.approx(1.0, rel=1e-5)


class TestExits:
    def _fake(self, beat: float, n: int) -> TickDetection:
        i = np.arange(n)
        return TickDetection(times_s=0.1 + i * beat, index=i, correlation=np.ones(n),
                             rejected_times_s=np.zeros(0), beat_estimate_s=beat, rate_hz=8000,
                             duration_s=n * beat + 0.2, templates=np.zeros((2, 4)),
                             template_onset=1)

    @pytest.mark.parametrize("beat", [0.02, 12.0])
    def test_period_outside_range(self, beat: float) -> None:
        with pytest.raises(DesignError, match="outside 0.1–20 s"):
            analyse_detection(self._fake(beat, 20))

    def test_too_few_ticks(self) -> None:
        with pytest.raises(DesignError, match="at least 8"):
            analyse_detection(self._fake(1.0, 6))

    def test_bad_target(self) -> None:
        with pytest.raises(DesignError) as err:
            analyse_detection(self._fake(1.0, 20), target_period_s=-2.0)
        assert err.value.field == "target_period_s"

    def test_silence_file(self, tmp_path: Path) -> None:
        path = tmp_path / "quiet.wav"
        wavfile.write(path, 8000, np.zeros(8000 * 10, dtype=np.int16))
        with pytest.raises(DesignError) as err:
            analyse_recording(path)
        assert err.value.field == "recording"


    def test_irregular_ticks_refused(self) -> None:
        # ticks scattered by 30 ms rms about a 1-s beat: 3 % of the beat, not a clock's timing
        i = np.arange(40)
        times = 0.1 + i + np.random.default_rng(1).normal(0, 0.03, 40)
        det = TickDetection(times_s=times, index=i, correlation=np.ones(40),
                            rejected_times_s=np.zeros(0), beat_estimate_s=1.0, rate_hz=8000,
                            duration_s=41.0, templates=np.zeros((2, 4)), template_onset=1)
        with pytest.raises(DesignError, match="too weak or too irregular"):
            analyse_detection(det)

class TestDemoRecording:
    def test_demo_file_is_marked_synthetic_and_gives_its_numbers(self) -> None:
        root = Path(__file__).resolve().parents[2]
        path = root / "resources" / "examples" / "demo_ticks.wav"
        assert b"Synthetic: invented ticks" in path.read_bytes()[-400:]
        a = analyse_recording(path, target_period_s=2.0)
        # the script's chosen numbers: gains 4.0 s/day, out of beat by 1.5 ms
        assert abs(a.rate_s_per_day - 4.0) < max(4 * a.rate_sigma_s_per_day, 0.1)
        assert a.beat_asymmetry_ms == pytest.approx(1.5, abs=0.1)
        assert a.missing == 1 and a.rejected == 1
