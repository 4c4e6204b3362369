"""Benchmark: ``core.analyse`` against a naive scipy baseline for the same motion and curve.

Run from the repository root: ``python3 benchmarks/core_bench.py`` (≈ 30 s on 2 cores; needs
mpmath, from the ``test`` extra). A plain script: it prints, it asserts nothing.

Designs: every ``resources/examples/*.pendulum.json`` (globbed at run time) and variants of the
workshop regulator made with ``core.fileformat.with_value``: no damping; a suspension spring
(0.5 N·m/rad, damping kept); the spring without damping; a 170° semi-arc (no damping, no spring).

Measured for each design, in one run, all timings interleaved (``time.perf_counter``):

* analyse — median of ANALYSE_RUNS calls of ``core.analyse(design)`` after WARMUP calls.
* naive — median of NAIVE_RUNS of each of (a) the motion the result holds, by ``solve_ivp``
  RK45 at default tolerances: same θ₀, times (``t_eval``) and equation
  θ̈ = −(A/I) sin θ − (k/I) θ − (ω₀/Q) θ̇, ω₀ = √((A + k)/I) as in the core; (b) the 400 periods
  of ``result.period_curve``, one ``scipy.integrate.quad`` per amplitude of
  T = 4∫₀^θ₀ dθ / √(2(V(θ₀) − V(θ))/I), V = A(1 − cos θ) + kθ²/2: substitution-free, quad's
  default (QAGS) handling of the endpoint singularity, no ``weight``. Naive = (a) + (b).
* motion error — max |θ − θ_ref| (rad) over all samples; θ_ref at 30 digits from the Jacobi
  closed form in mpmath (no spring, no damping) or mpmath's Taylor integrator ``odefun``
  (otherwise). DOP853 at rtol = atol = 1e-13 is too coarse to judge the core; its error at 170°
  is printed as a note.
* curve error — max relative period error at ~20 of the 400 amplitudes against mpmath at 30
  digits (``ellipk`` without spring; ``quad`` in u, θ = θ₀ sin u, with a spring).
* accuracy ratio — the smaller of naive/core for the two errors, core errors floored at one
  rounding (θ₀·2⁻⁵² rad, 2⁻⁵³ relative).

Goals: no spring and no damping — analyse ≤ 5 ms, naive/analyse ≥ 20, accuracy ratio ≥ 1e4;
spring or damping — analyse ≤ 25 ms. A cProfile of ``analyse`` is printed for each miss.
"""

from __future__ import annotations

import cProfile
import glob
import math
import os
import platform
import pstats
import statistics
import sys
import time
import warnings
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

import mpmath
import numpy as np
import scipy
from numpy.typing import NDArray
from scipy.integrate import IntegrationWarning, quad, solve_ivp

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

import core  # noqa: E402
from core.fileformat import with_value  # noqa: E402

FloatArray = NDArray[np.float64]
WARMUP, ANALYSE_RUNS, NAIVE_RUNS, CURVE_SAMPLES = 3, 30, 10, 20
SPRING = {"kind": "spring", "stiffness_n_m_per_rad": 0.5}
mpmath.mp.dps = 30


@dataclass(frozen=True)
class Coefficients:
    """θ̈ = −a sin θ − b θ − c θ̇, released from rest at θ₀."""

    inertia: float
    torque: float
    stiffness: float
    damping_per_s: float
    theta0: float

    @property
    def plain(self) -> bool:
        """No spring and no damping: the Jacobi closed form applies."""
        return self.stiffness == 0.0 and self.damping_per_s == 0.0


