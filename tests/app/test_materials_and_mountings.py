"""Your own materials, measured stock, the spring given by its blades and format-2 mountings,
edited in the window. Wiring tests: figures come from the core itself."""

from __future__ import annotations

from pathlib import Path

import pytest
from PySide6.QtCore import Qt

from app.form import design_edits, material_edits, mounting_edits
from app.form.field_rows import ChoiceRow
from app.form.number_field import NumberField
from app.window.main_window import MainWindow
from core import DesignError, analyse, load_design
from core.blades import blade_stiffness_n_m_per_rad


def type_into(qtbot, field: NumberField, text: str) -> None:  # type: ignore[no-untyped-def]
    field.lineEdit().selectAll()
    qtbot.keyClicks(field, text)
    qtbot.keyClick(field, Qt.Key.Key_Return)


def choose(row: ChoiceRow, key: object) -> None:
    row.combo.setCurrentIndex(row.combo.findData(key))
    row.combo.activated.emit(row.combo.currentIndex())


def number(window: MainWindow, path: str) -> NumberField:
    editor = window.design_panel.row(path).editor()
    assert isinstance(editor, NumberField)
    return editor


class TestOwnMaterials:
    def test_added_material_used_by_a_part_survives_save_and_load(
            self, window: MainWindow, qtbot, tmp_path: Path) -> None:  # type: ignore[no-untyped-def]
        dialog = window.open_materials_dialog()
        qtbot.keyClicks(dialog.name_edit, "Bronze rod stock")
        assert dialog.key_edit.text() == "bronze_rod_stock"
        dialog.density.setValue(8800.0)
        dialog.expansion.setValue(18.0)
        dialog.modulus.setValue(110.0)
        assert not dialog.save_material()  # no source yet: the core refuses
        assert "where the values come from" in dialog.problem.text()
        dialog.source_edit.setText("supplier's data sheet")
        assert dialog.save_material()
        assert dialog.list.count() == 1
        dialog.close()
        window.design_panel.select_part(0)
        row = window.design_panel.row("parts[0].material")
        assert isinstance(row, ChoiceRow)
        assert row.combo.findData("bronze_rod_stock") >= 0
        choose(row, "bronze_rod_stock")
        assert window.document.design.parts[0].material == "bronze_rod_stock"
        target = tmp_path / "bronze.pendulum.json"
        assert window.save_as(target)
        again = load_design(target)
        assert again.parts[0].material == "bronze_rod_stock"
        mine = again.material("bronze_rod_stock")
        assert (mine.density_kg_m3, mine.expansion_per_k, mine.youngs_modulus_pa) == \
            pytest.approx((8800.0, 18.0e-6, 110.0e9))
        assert mine.source == "supplier's data sheet"

    def test_a_key_shadowing_a_built_in_one_is_refused_with_the_cores_sentence(
            self, window: MainWindow) -> None:
        dialog = window.open_materials_dialog()
        before = window.document.design
        dialog.name_edit.setText("My zinc")
        dialog.key_edit.setText("zinc")
        dialog.source_edit.setText("as measured")
        assert not dialog.save_material()
        assert "built-in material" in dialog.problem.text()
        assert window.document.design == before

    def test_measured_invar_is_a_copy_used_by_the_parts_and_one_undo_step(
            self, window: MainWindow) -> None:
        before = window.document.design
        steps = window.document.undo_stack.count()
        dialog = window.open_materials_dialog()
        dialog.builtin_combo.setCurrentIndex(dialog.builtin_combo.findData("invar"))
        dialog.measured.setValue(0.6)
        assert dialog.add_measured_copy()
        design = window.document.design
        assert window.document.undo_stack.count() == steps + 1
        assert design.parts[0].material == "invar_as_measured"
        copy = design.material("invar_as_measured")
        assert copy.expansion_per_k == pytest.approx(0.6e-6)
        assert copy.density_kg_m3 == design.material("invar").density_kg_m3
        assert design.material("invar").expansion_per_k != copy.expansion_per_k
        assert not dialog.remove_selected()  # the rod uses it
        assert "rod" in dialog.problem.text()
        window.document.undo_stack.undo()
        assert window.document.design == before

    def test_removing_an_unused_material(self) -> None:
        design = load_design(Path(__file__).resolve().parents[2] / "resources" / "examples"
                             / "workshop_regulator.pendulum.json")
        values = material_edits.MaterialValues("oak", "Oak", 700.0, 5e-6, 11e9, "a wood table")
        with_oak = material_edits.set_material(design, values)
        assert [m.key for m in with_oak.materials] == ["oak"]
        assert material_edits.remove_material(with_oak, "oak") == design


