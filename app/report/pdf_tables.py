"""The PDF report's tables as Qt rich-text HTML, in the window's words and the chosen units.

Labels come from the core's field table (:mod:`core.fields`) and the readout's rows
(:mod:`app.readout.readout_format`), choice values from ``core.fields.choice_label`` and the
material table, units from :mod:`app.form.units`: no file key reaches the page.
"""

from __future__ import annotations

import html
from collections.abc import Mapping, Sequence
from typing import Any

from app.form.field_text import label_of
from app.form.units import UnitSystem, field_unit, format_sig, readout_unit
from app.readout.figure_words import figure_label
from app.readout.readout_format import SECTIONS, format_value, no_signed_zero
from core import Result
from core.analysis import LOAD_CAUTION
from core.fields import choice_label
from core.fileformat import design_to_dict

__all__ = ["readout_table", "design_tables", "budget_table", "exhibit_table", "rating_summary",
           "box", "EXHIBIT_SECTION"]

EXHIBIT_SECTION = "Swing and loads"
_EXHIBIT_EXTRA = (
    ("peak_angular_velocity_rad_s", "Peak angular velocity", "rad/s", "sig5"),
    ("release_axial_load_n", "Load along pendulum at release", "N", "{:.2f}"),
    ("lowest_point_m", "Lowest point below pivot (hanging)", "m", "{:.4f}"),
    ("energy_lost_per_cycle_j", "Energy lost per period", "J", "sig4"),
)
_NONE_TEXT = {"mass_kg": "from material", "g_m_s2": "from latitude and elevation",
              "period_s": "none", "beats_per_hour": "none", "pitch_m": "no rating nut",
              "quality_factor": "no damping", "temperature_c": "the reference"}
_CHOICE_GROUP = {"kind": "part", "shape": "shape", "support": "support", "end": "end",
                 "purpose": "purpose"}
_SECTIONS = ("site", "suspension", "swing", "target", "rating_nut", "exhibit")


def table(header: Sequence[str], rows: Sequence[Sequence[str]], widths: Sequence[int] = ()
          ) -> str:
    cols = "".join(f"<th width='{w}%'>{h}</th>" if widths else f"<th>{h}</th>"
                   for h, w in zip(header, widths or [0] * len(header), strict=False))
    body = "".join("<tr>" + "".join(cell for cell in row) + "</tr>" for row in rows)
    return (f"<table class='grid' width='100%' cellspacing='0' cellpadding='3'>"
            f"<tr>{cols}</tr>{body}</table>")


def td(text: str, num: bool = False) -> str:
    return f"<td class='num'>{text}</td>" if num else f"<td>{text}</td>"


def box(title: str, items: Sequence[str], colour: str, fill: str) -> str:
    """A framed box (a one-cell table) holding a title and a bulleted list."""
    bullets = "".join(f"<li>{html.escape(t)}</li>" for t in items)
    return (f"<table width='100%' cellspacing='0' cellpadding='8' border='2' "
            f"style='border-color:{colour}; border-style:solid; background-color:{fill};'>"
            f"<tr><td><b style='color:{colour}'>{html.escape(title)}</b>"
            f"<ul style='margin-top:3px; margin-bottom:0px'>{bullets}</ul></td></tr></table>")


def _figure_rows(result: Result, report: Mapping[str, Any], system: UnitSystem,
                 items: Sequence[tuple[str, str, str, str]]) -> list[list[str]]:
    rows = []
    for key, label, unit, fmt in items:
        shown = readout_unit(unit, system)
        label, factor = figure_label(key, label, result, system)
        value = report.get(key)
        if isinstance(value, (int, float)) and not isinstance(value, bool):
            value = (float(value) * shown.scale + shown.offset) * factor
        rows.append([td(html.escape(label)), td(format_value(value, fmt), True),
                     td(html.escape(shown.text))])
    return rows


def readout_table(result: Result, system: UnitSystem) -> str:
    """The readout table (as the window's), the stiffness figure only for a spring."""
    report = result.report_dict()
    rows: list[list[str]] = []
    for section, items in SECTIONS:
        if section == EXHIBIT_SECTION:
            continue  # shown with the exhibit figures, beside the load caution
        rows.append([f"<td colspan='3'>{html.escape(section)}</td>"])
        extra = ([("stiffness_s_per_day_per_n_m_per_rad", "Spring stiffness +1 N·m/rad",
                   "s/day", "{:+.4f}")]
                 if section == "Tuning" and result.design.suspension.kind == "spring" else [])
        rows += _figure_rows(result, report, system, list(items) + extra)
    text = table(["Figure", "Value", "Unit"], rows, (55, 28, 17))
    return text.replace("<tr><td colspan='3'>", "<tr class='section'><td colspan='3'>")


def _value(path: str, key: str, value: Any, system: UnitSystem) -> str:
    """A design value as the form shows it: number in the display unit, words for choices."""
    if value is None:
        return _NONE_TEXT.get(key, "—")
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, (int, float)):
        unit = field_unit(path, system)
        number = format_sig(unit.to_display(float(value)), 6)
        if not unit.text:
            return f"<b>{number}</b>"
        return f"<b>{number}</b>{'' if unit.text == '°' else ' '}{html.escape(unit.text)}"
    return f"<b>{html.escape(_word(path, key, str(value)))}</b>"


