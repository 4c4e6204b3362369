"""``analyse``: one validated design in, one immutable result out.

The result carries every figure of the readout under the names of the report's JSON keys
(DESIGN §4), the curves the window draws, the rate budget, warnings and safety cautions.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, fields
from typing import Any

import numpy as np
from numpy.typing import NDArray

from .blades import SPRING_STRESS_CAUTION, BladeStresses, blade_clamp_stresses
from .cable import CableFigures, cable_figures
from .constants import SECONDS_PER_DAY
from .design import Design, beats_per_hour
from .errors import DesignError, guarded
from .exhibit import ExhibitFigures, exhibit_figures
from .exhibit_geometry import HEADROOM_M, SweptGeometry, swept_geometry
from .fileformat import design_from_dict, design_to_dict
from .mass_properties import Body, rods_in_series
from .model import PendulumState, pendulum_state
from .motion import Motion, motion
from .period import period_exact
from .phase import PhasePortrait, phase_portrait
from .pivot import PivotFigures, pivot_figures
from .tuning import BudgetRanges, RateBudget, Sensitivities, rate_budget, sensitivities

__all__ = ["Result", "PeriodCurve", "analyse", "REPORT_KEYS", "LOAD_CAUTION", "SPRING_CAUTION",
           "AIRY_CAUTION", "HEAVY_LOAD_N", "LOAD_CAUTION_MASS_KG", "LONG_PENDULUM_M",
           "STRESS_WARNING_RATIO", "finite_or_none"]

FloatArray = NDArray[np.float64]

REPORT_KEYS = (
    "mass_kg", "centre_of_mass_m", "inertia_pivot_kg_m2", "equivalent_length_m",
    "centre_of_oscillation_m", "g_m_s2", "period_small_s", "period_s", "beats_per_hour",
    "circular_error_s_per_day", "rate_s_per_day", "temperature_coefficient_s_per_day_per_k",
    "pressure_coefficient_s_per_day_per_hpa", "bob_sensitivity_s_per_day_per_mm",
    "peak_speed_m_s", "max_pivot_load_n", "warnings",
)

LOAD_CAUTION = (
    "Loads shown are ideal dynamic loads with no safety factor. The fixing, cable and structure "
    "must be designed and checked by a qualified engineer under local building codes.")
SPRING_CAUTION = (
    "Suspension-spring and knife-edge stresses are outside what Penduline checks or certifies.")
AIRY_CAUTION = (
    "A swing started with the least sideways motion becomes elliptical and its plane turns by "
    "itself (Airy 1851), adding to or hiding the Foucault turn: release it from rest, by "
    "burning a thread or an electromagnet.")

# Where the cautions apply. Thresholds: common practice, no source.
LOAD_CAUTION_MASS_KG = 10.0   # a pendulum this heavy: the engineer caution on loads
HEAVY_LOAD_N = 200.0          # weight above which people must keep out of the swept area
LONG_PENDULUM_M = 3.0         # reaching this far below the pivot: longer than any case clock
STRESS_WARNING_RATIO = 0.2    # peak stress above 1/5 of the strength (a safety factor under 5)

# Dense where clocks swing (0.05°–10°, geometric), even to 170°, dense again towards 180°.
_CURVE_AMPLITUDES_DEG = np.concatenate([np.geomspace(0.05, 10.0, 160),
                                        np.linspace(11.0, 170.0, 180),
                                        np.linspace(170.5, 179.9, 60)])


@dataclass(frozen=True)
class PeriodCurve:
    """Exact period (s), circular error (s/day) and rate against the target (s/day; None
    without a target) against semi-arc (degrees)."""

    amplitude_deg: FloatArray
    period_s: FloatArray
    circular_error_s_per_day: FloatArray
    rate_s_per_day: FloatArray | None = None


@dataclass(frozen=True)
class Result:
    """Everything Penduline shows about one design. SI units; per-day figures in s/day."""

    design: Design
    # DESIGN §4 figures
    mass_kg: float
    centre_of_mass_m: float
    inertia_pivot_kg_m2: float
    equivalent_length_m: float
    centre_of_oscillation_m: float
    g_m_s2: float
    period_small_s: float
    period_s: float
    beats_per_hour: float
    circular_error_s_per_day: float
    rate_s_per_day: float | None
    temperature_coefficient_s_per_day_per_k: float
    pressure_coefficient_s_per_day_per_hpa: float
    bob_sensitivity_s_per_day_per_mm: float | None
    peak_speed_m_s: float | None
    max_pivot_load_n: float
    warnings: tuple[str, ...]
    # further figures
    target_period_s: float | None
    amplitude_deg: float
    air_density_kg_m3: float
    effective_inertia_kg_m2: float
    torque_n_m: float
    cautions: tuple[str, ...]
    sensitivities: Sensitivities
    budget: RateBudget
    exhibit: ExhibitFigures
    bodies: tuple[Body, ...]
    motion: Motion
    phase: PhasePortrait
    period_curve: PeriodCurve
    # exhibit planning (issue 13) and the pivot (issue 17)
    purpose: str = "clock"
    geometry: SweptGeometry | None = None
    cable: CableFigures | None = None
    pivot: PivotFigures | None = None
    # the suspension (issue 14)
    suspension_stiffness_n_m_per_rad: float = 0.0
    blade_stresses: BladeStresses | None = None

    def report_dict(self) -> dict[str, Any]:
        """The JSON form of ``penduline report --json``: DESIGN §4 keys first, then the rest."""
        out: dict[str, Any] = {key: getattr(self, key) for key in REPORT_KEYS}
        s, e = self.sensitivities, self.exhibit
        out.update({
            "name": self.design.name,
            "target_period_s": self.target_period_s,
            "amplitude_deg": self.amplitude_deg,
            "air_density_kg_m3": self.air_density_kg_m3,
            "rating_nut_s_per_day_per_turn": s.rating_nut_s_per_day_per_turn,
            "trim_height_m": s.trim_height_m,
            "trim_null_height_m": s.null_height_m,
            "trim_s_per_day_per_g": s.trim_s_per_day_per_g,
            "arc_s_per_day_per_0_1_deg": s.arc_s_per_day_per_0_1_deg,
            "elevation_s_per_day_per_100_m": s.elevation_s_per_day_per_100_m,
            "stiffness_s_per_day_per_n_m_per_rad": s.stiffness_s_per_day_per_n_m_per_rad,
            "rate_budget": [
                {"cause": line.cause, "unit": line.unit, "low": line.low, "high": line.high,
                 "rate_at_low_s_per_day": line.rate_at_low_s_per_day,
                 "rate_at_high_s_per_day": line.rate_at_high_s_per_day,
                 "spread_s_per_day": line.spread_s_per_day} for line in self.budget.lines],
            "rate_budget_worst_case_s_per_day": self.budget.worst_case_s_per_day,
            "rate_budget_rss_s_per_day": self.budget.root_sum_square_s_per_day,
            "cautions": list(self.cautions),
        })
        out.update({f.name: getattr(e, f.name) for f in fields(e) if f.name not in out})
        out.update(self._exhibit_keys())
        return finite_or_none(out)

    def _exhibit_keys(self) -> dict[str, Any]:
        """Report keys of the exhibit planning and the pivot (null where not defined)."""
        e, g, c, p = self.exhibit, self.geometry, self.cable, self.pivot
        half = e.time_to_half_amplitude_s
        out: dict[str, Any] = {
            "purpose": self.purpose,
            "foucault_deg_per_hour": e.foucault_deg_per_hour,
            "foucault_hours_per_turn": e.foucault_turn_h,
            "time_to_half_amplitude_h": None if half is None else half / 3600.0,
        }
        if g is not None:
            out.update({"bob_rise_m": g.bob_rise_m, "lowest_point_m": g.lowest_point_m,
                        "outer_sweep_m": g.outer_sweep_m,
                        "floor_clearance_m": g.floor_clearance_m,
                        "barrier_margin_m": g.barrier_margin_m,
                        "reach_below_headroom_m": g.reach_below_headroom_m,
                        "visitors_within_reach": g.within_reach})
        if c is not None:
            out.update({"stretch_m": c.stretch_m,
                        "stretch_rate_s_per_day": c.stretch_rate_s_per_day,
                        "peak_stress_pa": c.peak_stress_pa,
                        "peak_stress_part": c.peak_stress_part,
                        "peak_stress_ratio": c.peak_stress_ratio,
                        "peak_stress_ratio_basis": c.peak_stress_ratio_basis})
        if p is not None:
            out.update({"radius_of_gyration_m": p.radius_of_gyration_m,
                        "shortest_period_pivot_m": p.shortest_period_pivot_m,
                        "shortest_period_small_s": p.shortest_period_small_s,
                        "conjugate_pivot_m": p.conjugate_pivot_m,
                        "pivot_sensitivity_s_per_day_per_mm":
                            p.pivot_sensitivity_s_per_day_per_mm})
        return out


def finite_or_none(value: Any) -> Any:
    """``value`` made fit to leave the core: every float that is not finite (NaN, ±inf)
    becomes None, everywhere — in dicts, lists, tuples (which become lists), numpy arrays and
    numpy scalars (which become Python numbers). Use it on anything exported (JSON, CSV)."""
    if isinstance(value, dict):
        return {k: finite_or_none(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [finite_or_none(v) for v in value]
    if isinstance(value, np.ndarray):
        return [finite_or_none(v) for v in value.tolist()]
    if isinstance(value, np.generic):
        value = value.item()
    if isinstance(value, float) and not math.isfinite(value):
        return None
    return value


def _validated(design: Design | dict[str, Any]) -> Design:
    """Check any design object (or a parsed file dict) through the one validator."""
    if isinstance(design, Design):
        try:
            text = design_to_dict(design)
        except (AttributeError, TypeError, KeyError) as exc:  # a Design built by hand, badly
            raise DesignError("design", f"is not a complete design ({type(exc).__name__})"
                              ) from None
        return design_from_dict(text)
    if isinstance(design, dict):
        return design_from_dict(design)
    raise TypeError(f"analyse needs a Design or a parsed design file (a dict), not "
                    f"{type(design).__name__}")


def _warnings(design: Design, state: PendulumState) -> tuple[str, ...]:
    out = []
    amp = design.swing.amplitude_deg
    if amp > 90.0:
        out.append(f"Semi-arc {amp:g}° is above 90°: a cable or chain would go slack at release; "
                   "only a rigid rod can swing this far.")
    # The period grows without bound only where the potential A(1 − cos θ) + kθ²/2 has a
    # maximum at or below 180°: V′ = A sin θ + kθ > 0 on (0°, 180°] for any k > 0, so only
    # without a spring (the maximum at 180°).
    if amp >= 150.0 and state.stiffness_n_m_per_rad <= 0.0:
        out.append(f"Semi-arc {amp:g}° is near 180°: the period grows without bound there and "
                   "the smallest change of arc changes it greatly.")
    # A bob hung at the end of a cable is ordinary: no warning (the validator refuses a bob
    # whose body does not reach its rod).
    for lower, upper in rods_in_series(design):
        out.append(f"Rod '{lower}' starts on rod '{upper}' at a fixed top, which does not "
                   f"follow rod '{upper}' as it grows with temperature: the temperature "
                   f"figures leave that growth out. Hang it from the rod's end (hangs_from).")
    if design.suspension.kind == "spring" and amp > 10.0:
        out.append(f"A suspension spring at {amp:g}° semi-arc bends far beyond its linear range; "
                   "the constant-stiffness model is optimistic there.")
    if state.main_bob() is None:
        out.append("The design has no bob: peak speed is not defined.")
    if state.mass.first_moment_kg_m > 0 and state.air_density_kg_m3 > 0:
        buoyancy = state.mass.displaced_first_moment_kg_m / state.mass.first_moment_kg_m
        if buoyancy > 0.01:
            out.append(f"Air buoys the pendulum by {100 * buoyancy:.2g} % of its weight torque: "
                       "the added-mass model is an approximation at this level.")
    return tuple(out)


def _purpose(design: Design) -> str:
    return design.purpose


def _room(design: Design) -> tuple[float | None, float | None]:
    """(pivot height above the floor, barrier radius), m, from the design's exhibit section."""
    if design.exhibit is None:
        return None, None
    return design.exhibit.pivot_above_floor_m, design.exhibit.barrier_radius_m


