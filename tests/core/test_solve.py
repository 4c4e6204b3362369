"""Reference tests for core/solve.py: meeting a target period by one field, refusals, sweeps.

Targets are made reachable by construction: a design with the field set to some other value
(by ``with_value``) is analysed, and its period becomes the target. The solved design is then
re-analysed on its own and must meet the target to 1e-10 relative.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

from core import (
    Design,
    DesignError,
    analyse,
    design_from_dict,
    design_to_dict,
    load_design,
    with_value,
)
from core.fileformat import get_value
from core.solve import solve_field, sweep_field

from _core_builders import G_N, bob, clamp, design, point_pendulum, rod, weight
from _mp_reference import mp_ratio

EXAMPLE = str(Path(__file__).resolve().parents[2] / "resources" / "examples"
              / "workshop_regulator.pendulum.json")


def clamped() -> Design:
    parts = [rod(material="steel", length_m=1.1, diameter_m=0.008),
             bob("lens", material="brass", diameter_m=0.2, thickness_m=0.03,
                 mount=clamp(centre_m=0.95)),
             weight(mass_kg=0.004, at_m=0.4)]
    return design_from_dict(design(parts, g_m_s2=None, latitude_deg=48.0, pressure_hpa=1000.0,
                                   amplitude_deg=3.0, period_s=2.0))


def sprung() -> Design:
    parts = [rod(material="steel", length_m=0.25, diameter_m=0.004),
             bob("cylinder", material="brass", diameter_m=0.03, height_m=0.04,
                 mount=clamp(centre_m=0.23))]
    return design_from_dict(design(parts, stiffness=0.02, amplitude_deg=5.0,
                                   pressure_hpa=1013.25))


CASES = [
    # (design, field path, value used to make the target)
    (clamped, "parts[1].mount.centre_m", 0.97),            # bob centre
    (lambda: load_design(EXAMPLE), "parts[0].length_m", 1.12),  # rod length (bob on sleeve)
    (lambda: load_design(EXAMPLE), "parts[1].length_m", 0.07),  # compensating sleeve length
    (lambda: load_design(EXAMPLE), "parts[3].mass_kg", 0.02),   # trim mass
    (sprung, "suspension.stiffness_n_m_per_rad", 0.05),     # suspension spring stiffness
]


class TestSolveField:
    @pytest.mark.parametrize("make, path, value", CASES, ids=[
        "bob_centre", "rod_length", "sleeve_length", "trim_mass", "spring_stiffness"])
    def test_meets_target(self, make, path: str, value: float) -> None:  # type: ignore[no-untyped-def]
        d = make()
        target = analyse(with_value(d, path, value)).period_s
        sol = solve_field(d, path, target_period_s=target)
        assert sol.field == path
        assert sol.old_value == get_value(design_to_dict(d), path)
        # re-analysed independently of the solver
        assert analyse(sol.design).period_s == pytest.approx(target, rel=1e-10, abs=0)
        assert sol.period_s == pytest.approx(target, rel=1e-10, abs=0)
        # only that field changed
        assert sol.design == with_value(d, path, sol.value)
        # the period is monotonic in each of these fields here, so the value is the one used
        assert sol.value == pytest.approx(value, rel=1e-6)

    def test_design_target_by_default(self) -> None:
        # With no target given, the design's own target (2 s) is used: the rate becomes 0.
        sol = solve_field(load_design(EXAMPLE), "parts[0].length_m")
        r = analyse(sol.design)
        assert r.period_s == pytest.approx(2.0, rel=1e-10, abs=0)
        assert r.rate_s_per_day == pytest.approx(0.0, abs=1e-5)

    def test_point_pendulum_length(self) -> None:
        # Independent check: the bob centre giving T = 2 s at 1.5° in vacuum at g_n is
        # L = g_n (T / (2π · T/T₀))², with T/T₀ from mpmath at 40 digits (DOMAIN §4: 0.085 mm
        # less than g_n/π²).
        d = design_from_dict(point_pendulum(1.0, amplitude_deg=1.5, period_s=2.0))
        # the rod must stay long enough for the bob: its centre may go beyond the rod's end
        # only while the ball still touches it, so solve on a longer rod
        d = with_value(d, "parts[0].length_m", 1.2)
        sol = solve_field(d, "parts[1].mount.centre_m")
        expected = G_N * (1.0 / (math.pi * float(mp_ratio(1.5)))) ** 2
        assert sol.value == pytest.approx(expected, rel=1e-9)
        assert (G_N / math.pi**2 - sol.value) * 1e3 == pytest.approx(0.085, abs=5e-4)

    def test_no_solution_names_the_field(self) -> None:
        # A 4 g trim weight cannot bring a 2 s regulator to 1 s: refused naming the field,
        # with the nearest reachable value.
        d = load_design(EXAMPLE)
        with pytest.raises(DesignError) as err:
            solve_field(d, "parts[3].mass_kg", target_period_s=1.0)
        assert err.value.field == "parts[3].mass_kg"
        assert "no value" in err.value.reason and "nearest" in err.value.reason

    def test_temperature_null_unreachable(self) -> None:
        # A plain steel rod has no compensating part: no trim mass nulls its temperature
        # coefficient.
        d = design_from_dict(design([rod(material="steel"), bob("sphere", mount=clamp()),
                                     weight(mass_kg=0.01, at_m=0.5)]))
        with pytest.raises(DesignError) as err:
            solve_field(d, "parts[2].mass_kg", goal="temperature")
        assert err.value.field == "parts[2].mass_kg"

    @pytest.mark.parametrize("path", ["parts[9].length_m", "parts[0].material",
                                      "site.nonsense", "parts[0]..length_m"])
    def test_bad_field_refused(self, path: str) -> None:
        with pytest.raises(DesignError) as err:
            solve_field(load_design(EXAMPLE), path, target_period_s=2.0)
        assert err.value.field == path

    def test_no_target_refused(self) -> None:
        d = design_from_dict(point_pendulum(1.0))
        with pytest.raises(DesignError) as err:
            solve_field(d, "parts[1].mount.centre_m")
        assert err.value.field == "target.period_s"


class TestSweepField:
    def test_point_pendulum_against_formula(self) -> None:
        # T = 2π√(z/g_n)·(T/T₀)(θ₀) for a point bob at z — mpmath ratio at 40 digits.
        d = design_from_dict(point_pendulum(1.0, amplitude_deg=10.0, period_s=2.0))
        table = sweep_field(d, "parts[1].mount.centre_m", 0.5, 1.0, 6)
        expected = [2 * math.pi * math.sqrt(z / G_N) * float(mp_ratio(10)) for z in table.values]
        np.testing.assert_allclose(table.period_s, expected, rtol=1e-9)
        np.testing.assert_allclose(table.rate_s_per_day, 86400 * (2.0 / np.array(expected) - 1),
                                   rtol=1e-8)
        assert all(reason == "" for reason in table.reasons)

    def test_unusable_values_are_nan_with_reason(self) -> None:
        # Beyond the end of the rod a 10 µm ball no longer touches it: NaN, with the reason.
        d = design_from_dict(point_pendulum(1.0, period_s=2.0))
        table = sweep_field(d, "parts[1].mount.centre_m", 0.9, 1.1, 3)
        assert math.isfinite(table.period_s[0]) and math.isfinite(table.period_s[1])
        assert math.isnan(table.period_s[2])
        assert "parts[1].mount.centre_m" in table.reasons[2]

    def test_bad_arguments(self) -> None:
        d = design_from_dict(point_pendulum(1.0))
        with pytest.raises(DesignError):
            sweep_field(d, "parts[1].mount.centre_m", 0.5, math.nan, 5)
        with pytest.raises(DesignError):
            sweep_field(d, "parts[1].mount.centre_m", 0.5, 1.0, 1)


class TestPivotSweepReversible:
    """Kater's reversible pendulum (Kater 1818; standard mechanics texts [pub, memory]): the
    period is least where the pivot's distance from the centre of mass equals the radius of
    gyration k_c about it, and a pivot at the centre of oscillation, on the far side of the
    centre of mass, gives the same period as the original pivot."""

    def _compound(self):  # type: ignore[no-untyped-def]
        from core import design_from_dict

        from _core_builders import bob, clamp, design, rod

        # DOMAIN §3's compound example: rod 1.000 m, 0.25 kg; disc R = 0.075 m, 3.0 kg at 0.95 m,
        # vacuum, g_n, a small arc.
        return design_from_dict(design([
            rod(length_m=1.0, diameter_m=1e-4, mass_kg=0.25),
            bob("disc", diameter_m=0.15, thickness_m=1e-4, mass_kg=3.0,
                mount=clamp(centre_m=0.95))], amplitude_deg=0.01))

    def test_conjugate_pivot_keeps_the_period(self) -> None:
        from core import analyse
        from core.solve import sweep_field

        d = self._compound()
        r = analyse(d)
        # mpmath-free reference: the same design's own exact period at its own pivot.
        table = sweep_field(d, "pivot", 0.0, r.centre_of_oscillation_m, 2)
        assert table.period_s[1] == pytest.approx(table.period_s[0], rel=1e-12)
        assert table.period_s[0] == pytest.approx(r.period_s, rel=1e-15)

    def test_least_period_where_pivot_distance_is_the_radius_of_gyration(self) -> None:
        from core import analyse
        from core.solve import sweep_field

        d = self._compound()
        r = analyse(d)
        h = r.centre_of_mass_m
        k_c = (r.inertia_pivot_kg_m2 / r.mass_kg - h * h) ** 0.5  # parallel-axis theorem
        # the pivot at distance k_c above the centre of mass: shift = h − k_c
        around = np.linspace(h - k_c - 0.02, h - k_c + 0.02, 4001)
        table = sweep_field(d, "pivot", float(around[0]), float(around[-1]), 4001)
        best = float(table.values[int(np.nanargmin(table.period_s))])
        assert best == pytest.approx(h - k_c, abs=2e-5)  # the grid step is 1e-5 m
