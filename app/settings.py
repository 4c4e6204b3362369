"""Where the window keeps what it remembers between sessions: layout, units, recent files.

Settings live in an INI file under the user's configuration folder, organisation "Penduline"
(tests point ``QSettings.setPath`` at a temporary folder so the user's file is never touched).
"""

from __future__ import annotations

from pathlib import Path

from PySide6.QtCore import QSettings

__all__ = ["ORGANISATION", "APPLICATION", "MAX_RECENT", "app_settings", "recent_files",
           "add_recent_file"]

ORGANISATION = "Penduline"
APPLICATION = "Penduline"
MAX_RECENT = 8


def app_settings() -> QSettings:
    """The application's settings (INI format, user scope)."""
    return QSettings(QSettings.Format.IniFormat, QSettings.Scope.UserScope, ORGANISATION,
                     APPLICATION)


def recent_files() -> list[Path]:
    """Recently opened or saved design files, newest first, that still exist."""
    value = app_settings().value("files/recent", [])
    if isinstance(value, str):
        value = [value]
    paths = [Path(str(v)) for v in (value or [])]
    return [p for p in paths if p.is_file()][:MAX_RECENT]


def add_recent_file(path: str | Path) -> list[Path]:
    """Put ``path`` first in the recent files; returns the new list."""
    resolved = Path(path).resolve()
    paths = [resolved] + [p for p in recent_files() if p.resolve() != resolved]
    paths = paths[:MAX_RECENT]
    app_settings().setValue("files/recent", [str(p) for p in paths])
    return paths