def _exhibit_warnings(design: Design, geometry: SweptGeometry, cable: CableFigures
                      ) -> tuple[str, ...]:
    out = []
    floor, barrier = _room(design)
    if geometry.floor_clearance_m is not None and geometry.floor_clearance_m <= 0.0:
        out.append(f"The swing reaches the floor: its lowest point is "
                   f"{-geometry.floor_clearance_m:.3g} m below it.")
    if geometry.barrier_margin_m is not None and geometry.barrier_margin_m < 0.0:
        out.append(f"The pendulum swings {-geometry.barrier_margin_m:.3g} m beyond the barrier.")
    if geometry.within_reach:
        where = ("" if barrier is None else
                 f" at {geometry.reach_below_headroom_m:.3g} m from the centre, outside the "
                 f"barrier ({barrier:.3g} m)")
        out.append(f"Visitors can be hit: the pendulum passes less than {HEADROOM_M:g} m above "
                   f"the floor{where}"
                   + (" and there is no barrier" if barrier is None else "")
                   + f". Keep people out of its swept area ({HEADROOM_M:g} m: common practice, "
                   "above the 2.03 m minimum head clearance of the 2010 ADA Standards §307.4).")
    ratio = cable.peak_stress_ratio
    if ratio is not None and ratio >= STRESS_WARNING_RATIO:
        out.append(f"Peak stress in '{cable.peak_stress_part}' is {100 * ratio:.3g} % of its "
                   f"{cable.peak_stress_ratio_basis} strength: less than a safety factor of "
                   f"{1 / STRESS_WARNING_RATIO:g}.")
    return tuple(out)


