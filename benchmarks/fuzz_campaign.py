"""An independent fuzz campaign through ``penduline report --json``: mutated example designs.

Each case takes one example design (every example, in turn), applies one to three seeded
mutations — a numeric field set to a tiny, huge, negative, zero, non-finite or random value, a
field removed, a value of the wrong type, a whole section replaced — and runs the command line
in-process with random options (``--trim-height``, the rate-budget ranges). It counts:

- escapes: an exit code other than 0 or 2, or any traceback;
- non-finite values anywhere in the printed JSON (``NaN``/``Infinity`` are not JSON);
- negative speeds, widths, sweeps, stretches, stresses, masses or loads (the bob's rise is
  signed: a bob above the pivot drops);
- messages that name an internal exception type (``TypeError``, ``ZeroDivisionError`` …).

Run: ``python3 benchmarks/fuzz_campaign.py [--cases 10000] [--seed 2026]``. Prints plain lines;
exits 1 when any of the four counts is not zero.
"""

from __future__ import annotations

import argparse
import contextlib
import io
import json
import math
import random
import sys
import tempfile
import time
from collections import Counter
from pathlib import Path
from typing import Any

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from app.cli import main  # noqa: E402  (after the path is set)

EXAMPLES = sorted((ROOT / "resources" / "examples").glob("*.pendulum.json"))
INTERNAL = ("TypeError", "ValueError", "ZeroDivisionError", "OverflowError", "KeyError",
            "AttributeError", "IndexError", "RecursionError", "AssertionError", "Traceback",
            "internal error")
NON_NEGATIVE = ("peak_speed_m_s", "sweep_width_m", "outer_sweep_m",
                "stretch_m", "peak_stress_pa", "mass_kg", "max_pivot_load_n")
NASTY = (0.0, -0.0, 1e-300, -1e-300, 1e-12, -1e-12, 1e300, -1e300, 1e15, -1.0, 1.0, 179.9,
         180.0, 1e308, float("nan"), float("inf"), float("-inf"), 10**40, True, None, "1.0",
         [], {})


def _leaves(obj: Any, path: tuple[Any, ...] = ()) -> list[tuple[tuple[Any, ...], Any]]:
    out: list[tuple[tuple[Any, ...], Any]] = []
    if isinstance(obj, dict):
        for k, v in obj.items():
            out += [((*path, k), v)] + _leaves(v, (*path, k))
    elif isinstance(obj, list):
        for i, v in enumerate(obj):
            out += [((*path, i), v)] + _leaves(v, (*path, i))
    return out


def _set(obj: Any, path: tuple[Any, ...], value: Any, delete: bool = False) -> None:
    for step in path[:-1]:
        obj = obj[step]
    if delete and isinstance(obj, dict):
        obj.pop(path[-1], None)
    elif delete and isinstance(obj, list) and len(obj) > 1:
        obj.pop(path[-1])
    else:
        obj[path[-1]] = value


def _value(rng: random.Random, old: Any) -> Any:
    roll = rng.random()
    if roll < 0.25:
        return rng.choice(NASTY)
    if isinstance(old, (int, float)) and not isinstance(old, bool) and roll < 0.95:
        spread = rng.choice((0.3, 3.0, 12.0))  # decades: near, far, extreme
        return old * 10 ** rng.uniform(-spread, spread) * rng.choice((1,) * 9 + (-1,))
    return rng.uniform(-1e6, 1e6)


def mutate(design: dict[str, Any], rng: random.Random) -> dict[str, Any]:
    """One to three seeded mutations of ``design`` (a parsed design file)."""
    d = json.loads(json.dumps(design))
    for _ in range(rng.randint(1, 3)):
        leaves = _leaves(d)
        if not leaves:
            break
        numeric = [(p, v) for p, v in leaves
                   if isinstance(v, (int, float)) and not isinstance(v, bool)]
        path, old = rng.choice(numeric if numeric and rng.random() < 0.85 else leaves)
        if rng.random() < 0.1:
            _set(d, path, None, delete=True)
        else:
            _set(d, path, _value(rng, old))
    return d


def _options(rng: random.Random) -> list[str]:
    out: list[str] = []
    if rng.random() < 0.3:
        out += ["--trim-height", repr(rng.choice((1e-300, 1e154, -1.0, 0.0, 0.5,
                                                  rng.uniform(-10, 10))))]
    for option in ("--budget-temperature", "--budget-pressure", "--budget-arc"):
        if rng.random() < 0.15:
            out += [option, repr(rng.choice((0.0, -1.0, 1e300, 1e-300, rng.uniform(0, 500))))]
    return out


def run_case(path: Path, options: list[str]) -> tuple[int, str, str]:
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = main(["report", str(path), "--json", *options])
    return code, out.getvalue(), err.getvalue()


def check(code: int, out: str, err: str, counts: Counter[str]) -> None:
    counts[f"exit {code}"] += 1
    if code not in (0, 2):
        counts["escapes"] += 1
    if any(word in err for word in INTERNAL):
        counts["internal messages"] += 1
    if code != 0:
        return
    try:
        report = json.loads(out, parse_constant=lambda name: (_ for _ in ()).throw(
            ValueError(name)))
    except ValueError:
        counts["non-finite"] += 1
        return
    for path, value in _leaves(report):
        if isinstance(value, float) and not math.isfinite(value):
            counts["non-finite"] += 1
        key = next((p for p in reversed(path) if isinstance(p, str)), "")
        if key in NON_NEGATIVE and isinstance(value, (int, float)) and value < 0:
            counts["negative"] += 1
            counts[f"(negative {key})"] += 1


def main_campaign() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--cases", type=int, default=10_000)
    parser.add_argument("--seed", type=int, default=2026)
    args = parser.parse_args()
    rng = random.Random(args.seed)
    bases = [json.loads(p.read_text(encoding="utf-8")) for p in EXAMPLES]
    counts: Counter[str] = Counter()
    start = time.perf_counter()
    with tempfile.TemporaryDirectory() as folder:
        target = Path(folder) / "case.pendulum.json"
        for case in range(args.cases):
            design = mutate(bases[case % len(bases)], rng)
            target.write_text(json.dumps(design, allow_nan=True), encoding="utf-8")
            check(*run_case(target, _options(rng)), counts)
    seconds = time.perf_counter() - start
    print(f"fuzz campaign: {args.cases} mutated designs of {len(bases)} examples, seed "
          f"{args.seed}, {seconds:.0f} s")
    for key in sorted(counts):
        print(f"  {key}: {counts[key]}")
    bad = sum(counts[k] for k in ("escapes", "non-finite", "negative", "internal messages"))
    print(f"escapes {counts['escapes']}, non-finite {counts['non-finite']}, negative "
          f"{counts['negative']}, internal messages {counts['internal messages']}")
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main_campaign())
