"""Design files: reading, writing (atomically) and editing by field path.

The validator itself is :mod:`core.validate` (format 1 and 2 read; format 2 written); the facts
about each field (label, unit, range, default) are in :mod:`core.fields`. Every refusal is a
:class:`~core.errors.DesignError` whose ``field`` is the path of the offending value in the file
(``parts[1].length_m``). Reading never changes the file; saving writes a temporary file beside
the target and renames it over the old one.
"""

from __future__ import annotations

import json
import os
import stat
from dataclasses import replace
from pathlib import Path
from typing import Any

from .atomic_write import FileStamp
from .atomic_write import write_text_atomic as _atomic_write
from .design import Bob, ClampMount, Design, Part, Rod, Sleeve
from .errors import DesignError, guarded
from .fields import FieldPath, field_spec
from .validate import (
    FORMAT,
    SECTIONS,
    VERSION,
    check_number,
    design_from_dict,
    is_validated,
    mark_validated,
)
from .validate_parts import BOB_SIZE_KEYS

__all__ = [
    "FORMAT", "VERSION", "MAX_FILE_BYTES", "design_from_dict", "design_to_dict", "loads_design",
    "dumps_design", "load_design", "save_design", "with_value", "get_value", "set_in_dict",
    "field_range", "check_number", "read_design_dict", "write_text_atomic",
]

MAX_FILE_BYTES = 5_000_000
MAX_INT_DIGITS = 30  # a whole number longer than this is no measurement


def field_range(path: str) -> tuple[float, float, bool, bool]:
    """The allowed range ``(low, high, low_open, high_open)`` of the numeric field at ``path``,
    from the field table (:mod:`core.fields`)."""
    try:
        spec = field_spec(path)
    except (KeyError, ValueError):
        spec = None
    if spec is None or spec.low is None or spec.high is None:
        raise DesignError(path, "is not a numeric field of the design")
    return spec.low, spec.high, spec.low_open, spec.high_open


# ----------------------------------------------------------------------------- writing

def _part_to_dict(p: Part) -> dict[str, Any]:
    if isinstance(p, Rod):
        d: dict[str, Any] = {"kind": "rod", "name": p.name, "material": p.material}
        if p.hangs_from is not None:
            d["hangs_from"] = {"part": p.hangs_from.part, "end": p.hangs_from.end}
        else:
            d["top_m"] = p.top_m
        d.update({"length_m": p.length_m, "diameter_m": p.diameter_m, "mass_kg": p.mass_kg})
        return d
    if isinstance(p, Sleeve):
        return {"kind": "sleeve", "name": p.name, "material": p.material, "on": p.on,
                "length_m": p.length_m, "outer_diameter_m": p.outer_diameter_m,
                "inner_diameter_m": p.inner_diameter_m, "mass_kg": p.mass_kg}
    if isinstance(p, Bob):
        mount: dict[str, Any] = {"kind": p.mount.kind, "on": p.mount.on}
        if isinstance(p.mount, ClampMount):
            mount["centre_m"] = p.mount.centre_m
        d = {"kind": "bob", "name": p.name, "shape": p.shape, "material": p.material,
             "mount": mount, "diameter_m": p.diameter_m}
        for key in BOB_SIZE_KEYS[p.shape]:
            d[key] = getattr(p, key)
        if p.mount.kind == "on_sleeve":
            d["support"] = p.support
        if p.hole_diameter_m is not None:
            d["hole_diameter_m"] = p.hole_diameter_m
        d["mass_kg"] = p.mass_kg
        return d
    return {"kind": "weight", "name": p.name, "mass_kg": p.mass_kg, "at_m": p.at_m, "on": p.on}


def _suspension_to_dict(design: Design) -> dict[str, Any]:
    sus = design.suspension
    if sus.blades is None:
        return {"kind": sus.kind, "stiffness_n_m_per_rad": sus.stiffness_n_m_per_rad}
    b = sus.blades
    return {"kind": sus.kind, "stiffness_n_m_per_rad": None,
            "blades": {"count": b.count, "material": b.material, "width_m": b.width_m,
                       "thickness_m": b.thickness_m, "free_length_m": b.free_length_m}}


