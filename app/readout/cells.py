"""The readout's text cells: written only when they change, and the budget's row texts.

What was last set in each cell is remembered on the :class:`TreeCells` of one tree (reading it
back from Qt is slow), keyed by the item; the tree's items are made once, so the memory is as
large as the tree and goes with it.
"""

from __future__ import annotations

from collections.abc import Iterable
from html import escape
from typing import Any

from PySide6.QtCore import QSignalBlocker
from PySide6.QtWidgets import QTreeWidget, QTreeWidgetItem

from app.form.units import UnitSystem, format_sig, readout_unit
from app.readout.readout_format import format_value
from core import Result

__all__ = ["TreeCells", "budget_rows", "range_text", "convert", "delta_text", "bullets"]


class TreeCells:
    """Sets the texts and tooltips of one tree's cells, skipping unchanged ones."""

    def __init__(self, tree: QTreeWidget) -> None:
        self.tree = tree
        self._shown: dict[tuple[int, int], str] = {}  # (id of a live item, column) -> text
        self._tips: dict[int, str] = {}

    def write(self, cells: list[tuple[QTreeWidgetItem, int, str]]) -> None:
        """Set the text of one-line cells (``(item, column, text)``; unchanged ones are
        skipped).

        The tree learns of each change by a repaint of that cell alone. Qt's own change
        notice would also measure the row's height again (the rows are not all of one height:
        the budget's range entries are taller), which one line of new text cannot change; on
        a live drag that measuring is a cost paid for nothing.
        """
        changed: list[tuple[QTreeWidgetItem, int]] = []
        with QSignalBlocker(self.tree.model()):
            for item, column, text in cells:
                key = (id(item), column)
                if self._shown.get(key) != text:
                    self._shown[key] = text
                    item.setText(column, text)
                    changed.append((item, column))
        viewport = self.tree.viewport()
        for item, column in changed:
            viewport.update(self.tree.visualRect(self.tree.indexFromItem(item, column)))

    def set_text(self, item: QTreeWidgetItem, column: int, text: str) -> None:
        """Set a cell's text only when it changes (each change costs a relayout and
        repaint)."""
        key = (id(item), column)
        if self._shown.get(key) != text:
            self._shown[key] = text
            item.setText(column, text)

    def set_tip(self, item: QTreeWidgetItem, tip: str) -> None:
        """Set the first column's tooltip only when it changes."""
        if self._tips.get(id(item)) != tip:
            self._tips[id(item)] = tip
            item.setToolTip(0, tip)


def budget_rows(result: Result, system: UnitSystem
                ) -> tuple[list[tuple[str, str, str]], list[str]]:
    """The rate budget's rows (label, value, unit) and their tooltips, in ``system``'s
    units: one line per cause, then the worst case and the root sum square."""
    rows: list[tuple[str, str, str]] = []
    tips: list[str] = []
    site = result.design.site
    nominal = {"°C": site.temperature_c, "hPa": site.pressure_hpa,
               "°": result.amplitude_deg}  # what each range is taken about, by its unit
    for line in result.budget.lines:
        unit = readout_unit(line.unit, system)
        low, high = unit.convert(line.low), unit.convert(line.high)
        centre = nominal.get(line.unit)
        shown = range_text(low, high, None if centre is None else unit.convert(centre))
        gap = "" if unit.text == "°" else " "
        rows.append((f"{line.cause} {shown}{gap}{unit.text}",
                     format_value(abs(line.spread_s_per_day), "{:.2f}"), "s/day"))
        tips.append(f"Spread of the rate, end to end, while the {line.cause.lower()} goes from "
                    f"{format_sig(low, 6)} to {format_sig(high, 6)} {unit.text}: rate "
                    f"{format_value(line.rate_at_low_s_per_day, '{:+.2f}')} s/day at the low "
                    f"end, {format_value(line.rate_at_high_s_per_day, '{:+.2f}')} s/day at the "
                    "high end")
    rows.append(("Worst case (sum)",
                 format_value(result.budget.worst_case_s_per_day, "{:.2f}"), "s/day"))
    tips.append("Sum of the spreads above: every cause pushing the same way at once")
    rows.append(("Root sum square",
                 format_value(result.budget.root_sum_square_s_per_day, "{:.2f}"), "s/day"))
    tips.append("Square root of the sum of the squared spreads: the causes taken as "
                "independent of each other")
    return rows, tips


def range_text(low: float, high: float, nominal: float | None) -> str:
    """A budget range shown briefly: "±5" when it is centred on the ``nominal`` value (the
    site's, or the working arc), "0–1063" when one end is cut short (a pressure range wider
    than the site's pressure); the exact ends are in the row's tooltip."""
    half = 0.5 * (high - low)
    middle = 0.5 * (high + low)
    if nominal is not None and abs(middle - nominal) <= 1e-9 * max(1.0, abs(nominal)):
        return f"±{half:.3g}"
    return f"{low:.4g}–{high:.4g}"


def convert(value: Any, unit: Any) -> Any:
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        return unit.convert(float(value))
    return value


def delta_text(value: Any, base: Any, scale: float, fmt: str) -> str:
    if not (isinstance(value, (int, float)) and isinstance(base, (int, float))):
        return ""
    return format_value((float(value) - float(base)) * scale, signed(fmt))


def bullets(lines: Iterable[str]) -> str:
    return "".join(f"<p style='margin:0 0 4px 0'>{escape(text)}</p>" for text in lines)


def signed(fmt: str) -> str:
    """The same format with an explicit sign (for differences)."""
    return fmt if fmt.startswith("{:+") else fmt.replace("{:", "{:+", 1)


