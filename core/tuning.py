"""What to turn and by how much: rate sensitivities, the trim weight and the rate budget.

Mass moves use analytic derivatives of I and A (a part of mass m, volume V and added-mass
coefficient C lowered by dz changes I by 2(m + CρV) z dz and A by g (m − ρV) dz); the exact
period's own slopes come from :mod:`core.period`. Changes of the surroundings (temperature,
pressure, arc, elevation) re-evaluate the whole model with centred differences, so every
length, the air and the gravity model move together.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .constants import SECONDS_PER_DAY
from .design import Bob, ClampMount, Design
from .errors import DesignError
from .mass_properties import Body
from .model import PendulumState, gravity_at, pendulum_state

__all__ = ["Sensitivities", "BudgetLine", "RateBudget", "sensitivities", "trim_effect",
           "rate_budget", "null_height_m"]

_TEMPERATURE_STEP_K = 0.5
_PRESSURE_STEP_HPA = 1.0
_ARC_STEP_DEG = 0.1
_ELEVATION_STEP_M = 100.0


@dataclass(frozen=True)
class Sensitivities:
    """Rate changes in s/day per unit (None where the design has no such thing).

    Attributes
    ----------
    bob_s_per_day_per_mm : main bob lowered 1 mm (negative: the clock loses).
    rating_nut_s_per_day_per_turn : one turn of the rating nut *raising* the bob (positive).
    trim_s_per_day_per_g : 1 g added at ``trim_height_m``.
    trim_height_m : height of the trim tray, m below the pivot.
    null_height_m : where a small added mass changes nothing, m (the centre of oscillation
        I/(M h) in vacuum without a spring; air and a spring move it).
    temperature_s_per_day_per_k : d(rate)/dT of the whole model, centred ±0.5 K.
    pressure_s_per_day_per_hpa : d(rate)/dp, centred ±1 hPa (forward from vacuum).
    arc_s_per_day_per_0_1_deg : rate change for 0.1° more semi-arc, centred step.
    elevation_s_per_day_per_100_m : rate change for the site 100 m higher, centred (None with a
        g override).
    stiffness_s_per_day_per_n_m_per_rad : d(rate)/dk.
    """

    bob_s_per_day_per_mm: float | None
    rating_nut_s_per_day_per_turn: float | None
    trim_s_per_day_per_g: float
    trim_height_m: float
    null_height_m: float
    temperature_s_per_day_per_k: float
    pressure_s_per_day_per_hpa: float
    arc_s_per_day_per_0_1_deg: float
    elevation_s_per_day_per_100_m: float | None
    stiffness_s_per_day_per_n_m_per_rad: float


def _move_rate(state: PendulumState, bodies: list[Body], dz_m: float) -> float:
    """Rate change, s/day, when ``bodies`` are all lowered by ``dz_m`` (first order)."""
    rho, g = state.air_density_kg_m3, state.g_m_s2
    d_inertia = sum(2.0 * (b.mass_kg + b.added_mass_coefficient * rho * b.volume_m3)
                    * b.centre_m for b in bodies) * dz_m
    d_torque = g * sum(b.mass_kg - rho * b.volume_m3 for b in bodies) * dz_m
    return state.rate_change(d_inertia, d_torque)


def trim_effect(state: PendulumState, height_m: float, mass_kg: float = 1e-3) -> float:
    """Rate change, s/day, of a small point mass added at ``height_m`` below the pivot."""
    return state.rate_change(mass_kg * height_m**2, state.g_m_s2 * mass_kg * height_m)


def null_height_m(state: PendulumState) -> float:
    """Height below the pivot where a small added mass leaves the period unchanged, m.

    With no spring and no air this is L_eq = I/(M h), the centre of oscillation.
    """
    return -2.0 * state.inertia_kg_m2 * state.g_m_s2 * state.period_slope_torque / state.period_s


def _nut_bodies(design: Design, state: PendulumState) -> list[Body]:
    """The bodies a rating nut under the main bob carries: a sleeve and its bob, or the bob."""
    main = state.main_bob()
    if main is None:
        return []
    bob = design.part(main.name)
    assert isinstance(bob, Bob)
    by_name = {b.name: b for b in state.bodies}
    if isinstance(bob.mount, ClampMount):
        return [main]
    return [by_name[bob.mount.on], main]


def _period_with(design: Design, condition: str, value: float) -> float:
    """Exact period, s, with one site condition (``temperature_c``, ``pressure_hpa``,
    ``elevation_m`` or ``amplitude_deg``) set to ``value``."""
    if condition == "temperature_c":
        return pendulum_state(design, slopes=False, temperature_c=value).period_s
    if condition == "pressure_hpa":
        return pendulum_state(design, slopes=False, pressure_hpa=value).period_s
    if condition == "elevation_m":
        return pendulum_state(design, slopes=False, elevation_m=value).period_s
    if condition == "amplitude_deg":
        return pendulum_state(design, slopes=False, amplitude_deg=value).period_s
    raise ValueError(f"{condition!r} is not a site condition")


def _centred(design: Design, state: PendulumState, key: str, value: float, step: float,
             lowest: float | None = None) -> float:
    """(rate(value + step/2) − rate(value − step/2)) of the full model, s/day per ``step``."""
    lo, hi = value - step / 2, value + step / 2
    if lowest is not None and lo < lowest:
        lo, hi = lowest, lowest + step
    # Against the state's own period when there is no target: a clock's change of rate.
    target = state.target_period_s or state.period_s
    try:
        lo_t, hi_t = _period_with(design, key, lo), _period_with(design, key, hi)
    except DesignError:
        # One end would not hang (air just dense enough to float a part): a one-sided
        # difference from the site's own value, scaled to the step.
        ends = []
        for end in (lo, hi):
            try:
                ends.append((end, _period_with(design, key, end)))
            except DesignError:
                ends.append((value, state.period_s))
        (lo, lo_t), (hi, hi_t) = ends
        if hi == lo:
            raise
        return SECONDS_PER_DAY * (target / hi_t - target / lo_t) * step / (hi - lo)
    return SECONDS_PER_DAY * (target / hi_t - target / lo_t)


def sensitivities(design: Design, state: PendulumState, trim_height_m: float | None = None
                  ) -> Sensitivities:
    """All rate sensitivities of ``design`` at ``state`` (its site conditions)."""
    main = state.main_bob()
    bob = None if main is None else _move_rate(state, [main], 1e-3)
    pitch = design.rating_nut.pitch_m
    nut_bodies = _nut_bodies(design, state)
    nut = None if (pitch is None or not nut_bodies) else _move_rate(state, nut_bodies, -pitch)
    null_z = null_height_m(state)
    trim_z = trim_height_m if trim_height_m is not None else _default_trim_height(state, null_z)
    amp = design.swing.amplitude_deg
    elevation = None
    if design.site.g_m_s2 is None:
        elevation = _centred(design, state, "elevation_m", design.site.elevation_m,
                             _ELEVATION_STEP_M)
    return Sensitivities(
        bob_s_per_day_per_mm=bob,
        rating_nut_s_per_day_per_turn=nut,
        trim_s_per_day_per_g=trim_effect(state, trim_z),
        trim_height_m=trim_z,
        null_height_m=null_z,
        temperature_s_per_day_per_k=_centred(design, state, "temperature_c",
                                             state.temperature_c, _TEMPERATURE_STEP_K)
        / _TEMPERATURE_STEP_K,
        pressure_s_per_day_per_hpa=_centred(design, state, "pressure_hpa", state.pressure_hpa,
                                            _PRESSURE_STEP_HPA, lowest=0.0) / _PRESSURE_STEP_HPA,
        arc_s_per_day_per_0_1_deg=_centred(design, state, "amplitude_deg", amp, _ARC_STEP_DEG,
                                           lowest=1e-6),
        elevation_s_per_day_per_100_m=elevation,
        stiffness_s_per_day_per_n_m_per_rad=state.rate_change(0.0, 0.0, 1.0),
    )


def _default_trim_height(state: PendulumState, null_z: float) -> float:
    """The first trim weight's height, else half the centre of oscillation, m."""
    for b in state.bodies:
        if b.kind == "weight":
            return b.centre_m
    return 0.5 * null_z


