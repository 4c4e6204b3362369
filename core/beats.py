"""Beat, period, beat asymmetry and rate from the ticks of a recording (DESIGN §9).

The ticks' onsets are fitted by linear least squares with the model

    t_i = t₀ + i·b + (−1)^i · a/2,

i the beat number (a missing tick leaves its number unused, so gaps are bridged), b the beat,
a the beat asymmetry: the intervals alternate b − a and b + a ("in beat" when a = 0). The
period is 2b. The 1-σ uncertainties are the standard errors √diag(s²(XᵀX)⁻¹), s² = RSS/(n − 3)
(any statistics text). The rate against a target period T_t is 86400·(T_t/T − 1) s/day,
positive when the clock gains; its σ follows from σ_b. The drift is the rate of the last third
of the recording minus that of the first third (each fitted alone). Ticks whose shape is unlike
the clock's own (correlation with the average tick under half the median) or that stand off the
beat (residual beyond 6 robust σ, and 30 µs, from the median of its 7 neighbours' residuals)
are rejected before the final fit.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

import numpy as np
from numpy.typing import NDArray
from scipy.ndimage import median_filter
from scipy.signal import sosfiltfilt

from .errors import DesignError, guarded
from .recording import MAX_RATE_HZ, MIN_RATE_HZ, ArraySource, SampleSource, open_recording
from .ticks import TickDetection, detect_ticks, highpass_sos

__all__ = ["BeatFit", "BeatAnalysis", "fit_beats", "analyse_recording", "analyse_ticks",
           "analyse_detection", "tick_waveform", "beats_text", "BEATS_REPORT_KEYS",
           "MIN_TICKS", "MIN_PERIOD_S", "MAX_PERIOD_S"]

FloatArray = NDArray[np.float64]
IntArray = NDArray[np.int64]
from .constants import SECONDS_PER_DAY  # noqa: E402

MIN_TICKS = 8
MIN_PERIOD_S = 0.1
MAX_PERIOD_S = 20.0
_OFF_BEAT_FLOOR_S = 30e-6   # never call a tick off the beat for less
_MAX_SCATTER_OF_BEAT = 0.01   # beyond, the ticks found are not one clock's beat
_OUT_OF_BEAT_PERCENT = 2.0   # common practice, no source: audibly out of beat
BEATS_REPORT_KEYS = ("ticks", "rejected", "missing", "duration_s", "beat_s", "beat_sigma_s",
                     "period_s", "beat_asymmetry_ms", "beat_asymmetry_sigma_ms",
                     "beat_asymmetry_percent", "target_period_s", "rate_s_per_day",
                     "rate_sigma_s_per_day", "rate_drift_s_per_day",
                     "rate_drift_sigma_s_per_day", "timing_scatter_ms", "warnings")


@dataclass(frozen=True, eq=False)
class BeatFit:
    """Least-squares fit of t_i = t₀ + i·b + (−1)^i·a/2 (all in s)."""

    t0_s: float
    beat_s: float
    asymmetry_s: float
    covariance: FloatArray   # of (t₀, b, a), s²
    residuals_s: FloatArray
    scatter_s: float         # √(RSS/(n − 3))

    @property
    def beat_sigma_s(self) -> float:
        """Standard error of the beat, s."""
        return math.sqrt(self.covariance[1, 1])

    @property
    def asymmetry_sigma_s(self) -> float:
        """Standard error of the asymmetry, s."""
        return math.sqrt(self.covariance[2, 2])


def fit_beats(index: IntArray, times_s: FloatArray) -> BeatFit:
    """Fit t_i = t₀ + i·b + (−1)^i·a/2 by linear least squares (needs at least 4 ticks).

    Parameters
    ----------
    index : beat numbers i (integers; gaps allowed).
    times_s : tick onsets, s.
    """
    i = np.asarray(index, dtype=np.int64)
    t = np.asarray(times_s, dtype=np.float64)
    if len(t) < 4:
        raise DesignError("recording", f"only {len(t)} ticks: at least 4 are needed for a fit")
    if np.all(i % 2 == 0) or np.all(i % 2 == 1) or len(np.unique(i)) < len(i):
        raise DesignError("recording", "the ticks found do not alternate (only every other "
                                       "beat was heard): no beat can be fitted")
    ic = float(np.mean(i))                     # centred for conditioning
    x = np.column_stack([np.ones(len(i)), i - ic, np.where(i % 2 == 0, 0.5, -0.5)])
    coef, *_ = np.linalg.lstsq(x, t, rcond=None)
    res = t - x @ coef
    dof = len(t) - 3
    s2 = float(res @ res) / dof if dof > 0 else 0.0
    cov_c = s2 * np.linalg.inv(x.T @ x)
    # back to t₀ at i = 0: t₀ = c₀ − ic·b
    jac = np.array([[1.0, -ic, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]])
    return BeatFit(t0_s=float(coef[0] - ic * coef[1]), beat_s=float(coef[1]),
                   asymmetry_s=float(coef[2]), covariance=jac @ cov_c @ jac.T,
                   residuals_s=res, scatter_s=math.sqrt(s2))


def _rate(period_s: float, target_s: float) -> float:
    return SECONDS_PER_DAY * (target_s / period_s - 1.0)


def _rate_sigma(beat_s: float, beat_sigma_s: float, target_s: float) -> float:
    # d/db of 86400·(T_t/(2b) − 1) = −86400·T_t/(2b²)
    return SECONDS_PER_DAY * target_s * beat_sigma_s / (2.0 * beat_s ** 2)


@dataclass(frozen=True, eq=False)
class BeatAnalysis:
    """What a recording says about the clock (times in s, rates in s/day, positive = gains).

    ``beat_asymmetry_s`` is |a| (the intervals alternate b ± a); ``asymmetry_signed_s`` keeps the
    sign: positive when the interval after an even-numbered tick is the shorter one.
    ``rate_*`` are None without a target period; the drift is measured against the target or,
    without one, against the recording's own period. Arrays are per accepted tick.
    """

    ticks: int
    rejected: int
    missing: int
    duration_s: float
    sample_rate_hz: int
    beat_s: float
    beat_sigma_s: float
    period_s: float
    beat_asymmetry_s: float
    beat_asymmetry_sigma_s: float
    asymmetry_signed_s: float
    target_period_s: float | None
    rate_s_per_day: float | None
    rate_sigma_s_per_day: float | None
    rate_drift_s_per_day: float | None
    rate_drift_sigma_s_per_day: float | None
    timing_scatter_s: float
    tick_times_s: FloatArray
    tick_index: IntArray
    residuals_s: FloatArray
    rejected_times_s: FloatArray
    warnings: tuple[str, ...]

    @property
    def beat_asymmetry_ms(self) -> float:
        """|a| in ms."""
        return 1e3 * self.beat_asymmetry_s

    @property
    def timing_scatter_ms(self) -> float:
        """RMS of the fit's residuals, ms."""
        return 1e3 * self.timing_scatter_s

    @property
    def beat_asymmetry_percent(self) -> float:
        """|a| as a share of the beat, %."""
        return 100.0 * self.beat_asymmetry_s / self.beat_s

    def intervals(self) -> tuple[FloatArray, FloatArray, IntArray]:
        """Consecutive-tick intervals: (mid time s, interval s, parity 0/1 of the first tick)."""
        ok = np.diff(self.tick_index) == 1
        t = self.tick_times_s
        mid = 0.5 * (t[1:] + t[:-1])[ok]
        return mid, np.diff(t)[ok], (self.tick_index[:-1] % 2)[ok]

    def rated(self, target_period_s: float | None) -> BeatAnalysis:
        """The same ticks rated against another target period, s (None: no rate).

        Nothing is detected again: the beat and its σ stay; the rate, its σ, the drift (each
        third refitted from the accepted ticks) and the drift warning follow the target.
        """
        target = _check_target(target_period_s)
        rate, rate_sigma, drift, drift_sigma = _rates(self.tick_index, self.tick_times_s,
                                                      self.beat_s, self.beat_sigma_s, target)
        warns = tuple(w for w in self.warnings if not w.startswith(_DRIFT_WARNING))
        return replace(self, target_period_s=target, rate_s_per_day=rate,
                       rate_sigma_s_per_day=rate_sigma, rate_drift_s_per_day=drift,
                       rate_drift_sigma_s_per_day=drift_sigma,
                       warnings=warns + _drift_warning(drift, drift_sigma))

    def report_dict(self) -> dict[str, Any]:
        """The JSON report (keys ``BEATS_REPORT_KEYS``; plain floats, None for null)."""
        return {"ticks": self.ticks, "rejected": self.rejected, "missing": self.missing,
                "duration_s": self.duration_s, "beat_s": self.beat_s,
                "beat_sigma_s": self.beat_sigma_s, "period_s": self.period_s,
                "beat_asymmetry_ms": 1e3 * self.beat_asymmetry_s,
                "beat_asymmetry_sigma_ms": 1e3 * self.beat_asymmetry_sigma_s,
                "beat_asymmetry_percent": self.beat_asymmetry_percent,
                "target_period_s": self.target_period_s, "rate_s_per_day": self.rate_s_per_day,
                "rate_sigma_s_per_day": self.rate_sigma_s_per_day,
                "rate_drift_s_per_day": self.rate_drift_s_per_day,
                "rate_drift_sigma_s_per_day": self.rate_drift_sigma_s_per_day,
                "timing_scatter_ms": 1e3 * self.timing_scatter_s,
                "warnings": list(self.warnings)}


