"""Benchmark: the slowest ``core.analyse`` over thousands of random valid spring designs.

Run from the repository root: ``python3 benchmarks/spring_campaign.py`` (about a minute on
2 cores; ``--count`` and ``--seed`` change the campaign, ``--baseline`` the size of the
subsample timed with the old method). A plain script: it prints, it asserts nothing.

Designs: a rod with a spherical bob clamped at its end on a suspension spring, every value
drawn log-uniformly over the file format's valid range (DESIGN §3 / ``core.fileformat``):
rod length 1e-4–1000 m, rod diameter 1e-5–0.1 m, bob diameter 1e-4–1 m, bob mass 1e-6–1e3 kg
(half the bobs take their mass from the material instead), spring 1e-9–1e6 N·m/rad, semi-arc
1e-6–179.9°, quality factor 1–1e9 (none for a third of the designs), pressure 0–1100 hPa
(uniform). Designs the validator or the model refuses (a bob lighter than the air it
displaces, …) are counted and skipped.

Measured (``time.perf_counter``), one call per design after a warm-up:

* analyse — the whole ``core.analyse(design)``; the goal is that the slowest stays under 0.5 s
  (aim: under 0.1 s) on a busy machine.
* motion, new and old — on a random subsample of ``--baseline`` analysed designs: the core's
  ``core.motion.motion`` against the method it replaced (LSODA in seconds and radians,
  rtol 1e-11, atol 1e-13·θ₀; copied below as the naive baseline), on the same I, A, k, θ₀, Q.
  The old method's step size collapses on stiff or fast designs (tens of seconds each).
"""

from __future__ import annotations

import argparse
import math
import platform
import statistics
import sys
import time
from pathlib import Path
from typing import Any

import numpy as np
from numpy.typing import NDArray

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

import core  # noqa: E402
from core.motion import jacobi_motion, motion  # noqa: E402

FloatArray = NDArray[np.float64]


def _log_uniform(rng: np.random.Generator, lo: float, hi: float) -> float:
    return float(10.0 ** rng.uniform(math.log10(lo), math.log10(hi)))


def random_design(rng: np.random.Generator) -> dict[str, Any]:
    """One random spring design over the valid ranges (see the module notes)."""
    length = _log_uniform(rng, 1e-4, 1000.0)
    bob_mass = _log_uniform(rng, 1e-6, 1e3) if rng.random() < 0.5 else None
    q = None if rng.random() < 1 / 3 else _log_uniform(rng, 1.0, 1e9)
    materials = ["steel", "brass", "invar", "lead", "cast_iron", "wood"]
    return {
        "format": "penduline-design", "version": 1, "name": "campaign",
        "site": {"latitude_deg": float(rng.uniform(-90, 90)),
                 "pressure_hpa": float(rng.uniform(0.0, 1100.0))},
        "suspension": {"kind": "spring",
                       "stiffness_n_m_per_rad": _log_uniform(rng, 1e-9, 1e6)},
        "parts": [
            {"kind": "rod", "name": "rod", "material": str(rng.choice(materials)),
             "top_m": 0.0, "length_m": length,
             "diameter_m": _log_uniform(rng, 1e-5, 0.1), "mass_kg": None},
            {"kind": "bob", "name": "bob", "shape": "sphere",
             "material": str(rng.choice(materials)),
             "mount": {"kind": "clamp", "on": "rod", "centre_m": length},
             "diameter_m": _log_uniform(rng, 1e-4, 1.0), "mass_kg": bob_mass},
        ],
        "swing": {"amplitude_deg": _log_uniform(rng, 1e-6, 179.9), "quality_factor": q},
        "target": {"period_s": 2.0},
    }


# ------------------------------------------------------------------ the old method (baseline)

def old_integrated_motion(inertia: float, torque: float, stiffness: float, theta0: float,
                          damping_per_s: float, time_s: FloatArray
                          ) -> tuple[FloatArray, FloatArray]:
    """The replaced integrator: LSODA on the unscaled equation, rtol 1e-11."""
    from scipy.integrate import odeint

    a, c, k = torque / inertia, damping_per_s, stiffness / inertia

    def rhs(_t: float, y: FloatArray) -> list[float]:
        return [y[1], -a * np.sin(y[0]) - k * y[0] - c * y[1]]

    def jac(_t: float, y: FloatArray) -> list[list[float]]:
        return [[0.0, 1.0], [-a * np.cos(y[0]) - k, -c]]

    sol = odeint(rhs, [theta0, 0.0], time_s, Dfun=jac, tfirst=True, rtol=1e-11,
                 atol=1e-13 * max(theta0, 1e-3), mxstep=200000)
    return sol[:, 0], sol[:, 1]