@dataclass(frozen=True)
class BudgetLine:
    """One cause in the rate budget: its range and the rates at both ends (s/day)."""

    cause: str
    unit: str
    low: float
    high: float
    rate_at_low_s_per_day: float
    rate_at_high_s_per_day: float

    @property
    def spread_s_per_day(self) -> float:
        """Rate at the high end minus rate at the low end, s/day."""
        return self.rate_at_high_s_per_day - self.rate_at_low_s_per_day


@dataclass(frozen=True)
class RateBudget:
    """Spread of rate from each cause, and the totals (worst case and root-sum-square)."""

    lines: tuple[BudgetLine, ...]
    notes: tuple[str, ...] = ()  # lines left out, and why

    @property
    def worst_case_s_per_day(self) -> float:
        return sum(abs(line.spread_s_per_day) for line in self.lines)

    @property
    def root_sum_square_s_per_day(self) -> float:
        return math.hypot(*(line.spread_s_per_day for line in self.lines))  # no overflow


@dataclass(frozen=True)
class BudgetRanges:
    """Half-widths of the ranges the site is expected to see around its nominal values."""

    temperature_k: float = 5.0
    pressure_hpa: float = 30.0
    arc_deg: float = 0.1


def budget_ranges(temperature_k: float = 5.0, pressure_hpa: float = 30.0, arc_deg: float = 0.1
                  ) -> BudgetRanges:
    """Validated budget half-ranges (K, hPa, degrees): finite and not negative.

    Raises
    ------
    DesignError
        Naming ``budget.temperature_k``, ``budget.pressure_hpa`` or ``budget.arc_deg``.
    """
    limits = {"temperature_k": (temperature_k, 100.0), "pressure_hpa": (pressure_hpa, 500.0),
              "arc_deg": (arc_deg, 90.0)}
    for name, (value, top) in limits.items():
        if isinstance(value, bool) or not isinstance(value, (int, float)) or not (
                0.0 <= value <= top):
            raise DesignError(f"budget.{name}", f"{name}={value!r} is out of range: it must "
                                                f"be in [0, {top:g}]")
    return BudgetRanges(float(temperature_k), float(pressure_hpa), float(arc_deg))


