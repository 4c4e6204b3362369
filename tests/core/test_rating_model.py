"""The model beside the clock: the correction re-analysed, fitting one field to the measured
rate, and the model's coefficients at the log's conditions."""

from __future__ import annotations

from pathlib import Path

import pytest

from core import analyse, design_to_dict, load_design
from core.errors import DesignError
from core.rating import Conditions
from core.rating_model import (
    TRIM_LIMIT_FRACTION,
    apply_correction,
    correction,
    default_fit_field,
    fit_model_to_clock,
    model_at_conditions,
    reference_conditions,
)

EXAMPLES = Path(__file__).resolve().parents[2] / "resources" / "examples"


def _design(name: str):  # type: ignore[no-untyped-def]
    return load_design(EXAMPLES / f"{name}.pendulum.json")


def _differences(a: object, b: object, path: str = "") -> list[str]:
    if isinstance(a, dict) and isinstance(b, dict):
        return [d for k in a for d in _differences(a[k], b.get(k), f"{path}.{k}".lstrip("."))]
    if isinstance(a, list) and isinstance(b, list):
        pairs = enumerate(zip(a, b, strict=False))
        return [d for i, (x, y) in pairs for d in _differences(x, y, f"{path}[{i}]")]
    return [] if a == b else [path]


@pytest.mark.parametrize("name", ["hall_clock", "workshop_regulator"])
@pytest.mark.parametrize("measured", [9.0, -14.0])
@pytest.mark.parametrize("what", ["nut", "bob", "trim"])
def test_correction_applied_and_reanalysed_cancels_the_measured_rate(
        name: str, measured: float, what: str) -> None:
    design = _design(name)
    result = analyse(design)
    corr = correction(design, result, measured)
    amount = {"nut": corr.rating_nut_turns, "bob": corr.bob_lowered_mm, "trim": corr.trim_g}[what]
    assert amount is not None
    if what == "trim" and amount < 0 and name == "workshop_regulator":
        # Only 4 g sit on the tray: taking off more is refused, with a warning beforehand.
        assert any("hold 4 g" in w for w in corr.warnings)
        with pytest.raises(DesignError, match="leaves nothing"):
            apply_correction(design, what, amount, corr.trim_height_m)
        return
    corrected = analyse(apply_correction(design, what, amount, corr.trim_height_m))
    change = corrected.rate_s_per_day - result.rate_s_per_day
    assert change == pytest.approx(-measured, rel=0.01)


def test_nut_direction_in_words() -> None:
    design = _design("hall_clock")
    gaining = correction(design, analyse(design), 5.0)
    assert gaining.rating_nut_turns < 0 and "down" in gaining.rating_nut_direction
    losing = correction(design, analyse(design), -5.0)
    assert losing.rating_nut_turns > 0 and "up" in losing.rating_nut_direction
    # One turn of a 0.8 mm thread: the nut figure per mm equals the bob figure for a clamp.
    assert gaining.bob_lowered_mm == pytest.approx(-gaining.rating_nut_turns * 0.8, rel=1e-12)


def test_trim_beyond_the_tray_is_warned() -> None:
    design = _design("hall_clock")
    result = analyse(design)
    limit_g = 1000.0 * TRIM_LIMIT_FRACTION * 2.6  # 1 % of the 2.6 kg bob (common practice)
    corr = correction(design, result, -result.sensitivities.trim_s_per_day_per_g * 1.2 * limit_g)
    assert corr.trim_limit_g == pytest.approx(limit_g)
    assert corr.trim_g == pytest.approx(1.2 * limit_g)
    assert any("more than a trim tray sensibly holds" in w for w in corr.warnings)
    small = correction(design, result, -0.5)
    assert small.warnings == ()


def test_correction_refuses_a_non_number() -> None:
    design = _design("hall_clock")
    with pytest.raises(DesignError) as info:
        correction(design, analyse(design), float("nan"))
    assert info.value.field == "measured_rate"


@pytest.mark.parametrize("name, field", [
    ("hall_clock", "parts[1].mount.centre_m"), ("workshop_regulator", "parts[0].length_m")])
def test_fit_model_to_clock_moves_one_field(name: str, field: str) -> None:
    design = _design(name)
    cond = Conditions(16.5, 1002.0, design.swing.amplitude_deg + 0.2)
    assert default_fit_field(design) == field
    fit = fit_model_to_clock(design, None, 2.75, cond)
    assert fit.field == field
    assert _differences(design_to_dict(design), design_to_dict(fit.design)) == [field]
    # Checked through the other path: the full analysis of the fitted design at those conditions.
    model = model_at_conditions(fit.design, cond.temperature_c, cond.pressure_hpa,
                                cond.semi_arc_deg)
    assert model.rate_s_per_day == pytest.approx(2.75, abs=1e-7)


def test_fit_model_to_clock_by_gravity_follows_the_square_root_law() -> None:
    # T ∝ 1/√g exactly for a knife edge (the torque is proportional to g, the inertia is not):
    # plain dimensional analysis.
    design = _design("workshop_regulator")
    cond = reference_conditions(design)
    before = analyse(design)
    fit = fit_model_to_clock(design, "site.g_m_s2", -3.0, cond)
    ratio = ((1 - 3.0 / 86400) / (1 + before.rate_s_per_day / 86400)) ** 2
    assert fit.old_value == pytest.approx(before.g_m_s2, rel=1e-15)
    assert fit.value == pytest.approx(before.g_m_s2 * ratio, rel=1e-10)


def test_fit_model_to_clock_refusals() -> None:
    design = _design("hall_clock")
    cond = reference_conditions(design)
    with pytest.raises(DesignError) as info:
        fit_model_to_clock(design, "name", 1.0, cond)
    assert info.value.field == "name"
    with pytest.raises(DesignError) as info:
        fit_model_to_clock(design, "parts[9].length_m", 1.0, cond)
    assert info.value.field == "parts[9].length_m"


def test_model_arc_coefficient_matches_the_circular_error_check_value() -> None:
    # DOMAIN §3 [computed]: 0.1° more arc at 2° (1.95° → 2.05°) loses 0.658 s/day; for a rigid
    # pendulum on a knife edge T/T₀ depends on the semi-arc alone.
    design = _design("workshop_regulator")
    model = model_at_conditions(design, 18.0, 1005.0, 2.0)
    assert model.arc_coefficient_s_per_day_per_deg == pytest.approx(-6.58, abs=0.01)
    site = model_at_conditions(design, *vars(reference_conditions(design)).values())
    direct = analyse(design)
    assert site.rate_s_per_day == direct.rate_s_per_day
    assert site.temperature_coefficient_s_per_day_per_k == \
        direct.temperature_coefficient_s_per_day_per_k
    assert model.rate_s_per_day != direct.rate_s_per_day
    with pytest.raises(DesignError) as info:
        model_at_conditions(design, 150.0, 1005.0, 2.0)
    assert info.value.field == "site.temperature_c"
