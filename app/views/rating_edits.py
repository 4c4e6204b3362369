"""Edits of a design's rating log, as the rating view's table makes them: a cell typed, a
reading added "now", rows pasted from a spreadsheet or deleted.

Each function takes the immutable log (and the table's rows) and returns a new
:class:`core.rating_log.RatingLog` checked by the core's validator
(:func:`core.rating_log.rating_log_from_dict`), or raises :class:`core.DesignError` whose
``field`` names the table row and column ("row 4, Temperature") and whose message says why.
:func:`design_with_log` makes the new design through the core's validator, as
:mod:`app.form.design_edits` does. No Qt here; no physics.
"""

from __future__ import annotations

import csv
import dataclasses
import io
import re
from dataclasses import dataclass
from datetime import datetime, timedelta
from typing import Any

from app.form.units import UnitSystem, readout_unit
from core import Design, DesignError, design_from_dict, design_to_dict
from core.rating_log import (
    ADJUSTMENT_KINDS,
    CSV_COLUMNS,
    RatingLog,
    parse_time,
    rating_log_from_csv,
    rating_log_from_dict,
    rating_log_to_dict,
)

__all__ = ["Column", "COLUMNS", "Row", "table_rows", "with_cell", "with_rows_removed",
           "with_reading_now", "with_pasted", "design_with_log", "cell_text", "PASTE_HEADER"]


@dataclass(frozen=True)
class Column:
    """A table column: the log's key, its heading and the SI unit it is kept in."""

    key: str
    heading: str
    unit: str = ""


COLUMNS = (Column("at", "Time"), Column("what", "Kind"), Column("error_s", "Error", "s"),
           Column("temperature_c", "Temp.", "°C"),
           Column("pressure_hpa", "Pressure", "hPa"), Column("semi_arc_deg", "Arc", "°"),
           Column("amount", "Amount"), Column("note", "Note"))
_READING_KEYS = ("at", "error_s", "temperature_c", "pressure_hpa", "semi_arc_deg", "note")
_ADJUSTMENT_KEYS = ("at", "what", "amount", "note")
#: Columns assumed for pasted rows that carry no header of their own.
PASTE_HEADER = ("at", "error_s", "temperature_c", "pressure_hpa", "semi_arc_deg", "note")
AMOUNT_UNITS = {"nut": "turns up", "trim": "g added", "bob": "mm lowered", "set": "s",
                "other": ""}


@dataclass(frozen=True)
class Row:
    """One table row: a reading or an adjustment (``index`` into its list in the log)."""

    kind: str  # "reading" or "adjustment"
    index: int
    at: datetime


def table_rows(log: RatingLog | None) -> list[Row]:
    """Readings and adjustments merged in time order (an adjustment after a reading at the
    same instant)."""
    if log is None:
        return []
    rows = [Row("reading", i, r.at) for i, r in enumerate(log.readings)]
    rows += [Row("adjustment", j, a.at) for j, a in enumerate(log.adjustments)]
    return sorted(rows, key=lambda r: (r.at, r.kind != "reading", r.index))


def editable(row: Row, key: str) -> bool:
    """Whether the cell of ``row`` under column ``key`` can be typed in."""
    return key in (_READING_KEYS if row.kind == "reading" else _ADJUSTMENT_KEYS)


def _unit(key: str, system: UnitSystem) -> Any:
    unit = {"temperature_c": "°C", "pressure_hpa": "hPa"}.get(key)
    return None if unit is None else readout_unit(unit, system)


def cell_text(log: RatingLog, row: Row, key: str, system: UnitSystem = UnitSystem.METRIC) -> str:
    """What the table shows in a cell (display units; empty where nothing was noted)."""
    entry: Any = log.readings[row.index] if row.kind == "reading" else \
        log.adjustments[row.index]
    if key == "at":
        return entry.at.isoformat()
    if key == "what":
        return "reading" if row.kind == "reading" else entry.what
    if not editable(row, key):
        return ""
    value = getattr(entry, key)
    if key == "note":
        return str(value)
    if value is None:
        return ""
    unit = _unit(key, system)
    shown = float(value) if unit is None else unit.convert(float(value))
    return f"{shown:.6g}" if key != "error_s" else f"{shown:.3f}".rstrip("0").rstrip(".")


