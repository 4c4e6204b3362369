"""The rating fit (DESIGN §9): recovery of known rates and coefficients, standard errors against
an independent least-squares computation, the "not determined" rules, Allan deviation against
``allantools`` and Q from a large-arc decay integrated with ``solve_ivp``."""

from __future__ import annotations

import functools
import math
import warnings
from datetime import UTC, datetime, timedelta, timezone

import numpy as np
import pytest
from scipy.integrate import cumulative_trapezoid, quad, solve_ivp

from core.errors import DesignError
from core.rating import Conditions, fit_rating
from core.rating_log import Adjustment, DecayReading, RatingLog, Reading
from core.rating_stability import (
    allan_deviation,
    fit_quality_factor,
    large_arc_log,
    phase_allan_deviation,
)

TZ = timezone(timedelta(hours=1))
T0 = datetime(2027, 3, 1, 8, 0, tzinfo=TZ)
REF = Conditions(20.0, 1013.25, 1.6)
TRUE = {"rates": (3.5, -1.2, 0.4), "k_t": -0.25, "k_p": 0.012, "k_a": -4.0,
        "offsets": (1.0, 30.0, -2.0)}


def _temperature(d: float) -> float:
    return 18.0 + 3.0 * math.sin(d / 4.0) + 0.05 * d


def _pressure(d: float) -> float:
    return 1010.0 + 12.0 * math.cos(d / 3.0 + 0.5)


def _arc(d: float) -> float:
    return 1.6 + 0.05 * math.sin(d / 2.2 + 1.0)


@functools.cache
def _truth() -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, np.ndarray,
                      tuple[float, ...]]:
    """Three segments of readings over 45 days, unevenly spaced; the true error is integrated
    with ``quad`` over the linearly interpolated conditions (a different route from the fit's
    trapezoid sums)."""
    days = np.arange(0.0, 45.0, 0.75) + np.random.default_rng(99).uniform(-0.1, 0.1, 60)
    cuts = (15.1, 30.2)
    seg = np.searchsorted(cuts, days)
    temps = np.array([_temperature(d) for d in days])
    press = np.array([_pressure(d) for d in days])
    arcs = np.array([_arc(d) for d in days])

    def rate(d: float, s: int) -> float:
        t, p, a = (np.interp(d, days, v) for v in (temps, press, arcs))
        return (TRUE["rates"][s] + TRUE["k_t"] * (t - REF.temperature_c)
                + TRUE["k_p"] * (p - REF.pressure_hpa) + TRUE["k_a"] * (a - REF.semi_arc_deg))

    errors = np.empty(days.size)
    for i, d in enumerate(days):
        s = int(seg[i])
        if i == 0 or seg[i - 1] != s:
            errors[i] = TRUE["offsets"][s]
        else:
            errors[i] = errors[i - 1] + quad(rate, days[i - 1], d, args=(s,), epsabs=1e-13,
                                             epsrel=1e-13)[0]
    return days, temps, press, arcs, errors, cuts


def _synthetic(noise_s: float, seed: int = 7) -> RatingLog:
    days, temps, press, arcs, errors, cuts = _truth()
    noise = np.random.default_rng(seed).normal(0.0, noise_s, days.size)
    readings = tuple(Reading(T0 + timedelta(days=float(d)), float(errors[i] + noise[i]),
                             float(temps[i]), float(press[i]), float(arcs[i]))
                     for i, d in enumerate(days))
    adjustments = tuple(Adjustment(T0 + timedelta(days=c), "nut", 0.1) for c in cuts)
    return RatingLog(readings, adjustments)


