"""A garbage campaign through the window: hostile text into every field, paste, combos, part
edits, undo/redo storms and open/close storms — and after every action, the window must still
show the last valid design. (Only the rewinds through the whole undo history, thousands of
steps, are checked every 25th step and at their end.)

After each action the test checks that

* no exception reached ``sys.excepthook`` (wrapped here, besides pytest-qt's own capture);
* the document's design is a valid design (it survives the file form unchanged) and either
  ``core.analyse`` accepts it and the readout shows its period and the motion plot its motion,
  or the core refuses it and the window says so while showing the last result it could compute;
* every number field holds exactly the design's value (no field kept a value the design does
  not have, or silently turned bad text into 0);
* text typed into a field was either taken as the number it spells (``float`` of the stripped
  text, in the field's display unit) or refused with a sentence, the design unchanged.

Everything is seeded (``random.Random``) and counted, never timed; the count of actions is
printed. Non-ASCII text is typed as key events carrying the text (what a keyboard layout or an
input method delivers), since ``QTest.keyClicks`` only knows ASCII keys.
"""

from __future__ import annotations

import math
import random
import shutil
import string
import sys
import unicodedata
from collections import Counter
from collections.abc import Callable
from pathlib import Path
from types import TracebackType
from typing import Any

import pytest
from PySide6.QtCore import QEvent, Qt
from PySide6.QtGui import QKeyEvent
from PySide6.QtWidgets import QApplication, QLineEdit, QWidget

from app.form.field_rows import ChoiceRow, NumberRow, TextRow
from app.form.number_field import NumberField
from app.form.units import UnitSystem
from app.readout.readout_format import format_value
from app.window.main_window import MainWindow, example_files
from core import Design, DesignError, analyse, design_from_dict, design_to_dict, load_design
from core.fileformat import get_value

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "resources" / "examples" / "workshop_regulator.pendulum.json"
SEED = 20240611
RANDOM_ACTIONS = 800

HOSTILE = [
    "", " ", "-", "+", ".", "e", "1e999", "-1e999", "nan", "NaN", "inf", "-inf", "Infinity",
    "-0", "0", "1,5", "1.5.2", "١٢٣", "٣٫٥", "𝟙", "½", "0x10", "0b11", "  3 ", "\t2\t",
    "1e308", "-1e308", "1e-320", "99999999999999999999999", "-99999999999999", "-5", "1_000",
    "3.", ".5", "--1", "+-1", "1e", "e5", "∞", "None", "null", "1 2", "−2", "7",
    "2.5", "12", "0.1e1", "🕰", "1🕰", "🕰️⏱️", "\u200b1", "1\u00a0", "x" * 5000, "9" * 400,
    "1" + "0" * 400, "0." + "0" * 300 + "1", "<script>", "'; DROP TABLE parts; --", "%s%n",
]
HOSTILE_NAMES = [
    "", " ", "rod", "bob", "x" * 5000, "🕰️ pendulum", "名前", "ملف", "a\tb", "\u200b", "null",
    "../../etc/passwd", "trim 2", "—", "'\"\\",
]
RANDOM_CHARS = (string.digits * 3 + ".-+eE, _x" + "١٢٣٫" + "∞½−" + "🕰" + "\u00a0\u200b")
TYPEABLE = set(string.digits + string.ascii_letters + string.punctuation + " ")


# ============================================================================ input helpers

def send_text(qtbot: Any, widget: QWidget, text: str) -> None:  # type: ignore[no-untyped-def]
    """Type ``text`` into ``widget``: ASCII as key clicks, other characters as key events
    carrying their text."""
    run = ""
    for ch in text:
        if ch in TYPEABLE:
            run += ch
            continue
        if run:
            qtbot.keyClicks(widget, run)
            run = ""
        for kind in (QEvent.Type.KeyPress, QEvent.Type.KeyRelease):
            QApplication.sendEvent(widget, QKeyEvent(kind, 0, Qt.KeyboardModifier.NoModifier,
                                                     ch))
    if run:
        qtbot.keyClicks(widget, run)