def _word(path: str, key: str, value: str) -> str:
    if key == "material":
        from core.materials import MATERIALS
        return MATERIALS[value].label if value in MATERIALS else choice_label("material", value)
    if path.endswith("suspension.kind"):
        return choice_label("suspension", value)
    if path.endswith("mount.kind"):
        return choice_label("mount", value)
    if key in _CHOICE_GROUP:
        return choice_label(_CHOICE_GROUP[key], value)
    return value


def _fields(d: Mapping[str, Any], at: str, system: UnitSystem, kind: str | None = None,
            skip: Sequence[str] = ()) -> str:
    """``Label value unit`` for every field of a section or part, separated by middle dots."""
    pieces = []
    for key, value in d.items():
        if key in skip:
            continue
        path = f"{at}.{key}"
        if isinstance(value, Mapping):
            inner = _fields(value, path, system, kind)
            # A part of a part with its own kind (a bob's mount) names itself.
            pieces.append(inner if "kind" in value else
                          f"{html.escape(label_of(path, kind))}: {inner}")
            continue
        if isinstance(value, list):
            continue
        pieces.append(f"{html.escape(label_of(path, kind))} {_value(path, key, value, system)}")
    return " · ".join(pieces)


def design_tables(result: Result, system: UnitSystem) -> str:
    """The design's sections and parts, in the form's words and ``system``'s units."""
    d = design_to_dict(result.design)
    rows = [[td(html.escape(label_of("reference_temperature_c"))),
             td(_value("reference_temperature_c", "reference_temperature_c",
                       d["reference_temperature_c"], system))]]
    for key in _SECTIONS:
        if isinstance(d.get(key), Mapping) and d[key]:
            rows.append([td(html.escape(label_of(key))), td(_fields(d[key], key, system))])
    general = table(["Section", "Fields"], rows, (22, 78))
    bodies = {b.name: b for b in result.bodies}
    length = readout_unit("m", system)
    mass = readout_unit("kg", system)
    part_rows = []
    for i, p in enumerate(d["parts"]):
        body = bodies.get(p["name"])
        kind = choice_label("part", p["kind"]) + (
            f" ({choice_label('shape', p['shape']).lower()})" if "shape" in p else "")
        part_rows.append([
            td(f"<b>{html.escape(p['name'])}</b>"), td(html.escape(kind)),
            td(_fields(p, f"parts[{i}]", system, p["kind"], skip=("kind", "name", "shape"))),
            td("—" if body is None else format_sig(mass.convert(body.mass_kg), 4), True),
            td("—" if body is None else format_sig(length.convert(body.centre_m), 4), True)])
    parts = table(["Part", "Kind", "Fields (as given, at the reference temperature)",
                   f"Mass {mass.text}", f"Centre {length.text}"], part_rows,
                  (11, 12, 53, 12, 12))
    return (general + "<p class='caption'>Parts, top to bottom as listed in the design; mass "
            "and centre as hung at the site temperature (used in every figure).</p>" + parts)


def budget_table(result: Result, system: UnitSystem) -> str:
    """The rate budget: each cause's range, the rates at its ends and the spread."""
    rows = []
    for line in result.budget.lines:
        unit = readout_unit(line.unit, system)
        rows.append([
            td(html.escape(line.cause)),
            td(f"{format_sig(unit.convert(line.low), 5)} to "
               f"{format_sig(unit.convert(line.high), 5)}"
               f"{'' if unit.text == '°' else ' '}{html.escape(unit.text)}"),
            td(format_value(line.rate_at_low_s_per_day, "{:+.3f}"), True),
            td(format_value(line.rate_at_high_s_per_day, "{:+.3f}"), True),
            td(format_value(abs(line.spread_s_per_day), "{:.3f}"), True)])
    rows.append([td("<b>Worst case (sum of spreads)</b>"), td(""), td(""), td(""),
                 td(f"<b>{format_value(result.budget.worst_case_s_per_day, '{:.3f}')}</b>",
                    True)])
    rows.append([td("<b>Root sum square</b>"), td(""), td(""), td(""),
                 td(f"<b>{format_value(result.budget.root_sum_square_s_per_day, '{:.3f}')}"
                    "</b>", True)])
    note = ("<p class='caption'>Rate (s/day) at each end of each range, the other conditions "
            "held at the site's values; the spread is the change of rate from one end of the "
            "range to the other. Against the target period, or the design's own period when "
            "no target is set.</p>")
    return table(["Cause", "Range", "Rate at low end", "Rate at high end", "Spread s/day"],
                 rows, (20, 30, 17, 17, 16)) + note


def exhibit_table(result: Result, system: UnitSystem) -> str:
    """The swing and load figures, with the load caution beside them."""
    items = [i for s, rows in SECTIONS if s == EXHIBIT_SECTION for i in rows]
    items += list(_EXHIBIT_EXTRA)
    rows = _figure_rows(result, result.report_dict(), system, items)
    return table(["Figure", "Value", "Unit"], rows, (55, 28, 17)) + box(
        "Loads", [LOAD_CAUTION], "#9a5b00", "#fff6e0")


def rating_summary(result: Result) -> str:
    """One line on the design's rating log (never the log itself), or "" without one."""
    log = result.design.rating_log
    if log is None:
        return ""
    readings = len(getattr(log, "readings", ()))
    adjustments = len(getattr(log, "adjustments", ()))
    text = (f"Rating log: {readings} reading{'s' if readings != 1 else ''}, {adjustments} "
            f"adjustment{'s' if adjustments != 1 else ''}.")
    return f"<p>{html.escape(no_signed_zero(text))}</p>"
