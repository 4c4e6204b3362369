"""Benchmark: ``core.beats.analyse_recording`` against a naive baseline, time, memory, accuracy.

Run from the repository root: ``python3 benchmarks/beats_bench.py`` (the hour is generated on
the fly into a temporary file, ≈ 0.7 GB of disk and a few minutes; ``--quick`` skips it,
``--long-seconds N`` shortens it). A plain script: it prints, it asserts nothing.

Recordings (invented, :mod:`core.synthetic_ticks`): 60 s at 48 kHz 16-bit mono, and one hour at
48 kHz 16-bit stereo; 1-s beats with known beat and asymmetry, 20 dB of noise (tick peak over
noise rms), hum, reverberation, secondary sounds, a dropped tick and a stray click.

Each analysis runs in a fresh interpreter (``subprocess``) so its peak memory is its own:
``ru_maxrss`` of the child (resident set, includes the interpreter and numpy/scipy, ≈ 60 MB)
and, in a second run, the ``tracemalloc`` peak (Python and numpy allocations only). Time is
``time.perf_counter`` around the analysis alone, median of RUNS.

Naive baseline: ``scipy.io.wavfile.read`` of the whole file, channels mixed to float64,
high-pass (``sosfiltfilt``, same 1 kHz Butterworth), rectified; the tick is the first sample
over half the 90th percentile of the peaks 0.4 s apart, after a 0.6 s dead time (whole
samples, no template, no rejection); beat and asymmetry from the same least-squares model
(:func:`core.beats.fit_beats`), ticks numbered by rounding the intervals to the median one.

Goals (the issue): 60 s under 0.5 s, the hour under 30 s and 300 MB.
"""

from __future__ import annotations

import argparse
import json
import platform
import resource
import statistics
import subprocess
import sys
import tempfile
import time
import tracemalloc
from pathlib import Path

import numpy as np
import scipy

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from core.beats import analyse_recording, fit_beats  # noqa: E402
from core.synthetic_ticks import TickSignalSpec, write_wav  # noqa: E402
from core.ticks import highpass_sos  # noqa: E402

RUNS = 3
BEAT_S = 1.0000115
ASYM_S = 0.0021


def _spec(duration_s: float) -> TickSignalSpec:
    return TickSignalSpec(rate_hz=48000, duration_s=duration_s, beat_s=BEAT_S,
                          asymmetry_s=ASYM_S, tick_hz=3500.0, dropped=(7,),
                          clicks_s=(12.37,), seed=42)


def naive(path: str) -> tuple[float, float, int]:
    """Whole-file threshold detector: (beat s, asymmetry s, ticks)."""
    from scipy.io import wavfile
    from scipy.signal import find_peaks, sosfiltfilt
    rate, data = wavfile.read(path)
    x = data.astype(np.float64)
    if x.ndim == 2:
        x = x.mean(axis=1)
    y = np.abs(sosfiltfilt(highpass_sos(rate), x))
    pk, _ = find_peaks(y, distance=int(0.4 * rate))
    level = 0.5 * np.percentile(y[pk], 90)
    ticks, dead = [], -1
    for k in np.flatnonzero(y > level):
        if k > dead:
            ticks.append(k)
            dead = k + int(0.6 * rate)
    t = np.array(ticks) / rate
    step = np.median(np.diff(t))
    index = np.concatenate([[0], np.cumsum(np.round(np.diff(t) / step))]).astype(np.int64)
    first = np.concatenate([[True], np.diff(index) > 0])   # a second crossing in one beat
    index, t = index[first], t[first]
    fit = fit_beats(index, t)
    return fit.beat_s, abs(fit.asymmetry_s), len(t)


def child(mode: str, path: str, trace: bool) -> None:
    """Run one analysis in this (fresh) process and print a JSON line."""
    if trace:
        tracemalloc.start()
    t0 = time.perf_counter()
    if mode == "core":
        a = analyse_recording(path)
        beat, asym, ticks = a.beat_s, a.beat_asymmetry_s, a.ticks
    else:
        beat, asym, ticks = naive(path)
    dt = time.perf_counter() - t0
    peak = tracemalloc.get_traced_memory()[1] if trace else 0
    rss_kb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss
    print(json.dumps({"time_s": dt, "traced_mb": peak / 1e6, "rss_mb": rss_kb / 1e3,
                      "beat_s": beat, "asym_s": asym, "ticks": ticks}))


def measure(mode: str, path: str) -> dict[str, float]:
    """Median time of RUNS fresh runs, peak RSS, traced peak and the accuracy."""
    runs = []
    for trace in [False] * RUNS + [True]:
        out = subprocess.run([sys.executable, __file__, "--child", mode, path]
                             + (["--trace"] if trace else []),
                             capture_output=True, text=True, check=True, cwd=ROOT)
        runs.append(json.loads(out.stdout.strip().splitlines()[-1]))
    timed = runs[:-1]
    return {"time_s": statistics.median(r["time_s"] for r in timed),
            "rss_mb": max(r["rss_mb"] for r in timed), "traced_mb": runs[-1]["traced_mb"],
            "beat_err_rel": abs(timed[0]["beat_s"] / BEAT_S - 1),
            "asym_err_ms": 1e3 * abs(timed[0]["asym_s"] - ASYM_S), "ticks": timed[0]["ticks"]}


def main() -> None:
    """Generate the recordings, measure core and naive, print a table."""
    ap = argparse.ArgumentParser()
    ap.add_argument("--quick", action="store_true", help="skip the long recording")
    ap.add_argument("--long-seconds", type=float, default=3600.0)
    ap.add_argument("--child", nargs=2, metavar=("MODE", "PATH"))
    ap.add_argument("--trace", action="store_true")
    args = ap.parse_args()
    if args.child:
        child(args.child[0], args.child[1], args.trace)
        return
    print(f"Python {platform.python_version()}, numpy {np.__version__}, scipy "
          f"{scipy.__version__}, {platform.machine()}")
    cases = [("60 s, 48 kHz mono", 60.0, 1)]
    if not args.quick:
        cases.append((f"{args.long_seconds:g} s, 48 kHz stereo", args.long_seconds, 2))
    with tempfile.TemporaryDirectory() as tmp:
        for label, seconds, channels in cases:
            path = str(Path(tmp) / "rec.wav")
            t0 = time.perf_counter()
            write_wav(_spec(seconds), path, bits=16, channels=channels)
            print(f"\n{label}: generated in {time.perf_counter() - t0:.1f} s "
                  f"({Path(path).stat().st_size / 1e6:.0f} MB)")
            print(f"{'':8} {'time s':>8} {'RSS MB':>8} {'traced MB':>10} {'ticks':>6} "
                  f"{'beat err (rel)':>15} {'asym err ms':>12}")
            for mode in ("core", "naive"):
                m = measure(mode, path)
                print(f"{mode:8} {m['time_s']:8.3f} {m['rss_mb']:8.0f} {m['traced_mb']:10.1f} "
                      f"{m['ticks']:6d} {m['beat_err_rel']:15.2e} {m['asym_err_ms']:12.4f}")
    print("\nGoals: 60 s < 0.5 s; the hour < 30 s and < 300 MB (RSS of the analysing process).")


if __name__ == "__main__":
    main()