def _where(n: int, key: str) -> str:
    heading = next(c.heading for c in COLUMNS if c.key == key)
    return f"row {n + 1}, {heading}"


def _parsed(text: str, key: str, row_number: int, system: UnitSystem) -> Any:
    where = _where(row_number, key)
    text = text.strip()
    if key == "at":
        return parse_time(where, text).isoformat()
    if key in ("what", "note"):
        return text
    if not text:
        if key == "error_s":
            raise DesignError(where, "is empty: a reading needs the clock's error")
        return None
    try:
        value = float(text.replace(",", ".") if text.count(",") == 1 and "." not in text
                      else text)
    except ValueError:
        raise DesignError(where, f"{text!r} is not a number") from None
    unit = _unit(key, system)
    return value if unit is None else (value - unit.offset) / unit.scale


def _checked(raw: dict[str, Any], rows_of: dict[tuple[str, int], int]) -> RatingLog:
    """Sort each list by time and validate; a refusal names the table row and column."""
    for name in ("readings", "adjustments"):
        raw[name].sort(key=lambda e: datetime.fromisoformat(e["at"]))
    try:
        return rating_log_from_dict(raw)
    except DesignError as exc:
        m = re.match(r"rating_log\.(readings|adjustments)\[(\d+)\]\.(\w+)", exc.field)
        if not m:
            raise
        # after sorting, the entry's position may differ: find its row by time
        kind = "reading" if m.group(1) == "readings" else "adjustment"
        entry = raw[m.group(1)][int(m.group(2))]
        n = rows_of.get((kind, id(entry)), -1)
        key = m.group(3) if m.group(3) in {c.key for c in COLUMNS} else "at"
        where = _where(n, key) if n >= 0 else f"the new {kind}, {key}"
        raise DesignError(where, exc.reason) from None


def _editable_dict(log: RatingLog | None, rows: list[Row]
                   ) -> tuple[dict[str, Any], dict[tuple[str, int], int]]:
    raw = rating_log_to_dict(log if log is not None else RatingLog())
    where: dict[tuple[str, int], int] = {}
    for n, row in enumerate(rows):
        lst = raw["readings" if row.kind == "reading" else "adjustments"]
        if row.index < len(lst):
            where[(row.kind, id(lst[row.index]))] = n
    return raw, where


def with_cell(log: RatingLog, rows: list[Row], row_number: int, key: str, text: str,
              system: UnitSystem = UnitSystem.METRIC) -> RatingLog:
    """``log`` with the cell at table row ``row_number`` (0-based), column ``key``, set to
    ``text`` as typed (display units)."""
    row = rows[row_number]
    if not editable(row, key):
        raise DesignError(_where(row_number, key), "cannot be typed in for this kind of row")
    raw, where = _editable_dict(log, rows)
    entry = raw["readings" if row.kind == "reading" else "adjustments"][row.index]
    value = _parsed(text, key, row_number, system)
    if key == "what" and value not in ADJUSTMENT_KINDS:
        raise DesignError(_where(row_number, key),
                          f"{value!r} is not one of {', '.join(ADJUSTMENT_KINDS)}")
    entry[key] = value
    return _checked(raw, where)


def with_rows_removed(log: RatingLog, rows: list[Row], row_numbers: list[int]) -> RatingLog:
    """``log`` without the table rows ``row_numbers`` (0-based)."""
    gone = {(rows[n].kind, rows[n].index) for n in row_numbers}
    return RatingLog(
        tuple(r for i, r in enumerate(log.readings) if ("reading", i) not in gone),
        tuple(a for j, a in enumerate(log.adjustments) if ("adjustment", j) not in gone),
        log.decay)


