"""A design field's words for the window, read from the core's field table: its label, its
help sentence, and the sentence a refused value gets.

The command line keeps the field path in its messages (``parts[0].length_m: …``); the window
never shows a file key or an SI value: :func:`window_message` turns a :class:`core.DesignError`
into a sentence in the form's words and the chosen display unit (“Rod length must be between
0.1 mm and 1000 m.”).
"""

from __future__ import annotations

import re

from app.form.units import UnitSystem, field_unit, format_sig, quantity_text
from core import DesignError
from core.fields import FieldPath, FieldSpec, choice_label, field_spec

__all__ = ["label_of", "help_of", "spec_of", "window_message", "range_sentence", "setting_reason",
           "choice_label"]

_WHOLE_DESIGN = ("design", "file", "parts", "")


def spec_of(path: str, kind: str | None = None) -> FieldSpec | None:
    """The field table's row for ``path`` (None for paths outside the table)."""
    try:
        return field_spec(path, kind)
    except (KeyError, ValueError, TypeError):
        return None


def label_of(path: str, kind: str | None = None) -> str:
    """The form's label for ``path`` (``parts[2].mount.centre_m`` → “Bob centre”)."""
    if path == "target.kind":
        return "Target"
    spec = spec_of(path, kind)
    if spec is not None:
        return spec.label
    if path in _WHOLE_DESIGN:
        return "Design"
    try:
        key = FieldPath.parse(path).key
    except (ValueError, TypeError):
        key = path
    return choice_label("", key)


def help_of(path: str, kind: str | None = None) -> str:
    """The field table's help sentence for ``path`` ("" when it has none)."""
    spec = spec_of(path, kind)
    return spec.help if spec is not None else ""


def range_sentence(spec: FieldSpec, system: UnitSystem, path: str = "") -> str:
    """“must be between 0.1 mm and 1000 m” in ``system``'s units (ends excluded said so)."""
    assert spec.low is not None and spec.high is not None
    unit = field_unit(path or spec.pattern, system)
    lo, hi = spec.low, spec.high
    if unit.reciprocal:  # threads per inch: the ends swap
        lo, hi = hi, lo
        low_open, high_open = spec.high_open, spec.low_open
    else:
        low_open, high_open = spec.low_open, spec.high_open
    path = path or spec.pattern
    lo_text = quantity_text(lo, spec.unit, system, path)
    hi_text = quantity_text(hi, spec.unit, system, path)
    if unit.reciprocal and spec.low == 0.0:
        return f"must be at least {lo_text}"
    if low_open and not high_open:
        return f"must be more than {lo_text} and at most {hi_text}"
    if high_open and not low_open:
        return f"must be at least {lo_text} and less than {hi_text}"
    return f"must be between {lo_text} and {hi_text}"


_INTERVAL = re.compile(r"must be in \[\s*([-+0-9.e]+)\s*,\s*([-+0-9.e]+)\s*\]")


def setting_reason(error: DesignError, system: UnitSystem) -> str:
    """Why a window setting outside the design (a budget half-width) was refused, in the
    display unit: “must be between 0 and 180 °F” rather than “temperature_k=200 …”."""
    match = _INTERVAL.search(error.reason)
    if match is None:
        return _metres_shown(_without_keys(error.reason), system)
    unit = field_unit(str(error.field), system)
    lo, hi = (format_sig(unit.to_display(float(v)), 4) for v in match.groups())
    gap = "" if unit.text in ("°", "") else " "
    return f"must be between {lo} and {hi}{gap}{unit.text}"


_OUT_OF_RANGE = re.compile(r"is out of range|must be in \[|must be in \(")
_NUMBER_TYPE = re.compile(r"must be (a number|a finite number)")


def window_message(error: DesignError, system: UnitSystem, kind: str | None = None) -> str:
    """The window's sentence for ``error``: the field's label and, for a value out of its
    range, the range in ``system``'s display units; never a file key.

    Parameters
    ----------
    error : core.DesignError
        Its ``field`` is the path of the refused value, its ``reason`` the core's words.
    system : UnitSystem
        The units the person reads.
    kind : str, optional
        The part kind, for a path into ``parts``.
    """
    path = str(error.field)
    spec = spec_of(path, kind)
    label = label_of(path, kind)
    reason = error.reason.strip()
    if spec is not None and spec.numeric:
        if _OUT_OF_RANGE.search(reason):
            return f"{label} {range_sentence(spec, system, path)}."
        if _NUMBER_TYPE.search(reason):
            return f"{label} must be a number."
    reason = _metres_shown(_without_keys(reason), system)
    if reason.lower().startswith(label.lower()) or path in _WHOLE_DESIGN:
        sentence = reason
    elif reason.startswith(_VERBS):
        sentence = f"{label} {reason}"
    else:
        sentence = f"{label}: {reason}"
    sentence = sentence[:1].upper() + sentence[1:]
    return sentence if sentence.endswith((".", "!", "?")) else sentence + "."


_VERBS = ("must ", "is ", "cannot ", "has ", "needs ", "belongs ", "contains ")
_METRES = re.compile(r"(?<![\w.])(-?\d+(?:\.\d+)?(?:e[-+]?\d+)?) m\b")


def _metres_shown(text: str, system: UnitSystem) -> str:
    """SI lengths in the core's words (“0.02 m”) in the display unit (“20 mm”, “0.787 in”)."""
    return _METRES.sub(lambda m: quantity_text(float(m.group(1)), "length", system), text)


_KEY = re.compile(r"\b(?:[a-z_]+(?:\[\d+\])?\.)*[a-z]+_[a-z_0-9]+\b")


def _without_keys(text: str) -> str:
    """Replace file keys in the core's reason by their labels (``rating_nut.pitch_m`` →
    “Thread pitch”)."""
    def swap(match: re.Match[str]) -> str:
        word = match.group(0)
        spec = spec_of(word)
        if spec is not None:
            return spec.label.lower()
        for group in ("material", "suspension", "mount", "shape", "support", "part"):
            shown = choice_label(group, word)
            if shown != choice_label("", word):
                return shown.lower()
        return word  # a name the person gave (a part called rod_top) stays as written
    return _KEY.sub(swap, text)