def _rates(index: IntArray, times: FloatArray, beat_s: float, beat_sigma_s: float,
           target: float | None) -> tuple[float | None, float | None, float | None, float | None]:
    """Rate and its σ against ``target`` (None without one), and the drift of the last third
    against the first (against ``target``, or the recording's own period), with its σ."""
    drift = drift_sigma = None
    ref = target if target is not None else 2.0 * beat_s
    third = (times[-1] - times[0]) / 3.0
    parts = [times <= times[0] + third, times >= times[-1] - third]
    if all(int(p.sum()) >= MIN_TICKS for p in parts):
        fits = [fit_beats(index[p], times[p]) for p in parts]
        rates = [_rate(2 * f.beat_s, ref) for f in fits]
        drift = rates[1] - rates[0]
        drift_sigma = math.hypot(*(_rate_sigma(f.beat_s, f.beat_sigma_s, ref) for f in fits))
    if target is None:
        return None, None, drift, drift_sigma
    return (_rate(2.0 * beat_s, target), _rate_sigma(beat_s, beat_sigma_s, target), drift,
            drift_sigma)


_DRIFT_WARNING = "the rate changed by"


def _drift_warning(drift: float | None, drift_sigma: float | None) -> tuple[str, ...]:
    if drift is not None and drift_sigma is not None and abs(drift) > max(3 * drift_sigma, 1.0):
        return (f"{_DRIFT_WARNING} {drift:+.1f} s/day between the first and last third of the "
                "recording",)
    return ()


