"""Named constants used across the core and the window (one home for each).

``SECONDS_PER_DAY`` turns a relative period error into a clock's rate in s/day;
``STANDARD_GRAVITY`` is the conventional g_n (3rd CGPM, 1901), used to quote loads in kg.
"""

from __future__ import annotations

__all__ = ["SECONDS_PER_DAY", "STANDARD_GRAVITY", "SECONDS_PER_HOUR", "BEATS_PER_PERIOD"]

SECONDS_PER_DAY = 86400.0  # s
SECONDS_PER_HOUR = 3600.0  # s
STANDARD_GRAVITY = 9.80665  # m/s², 3rd CGPM (1901)
BEATS_PER_PERIOD = 2  # a pendulum beats twice in each full period (tick and tock)