@dataclass(frozen=True)
class Row:
    name: str
    plain: bool
    analyse_ms: float
    rk45_ms: float
    quad_ms: float
    core_motion_err: float
    naive_motion_err: float
    core_curve_err: float
    naive_curve_err: float
    floors: tuple[float, float]

    @property
    def naive_ms(self) -> float:
        """Naive motion (RK45) + period curve (quad), each a median, ms."""
        return self.rk45_ms + self.quad_ms

    @property
    def speed_ratio(self) -> float:
        return self.naive_ms / self.analyse_ms

    @property
    def accuracy_ratio(self) -> float:
        motion = self.naive_motion_err / max(self.core_motion_err, self.floors[0])
        curve = self.naive_curve_err / max(self.core_curve_err, self.floors[1])
        return min(motion, curve)

    @property
    def goal_misses(self) -> list[str]:
        if not self.plain:
            return [] if self.analyse_ms <= 25.0 else ["> 25 ms"]
        misses = [] if self.analyse_ms <= 5.0 else ["> 5 ms"]
        misses += [] if self.speed_ratio >= 20.0 else ["speed < 20x"]
        return misses + ([] if self.accuracy_ratio >= 1e4 else ["accuracy < 1e4x"])


def cases() -> list[tuple[str, core.Design]]:
    """Example files (globbed now) plus the built-in variants of the workshop regulator."""
    out = []
    for path in sorted(glob.glob(str(ROOT / "resources/examples/*.pendulum.json"))):
        try:
            out.append((Path(path).name.removesuffix(".pendulum.json"), core.load_design(path)))
        except core.DesignError as exc:
            print(f"skipped {path}: {exc}")
    base = core.load_design(ROOT / "resources/examples/workshop_regulator.pendulum.json")
    undamped = with_value(base, "swing.quality_factor", None)
    spring = with_value(base, "suspension", SPRING)
    return out + [
        ("regulator, no damping", undamped),
        ("regulator + spring 0.5", spring),
        ("regulator + spring, no damping", with_value(spring, "swing.quality_factor", None)),
        ("regulator 170°, no damping", with_value(undamped, "swing.amplitude_deg", 170.0)),
    ]


def interleaved_ms(fns: list[Callable[[], object]], runs: list[int]) -> list[float]:
    """Median wall time (ms) of each ``fns[i]()`` over ``runs[i]`` calls after WARMUP calls.

    The calls are interleaved, so that a change of machine load hits every function alike.
    """
    for fn in fns:
        for _ in range(WARMUP):
            fn()
    times: list[list[float]] = [[] for _ in fns]
    rounds = max(runs)
    for i in range(rounds):
        for fn, n, out in zip(fns, runs, times, strict=True):
            if i * n // rounds != (i + 1) * n // rounds:
                start = time.perf_counter()
                fn()
                out.append(time.perf_counter() - start)
    return [1e3 * statistics.median(t) for t in times]


def coefficients(result: core.Result) -> Coefficients:
    inertia, torque = result.effective_inertia_kg_m2, result.torque_n_m
    k = result.design.suspension.stiffness_n_m_per_rad
    q = result.design.swing.quality_factor
    c = 0.0 if q is None else math.sqrt((torque + k) / inertia) / q
    return Coefficients(inertia, torque, k, c, math.radians(result.amplitude_deg))


def integrate(co: Coefficients, times: FloatArray, method: str, **tol: float) -> FloatArray:
    """θ at ``times`` by ``solve_ivp``."""
    a, b, c = co.torque / co.inertia, co.stiffness / co.inertia, co.damping_per_s

    def rhs(_t: float, y: FloatArray) -> list[float]:
        return [y[1], -a * math.sin(y[0]) - b * y[0] - c * y[1]]

    sol = solve_ivp(rhs, (times[0], times[-1]), [co.theta0, 0.0], method=method,
                    t_eval=times, **tol)
    return sol.y[0]


def jacobi_mp(co: Coefficients, times: FloatArray) -> FloatArray:
    """Exact θ(t) without spring or damping, mpmath at 30 digits."""
    theta0 = mpmath.mpf(co.theta0)
    m = mpmath.sin(theta0 / 2) ** 2
    quarter = mpmath.ellipk(m)
    omega0 = mpmath.sqrt(mpmath.mpf(co.torque) / mpmath.mpf(co.inertia))
    return np.array([float(2 * mpmath.asin(mpmath.sqrt(m) * mpmath.ellipfun(
        "sn", quarter - omega0 * mpmath.mpf(t), m=m))) for t in times])


