"""Finding the ticks in a recording and timing each to a small fraction of a sample.

Three stages, each on what it needs:

1. **Envelope** (one pass over the file, block by block). A 4th-order Butterworth band-pass
   (1–8 kHz, within 0.2–0.45 of the sample rate) removes mains hum and its harmonics, any slow
   level change and the hiss above the ticks' band; its state is carried from block to block
   (:func:`scipy.signal.sosfilt` with ``zi``), so blocks join without seams. The rms of each
   1 ms bin is kept (3.6 M numbers for an hour), divided by the local noise floor (median of
   each second, interpolated).
2. **Beat and tracking.** The beat is the lag of the strongest peak of the autocorrelation of
   the clipped envelope (:func:`scipy.signal.correlate`), halved when half that lag also
   carries a peak (a clock out of beat splits the lag of one beat into two). Candidate events
   (:func:`scipy.signal.find_peaks`, 20 ms apart, so an escapement's secondary sound or the
   reverberation merges into its tick) are followed from beat to beat: the event nearest the
   predicted time within a quarter beat, at least 0.3 of the recent tick level, is the tick;
   the prediction learns the two alternating intervals. A missing tick leaves its index unused;
   loud events off the beat are counted as rejected.
3. **Sub-sample timing.** Around each tick the raw samples are read again, filtered with the
   zero-phase :func:`scipy.signal.sosfiltfilt`, aligned first by the onset of their Hilbert
   envelope and then by cross-correlation with the clock's own average tick (one template per
   parity, since tick and tock differ), the correlation peak placed from the phase of the
   analytic correlation; the template is rebuilt from the aligned ticks and the alignment
   repeated. Each time refers to the onset of the average tick (its envelope's first crossing
   of 30 % of its peak); when tick and tock have the same shape (correlation ≥ 0.9) the tock's
   average is placed against the tick's by correlation instead, so both share one onset.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np
from numpy.typing import NDArray
from scipy.fft import irfft, rfft, rfftfreq
from scipy.ndimage import uniform_filter1d
from scipy.signal import (
    butter,
    correlate,
    find_peaks,
    hilbert,
    resample,
    sosfilt,
    sosfilt_zi,
    sosfiltfilt,
)

from .errors import DesignError
from .recording import SampleSource

__all__ = ["TickDetection", "detect_ticks", "highpass_sos", "bandpass_sos", "MIN_BEAT_S",
           "MAX_BEAT_S"]

FloatArray = NDArray[np.float64]
IntArray = NDArray[np.int64]

MIN_BEAT_S = 0.05   # a period of 0.1 s
MAX_BEAT_S = 10.0   # a period of 20 s
_BIN_S = 1e-3
_BLOCK_BINS = 10_000
_CAND_SPACING_S = 0.02
_CAND_HEIGHT = 2.5          # candidate events: envelope over the noise floor
_ONSET_FRACTION = 0.3
_TEMPLATE_ROUNDS = 3
_BATCH = 256
_SAME_SHAPE = 0.9        # normalised correlation of the two average ticks


@dataclass(frozen=True, eq=False)
class TickDetection:
    """Ticks found in a recording.

    Attributes
    ----------
    times_s : onset time of each tick, s from the start of the recording, sub-sample.
    index : beat number of each tick (consecutive ticks differ by 1; a missing tick leaves a gap).
    correlation : normalised correlation of each tick with its parity's average tick (0–1).
    rejected_times_s : loud events off the beat (stray clicks), s.
    beat_estimate_s : the beat from the autocorrelation, s (coarse, 1 ms).
    rate_hz : samples per second.
    duration_s : length of the recording, s.
    templates : the average tick of even and odd beats (2 × M samples, onset at ``template_onset``).
    template_onset : sample index of the templates' onset.
    """

    times_s: FloatArray
    index: IntArray
    correlation: FloatArray
    rejected_times_s: FloatArray
    beat_estimate_s: float
    rate_hz: int
    duration_s: float
    templates: FloatArray
    template_onset: int


def highpass_sos(rate_hz: float) -> FloatArray:
    """The tick band's high-pass (4th-order Butterworth, 1 kHz or a fifth of the rate), SOS."""
    cutoff = min(1000.0, 0.2 * rate_hz)
    return np.asarray(butter(4, cutoff, "highpass", fs=rate_hz, output="sos"))


