"""The swing preview's words: the figures under the drawing and the cautions that apply."""

from __future__ import annotations

from collections.abc import Callable
from html import escape

from core import Result
from core.analysis import LOAD_CAUTION, SPRING_CAUTION

__all__ = ["figures_html", "caution_html"]


def figures_html(r: Result, deepest_m: float, text: Callable[[float, str], str], compact: bool,
                 key: str, ghost: str) -> str:
    """What the design does, under the drawing (never the window's state: an export shows it
    as it is). ``text(si, unit)`` writes a figure in the chosen units; ``key`` names the drawn
    paths and marks; ``ghost`` mentions a pinned baseline."""
    if compact:
        return (f"<div style='font-size:8pt'>±{r.amplitude_deg:.3g}° · period "
                f"{r.period_s:.4f} s · peak pivot load {text(r.max_pivot_load_n, 'N')} "
                f"(ideal){ghost}</div>")
    e = r.exhibit
    figures = [f"<b>{escape(r.design.name, quote=False)}</b>",
               f"semi-arc ±{r.amplitude_deg:.3g}°", f"period {r.period_s:.4f} s",
               f"deepest point {text(deepest_m, 'm')} below pivot"]
    if e.sweep_width_m is not None and r.peak_speed_m_s is not None:
        figures += [f"bob centre sweep {text(e.sweep_width_m, 'm')}",
                    f"peak speed {text(r.peak_speed_m_s, 'm/s')}"]
    figures.append(f"peak pivot load {text(r.max_pivot_load_n, 'N')} (ideal, no safety factor)")
    return f"<div style='font-size:9pt'>{' · '.join(figures)}<br>{key}{ghost}</div>"


def caution_html(r: Result) -> str:
    """The core's load and spring cautions where they apply to this design (none for a light
    clock pendulum on a knife edge)."""
    cautions = [c for c in r.cautions if c in (LOAD_CAUTION, SPRING_CAUTION)]
    if not cautions:
        return ""
    return "<b>Caution.</b> " + "<br>".join(escape(c, quote=False) for c in cautions)