def with_reading_now(log: RatingLog | None, now: datetime | None = None) -> tuple[RatingLog, int]:
    """``log`` with a reading at ``now`` (default: the local time with its offset, to the
    second), its error prefilled with the latest earlier reading's (0 for the first), to be
    typed over. Returns the log and the new reading's table row."""
    log = log if log is not None else RatingLog()
    at = (now or datetime.now().astimezone()).replace(microsecond=0)
    taken = {r.at for r in log.readings} | {a.at for a in log.adjustments}
    while at in taken:
        at += timedelta(seconds=1)
    earlier = [r for r in log.readings if r.at < at]
    error = earlier[-1].error_s if earlier else 0.0
    raw = rating_log_to_dict(log)
    raw["readings"].append({"at": at.isoformat(), "error_s": error})
    new = _checked(raw, {})
    rows = table_rows(new)
    number = next(n for n, r in enumerate(rows) if r.kind == "reading" and r.at == at)
    return new, number


def _as_csv(text: str) -> tuple[str, bool]:
    """Tab-separated (or comma-separated) text as CSV; a header row is added when the text
    has none. Returns the CSV and whether a header was added."""
    lines = [line for line in text.replace("\r\n", "\n").replace("\r", "\n").split("\n")]
    delimiter = "\t" if any("\t" in line for line in lines) else ","
    cells = list(csv.reader(io.StringIO("\n".join(lines)), delimiter=delimiter))
    cells = [row for row in cells if any(c.strip() for c in row)]
    added = not cells or not {c.strip().lower() for c in cells[0]} & set(CSV_COLUMNS)
    if added:
        width = max((len(r) for r in cells), default=2)
        cells.insert(0, list(PASTE_HEADER[:max(2, min(width, len(PASTE_HEADER)))]))
    out = io.StringIO()
    csv.writer(out, lineterminator="\n").writerows(cells)
    return out.getvalue(), added


def with_pasted(log: RatingLog | None, text: str) -> tuple[RatingLog, list[str]]:
    """``log`` with the rows of pasted spreadsheet text added (tab- or comma-separated; a
    first row naming columns is a header, otherwise the columns are :data:`PASTE_HEADER`).

    Bad rows are refused one by one (a sentence each, counting pasted lines from 1), and so
    is a row at the time of a row already in the log; the good ones are kept.
    """
    log = log if log is not None else RatingLog()
    csv_text, added = _as_csv(text)
    pasted, messages = rating_log_from_csv(csv_text)
    shift = 1 if added else 0

    def renumber(message: str) -> str:
        return re.sub(r"^row (\d+):", lambda m: f"pasted line {int(m.group(1)) - shift}:",
                      message)

    messages = [renumber(m) for m in messages]
    taken = {r.at for r in log.readings} | {a.at for a in log.adjustments}
    readings = list(log.readings)
    adjustments = list(log.adjustments)
    for entry in list(pasted.readings) + list(pasted.adjustments):
        if entry.at in taken:
            messages.append(f"the pasted row at {entry.at.isoformat()} has the time of a row "
                            "already in the log; refused")
            continue
        taken.add(entry.at)
        (readings if hasattr(entry, "error_s") else adjustments).append(entry)  # type: ignore[arg-type]
    new = RatingLog(tuple(sorted(readings, key=lambda r: r.at)),
                    tuple(sorted(adjustments, key=lambda a: a.at)),
                    log.decay + pasted.decay if not log.decay else log.decay)
    return rating_log_from_dict(rating_log_to_dict(new)), messages


def design_with_log(design: Design, log: RatingLog | None) -> Design:
    """``design`` carrying ``log`` (None, or an empty log: no rating log), through the core's
    validator."""
    if log is not None and not (log.readings or log.adjustments or log.decay):
        log = None
    return design_from_dict(design_to_dict(dataclasses.replace(design, rating_log=log)))
