"""The rating view's figures, as a small HTML table from a
:func:`core.rating_report.rating_report` object: per-segment rates, the coefficients beside the
model's, the correction, Q and the warnings. Formatting only; unit conversion only.
"""

from __future__ import annotations

import html
from typing import Any

from app.form.units import UnitSystem, readout_unit

__all__ = ["figures_html"]

_COEFFICIENTS = (("temperature_coefficient_s_per_day_per_k", "per K", "s/day/K"),
                 ("pressure_coefficient_s_per_day_per_hpa", "per hPa", "s/day/hPa"),
                 ("arc_coefficient_s_per_day_per_deg", "per ° of arc", "s/day/°"))


def _pm(value: float | None, sigma: float | None, fmt: str) -> str:
    if value is None:
        return "—"
    return f"{value:{fmt}}" + ("" if sigma is None else f" ± {sigma:.2g}")


def _row(*cells: str, span: int = 1) -> str:
    """A table row; the last cell spans ``span`` columns."""
    tds = [f"<td>{c}</td>" for c in cells[:-1]]
    tds.append(f"<td colspan='{span}'>{cells[-1]}</td>")
    return "<tr>" + "".join(tds) + "</tr>"


def figures_html(report: dict[str, Any] | None, problem: str = "",
                 system: UnitSystem = UnitSystem.METRIC) -> str:
    """The figures (or ``problem``, a sentence, when there is nothing to show)."""
    if problem or not report:
        return f"<p>{html.escape(problem or 'No rating log yet: add readings.')}</p>"
    out = ["<table cellspacing='0' cellpadding='2' width='100%'>"]
    ref = report.get("reference_conditions") or {}
    temp = readout_unit("°C", system)
    pres = readout_unit("hPa", system)
    if ref:
        out.append(_row(f"<b>Rates</b> at {temp.convert(ref['temperature_c']):.4g} {temp.text}, "
                        f"{pres.convert(ref['pressure_hpa']):.5g} {pres.text}, "
                        f"{ref['semi_arc_deg']:g}° semi-arc (the design's site)", span=3))
    for i, s in enumerate(report.get("segments") or []):
        rate = html.escape(s["note"]) if s["rate_s_per_day"] is None else \
            f"{_pm(s['rate_s_per_day'], s['rate_sigma_s_per_day'], '+.3f')} s/day"
        out.append(_row(f"Segment {i + 1}", f"{rate} <span style='color:#6b7178'>"
                        f"({s['readings']} readings from {s['from'][:10]})</span>", span=2))
    model = report.get("model") or {}
    if report.get("segments"):
        out.append(_row("<b>Coefficients</b>, s/day", "<b>clock</b>", "<b>model</b>"))
        for key, label, unit in _COEFFICIENTS:
            shown = readout_unit(unit, system)
            scale = shown.scale
            value, sigma = report.get(key), report.get(f"{key}_sigma")
            clock = (f"{_pm(value * scale, None if sigma is None else sigma * scale, '+.4g')}"
                     if value is not None else
                     f"not determined — {html.escape(str(report.get(f'{key}_reason')))}")
            mod = "—" if model.get(key) is None else f"{model[key] * scale:+.4g}"
            label = label.replace("K", "°F") if shown.text.endswith("°F") else \
                label.replace("hPa", "inHg") if shown.text.endswith("inHg") else label
            if value is None:
                out.append(_row(f"{label}", f"{clock}; model {mod}", span=2))
            else:
                out.append(_row(f"{label}", clock, mod))
        measured = report.get("measured_rate_at_mean_conditions_s_per_day")
        if model.get("rate_s_per_day") is not None:
            out.append(_row(f"<b>At the log's mean</b> {temp.convert(model['temperature_c']):.3g} "
                            f"{temp.text}, {pres.convert(model['pressure_hpa']):.5g} "
                            f"{pres.text}, {model['semi_arc_deg']:.3g}°", span=3))
            out.append(_row("rate, s/day", "—" if measured is None else f"{measured:+.3f}",
                            f"{model['rate_s_per_day']:+.3f}"))
        out.append(_row("Residual RMS", f"{report['residual_rms_s']:.3g} s", span=2))
    out.append("</table>")
    corr = report.get("correction")
    if corr:
        trim = "—" if corr["trim_g"] is None else \
            f"{corr['trim_g']:+.3g} g at {corr['trim_height_m'] * 1000:.0f} mm below the pivot"
        down = corr["bob_lowered_mm"]
        bob = "move the bob: —" if down is None else \
            f"{'lower' if down >= 0 else 'raise'} the bob {abs(down):.3g} mm"
        out.append(f"<p><b>Correction</b> for segment {corr['segment']} "
                   f"({corr['measured_rate_s_per_day']:+.3f} s/day), any one of:<br>"
                   f"&nbsp;• {html.escape(corr['rating_nut_direction'])}<br>"
                   f"&nbsp;• trim {trim}<br>&nbsp;• {bob}</p>")
    q = report.get("quality_factor")
    out.append("<p><b>Q from decay</b>: "
               + (f"{_pm(q, report.get('quality_factor_sigma'), '.0f' if q >= 100 else '.3g')}"
                  if q is not None
                  else html.escape(report.get("quality_note") or "no decay readings"))
               + "</p>")
    for w in report.get("warnings") or []:
        out.append(f"<p style='color:#8a5a00'>⚠ {html.escape(w)}</p>")
    return "".join(out)
