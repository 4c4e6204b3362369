"""The rating log (DESIGN §8, ``rating_log``): readings, adjustments and decay readings.

A reading is the clock's error against a time reference (``error_s`` = clock − true time,
positive: the clock is ahead) at a time that carries its UTC offset, with the room's
conditions where they were noted. Adjustments (``nut`` turns up, ``trim`` grams added, ``bob``
mm lowered, ``set`` the clock was set, ``other``) split the log into segments. Decay readings
are semi-arcs against elapsed time with the drive removed.

Validation refuses with :class:`~core.errors.DesignError` whose ``field`` is the path of the
offending value (``rating_log.readings[3].at``). CSV import (:func:`rating_log_from_csv`)
refuses bad rows one by one with the row number and keeps the rest.
"""

from __future__ import annotations

import csv
import io
from dataclasses import dataclass
from datetime import datetime
from typing import Any, Literal

from .errors import DesignError, guarded

__all__ = ["Reading", "Adjustment", "DecayReading", "RatingLog", "ADJUSTMENT_KINDS",
           "CSV_COLUMNS", "rating_log_from_dict", "rating_log_to_dict", "rating_log_from_csv",
           "rating_log_to_csv", "parse_time"]

AdjustmentKind = Literal["nut", "trim", "bob", "set", "other"]
ADJUSTMENT_KINDS: tuple[str, ...] = ("nut", "trim", "bob", "set", "other")
MAX_ENTRIES = 100_000
MAX_NOTE = 200



@dataclass(frozen=True)
class Reading:
    """One comparison of the clock with a time reference.

    Attributes
    ----------
    at : datetime
        When, timezone-aware.
    error_s : float
        Clock reading minus true time, s (positive: the clock is ahead).
    temperature_c, pressure_hpa, semi_arc_deg : float or None
        Room temperature (°C), air pressure (hPa) and semi-arc (degrees), when noted.
    note : str
    """

    at: datetime
    error_s: float
    temperature_c: float | None = None
    pressure_hpa: float | None = None
    semi_arc_deg: float | None = None
    note: str = ""


@dataclass(frozen=True)
class Adjustment:
    """Something done to the clock: ``nut`` (turns, positive = up), ``trim`` (grams added),
    ``bob`` (mm lowered), ``set`` (the clock was set: the error jumps; amount in s, optional)
    or ``other`` (amount optional). Readings after it belong to a new segment."""

    at: datetime
    what: AdjustmentKind
    amount: float | None = None
    note: str = ""


@dataclass(frozen=True)
class DecayReading:
    """A semi-arc (degrees) ``elapsed_s`` seconds after the drive was removed."""

    elapsed_s: float
    semi_arc_deg: float


@dataclass(frozen=True)
class RatingLog:
    """Readings, adjustments and decay readings, each in time order."""

    readings: tuple[Reading, ...] = ()
    adjustments: tuple[Adjustment, ...] = ()
    decay: tuple[DecayReading, ...] = ()


# ----------------------------------------------------------------------------- checks

def _kind(value: Any) -> str:
    names = {bool: "true/false", int: "a number", float: "a number", str: "text",
             list: "a list", dict: "an object", type(None): "null"}
    return names.get(type(value), type(value).__name__)


# The table row of each CSV column (a CSV row is not a path into the file).
_CSV_SPEC = {"error_s": "rating_log.readings[].error_s",
             "temperature_c": "rating_log.readings[].temperature_c",
             "pressure_hpa": "rating_log.readings[].pressure_hpa",
             "semi_arc_deg": "rating_log.readings[].semi_arc_deg",
             "amount": "rating_log.adjustments[].amount",
             "elapsed_s": "rating_log.decay[].elapsed_s"}


def _number(path: str, key: str, value: Any) -> float:
    """``value`` checked as the number at ``path`` by the design's one number check (its range
    from the field table); a CSV cell (``path`` its column) is checked against its column's row."""
    from .validate import check_number  # validate reads this module: imported when first used

    spec_path = path if path.startswith("rating_log") else _CSV_SPEC[key]
    try:
        return check_number(spec_path, value)
    except DesignError as exc:
        if spec_path == path:
            raise
        raise DesignError(path, exc.reason) from None


def _text(path: str, value: Any) -> str:
    if not isinstance(value, str):
        raise DesignError(path, f"must be text, not {_kind(value)}")
    if len(value) > MAX_NOTE:
        raise DesignError(path, f"is longer than {MAX_NOTE} characters")
    try:
        value.encode("utf-8")
    except UnicodeEncodeError:
        raise DesignError(path, "contains a character that is not valid text") from None
    return value


