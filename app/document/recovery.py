"""Autosave of unsaved edits, and their recovery after a crash.

While the document has unsaved edits, :class:`Autosaver` writes its design ``delay_s`` seconds
after the last edit (3 by default; during a long run of edits at most ``MAX_DELAY_S`` after the
first one), and in any case every ``interval_s`` seconds (30 by default), into the recovery
folder, through the core's atomic
writer, as a session of three files::

    <session>.pendulum.json   the design itself: a valid design file, openable on its own
    <session>.recovery.json   what it was: the file it was edited from (or null), when, its name
    <session>.lock            a QLockFile held while the session runs

Saving, discarding the edits or closing the window cleanly removes the session. A session whose
lock is no longer held by a running process is left over from a crash: :func:`find_orphans`
lists those, newest first, and the window offers to restore them when it starts. A recovered
design that cannot be read is never deleted: :func:`set_aside` renames its files to ``.bad``.

The recovery folder is ``recovery`` in the application's data folder
(``QStandardPaths.AppDataLocation``); the environment variable ``PENDULINE_DATA_DIR`` replaces
the data folder (tests point it at a temporary folder, so the user's data is never touched).
"""

from __future__ import annotations

import json
import os
import time
import uuid
from dataclasses import dataclass
from datetime import UTC, datetime
from pathlib import Path
from typing import Any

from PySide6.QtCore import QLockFile, QObject, QStandardPaths, QTimer, Signal

from app.document.document import Document, read_design_file
from core import Design, DesignError, dumps_design
from core.fileformat import write_text_atomic

__all__ = ["AUTOSAVE_DELAY_S", "AUTOSAVE_INTERVAL_S", "DATA_DIR_ENV", "MAX_DELAY_S",
           "RECOVERY_FORMAT", "Autosaver", "RecoveryEntry", "data_folder", "find_orphans",
           "read_entry", "recovery_folder", "remove_entry", "set_aside"]

AUTOSAVE_INTERVAL_S = 30.0
AUTOSAVE_DELAY_S = 3.0   # after the last edit: a crash loses at most the last few seconds
MAX_DELAY_S = 10.0       # a long run of edits is autosaved at least this often
DATA_DIR_ENV = "PENDULINE_DATA_DIR"
RECOVERY_FORMAT = "penduline-recovery"
RECOVERY_VERSION = 1
DESIGN_SUFFIX = ".pendulum.json"
INFO_SUFFIX = ".recovery.json"
LOCK_SUFFIX = ".lock"
BAD_SUFFIX = ".bad"
MAX_INFO_BYTES = 100_000


def data_folder() -> Path:
    """The application's data folder (``PENDULINE_DATA_DIR`` when it is set)."""
    override = os.environ.get(DATA_DIR_ENV)
    if override:
        return Path(override)
    location = QStandardPaths.writableLocation(
        QStandardPaths.StandardLocation.AppDataLocation)
    return Path(location) if location else Path.home() / ".penduline"


def recovery_folder() -> Path:
    """Where autosaved sessions are kept."""
    return data_folder() / "recovery"


@dataclass(frozen=True)
class RecoveryEntry:
    """One autosaved session left over from a run that did not end cleanly.

    ``original_path`` is the file the design was edited from (None for a design never saved, or
    when the record of it is unreadable, in which case ``info_problem`` says why);
    ``saved_at`` the local time of the last autosave (``YYYY-MM-DD HH:MM``).
    """

    design_path: Path
    info_path: Path
    lock_path: Path
    original_path: Path | None
    saved_at: str
    name: str
    info_problem: str = ""

    @property
    def session(self) -> str:
        """The session's name (the files' common stem)."""
        return self.design_path.name.removesuffix(DESIGN_SUFFIX)


def _session_paths(folder: Path, session: str) -> tuple[Path, Path, Path]:
    return (folder / f"{session}{DESIGN_SUFFIX}", folder / f"{session}{INFO_SUFFIX}",
            folder / f"{session}{LOCK_SUFFIX}")


_HELD: set[str] = set()  # lock files this process holds for its own sessions


def _lock(path: Path) -> QLockFile:
    lock = QLockFile(str(path))
    lock.setStaleLockTime(0)  # stale only when its process is gone, however old it is
    return lock


def _session_is_running(lock_path: Path) -> bool:
    """True when a running process holds the session's lock (its owner is alive)."""
    if not lock_path.exists():
        return False
    if os.path.abspath(lock_path) in _HELD:
        return True
    probe = _lock(lock_path)
    info = probe.getLockInfo()
    if isinstance(info, tuple) and info and info[0] == os.getpid():
        # Our own process id on a lock this process does not hold: a session of an earlier
        # run that crashed, whose process id was reused by this one (common in containers).
        lock_path.unlink(missing_ok=True)
        return False
    if probe.tryLock(0):  # a stale lock (its process died) is taken over and released
        probe.unlock()
        return False
    return probe.error() == QLockFile.LockError.LockFailedError


