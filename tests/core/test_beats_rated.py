"""Re-rating an analysis against another target: the same as analysing with that target, with
nothing detected again."""

from __future__ import annotations

from pathlib import Path

import pytest

from core.beats import analyse_recording
from core.constants import SECONDS_PER_DAY

DEMO = Path(__file__).resolve().parents[2] / "resources" / "examples" / "demo_ticks.wav"


def test_rated_equals_a_fresh_analysis_against_that_target() -> None:
    plain = analyse_recording(DEMO)
    fresh = analyse_recording(DEMO, target_period_s=2.001)
    rated = plain.rated(2.001)
    assert plain.rate_s_per_day is None
    assert rated.rate_s_per_day == pytest.approx(fresh.rate_s_per_day, rel=1e-12)
    assert rated.rate_sigma_s_per_day == pytest.approx(fresh.rate_sigma_s_per_day, rel=1e-12)
    assert rated.rate_drift_s_per_day == pytest.approx(fresh.rate_drift_s_per_day, rel=1e-9)
    assert rated.warnings == fresh.warnings
    assert rated.tick_times_s is plain.tick_times_s  # the ticks are the same objects
    # rate definition, DESIGN §9: 86400·(T_target/T − 1), positive when the clock gains
    assert rated.rate_s_per_day == pytest.approx(
        SECONDS_PER_DAY * (2.001 / plain.period_s - 1.0), rel=1e-12)
    assert rated.rated(None).rate_s_per_day is None


def test_a_target_out_of_range_is_refused_with_its_field() -> None:
    from core import DesignError

    with pytest.raises(DesignError) as err:
        analyse_recording(DEMO).rated(50.0)
    assert err.value.field == "target_period_s"