class TestSpringBlades:
    def _blades(self, window: MainWindow) -> None:
        choose(window.design_panel.row("suspension.kind"), "spring")  # type: ignore[arg-type]
        choose(window.design_panel.row("suspension.given"), "blades")  # type: ignore[arg-type]
        assert window.document.design.suspension.blades is not None

    def test_blades_typed_in_the_form_change_the_stiffness_figure(
            self, window: MainWindow, qtbot) -> None:  # type: ignore[no-untyped-def]
        self._blades(window)
        window.compute_now()
        first = window.result
        assert first is not None and first.suspension_stiffness_n_m_per_rad > 0
        assert first.blade_stresses is not None
        type_into(qtbot, number(window, "suspension.blades.thickness_m"), "0.2")  # mm
        window.compute_now()
        r = window.result
        assert r is not None and window.document.design.suspension.blades.thickness_m == 0.0002  # type: ignore[union-attr]
        # Bending stiffness grows with the cube of the thickness (Euler-Bernoulli beam, any
        # strength-of-materials text), so doubling it must stiffen the spring.
        assert r.suspension_stiffness_n_m_per_rad > first.suspension_stiffness_n_m_per_rad
        b = window.document.design.suspension.blades
        assert b is not None
        expected = blade_stiffness_n_m_per_rad(
            b.count, window.document.design.material(b.material).youngs_modulus_pa, b.width_m,
            b.thickness_m, b.free_length_m, r.mass_kg * r.g_m_s2)
        assert r.suspension_stiffness_n_m_per_rad == pytest.approx(expected, rel=1e-12)
        text = window.design_panel.spring_figures.text()
        assert f"{r.suspension_stiffness_n_m_per_rad:.4g} N·m/rad" in text
        assert "MPa" in text
        assert window.design_panel.spring_caution.isVisibleTo(window.design_panel)
        assert any("no safety factor" in c for c in r.cautions)

    def test_a_bad_blade_thickness_is_refused_and_the_last_good_design_kept(
            self, window: MainWindow, qtbot) -> None:  # type: ignore[no-untyped-def]
        self._blades(window)
        good = window.document.design
        type_into(qtbot, number(window, "suspension.blades.thickness_m"), "50")  # mm
        assert window.document.design == good
        problem = window.design_panel.row("suspension.blades.thickness_m").problem()
        assert "and 5 mm" in problem  # the sentence names the field's upper bound, 5 mm

    def test_back_to_a_stiffness_starts_from_the_blades_figure(self, window: MainWindow
                                                                ) -> None:
        self._blades(window)
        window.compute_now()
        assert window.result is not None
        k = window.result.suspension_stiffness_n_m_per_rad
        choose(window.design_panel.row("suspension.given"), "stiffness")  # type: ignore[arg-type]
        sus = window.document.design.suspension
        assert sus.blades is None and sus.stiffness_n_m_per_rad == pytest.approx(k)


class TestMountings:
    def test_a_rod_hangs_from_the_sleeves_upper_end(self, window: MainWindow) -> None:
        design, _ = design_edits.add_part(window.document.design, "rod")
        window.document.commit(design, "add rod")
        index = len(design.parts) - 1
        window.design_panel.select_part(index)
        row = window.design_panel.row(f"parts[{index}].hangs_from")
        assert isinstance(row, ChoiceRow)
        choose(row, mounting_edits.hang_key("sleeve", "upper"))
        rod = window.document.design.parts[index]
        assert rod.hangs_from is not None and rod.hangs_from.part == "sleeve"  # type: ignore[union-attr]
        rod0, sleeve = design.parts[0], design.parts[1]
        # The sleeve stands on the rod's lower end; its upper end is that less its length
        # (plain geometry).
        assert rod.top_m == pytest.approx(rod0.top_m + rod0.length_m - sleeve.length_m)  # type: ignore[union-attr]
        assert f"parts[{index}].top_m" not in window.design_panel.all_rows()
        row = window.design_panel.row(f"parts[{index}].hangs_from")  # rebuilt: no top row
        assert isinstance(row, ChoiceRow)
        choose(row, mounting_edits.PIVOT)
        assert window.document.design.parts[index].hangs_from is None  # type: ignore[union-attr]

    def test_bob_support_and_hole_change_the_analysis(self, window: MainWindow) -> None:
        window.design_panel.select_part(2)
        support = window.design_panel.row("parts[2].support")
        assert isinstance(support, ChoiceRow)
        before = analyse(window.document.design)
        choose(support, "centre")
        assert window.document.design.parts[2].support == "centre"  # type: ignore[union-attr]
        # Supported at its centre, the sleeve's top is at the bob's centre instead of its
        # bottom, so the bob hangs half its height lower (plain geometry): it swings slower.
        assert analyse(window.document.design).period_s > before.period_s
        hole = window.design_panel.row("parts[2].hole_diameter_m")
        hole.check.setChecked(True)  # type: ignore[attr-defined]
        assert window.document.design.parts[2].hole_diameter_m == pytest.approx(0.008)  # type: ignore[union-attr]

    def test_a_rod_cannot_hang_from_itself_through_a_loop(self) -> None:
        design = load_design(Path(__file__).resolve().parents[2] / "resources" / "examples"
                             / "workshop_regulator.pendulum.json")
        with pytest.raises(DesignError):
            mounting_edits.set_hangs_from(design, 0, mounting_edits.hang_key("sleeve", "upper"))