def _read_info(info_path: Path) -> tuple[Path | None, str, str]:
    """(original path, design name, problem) from a session's record."""
    try:
        if info_path.stat().st_size > MAX_INFO_BYTES:
            raise ValueError("it is too large")
        info: Any = json.loads(info_path.read_text(encoding="utf-8"))
        if not isinstance(info, dict) or info.get("format") != RECOVERY_FORMAT:
            raise ValueError("it is not a recovery record")
        original = info.get("original_path")
        if original is not None and not isinstance(original, str):
            raise ValueError("its original_path is not text")
        name = info.get("name", "")
        return Path(original) if original else None, name if isinstance(name, str) else "", ""
    except FileNotFoundError:
        return None, "", "its record is missing"
    except (OSError, ValueError) as exc:  # JSONDecodeError and UnicodeDecodeError included
        return None, "", f"its record cannot be read ({exc})"


def find_orphans(folder: Path | None = None) -> list[RecoveryEntry]:
    """Autosaved sessions whose process is no longer running, newest first.

    Never raises: a folder that cannot be listed has no sessions to offer.
    """
    folder = recovery_folder() if folder is None else folder
    try:
        designs = [p for p in folder.glob(f"*{DESIGN_SUFFIX}") if p.is_file()]
    except OSError:
        return []
    found: list[tuple[float, RecoveryEntry]] = []
    for design_path in designs:
        session = design_path.name.removesuffix(DESIGN_SUFFIX)
        _, info_path, lock_path = _session_paths(folder, session)
        try:
            if _session_is_running(lock_path):
                continue
            mtime = design_path.stat().st_mtime
        except OSError:
            continue
        original, name, problem = _read_info(info_path)
        saved_at = datetime.fromtimestamp(mtime).strftime("%Y-%m-%d %H:%M")
        found.append((mtime, RecoveryEntry(design_path, info_path, lock_path, original,
                                           saved_at, name, problem)))
    found.sort(key=lambda item: (-item[0], item[1].design_path.name))
    return [entry for _, entry in found]


def read_entry(entry: RecoveryEntry) -> Design:
    """The design of a recovered session.

    Raises
    ------
    DesignError
        When the autosaved design cannot be used (then :func:`set_aside` keeps it).
    """
    return read_design_file(entry.design_path)


def remove_entry(entry: RecoveryEntry) -> None:
    """Delete a recovered session's files (after it was restored or declined)."""
    for path in (entry.info_path, entry.design_path, entry.lock_path):
        try:
            path.unlink(missing_ok=True)
        except OSError:
            pass


def set_aside(entry: RecoveryEntry) -> list[Path]:
    """Rename a session's files to ``<name>.bad`` so they are kept but not offered again;
    returns the new paths of the files that exist (the originals when renaming fails)."""
    kept: list[Path] = []
    for path in (entry.design_path, entry.info_path):
        if not path.exists():
            continue
        bad = path.with_name(path.name + BAD_SUFFIX)
        n = 2
        while bad.exists():
            bad = path.with_name(f"{path.name}.{n}{BAD_SUFFIX}")
            n += 1
        try:
            os.replace(path, bad)
            kept.append(bad)
        except OSError:
            kept.append(path)
    try:
        entry.lock_path.unlink(missing_ok=True)
    except OSError:
        pass
    return kept