def _independent_fit(log: RatingLog, names: tuple[str, ...]) -> tuple[np.ndarray, np.ndarray]:
    """Estimates and standard errors by a separate route: X built with explicit loops and
    ``cumulative_trapezoid``, covariance s²·inv(XᵀX) (any statistics text)."""
    cuts = [a.at for a in log.adjustments]
    seg = [sum(1 for c in cuts if c < r.at) for r in log.readings]
    segments = sorted(set(seg))
    rows = []
    for s in segments:
        members = [r for r, k in zip(log.readings, seg, strict=True) if k == s]
        days = np.array([(r.at - members[0].at).total_seconds() / 86400.0 for r in members])
        integrals = []
        for name in names:
            allx = np.array([(r.at - log.readings[0].at).total_seconds() for r in log.readings])
            have = [getattr(r, name) is not None for r in log.readings]
            vals = np.interp(allx, allx[have], [getattr(r, name) for r in log.readings
                                                if getattr(r, name) is not None])
            mine = np.array([v for v, k in zip(vals, seg, strict=True) if k == s])
            mine = mine - getattr(REF, name)
            integrals.append(cumulative_trapezoid(mine, days, initial=0.0))
        for j in range(len(members)):
            row = [1.0 if q == s else 0.0 for q in segments]
            row += [days[j] if q == s else 0.0 for q in segments]
            row += [col[j] for col in integrals]
            rows.append(row)
    x = np.array(rows)
    y = np.array([r.error_s for r in log.readings])
    beta = np.linalg.lstsq(x, y, rcond=None)[0]
    resid = y - x @ beta
    s2 = resid @ resid / (len(y) - x.shape[1])
    return beta, np.sqrt(np.diag(s2 * np.linalg.inv(x.T @ x)))


def test_noise_free_log_recovers_the_truth() -> None:
    fit = fit_rating(_synthetic(0.0), REF)
    assert [s.rate_s_per_day for s in fit.segments] == pytest.approx(TRUE["rates"], abs=1e-8)
    assert [s.offset_s for s in fit.segments] == pytest.approx(TRUE["offsets"], abs=1e-8)
    assert fit.temperature.value == pytest.approx(TRUE["k_t"], abs=1e-9)
    assert fit.pressure.value == pytest.approx(TRUE["k_p"], abs=1e-10)
    assert fit.arc.value == pytest.approx(TRUE["k_a"], abs=1e-7)
    assert fit.residual_rms_s < 1e-9


def test_noisy_log_recovers_the_truth_within_three_sigma() -> None:
    fit = fit_rating(_synthetic(0.05, seed=11), REF)
    for seg, rate in zip(fit.segments, TRUE["rates"], strict=True):
        assert seg.rate_sigma_s_per_day is not None and seg.rate_sigma_s_per_day > 0
        assert abs(seg.rate_s_per_day - rate) < 3 * seg.rate_sigma_s_per_day
    for coeff, true in ((fit.temperature, TRUE["k_t"]), (fit.pressure, TRUE["k_p"]),
                        (fit.arc, TRUE["k_a"])):
        assert coeff.value is not None and coeff.sigma is not None and coeff.reason == ""
        assert abs(coeff.value - true) < 3 * coeff.sigma
    assert 0.03 < fit.residual_rms_s < 0.07
    assert fit.degrees_of_freedom == 60 - 9


def test_standard_errors_match_an_independent_computation() -> None:
    log = _synthetic(0.05, seed=3)
    fit = fit_rating(log, REF)
    beta, sigma = _independent_fit(log, ("temperature_c", "pressure_hpa", "semi_arc_deg"))
    ours = np.sqrt(np.diag(fit.covariance))
    order = [f"offset_{j}" for j in range(3)] + [f"rate_{j}" for j in range(3)] + [
        "temperature_c", "pressure_hpa", "semi_arc_deg"]
    assert list(fit.parameter_names) == order
    np.testing.assert_allclose(ours, sigma, rtol=1e-9)
    assert [s.rate_s_per_day for s in fit.segments] == pytest.approx(beta[3:6], rel=1e-9)
    assert fit.arc.sigma == pytest.approx(sigma[8], rel=1e-9)