def bandpass_sos(rate_hz: float) -> FloatArray:
    """The detection band (4th-order Butterworth, 1–8 kHz, within 0.2–0.45 of the rate), SOS."""
    lo = min(1000.0, 0.2 * rate_hz)
    hi = min(8000.0, 0.45 * rate_hz)
    return np.asarray(butter(4, [lo, hi], "bandpass", fs=rate_hz, output="sos"))


def _envelope(source: SampleSource) -> tuple[FloatArray, int]:
    """RMS of the band-passed signal in 1 ms bins, and the bin length in samples."""
    fs = source.rate_hz
    nbin = max(1, int(round(fs * _BIN_S)))
    sos = bandpass_sos(fs)
    block = nbin * _BLOCK_BINS
    parts: list[FloatArray] = []
    zi: FloatArray | None = None
    for start in range(0, source.frames, block):
        x = source.read(start, start + block)
        if not np.all(np.isfinite(x)):
            raise DesignError("recording", "contains samples that are not finite numbers "
                                           "(NaN or infinity)")
        if zi is None:
            zi = sosfilt_zi(sos) * x[0]
        y, zi = sosfilt(sos, x, zi=zi)
        n = len(y) // nbin * nbin
        if n:
            parts.append(np.sqrt(np.mean(np.square(y[:n]).reshape(-1, nbin), axis=1)
                                 ).astype(np.float32))
    return (np.concatenate(parts).astype(np.float64) if parts else np.zeros(0)), nbin


def _normalise(env: FloatArray, bins_per_s: int) -> FloatArray:
    """Envelope over its local noise floor (median of each second, interpolated)."""
    n = len(env) // bins_per_s
    if n < 2:
        floor = np.full_like(env, np.median(env))
    else:
        med = np.median(env[:n * bins_per_s].reshape(n, bins_per_s), axis=1)
        centres = (np.arange(n) + 0.5) * bins_per_s
        floor = np.interp(np.arange(len(env)), centres, med)
    tiny = max(float(np.max(env)) * 1e-9, 1e-300)
    return env / np.maximum(floor, tiny)