def _cautions(design: Design, exhibit: ExhibitFigures, geometry: SweptGeometry,
              mass_kg: float) -> tuple[str, ...]:
    """Each caution where it applies (thresholds: common practice, no source)."""
    exhibit_use = _purpose(design) == "exhibit"
    long = geometry.lowest_point_m >= LONG_PENDULUM_M
    out = []
    if exhibit_use or long or mass_kg >= LOAD_CAUTION_MASS_KG:
        out.append(LOAD_CAUTION)
    if design.suspension.kind == "spring":
        out.append(SPRING_CAUTION)
    if design.suspension.blades is not None:
        out.append(SPRING_STRESS_CAUTION)
    if exhibit.static_load_n > HEAVY_LOAD_N:
        out.append(f"Heavy pendulum ({mass_kg:.4g} kg): keep people out from under it and out "
                   "of its swept area while it is hung, tested or stopped and while it runs; "
                   "a barrier around the swept area keeps visitors out.")
    if design.site.latitude_deg != 0.0 and (exhibit_use or long):
        out.append(AIRY_CAUTION)
    return tuple(out)


def period_curve(state: PendulumState) -> PeriodCurve:
    """Exact period, circular error and rate against semi-arc, 0.05°–179.9°."""
    amps = _CURVE_AMPLITUDES_DEG
    periods = period_exact(state.inertia_kg_m2, state.torque_n_m, state.stiffness_n_m_per_rad,
                           np.radians(amps))
    target = state.target_period_s
    rate = None if target is None else SECONDS_PER_DAY * (target / periods - 1.0)
    return PeriodCurve(amps, periods, SECONDS_PER_DAY * (1.0 - state.period_small_s / periods),
                       rate)


