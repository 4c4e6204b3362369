"""Where the window keeps what it remembers between sessions: layout, units, recent files,
the rate budget's ranges (a way of looking at designs, so not kept in the design file).

Settings live in an INI file under the user's configuration folder, organisation "Penduline"
(tests point ``QSettings.setPath`` at a temporary folder so the user's file is never touched).
"""

from __future__ import annotations

from pathlib import Path

from PySide6.QtCore import QSettings

from core import DesignError
from core.tuning import BudgetRanges, budget_ranges

__all__ = ["ORGANISATION", "APPLICATION", "MAX_RECENT", "BUDGET_KEYS", "app_settings",
           "recent_files", "add_recent_file", "stored_budget_ranges", "store_budget_ranges"]

ORGANISATION = "Penduline"
APPLICATION = "Penduline"
MAX_RECENT = 8
BUDGET_KEYS = ("temperature_k", "pressure_hpa", "arc_deg")
"""The rate budget's half-widths, as named by ``core.tuning.BudgetRanges`` (K, hPa, °)."""


def app_settings() -> QSettings:
    """The application's settings (INI format, user scope)."""
    return QSettings(QSettings.Format.IniFormat, QSettings.Scope.UserScope, ORGANISATION,
                     APPLICATION)


def recent_files() -> list[Path]:
    """Recently opened or saved design files, newest first, that still exist."""
    value = app_settings().value("files/recent", [])
    values: list[object] = [value] if isinstance(value, str) else list(value or [])  # type: ignore[call-overload]
    paths = [Path(str(v)) for v in values]
    return [p for p in paths if p.is_file()][:MAX_RECENT]


def add_recent_file(path: str | Path) -> list[Path]:
    """Put ``path`` first in the recent files; returns the new list."""
    resolved = Path(path).resolve()
    paths = [resolved] + [p for p in recent_files() if p.resolve() != resolved]
    paths = paths[:MAX_RECENT]
    app_settings().setValue("files/recent", [str(p) for p in paths])
    return paths


def stored_budget_ranges() -> BudgetRanges:
    """The rate budget's half-widths last chosen; the core's defaults where none was kept or
    what was kept is not usable (the core's :func:`~core.tuning.budget_ranges` judges)."""
    settings = app_settings()
    values = {}
    for key in BUDGET_KEYS:
        value = settings.value(f"budget/{key}")
        try:
            values[key] = float(value) if value is not None else getattr(BudgetRanges(), key)
        except (TypeError, ValueError):
            return BudgetRanges()
    try:
        return budget_ranges(**values)
    except DesignError:
        return BudgetRanges()


def store_budget_ranges(ranges: BudgetRanges) -> None:
    """Keep the rate budget's half-widths for the next session."""
    settings = app_settings()
    for key in BUDGET_KEYS:
        settings.setValue(f"budget/{key}", float(getattr(ranges, key)))
