"""The ``penduline`` command: the window, and ``report``, ``solve``, ``sweep``, ``export``,
``rating``, ``beats``.

Exit codes: 0 success, 2 bad input (one line on stderr naming the field), 1 a program failure
(one line asking for a report; ``--debug`` anywhere on the line adds the traceback).
"""

from __future__ import annotations

import argparse
import json
import os
import sys
import traceback
from collections.abc import Sequence
from pathlib import Path
from typing import Any

__all__ = ["main"]

COMMANDS = ("report", "solve", "sweep", "export", "rating", "beats")


class _UsageError(Exception):
    """Bad command-line words: reported like bad input (exit 2)."""


class _Parser(argparse.ArgumentParser):
    def error(self, message: str) -> Any:  # type: ignore[override]
        raise _UsageError(message)


COMMAND_HELP = {
    "report": "print the readout of a design (or --json)",
    "sweep": "period and rate against one field, as CSV",
    "export": "write plots, data and a PDF report, no display needed",
}


def _window_parser() -> _Parser:
    """The window's words (``penduline [FILE] ...``); builds the view list, so imports Qt."""
    from app.launch import view_names

    sub = next(a for a in _tools_parser()._actions
               if isinstance(a, argparse._SubParsersAction))
    commands = "\n".join(f"  penduline {action.dest:<8} {action.help}"
                         for action in sub._choices_actions)
    window = _Parser(prog="penduline", formatter_class=argparse.RawDescriptionHelpFormatter,
                     description="Open the Penduline workbench on a design file.",
                     epilog=f"commands (penduline COMMAND --help for their options):\n"
                            f"{commands}")
    window.add_argument("file", nargs="?", help="design file to open (default: an example)")
    window.add_argument("--screenshot", metavar="OUT.png",
                        help="draw the window offscreen at 1440x900, save it as PNG and exit")
    window.add_argument("--view", metavar="NAME", choices=view_names(),
                        help="the view on show (with --screenshot too): "
                             f"{', '.join(view_names()[:-1])}, or 'all' for the plots together")
    window.add_argument("--debug", action="store_true",
                        help="on a program failure, print the traceback (any command)")
    return window