def _beat_from_autocorrelation(norm: FloatArray, cand_h: FloatArray, bin_s: float) -> float:
    """Coarse beat (s): strongest autocorrelation lag, halved if half of it carries a peak."""
    n = min(len(norm), int(300.0 / bin_s))
    cap = float(np.median(cand_h))
    o = np.clip(norm[:n] - _CAND_HEIGHT, 0.0, cap)
    o = uniform_filter1d(o, 5)  # a few ms of tolerance for jitter and drift
    acf = correlate(o, o, mode="full", method="fft")[n - 1:]
    lo = int(0.8 * MIN_BEAT_S / bin_s)
    hi = min(int(1.05 * MAX_BEAT_S / bin_s), n // 3)
    if hi <= lo + 2:
        raise DesignError("recording", "is too short to find a beat: it must hold at least "
                                       "three beats")
    lag = lo + int(np.argmax(acf[lo:hi]))
    # heights above the background of chance coincidences of noise
    floor = float(np.median(acf[lo:hi]))
    top = acf[lag] - floor
    for n in (6, 5, 4, 3, 2):   # a multiple of the beat may win by chance: take the smallest
        a, b = int(lag / n * 0.9), int(lag / n * 1.1) + 1
        if a >= lo and acf[a:b].max() - floor >= 0.5 * top:
            lag = a + int(np.argmax(acf[a:b]))
            top = acf[lag] - floor
            break
    half = acf[max(lo, int(0.3 * lag)):max(lo + 1, int(0.7 * lag))]
    if half.size and half.max() - floor >= 0.25 * top:
        return float(lag) * bin_s / 2.0
    return float(lag) * bin_s


def _track(ct: FloatArray, ch: FloatArray, start: int, beat: float, t_end: float
           ) -> tuple[list[int], list[int]]:
    """Follow ticks forward from candidate ``start``; returns candidate indices, beat indices.

    Tick and tock keep their own loudness (a weak tock is judged against tocks) and the search
    window narrows to the prediction's own scatter once a few beats are locked.
    """
    wide = 0.25 * beat
    acc_c, acc_i = [start], [0]
    intervals = [beat, beat]
    pred, idx, misses = ct[start], 0, 0
    recent: list[list[float]] = [[float(ch[start])], []]
    errors: list[float] = []
    while True:
        pred += intervals[idx % 2]
        idx += 1
        if len(errors) >= 6:
            spread = 1.4826 * float(np.median(np.abs(errors[-16:])))
            window = min(wide, max(0.005, 6.0 * spread + 0.003))
        else:
            window = wide
        if pred > t_end + window:
            break
        lo, hi = np.searchsorted(ct, [pred - window, pred + window])
        own = recent[idx % 2] or recent[(idx + 1) % 2]
        href = float(np.median(own[-9:]))
        ok = [j for j in range(lo, hi) if ch[j] >= 0.3 * href and j > acc_c[-1]]
        if not ok and misses >= 8:   # lost: re-acquire at the next strong event
            after = max(int(lo), acc_c[-1] + 1)
            loud = float(np.median(recent[0][-9:] + recent[1][-9:]))
            nxt = np.flatnonzero(ch[after:] >= 0.5 * loud)
            if not nxt.size:
                break
            j = after + int(nxt[0])
            idx = acc_i[-1] + max(1, int(round((ct[j] - ct[acc_c[-1]]) / beat)))
            ok, pred, errors = [j], ct[j], []
        if not ok:
            misses += 1
            continue
        j = min(ok, key=lambda k: abs(ct[k] - pred))
        errors.append(float(ct[j] - pred))
        if acc_i[-1] == idx - 1:
            p = (idx - 1) % 2
            intervals[p] += 0.3 * ((ct[j] - ct[acc_c[-1]]) - intervals[p])
        acc_c.append(j)
        acc_i.append(idx)
        recent[idx % 2].append(float(ch[j]))
        pred, misses = ct[j], 0
    return acc_c, acc_i


def _follow(ct: FloatArray, ch: FloatArray, beat: float, t_end: float
            ) -> tuple[IntArray, IntArray]:
    """Start at the loudest event that recurs a period later, track both ways.

    Returns candidate indices and beat numbers (from 0).
    """
    strong = np.flatnonzero(ch >= 0.5 * np.percentile(ch, 90))
    early = strong[ct[strong] < ct[strong[0]] + 30 * beat][:60]
    tol = max(0.005, 0.01 * beat)
    ts = ct[strong]
    support = np.array([int(np.sum(np.abs(ts[:, None] - (ct[k] + 2 * beat * np.arange(1, 4))
                                          [None, :]) < tol)) for k in early])
    best = early[support == support.max()]
    start = int(best[int(np.argmax(ch[best]))])
    fc, fi = _track(ct, ch, start, beat, t_end)
    rev = len(ct) - 1 - start
    bc, bi = _track(-ct[::-1], ch[::-1], rev, beat, 0.0)
    cand = np.array([len(ct) - 1 - c for c in bc[:0:-1]] + fc, dtype=np.int64)
    beat_idx = np.array([-i for i in bi[:0:-1]] + fi, dtype=np.int64)
    return cand, beat_idx - beat_idx[0]


def _half_beat_heard(norm: FloatArray, times: FloatArray, index: IntArray, bin_s: float
                     ) -> bool:
    """Whether a weaker sound recurs midway between the tracked ticks (then they are every
    other beat): the envelope folded over the tracked intervals (synchronous average), its
    middle half searched for a peak well above that average's own noise."""
    ok = np.flatnonzero(np.diff(index) == 1)
    if len(ok) < 4:
        return False
    t0, t1 = times[ok], times[ok + 1]
    cells = int(min(1000, max(50, np.median(t1 - t0) / bin_s)))
    sums = np.zeros(cells)
    counts = np.zeros(cells)
    for a, b in zip(t0, t1, strict=True):
        lo, hi = int(a / bin_s), min(len(norm), int(b / bin_s))
        phase = ((np.arange(lo, hi) * bin_s - a) / (b - a) * cells).astype(np.int64)
        keep = (phase >= 0) & (phase < cells)
        sums += np.bincount(phase[keep], weights=norm[lo:hi][keep], minlength=cells)
        counts += np.bincount(phase[keep], minlength=cells)
    folded = sums / np.maximum(counts, 1)
    mid = folded[cells // 4:3 * cells // 4]
    background = float(np.median(mid))
    noise = 1.4826 * float(np.median(np.abs(mid - background)))
    tick = float(folded[:max(2, cells // 50)].max()) - background
    rise = float(mid.max()) - background
    return rise > 8.0 * noise and rise > 0.05 * tick


def _onsets(env: FloatArray) -> FloatArray:
    """First crossing of 30 % of each row's peak, before the peak, interpolated (samples)."""
    peak = np.argmax(env, axis=1)
    thr = _ONSET_FRACTION * env[np.arange(len(env)), peak]
    out = np.empty(len(env))
    for r in range(len(env)):
        below = np.flatnonzero(env[r, :peak[r] + 1] < thr[r])
        k = int(below[-1]) if below.size else 0
        y0, y1 = env[r, k], env[r, min(k + 1, env.shape[1] - 1)]
        out[r] = k + (thr[r] - y0) / (y1 - y0) if y1 > y0 else float(k)
    return out


def _shift_rows(y: FloatArray, shift: FloatArray) -> FloatArray:
    """Rows advanced by fractional sample amounts (z[k] = y[k + shift]), via the FFT."""
    n = y.shape[1]
    f = rfftfreq(n)
    return np.asarray(irfft(rfft(y, axis=1) * np.exp(2j * np.pi * f[None, :] * shift[:, None]),
                            n=n, axis=1))


def _refine(source: SampleSource, coarse: IntArray, parity: IntArray, beat: float
            ) -> tuple[FloatArray, FloatArray, FloatArray, int]:
    """Sub-sample onsets (s), correlations, templates, template onset index."""
    fs = source.rate_hz
    before = int(round(0.006 * fs))
    q = int(round(0.002 * fs))                      # template samples before the onset
    m = q + int(round(min(0.010, 0.3 * beat) * fs))  # template length
    s = max(3, int(round(0.001 * fs)))              # correlation search, ± samples
    after = m - q + int(round(0.004 * fs)) + s
    pad = int(round(0.01 * fs))
    starts = coarse - before - pad
    width = before + after
    n = len(coarse)
    sos = highpass_sos(fs)
    # the filtered windows are kept (float32, ~20 ms each: 30 MB for an hour at 48 kHz);
    # everything wider is made a batch at a time
    y = np.empty((n, width), dtype=np.float32)
    onset = np.empty(n)
    batches = [slice(b0, min(n, b0 + _BATCH)) for b0 in range(0, n, _BATCH)]
    for sl in batches:
        raw = source.read_windows(starts[sl], width + 2 * pad)
        yb = sosfiltfilt(sos, raw, axis=1)[:, pad:-pad]
        y[sl] = yb
        env = uniform_filter1d(np.abs(hilbert(yb, axis=1)), max(1, int(3e-4 * fs)), axis=1)
        onset[sl] = _onsets(env[:, :before + int(0.002 * fs)])
    onset = np.clip(onset, q + s, width - (m - q) - s - 1)
    templates = np.zeros((2, m))
    corr = np.zeros(n)
    for _ in range(_TEMPLATE_ROUNDS):
        base = np.floor(onset).astype(np.int64)
        sums = np.zeros((2, m))
        for sl in batches:
            z = _shift_rows(y[sl].astype(np.float64), onset[sl] - base[sl])
            aligned = z[np.arange(len(z))[:, None], (base[sl] - q)[:, None] + np.arange(m)]
            for p in (0, 1):
                sums[p] += aligned[parity[sl] == p].sum(axis=0)
        counts = np.array([np.count_nonzero(parity == p) for p in (0, 1)])
        templates = sums / np.maximum(counts, 1)[:, None]
        spec = np.abs(rfft(templates, axis=1))
        spec[:, 0] = 0.0
        half_cycle = [max(1, int(0.5 * m / max(1, int(np.argmax(sp))))) for sp in spec]
        energy = np.sum(templates ** 2, axis=1)
        for sl in batches:
            analytic = np.asarray(hilbert(y[sl].astype(np.float64), axis=1))
            for j, r in enumerate(range(sl.start, sl.stop)):
                t = templates[parity[r]]
                lo = base[r] - q - s
                cc = correlate(analytic[j, lo:lo + m + 2 * s], t, mode="valid")
                ke = int(np.argmax(np.abs(cc)))    # the correlation's envelope: no cycle slips
                w = half_cycle[parity[r]]
                c = cc.real
                a, b = max(0, ke - w), min(len(c), ke + w + 1)
                k = a + int(np.argmax(c[a:b]))     # then the carrier peak nearest to it
                d = 0.0
                if 0 < k < len(c) - 1:
                    # the analytic correlation's phase runs linearly through zero at the true
                    # lag: offset = −phase / (phase per sample); a parabola through three
                    # samples of a carrier near a third of the rate would err by a fifth
                    omega = 0.5 * float(np.angle(cc[k + 1] * np.conj(cc[k]))
                                        + np.angle(cc[k] * np.conj(cc[k - 1])))
                    if omega > 0:
                        d = float(np.clip(-np.angle(cc[k]) / omega, -1.0, 1.0))
                    else:
                        den = c[k - 1] - 2 * c[k] + c[k + 1]
                        d = 0.5 * (c[k - 1] - c[k + 1]) / den if den < 0 else 0.0
                onset[r] = lo + q + k + d
                norm = np.sqrt(energy[parity[r]] * np.sum(
                    y[r, lo + k:lo + k + m].astype(np.float64) ** 2))
                corr[r] = c[k] / norm if norm > 0 else 0.0
        onset = np.clip(onset, q + s, width - (m - q) - s - 1)
    # refer each parity's times to its template's own onset
    up = max(1, int(np.ceil(384_000 / fs)))      # onsets of the templates on a fine grid
    fine = np.asarray(resample(templates, m * up, axis=1))
    ref = _onsets(np.abs(hilbert(fine, axis=1))) / up - q
    # tick and tock alike in shape: one onset for both, the tock's placed by correlating the
    # two average ticks (their envelopes' crossings alone would differ by the noise left in
    # each average, a bias of the asymmetry); unlike: each keeps its own onset
    cc = correlate(fine[1], fine[0], mode="full")
    lag = int(np.argmax(cc))
    similar = cc[lag] / max(float(np.sqrt(np.sum(fine[0] ** 2) * np.sum(fine[1] ** 2))), 1e-300)
    if similar >= _SAME_SHAPE and np.all(counts > 0):
        ref[1] = ref[0] + (lag - (m * up - 1)) / up
    times = (starts + pad + onset + ref[parity]) / fs
    return times, corr, templates, q


def detect_ticks(source: SampleSource) -> TickDetection:
    """Find and time the ticks of a recording.

    Parameters
    ----------
    source : a :class:`core.recording.WavSource` or :class:`core.recording.ArraySource`.

    Returns
    -------
    TickDetection
        Tick onsets (s, sub-sample), their beat numbers, correlations and the rejected events.

    Raises
    ------
    DesignError
        On ``recording`` when no ticks are found or the recording is shorter than three beats.
    """
    fs = source.rate_hz
    if source.frames < 3 * MIN_BEAT_S * fs:
        raise DesignError("recording", f"is too short ({source.frames / fs:.3g} s): it must hold "
                                       "at least three beats")
    env, nbin = _envelope(source)
    bin_s = nbin / fs
    norm = _normalise(env, int(round(1.0 / bin_s)))
    del env
    pk, props = find_peaks(norm, height=_CAND_HEIGHT,
                           distance=max(1, int(round(_CAND_SPACING_S / bin_s))))
    if len(pk) < 3:
        raise DesignError("recording", "holds no ticks: no sounds stand out of the noise")
    ch = np.asarray(props["peak_heights"], dtype=np.float64)
    beat = _beat_from_autocorrelation(norm, ch, bin_s)
    ct = pk * bin_s
    cand, idx = _follow(ct, ch, beat, len(norm) * bin_s)
    if beat / 2 >= MIN_BEAT_S and _half_beat_heard(norm, ct[cand], idx, bin_s):
        beat /= 2.0   # weak tocks the autocorrelation missed
        cand, idx = _follow(ct, ch, beat, len(norm) * bin_s)
    if len(cand) < 3:
        raise DesignError("recording", "holds no regular ticks")
    coarse = pk[cand] * nbin
    order = np.argsort(idx)
    cand, idx, coarse = cand[order], idx[order], coarse[order]
    times, corr, templates, q = _refine(source, coarse, idx % 2, beat)
    # loud events off the beat: not a tick, not in the tick's own sounds just after it
    loud_level = max(0.5 * float(np.median(ch[cand])), 2.0 * _CAND_HEIGHT)
    loud = np.setdiff1d(np.flatnonzero(ch >= loud_level), cand)
    k = np.searchsorted(ct[cand], ct[loud], side="right") - 1
    own = (k >= 0) & (ct[loud] - ct[cand][np.maximum(k, 0)] < min(0.08, 0.4 * beat))
    return TickDetection(times_s=times, index=idx, correlation=corr,
                         rejected_times_s=ct[loud[~own]], beat_estimate_s=beat, rate_hz=fs,
                         duration_s=source.frames / fs, templates=templates, template_onset=q)