def rate_budget(design: Design, state: PendulumState,
                ranges: BudgetRanges = BudgetRanges()) -> RateBudget:
    """Rate at each end of each range, the other conditions held at the site's values.

    An end of a range at which the design would not hang (air dense enough to float a part,
    …) cannot be rated. With the default ranges that line is left out and a note says why
    (a design valid at its site is never refused for its budget); with ranges the caller chose
    the request is refused, naming the range.

    Raises
    ------
    DesignError
        ``budget.temperature_k``, ``budget.pressure_hpa`` or ``budget.arc_deg``: "at 1043 hPa
        (…) the design would …".
    """
    target = state.target_period_s or state.period_s
    site = design.site
    amp = design.swing.amplitude_deg
    defaults = ranges == BudgetRanges()
    notes: list[str] = []

    def line(cause: str, unit: str, key: str, name: str, low: float, high: float
             ) -> BudgetLine | None:
        rates = []
        for value in (low, high):
            try:
                period = _period_with(design, key, value)
            except DesignError as exc:
                where = (f"at {value:g} {unit} (the {cause.lower()} range {low:g} to {high:g} "
                         f"{unit}) the design would not hang as it does at its site: "
                         f"{exc.reason}")
                if not defaults:
                    raise DesignError(f"budget.{name}", where + "; narrow the range") from None
                notes.append(f"Rate budget: {cause.lower()} left out — {where}.")
                return None
            rates.append(SECONDS_PER_DAY * (target / period - 1.0))
        return BudgetLine(cause, unit, low, high, rates[0], rates[1])

    t, p = site.temperature_c, site.pressure_hpa
    lines = [
        line("Temperature", "°C", "temperature_c", "temperature_k", t - ranges.temperature_k,
             t + ranges.temperature_k),
        line("Air pressure", "hPa", "pressure_hpa", "pressure_hpa",
             max(0.0, p - ranges.pressure_hpa), p + ranges.pressure_hpa),
        line("Semi-arc", "°", "amplitude_deg", "arc_deg", max(1e-6, amp - ranges.arc_deg),
             min(179.9, amp + ranges.arc_deg)),
    ]
    return RateBudget(tuple(x for x in lines if x is not None), tuple(notes))


__all__ += ["BudgetRanges", "budget_ranges", "gravity_at"]