def line_edit(widget: QWidget) -> QLineEdit:
    return widget.lineEdit() if isinstance(widget, NumberField) else widget  # type: ignore[return-value]


def enter(qtbot: Any, widget: QWidget, text: str, paste: bool) -> None:  # type: ignore[no-untyped-def]
    """Replace the widget's text by typing (or pasting) ``text``, then press Enter."""
    line_edit(widget).selectAll()
    qtbot.keyClick(widget, Qt.Key.Key_Backspace)
    if paste or len(text) > 40:  # nobody types 5000 characters: they paste them
        QApplication.clipboard().setText(text)
        qtbot.keyClick(widget, Qt.Key.Key_V, Qt.KeyboardModifier.ControlModifier)
    else:
        send_text(qtbot, widget, text)
    qtbot.keyClick(widget, Qt.Key.Key_Return)


def spelled_number(text: str) -> float | None:
    """The finite number ``text`` spells for Python's ``float`` (None when it spells none)."""
    try:
        value = float(text.strip().replace("−", "-"))
    except ValueError:
        return None
    return value if math.isfinite(value) else None


def has_digit(text: str) -> bool:
    return any(unicodedata.category(ch) == "Nd" for ch in text)


# ============================================================================ the campaign

class Campaign:
    """Drives one window with seeded garbage and checks it after every action."""

    def __init__(self, window: MainWindow, qtbot: Any, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
        self.w = window
        self.qtbot = qtbot
        self.rng = random.Random(SEED)
        self.counts: Counter[str] = Counter()
        self.refusals: Counter[str] = Counter()  # why the core refused designs on view
        self.errors: list[BaseException] = []
        self.messages: list[str] = []
        self._analysed: tuple[Design, Any] | None = None
        self.broken = tmp_path / "broken.pendulum.json"
        self.broken.write_bytes(b'{"format": "penduline-design", "version": 1, "parts": [')
        self.copy = tmp_path / "regulator.pendulum.json"
        shutil.copyfile(EXAMPLE, self.copy)

    # ------------------------------------------------------------------ checking
    def check(self, what: str) -> None:
        """Every invariant of the module docstring, after the action ``what``."""
        self.counts[what.split(":")[0]] += 1
        assert not self.errors, f"after {what}: uncaught {self.errors[0]!r}"
        w, doc = self.w, self.w.document
        design = doc.design
        assert design_from_dict(design_to_dict(design)) == design, what
        w.compute_now()
        if self._analysed is None or self._analysed[0] != design:
            try:
                self._analysed = (design, analyse(design))
            except DesignError as exc:
                self._analysed = (design, exc)
        expected = self._analysed[1]
        assert w.result is not None, what
        if isinstance(expected, DesignError):
            self.counts["(design the core refuses: last result kept)"] += 1
            self.refusals[f"{expected.field}: {expected.reason}"] += 1
            assert w.result.design != design, what
            assert w.readout.compute_problem.text(), what
            expected = w.result  # the last good result stays on view
        else:
            assert w.result.design == design, what
        assert w.readout.value_text("period_s") == format_value(expected.period_s, "{:.9f}"), \
            what
        if w.plot_area.arrangement() == "tabs" and w.plot_area.tabs.currentIndex() == 0:
            times = w.plots[0].exact.getData()[0]
            assert times[-1] == expected.motion.time_s[-1], what
        self._check_rows(design, what)

    def _check_rows(self, design: Design, what: str) -> None:
        d = design_to_dict(design)
        for path, row in self.w.design_panel.all_rows().items():
            if not isinstance(row, NumberRow) or path.startswith("target.") and \
                    not row.isVisibleTo(self.w.design_panel):
                continue
            try:
                value = get_value(d, path)
            except DesignError:
                continue
            held = row.field.value()
            if value is None:
                assert held is None, f"{what}: {path} holds {held}, the design has none"
            else:
                assert held == value, f"{what}: {path} holds {held}, the design has {value}"
                if not row.field.problem():
                    shown = spelled_number(row.field.text())
                    unit = row.field.unit()
                    assert shown is not None and abs(shown - unit.to_display(value)) <= \
                        0.51 * 10.0 ** -unit.decimals + 1e-12 * abs(shown), \
                        f"{what}: {path} shows {row.field.text()!r} for {value}"

    # ------------------------------------------------------------------ fields
    def number_rows(self) -> list[NumberRow]:
        return [r for r in self.w.design_panel.all_rows().values()
                if isinstance(r, NumberRow) and r.field.isEnabled()
                and r.isVisibleTo(self.w.design_panel)]

    def text_rows(self) -> list[TextRow]:
        return [r for r in self.w.design_panel.all_rows().values() if isinstance(r, TextRow)]

    def choice_rows(self) -> list[ChoiceRow]:
        return [r for r in self.w.design_panel.all_rows().values() if isinstance(r, ChoiceRow)
                and r.combo.isEnabled() and r.isVisibleTo(self.w.design_panel)]

    def row(self, path: str) -> Any:
        """The row now editing ``path`` (rows are rebuilt when the parts change)."""
        return self.w.design_panel.all_rows().get(path)

    def type_number(self, row: NumberRow, text: str, paste: bool) -> None:
        doc = self.w.document
        before = doc.design
        path = row.path
        old = get_value(design_to_dict(before), path)
        unit = row.field.unit()
        enter(self.qtbot, row.field, text, paste)
        row = self.row(path)
        new = get_value(design_to_dict(doc.design), path)
        what = f"{'paste' if paste else 'type'}: {text[:30]!r} into {path}"
        number = spelled_number(text)
        if number is None:  # refused: the design is untouched and the field says why
            assert doc.design == before, what
            if text.strip() != row.field._format(old) if old is not None else True:
                assert row.field.problem(), what
        elif doc.design != before:  # taken: exactly the number typed, in display units
            assert new == unit.to_si(number), what
            assert has_digit(text), what
        else:  # the number was refused by the core (with a reason) or equals the value
            assert new == old, what
            assert row.field.problem() or row.problem() or unit.to_si(number) == old \
                or text.strip() == row.field._format(old), what
        self.check(what)

    def type_name(self, row: TextRow, text: str, paste: bool) -> None:
        doc = self.w.document
        before = doc.design
        path = row.path
        enter(self.qtbot, row.edit, text, paste)
        row = self.row(path)  # renaming a part rebuilds the part editor
        what = f"name: {text[:30]!r} into {path}"
        value = get_value(design_to_dict(doc.design), path)
        if doc.design == before:  # refused with a sentence, or the same name again
            assert row.problem() or row.edit.text() == value, what
        else:
            assert row.edit.text() == value and len(value) <= 200, what
            if "\t" not in text:
                assert value == text[:200], what
        self.check(what)

    def choose(self, row: ChoiceRow, index: int) -> None:
        what = f"choose: {row.combo.itemData(index)} for {row.path}"
        row.combo.setCurrentIndex(index)
        row.combo.activated.emit(index)  # the rows may be rebuilt: ``row`` is gone
        self.check(what)

    def toggle_optional(self) -> None:
        rows = [r for r in self.number_rows() if r.check is not None] + [
            r for r in self.w.design_panel.all_rows().values()
            if isinstance(r, NumberRow) and r.check is not None and not r.check.isChecked()]
        if rows:
            row = self.rng.choice(rows)
            what = f"toggle: {row.path}"
            row.check.click()
            self.check(what)

    def step(self) -> None:
        rows = [r for r in self.number_rows() if r.field.value() is not None]
        if not rows:
            return
        path = self.rng.choice(rows).path
        for _ in range(self.rng.randint(1, 15)):
            self.row(path).field.stepBy(self.rng.choice([-10, -1, 1, 1, 3]))
            self.check(f"step: {path}")
        self.row(path).field.finish_steps()
        self.check(f"step: finish {path}")

    # ------------------------------------------------------------------ parts
    def part_action(self) -> None:
        panel = self.w.design_panel
        kind = self.rng.choice(["add", "add", "duplicate", "remove", "select"])
        if kind == "add":
            panel.add_part(self.rng.choice(["rod", "sleeve", "bob", "weight"]))
        elif kind == "duplicate":
            panel.duplicate_selected_part()
        elif kind == "remove":
            panel.remove_selected_part()
        else:
            panel.select_part(self.rng.randrange(len(self.w.document.design.parts)))
        self.check(f"part: {kind}")

    def undo_redo_storm(self, n: int) -> None:
        for _ in range(n):
            r = self.rng.random()
            if r < 0.45:
                self.w.undo_action.trigger()
                self.check("undo")
            elif r < 0.9:
                self.w.redo_action.trigger()
                self.check("redo")
            else:
                self.random_edit()

    def random_edit(self) -> None:
        rows = self.number_rows()
        row = self.rng.choice(rows)
        value = row.field.value()
        if value is None:
            text = self.rng.choice(HOSTILE)
        else:
            shown = row.field.unit().to_display(value)
            text = f"{shown * self.rng.uniform(0.8, 1.2):.6g}"
        self.type_number(row, text, paste=False)

    def open_close_storm(self, rounds: int) -> None:
        for _ in range(rounds):
            for path in example_files():
                self.w.open_file(path, as_example=True)
                self.check(f"open: example {path.name}")
            assert not self.w.open_file(self.broken)
            self.check("open: broken file")
            assert self.w.open_file(self.copy)
            self.check("open: file")
            self.random_edit()
            assert not self.w.open_file(self.broken)
            assert self.w.document.is_dirty
            self.check("open: broken file over an unsaved edit")
            self.w.new_document()
            self.check("open: new document")

    def random_text(self) -> str:
        if self.rng.random() < 0.4:
            return self.rng.choice(HOSTILE)
        return "".join(self.rng.choice(RANDOM_CHARS) for _ in range(self.rng.randint(0, 10)))


@pytest.fixture
def campaign(window: MainWindow, qtbot, tmp_path: Path,  # type: ignore[no-untyped-def]
             monkeypatch: pytest.MonkeyPatch) -> Campaign:
    run = Campaign(window, qtbot, tmp_path)
    monkeypatch.setattr(window, "show_message", lambda _title, text: run.messages.append(text))
    return run


@pytest.mark.slow
def test_garbage_campaign(campaign: Campaign, record_property: Callable[[str, Any], None]
                          ) -> None:
    c, w = campaign, campaign.w
    previous = sys.excepthook

    def hook(kind: type[BaseException], value: BaseException,
             tb: TracebackType | None) -> None:
        c.errors.append(value)
        previous(kind, value, tb)

    sys.excepthook = hook
    try:
        c.check("start")
        # 1. Every hostile string into every number and text field, for every part, in both
        #    unit systems' turn (metric for the design fields, inch-pound for the parts).
        panel = w.design_panel
        for index in range(len(w.document.design.parts)):
            panel.select_part(index)
            if index == 1:
                w.set_unit_system(UnitSystem.INCH_POUND)
            for path in [r.path for r in c.number_rows()]:
                if path.startswith("parts[") or index == 0:
                    original = c.row(path).field.text()
                    for i, text in enumerate(HOSTILE):
                        c.type_number(c.row(path), text, paste=i % 5 == 4)
                    c.type_number(c.row(path), original, paste=False)  # back to a sane value
            for path in [r.path for r in c.text_rows()]:
                if path.startswith("parts[") or index == 0:
                    for i, text in enumerate(HOSTILE_NAMES):
                        c.type_name(c.row(path), text, paste=i % 4 == 3)
        w.set_unit_system(UnitSystem.METRIC)
        # the fields shown only for other choices: a spring, a beats-per-hour target
        for path, key in (("suspension.kind", "spring"), ("target.kind", "beats_per_hour")):
            row = panel.row(path)
            assert isinstance(row, ChoiceRow)
            c.choose(row, row.combo.findData(key))
            for field_path in ("suspension.stiffness_n_m_per_rad", "target.beats_per_hour"):
                number = panel.row(field_path)
                assert isinstance(number, NumberRow)
                if number.field.isEnabled() and number.isVisibleTo(panel):
                    for text in HOSTILE[::3]:
                        c.type_number(number, text, paste=False)
        # 2. Random actions, seeded.
        for _ in range(RANDOM_ACTIONS):
            r = c.rng.random()
            if r < 0.35:
                c.type_number(c.rng.choice(c.number_rows()), c.random_text(),
                              paste=c.rng.random() < 0.3)
            elif r < 0.45:
                c.random_edit()
            elif r < 0.52:
                c.type_name(c.rng.choice(c.text_rows()), c.rng.choice(HOSTILE_NAMES),
                            paste=c.rng.random() < 0.3)
            elif r < 0.65:
                row = c.rng.choice(c.choice_rows())
                c.choose(row, c.rng.randrange(row.combo.count()))
            elif r < 0.80:
                c.part_action()
            elif r < 0.85:
                c.toggle_optional()
            elif r < 0.90:
                c.step()
            elif r < 0.95:
                w.set_unit_system(c.rng.choice(list(UnitSystem)))
                c.check("units")
            else:
                c.undo_redo_storm(20)
        # 3. Undo/redo storms: the whole history back and forth, interleaved with edits.
        #    (The rewinds through the whole history are checked every 25th step.)
        for _ in range(3):
            c.undo_redo_storm(150)
            for action, name in ((w.undo_action, "rewind: undo"), (w.redo_action, "rewind: redo")):
                for i in range(w.document.undo_stack.count() + 1):
                    action.trigger()
                    c.counts["(rewind steps)"] += 1
                    if i % 25 == 24:
                        c.check(name)
                c.check(name)
            assert w.document.undo_stack.index() == w.document.undo_stack.count()
        # 4. Open/close storms.
        c.open_close_storm(4)
        for _ in range(3):  # whole windows made and closed
            other = MainWindow(load_design(EXAMPLE), None)
            other.compute_now()
            other.document.undo_stack.setClean()
            assert other.close()
            other.deleteLater()
            c.check("window: made and closed")
    finally:
        sys.excepthook = previous

    checks = sum(n for key, n in c.counts.items() if not key.startswith("("))
    actions = checks - c.counts["start"] - c.counts["rewind"] + c.counts["(rewind steps)"]
    summary = (f"garbage: {actions} actions, {checks} full checks — "
               + ", ".join(f"{key} {n}" for key, n in sorted(c.counts.items()))
               + f"; {len(c.messages)} messages shown; designs the core refused: "
               + (", ".join(f"{why} ×{n}" for why, n in c.refusals.most_common()) or "none"))
    print(summary)
    record_property("garbage_summary", summary)
    # Floors that show the campaign reached every field (the counts are seeded, not timed; the
    # form's number rows set them: 3788 checks with the form of format 2).
    assert checks >= 3700 and actions >= 6500
    assert c.counts["type"] + c.counts["paste"] >= 1700
    assert c.counts["undo"] >= 300 and c.counts["redo"] >= 300
    assert c.counts["open"] >= 4 * (len(example_files()) + 4)
    assert len(c.messages) >= 8  # every broken file was reported
    assert all("is not valid JSON" in m for m in c.messages)


def test_a_design_the_core_refuses_stays_reported_through_redraws(window: MainWindow) -> None:
    """Found by the campaign: switching units (or pinning a baseline) re-showed the last good
    result and hid the sentence saying the design on view cannot be computed."""
    d = design_to_dict(window.document.design)
    d["parts"][0]["top_m"] = -3.0  # the whole pendulum above the pivot
    d["parts"][3]["at_m"] = -2.5
    above = design_from_dict(d)
    with pytest.raises(DesignError) as refused:
        analyse(above)
    assert refused.value.field == "parts"
    good = window.result
    window.document.commit(above, "Move rod", "parts[0].top_m")
    window.compute_now()
    problem = window.readout.compute_problem.text()
    assert problem.startswith("The centre of mass must hang below the pivot")
    for redraw in (lambda: window.set_unit_system(UnitSystem.INCH_POUND), window.pin_baseline,
                   window.clear_baseline, lambda: window.set_unit_system(UnitSystem.METRIC)):
        redraw()
        assert window.readout.compute_problem.text() == problem
        assert window.result is good
    window.undo_action.trigger()
    window.compute_now()
    assert window.readout.compute_problem.text() == ""
    assert window.result.design == window.document.design
