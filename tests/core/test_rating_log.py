"""The rating log: validation of DESIGN §8's ``rating_log``, the dict and CSV round trips, and
bad rows refused one by one with their row number."""

from __future__ import annotations

import copy
import json
import runpy
from datetime import UTC, datetime, timedelta, timezone
from pathlib import Path
from typing import Any

import pytest

from core.errors import DesignError
from core.rating_log import (
    Adjustment,
    DecayReading,
    RatingLog,
    Reading,
    rating_log_from_csv,
    rating_log_from_dict,
    rating_log_to_csv,
    rating_log_to_dict,
)

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "resources" / "examples" / "rating_log_demo.json"


def _raw() -> dict[str, Any]:
    return {
        "readings": [
            {"at": "2027-03-01T08:00:00+01:00", "error_s": 1.25, "temperature_c": 19.5,
             "pressure_hpa": 1008.0, "semi_arc_deg": 1.55, "note": ""},
            {"at": "2027-03-02T08:00:00+01:00", "error_s": 2.5},
            {"at": "2027-03-03T08:00:00+01:00", "error_s": 3.0, "temperature_c": None},
            {"at": "2027-03-05T07:00:00Z", "error_s": 4.0, "note": "after the weekend"},
        ],
        "adjustments": [{"at": "2027-03-04T08:05:00+01:00", "what": "nut", "amount": -0.5,
                         "note": "half a turn down"},
                        {"at": "2027-03-04T08:06:00+01:00", "what": "set"}],
        "decay": [{"elapsed_s": 0.0, "semi_arc_deg": 1.60},
                  {"elapsed_s": 3600.0, "semi_arc_deg": 1.12}],
    }


def _refused(raw: Any) -> DesignError:
    with pytest.raises(DesignError) as info:
        rating_log_from_dict(raw)
    return info.value


def test_design_example_is_read() -> None:
    log = rating_log_from_dict(_raw())
    assert len(log.readings) == 4 and len(log.adjustments) == 2 and len(log.decay) == 2
    r0 = log.readings[0]
    assert r0.at == datetime(2027, 3, 1, 7, 0, tzinfo=UTC)
    assert (r0.error_s, r0.temperature_c, r0.pressure_hpa, r0.semi_arc_deg) == (
        1.25, 19.5, 1008.0, 1.55)
    assert log.readings[1].temperature_c is None and log.readings[2].temperature_c is None
    assert log.adjustments[0].what == "nut" and log.adjustments[0].amount == -0.5
    assert log.adjustments[1].amount is None
    assert log.readings[3].at.utcoffset() == timedelta(0)


def test_dict_round_trip() -> None:
    log = rating_log_from_dict(_raw())
    again = rating_log_from_dict(json.loads(json.dumps(rating_log_to_dict(log))))
    assert again == log


