"""The window's file handling: new, open, save, export, and the unsaved-changes question.

A save respects the file: the document remembers the file as it was read or last saved, and
when another program changed it since, the window asks (Overwrite / Save As… / Cancel); a
read-only file is not replaced (Save As… is offered); any other refusal is said in a sentence
and the document stays unsaved."""

from __future__ import annotations

from pathlib import Path

from PySide6.QtWidgets import QFileDialog, QMessageBox

from app.document.document import blank_design, read_design_file
from app.document.settings import add_recent_file
from app.launch import default_design_path
from app.window.parts import WindowParts
from core import DesignError
from core.atomic_write import FileChangedError, ReadOnlyFileError, file_stamp

__all__ = ["WindowFiles", "DESIGN_FILTER", "examples_folder", "example_files", "example_title",
           "OVERWRITE", "SAVE_AS", "CANCEL"]

DESIGN_FILTER = "Penduline designs (*.pendulum.json *.json);;All files (*)"
OVERWRITE, SAVE_AS, CANCEL = "overwrite", "save_as", "cancel"  # answers to a changed file


def examples_folder() -> Path:
    """``resources/examples`` beside the ``app`` package."""
    return default_design_path().parent


def example_files() -> list[Path]:
    """Every example design, sorted by name."""
    return sorted(examples_folder().glob("*.pendulum.json"))


def example_title(path: Path) -> str:
    """An example's name for the menu (``hall_clock.pendulum.json`` → “Hall clock”)."""
    return path.name.removesuffix(".pendulum.json").replace("_", " ").capitalize()