def parse_time(path: str, value: Any) -> datetime:
    """An ISO 8601 date and time with its UTC offset (``2027-03-01T08:00:00+01:00``).

    Raises
    ------
    DesignError
        On ``path`` when the text is not such a time or has no offset.
    """
    if not isinstance(value, str):
        raise DesignError(path, f"must be an ISO 8601 time as text, not {_kind(value)}")
    try:
        t = datetime.fromisoformat(value.strip())
    except ValueError:
        raise DesignError(path, f"{value!r} is not an ISO 8601 date and time "
                                "(example: 2027-03-01T08:00:00+01:00)") from None
    if t.tzinfo is None or t.utcoffset() is None:
        raise DesignError(path, f"{value!r} has no UTC offset: add one, e.g. +01:00 or Z, "
                                "so that readings across a clock change stay in order")
    return t


def _time_text(t: datetime) -> str:
    return t.isoformat()


class _Obj:
    """One JSON object: keyed access with paths, unknown keys refused at the end."""

    def __init__(self, obj: Any, path: str) -> None:
        if not isinstance(obj, dict):
            raise DesignError(path, f"must be an object, not {_kind(obj)}")
        self.obj: dict[Any, Any] = obj
        self.path = path
        self.used: set[str] = set()

    def get(self, key: str, required: bool) -> Any:
        self.used.add(key)
        if key not in self.obj:
            if required:
                raise DesignError(f"{self.path}.{key}", "is missing (required)")
            return None
        return self.obj[key]

    def number(self, key: str, required: bool = True, nullable: bool = False) -> float | None:
        value = self.get(key, required)
        if value is None:
            if key in self.obj and not nullable:
                raise DesignError(f"{self.path}.{key}", "must be a number, not null")
            return None
        return _number(f"{self.path}.{key}", key, value)

    def note(self) -> str:
        value = self.get("note", False)
        return "" if value is None else _text(f"{self.path}.note", value)

    def done(self) -> None:
        extra = sorted(set(map(str, self.obj)) - self.used)
        if extra:
            raise DesignError(f"{self.path}.{extra[0]}", "is not a known key here")


def _list(obj: _Obj, key: str) -> list[Any]:
    value = obj.get(key, False)
    if value is None:
        return []
    if not isinstance(value, list):
        raise DesignError(f"{obj.path}.{key}", f"must be a list, not {_kind(value)}")
    if len(value) > MAX_ENTRIES:
        raise DesignError(f"{obj.path}.{key}", f"has more than {MAX_ENTRIES} entries")
    return value


def _in_order(path: str, key: str, times: list[Any], what: str) -> None:
    for i in range(1, len(times)):
        if times[i] == times[i - 1]:
            raise DesignError(f"{path}[{i}].{key}", f"is the same {what} as {path}[{i - 1}] "
                                                    "(a duplicate)")
        if times[i] < times[i - 1]:
            raise DesignError(f"{path}[{i}].{key}", f"is earlier than {path}[{i - 1}]: "
                                                    "entries must be in time order")


def _reading(item: Any, path: str) -> Reading:
    r = _Obj(item, path)
    at = parse_time(f"{path}.at", r.get("at", True))
    error = r.number("error_s")
    assert error is not None
    reading = Reading(at, error, r.number("temperature_c", False, True),
                      r.number("pressure_hpa", False, True),
                      r.number("semi_arc_deg", False, True), r.note())
    r.done()
    return reading


def _adjustment(item: Any, path: str) -> Adjustment:
    r = _Obj(item, path)
    at = parse_time(f"{path}.at", r.get("at", True))
    what = r.get("what", True)
    if what not in ADJUSTMENT_KINDS:
        raise DesignError(f"{path}.what", f"{what!r} is not one of {', '.join(ADJUSTMENT_KINDS)}")
    needs_amount = what in ("nut", "trim", "bob")
    amount = r.number("amount", needs_amount, nullable=not needs_amount)
    adj = Adjustment(at, what, amount, r.note())
    r.done()
    return adj


def _decay(item: Any, path: str) -> DecayReading:
    r = _Obj(item, path)
    elapsed, arc = r.number("elapsed_s"), r.number("semi_arc_deg")
    assert elapsed is not None and arc is not None
    r.done()
    return DecayReading(elapsed, arc)