@pytest.mark.parametrize("edit, field, words", [
    (lambda r: r["readings"][1].update(at="2027-03-02T08:00:00"), "rating_log.readings[1].at",
     "offset"),
    (lambda r: r["readings"][2].update(at="2027-03-01T12:00:00+01:00"),
     "rating_log.readings[2].at", "earlier"),
    (lambda r: r["readings"][1].update(at="2027-03-01T07:00:00Z"), "rating_log.readings[1].at",
     "duplicate"),
    (lambda r: r["readings"][1].update(at="yesterday"), "rating_log.readings[1].at",
     "ISO 8601"),
    (lambda r: r["readings"][1].update(at=20270302), "rating_log.readings[1].at", "text"),
    (lambda r: r["readings"][3].update(error_s="4.0"), "rating_log.readings[3].error_s",
     "number"),
    (lambda r: r["readings"][3].update(error_s=True), "rating_log.readings[3].error_s",
     "number"),
    (lambda r: r["readings"][3].update(error_s=float("nan")), "rating_log.readings[3].error_s",
     "finite"),
    (lambda r: r["readings"][3].pop("error_s"), "rating_log.readings[3].error_s", "missing"),
    (lambda r: r["readings"][0].update(temperature_c=101.0),
     "rating_log.readings[0].temperature_c", "[-80, 100]"),
    (lambda r: r["readings"][0].update(temperature_c=-80.5),
     "rating_log.readings[0].temperature_c", "out of range"),
    (lambda r: r["readings"][0].update(pressure_hpa=1300.0),
     "rating_log.readings[0].pressure_hpa", "[0, 1200]"),
    (lambda r: r["readings"][0].update(semi_arc_deg=0.0), "rating_log.readings[0].semi_arc_deg",
     "(0, 179.9]"),
    (lambda r: r["readings"][0].update(semi_arc_deg=180.0),
     "rating_log.readings[0].semi_arc_deg", "out of range"),
    (lambda r: r["readings"][0].update(humidity=40), "rating_log.readings[0].humidity",
     "not a known key"),
    (lambda r: r["readings"][0].update(note=3), "rating_log.readings[0].note", "text"),
    (lambda r: r["adjustments"][0].update(what="wind"), "rating_log.adjustments[0].what",
     "nut, trim, bob, set, other"),
    (lambda r: r["adjustments"][0].pop("amount"), "rating_log.adjustments[0].amount", "missing"),
    (lambda r: r["adjustments"][0].update(at="2027-03-02T08:00:00+01:00"),
     "rating_log.adjustments[0].at", "readings[1]"),
    (lambda r: r["adjustments"][1].update(at="2027-03-04T08:00:00+01:00"),
     "rating_log.adjustments[1].at", "earlier"),
    (lambda r: r["decay"][1].update(elapsed_s=0.0), "rating_log.decay[1].elapsed_s",
     "duplicate"),
    (lambda r: r["decay"][1].update(semi_arc_deg=-1.0), "rating_log.decay[1].semi_arc_deg",
     "out of range"),
    (lambda r: r.update(readings={}), "rating_log.readings", "list"),
    (lambda r: r.update(comment="x"), "rating_log.comment", "not a known key"),
    (lambda r: r["readings"].__setitem__(2, [1, 2]), "rating_log.readings[2]", "object"),
])
def test_bad_input_names_the_reading_and_field(edit: Any, field: str, words: str) -> None:
    raw = copy.deepcopy(_raw())
    edit(raw)
    err = _refused(raw)
    assert err.field == field
    assert words in str(err)
    assert isinstance(err, ValueError)


def test_limits_of_the_ranges_are_accepted() -> None:
    raw = _raw()
    raw["readings"][0].update(temperature_c=-80, pressure_hpa=0, semi_arc_deg=179.9)
    raw["readings"][1].update(temperature_c=100.0, pressure_hpa=1200.0, semi_arc_deg=1e-6)
    log = rating_log_from_dict(raw)
    assert log.readings[0].temperature_c == -80.0 and log.readings[1].pressure_hpa == 1200.0


def test_not_an_object_is_refused() -> None:
    assert _refused([1, 2]).field == "rating_log"
    assert _refused(None).field == "rating_log"


def test_empty_log_is_valid() -> None:
    assert rating_log_from_dict({}) == RatingLog()


# ----------------------------------------------------------------------------- CSV

def test_csv_round_trip_keeps_everything() -> None:
    log = rating_log_from_dict(_raw())
    text = rating_log_to_csv(log)
    assert text.splitlines()[0] == ("kind,at,error_s,temperature_c,pressure_hpa,semi_arc_deg,"
                                    "amount,note,elapsed_s")
    again, messages = rating_log_from_csv(text)
    assert messages == []
    assert again == log


def test_csv_round_trip_of_the_demo_log() -> None:
    log = rating_log_from_dict(json.loads(DEMO.read_text(encoding="utf-8"))["rating_log"])
    again, messages = rating_log_from_csv(rating_log_to_csv(log))
    assert messages == [] and again == log