def _tools_parser() -> _Parser:
    """The commands' words (``penduline COMMAND ...``); no Qt needed."""
    tools = _Parser(prog="penduline")
    sub = tools.add_subparsers(dest="command", required=True)
    rep = sub.add_parser("report", help=COMMAND_HELP["report"],
                         description="Print the readout of a design: figures, rate budget, "
                                     "warnings and cautions.")
    rep.add_argument("file", help="design file (*.pendulum.json)")
    rep.add_argument("--json", action="store_true",
                     help="print one JSON object instead, SI units, keys named with their unit")
    rep.add_argument("--trim-height", type=float, metavar="M",
                     help="quote the 1 g trim sensitivity at this height below the pivot (m)")
    rep.add_argument("--budget-temperature", type=float, default=5.0, metavar="K",
                     help="rate budget: temperature half-range around the site's (default 5)")
    rep.add_argument("--budget-pressure", type=float, default=30.0, metavar="HPA",
                     help="rate budget: pressure half-range around the site's (default 30)")
    rep.add_argument("--budget-arc", type=float, default=0.1, metavar="DEG",
                     help="rate budget: semi-arc half-range around the working arc "
                          "(default 0.1)")
    sol = sub.add_parser(
        "solve", help="find the value of one or two fields that meets the targets",
        description="Vary one field to meet one target, or two fields to meet the period and "
                    "null the temperature coefficient together. Each field's whole valid range "
                    "is searched.")
    sol.add_argument("file", help="design file")
    sol.add_argument("--vary", required=True, action="append", metavar="FIELD",
                     help="field path to vary, e.g. parts[2].mount.centre_m; give it twice "
                          "to vary two fields together")
    period = sol.add_mutually_exclusive_group()
    period.add_argument("--target-period", type=float, metavar="S",
                        help="period to meet at the working amplitude, s (default: the "
                             "design's own target)")
    period.add_argument("--target-bph", type=float, metavar="N",
                        help="beats per hour to meet instead (7200 / period)")
    sol.add_argument("--null", choices=["temperature"],
                     help="make the temperature coefficient zero (alone with one field; "
                          "with the period when two fields are varied)")
    sol.add_argument("--write", metavar="OUT", help="write the design with the solved values")
    sol.add_argument("--force", action="store_true",
                     help="with --write: overwrite OUT even if another program changed it "
                          "since it was read")
    swp = sub.add_parser("sweep", help=COMMAND_HELP["sweep"],
                         description="Print the period and rate as CSV (one row per point) "
                                     "while one field of the design runs over a range; "
                                     "points the design cannot take are left empty.")
    swp.add_argument("file", help="design file (*.pendulum.json)")
    swp.add_argument("--vary", required=True, metavar="FIELD",
                     help="field path in SI units, e.g. 'parts[1].mount.centre_m', or 'pivot' "
                          "(moves the pivot down the pendulum by the value, m)")
    swp.add_argument("--from", dest="start", type=float, required=True, metavar="VALUE",
                     help="first value of the field, in the field's SI unit")
    swp.add_argument("--to", dest="stop", type=float, required=True, metavar="VALUE",
                     help="last value of the field, in the field's SI unit")
    swp.add_argument("--points", type=int, default=51, metavar="N",
                     help="number of evenly spaced values, ends included (default 51)")
    exp = sub.add_parser("export", help=COMMAND_HELP["export"],
                         description="Write every plot (PNG and SVG), the data (CSV) and the "
                                     "PDF report of a design into a folder; no display needed.")
    exp.add_argument("file", help="design file (*.pendulum.json)")
    exp.add_argument("--out", required=True, metavar="DIR",
                     help="folder to write into (made if missing; files in it are replaced)")
    exp.add_argument("--sheet", action="store_true",
                     help="also write the one-page client sheet (client_sheet.pdf) and one "
                          "full swing at true speed (swing.gif)")
    exp.add_argument("--units", choices=["metric", "inch-pound"], default="metric",
                     help="units of the client sheet (the design file stays SI)")
    rat = sub.add_parser("rating", help="fit the rating log: measured rate, coefficients, "
                         "correction")
    rat.add_argument("file", help="design file (its rating log, unless --log is given)")
    rat.add_argument("--json", action="store_true", help="one JSON object, SI units")
    rat.add_argument("--log", metavar="CSV",
                     help="fit this CSV log instead of the design's (bad rows become warnings)")
    bts = sub.add_parser("beats", help="rate a clock from a sound recording of its ticking",
                         description="Find the ticks in a WAV recording, fit the beat and the "
                                     "beat asymmetry (out of beat), and rate the clock against "
                                     "a target period.")
    bts.add_argument("recording", help="WAV file: mono or stereo, 8-96 kHz, 16/24/32-bit "
                                       "integer or float")
    target = bts.add_mutually_exclusive_group()
    target.add_argument("--design", metavar="FILE",
                        help="rate against this design's target period (none: no rate)")
    target.add_argument("--target-period", type=float, metavar="S",
                        help="rate against this full period, s (two beats)")
    bts.add_argument("--channel", type=int, metavar="N",
                     help="use channel N of a stereo file (0 or 1; default: the channels mixed)")
    bts.add_argument("--json", action="store_true", help="one JSON object, SI units")
    for p in (rep, sol, swp, exp, rat, bts):
        p.__class__ = _Parser
    return tools


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; returns the exit code."""
    args_list = list(sys.argv[1:] if argv is None else argv)
    debug = "--debug" in args_list
    args_list = [a for a in args_list if a != "--debug"]
    from core import DesignError

    try:
        if args_list and args_list[0] in COMMANDS:
            args = _tools_parser().parse_args(args_list)
            return _COMMAND_RUNNERS[args.command](args)
        args = _window_parser().parse_args(args_list)
        from app.launch import run_window
        return run_window(args.file, args.screenshot, args.view)
    except DesignError as exc:
        print(f"penduline: {exc.field}: {exc.reason}", file=sys.stderr)
        return 2
    except _UsageError as exc:
        print(f"penduline: {exc}", file=sys.stderr)
        return 2
    except BrokenPipeError:  # output piped into a pager or `head` that closed early
        try:
            sys.stdout = open(os.devnull, "w")
        except OSError:
            pass
        return 0
    except KeyboardInterrupt:
        return 1
    except Exception as exc:  # a program bug: one line (the traceback only with --debug)
        if debug:
            traceback.print_exc(file=sys.stderr)
        print(f"penduline: internal error: {type(exc).__name__}: {exc} — please report it; "
              "run with --debug for the traceback", file=sys.stderr)
        return 1


def _report(args: argparse.Namespace) -> int:
    from app.readout.readout_format import rows
    from core import analyse, load_design
    from core.tuning import budget_ranges

    design = load_design(args.file)
    ranges = budget_ranges(args.budget_temperature, args.budget_pressure, args.budget_arc)
    result = analyse(design, trim_height_m=args.trim_height, budget_ranges=ranges)
    report = result.report_dict()
    if args.json:
        print(json.dumps(report, indent=2, ensure_ascii=False))
        return 0
    print(f"{result.design.name}  ({Path(args.file).name})")
    section = ""
    for sec, label, value, unit in rows(report):
        if sec != section:
            section = sec
            print(f"\n{sec}")
        print(f"  {label:<28} {value:>18} {unit}")
    print("\nRate budget (spread of rate over each range)")
    for line in report["rate_budget"]:
        print(f"  {line['cause']:<14} {line['low']:>10.4g} to {line['high']:<10.4g} "
              f"{line['unit']:<4} {line['spread_s_per_day']:+10.3f} s/day")
    print(f"  {'Total, worst case':<40} {report['rate_budget_worst_case_s_per_day']:+10.3f} s/day")
    for title, key in (("Warnings", "warnings"), ("Cautions", "cautions")):
        if report[key]:
            print(f"\n{title}")
            for text in report[key]:
                print(f"  - {text}")
    return 0


def _solve(args: argparse.Namespace) -> int:
    from core import DesignError, load_design
    from core.atomic_write import FileChangedError, file_stamp, write_text_atomic
    from core.fileformat import read_design_dict, set_in_dict
    from core.solve import Targets, solve

    # The output as it was before the solve: overwriting it after another program changed
    # it meanwhile needs --force (stamped before reading, so a change during the read counts).
    before = file_stamp(args.write) if args.write else None
    design = load_design(args.file)
    targets = Targets(period_s=args.target_period, beats_per_hour=args.target_bph,
                      null_temperature=args.null == "temperature")
    sol = solve(design, args.vary, targets)
    for path, (lo, hi), (a, b) in zip(sol.fields, sol.searched, sol.usable, strict=True):
        print(f"{path}: searched {lo:g} to {hi:g}, usable designs from {a:.6g} to {b:.6g}")
    for path, old, new in zip(sol.fields, sol.old_values, sol.values, strict=True):
        print(f"{path} = {new:.12g}  (was {old:.12g})")
    if sol.other_roots:
        print("other values that also meet the target: "
              + ", ".join(f"{r:.9g}" for r in sol.other_roots))
    print(f"period {sol.period_s:.12f} s, temperature coefficient "
          f"{sol.temperature_coefficient_s_per_day_per_k:+.3e} s/day/K")
    for goal, residual in zip(sol.goals, sol.residuals, strict=True):
        print(f"residual: period {residual:+.3e} s" if goal == "period"
              else f"residual: temperature coefficient {residual:+.3e} s/day/K")
    if not sol.met:
        print(f"penduline: {sol.fields[0]}: {sol.message}", file=sys.stderr)
        return 2
    if args.write:
        raw = read_design_dict(args.file)
        for path, value in zip(sol.fields, sol.values, strict=True):
            raw = set_in_dict(raw, path, value)
        try:
            write_text_atomic(args.write, json.dumps(raw, indent=2, ensure_ascii=False) + "\n",
                              expect=before, force=args.force)
        except FileChangedError:
            raise DesignError("file", f"{args.write} was changed by another program since it "
                                      "was read; nothing was written (give --force to "
                                      "overwrite it)") from None
        print(f"wrote {args.write}")
    return 0


def _sweep(args: argparse.Namespace) -> int:
    from core import load_design
    from core.solve import sweep_field

    table = sweep_field(load_design(args.file), args.vary, args.start, args.stop, args.points)
    print(f"{table.field},period_s,rate_s_per_day")
    for x, t, r in zip(table.values, table.period_s, table.rate_s_per_day, strict=True):
        print(f"{x:.9g},{'' if t != t else f'{t:.12g}'},{'' if r != r else f'{r:.6f}'}")
    return 0


def _export(args: argparse.Namespace) -> int:
    from app.report.export import export_all

    for path in export_all(args.file, args.out):
        print(path)
    if args.sheet:
        from app.report.client_sheet import export_sheet_files

        for path in export_sheet_files(args.file, args.out, args.units):
            print(path)
    return 0


def _rating(args: argparse.Namespace) -> int:
    from core import DesignError, load_design, rating_log_from_csv, rating_report, rating_text

    design = load_design(args.file)
    messages: list[str] = []
    if args.log:
        try:
            text = Path(args.log).read_text(encoding="utf-8")
        except (OSError, UnicodeDecodeError) as exc:
            raise DesignError("log", f"cannot read {args.log}: "
                                     f"{getattr(exc, 'strerror', None) or exc}") from None
        log, messages = rating_log_from_csv(text)
    elif design.rating_log is None:
        raise DesignError("rating_log", "the design has no rating log; give one with --log CSV")
    else:
        log = design.rating_log
    report = rating_report(design, log, extra_warnings=messages)
    if args.json:
        print(json.dumps(report, allow_nan=False, ensure_ascii=False))
    else:
        print(rating_text(report), end="")
    return 0


def _beats(args: argparse.Namespace) -> int:
    from core import analyse_recording, beats_text, load_design
    from core.analysis import finite_or_none

    target = args.target_period
    if args.design:
        target = load_design(args.design).target.target_period_s
    analysis = analyse_recording(args.recording, target, args.channel)
    if args.json:
        print(json.dumps(finite_or_none(analysis.report_dict()), allow_nan=False))
    else:
        print(beats_text(analysis).rstrip("\n"))
    return 0


_COMMAND_RUNNERS = {"report": _report, "solve": _solve, "sweep": _sweep, "export": _export,
                    "rating": _rating, "beats": _beats}