class WindowFiles(WindowParts):
    """Opening, saving and exporting; every refusal is a message, never an exception."""

    def confirm_discard(self) -> bool:
        """True when unsaved edits may be dropped (asks; Save saves first)."""
        if not self.document.is_dirty:
            return True
        answer = QMessageBox.question(
            self, "Unsaved changes",
            f"Save the changes to {self.document.display_name()} before closing it?",
            QMessageBox.StandardButton.Save | QMessageBox.StandardButton.Discard
            | QMessageBox.StandardButton.Cancel, QMessageBox.StandardButton.Save)
        if answer == QMessageBox.StandardButton.Save:
            return self.save()
        return answer == QMessageBox.StandardButton.Discard

    def new_document(self) -> bool:
        """Start a new, unsaved design."""
        if not self.confirm_discard():
            return False
        self._trim_height = None
        self.document.replace(blank_design(), None)
        return True

    def ask_open(self) -> None:
        """File ▸ Open…: choose a design file."""
        start = str(self.document.path.parent) if self.document.path else str(examples_folder())
        name, _ = QFileDialog.getOpenFileName(self, "Open design", start, DESIGN_FILTER)
        if name:
            self.open_file(name)

    def open_file(self, path: str | Path, as_example: bool = False) -> bool:
        """Open the design at ``path`` (an example opens as an untitled copy).

        The file is read first: a file that cannot be used is refused with a message naming
        the field, before any question about unsaved edits, and the open document (design,
        file, history, unsaved state) is left exactly as it was.
        """
        stamp = file_stamp(path)  # before reading: a change meanwhile is caught at save
        try:
            design = read_design_file(path)
        except DesignError as exc:
            self.show_message("Cannot open design", f"{Path(path).name}: {exc.field}: "
                                                    f"{exc.reason}")
            return False
        if not self.confirm_discard():
            return False
        self._trim_height = None
        self.document.replace(design, None if as_example else path,
                              None if as_example else stamp)
        if not as_example:
            add_recent_file(path)
        return True

    def save(self) -> bool:
        """Save to the document's file (asks for a name the first time)."""
        if self.document.path is None:
            return self.save_as()
        return self._save_to(self.document.path)

    def save_as(self, path: str | Path | None = None) -> bool:
        """Save under a new name (asked for when ``path`` is None)."""
        if path is None:
            path = self.ask_save_path()
            if path is None:
                return False
        return self._save_to(Path(path))

    def ask_save_path(self) -> Path | None:
        """Ask where to save; None when cancelled."""
        start = self.document.path or Path.home() / f"{self.document.design.name}.pendulum.json"
        name, _ = QFileDialog.getSaveFileName(self, "Save design", str(start), DESIGN_FILTER)
        if not name:
            return None
        path = Path(name)
        return path if path.name.endswith(".json") else path.with_name(path.name +
                                                                       ".pendulum.json")

    def _save_to(self, path: Path, force: bool = False) -> bool:
        """Save; a file changed on disk or read-only is asked about, any other refusal is
        said. Whatever was refused leaves the file untouched and the document unsaved."""
        try:
            self.document.save(path, force=force)
        except FileChangedError:
            answer = self.ask_file_changed(path)
            if answer == OVERWRITE:
                return self._save_to(path, force=True)
            return self.save_as() if answer == SAVE_AS else False
        except ReadOnlyFileError:
            return self.save_as() if self.ask_read_only(path) else False
        except DesignError as exc:
            self.show_message("Cannot save design", exc.reason)
            return False
        add_recent_file(path)
        self.statusBar().showMessage(f"Saved {path.name}", 3000)
        return True

    def ask_file_changed(self, path: Path) -> str:
        """Another program changed ``path`` since it was opened or saved: ``OVERWRITE``,
        ``SAVE_AS`` or ``CANCEL``."""
        box = QMessageBox(QMessageBox.Icon.Warning, "File changed on disk",
                          f"{path.name} was changed by another program since it was opened "
                          "or last saved here. Saving now replaces those changes.", parent=self)
        overwrite = box.addButton("Overwrite", QMessageBox.ButtonRole.DestructiveRole)
        save_as = box.addButton("Save As…", QMessageBox.ButtonRole.AcceptRole)
        cancel = box.addButton(QMessageBox.StandardButton.Cancel)
        box.setDefaultButton(cancel)
        box.exec()
        clicked = box.clickedButton()
        return OVERWRITE if clicked is overwrite else SAVE_AS if clicked is save_as else CANCEL

    def ask_read_only(self, path: Path) -> bool:
        """``path`` is read-only: True when the person wants to save under another name."""
        box = QMessageBox(QMessageBox.Icon.Warning, "File is read-only",
                          f"{path.name} is read-only, so it cannot be replaced. Save the design "
                          "under another name?", parent=self)
        save_as = box.addButton("Save As…", QMessageBox.ButtonRole.AcceptRole)
        box.addButton(QMessageBox.StandardButton.Cancel)
        box.setDefaultButton(save_as)
        box.exec()
        return box.clickedButton() is save_as

    def ask_export_plots(self) -> None:
        """File ▸ Export plots…: choose a folder."""
        folder = QFileDialog.getExistingDirectory(self, "Export plots to folder")
        if folder:
            written = self.export_plots(folder)
            if written:
                self.statusBar().showMessage(f"Wrote {len(written)} files to {folder}", 5000)

    def export_plots(self, folder: str | Path) -> list[Path]:
        """Write every view as ``<slug>.png`` and ``<slug>.svg`` into ``folder``."""
        self.compute_now()
        self._refresh_plots(everything=True)
        target = Path(folder)
        written: list[Path] = []
        try:
            target.mkdir(parents=True, exist_ok=True)
            for view in self.plots:
                for suffix in (".png", ".svg"):
                    written.append(view.export(target / f"{view.slug}{suffix}"))
        except (OSError, ValueError) as exc:
            self.show_message("Cannot export plots", str(exc))
        return written

    def ask_export_all(self) -> None:
        """File ▸ Export plots, data and report…: choose a folder."""
        folder = QFileDialog.getExistingDirectory(self, "Export plots, data and report to folder")
        if folder:
            written = self.export_all(folder)
            if written:
                self.statusBar().showMessage(f"Wrote {len(written)} files to {folder}", 5000)

    def export_all(self, folder: str | Path) -> list[Path]:
        """Write every plot, the CSV data and the PDF report of the current result."""
        from app.report.export import export_result  # Qt's PDF machinery, when first needed

        self.compute_now()
        if self.result is None:
            self.show_message("Cannot export", "There is no valid design to export yet.")
            return []
        try:
            return export_result(self.result, folder, self.document.display_name(),
                                 system=self._system)
        except DesignError as exc:
            self.show_message("Cannot export", exc.reason[:1].upper() + exc.reason[1:])
            return []