def test_csv_readings_only_in_any_column_order() -> None:
    text = ("note,error_s,at,temperature_c\n"
            "\"cold, windy\",1.5,2027-01-05T09:00:00+01:00,12.5\n"
            ",2.0,2027-01-06T09:00:00+01:00,\n")
    log, messages = rating_log_from_csv(text)
    assert messages == []
    assert [r.error_s for r in log.readings] == [1.5, 2.0]
    assert log.readings[0].note == "cold, windy" and log.readings[0].temperature_c == 12.5
    assert log.readings[1].temperature_c is None


def test_csv_bad_rows_are_refused_with_their_number_and_the_rest_kept() -> None:
    text = "\n".join([
        "kind,at,error_s,temperature_c,pressure_hpa,semi_arc_deg,amount,note",
        "reading,2027-03-01T08:00:00+01:00,1.0,19,1010,1.6,,",        # row 2: good
        "reading,2027-03-02T08:00:00+01:00,abc,19,1010,1.6,,",        # row 3: not a number
        "reading,2027-03-03T08:00:00,3.0,19,1010,1.6,,",              # row 4: no offset
        "reading,2027-03-04T08:00:00+01:00,4.0,150,1010,1.6,,",       # row 5: too hot
        "reading,2027-03-05T08:00:00+01:00,5.0,19,1010,1.6,,",        # row 6: good
        "reading,2027-03-04T09:00:00+01:00,4.5,19,1010,1.6,,",        # row 7: out of order
        "reading,2027-03-05T08:00:00+01:00,5.0,19,1010,1.6,,",        # row 8: duplicate
        "nut,2027-03-05T08:10:00+01:00,,,,,,",                        # row 9: no amount
        "wind,2027-03-05T08:20:00+01:00,,,,,1,",                      # row 10: unknown kind
        "nut,2027-03-05T08:30:00+01:00,,,,,-0.25,quarter down",       # row 11: good
        "reading,2027-03-06T08:00:00+01:00,6.0,19,1010,1.6,,,extra",  # row 12: extra cell
        "",
        "reading,2027-03-07T08:00:00+01:00,7.0,,,0,,",                # row 14: arc 0
        "reading,2027-03-08T08:00:00+01:00,8.0,,,,,",                 # row 15: good
    ])
    log, messages = rating_log_from_csv(text)
    assert [r.error_s for r in log.readings] == [1.0, 5.0, 8.0]
    assert [(a.what, a.amount) for a in log.adjustments] == [("nut", -0.25)]
    rows = [int(m.split(":")[0].split()[1]) for m in messages]
    assert rows == [3, 4, 5, 7, 8, 9, 10, 12, 14]
    by_row = dict(zip(rows, messages, strict=True))
    assert "error_s" in by_row[3] and "not a number" in by_row[3]
    assert "offset" in by_row[4]
    assert "temperature_c" in by_row[5] and "out of range" in by_row[5]
    assert "earlier" in by_row[7]
    assert "duplicate" in by_row[8]
    assert "amount" in by_row[9]
    assert "'wind'" in by_row[10]
    assert "cells" in by_row[12]
    assert "semi_arc_deg" in by_row[14]
    assert all(m.endswith("refused") for m in messages)


def test_csv_adjustment_at_a_reading_time_is_refused() -> None:
    text = ("kind,at,error_s,amount\n"
            "reading,2027-03-01T08:00:00+01:00,1.0,\n"
            "set,2027-03-01T08:00:00+01:00,,\n")
    log, messages = rating_log_from_csv(text)
    assert len(log.readings) == 1 and log.adjustments == ()
    assert messages[0].startswith("row 3:") and "reading and an adjustment" in messages[0]