def design_to_dict(design: Design, without: tuple[str, ...] = ()) -> dict[str, Any]:
    """The file form (format 2) of ``design``; every key written, SI units. ``without``
    names optional top-level sections to leave out (``("rating_log",)``: a form that edits
    everything but the log need not write every reading on each edit).

    Raises
    ------
    TypeError
        When ``design`` is not a :class:`~core.design.Design`.
    """
    from .validate import _write_materials

    if not isinstance(design, Design):
        raise TypeError(f"design_to_dict needs a Design, not {type(design).__name__}")
    s = design.site
    d: dict[str, Any] = {
        "format": FORMAT, "version": VERSION, "name": design.name, "purpose": design.purpose,
        "reference_temperature_c": design.reference_temperature_c,
    }
    if design.materials:
        d["materials"] = _write_materials(design)
    d.update({
        "site": {"latitude_deg": s.latitude_deg, "elevation_m": s.elevation_m,
                 "g_m_s2": s.g_m_s2, "temperature_c": s.temperature_c,
                 "pressure_hpa": s.pressure_hpa},
        "suspension": _suspension_to_dict(design),
        "parts": [_part_to_dict(p) for p in design.parts],
        "swing": {"amplitude_deg": design.swing.amplitude_deg,
                  "quality_factor": design.swing.quality_factor},
    })
    t = design.target
    if t.beats_per_hour is not None:
        d["target"] = {"beats_per_hour": t.beats_per_hour}
    else:
        d["target"] = {"period_s": t.period_s}
    d["rating_nut"] = {"pitch_m": design.rating_nut.pitch_m}
    for section in SECTIONS:
        if section.key not in without and section.present(design):
            d[section.key] = section.write(design)
    return d


@guarded("file")
def loads_design(text: str | bytes) -> Design:
    """Parse and validate design-file text (``TypeError`` for anything but text or bytes)."""
    if not isinstance(text, (str, bytes)):
        raise TypeError(f"loads_design needs the file's text (str or bytes), not "
                        f"{type(text).__name__}")
    return design_from_dict(_loads_json(text))


def _loads_json(text: str | bytes) -> Any:
    if isinstance(text, bytes):
        if len(text) > MAX_FILE_BYTES:
            raise DesignError("file", f"is {len(text)} bytes; a design file is at most "
                                      f"{MAX_FILE_BYTES} bytes")
        wide = text[:2] in (b"\xff\xfe", b"\xfe\xff") or b"\x00" in text[:200]
        hint = "; it looks like UTF-16 or UTF-32: save it as UTF-8" if wide else ""
        try:
            decoded = text.decode("utf-8-sig")
        except UnicodeDecodeError as exc:
            raise DesignError("file", f"is not UTF-8 text (byte {exc.start}){hint}") from None
        if "\x00" in decoded:
            raise DesignError("file", f"is not UTF-8 text (byte {text.index(0)}){hint}")
        text = decoded
    if len(text) > MAX_FILE_BYTES:
        raise DesignError("file", f"is longer than {MAX_FILE_BYTES} characters")
    if not text.strip():
        raise DesignError("file", "is empty")
    try:
        return json.loads(text, parse_constant=_refuse_constant, parse_int=_parse_int,
                          object_pairs_hook=_no_duplicate_keys)
    except DesignError:
        raise
    except RecursionError:
        raise DesignError("file", "is nested too deeply to be a design") from None
    except json.JSONDecodeError as exc:
        raise DesignError("file", f"is not valid JSON (line {exc.lineno}, column {exc.colno}: "
                                  f"{exc.msg})") from None
    except ValueError as exc:
        raise DesignError("file", f"is not valid JSON ({exc})") from None


def _refuse_constant(name: str) -> Any:
    raise DesignError("file", f"contains {name}, which is not a number JSON allows")


def _parse_int(digits: str) -> int:
    if len(digits.lstrip("-")) > MAX_INT_DIGITS:
        raise DesignError("file", f"contains a whole number of {len(digits.lstrip('-'))} "
                                  "digits, which is too large to be a design value")
    return int(digits)


def _no_duplicate_keys(pairs: list[tuple[str, Any]]) -> dict[str, Any]:
    out: dict[str, Any] = {}
    for key, value in pairs:
        if key in out:
            raise DesignError("file", f"the key {key!r} appears twice in the same object; "
                                      "keep one")
        out[key] = value
    return out


def dumps_design(design: Design) -> str:
    """The file text of ``design`` (UTF-8 JSON, two-space indent, newline at the end)."""
    return json.dumps(design_to_dict(design), indent=2, ensure_ascii=False) + "\n"


def _check_path(func: str, path: Any) -> None:
    if not isinstance(path, (str, os.PathLike)):
        raise TypeError(f"{func} needs a file path (text or a path object), not "
                        f"{type(path).__name__}")


@guarded("file")
def load_design(path: str | os.PathLike[str]) -> Design:
    """Read and validate a design file; the file is never changed."""
    _check_path("load_design", path)
    return loads_design(_read_bytes(path))


@guarded("file")
def read_design_dict(path: str | os.PathLike[str]) -> Any:
    """The raw JSON object of a design file (not validated beyond JSON itself)."""
    _check_path("read_design_dict", path)
    return _loads_json(_read_bytes(path))