def _reject_off_beat(index: IntArray, times: FloatArray) -> NDArray[np.bool_]:
    """Mask of ticks to keep: residuals within 6 robust σ of their local median."""
    keep = np.ones(len(times), dtype=bool)
    for _ in range(3):
        fit = fit_beats(index[keep], times[keep])
        i = index.astype(np.float64)
        res = times - (fit.t0_s + i * fit.beat_s + np.where(index % 2 == 0, 0.5, -0.5)
                       * fit.asymmetry_s)
        size = min(7, int(keep.sum()) // 2 * 2 - 1)
        local = res.copy()
        local[keep] -= median_filter(res[keep], size=max(1, size), mode="nearest")
        dev = np.abs(local[keep] - np.median(local[keep]))
        sigma = 1.4826 * float(np.median(dev))
        new = np.abs(local - np.median(local[keep])) <= max(6.0 * sigma, _OFF_BEAT_FLOOR_S)
        par = index[new] % 2
        if (np.array_equal(new, keep) or new.sum() < MIN_TICKS or par.min() == par.max()):
            break
        keep = new
    return keep


def _check_target(target_period_s: float | None) -> float | None:
    if target_period_s is None:
        return None
    t = float(target_period_s)
    if not math.isfinite(t) or not MIN_PERIOD_S <= t <= MAX_PERIOD_S:
        raise DesignError("target_period_s", f"target_period_s={target_period_s} is out of "
                                             f"range: it must be in [{MIN_PERIOD_S}, "
                                             f"{MAX_PERIOD_S}] s")
    return t


@guarded("recording")
def analyse_detection(det: TickDetection, target_period_s: float | None = None) -> BeatAnalysis:
    """Fit the beat model to detected ticks; see :func:`analyse_recording`."""
    target = _check_target(target_period_s)
    good = det.correlation >= 0.5 * float(np.median(det.correlation))
    index, times = det.index[good], det.times_s[good]
    if len(times) < MIN_TICKS:
        raise DesignError("recording", f"only {len(times)} ticks were found; at least "
                                       f"{MIN_TICKS} are needed for a rate")
    keep = _reject_off_beat(index, times)
    index, times = index[keep], times[keep]
    rejected_times = np.sort(np.concatenate([det.rejected_times_s, det.times_s[good][~keep],
                                             det.times_s[~good]]))
    fit = fit_beats(index, times)
    b = fit.beat_s
    period = 2.0 * b
    if not MIN_PERIOD_S <= period <= MAX_PERIOD_S:
        raise DesignError("recording", f"the period found, {period:.4g} s, is outside "
                                       f"{MIN_PERIOD_S:g}–{MAX_PERIOD_S:g} s: not a clock's "
                                       "ticking")
    missing = int(index[-1] - index[0] + 1 - len(index))
    if fit.scatter_s > _MAX_SCATTER_OF_BEAT * b:
        raise DesignError("recording", f"the ticks are too weak or too irregular to time: their "
                                       f"scatter about a steady beat is {1e3 * fit.scatter_s:.3g}"
                                       f" ms, over 1 % of the {b:.4g} s beat")
    rate, rate_sigma, drift, drift_sigma = _rates(index, times, b, fit.beat_sigma_s, target)
    warns: list[str] = []
    if missing:
        warns.append(f"{missing} tick{'s were' if missing > 1 else ' was'} missing; the gaps "
                     "are bridged by the tick count")
    if len(rejected_times):
        warns.append(f"{len(rejected_times)} sound{'s' if len(rejected_times) > 1 else ''} off "
                     "the beat or unlike the clock's tick rejected (stray clicks)")
    pct = 100.0 * abs(fit.asymmetry_s) / b
    if pct > _OUT_OF_BEAT_PERCENT:
        warns.append(f"out of beat: the intervals differ by {2e3 * abs(fit.asymmetry_s):.1f} ms "
                     f"({pct:.1f} % of the beat on either side)")
    if fit.scatter_s > 1e-3:
        warns.append(f"timing scatter {1e3 * fit.scatter_s:.2f} ms is large: the ticks are "
                     "poorly defined (noise, or a weak signal)")
    if len(times) < 30:
        warns.append(f"only {len(times)} ticks: record longer for a firmer rate")
    warns.extend(_drift_warning(drift, drift_sigma))
    return BeatAnalysis(
        ticks=len(times), rejected=len(rejected_times), missing=missing,
        duration_s=det.duration_s, sample_rate_hz=det.rate_hz, beat_s=b,
        beat_sigma_s=fit.beat_sigma_s, period_s=period,
        beat_asymmetry_s=abs(fit.asymmetry_s), beat_asymmetry_sigma_s=fit.asymmetry_sigma_s,
        asymmetry_signed_s=fit.asymmetry_s, target_period_s=target, rate_s_per_day=rate,
        rate_sigma_s_per_day=rate_sigma, rate_drift_s_per_day=drift,
        rate_drift_sigma_s_per_day=drift_sigma, timing_scatter_s=fit.scatter_s,
        tick_times_s=times, tick_index=index - index[0], residuals_s=fit.residuals_s,
        rejected_times_s=rejected_times, warnings=tuple(warns))


@guarded("recording")
def analyse_recording(path: str | Path, target_period_s: float | None = None,
                      channel: int | None = None) -> BeatAnalysis:
    """Beat, period, asymmetry and rate of the clock heard in a WAV recording.

    Parameters
    ----------
    path : the WAV file (16/24/32-bit integer or 32/64-bit float, mono or stereo, 8–96 kHz).
    target_period_s : the design's period, s (None: no rate).
    channel : 0-based channel of a stereo file; None mixes the channels.

    Raises
    ------
    DesignError
        On ``recording`` (unreadable or unsuitable file, no ticks, a period outside 0.1–20 s,
        fewer than 8 ticks), ``channel`` or ``target_period_s``.
    """
    _check_target(target_period_s)
    return analyse_detection(detect_ticks(open_recording(path, channel)), target_period_s)


@guarded("recording")
def analyse_ticks(samples: FloatArray, rate_hz: int, target_period_s: float | None = None
                  ) -> BeatAnalysis:
    """As :func:`analyse_recording` for mono samples already in memory (any scale)."""
    x = np.asarray(samples, dtype=np.float64)
    if x.ndim != 1 or not np.all(np.isfinite(x)):
        raise DesignError("recording", "samples must be one channel of finite numbers")
    if not MIN_RATE_HZ <= rate_hz <= MAX_RATE_HZ:
        raise DesignError("recording", f"rate_hz={rate_hz} is out of range: it must be in "
                                       f"[{MIN_RATE_HZ}, {MAX_RATE_HZ}]")
    _check_target(target_period_s)
    return analyse_detection(detect_ticks(ArraySource(x, int(rate_hz))), target_period_s)


def tick_waveform(source: SampleSource | str | Path, time_s: float, before_s: float = 0.005,
                  after_s: float = 0.025, channel: int | None = None
                  ) -> tuple[FloatArray, FloatArray, FloatArray]:
    """The sound around one tick, for display.

    Returns
    -------
    (t, raw, filtered) : times relative to ``time_s`` (s), the samples (full scale ±1) and the
    same through the detector's zero-phase high-pass.
    """
    src = open_recording(source, channel) if isinstance(source, (str, Path)) else source
    fs = src.rate_hz
    pad = int(0.01 * fs)
    n0 = int(math.floor((time_s - before_s) * fs))
    n = int(math.ceil((before_s + after_s) * fs))
    raw = src.read_windows(np.array([n0 - pad], dtype=np.int64), n + 2 * pad)[0]
    filt = sosfiltfilt(highpass_sos(fs), raw)[pad:pad + n]
    t = (n0 + np.arange(n)) / fs - time_s
    return t, raw[pad:pad + n], np.asarray(filt)


def beats_text(report: BeatAnalysis | dict[str, Any]) -> str:
    """The human-readable form of a beat report (a :class:`BeatAnalysis` or its dict)."""
    r = report.report_dict() if isinstance(report, BeatAnalysis) else report
    lines = [f"Ticks                 {r['ticks']} in {r['duration_s']:.1f} s "
             f"({r['rejected']} rejected, {r['missing']} missing)",
             f"Beat                  {r['beat_s']:.7f} s ± {1e6 * r['beat_sigma_s']:.2f} µs",
             f"Period                {r['period_s']:.7f} s",
             f"Beat asymmetry        {r['beat_asymmetry_ms']:.3f} ms ± "
             f"{r['beat_asymmetry_sigma_ms']:.3f} ms ({r['beat_asymmetry_percent']:.2f} % "
             "of the beat)"]
    if r["rate_s_per_day"] is not None:
        lines.append(f"Rate                  {r['rate_s_per_day']:+.2f} s/day ± "
                     f"{r['rate_sigma_s_per_day']:.2f} (against {r['target_period_s']:g} s; "
                     "positive: gains)")
    else:
        lines.append("Rate                  no target period given")
    if r["rate_drift_s_per_day"] is not None:
        lines.append(f"Drift                 {r['rate_drift_s_per_day']:+.2f} s/day ± "
                     f"{r['rate_drift_sigma_s_per_day']:.2f} (last third − first third)")
    lines.append(f"Timing scatter        {r['timing_scatter_ms']:.4f} ms rms")
    lines.extend(f"Warning: {w}" for w in r["warnings"])
    return "\n".join(lines)