@guarded("rating_log")
def rating_log_from_dict(obj: Any, path: str = "rating_log") -> RatingLog:
    """Validate the ``rating_log`` object of a design file (DESIGN §8).

    Raises
    ------
    DesignError
        ``field`` is the path of the offending value, e.g. ``rating_log.readings[3].at``.
    """
    top = _Obj(obj, path)
    readings = [_reading(x, f"{path}.readings[{i}]")
                for i, x in enumerate(_list(top, "readings"))]
    adjustments = [_adjustment(x, f"{path}.adjustments[{i}]")
                   for i, x in enumerate(_list(top, "adjustments"))]
    decay = [_decay(x, f"{path}.decay[{i}]") for i, x in enumerate(_list(top, "decay"))]
    top.done()
    _in_order(f"{path}.readings", "at", [r.at for r in readings], "time")
    _in_order(f"{path}.adjustments", "at", [a.at for a in adjustments], "time")
    _in_order(f"{path}.decay", "elapsed_s", [d.elapsed_s for d in decay], "elapsed time")
    reading_times = {r.at: i for i, r in enumerate(readings)}
    for j, a in enumerate(adjustments):
        if a.at in reading_times:
            raise DesignError(f"{path}.adjustments[{j}].at",
                              f"is the same time as {path}.readings[{reading_times[a.at]}], so "
                              "that reading belongs to neither segment: note the adjustment "
                              "a minute after the reading")
    return RatingLog(tuple(readings), tuple(adjustments), tuple(decay))


def rating_log_to_dict(log: RatingLog) -> dict[str, Any]:
    """The JSON form of a rating log (every key written; absent conditions as null)."""
    return {
        "readings": [{"at": _time_text(r.at), "error_s": r.error_s,
                      "temperature_c": r.temperature_c, "pressure_hpa": r.pressure_hpa,
                      "semi_arc_deg": r.semi_arc_deg, "note": r.note} for r in log.readings],
        "adjustments": [{"at": _time_text(a.at), "what": a.what, "amount": a.amount,
                         "note": a.note} for a in log.adjustments],
        "decay": [{"elapsed_s": d.elapsed_s, "semi_arc_deg": d.semi_arc_deg} for d in log.decay],
    }


# ----------------------------------------------------------------------------- CSV

#: Columns of the CSV form. ``kind`` is ``reading`` (or empty), an adjustment kind (``nut``,
#: ``trim``, ``bob``, ``set``, ``other``, using ``at``, ``amount`` and ``note``) or ``decay``
#: (using ``elapsed_s`` and ``semi_arc_deg``). Only ``at`` and ``error_s`` are required
#: columns; a file without ``kind`` holds readings only. Column order is free.
CSV_COLUMNS = ("kind", "at", "error_s", "temperature_c", "pressure_hpa", "semi_arc_deg",
               "amount", "note", "elapsed_s")
_CONDITIONS = ("temperature_c", "pressure_hpa", "semi_arc_deg")


def _cell_number(row: dict[str, str], key: str) -> float | None:
    text = (row.get(key) or "").strip()
    if not text:
        return None
    try:
        value = float(text)
    except ValueError:
        raise DesignError(key, f"{text!r} is not a number") from None
    return _number(key, key, value)


def _csv_row(row: dict[str, str]) -> Reading | Adjustment | DecayReading:
    kind = (row.get("kind") or "reading").strip().lower() or "reading"
    note = _text("note", row.get("note") or "")
    if kind == "decay":
        elapsed, arc = _cell_number(row, "elapsed_s"), _cell_number(row, "semi_arc_deg")
        if elapsed is None or arc is None:
            raise DesignError("elapsed_s", "a decay row needs elapsed_s and semi_arc_deg")
        return DecayReading(elapsed, arc)
    at = parse_time("at", (row.get("at") or "").strip() or None)
    if kind == "reading":
        error = _cell_number(row, "error_s")
        if error is None:
            raise DesignError("error_s", "is empty: a reading needs the clock's error")
        c = [_cell_number(row, k) for k in _CONDITIONS]
        return Reading(at, error, c[0], c[1], c[2], note)
    if kind not in ADJUSTMENT_KINDS:
        raise DesignError("kind", f"{kind!r} is not one of reading, decay, "
                                  f"{', '.join(ADJUSTMENT_KINDS)}")
    amount = _cell_number(row, "amount")
    if amount is None and kind in ("nut", "trim", "bob"):
        raise DesignError("amount", f"is empty: a {kind} adjustment needs its amount")
    return Adjustment(at, kind, amount, note)  # type: ignore[arg-type]