def taylor_mp(co: Coefficients, times: FloatArray) -> FloatArray:
    """θ(t) by mpmath's Taylor-series integrator at 30 digits (any spring, any damping)."""
    a, b = (mpmath.mpf(co.torque) / mpmath.mpf(co.inertia),
            mpmath.mpf(co.stiffness) / mpmath.mpf(co.inertia))
    c = mpmath.mpf(co.damping_per_s)
    solution = mpmath.odefun(lambda _t, y: [y[1], -a * mpmath.sin(y[0]) - b * y[0] - c * y[1]],
                             0, [mpmath.mpf(co.theta0), mpmath.mpf(0)])
    return np.array([float(solution(mpmath.mpf(t))[0]) for t in times])


def reference_motion(co: Coefficients, times: FloatArray) -> FloatArray:
    return jacobi_mp(co, times) if co.plain else taylor_mp(co, times)


def potential(co: Coefficients, theta: float) -> float:
    return co.torque * (1.0 - math.cos(theta)) + 0.5 * co.stiffness * theta * theta


def quad_period(co: Coefficients, theta0: float) -> float:
    """Naive full period: quad of the plain integrand (1/√ singularity at θ₀)."""
    v0 = potential(co, theta0)

    def integrand(theta: float) -> float:
        return 1.0 / math.sqrt(2.0 * (v0 - potential(co, theta)) / co.inertia)

    return 4.0 * quad(integrand, 0.0, theta0)[0]


def quad_periods(co: Coefficients, amplitudes_deg: FloatArray) -> FloatArray:
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", IntegrationWarning)
        return np.array([quad_period(co, a) for a in np.radians(amplitudes_deg)])


def mp_period(co: Coefficients, theta0_rad: float) -> mpmath.mpf:
    """Exact full period at 30 digits: 4√(I/A)·K(m), or quad in u with θ = θ₀ sin u."""
    inertia, torque, k = (mpmath.mpf(x) for x in (co.inertia, co.torque, co.stiffness))
    th0 = mpmath.mpf(theta0_rad)
    if co.stiffness == 0.0:
        return 4 * mpmath.sqrt(inertia / torque) * mpmath.ellipk(mpmath.sin(th0 / 2) ** 2)

    def integrand(u: mpmath.mpf) -> mpmath.mpf:
        # V(θ₀) − V(θ) without cancellation: θ₀ − θ = θ₀ cos²u / (1 + sin u)
        su, cu = mpmath.sin(u), mpmath.cos(u)
        gap = th0 * cu**2 / (1 + su)
        dv = (2 * torque * mpmath.sin(th0 - gap / 2) * mpmath.sin(gap / 2)
              + k * th0**2 * cu**2 / 2)
        return th0 * cu / mpmath.sqrt(2 * dv / inertia)

    return 4 * mpmath.quad(integrand, mpmath.linspace(0, mpmath.pi / 2, 5))


def curve_subsample(n: int) -> NDArray[np.intp]:
    return np.unique(np.round(np.linspace(0, n - 1, CURVE_SAMPLES)).astype(np.intp))


def curve_error(periods: FloatArray, reference: list[mpmath.mpf]) -> float:
    return max(float(abs(mpmath.mpf(p) / r - 1)) for p, r in zip(periods, reference, strict=True))


def measure(name: str, design: core.Design) -> Row:
    result = core.analyse(design)
    co = coefficients(result)
    times = result.motion.time_s
    amps = result.period_curve.amplitude_deg
    analyse_ms, rk45_ms, quad_ms = interleaved_ms(
        [lambda: core.analyse(design), lambda: integrate(co, times, "RK45"),
         lambda: quad_periods(co, amps)], [ANALYSE_RUNS, NAIVE_RUNS, NAIVE_RUNS])
    ref_theta = reference_motion(co, times)
    idx = curve_subsample(amps.size)
    ref_periods = [mp_period(co, a) for a in np.radians(amps[idx])]
    return Row(
        name, co.plain, analyse_ms, rk45_ms, quad_ms,
        float(np.max(np.abs(result.motion.angle_rad - ref_theta))),
        float(np.max(np.abs(integrate(co, times, "RK45") - ref_theta))),
        curve_error(result.period_curve.period_s[idx], ref_periods),
        curve_error(quad_periods(co, amps[idx]), ref_periods),
        (co.theta0 * 2.0**-52, 2.0**-53))


