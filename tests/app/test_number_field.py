"""The number entry: typed text is judged, never coerced; steps are live, then one edit."""

from __future__ import annotations

import math

import pytest
from PySide6.QtCore import QEvent, Qt
from PySide6.QtGui import QFocusEvent
from PySide6.QtWidgets import QApplication

from app.form.number_field import NumberField, NumberTextError, format_number, parse_number
from app.form.units import UnitSystem, field_unit


class TestParseNumber:
    @pytest.mark.parametrize("text, value", [("1.25", 1.25), (" -3e-4 ", -3e-4), ("−2", -2.0)])
    def test_reads_numbers(self, text: str, value: float) -> None:
        assert parse_number(text) == value

    @pytest.mark.parametrize("text", ["", "abc", "1,5", "nan", "inf", "-Infinity", "1e999"])
    def test_refuses_text_that_is_not_a_finite_number(self, text: str) -> None:
        with pytest.raises(NumberTextError):
            parse_number(text)


class TestFormatNumber:
    def test_drops_trailing_zeros_and_negative_zero(self) -> None:
        assert format_number(1.1131, 6) == "1.1131"
        assert format_number(20.0, 2) == "20"
        assert format_number(-0.0000001, 4) == "0"


@pytest.fixture
def field(qtbot) -> NumberField:  # type: ignore[no-untyped-def]
    widget = NumberField(field_unit("parts[0].length_m", UnitSystem.INCH_POUND))
    qtbot.addWidget(widget)
    widget.set_value(0.0254)  # shown as 1 in
    return widget


class TestNumberField:
    def test_typed_value_is_emitted_in_si(self, field: NumberField, qtbot) -> None:  # type: ignore[no-untyped-def]
        assert field.text() == "1"
        field.lineEdit().selectAll()
        qtbot.keyClicks(field, "2")
        with qtbot.waitSignal(field.changed) as signal:
            qtbot.keyClick(field, Qt.Key.Key_Return)
        assert signal.args[0] == pytest.approx(0.0508, rel=1e-12)  # 2 in = 0.0508 m (exact)
        assert signal.args[1] is False

    def test_bad_text_is_marked_and_nothing_is_emitted(self, field: NumberField, qtbot) -> None:  # type: ignore[no-untyped-def]
        emitted: list[float] = []
        field.changed.connect(lambda v, _s: emitted.append(v))
        field.lineEdit().selectAll()
        qtbot.keyClicks(field, "nan")
        qtbot.keyClick(field, Qt.Key.Key_Return)
        assert emitted == []
        assert "not a finite number" in field.problem()
        assert field.property("invalid") is True
        assert field.value() == pytest.approx(0.0254)

    def test_focus_out_restores_the_last_good_value(self, field: NumberField, qtbot) -> None:  # type: ignore[no-untyped-def]
        field.lineEdit().selectAll()
        qtbot.keyClicks(field, "abc")
        qtbot.keyClick(field, Qt.Key.Key_Return)
        assert "not a number" in field.problem()
        QApplication.sendEvent(field, QFocusEvent(QEvent.Type.FocusOut))
        assert field.text() == "1"
        assert field.problem() == ""

    def test_steps_are_live_and_end_as_one_edit(self, field: NumberField) -> None:
        live: list[float] = []
        done: list[tuple[float, bool]] = []
        field.changing.connect(live.append)
        field.changed.connect(lambda v, s: done.append((v, s)))
        for _ in range(3):
            field.stepBy(1)  # 0.05 in a step
        assert len(live) == 3 and done == []
        field.finish_steps()
        assert done == [(pytest.approx(1.15 * 0.0254, rel=1e-12), True)]
        assert math.isclose(live[-1], done[0][0])
