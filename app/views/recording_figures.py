"""The recording view's figures, as a small HTML table from a :class:`core.beats.BeatAnalysis`:
beat, period, asymmetry (ms and % of the beat), rate ± σ against the design's target, drift,
ticks found, rejected and missing, timing scatter and the warnings. Formatting only.
"""

from __future__ import annotations

import html

from core.beats import BeatAnalysis

__all__ = ["figures_html", "verdict"]

_GREY = "#6b7178"


def _row(label: str, value: str, note: str = "") -> str:
    extra = f" <span style='color:{_GREY}'>{note}</span>" if note else ""
    return f"<tr><td>{label}</td><td><b>{value}</b>{extra}</td></tr>"


def verdict(analysis: BeatAnalysis) -> str:
    """"gains"/"loses" and the rate, or a sentence saying there is no target to rate against."""
    rate = analysis.rate_s_per_day
    if rate is None:
        return "no target period in the design: set one to rate the clock"
    word = "gains" if rate >= 0 else "loses"
    return f"the clock {word} {abs(rate):.2f} s/day"


def figures_html(analysis: BeatAnalysis | None, problem: str = "") -> str:
    """The figures of ``analysis`` (or ``problem``, a sentence, when there is none)."""
    if analysis is None:
        text = problem or ("No recording yet. “Open recording…” reads a WAV file of the clock "
                           "ticking — a minute with a phone held to the case is enough.")
        return f"<p>{html.escape(text)}</p>"
    a = analysis
    out = ["<table cellspacing='0' cellpadding='2' width='100%'>"]
    out.append(_row("Beat", f"{a.beat_s:.6f} s", f"± {1e6 * a.beat_sigma_s:.2f} µs"))
    out.append(_row("Period", f"{a.period_s:.6f} s"))
    out.append(_row("Beat asymmetry", f"{a.beat_asymmetry_ms:.3f} ms",
                    f"± {1e3 * a.beat_asymmetry_sigma_s:.3f}, "
                    f"{a.beat_asymmetry_percent:.2f} % of the beat"))
    if a.rate_s_per_day is not None and a.rate_sigma_s_per_day is not None:
        out.append(_row("Rate", f"{a.rate_s_per_day:+.2f} s/day",
                        f"± {a.rate_sigma_s_per_day:.2f}, against {a.target_period_s:g} s"))
    else:
        out.append(_row("Rate", "—", "the design has no target period"))
    if a.rate_drift_s_per_day is not None and a.rate_drift_sigma_s_per_day is not None:
        out.append(_row("Drift", f"{a.rate_drift_s_per_day:+.2f} s/day",
                        f"± {a.rate_drift_sigma_s_per_day:.2f}, last third on first"))
    else:
        out.append(_row("Drift", "—", "too few ticks in each third"))
    out.append(_row("Ticks", f"{a.ticks}", f"{a.rejected} rejected, {a.missing} missing, "
                    f"in {a.duration_s:.1f} s"))
    out.append(_row("Timing scatter", f"{1e3 * a.timing_scatter_s:.4f} ms", "rms"))
    out.append("</table>")
    out.append(f"<p>In short: {html.escape(verdict(a))}.</p>")
    for w in a.warnings:
        out.append(f"<p style='color:#8a5a00'>⚠ {html.escape(w)}</p>")
    return "".join(out)
