"""File ▸ Export client sheet…: the one-page PDF and the animated swing of the current result,
in the window's unit system (:mod:`app.report.client_sheet`)."""

from __future__ import annotations

from pathlib import Path
from typing import Any

from PySide6.QtWidgets import QFileDialog

from core import DesignError

__all__ = ["ask_export_sheet", "export_sheet"]


def export_sheet(window: Any, folder: str | Path) -> list[Path]:
    """Write the client sheet and the swing GIF of ``window``'s current result to ``folder``."""
    from app.report.client_sheet import write_sheet_files

    window.compute_now()
    if window.result is None:
        window.show_message("Cannot export", "There is no valid design to export yet.")
        return []
    try:
        return write_sheet_files(window.result, folder, window.unit_system())
    except (DesignError, OSError, ValueError) as exc:
        window.show_message("Cannot export the client sheet", str(exc))
        return []


def ask_export_sheet(window: Any) -> None:
    """Choose a folder, then write the client sheet there."""
    folder = QFileDialog.getExistingDirectory(window, "Export client sheet to folder")
    if folder:
        written = export_sheet(window, folder)
        if written:
            window.statusBar().showMessage(f"Wrote {len(written)} files to {folder}", 5000)