def old_motion(inertia: float, torque: float, k: float, theta0: float, period: float,
               quality_factor: float | None, periods: int = 3, per: int = 400) -> FloatArray:
    """The replaced ``core.motion.motion`` (angle only)."""
    time_s = np.linspace(0.0, periods * period, periods * per + 1)
    if quality_factor is not None:
        decay = math.sqrt((torque + k) / inertia) / quality_factor
        return old_integrated_motion(inertia, torque, k, theta0, decay, time_s)[0]
    if k == 0.0:
        return jacobi_motion(math.sqrt(torque / inertia), theta0, time_s)[0]
    one = old_integrated_motion(inertia, torque, k, theta0, 0.0, time_s[: per + 1])[0]
    return np.concatenate([np.tile(one[:-1], periods), one[-1:]])


# --------------------------------------------------------------------------------- campaign

def _percentiles(values: list[float]) -> str:
    arr = np.array(values)
    qs = [50, 90, 99, 99.9]
    parts = [f"p{q:g} {1e3 * np.percentile(arr, q):.2f}" for q in qs]
    return ", ".join(parts) + f", max {1e3 * arr.max():.2f} ms (n = {arr.size})"


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    parser.add_argument("--count", type=int, default=5000, help="designs drawn (default 5000)")
    parser.add_argument("--seed", type=int, default=2026, help="random seed (default 2026)")
    parser.add_argument("--baseline", type=int, default=200,
                        help="analysed designs also timed with the old method (default 200)")
    args = parser.parse_args()
    rng = np.random.default_rng(args.seed)
    print(f"Python {platform.python_version()}, numpy {np.__version__}, "
          f"{platform.machine()}; {args.count} designs, seed {args.seed}")

    # Warm-up: the first spring design of a process imports scipy.integrate (0.1-0.3 s,
    # once per process); timed here and reported apart from the campaign.
    warm = core.with_value(core.load_design(ROOT / "resources/examples/"
                                            "workshop_regulator.pendulum.json"),
                           "suspension", {"kind": "spring", "stiffness_n_m_per_rad": 0.5})
    t0 = time.perf_counter()
    core.analyse(warm)
    print(f"first analyse in this process (imports included): "
          f"{1e3 * (time.perf_counter() - t0):.0f} ms")

    times: list[float] = []
    slow: list[tuple[float, dict[str, Any], Any]] = []
    refused = 0
    analysed: list[Any] = []
    started = time.perf_counter()
    for _ in range(args.count):
        d = random_design(rng)
        try:
            design = core.design_from_dict(d)
        except core.DesignError:
            refused += 1
            continue
        t0 = time.perf_counter()
        try:
            result = core.analyse(design)
        except core.DesignError:
            refused += 1
            continue
        dt = time.perf_counter() - t0
        times.append(dt)
        analysed.append(result)
        slow.append((dt, d, result))
        slow.sort(key=lambda item: -item[0])
        del slow[5:]
    total = time.perf_counter() - started
    print(f"\n{len(times)} analysed, {refused} refused by the validator or model, "
          f"{total:.1f} s in all")
    print(f"analyse: {_percentiles(times)}")
    print(f"over 0.1 s: {sum(t > 0.1 for t in times)}; over 0.5 s: "
          f"{sum(t > 0.5 for t in times)}")
    print("slowest five:")
    for dt, d, r in slow:
        print(f"  {1e3 * dt:7.2f} ms  I {r.effective_inertia_kg_m2:.3g} kg·m², "
              f"A {r.torque_n_m:.3g} N·m, k {d['suspension']['stiffness_n_m_per_rad']:.3g} "
              f"N·m/rad, θ₀ {d['swing']['amplitude_deg']:.3g}°, "
              f"Q {d['swing']['quality_factor']}, period {r.period_s:.3g} s")

    if args.baseline <= 0 or not analysed:
        return
    pick = rng.choice(len(analysed), size=min(args.baseline, len(analysed)), replace=False)
    new_t: list[float] = []
    old_t: list[float] = []
    worst_gap = 0.0
    for i in pick:
        r = analysed[int(i)]
        s = r.design
        args_m = (r.effective_inertia_kg_m2, r.torque_n_m, s.suspension.stiffness_n_m_per_rad,
                  math.radians(r.amplitude_deg))
        t0 = time.perf_counter()
        m = motion(*args_m, r.period_s, r.period_small_s, s.swing.quality_factor)
        new_t.append(time.perf_counter() - t0)
        t0 = time.perf_counter()
        old = old_motion(*args_m, r.period_s, s.swing.quality_factor)
        old_t.append(time.perf_counter() - t0)
        worst_gap = max(worst_gap, float(np.max(np.abs(old - m.angle_rad))) / args_m[3])
    print(f"\nmotion on {len(pick)} of the analysed designs:")
    print(f"  new (scaled LSODA): {_percentiles(new_t)}")
    print(f"  old (unscaled LSODA): {_percentiles(old_t)}")
    print(f"  slowest old / slowest new: {max(old_t) / max(new_t):.0f}×; total "
          f"{sum(old_t):.1f} s against {sum(new_t):.2f} s")
    print(f"  largest |θ_old − θ_new| / θ₀: {worst_gap:.2g} (both at rtol 1e-11)")
    print(f"  median of per-design ratios: "
          f"{statistics.median(o / n for o, n in zip(old_t, new_t, strict=True)):.2f}")


if __name__ == "__main__":
    main()