@guarded("design")
def analyse(design: Design | dict[str, Any], *, trim_height_m: float | None = None,
            budget_ranges: BudgetRanges = BudgetRanges()) -> Result:
    """Analyse a design: figures, sensitivities, budget, exhibit figures and curves.

    Parameters
    ----------
    design : Design or dict
        The design (validated again here), or a parsed design file.
    trim_height_m : float, optional
        Height below the pivot at which to quote the trim-weight sensitivity, m (default: the
        first trim weight, else half the centre of oscillation).
    budget_ranges : BudgetRanges
        Half-widths of the temperature, pressure and arc ranges of the rate budget.

    Raises
    ------
    DesignError
        Whatever is wrong with the design, naming the field. Nothing else escapes.
    """
    if trim_height_m is not None:
        from .fileformat import check_number
        check_number("trim_height_m", trim_height_m)
    return _analyse(_validated(design), trim_height_m, budget_ranges)


def _analyse(design: Design, trim_height_m: float | None, ranges: BudgetRanges) -> Result:
    state = pendulum_state(design)
    sens = sensitivities(design, state, trim_height_m)
    budget = rate_budget(design, state, ranges)
    exhibit = exhibit_figures(state)
    mass = state.mass
    floor, barrier = _room(design)
    geometry = swept_geometry(state.bodies, state.amplitude_rad, state.main_bob(),
                              pivot_above_floor_m=floor, barrier_radius_m=barrier)
    cable = cable_figures(design, state, exhibit.peak_angular_velocity_rad_s)
    return Result(
        design=design,
        mass_kg=mass.mass_kg,
        centre_of_mass_m=mass.centre_of_mass_m,
        inertia_pivot_kg_m2=mass.inertia_pivot_kg_m2,
        equivalent_length_m=mass.equivalent_length_m,
        centre_of_oscillation_m=mass.equivalent_length_m,
        g_m_s2=state.g_m_s2,
        period_small_s=state.period_small_s,
        period_s=state.period_s,
        beats_per_hour=beats_per_hour(state.period_s),
        circular_error_s_per_day=SECONDS_PER_DAY * (1.0 - state.period_small_s / state.period_s),
        rate_s_per_day=state.rate_s_per_day,
        temperature_coefficient_s_per_day_per_k=sens.temperature_s_per_day_per_k,
        pressure_coefficient_s_per_day_per_hpa=sens.pressure_s_per_day_per_hpa,
        bob_sensitivity_s_per_day_per_mm=sens.bob_s_per_day_per_mm,
        peak_speed_m_s=exhibit.peak_speed_m_s,
        max_pivot_load_n=exhibit.max_pivot_load_n,
        warnings=(_warnings(design, state) + _exhibit_warnings(design, geometry, cable)
                  + budget.notes),
        target_period_s=state.target_period_s,
        amplitude_deg=design.swing.amplitude_deg,
        air_density_kg_m3=state.air_density_kg_m3,
        effective_inertia_kg_m2=state.inertia_kg_m2,
        torque_n_m=state.torque_n_m,
        cautions=_cautions(design, exhibit, geometry, mass.mass_kg),
        sensitivities=sens,
        budget=budget,
        exhibit=exhibit,
        bodies=state.bodies,
        motion=motion(state.inertia_kg_m2, state.torque_n_m, state.stiffness_n_m_per_rad,
                      state.amplitude_rad, state.period_s, state.period_small_s,
                      design.swing.quality_factor),
        phase=phase_portrait(state.inertia_kg_m2, state.torque_n_m, state.stiffness_n_m_per_rad,
                             state.amplitude_rad),
        period_curve=period_curve(state),
        purpose=_purpose(design),
        geometry=geometry,
        cable=cable,
        pivot=pivot_figures(state),
        suspension_stiffness_n_m_per_rad=state.stiffness_n_m_per_rad,
        blade_stresses=_blade_stresses(design, state),
    )


def _blade_stresses(design: Design, state: PendulumState) -> BladeStresses | None:
    """Clamp stresses of a spring given by its blades, under the pendulum's static weight at
    the working semi-arc (ideal elastic figures, Pa); None otherwise."""
    b = design.suspension.blades
    if b is None:
        return None
    return blade_clamp_stresses(b.count, design.material(b.material).youngs_modulus_pa,
                                b.width_m, b.thickness_m, b.free_length_m,
                                state.mass.mass_kg * state.g_m_s2, design.swing.amplitude_deg)