class Autosaver(QObject):
    """Writes the document's design to its own recovery session while it has unsaved edits.

    Parameters
    ----------
    document : Document
        The document to keep safe.
    folder : Path, optional
        The recovery folder (default :func:`recovery_folder`, read when the first autosave is
        written).
    interval_s : float
        Seconds between autosaves while the document is unsaved.
    delay_s : float
        Seconds after the last edit before it is autosaved (edits in quick succession wait
        for the last one, but never more than ``MAX_DELAY_S`` after the first).

    Signals
    -------
    saved(object)
        The path of the autosaved design, after each autosave.
    failed(str)
        Why an autosave could not be written (the edits stay in memory; it is tried again at
        the next interval).
    """

    saved = Signal(object)
    failed = Signal(str)

    def __init__(self, document: Document, folder: Path | None = None,
                 interval_s: float = AUTOSAVE_INTERVAL_S, parent: QObject | None = None,
                 delay_s: float = AUTOSAVE_DELAY_S) -> None:
        super().__init__(parent)
        self.document = document
        self._folder = folder
        self._session = ""
        self._session_folder: Path | None = None  # where this session's files are
        self._lock: QLockFile | None = None
        self._written: tuple[Design, Path | None] | None = None
        self.last_error = ""
        self.timer = QTimer(self)
        self.timer.setInterval(max(1, round(interval_s * 1000)))
        self.timer.timeout.connect(self.autosave_now)
        self.soon = QTimer(self)  # the autosave a few seconds after the last edit
        self.soon.setSingleShot(True)
        self.soon.setInterval(max(1, round(delay_s * 1000)))
        self.soon.timeout.connect(self.autosave_now)
        self._first_pending = 0.0
        document.dirtyChanged.connect(self._on_dirty_changed)
        document.designChanged.connect(self._on_design_changed)
        if document.is_dirty:
            self.timer.start()
            self._edited()

    # ------------------------------------------------------------------ where
    def folder(self) -> Path:
        """The recovery folder this autosaver writes to (fixed once a session is open)."""
        if self._session_folder is not None:
            return self._session_folder
        return recovery_folder() if self._folder is None else self._folder

    def design_path(self) -> Path | None:
        """The autosaved design of this session (None before the first autosave)."""
        if not self._session:
            return None
        return _session_paths(self.folder(), self._session)[0]

    def lock_path(self) -> Path | None:
        """This session's lock file (None before the first autosave)."""
        if not self._session:
            return None
        return _session_paths(self.folder(), self._session)[2]

    # ------------------------------------------------------------------ writing
    def autosave_now(self) -> bool:
        """Write the document's design now, when it has unsaved edits not yet autosaved.

        Returns True when the unsaved design is safe on disk (written now, or unchanged since
        the last autosave), False when there is nothing unsaved or it cannot be written (then
        ``failed`` says why). Never raises.
        """
        if not self.document.is_dirty:
            return False
        state = (self.document.design, self.document.path)
        if state == self._written and self.design_path() is not None \
                and self.design_path().exists():  # type: ignore[union-attr]
            return True
        try:
            design_path, info_path = self._open_session()
            text = dumps_design(state[0])
            info = {"format": RECOVERY_FORMAT, "version": RECOVERY_VERSION,
                    "original_path": None if state[1] is None else str(state[1]),
                    "name": state[0].name,
                    "saved_at": datetime.now(UTC).isoformat(timespec="seconds"),
                    "design_file": design_path.name, "pid": os.getpid()}
            # The record first: the design file is what makes a session recoverable, so a
            # process killed between the two writes never leaves a design without its record
            # (the file it came from would be lost).
            write_text_atomic(info_path, json.dumps(info, indent=2, ensure_ascii=False) + "\n")
            write_text_atomic(design_path, text)
        except DesignError as exc:
            return self._fail(f"Autosave failed: {exc.reason}")
        except OSError as exc:
            return self._fail(f"Autosave failed: cannot write to {self.folder()}: "
                              f"{exc.strerror or exc}")
        self._written = state
        self.last_error = ""
        self.saved.emit(design_path)
        return True

    def _fail(self, message: str) -> bool:
        self.last_error = message
        self.failed.emit(message)
        return False

    def _open_session(self) -> tuple[Path, Path]:
        """Make the folder and take this session's lock (once); its design and record paths."""
        folder = self.folder()
        if not self._session:
            folder.mkdir(parents=True, exist_ok=True)
            for _ in range(5):
                session = (f"{datetime.now().strftime('%Y%m%d-%H%M%S')}-{os.getpid()}-"
                           f"{uuid.uuid4().hex[:8]}")
                lock = _lock(_session_paths(folder, session)[2])
                if lock.tryLock(0):
                    self._session, self._lock, self._session_folder = session, lock, folder
                    _HELD.add(os.path.abspath(lock.fileName()))
                    break
            else:
                raise OSError(f"cannot lock a recovery session in {folder}")
        design_path, info_path, _ = _session_paths(folder, self._session)
        return design_path, info_path

    # ------------------------------------------------------------------ removing
    def discard(self) -> None:
        """Remove this session's autosaved files (the edits were saved or dropped)."""
        self._written = None
        if not self._session:
            return
        design_path, info_path, _ = _session_paths(self.folder(), self._session)
        for path in (info_path, design_path):
            try:
                path.unlink(missing_ok=True)
            except OSError:
                pass

    def close(self) -> None:
        """End the session cleanly: stop, remove its files and release its lock."""
        self.timer.stop()
        self.soon.stop()
        self.discard()
        if self._lock is not None:
            _HELD.discard(os.path.abspath(self._lock.fileName()))
            self._lock.unlock()
            self._lock = None
        self._session = ""
        self._session_folder = None

    def _on_dirty_changed(self, dirty: bool) -> None:
        if dirty:
            if not self.timer.isActive():
                self.timer.start()
            self._edited()
        else:
            self.timer.stop()
            self.soon.stop()
            self.discard()

    def _on_design_changed(self, _design: Design) -> None:
        if self.document.is_dirty:
            self._edited()

    def _edited(self) -> None:
        """(Re)start the short wait: edits in quick succession are written once, after the
        last one, or ``MAX_DELAY_S`` after the first when they go on."""
        now = time.monotonic()
        if not self.soon.isActive():
            self._first_pending = now
            self.soon.start()
        elif now - self._first_pending < MAX_DELAY_S:
            self.soon.start()
