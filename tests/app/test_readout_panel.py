"""The readout: labels shown whole (the label column fits them, measured once), a tooltip
giving each figure's full description and JSON key, and the rate budget in short rows."""

from __future__ import annotations

from pathlib import Path

import pytest
from PySide6.QtCore import Qt

from app.form.units import UnitSystem
from app.readout.readout_format import DESCRIPTIONS, SECTIONS
from app.readout.readout_panel import BUDGET_RANGES, LABEL_PADDING_PX, ReadoutPanel
from core import analyse, load_design, with_value
from core.tuning import BudgetRanges

EXAMPLE = (Path(__file__).resolve().parents[2]
           / "resources/examples/workshop_regulator.pendulum.json")


@pytest.fixture(scope="module")
def results():  # type: ignore[no-untyped-def]
    design = load_design(EXAMPLE)
    return analyse(design), analyse(with_value(design, "parts[0].length_m", 1.2))


@pytest.fixture
def panel(qtbot):  # type: ignore[no-untyped-def]
    view = ReadoutPanel()
    qtbot.addWidget(view)
    view.setMinimumWidth(330)  # as the window asks
    view.setAttribute(Qt.WidgetAttribute.WA_DontShowOnScreen, True)
    return view


def _labels_fit(panel: ReadoutPanel) -> bool:
    tree = panel.tree
    metrics = tree.fontMetrics()
    room = tree.header().sectionSize(0) - LABEL_PADDING_PX
    return all(metrics.horizontalAdvance(item.text(0)) <= room
               for item, _unit, _fmt in panel._items.values())


def test_every_label_is_shown_whole_at_the_least_width(panel, results) -> None:  # type: ignore[no-untyped-def]
    panel.show_result(results[0])
    panel.resize(panel.minimumSizeHint().width(), 700)
    panel.show()
    assert panel.width() <= 380  # still a side panel
    assert _labels_fit(panel)


def test_with_a_baseline_the_panel_widens_to_keep_labels_whole(panel, results) -> None:  # type: ignore[no-untyped-def]
    result, baseline = results
    panel.show_result(result)
    narrow = panel.minimumWidth()
    panel.show_result(result, baseline)
    assert not panel.tree.isColumnHidden(3)
    assert panel.minimumWidth() > narrow
    panel.resize(panel.minimumWidth(), 700)
    panel.show()
    assert _labels_fit(panel)
    panel.show_result(result)
    assert panel.minimumWidth() == narrow


def test_tooltips_give_the_full_description_and_json_key(panel) -> None:  # type: ignore[no-untyped-def]
    for _section, rows in SECTIONS:
        for key, _label, _unit, _fmt in rows:
            tip = panel._items[key][0].toolTip(0)
            assert tip == f"{DESCRIPTIONS[key]}.\nJSON key: {key}"
    assert "I/(M·h)" in panel._items["centre_of_oscillation_m"][0].toolTip(0)


def test_budget_rows_are_short_and_their_tooltips_exact(panel, results) -> None:  # type: ignore[no-untyped-def]
    result, _ = results  # site 20 °C, 1013.25 hPa, semi-arc 1.6°; ranges ±5 K, ±30 hPa, ±0.1°
    panel.show_result(result)
    rows = [item.text(0) for item in panel._budget_items if not item.isHidden()]
    assert rows == ["Temperature ±5 °C", "Air pressure ±30 hPa", "Semi-arc ±0.1°",
                    "Worst case (sum)", "Root sum square"]
    tip = panel._budget_items[1].toolTip(0)
    line = result.budget.lines[1]
    assert tip.startswith("Spread of the rate, end to end, while the air pressure goes from "
                          "983.25 to 1043.25 hPa: rate ")
    assert f"{line.rate_at_low_s_per_day:+.2f} s/day at the low end" in tip


def test_a_range_about_the_site_value_is_shown_as_plus_minus_even_about_zero(panel) -> None:  # type: ignore[no-untyped-def]
    design = with_value(with_value(load_design(EXAMPLE), "site.temperature_c", 0.0),
                        "site.pressure_hpa", 20.0)
    panel.show_result(analyse(design, budget_ranges=BudgetRanges(temperature_k=10.0)))
    rows = [item.text(0) for item in panel._budget_items[:3]]
    # ±10 K about 0 °C; the pressure range is cut at vacuum: 0 to 20 + 30 hPa.
    assert rows == ["Temperature ±10 °C", "Air pressure 0–50 hPa", "Semi-arc ±0.1°"]


def test_range_entries_open_the_budget_section_in_the_value_column(panel, results) -> None:  # type: ignore[no-untyped-def]
    panel.show_result(results[0])
    panel.set_budget_ranges(BudgetRanges(temperature_k=7.5, pressure_hpa=12.0, arc_deg=0.3))
    head = panel._budget_head
    labels = [head.child(i).text(0) for i in range(3)]
    assert labels == [label for _key, label, _tip in BUDGET_RANGES]
    assert head.child(3) is panel._budget_items[0]
    shown = {key: panel.tree.itemWidget(panel._range_items[key], 1).text()
             for key, _label, _tip in BUDGET_RANGES}
    assert shown == {"temperature_k": "7.5", "pressure_hpa": "12", "arc_deg": "0.3"}
    assert [head.child(i).text(2) for i in range(3)] == ["°C", "hPa", "°"]
    panel.set_unit_system(UnitSystem.INCH_POUND)
    assert panel.budget_fields["temperature_k"].text() == "13.5"  # 7.5 K = 13.5 °F
    assert [head.child(i).text(2) for i in range(3)] == ["°F", "inHg", "°"]


def test_range_labels_are_shown_whole_at_the_least_width(panel, results) -> None:  # type: ignore[no-untyped-def]
    panel.show_result(results[0])
    panel.resize(panel.minimumSizeHint().width(), 700)
    panel.show()
    metrics = panel.tree.fontMetrics()
    room = panel.tree.header().sectionSize(0) - LABEL_PADDING_PX
    assert all(metrics.horizontalAdvance(item.text(0)) <= room
               for item in panel._range_items.values())
    for key, item in panel._range_items.items():  # each entry stands in its row, whole
        entry = panel.budget_fields[key]
        assert panel.tree.visualItemRect(item).height() >= entry.sizeHint().height()


def test_budget_lines_with_long_ranges_widen_the_labels_to_stay_whole(results) -> None:  # type: ignore[no-untyped-def]
    panel = ReadoutPanel(UnitSystem.INCH_POUND)  # "Air pressure ±0.886 inHg" is the longest
    panel.setMinimumWidth(330)
    panel.setAttribute(Qt.WidgetAttribute.WA_DontShowOnScreen, True)
    panel.show_result(results[0])
    panel.resize(panel.minimumWidth(), 700)
    panel.show()
    metrics = panel.tree.fontMetrics()
    room = panel.tree.header().sectionSize(0) - LABEL_PADDING_PX
    labels = [item.text(0) for item in panel._budget_items if not item.isHidden()]
    assert "Air pressure ±0.886 inHg" in labels
    assert all(metrics.horizontalAdvance(text) <= room for text in labels)
    assert _labels_fit(panel)
    panel.close()
    panel.deleteLater()
