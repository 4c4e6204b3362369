"""Invented test signals: synthetic clock ticks with known beat, asymmetry and imperfections.

Nothing here is a recording of a real clock. The signals exist so that the tick detector and the
beat analysis can be checked against known truth (tests, the demo recording, the benchmark).

A tick is a decaying burst of a few kHz, t ≥ 0:
``s(t) = (1 − e^(−t/τr)) e^(−t/τd) sin(2π f t)``, placed at a fractional time (evaluated on the
sample grid, so sub-sample placement is exact), followed by a weaker secondary sound (the
escapement's drop) ``secondary_delay_s`` later. Tick *i* sits at
``t_i = first_tick_s + i·b(t) + (−1)^i a/2 + jitter_i`` — the model of DESIGN §9 with an optional
linear change of the beat over the recording. Each tick is convolved with a room response
(a direct path plus an exponentially decaying noise tail), the tick level drifts slowly
(``level_drift_db`` from start to end), white noise is added at ``snr_db`` (tick peak amplitude
over noise rms, the tick band unfiltered), mains hum with harmonics, stray clicks and dropped
ticks as asked.
"""

from __future__ import annotations

import struct
import wave
from collections.abc import Iterator
from dataclasses import dataclass
from pathlib import Path

import numpy as np
from numpy.typing import NDArray
from scipy.fft import irfft, rfft, rfftfreq
from scipy.signal import fftconvolve, resample_poly

from .errors import DesignError

__all__ = ["TickSignalSpec", "true_tick_times", "render_chunks", "render", "write_wav"]

FloatArray = NDArray[np.float64]
_OVER = 8
_EDGE = 8


@dataclass(frozen=True)
class TickSignalSpec:
    """What to synthesise. Times in s, frequencies in Hz, levels relative to the tick amplitude.

    ``asymmetry_s`` is *a* of the model t_i = t₀ + i·b + (−1)^i·a/2: the intervals alternate
    b − a and b + a. ``beat_drift`` is the relative change of the beat from start to end.
    ``dropped`` lists tick indices left out; ``clicks_s`` times of loud stray clicks.
    """

    rate_hz: int = 8000
    duration_s: float = 60.0
    beat_s: float = 1.0
    asymmetry_s: float = 0.0
    first_tick_s: float = 0.25
    jitter_s: float = 20e-6
    beat_drift: float = 0.0
    amplitude: float = 0.25
    tock_level: float = 0.8
    tick_hz: float = 2500.0
    tick_rise_s: float = 0.15e-3
    tick_decay_s: float = 1.5e-3
    secondary_delay_s: float = 0.018
    secondary_level: float = 0.4
    secondary_hz: float = 1800.0
    snr_db: float | None = 20.0
    hum_level: float = 0.5
    hum_hz: float = 50.0
    level_drift_db: float = -3.0
    reverb_decay_s: float = 0.03
    reverb_level: float = 0.3
    dropped: tuple[int, ...] = ()
    clicks_s: tuple[float, ...] = ()
    click_level: float = 3.0
    seed: int = 0


def true_tick_times(spec: TickSignalSpec) -> tuple[NDArray[np.int64], FloatArray]:
    """The beat indices and true onset times (s) of the ticks present in the signal."""
    rng = np.random.default_rng([spec.seed, 1])
    n = int(np.floor((spec.duration_s - spec.first_tick_s) / spec.beat_s)) + 2
    i = np.arange(n)
    # beat changing linearly over the recording: t = t0 + b0 (i + drift i² / (2 N_total))
    n_total = spec.duration_s / spec.beat_s
    t = (spec.first_tick_s + spec.beat_s * (i + spec.beat_drift * i ** 2 / (2.0 * n_total))
         + (-1.0) ** i * spec.asymmetry_s / 2.0 + spec.jitter_s * rng.standard_normal(n))
    keep = (t < spec.duration_s - 0.05) & ~np.isin(i, spec.dropped)
    return i[keep], t[keep]


def _burst(tau: FloatArray, freq_hz: float, rise_s: float, decay_s: float) -> FloatArray:
    out = np.zeros_like(tau)
    pos = tau >= 0.0
    tp = tau[pos]
    out[pos] = ((1.0 - np.exp(-tp / rise_s)) * np.exp(-tp / decay_s)
                * np.sin(2 * np.pi * freq_hz * tp))
    return out


def _room_response(spec: TickSignalSpec) -> FloatArray:
    if spec.reverb_decay_s <= 0 or spec.reverb_level <= 0:
        return np.ones(1)
    rng = np.random.default_rng([spec.seed, 2])
    n = int(5 * spec.reverb_decay_s * spec.rate_hz)
    tail = rng.standard_normal(n) * np.exp(-np.arange(n) / (spec.reverb_decay_s * spec.rate_hz))
    tail *= spec.reverb_level / np.sqrt(np.sum(tail ** 2))
    h = np.concatenate([[1.0], tail])
    h[1:3] = 0.0  # the first reflection arrives a little after the direct sound
    return h