def _read_bytes(path: str | os.PathLike[str]) -> bytes:
    p = Path(path)
    try:
        info = p.stat()
        if stat.S_ISDIR(info.st_mode):
            raise DesignError("file", f"{p} is a folder, not a design file")
        if not stat.S_ISREG(info.st_mode):
            raise DesignError("file", f"{p} is not a regular file (a pipe or a device)")
        size = info.st_size
        if size > MAX_FILE_BYTES:
            raise DesignError("file", f"{p.name} is {size} bytes; a design file is at most "
                                      f"{MAX_FILE_BYTES} bytes")
        return p.read_bytes()
    except DesignError:
        raise
    except FileNotFoundError:
        raise DesignError("file", f"{p} does not exist") from None
    except IsADirectoryError:
        raise DesignError("file", f"{p} is a folder, not a design file") from None
    except OSError as exc:
        raise DesignError("file", f"{p} cannot be read ({exc.strerror or exc})") from None


@guarded("file")
def save_design(design: Design, path: str | os.PathLike[str], *,
                expect: FileStamp | None = None, force: bool = False) -> FileStamp:
    """Validate ``design`` and write it to ``path`` atomically (temporary file, flush, rename;
    see :mod:`core.atomic_write`).

    A design that does not validate is refused before anything is written. ``expect`` is the
    file's stamp when it was opened (:func:`core.atomic_write.file_stamp`) or the one the last
    save returned: when the file was changed on disk since, the save is refused
    (:class:`~core.atomic_write.FileChangedError`) unless ``force``.

    Returns
    -------
    FileStamp
        The file as written; pass it as ``expect`` to the next save.

    Raises
    ------
    FileChangedError, ReadOnlyFileError, DesignError
        ``field="file"`` (or the offending field); the file on disk is then untouched.
    """
    _check_path("save_design", path)
    text = dumps_design(design)
    design_from_dict(json.loads(text))
    return _atomic_write(path, text, expect=expect, force=force)


@guarded("file")
def write_text_atomic(path: str | os.PathLike[str], text: str) -> None:
    """Write ``text`` (UTF-8) to ``path`` through a temporary file renamed over it.

    Raises
    ------
    DesignError
        ``field='file'`` when the folder cannot be written; the old file is then untouched.
    """
    _atomic_write(path, text)  # the one writer: core.atomic_write


# ----------------------------------------------------------------------------- field paths

def _steps(path: str) -> tuple[str | int, ...]:
    if not isinstance(path, str):
        raise TypeError(f"a field path is text, not {type(path).__name__}")
    try:
        return FieldPath.parse(path).steps
    except ValueError:
        raise DesignError(path, "is not a field path (example: parts[2].mount.centre_m)"
                          ) from None


@guarded("field")
def get_value(obj: Any, path: str) -> Any:
    """The value at ``path`` in a design dict."""
    cur = obj
    for step in _steps(path):
        try:
            cur = cur[step]
        except (KeyError, IndexError, TypeError):
            raise DesignError(path, "no such field in this design") from None
    return cur


@guarded("field")
def set_in_dict(obj: Any, path: str, value: Any) -> Any:
    """A new design dict equal to ``obj`` with ``path`` set to ``value`` (the key must exist
    or its parent object must). ``obj`` is left as it was: the objects along the path are
    copied, the rest is shared with ``obj`` (neither is changed afterwards by the core)."""
    steps = _steps(path)
    new = _shallow(obj, path)
    cur = new
    for step in steps[:-1]:
        try:
            child = cur[step]
        except (KeyError, IndexError, TypeError):
            raise DesignError(path, "no such field in this design") from None
        cur[step] = child = _shallow(child, path)
        cur = child
    last = steps[-1]
    if isinstance(last, int):
        if not isinstance(cur, list) or not 0 <= last < len(cur):
            raise DesignError(path, "no such field in this design")
    elif not isinstance(cur, dict):
        raise DesignError(path, "no such field in this design")
    cur[last] = value
    return new


def _shallow(obj: Any, path: str) -> Any:
    """A copy of one dict or list of a design dict (its contents shared)."""
    if isinstance(obj, dict):
        return dict(obj)
    if isinstance(obj, list):
        return list(obj)
    raise DesignError(path, "no such field in this design")


@guarded("field")
def with_value(design: Design, path: str, value: Any) -> Design:
    """A new validated design equal to ``design`` but with ``path`` set to ``value``.

    The rating log is read on its own (it refers to nothing else in the file), so an edit
    elsewhere keeps the validated log as it is instead of reading every reading again.
    """
    log = design.rating_log
    if (log is None or path.split(".")[0].split("[")[0] in ("rating_log", "version", "format")
            or not is_validated(design)):
        return design_from_dict(set_in_dict(design_to_dict(design), path, value))
    text = design_to_dict(design, without=("rating_log",))
    return mark_validated(replace(design_from_dict(set_in_dict(text, path, value)),
                                  rating_log=log))
