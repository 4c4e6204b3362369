"""What the views that follow the document itself share (the rating log, the recording).

Such a view is not a plot of the current result: it follows the document's design directly
(``bind_document``), computes only while on screen, and edits the design through the document.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

from app.views.plot_export import export_plot
from core import Design, Result

__all__ = ["DocumentView"]


class DocumentView:
    """Mixin for a QWidget view that follows a :class:`app.document.document.Document`.

    The class using it implements ``_on_design_changed(design)``.
    """

    document: Any = None

    def _on_design_changed(self, design: Design) -> None:
        raise NotImplementedError

    def bind_document(self, document: Any) -> None:
        """Follow and edit ``document``'s design."""
        self.document = document
        document.designChanged.connect(self._on_design_changed)
        self._on_design_changed(document.design)

    def show_result(self, result: Result, baseline: Result | None = None) -> None:
        """Without a document, follow ``result``'s design (with one, the document's design is
        followed directly)."""
        if self.document is None:
            self._on_design_changed(result.design)

    def attach_controls(self) -> None:
        """The controls are part of the view."""

    def pose_for_export(self) -> None:
        """Nothing moves."""

    def export(self, path: str | Path) -> Path:
        """Write the view as it stands to ``path`` (.png or .svg)."""
        return export_plot(self, path)  # type: ignore[arg-type]
