"""Write the key table of ``docs/file-format.md`` from the field table ``core.fields.FIELDS``.

The table sits between the markers ``<!-- keys:begin -->`` and ``<!-- keys:end -->``; the
rest of the document is written by hand. Run from the repository root:

    python3 docs/make_file_format.py          # rewrite the table in place
    python3 docs/make_file_format.py --check  # exit 1 when the committed table is stale

A test (``tests/core/test_file_format_doc.py``) runs the check, so the document cannot drift
from the table the program reads.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

from core.fields import CHOICES, FIELDS, FieldSpec  # noqa: E402

__all__ = ["DOC", "BEGIN", "END", "key_table", "render", "main"]

DOC = ROOT / "docs" / "file-format.md"
BEGIN = "<!-- keys:begin (written by docs/make_file_format.py from core.fields.FIELDS) -->"
END = "<!-- keys:end -->"

UNITS = {  # unit kind: the unit of the value in the file
    "length": "m", "small_length": "m", "mass": "kg", "angle": "°", "temperature": "°C",
    "pressure": "hPa", "stiffness": "N·m/rad", "gravity": "m/s²", "period": "s",
    "frequency": "beats/h", "quality": "", "density": "kg/m³", "expansion": "1/K",
    "modulus": "Pa", "count": "", "seconds": "s", "time": "ISO 8601", "text": "text",
    "choice": "choice", "section": "object",
}

CHOICE_GROUPS = {  # pattern: the CHOICES group listing its values
    "purpose": "purpose", "suspension.kind": "suspension",
    "suspension.blades.material": "material", "parts[bob].shape": "shape",
    "parts[bob].mount.kind": "mount", "parts[bob].support": "support",
    "parts[rod].hangs_from.end": "end",
}
ADJUSTMENTS = ("nut", "trim", "bob", "set", "other")  # core.rating_log.ADJUSTMENT_KINDS


def _number(x: float) -> str:
    return f"{x:g}"


def _range(spec: FieldSpec) -> str:
    if spec.low is None or spec.high is None:
        return ""
    left = "(" if spec.low_open else "["
    right = ")" if spec.high_open else "]"
    return f"{left}{_number(spec.low)}, {_number(spec.high)}{right}"


def _values(spec: FieldSpec) -> str:
    """The allowed words of a choice field."""
    if spec.pattern.endswith(".material"):
        return ", ".join(f"`{k}`" for k in CHOICES["material"]) + ", or a key of `materials`"
    if spec.pattern.endswith("].kind") and spec.pattern.startswith("parts["):
        return f"`{spec.pattern[6:spec.pattern.index(']')]}`"
    if spec.pattern == "rating_log.adjustments[].what":
        return ", ".join(f"`{k}`" for k in ADJUSTMENTS)
    group = CHOICE_GROUPS.get(spec.pattern)
    return ", ".join(f"`{k}`" for k in CHOICES[group]) if group else ""


def _default(spec: FieldSpec) -> str:
    if spec.default is None:
        return ""
    if isinstance(spec.default, str):
        return f"`{spec.default}`"
    return _number(spec.default) if isinstance(spec.default, float) else str(spec.default)


def _cell(text: str) -> str:
    return text.replace("|", "\\|")


def key_table() -> str:
    """The Markdown table of every key: path, unit, range or values, default, meaning."""
    lines = ["| key | unit | range or values | default | meaning |",
             "|---|---|---|---|---|"]
    lists = {s.pattern.split("[", 1)[0] for s in FIELDS if "[]" in s.pattern} | {
        s.pattern.rsplit("[", 1)[0] for s in FIELDS if "[]" in s.pattern} | {"parts"}
    for spec in FIELDS:
        allowed = _range(spec) or _values(spec)
        unit = "list" if spec.pattern in lists else UNITS.get(spec.unit, spec.unit)
        lines.append(f"| `{spec.pattern}` | {unit} | "
                     f"{_cell(allowed)} | {_cell(_default(spec))} | "
                     f"{_cell(spec.label)}: {_cell(spec.help)} |")
    return "\n".join(lines) + "\n"


def render(text: str) -> str:
    """``text`` (the document) with its key table written afresh."""
    head, rest = text.split(BEGIN, 1)
    _old, tail = rest.split(END, 1)
    return f"{head}{BEGIN}\n{key_table()}{END}{tail}"


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--check", action="store_true",
                        help="only check that the committed table is current (exit 1 if not)")
    args = parser.parse_args(argv)
    text = DOC.read_text(encoding="utf-8")
    fresh = render(text)
    if args.check:
        if fresh != text:
            print(f"{DOC}: the key table is stale; run python3 docs/make_file_format.py",
                  file=sys.stderr)
            return 1
        return 0
    DOC.write_text(fresh, encoding="utf-8")
    return 0


if __name__ == "__main__":
    sys.exit(main())
