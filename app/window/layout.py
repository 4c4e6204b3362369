"""The window's life: remembered layout, drag and drop, closing, and recovery at start-up."""

from __future__ import annotations

from pathlib import Path
from typing import Any

from PySide6.QtCore import QByteArray
from PySide6.QtGui import QCloseEvent, QDragEnterEvent, QDropEvent
from PySide6.QtWidgets import QMessageBox

from app.document.recovery import RecoveryEntry, find_orphans, read_entry, remove_entry, set_aside
from app.document.settings import app_settings
from app.form.units import UnitSystem
from app.window.parts import WindowParts
from core import DesignError

__all__ = ["WindowLayout", "DEFAULT_ARRANGEMENT", "stored_units"]

DEFAULT_ARRANGEMENT = "tabs"  # one large plot at a time; View ▸ Show plots together for a grid


class WindowLayout(WindowParts):
    """Geometry and splitters remembered between runs; files dropped on the window; the
    unsaved-changes question on closing; edits recovered after a crash."""

    # -------------------------------------------------------------- drag and drop
    def dragEnterEvent(self, event: QDragEnterEvent) -> None:  # Qt override
        if _dropped_design(event.mimeData()) is not None:
            event.acceptProposedAction()
        else:
            event.ignore()

    def dropEvent(self, event: QDropEvent) -> None:  # Qt override
        path = _dropped_design(event.mimeData())
        if path is None:
            event.ignore()
            return
        event.acceptProposedAction()
        self.open_file(path)

    # -------------------------------------------------------------- layout memory
    def _restore_layout(self) -> None:
        if not self._remember:
            self.resize(1440, 900)
            return
        settings = app_settings()
        geometry = settings.value("window/geometry")
        if isinstance(geometry, QByteArray) and not geometry.isEmpty():
            self.restoreGeometry(geometry)
        else:
            self.resize(1440, 900)
        for key, splitter in (("window/splitter", self.splitter),
                              ("window/readout_splitter", self.readout.splitter)):
            state = settings.value(key)
            if isinstance(state, QByteArray) and not state.isEmpty():
                splitter.restoreState(state)
        arrangement = settings.value("view/arrangement", DEFAULT_ARRANGEMENT)
        self.grid_action.setChecked(arrangement == "grid")

    def save_layout(self) -> None:
        """Remember window geometry, splitters and plot arrangement."""
        if not self._remember:
            return
        settings = app_settings()
        settings.setValue("window/geometry", self.saveGeometry())
        settings.setValue("window/splitter", self.splitter.saveState())
        settings.setValue("window/readout_splitter", self.readout.splitter.saveState())
        settings.setValue("view/arrangement", self.plot_area.arrangement())
        settings.sync()

    def closeEvent(self, event: QCloseEvent) -> None:  # Qt override
        if not self.confirm_discard():
            event.ignore()
            return
        self.save_layout()
        if self.autosaver is not None:  # a clean exit: saved or dropped, nothing to recover
            self.autosaver.close()
        event.accept()

    # -------------------------------------------------------------- recovery
    def offer_recovery(self) -> bool:
        """At start-up: offer to restore edits autosaved by a run that did not end cleanly.

        Each left-over session is offered (newest first) until one is restored; it opens as
        an unsaved document with its original file. A declined session is deleted. An
        autosave that cannot be read is renamed ``.bad`` (never deleted) and reported.
        Returns True when a design was restored; never raises.
        """
        if self.autosaver is None:
            return False
        restored = False
        for entry in find_orphans(self.autosaver.folder()):
            try:
                design = read_entry(entry)
            except DesignError as exc:
                kept = set_aside(entry)
                where = ", ".join(str(p) for p in kept) or str(entry.design_path)
                self.show_message("Cannot recover design",
                                  f"An autosaved design could not be read ({exc.field}: "
                                  f"{exc.reason}). It was kept as {where}.")
                continue
            if restored:  # one window holds one document; the rest wait for the next start
                continue
            if not self.ask_restore(entry):
                remove_entry(entry)
                continue
            if not self.confirm_discard():
                continue
            self._trim_height = None
            self.document.restore(design, entry.original_path)
            restored = True
            if self.autosaver.autosave_now():  # safe in this session before the old one goes
                remove_entry(entry)
            self.statusBar().showMessage(f"Restored unsaved edits to {design.name}.", 8000)
        return restored

    def ask_restore(self, entry: RecoveryEntry) -> bool:
        """Ask whether to restore ``entry`` (True) or discard it (False)."""
        source = (f"from {entry.original_path}" if entry.original_path is not None
                  else "of a design never saved")
        note = f"\n\n(The file it came from is not known: {entry.info_problem}.)" \
            if entry.info_problem else ""
        answer = QMessageBox.question(
            self, "Restore unsaved edits?",
            f"Penduline did not close normally. Unsaved edits {source}"
            f"{f' ({entry.name})' if entry.name else ''}, autosaved {entry.saved_at}, "
            f"can be restored.{note}\n\nRestore them? Discard deletes them.",
            QMessageBox.StandardButton.Yes | QMessageBox.StandardButton.Discard,
            QMessageBox.StandardButton.Yes)
        return answer == QMessageBox.StandardButton.Yes


def stored_units() -> UnitSystem:
    value = app_settings().value("view/units", UnitSystem.METRIC.value)
    try:
        return UnitSystem(str(value))
    except ValueError:
        return UnitSystem.METRIC


def _dropped_design(mime: Any) -> Path | None:
    if not mime.hasUrls():
        return None
    for url in mime.urls():
        if url.isLocalFile() and url.toLocalFile().lower().endswith(".json"):
            return Path(url.toLocalFile())
    return None
