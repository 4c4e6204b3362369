"""The window's words and units come from the core's field table: labels, help, refusals, the
inch-pound display of every number, and the PDF's words (no file keys, no "-0.00")."""

from __future__ import annotations

import dataclasses
import re
import shutil
import subprocess
from pathlib import Path

import pytest
from PySide6.QtCore import Qt
from PySide6.QtWidgets import QLabel

from app.form.field_text import spec_of, window_message
from app.form.number_field import NumberField
from app.form.units import UnitSystem, field_unit
from app.readout.readout_panel import ReadoutPanel
from app.window.main_window import MainWindow
from core import DesignError, analyse, load_design
from core import fields as core_fields

EXAMPLES = Path(__file__).resolve().parents[2] / "resources" / "examples"
EXAMPLE_NAMES = ("workshop_regulator", "hall_clock", "mantel_clock", "atrium_pendulum")
POUND_KG = 0.45359237  # 1 lb = 0.45359237 kg exactly (international pound, 1959 definition)
INCH_M = 0.0254        # 1 in = 0.0254 m exactly (international inch, 1959 definition)


def _type(qtbot, field: NumberField, text: str) -> None:  # type: ignore[no-untyped-def]
    field.lineEdit().selectAll()
    qtbot.keyClicks(field, text)
    qtbot.keyClick(field, Qt.Key.Key_Return)


def _form_label(window: MainWindow, path: str) -> str:
    row = window.design_panel.row(path)
    label = row.parentWidget().layout().labelForField(row)  # type: ignore[union-attr]
    assert isinstance(label, QLabel)
    return label.text()


class TestUnits:
    def test_a_derived_mass_follows_the_unit_system_without_reselecting(
            self, window: MainWindow) -> None:
        window.design_panel.select_part(0)
        row = window.design_panel.row("parts[0].mass_kg")
        name = window.document.design.parts[0].name
        body = next(b for b in window.result.bodies if b.name == name)  # type: ignore[union-attr]
        metric = row.editor().lineEdit().placeholderText()  # type: ignore[attr-defined]
        assert float(metric) == pytest.approx(body.mass_kg, rel=1e-4)
        window.set_unit_system(UnitSystem.INCH_POUND)
        shown = row.editor().lineEdit().placeholderText()  # type: ignore[attr-defined]
        assert float(shown) == pytest.approx(body.mass_kg / POUND_KG, rel=1e-4)
        window.set_unit_system(UnitSystem.METRIC)
        assert row.editor().lineEdit().placeholderText() == metric  # type: ignore[attr-defined]

    def test_small_lengths_in_mm_and_a_pitch_in_threads_per_inch(self) -> None:
        diameter = field_unit("parts[0].diameter_m", UnitSystem.METRIC)
        assert diameter.text == "mm" and diameter.to_display(0.008) == pytest.approx(8.0)
        pitch = field_unit("rating_nut.pitch_m", UnitSystem.INCH_POUND)
        # 20 threads per inch: a pitch of 0.0254 / 20 m (plain arithmetic on the inch).
        assert pitch.to_display(INCH_M / 20) == pytest.approx(20.0)
        assert pitch.to_si(20.0) == pytest.approx(INCH_M / 20)


class TestMessages:
    @pytest.mark.parametrize("system, words", [
        (UnitSystem.METRIC, "Rod length must be between 0.1 mm and 1000 m."),
        # 1e-4 m = 0.003937 in; 1000 m = 3280.8 ft (1 ft = 0.3048 m exactly).
        (UnitSystem.INCH_POUND, "Rod length must be between 0.003937 in and 3281 ft."),
    ])
    def test_a_bad_value_typed_reads_in_the_forms_words_and_units(
            self, window: MainWindow, qtbot, system: UnitSystem, words: str) -> None:  # type: ignore[no-untyped-def]
        window.set_unit_system(system)
        window.design_panel.select_part(0)
        _type(qtbot, window.design_panel.row("parts[0].length_m").editor(), "-1")  # type: ignore[arg-type]
        problem = window.design_panel.row("parts[0].length_m").problem()
        assert problem == words
        assert "_" not in problem and "parts[" not in problem

    def test_a_core_reason_loses_its_file_keys_and_si_values(self) -> None:
        error = DesignError("parts[2].hole_diameter_m",
                            "a hole of 0.02 m does not fit: see rating_nut.pitch_m")
        text = window_message(error, UnitSystem.INCH_POUND, "bob")
        assert text.startswith("Hole diameter: a hole of 0.7874 in")  # 0.02 / 0.0254
        assert "_" not in text and " m " not in text