def machine() -> str:
    cpu = platform.processor() or platform.machine()
    try:
        with open("/proc/cpuinfo") as f:
            cpu = next(line.split(":", 1)[1].strip() for line in f if "model name" in line)
    except (OSError, StopIteration):
        pass
    return (f"{platform.platform()} | {cpu} | {os.cpu_count()} CPUs | Python "
            f"{platform.python_version()} | numpy {np.__version__} | scipy {scipy.__version__}"
            f" | mpmath {mpmath.__version__}")


def print_table(rows: list[Row]) -> None:
    head = (f"{'design':<31}{'analyse ms':>11}{'naive ms':>9}{'(RK45+quad)':>13}{'speed x':>8}"
            f"{'θ err core':>12}{'θ err naive':>12}{'T err core':>12}{'T err naive':>12}"
            f"{'acc x':>10}  goals")
    print(head)
    print("-" * len(head))
    for r in rows:
        goals = ", ".join(r.goal_misses) or "met"
        split = f"({r.rk45_ms:.1f}+{r.quad_ms:.1f})"
        print(f"{r.name:<31}{r.analyse_ms:>11.2f}{r.naive_ms:>9.1f}{split:>13}"
              f"{r.speed_ratio:>8.1f}"
              f"{r.core_motion_err:>12.1e}{r.naive_motion_err:>12.1e}{r.core_curve_err:>12.1e}"
              f"{r.naive_curve_err:>12.1e}{r.accuracy_ratio:>10.1e}  {goals}")


def reference_check() -> str:
    """Error of DOP853 at 1e-13 against the mpmath Jacobi form at 170° (why it is not used)."""
    co = Coefficients(1.0, 9.81, 0.0, 0.0, math.radians(170.0))
    times = np.linspace(0.0, 3 * float(mp_period(co, co.theta0)), 1201)
    err = np.max(np.abs(integrate(co, times, "DOP853", rtol=1e-13, atol=1e-13)
                        - jacobi_mp(co, times)))
    return f"DOP853 at rtol = atol = 1e-13, 3 periods at 170°, vs mpmath Jacobi: {err:.1e} rad"


def profile(design: core.Design, calls: int = 50, top: int = 14) -> None:
    """cProfile of ``analyse``: core functions by cumulative time, ms per analyse call."""
    prof = cProfile.Profile()
    prof.runcall(lambda: [core.analyse(design) for _ in range(calls)])
    stats = pstats.Stats(prof).stats  # type: ignore[attr-defined]
    rows = sorted(((ct, tt, nc, f"{Path(fn).parent.name}/{Path(fn).name}:{line} {name}")
                   for (fn, line, name), (_cc, nc, tt, ct, _callers) in stats.items()
                   if "/core/" in fn), reverse=True)[:top]
    print(f"{'cum ms':>8}{'self ms':>9}{'calls':>7}  function   (per analyse, profiler on)")
    for ct, tt, nc, label in rows:
        print(f"{1e3 * ct / calls:>8.3f}{1e3 * tt / calls:>9.3f}{nc / calls:>7.0f}  {label}")


def main() -> None:
    print(machine())
    print(f"analyse: median of {ANALYSE_RUNS} calls, naive: medians of {NAIVE_RUNS} calls (RK45 "
          f"at default tolerances; quad with default options, no weight, x400 amplitudes), "
          f"interleaved, after {WARMUP} warm-up calls each")
    designs = cases()
    rows = [measure(name, design) for name, design in designs]
    print_table(rows)
    print("θ err: max |θ − θ_ref| rad over the result's motion; T err: max relative error of "
          f"the period curve at {CURVE_SAMPLES} amplitudes vs mpmath 30 digits")
    print(reference_check())
    missed = [(r, d) for r, (_n, d) in zip(rows, designs, strict=True) if r.goal_misses]
    for row, design in missed:
        print(f"\nProfile of analyse for '{row.name}' (misses: {', '.join(row.goal_misses)}):")
        profile(design)


if __name__ == "__main__":
    main()
