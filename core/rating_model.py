"""The model beside the clock: its rate at the log's conditions, the correction, and moving one
field so the model agrees with the measured rate.

Everything here works on designs through the public API: a modified design is made with
:func:`core.fileformat.with_value` (so it passes the validator) and evaluated with
:func:`core.analyse` or :func:`core.model.pendulum_state`.

The correction for a measured rate r (s/day, positive: the clock gains) is −r divided by the
model's sensitivity: rating-nut turns (positive = the bob goes up), grams added at the trim
height, or mm the bob is lowered. :func:`apply_correction` makes the corrected design, so the
correction can be checked by analysing it again.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from .analysis import Result, analyse
from .constants import SECONDS_PER_DAY
from .design import Bob, ClampMount, Design, Rod, Weight
from .errors import DesignError, guarded
from .fileformat import design_from_dict, design_to_dict, field_range, get_value, with_value
from .model import gravity_at, pendulum_state
from .rating import Conditions

__all__ = ["ModelAtConditions", "Correction", "ClockFit", "reference_conditions",
           "model_at_conditions", "correction", "apply_correction", "default_fit_field",
           "fit_model_to_clock", "TRIM_LIMIT_FRACTION"]

#: A trim tray sensibly holds up to this fraction of the main bob's mass (common practice,
#: no source).
TRIM_LIMIT_FRACTION = 0.01
# A weight within this of the trim height is the trim weight (its height at the site's
# temperature differs from the file's by thermal expansion, microns).
_SAME_HEIGHT_M = 1e-4


@dataclass(frozen=True)
class ModelAtConditions:
    """The model's rate (s/day; None without a target) and coefficients (s/day per K, per hPa,
    per degree of semi-arc) at one set of conditions, with the full result there."""

    conditions: Conditions
    rate_s_per_day: float | None
    temperature_coefficient_s_per_day_per_k: float
    pressure_coefficient_s_per_day_per_hpa: float
    arc_coefficient_s_per_day_per_deg: float
    result: Result


@dataclass(frozen=True)
class Correction:
    """What to do about a measured rate (s/day), each alternative on its own.

    Attributes
    ----------
    rating_nut_turns : turns of the rating nut, positive = bob up (None without a nut).
    rating_nut_direction : the same in words.
    trim_g : grams to add at ``trim_height_m`` (negative: take off).
    trim_limit_g : what a trim tray sensibly holds (1 % of the bob's mass; common practice).
    bob_lowered_mm : mm to lower the main bob (negative: raise it); a bob resting on a sleeve
        goes down with its sleeve.
    warnings : sentences (trim beyond the tray, a trim height with almost no effect).
    """

    measured_rate_s_per_day: float
    rating_nut_turns: float | None
    rating_nut_direction: str
    trim_g: float | None
    trim_height_m: float
    trim_limit_g: float | None
    bob_lowered_mm: float | None
    warnings: tuple[str, ...]


@dataclass(frozen=True)
class ClockFit:
    """The design with one field moved so the model's rate equals the measured rate."""

    design: Design
    field: str
    old_value: float
    value: float
    rate_s_per_day: float


def reference_conditions(design: Design) -> Conditions:
    """The design's site temperature and pressure and its working semi-arc."""
    return Conditions(design.site.temperature_c, design.site.pressure_hpa,
                      design.swing.amplitude_deg)


def _at(design: Design, conditions: Conditions) -> Design:
    d = with_value(design, "site.temperature_c", float(conditions.temperature_c))
    d = with_value(d, "site.pressure_hpa", float(conditions.pressure_hpa))
    return with_value(d, "swing.amplitude_deg", float(conditions.semi_arc_deg))


@guarded("design")
def model_at_conditions(design: Design, temperature_c: float, pressure_hpa: float,
                        semi_arc_deg: float) -> ModelAtConditions:
    """The model's rate and coefficients at the given temperature (°C), pressure (hPa) and
    semi-arc (degrees). The arc coefficient is the centred 0.1° step, per degree."""
    cond = Conditions(temperature_c, pressure_hpa, semi_arc_deg)
    result = analyse(_at(design, cond))
    s = result.sensitivities
    return ModelAtConditions(cond, result.rate_s_per_day, s.temperature_s_per_day_per_k,
                             s.pressure_s_per_day_per_hpa, 10.0 * s.arc_s_per_day_per_0_1_deg,
                             result)


def _main_bob_mass(result: Result) -> float | None:
    bobs = [b for b in result.bodies if b.kind == "bob"]
    return max(b.mass_kg for b in bobs) if bobs else None


@guarded("design")
def correction(design: Design, result: Result, measured_rate: float) -> Correction:
    """The correction for a measured rate (s/day, at the conditions ``result`` was made for).

    Parameters
    ----------
    design : the design.
    result : ``analyse(design)`` (its sensitivities are used).
    measured_rate : the clock's measured rate, s/day (positive: it gains).
    """
    if isinstance(measured_rate, bool) or not isinstance(measured_rate, (int, float)) or \
            not math.isfinite(measured_rate):
        raise DesignError("measured_rate", "must be a finite number of s/day")
    s = result.sensitivities
    warnings: list[str] = []
    nut = None if s.rating_nut_s_per_day_per_turn in (None, 0.0) else \
        -measured_rate / s.rating_nut_s_per_day_per_turn  # type: ignore[operator]
    if nut is None:
        direction = "the design has no rating nut"
    elif nut == 0.0:
        direction = "leave the rating nut as it is"
    else:
        way = ("up (the bob rises, the clock gains)" if nut > 0
               else "down (the bob drops, the clock loses)")
        direction = f"turn the rating nut {abs(nut):.3g} turn(s) {way}"
    per_mm = _bob_per_mm(design, s)
    bob = None if not per_mm else -measured_rate / per_mm
    bob_mass = _main_bob_mass(result)
    limit = None if bob_mass is None else 1000.0 * TRIM_LIMIT_FRACTION * bob_mass
    trim = None
    if abs(s.trim_s_per_day_per_g) < 1e-3:
        warnings.append(f"A trim weight at {s.trim_height_m:.3g} m is too near the centre of "
                        f"oscillation ({s.null_height_m:.3g} m) to change the rate.")
    else:
        trim = -measured_rate / s.trim_s_per_day_per_g
        held = sum(p.mass_kg for p in design.parts if isinstance(p, Weight)
                   and abs(p.at_m - s.trim_height_m) < _SAME_HEIGHT_M) * 1000.0
        if trim < 0.0 and -trim > held:
            warnings.append(f"The trim correction takes off {-trim:.3g} g at "
                            f"{s.trim_height_m:.3g} m, but the weights there hold {held:.3g} g: "
                            "use the rating nut.")
        if limit is not None and abs(trim) > limit:
            warnings.append(f"The trim correction ({trim:.3g} g at {s.trim_height_m:.3g} m) is "
                            f"more than a trim tray sensibly holds (about {limit:.3g} g, 1 % of "
                            "the bob's mass, common practice): use the rating nut.")
    return Correction(float(measured_rate), nut, direction, trim, s.trim_height_m, limit, bob,
                      tuple(warnings))


def _bob_per_mm(design: Design, s: Any) -> float | None:
    """Rate change, s/day, for the bob lowered 1 mm: a clamped bob alone (the sensitivity); a
    bob resting on a sleeve can only go down with its sleeve, so that move, as
    :func:`apply_correction` writes it, is differenced (centred, ±0.5 mm)."""
    try:
        _i, bob = _main_bob(design)
    except DesignError:
        return None
    if isinstance(bob.mount, ClampMount):
        return s.bob_s_per_day_per_mm  # type: ignore[no-any-return]
    base = pendulum_state(design, slopes=False)
    target = design.target.target_period_s or base.period_s
    lo, hi = (pendulum_state(apply_correction(design, "bob", x), slopes=False).period_s
              for x in (-0.5, 0.5))
    return SECONDS_PER_DAY * (target / hi - target / lo)


def _main_bob(design: Design) -> tuple[int, Bob]:
    main = pendulum_state(design, slopes=False).main_bob()
    for i, part in enumerate(design.parts):
        if main is not None and isinstance(part, Bob) and part.name == main.name:
            return i, part
    raise DesignError("parts", "the design has no bob to move")


def _index(design: Design, name: str) -> int:
    return next(i for i, p in enumerate(design.parts) if p.name == name)


@guarded("correction")
def apply_correction(design: Design, what: str, amount: float,
                     trim_height_m: float | None = None) -> Design:
    """The design after an adjustment, as the rating log names them.

    Parameters
    ----------
    what : ``"nut"`` (turns, positive = up), ``"bob"`` (mm lowered) or ``"trim"`` (grams added
        at ``trim_height_m``; default the first trim weight's height).

    Notes
    -----
    A clamped bob moves its ``mount.centre_m``. A bob resting on a sleeve moves with the sleeve
    (nut or bob alike), written as the length of the rod the sleeve stands on (a rod whose mass
    is derived from its size gains or loses the fraction of a gram of that length, which the
    sensitivities leave out: 0.6 % of the change on the workshop regulator). A trim changes the
    mass of a weight at the trim height, or adds one.
    """
    i, bob = _main_bob(design)
    if what in ("nut", "bob"):
        if what == "nut":
            pitch = design.rating_nut.pitch_m
            if pitch is None:
                raise DesignError("rating_nut.pitch_m", "the design has no rating nut")
            down_m = -amount * pitch
        else:
            down_m = amount / 1000.0
        if isinstance(bob.mount, ClampMount):
            return with_value(design, f"parts[{i}].mount.centre_m", bob.mount.centre_m + down_m)
        rod = design.part(design.part(bob.mount.on).on)  # type: ignore[union-attr]
        assert isinstance(rod, Rod)
        return with_value(design, f"parts[{_index(design, rod.name)}].length_m",
                          rod.length_m + down_m)
    if what == "trim":
        return _add_trim(design, amount, trim_height_m)
    raise DesignError("correction", f"{what!r} is not nut, bob or trim")


def _add_trim(design: Design, grams: float, height_m: float | None) -> Design:
    weights = [(k, p) for k, p in enumerate(design.parts) if isinstance(p, Weight)]
    if height_m is None:
        if not weights:
            raise DesignError("trim_height_m", "give the trim height: the design has no weight")
        height_m = weights[0][1].at_m
    for k, w in weights:
        if abs(w.at_m - height_m) < _SAME_HEIGHT_M:
            new = w.mass_kg + grams / 1000.0
            if new <= 0.0:
                raise DesignError(f"parts[{k}].mass_kg", f"taking off {-grams:.3g} g leaves "
                                                         f"nothing of the {w.mass_kg * 1000:.3g} g "
                                                         "weight")
            return with_value(design, f"parts[{k}].mass_kg", new)
    if grams <= 0.0:
        raise DesignError("trim_height_m", "there is no weight at that height to take off")
    rods = [p for p in design.parts if isinstance(p, Rod)
            and p.top_m <= height_m <= p.top_m + p.length_m]
    if not rods:
        raise DesignError("trim_height_m", f"no rod passes {height_m:g} m to carry a weight")
    raw: dict[str, Any] = design_to_dict(design)
    raw["parts"].append({"kind": "weight", "name": "trim correction", "mass_kg": grams / 1000.0,
                         "at_m": height_m, "on": rods[0].name})
    return design_from_dict(raw)


def default_fit_field(design: Design) -> str:
    """The bob's position: a clamp's ``mount.centre_m``, or for a bob on a sleeve the length of
    the rod the sleeve stands on (what the rating nut changes)."""
    i, bob = _main_bob(design)
    if isinstance(bob.mount, ClampMount):
        return f"parts[{i}].mount.centre_m"
    sleeve = design.part(bob.mount.on)
    return f"parts[{_index(design, sleeve.on)}].length_m"  # type: ignore[union-attr]


@guarded("field")
def fit_model_to_clock(design: Design, field_path: str | None, measured_rate: float,
                       conditions: Conditions) -> ClockFit:
    """Move one numeric field so the model's rate at ``conditions`` equals ``measured_rate``.

    Parameters
    ----------
    field_path : e.g. ``parts[2].mount.centre_m`` or ``site.g_m_s2`` (None: the bob's position,
        :func:`default_fit_field`). A null ``site.g_m_s2`` starts from normal gravity.
    measured_rate : s/day, at ``conditions``.

    Raises
    ------
    DesignError
        On the field when it is not numeric, or no value in its range gives the rate.
    """
    from scipy.optimize import brentq
    if design.target.target_period_s is None:
        raise DesignError("target", "the design needs a target: the rate is measured against it")
    path = field_path or default_fit_field(design)
    value = get_value(design_to_dict(design), path)
    if value is None and path == "site.g_m_s2":
        value = gravity_at(design)
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise DesignError(path, "is not a number in this design, so it cannot be fitted")
    x0 = float(value)
    lo, hi, lo_open, hi_open = field_range(path)

    def gap(x: float) -> float:
        d = with_value(design, path, float(x))
        st = pendulum_state(d, slopes=False, temperature_c=conditions.temperature_c,
                            pressure_hpa=conditions.pressure_hpa,
                            amplitude_deg=conditions.semi_arc_deg)
        return float(st.rate_s_per_day) - measured_rate  # type: ignore[arg-type]

    f0 = gap(x0)
    if f0 == 0.0:
        return ClockFit(with_value(design, path, x0), path, x0, x0, measured_rate)
    h = max(abs(x0) * 1e-5, 1e-9)
    slope = (gap(x0 + h) - f0) / h
    if slope == 0.0 or not math.isfinite(slope):
        raise DesignError(path, "changing this field does not change the rate")
    step = -f0 / slope
    a = x0
    for _ in range(40):
        b = min(max(x0 + step, lo + (1e-12 if lo_open else 0.0)), hi)
        try:
            fb = gap(b)
        except DesignError:
            fb = math.nan
        if math.isfinite(fb) and fb * f0 <= 0.0:
            root = float(brentq(gap, a, b, xtol=1e-15, rtol=1e-13))
            fitted = with_value(design, path, root)
            return ClockFit(fitted, path, x0, root, gap(root) + measured_rate)
        step *= 2.0
    raise DesignError(path, f"no value within its range makes the model's rate "
                            f"{measured_rate:+.3g} s/day")