class TestLabelsFromCore:
    def test_the_form_reads_labels_and_help_from_the_field_table(
            self, qtbot, example_copy: Path, monkeypatch: pytest.MonkeyPatch) -> None:  # type: ignore[no-untyped-def]
        spec = core_fields.field_spec("site.latitude_deg")
        changed = dataclasses.replace(spec, label="Breitengrad", help="Where north is.")
        table = dict(core_fields._BY_PATTERN)
        table["site.latitude_deg"] = changed
        monkeypatch.setattr(core_fields, "_BY_PATTERN", table)
        window = MainWindow(load_design(example_copy), example_copy)
        qtbot.addWidget(window)
        assert _form_label(window, "site.latitude_deg") == "Breitengrad"
        assert window.design_panel.row("site.latitude_deg").editor().toolTip() == \
            "Where north is."

    def test_every_form_field_has_the_tables_help_as_tooltip(self, window: MainWindow) -> None:
        for path, row in window.design_panel.all_rows().items():
            if path == "target.kind" or spec_of(path) is None:
                continue  # a choice of the form's own (how the spring is given)
            kind = None
            if path.startswith("parts["):
                kind = window.document.design.parts[int(path[6:path.index("]")])].kind
            assert row.editor().toolTip() == core_fields.field_spec(path, kind).help, path


class TestReadout:
    @pytest.mark.parametrize("name", EXAMPLE_NAMES)
    @pytest.mark.parametrize("system", list(UnitSystem))
    def test_no_negative_zero_in_the_readout(self, qtbot, name: str,  # type: ignore[no-untyped-def]
                                             system: UnitSystem) -> None:
        result = analyse(load_design(EXAMPLES / f"{name}.pendulum.json"))
        panel = ReadoutPanel(system)
        qtbot.addWidget(panel)
        panel.show_result(result, result)  # the Δ column against itself: every Δ is zero
        texts = []
        stack = [panel.tree.topLevelItem(i) for i in range(panel.tree.topLevelItemCount())]
        while stack:
            item = stack.pop()
            texts += [item.text(c) for c in range(4)]
            stack += [item.child(i) for i in range(item.childCount())]
        bad = [t for t in texts if re.fullmatch(r"[-+−]0(\.0*)?", t.strip())]
        assert not bad, bad

    def test_inch_pound_wording_of_the_sensitivities(self, qtbot) -> None:  # type: ignore[no-untyped-def]
        result = analyse(load_design(EXAMPLES / "workshop_regulator.pendulum.json"))
        panel = ReadoutPanel(UnitSystem.INCH_POUND)
        qtbot.addWidget(panel)
        panel.show_result(result)
        labels = {key: item.text(0) for key, (item, _u, _f) in panel._items.items()}
        assert labels["bob_sensitivity_s_per_day_per_mm"] == "Bob lowered 1/32 in"
        assert labels["elevation_s_per_day_per_100_m"] == "Site 300 ft higher"
        per_mm = result.report_dict()["bob_sensitivity_s_per_day_per_mm"]
        # 1/32 in = 0.79375 mm (1 in = 25.4 mm exactly): a linear sensitivity scales by it.
        assert float(panel.value_text("bob_sensitivity_s_per_day_per_mm")) == \
            pytest.approx(per_mm * 0.79375, abs=1e-3)

    def test_trim_is_quoted_at_the_tray_only_when_there_is_one(self, qtbot) -> None:  # type: ignore[no-untyped-def]
        panel = ReadoutPanel()
        qtbot.addWidget(panel)
        panel.show_result(analyse(load_design(EXAMPLES / "hall_clock.pendulum.json")))
        assert panel._items["trim_s_per_day_per_g"][0].text(0) == "1 g trim at tray"
        panel.show_result(analyse(load_design(EXAMPLES / "atrium_pendulum.pendulum.json")))
        assert panel._items["trim_s_per_day_per_g"][0].text(0).startswith("1 g trim at 9.")


class TestPdf:
    @pytest.mark.slow
    def test_the_report_uses_the_windows_words_and_is_small(self, qapp, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
        from app.report.export import export_result

        result = analyse(load_design(EXAMPLES / "workshop_regulator.pendulum.json"))
        export_result(result, tmp_path, "workshop_regulator.pendulum.json")
        pdf = tmp_path / "report.pdf"
        assert pdf.stat().st_size < 1_000_000
        if shutil.which("pdftotext"):
            text = subprocess.run(["pdftotext", str(pdf), "-"], check=True, timeout=60,
                                  capture_output=True, text=True).stdout
            flat = " ".join(text.split())
            assert "Knife edge" in flat and "Cast iron" in flat
            words = set(re.findall(r"\b\w+_\w+\b", flat)) - {"workshop_regulator"}
            assert not words, words
            log = result.design.rating_log
            assert log is not None
            assert (f"Rating log: {len(log.readings)} readings, {len(log.adjustments)} "
                    "adjustments") in flat
