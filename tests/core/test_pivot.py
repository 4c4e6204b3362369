"""Reference tests for core/pivot.py: radius of gyration, shortest-period pivot, conjugate
pivot, pivot sensitivity and moving the pivot.

Sources: rotational inertias of a rod and a sphere about their centres (Halliday, Resnick &
Walker, table [pub, memory]) with the parallel-axis theorem; the compound pendulum's period
2π√((k_c² + h²)/(g h)), shortest at h = k_c where it is 2π√(2k_c/g), with the conjugate pivot
k_c²/h beyond the centre of mass (Kater; any mechanics text [pub, memory]).
"""

from __future__ import annotations

import math
from typing import Any

import pytest
from scipy.optimize import minimize_scalar

from core import DesignError, analyse, design_from_dict, design_to_dict
from core.model import pendulum_state
from core.pivot import check_pivot_shift, shift_pivot
from core.solve import shift_pivot as solve_shift_pivot
from core.solve import sweep_field

from _core_builders import G_N, bob, clamp, design, rod

M_ROD, L_ROD, D_ROD = 1.2, 1.5, 0.02
M_BOB, R_BOB, C_BOB = 6.0, 0.09, 1.3


def _parts() -> list[dict[str, Any]]:
    return [rod(length_m=L_ROD, diameter_m=D_ROD, mass_kg=M_ROD),
            bob("sphere", diameter_m=2 * R_BOB, mass_kg=M_BOB, mount=clamp(centre_m=C_BOB))]


def _vacuum(**kw: Any) -> Any:
    return analyse(design_from_dict(design(_parts(), **kw)))


def _by_hand() -> tuple[float, float]:
    """(k_c, h) from the table of inertias and the parallel-axis theorem."""
    m = M_ROD + M_BOB
    h = (M_ROD * L_ROD / 2 + M_BOB * C_BOB) / m
    i_cm = (M_ROD * (L_ROD**2 / 12 + D_ROD**2 / 16) + M_ROD * (L_ROD / 2 - h) ** 2
            + 0.4 * M_BOB * R_BOB**2 + M_BOB * (C_BOB - h) ** 2)
    return math.sqrt(i_cm / m), h


class TestVacuumKnifeEdge:
    def test_radius_of_gyration(self) -> None:
        k_c, _h = _by_hand()
        out = _vacuum().report_dict()
        assert out["radius_of_gyration_m"] == pytest.approx(k_c, rel=1e-12)

    def test_shortest_period(self) -> None:
        # h = k_c, T₀ = 2π√(2k_c/g) (Kater [pub, memory]), to 1e-9 (issue 17).
        k_c, _h = _by_hand()
        out = _vacuum().report_dict()
        assert out["shortest_period_pivot_m"] == pytest.approx(k_c, rel=1e-9)
        assert out["shortest_period_small_s"] == pytest.approx(
            2 * math.pi * math.sqrt(2 * k_c / G_N), rel=1e-9)

    def test_conjugate_pivot(self) -> None:
        # k_c²/h below the centre of mass, i.e. at the centre of oscillation h + k_c²/h.
        k_c, h = _by_hand()
        r = _vacuum()
        out = r.report_dict()
        assert out["conjugate_pivot_m"] == pytest.approx(k_c**2 / h, rel=1e-9)
        assert h + out["conjugate_pivot_m"] == pytest.approx(r.centre_of_oscillation_m,
                                                             rel=1e-12)

    @pytest.mark.parametrize("deg", [1.0, 30.0])
    def test_pivot_sensitivity(self, deg: float) -> None:
        # T ∝ √L_eq at a fixed arc, L_eq = h + k_c²/h; moving the pivot 1 mm up the body adds
        # 1 mm to h: d(rate) = −43200 (1 − k_c²/h²)/L_eq × 1e-3 s/day (linear; no target).
        k_c, h = _by_hand()
        out = _vacuum(amplitude_deg=deg).report_dict()
        l_eq = h + k_c**2 / h
        assert out["pivot_sensitivity_s_per_day_per_mm"] == pytest.approx(
            -43200 * (1 - k_c**2 / h**2) / l_eq * 1e-3, rel=1e-9)