def test_missing_conditions_are_interpolated_and_match_the_independent_fit() -> None:
    log = _synthetic(0.05, seed=5)
    readings = list(log.readings)
    for i in (4, 5, 20, 41):
        r = readings[i]
        readings[i] = Reading(r.at, r.error_s, None, r.pressure_hpa, r.semi_arc_deg)
    readings[-1] = Reading(readings[-1].at, readings[-1].error_s, None, None, None)
    log = RatingLog(tuple(readings), log.adjustments)
    fit = fit_rating(log, REF)
    beta, sigma = _independent_fit(log, ("temperature_c", "pressure_hpa", "semi_arc_deg"))
    np.testing.assert_allclose(np.sqrt(np.diag(fit.covariance)), sigma, rtol=1e-9)
    assert fit.temperature.value == pytest.approx(beta[6], rel=1e-9)


def _log_with(temps: list[float | None], pressures: list[float | None] | None = None,
              cut: float | None = None) -> RatingLog:
    rng = np.random.default_rng(1)
    readings = tuple(
        Reading(T0 + timedelta(days=i), 2.0 * i + rng.normal(0, 0.1), t,
                None if pressures is None else pressures[i], None)
        for i, t in enumerate(temps))
    adj = () if cut is None else (Adjustment(T0 + timedelta(days=cut), "set", None),)
    return RatingLog(readings, adj)


def test_small_temperature_span_is_not_determined_with_the_reason() -> None:
    temps = [20.0, 20.3, 20.8, 20.1, 20.5, 20.2, 20.0, 20.4]
    fit = fit_rating(_log_with(temps), REF)
    assert fit.temperature.value is None and fit.temperature.sigma is None
    assert fit.temperature.reason.startswith("temperatures span only 0.8 K")
    assert fit.pressure.reason == "no fitted reading notes the pressure (3 needed)"
    assert fit.arc.value is None
    assert fit.segments[0].rate_s_per_day == pytest.approx(2.0, abs=0.1)
    assert fit.parameter_names == ("offset_0", "rate_0")


def test_condition_noted_in_two_readings_is_not_determined() -> None:
    temps: list[float | None] = [None] * 8
    temps[2], temps[6] = 15.0, 25.0
    fit = fit_rating(_log_with(temps), REF)
    assert fit.temperature.reason == "only 2 fitted reading(s) note the temperature (3 needed)"


def test_temperature_changing_only_between_segments_is_not_determined() -> None:
    temps = [15.0] * 5 + [25.0] * 5
    fit = fit_rating(_log_with(temps, cut=4.5), REF)
    assert fit.temperature.value is None
    assert "changed only along with the segments" in fit.temperature.reason
    assert len(fit.segments) == 2 and all(s.fitted for s in fit.segments)


def test_short_segment_is_left_out_with_a_warning_naming_its_readings() -> None:
    temps = [20.0 + (i % 3) for i in range(8)]
    fit = fit_rating(_log_with(temps, cut=5.5), REF)
    assert [s.fitted for s in fit.segments] == [True, False]
    assert fit.segments[1].rate_s_per_day is None and fit.segments[1].readings == 2
    assert "Segment 2 (readings 6–7" in fit.warnings[0] and "only 2 reading" in fit.warnings[0]
    assert math.isnan(fit.residuals_s[7]) and not math.isnan(fit.residuals_s[0])


def test_log_without_a_segment_of_three_is_refused() -> None:
    with pytest.raises(DesignError) as info:
        fit_rating(_log_with([20.0, 21.0, 22.0, 23.0], cut=1.5), REF)
    assert info.value.field == "rating_log.readings"
    assert "three readings" in str(info.value)


def test_log_built_in_code_out_of_order_is_refused_naming_the_reading() -> None:
    log = _log_with([20.0] * 5)
    readings = list(log.readings)
    readings[2], readings[3] = readings[3], readings[2]
    with pytest.raises(DesignError) as info:
        fit_rating(RatingLog(tuple(readings)), REF)
    assert info.value.field == "rating_log.readings[3].at"


