"""The readout: labels shown whole (the label column fits them, measured once), a tooltip
giving each figure's full description and JSON key, and the rate budget in short rows."""

from __future__ import annotations

from pathlib import Path

import pytest
from PySide6.QtCore import Qt

from app.readout_format import DESCRIPTIONS, SECTIONS
from app.readout_panel import LABEL_PADDING_PX, ReadoutPanel
from core import analyse, load_design, with_value

EXAMPLE = Path(__file__).resolve().parents[2] / "resources/examples/workshop_regulator.pendulum.json"


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
    assert tip.startswith("Air pressure from 983.25 to 1043.25 hPa: rate ")
    assert f"{line.rate_at_low_s_per_day:+.2f} s/day at the low end" in tip
