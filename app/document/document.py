"""The open document: the current design, its file, whether it is saved, and its undo history.

Designs are immutable core values, so an undo step simply holds the design before and after the
edit and undo is exact. Live edits (a value being dragged) change the shown design through
:meth:`Document.preview` without touching the history; the finished edit goes through
:meth:`Document.commit`, which pushes one undo step (consecutive stepping edits of one field are
merged into one).
"""

from __future__ import annotations

import os
import stat
from pathlib import Path

from PySide6.QtCore import QObject, Signal
from PySide6.QtGui import QUndoCommand, QUndoStack

from core import Design, DesignError, design_from_dict, load_design, save_design
from core.atomic_write import FileStamp, file_stamp

__all__ = ["Document", "EditCommand", "blank_design", "read_design_file"]

_MERGE_ID = 0x5EED


def blank_design() -> Design:
    """The design File ▸ New starts from: a plain steel rod and a brass lens bob."""
    return design_from_dict({
        "format": "penduline-design", "version": 1, "name": "Untitled pendulum",
        "reference_temperature_c": 20.0,
        "site": {"latitude_deg": 45.0, "elevation_m": 0.0, "g_m_s2": None,
                 "temperature_c": 20.0, "pressure_hpa": 1013.25},
        "suspension": {"kind": "knife_edge", "stiffness_n_m_per_rad": 0.0},
        "parts": [
            {"kind": "rod", "name": "rod", "material": "steel", "top_m": 0.0,
             "length_m": 1.0, "diameter_m": 0.006, "mass_kg": None},
            {"kind": "bob", "name": "bob", "shape": "lens", "material": "brass",
             "mount": {"kind": "clamp", "on": "rod", "centre_m": 0.95},
             "diameter_m": 0.15, "thickness_m": 0.03, "mass_kg": None},
        ],
        "swing": {"amplitude_deg": 2.0, "quality_factor": None},
        "target": {"period_s": 2.0},
        "rating_nut": {"pitch_m": None},
    })


def read_design_file(path: str | Path) -> Design:
    """Read and validate the design file at ``path`` (the file is never changed).

    Only a regular file is read: a named pipe or a device (``/dev/zero``) would block or never
    end, so it is refused before the core opens it.

    Raises
    ------
    DesignError
        ``field='file'`` (or the offending field) when the file cannot be used.
    """
    p = Path(path)
    try:
        mode = os.stat(p).st_mode
    except (OSError, ValueError):  # missing, unreadable, or a name with a NUL byte:
        mode = None                 # the core says which, in its own words
    if mode is not None and not stat.S_ISREG(mode) and not stat.S_ISDIR(mode):
        raise DesignError("file", f"{p.name} is not a regular file")
    return load_design(p)


class EditCommand(QUndoCommand):
    """One undoable edit: the whole design before and after.

    ``field`` names what was edited (a field path, or a word such as ``parts`` for structural
    edits); ``mergeable`` marks the end of a run of steps, which merges with the previous
    mergeable edit of the same field.
    """

    def __init__(self, document: Document, old: Design, new: Design, text: str,
                 field: str = "", mergeable: bool = False) -> None:
        super().__init__(text)
        self.document = document
        self.old = old
        self.new = new
        self.field = field
        self.mergeable = mergeable

    def redo(self) -> None:
        self.document._apply(self.new)

    def undo(self) -> None:
        self.document._apply(self.old)

    def id(self) -> int:
        return _MERGE_ID if self.mergeable else -1

    def mergeWith(self, other: QUndoCommand) -> bool:  # Qt override
        if not (isinstance(other, EditCommand) and other.mergeable and self.mergeable
                and other.field == self.field and other.old == self.new):
            return False
        self.new = other.new
        if self.new == self.old:
            self.setObsolete(True)
        return True


