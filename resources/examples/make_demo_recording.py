"""Write ``demo_ticks.wav``: an INVENTED, SYNTHETIC recording of a hall clock's ticking.

No clock was recorded. The file is made by :mod:`core.synthetic_ticks` from numbers chosen
here, so the analysis can be tried (``penduline beats resources/examples/demo_ticks.wav
--design resources/examples/hall_clock.pendulum.json``) and its answer checked against them:

* 30 s at 8 kHz, 16-bit mono (≈ 480 kB), with a comment chunk saying it is synthetic;
* beat 0.99995370 s (a 2 s period gaining 4.0 s/day against the hall clock's 3600 beats per
  hour), out of beat by a = 1.5 ms (intervals alternate b ± a, 0.15 % of the beat);
* ticks of a few kHz with a secondary sound 18 ms later, a 30 ms room tail, 20 dB of hiss
  (tick peak over noise rms), 50 Hz hum with harmonics, a 3 dB fade, one tick missing and
  one loud stray click (at 11.3 s).

Run from the repository root: ``python3 resources/examples/make_demo_recording.py``.
"""

from __future__ import annotations

import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

from core.synthetic_ticks import TickSignalSpec, write_wav  # noqa: E402

GAIN_S_PER_DAY = 4.0
TARGET_PERIOD_S = 2.0
DEMO = TickSignalSpec(
    rate_hz=8000, duration_s=30.0,
    beat_s=TARGET_PERIOD_S / 2.0 / (1.0 + GAIN_S_PER_DAY / 86400.0),
    asymmetry_s=0.0015, first_tick_s=0.4, jitter_s=25e-6, tick_hz=2200.0,
    dropped=(19,), clicks_s=(11.3,), snr_db=20.0, seed=2026)

COMMENT = ("Synthetic: invented ticks of an imaginary hall clock made by "
           "resources/examples/make_demo_recording.py; not a recording of a real clock.")


def main() -> None:
    """Write the demo recording next to this script."""
    out = Path(__file__).resolve().parent / "demo_ticks.wav"
    write_wav(DEMO, out, bits=16, comment=COMMENT)
    print(f"wrote {out} ({out.stat().st_size / 1e3:.0f} kB, synthetic)")


if __name__ == "__main__":
    main()