class TestAirAndSpring:
    KW: dict[str, Any] = {"pressure_hpa": 1013.25, "stiffness": 3.0, "amplitude_deg": 2.0}

    def test_shortest_period_against_the_full_model(self) -> None:
        # scipy's minimize_scalar over the pivot shift, each trial a design moved with
        # shift_pivot and evaluated by the whole model (air, spring): the closed form agrees.
        base = design(_parts(), **self.KW)
        r = analyse(design_from_dict(base))

        def t_small(shift: float) -> float:
            return pendulum_state(design_from_dict(shift_pivot(base, shift))).period_small_s

        best = minimize_scalar(t_small, bounds=(0.0, r.centre_of_mass_m - 0.05),
                               method="bounded", options={"xatol": 1e-10})
        assert r.pivot.shortest_period_small_s == pytest.approx(best.fun, rel=1e-12)
        assert r.pivot.shortest_period_pivot_m == pytest.approx(
            r.centre_of_mass_m - best.x, abs=1e-6)
        # air and spring move it off the vacuum value k_c
        assert abs(r.pivot.shortest_period_pivot_m - r.pivot.radius_of_gyration_m) > 1e-4

    def test_conjugate_pivot_same_period(self) -> None:
        # Hung turned over from the conjugate pivot, the full model gives the same small-arc
        # period as the design.
        base = design(_parts(), **self.KW)
        r = analyse(design_from_dict(base))
        z = r.centre_of_mass_m + r.pivot.conjugate_pivot_m
        turned = pendulum_state(design_from_dict(shift_pivot(base, z)), hang_either_way=True)
        assert turned.period_small_s == pytest.approx(r.period_small_s, rel=1e-12)

    def test_sensitivity_against_moved_designs(self) -> None:
        # Centred difference of the whole model's rate over ±0.1 mm of pivot travel.
        base = design(_parts(), period_s=2.0, **self.KW)
        r = analyse(design_from_dict(base))
        up, down = (analyse(design_from_dict(shift_pivot(base, s))).rate_s_per_day
                    for s in (-1e-4, 1e-4))
        assert r.pivot.pivot_sensitivity_s_per_day_per_mm == pytest.approx(
            (up - down) / 0.2, rel=1e-6)


class TestShiftPivot:
    def test_moves_every_position(self) -> None:
        # Plain arithmetic: every position from the pivot less the shift; the input is kept.
        base = design(_parts() + [{"kind": "weight", "name": "trim", "mass_kg": 0.01,
                                   "at_m": 0.5, "on": "rod"}])
        moved = shift_pivot(base, 0.25)
        assert moved["parts"][0]["top_m"] == pytest.approx(-0.25)
        assert moved["parts"][1]["mount"]["centre_m"] == pytest.approx(C_BOB - 0.25)
        assert moved["parts"][2]["at_m"] == pytest.approx(0.25)
        assert base["parts"][0]["top_m"] == 0.0 and base["parts"][2]["at_m"] == 0.5
        assert solve_shift_pivot is shift_pivot  # the sweep uses the same function

    def test_sweep_uses_it(self) -> None:
        d = design_from_dict(design(_parts()))
        table = sweep_field(d, "pivot", -0.1, 0.4, 6)
        for x, t in zip(table.values, table.period_s, strict=True):
            moved = design_from_dict(shift_pivot(design_to_dict(d), float(x)))
            assert t == pytest.approx(analyse(moved).period_s, rel=1e-15)

    def test_refusals(self) -> None:
        st = pendulum_state(design_from_dict(design(_parts())))
        check_pivot_shift(st, 0.5)
        with pytest.raises(DesignError) as err:
            check_pivot_shift(st, -0.01)  # above the top of the rod
        assert err.value.field == "pivot"
        with pytest.raises(DesignError) as err:
            check_pivot_shift(st, st.mass.centre_of_mass_m)
        assert "centre of mass" in str(err.value)
        with pytest.raises(DesignError):
            shift_pivot(design(_parts()), math.nan)