@guarded("csv")
def rating_log_from_csv(text: str) -> tuple[RatingLog, list[str]]:
    """Read a rating log from CSV text (columns: :data:`CSV_COLUMNS`, header first).

    Returns
    -------
    (RatingLog, list of str)
        The log from the good rows, and one sentence per refused row ("row 7: ...", counting
        the header as row 1, as a spreadsheet shows it). A row whose time is not later than the
        previous kept row of its kind (or equals a reading's time, for an adjustment) is
        refused too.

    Raises
    ------
    DesignError
        ``field='csv'`` when the header is unusable (no ``at``/``error_s`` column, an unknown
        or repeated column).
    """
    if not isinstance(text, str):
        raise DesignError("csv", f"must be text, not {_kind(text)}")
    reader = csv.reader(io.StringIO(text.lstrip("\ufeff")))
    header = next(reader, None)
    if header is None:
        raise DesignError("csv", "is empty: the first row must name the columns "
                                 f"({','.join(CSV_COLUMNS)})")
    names = [h.strip().lower() for h in header]
    for h in names:
        if h not in CSV_COLUMNS:
            raise DesignError("csv", f"column {h!r} is not known; the columns are "
                                     f"{', '.join(CSV_COLUMNS)} (units in the names)")
        if names.count(h) > 1:
            raise DesignError("csv", f"column {h!r} appears twice")
    if "at" not in names or "error_s" not in names:
        raise DesignError("csv", "needs at least the columns at and error_s")
    readings: list[Reading] = []
    adjustments: list[Adjustment] = []
    decay: list[DecayReading] = []
    messages: list[str] = []
    for cells in reader:
        number = reader.line_num
        if not any(c.strip() for c in cells):
            continue
        if len(cells) > len(names):
            messages.append(f"row {number}: has {len(cells)} cells but the header names "
                            f"{len(names)} columns; refused")
            continue
        row = dict(zip(names, cells, strict=False))
        try:
            entry = _csv_row(row)
        except DesignError as exc:
            messages.append(f"row {number}: {exc.field} {exc.reason}; refused")
            continue
        problem = _order_problem(entry, readings, adjustments, decay)
        if problem:
            messages.append(f"row {number}: {problem}; refused")
        elif isinstance(entry, Reading):
            readings.append(entry)
        elif isinstance(entry, Adjustment):
            adjustments.append(entry)
        else:
            decay.append(entry)
    return RatingLog(tuple(readings), tuple(adjustments), tuple(decay)), messages


def _order_problem(entry: Reading | Adjustment | DecayReading, readings: list[Reading],
                   adjustments: list[Adjustment], decay: list[DecayReading]) -> str:
    if isinstance(entry, DecayReading):
        if decay and entry.elapsed_s <= decay[-1].elapsed_s:
            return "elapsed_s is not later than the previous decay row's"
        return ""
    same = readings if isinstance(entry, Reading) else adjustments
    if same and entry.at == same[-1].at:
        return f"at {_time_text(entry.at)} is a duplicate of an earlier row's time"
    if same and entry.at < same[-1].at:
        return f"at {_time_text(entry.at)} is earlier than the row before it: rows must be " \
               "in time order"
    other = adjustments if isinstance(entry, Reading) else readings
    if any(o.at == entry.at for o in other):
        return f"at {_time_text(entry.at)} is the time of both a reading and an adjustment: " \
               "note the adjustment a minute after the reading"
    return ""


def _cell(value: float | None) -> str:
    return "" if value is None else repr(float(value))


def rating_log_to_csv(log: RatingLog) -> str:
    """The CSV form of a log: header :data:`CSV_COLUMNS`, readings and adjustments merged in
    time order, then the decay rows. :func:`rating_log_from_csv` reads it back unchanged."""
    out = io.StringIO()
    w = csv.writer(out, lineterminator="\n")
    w.writerow(CSV_COLUMNS)
    rows: list[tuple[datetime, int, list[str]]] = []
    for r in log.readings:
        rows.append((r.at, 0, ["reading", _time_text(r.at), _cell(r.error_s),
                               _cell(r.temperature_c), _cell(r.pressure_hpa),
                               _cell(r.semi_arc_deg), "", r.note, ""]))
    for a in log.adjustments:
        rows.append((a.at, 1, [a.what, _time_text(a.at), "", "", "", "", _cell(a.amount),
                               a.note, ""]))
    for _t, _k, cells in sorted(rows, key=lambda x: (x[0], x[1])):
        w.writerow(cells)
    for d in log.decay:
        w.writerow(["decay", "", "", "", "", _cell(d.semi_arc_deg), "", "", _cell(d.elapsed_s)])
    return out.getvalue()