def render_chunks(spec: TickSignalSpec, chunk_s: float = 10.0) -> Iterator[FloatArray]:
    """Yield the signal (full scale ±1) in consecutive chunks of ``chunk_s`` seconds."""
    fs = spec.rate_hz
    total = int(round(spec.duration_s * fs))
    index, times = true_tick_times(spec)
    h = _room_response(spec)
    tick_len = int((8 * spec.tick_decay_s + spec.secondary_delay_s + 0.002) * fs) + len(h) + _EDGE
    amp = spec.amplitude
    # one tick (with its secondary sound and the room) starting _EDGE samples in, made on a grid
    # 8 times finer and brought down through resample_poly's anti-alias filter as a recorder's
    # converter would; each tick is this delayed by its fraction of a sample (exact for a
    # band-limited signal), so the samples do not depend on where the grid falls
    tau = np.arange((tick_len + _EDGE) * _OVER) / (fs * _OVER) - _EDGE / fs
    y0 = _burst(tau, spec.tick_hz, spec.tick_rise_s, spec.tick_decay_s)
    y0 += spec.secondary_level * _burst(tau - spec.secondary_delay_s, spec.secondary_hz,
                                        spec.tick_rise_s, spec.tick_decay_s * 1.5)
    base = fftconvolve(resample_poly(y0, 1, _OVER)[:tick_len], h)[:tick_len]
    n_fft = tick_len + 2 * _EDGE
    base_spec = rfft(base, n=n_fft)
    freqs = rfftfreq(n_fft)
    gain = 10.0 ** (spec.level_drift_db / 20.0 * (times / spec.duration_s - 0.5))
    level = np.where(index % 2 == 0, 1.0, spec.tock_level) * gain
    noise_rms = 0.0 if spec.snr_db is None else amp / 10.0 ** (spec.snr_db / 20.0)
    rng = np.random.default_rng([spec.seed, 3])
    step = int(round(chunk_s * fs))
    for start in range(0, total, step):
        stop = min(total, start + step)
        t = np.arange(start, stop) / fs
        x = noise_rms * rng.standard_normal(stop - start)
        if spec.hum_level > 0:
            for k, rel in ((1, 1.0), (2, 0.4), (3, 0.5), (5, 0.2), (7, 0.1)):
                x += amp * spec.hum_level * rel * np.sin(2 * np.pi * k * spec.hum_hz * t + k)
        # ticks whose support overlaps this chunk
        k0 = np.searchsorted(times, start / fs - tick_len / fs - 0.01)
        k1 = np.searchsorted(times, stop / fs + 0.01)
        for k in range(k0, k1):
            n0 = int(np.floor(times[k] * fs)) - _EDGE
            frac = times[k] * fs - np.floor(times[k] * fs)
            y = irfft(base_spec * np.exp(-2j * np.pi * freqs * frac), n=n_fft)[:tick_len]
            y *= amp * level[k]
            lo, hi = max(n0, start), min(n0 + tick_len, stop)
            if lo < hi:
                x[lo - start:hi - start] += y[lo - n0:hi - n0]
        for c, tc in enumerate(spec.clicks_s):
            n0 = int(round(tc * fs))
            crng = np.random.default_rng([spec.seed, 4, c])
            m = max(8, int(1e-3 * fs))
            y = crng.standard_normal(m) * np.exp(-np.arange(m) / (m / 4))
            y *= spec.click_level * amp / np.max(np.abs(y))   # peak: click_level × tick's
            lo, hi = max(n0, start), min(n0 + m, stop)
            if lo < hi:
                x[lo - start:hi - start] += y[lo - n0:hi - n0]
        yield x


def render(spec: TickSignalSpec) -> FloatArray:
    """The whole signal as one array (full scale ±1), for short recordings."""
    return np.concatenate(list(render_chunks(spec)))


def write_wav(spec: TickSignalSpec, path: str | Path, bits: int = 16, channels: int = 1,
              comment: str | None = None) -> None:
    """Write the signal as integer PCM WAV (16, 24 or 32 bit), chunk by chunk (little memory).

    With ``channels=2`` the second channel carries the same ticks at 0.7 of the level with its
    own noise — two microphones at different distances. ``comment`` is stored in the file as a
    RIFF ``LIST``/``INFO`` ``ICMT`` chunk after the samples.
    """
    width = bits // 8
    if bits not in (16, 24, 32):
        raise DesignError("bits", f"bits={bits} is out of range: it must be 16, 24 or 32")
    full = float(2 ** (bits - 1) - 1)
    other = TickSignalSpec(**{**spec.__dict__, "seed": spec.seed + 1000,
                              "amplitude": spec.amplitude * 0.7})
    second = render_chunks(other) if channels == 2 else None
    with wave.open(str(path), "wb") as w:
        w.setnchannels(channels)
        w.setsampwidth(width)
        w.setframerate(spec.rate_hz)
        for x in render_chunks(spec):
            cols = [x] if second is None else [x, next(second)]
            q = np.clip(np.round(np.column_stack(cols) * full), -full - 1, full).astype("<i4")
            if width == 4:
                raw = q.tobytes()
            elif width == 2:
                raw = q.astype("<i2").tobytes()
            else:
                raw = q.view(np.uint8).reshape(-1, 4)[:, :3].tobytes()
            w.writeframes(raw)
    if comment:
        text = comment.encode("utf-8") + b"\0"
        text += b"\0" * (len(text) & 1)
        info = b"INFO" + b"ICMT" + struct.pack("<I", len(text)) + text
        with open(path, "r+b") as fh:
            fh.seek(0, 2)
            fh.write(b"LIST" + struct.pack("<I", len(info)) + info)
            size = fh.tell() - 8
            fh.seek(4)
            fh.write(struct.pack("<I", size))