@pytest.mark.parametrize("text, words", [
    ("", "empty"),
    ("time,error\n", "column 'time' is not known"),
    ("at,error_s,at\n", "twice"),
    ("at,temperature_c\n", "at and error_s"),
])
def test_csv_unusable_header_is_refused(text: str, words: str) -> None:
    with pytest.raises(DesignError) as info:
        rating_log_from_csv(text)
    assert info.value.field == "csv" and words in str(info.value)


def test_csv_header_names_units_and_byte_order_mark_is_ignored() -> None:
    text = "\ufeffat,error_s,temperature_c,pressure_hpa,semi_arc_deg\n" \
           "2027-03-01T08:00:00+01:00,0.5,20.5,1001.5,1.62\n"
    log, messages = rating_log_from_csv(text)
    assert messages == [] and log.readings[0].pressure_hpa == 1001.5


def test_objects_made_in_code_compare_with_parsed_ones() -> None:
    tz = timezone(timedelta(hours=1))
    log = RatingLog((Reading(datetime(2027, 3, 1, 8, tzinfo=tz), 1.25, 19.5, 1008.0, 1.55),),
                    (Adjustment(datetime(2027, 3, 4, 8, 5, tzinfo=tz), "nut", -0.5, "x"),),
                    (DecayReading(0.0, 1.6),))
    assert rating_log_from_dict(rating_log_to_dict(log)) == log


def test_demo_file_is_reproduced_by_its_script_and_is_valid() -> None:
    module = runpy.run_path(str(DEMO.with_name("make_rating_demo.py")))
    built = module["build"]()
    stored = json.loads(DEMO.read_text(encoding="utf-8"))
    assert built == stored
    assert "Invented" in stored["comment"]
    log = rating_log_from_dict(stored["rating_log"])
    assert len(log.readings) == 31 and [a.what for a in log.adjustments] == ["nut", "set"]
    assert len(log.decay) >= 3


# ----------------------------------------------------------------------------- garbage in

from hypothesis import given, settings  # noqa: E402
from hypothesis import strategies as st  # noqa: E402

_SCALARS = st.one_of(st.none(), st.booleans(), st.integers(-10**20, 10**20),
                     st.floats(allow_nan=True, allow_infinity=True), st.text(max_size=30),
                     st.sampled_from(["2027-03-01T08:00:00+01:00", "2027-03-01T08:00:00",
                                      "nut", "set", "reading", "decay"]))
_JSON = st.recursive(_SCALARS, lambda inner: st.one_of(
    st.lists(inner, max_size=4),
    st.dictionaries(st.sampled_from(["readings", "adjustments", "decay", "at", "error_s",
                                     "temperature_c", "what", "amount", "elapsed_s",
                                     "semi_arc_deg", "note", "x"]), inner, max_size=5)),
    max_leaves=20)


@pytest.mark.slow
@settings(max_examples=150, deadline=None, derandomize=True, database=None)
@given(_JSON)
def test_any_json_gives_a_log_or_a_design_error(raw: Any) -> None:
    try:
        rating_log_from_dict(raw)
    except DesignError as err:
        assert err.field.startswith("rating_log")


@pytest.mark.slow
@settings(max_examples=150, deadline=None, derandomize=True, database=None)
@given(st.lists(st.lists(st.one_of(_SCALARS.map(str), st.sampled_from(
    ["1.5", "-0.2", "20", "1e400", "nan", ""])), max_size=10), max_size=6))
def test_any_csv_gives_a_log_or_a_design_error(rows: list[list[str]]) -> None:
    import csv
    import io
    out = io.StringIO()
    w = csv.writer(out)
    w.writerow(["kind", "at", "error_s", "temperature_c", "pressure_hpa", "semi_arc_deg",
                "amount", "note", "elapsed_s"])
    w.writerows(rows)
    log, messages = rating_log_from_csv(out.getvalue())
    assert all(m.startswith("row ") for m in messages)
    assert rating_log_from_dict(rating_log_to_dict(log)) == log