# ----------------------------------------------------------------------------- Allan deviation

def _allantools_oadev(x: np.ndarray, tau0: float, taus: np.ndarray) -> np.ndarray:
    import allantools
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        out = allantools.oadev(x, rate=1.0 / tau0, data_type="phase", taus=taus)
    np.testing.assert_allclose(out[0], taus, rtol=1e-12)
    return np.asarray(out[1])


@pytest.mark.parametrize("n, seed", [(20, 1), (101, 2), (257, 3)])
def test_allan_deviation_matches_allantools(n: int, seed: int) -> None:
    # Reference: allantools.oadev (NIST SP 1065 eq. 14, overlapping ADEV from phase data).
    rng = np.random.default_rng(seed)
    x = np.cumsum(rng.normal(0.0, 0.3, n)) + rng.normal(0.0, 0.1, n)
    tau0 = 86400.0
    taus, adev = phase_allan_deviation(x, tau0)
    assert taus[0] == tau0 and taus.size == int(math.log2((n - 2) // 2)) + 1
    np.testing.assert_allclose(adev, _allantools_oadev(x, tau0, taus), rtol=1e-10)


def test_allan_deviation_of_a_segment_matches_allantools() -> None:
    rng = np.random.default_rng(9)
    readings = tuple(Reading(T0 + timedelta(hours=12 * i), 0.5 * i + rng.normal(0, 0.2))
                     for i in range(40))
    result = allan_deviation(readings, "segment 1")
    assert result.tau_s is not None and result.adev is not None
    x = np.array([r.error_s for r in readings])
    np.testing.assert_allclose(result.adev, _allantools_oadev(x, 43200.0, result.tau_s),
                               rtol=1e-10)
    assert "40 readings 12 h apart" in result.note


def test_allan_deviation_of_white_phase_noise_falls_as_one_over_tau() -> None:
    # White phase noise: ADEV ∝ τ⁻¹ (NIST SP 1065, power-law noise table) [pub, memory].
    x = np.random.default_rng(4).normal(0.0, 1.0, 4097)
    taus, adev = phase_allan_deviation(x, 1.0)
    slope = np.polyfit(np.log(taus[:8]), np.log(adev[:8]), 1)[0]
    assert slope == pytest.approx(-1.0, abs=0.05)


def test_uneven_spacing_gives_a_sentence_not_a_number() -> None:
    hours = [0, 24, 48, 73, 96, 120]
    readings = tuple(Reading(T0 + timedelta(hours=h), 0.1 * h) for h in hours)
    result = allan_deviation(readings, "segment 2")
    assert result.adev is None and result.tau_s is None
    assert "evenly spaced" in result.note and "segment 2" in result.note


def test_clock_change_does_not_break_even_spacing() -> None:
    summer = timezone(timedelta(hours=2))
    utc = [datetime(2027, 3, 26, 7, tzinfo=UTC) + timedelta(days=i) for i in range(6)]
    readings = tuple(Reading(t.astimezone(TZ if i < 2 else summer), 0.1 * i)
                     for i, t in enumerate(utc))
    assert allan_deviation(readings).adev is not None


# ----------------------------------------------------------------------------- Q from a decay

def _decay(q: float, a0_deg: float, period_small_s: float, cycles_of_q: float,
           points: int) -> list[DecayReading]:
    """Turning points of θ̈ + (ω₀/Q)θ̇ + ω₀² sin θ = 0 (DOMAIN §2 damping model), DOP853."""
    w0 = 2.0 * math.pi / period_small_s

    def rhs(_t: float, y: np.ndarray) -> list[float]:
        return [y[1], -(w0 / q) * y[1] - w0**2 * math.sin(y[0])]

    def turning(_t: float, y: np.ndarray) -> float:
        return float(y[1])
    turning.direction = -1  # type: ignore[attr-defined]
    sol = solve_ivp(rhs, (0.0, cycles_of_q * q / w0), [math.radians(a0_deg), 0.0],
                    method="DOP853", rtol=1e-12, atol=1e-14, events=turning)
    times = np.concatenate([[0.0], sol.t_events[0]])
    arcs = np.degrees(np.concatenate([[math.radians(a0_deg)], sol.y_events[0][:, 0]]))
    pick = np.linspace(0, times.size - 1, points).round().astype(int)
    return [DecayReading(float(times[i]), float(arcs[i])) for i in pick]


@pytest.mark.parametrize("q, a0, span", [  # the two long decays run in the full suite only
    (300.0, 120.0, 2.0), (150.0, 150.0, 2.0),
    pytest.param(2000.0, 90.0, 1.0, marks=pytest.mark.slow),
    pytest.param(4000.0, 1.6, 0.4, marks=pytest.mark.slow)])
def test_quality_factor_from_a_large_arc_decay(q: float, a0: float, span: float) -> None:
    decay = _decay(q, a0, 2.0, span, 25)
    fit = fit_quality_factor(decay, 2.0)
    # Averaging the energy loss over a cycle is exact up to terms of order 1/Q².
    assert fit.quality_factor == pytest.approx(q, rel=max(3.0 / q**2, 1e-6))
    assert fit.readings == 25


def test_small_arc_formula_would_be_wrong_at_large_arcs() -> None:
    # The point of the large-arc fit (DOMAIN §5): ln(arc) against time is biased at 120°.
    decay = _decay(300.0, 120.0, 2.0, 2.0, 25)
    t = np.array([d.elapsed_s for d in decay])
    slope = np.polyfit(t, np.log(np.radians([d.semi_arc_deg for d in decay])), 1)[0]
    small_arc_q = -math.pi / (2.0 * slope)
    assert abs(small_arc_q / 300.0 - 1.0) > 0.03
    assert fit_quality_factor(decay, 2.0).quality_factor == pytest.approx(300.0, rel=2e-5)


def test_quality_factor_uncertainty_covers_the_truth_with_noisy_readings() -> None:
    rng = np.random.default_rng(2)
    clean = _decay(500.0, 100.0, 1.5, 2.0, 30)
    noisy = [DecayReading(d.elapsed_s, d.semi_arc_deg * (1 + rng.normal(0, 0.002)))
             for d in clean]
    fit = fit_quality_factor(noisy, 1.5)
    assert fit.sigma is not None and 0 < fit.sigma < 0.02 * 500.0
    assert abs(fit.quality_factor - 500.0) < 3 * fit.sigma


def test_large_arc_log_tends_to_the_logarithm_and_its_identity_holds() -> None:
    # E(m) − (1 − m)K(m) = (πm/4)·₂F₁(½, ½; 2; m): checked with mpmath at 30 digits.
    import mpmath as mp
    from scipy.special import hyp2f1
    mp.mp.dps = 30
    for m in (1e-6, 0.1, 0.5, 0.9, 0.999):
        exact = mp.ellipe(m) - (1 - m) * mp.ellipk(m)
        assert math.pi * m / 4 * hyp2f1(0.5, 0.5, 2.0, m) == pytest.approx(float(exact),
                                                                           rel=1e-13)
    small = np.array([1e-4, 1e-3])
    np.testing.assert_allclose(large_arc_log(small), np.log(small), rtol=0, atol=1e-6)


def test_quality_factor_refusals() -> None:
    with pytest.raises(DesignError) as info:
        fit_quality_factor([DecayReading(0.0, 2.0), DecayReading(10.0, 1.9)], 2.0)
    assert info.value.field == "rating_log.decay"
    rising = [DecayReading(float(t), 1.0 + 0.1 * t) for t in range(4)]
    with pytest.raises(DesignError, match="does not fall"):
        fit_quality_factor(rising, 2.0)
    with pytest.raises(DesignError):
        fit_quality_factor([DecayReading(float(t), 2.0 - 0.1 * t) for t in range(4)], -1.0)