class Document(QObject):
    """The current design, its file path, dirty flag and undo stack.

    Signals
    -------
    designChanged(Design)
        The shown design changed (an edit, a live preview, undo/redo, open, new).
    pathChanged(object)
        The file path changed (a ``Path`` or None for an unsaved document).
    dirtyChanged(bool)
        The document became unsaved (True) or saved (False).
    """

    designChanged = Signal(object)
    pathChanged = Signal(object)
    dirtyChanged = Signal(bool)

    def __init__(self, design: Design, path: str | Path | None = None,
                 parent: QObject | None = None) -> None:
        super().__init__(parent)
        self._design = design
        self._committed = design
        self._path = Path(path) if path is not None else None
        # The file as it was read or last saved: a save refuses to overwrite it if another
        # program changed it since (the window asks first).
        self._stamp: FileStamp | None = file_stamp(path) if path is not None else None
        self._dirty = False
        self._restored = False  # holds edits recovered after a crash, not yet saved
        self.undo_stack = QUndoStack(self)
        self.undo_stack.cleanChanged.connect(self._update_dirty)

    # ------------------------------------------------------------------ state
    @property
    def design(self) -> Design:
        """The design shown now (including a live, not yet committed, edit)."""
        return self._design

    @property
    def committed_design(self) -> Design:
        """The design at the top of the undo history."""
        return self._committed

    @property
    def path(self) -> Path | None:
        """The file the document was read from or saved to (None: never saved)."""
        return self._path

    @property
    def is_dirty(self) -> bool:
        """True when there are edits not yet saved."""
        return self._dirty

    @property
    def file_stamp(self) -> FileStamp | None:
        """The document's file as it was read or last saved (None: no file, or unreadable)."""
        return self._stamp

    def display_name(self) -> str:
        """The file name, or “Untitled” for a document never saved."""
        return self._path.name if self._path is not None else "Untitled"

    # ------------------------------------------------------------------ editing
    def preview(self, design: Design) -> None:
        """Show ``design`` live (while a value is dragged); the history is not touched."""
        if design == self._design:
            return
        self._design = design
        self._update_dirty()
        self.designChanged.emit(design)

    def commit(self, design: Design, text: str, field: str = "",
               mergeable: bool = False) -> None:
        """Record a finished edit from the last committed design to ``design`` as an undo step."""
        if design == self._committed:
            if design != self._design:
                self._apply(design)
            return
        self.undo_stack.push(EditCommand(self, self._committed, design, text, field, mergeable))

    def revert_preview(self) -> None:
        """Drop a live edit that was not committed."""
        if self._design != self._committed:
            self._apply(self._committed)

    def _apply(self, design: Design) -> None:
        self._committed = design
        self._design = design
        self._update_dirty()
        self.designChanged.emit(design)

    # ------------------------------------------------------------------ files
    def replace(self, design: Design, path: str | Path | None,
                stamp: FileStamp | None = None) -> None:
        """Start over with ``design`` (File ▸ New / Open): empty history, saved state.
        ``stamp`` is the file's stamp taken *before* it was read (default: taken now)."""
        self._start_over(design, path, restored=False, stamp=stamp)

    def restore(self, design: Design, path: str | Path | None) -> None:
        """Start over with ``design`` recovered after a crash: empty history, **unsaved**, with
        ``path`` (the file it was being edited from; None when it had none) as its file. The
        file as it is now is what a save will replace without asking."""
        self._start_over(design, path, restored=True)

    def _start_over(self, design: Design, path: str | Path | None, restored: bool,
                    stamp: FileStamp | None = None) -> None:
        self._restored = restored
        if stamp is None and path is not None:
            stamp = file_stamp(path)
        self._stamp = stamp
        self.undo_stack.clear()
        self._path = Path(path) if path is not None else None
        self.undo_stack.setClean()
        self._apply(design)
        self._set_dirty(restored)
        self.pathChanged.emit(self._path)

    def open(self, path: str | Path) -> None:
        """Read the design file at ``path``; raises :class:`core.DesignError` and keeps the
        current document (design, path, history, dirty flag) when the file cannot be used."""
        stamp = file_stamp(path)  # before reading: a change meanwhile is caught at save
        self.replace(read_design_file(path), path, stamp)

    def save(self, path: str | Path | None = None, *, force: bool = False) -> None:
        """Write the committed design to ``path`` (default: the document's file) atomically.

        Saving to the document's own file refuses to overwrite it when another program
        changed it since it was read or last saved, unless ``force``; saving under another
        name replaces what is there (the save dialog asked).

        Raises
        ------
        FileChangedError
            The document's file changed on disk (``force=True`` overwrites it).
        ReadOnlyFileError
            The file is read-only (save under another name).
        DesignError
            ``field='file'`` when it cannot be written. In every case the file on disk is
            untouched and the document stays unsaved.
        """
        target = Path(path) if path is not None else self._path
        if target is None:
            raise DesignError("file", "choose a file name first (Save As…)")
        self.revert_preview()
        same_file = self._path is not None and (
            target == self._path or os.path.realpath(target) == os.path.realpath(self._path))
        self._stamp = save_design(self._committed, target,
                                  expect=self._stamp if same_file else None, force=force)
        changed_path = target != self._path
        self._path = target
        self._restored = False
        self.undo_stack.setClean()
        self._set_dirty(False)
        if changed_path:
            self.pathChanged.emit(self._path)

    # ------------------------------------------------------------------ dirty flag
    def _update_dirty(self) -> None:
        self._set_dirty(self._restored or not self.undo_stack.isClean()
                        or self._design != self._committed)

    def _set_dirty(self, dirty: bool) -> None:
        if dirty != self._dirty:
            self._dirty = dirty
            self.dirtyChanged.emit(dirty)
