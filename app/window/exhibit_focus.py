"""An exhibit opens on the swing preview: the view the window shows first follows the purpose.

When a result arrives whose design's purpose differs from the last one shown (a file opened,
the purpose switched), an exhibit brings the swing preview on view; a clock leaves the views
as they are. The readout orders its own figures by ``result.purpose``.
"""

from __future__ import annotations

from typing import Any

from core import Result

__all__ = ["focus_for_purpose", "PREVIEW_SLUG"]

PREVIEW_SLUG = "swing_preview"


def focus_for_purpose(window: Any, result: Result) -> None:
    """Show the swing preview in ``window`` when ``result`` is the first of an exhibit."""
    last = getattr(window, "_purpose_shown", None)
    window._purpose_shown = result.purpose
    if result.purpose != "exhibit" or last == "exhibit":
        return
    window.plot_area.show_plot(window.plots.index_of_slug(PREVIEW_SLUG))
