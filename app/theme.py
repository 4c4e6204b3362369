"""Colours and the style sheet of the workbench: a calm light scheme, ink on warm paper.

Plot colours are chosen to stay apart for the common colour-vision differences (blue, orange,
plum, slate) and to print legibly in grey.

The style sheet is set on the readout, the plot area and the dialogs, never on the whole
window: every widget under a style sheet is drawn through Qt's style-sheet style, and the design
panel's ~270 widgets then took 3.0 ms to repaint against 0.8 ms without (1440×900, measured).
The design panel gets its look from the palette instead (:func:`colour_window`,
:func:`set_role`, :func:`mark_invalid` and :class:`app.form.panel_group.PanelGroup`). Lists and
tables take their row colours from the palette too (:func:`colour_list`): a style-sheet rule
that matches an item view made each repaint of the readout's tree 3.3 ms against 0.6 ms.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

# At the top: an import inside a function passes PySide's import hook on every call (~0.6 ms).
from PySide6.QtGui import QColor, QPalette

if TYPE_CHECKING:
    from PySide6.QtWidgets import QAbstractItemView, QAbstractScrollArea, QWidget

__all__ = ["PLOT_BACKGROUND", "PLOT_FOREGROUND", "INK", "EXACT", "LINEAR", "DIFFERENCE",
           "NEIGHBOUR", "SEPARATRIX", "OVER_THE_TOP", "GHOST", "MARKER", "PROBLEM",
           "STYLE_SHEET", "WINDOW", "GROUP_BACKGROUND", "GROUP_BORDER", "LIST_BASE",
           "LIST_ALTERNATE", "ROLE_COLOURS", "SCROLLBAR_STYLE", "colour_list", "colour_window",
           "flat_scrollbars", "set_role",
           "mark_invalid"]

PLOT_BACKGROUND = "#fcfbf8"
PLOT_FOREGROUND = "#3d434a"
INK = "#23282e"

EXACT = "#1f5f99"        # deep blue: the exact solution, this swing
LINEAR = "#d9822b"       # orange: the small-angle (linearised) model
DIFFERENCE = "#8e4a86"   # plum: exact minus linearised, circular error
NEIGHBOUR = "#93b4d3"    # pale blue: other semi-arcs
SEPARATRIX = "#4f5b66"   # slate: the boundary between swinging and going over the top
OVER_THE_TOP = "#c9a96e" # sand: orbits over the top
GHOST = "#b9b9b9"        # grey: the pinned baseline
MARKER = "#2e7d5b"       # green: the working semi-arc marker
PROBLEM = "#b3261e"      # red: refused entries

WINDOW = "#f4f2ee"            # the window's paper
GROUP_BACKGROUND = "#fbfaf7"  # inside a titled group of entries
GROUP_BORDER = "#d8d4cc"      # frames and rules
LIST_BASE = "#fffefc"       # the background of lists and tables
LIST_ALTERNATE = "#f7f5f0"  # every other row of a list or table

ROLE_COLOURS = {"unit": "#5d646c", "problem": PROBLEM, "hint": "#6b7178"}
"""The colour of a label's text by its role ("" or any other role: the palette's ink)."""
INVALID_STYLE = ("{cls} {{ border: 2px solid " + PROBLEM
                 + "; border-radius: 3px; background: #fff6f5; }}")

SCROLLBAR_STYLE = f"""
QScrollBar:vertical {{ background: {WINDOW}; width: 12px; margin: 0; }}
QScrollBar:horizontal {{ background: {WINDOW}; height: 12px; margin: 0; }}
QScrollBar::handle {{ background: #c9c4ba; border-radius: 4px; margin: 2px; }}
QScrollBar::handle:hover {{ background: #b3ada2; }}
QScrollBar::handle:vertical {{ min-height: 24px; }}
QScrollBar::handle:horizontal {{ min-width: 24px; }}
QScrollBar::add-line, QScrollBar::sub-line {{ width: 0; height: 0; }}
QScrollBar::add-page, QScrollBar::sub-page {{ background: none; }}
"""
"""Flat scroll bars: the platform style's shaded ones took 2.2–3.5 ms to repaint at 1440×900
against 0.04 ms for these (measured), and a full repaint of the window has two."""

STYLE_SHEET = f"""
QWidget#ReadoutPanel {{ background: {WINDOW}; }}
QGroupBox {{
    font-weight: 600; border: 1px solid {GROUP_BORDER}; border-radius: 5px;
    margin-top: 14px; padding: 8px 6px 6px 6px; background: {GROUP_BACKGROUND};
}}
QGroupBox::title {{ subcontrol-origin: margin; left: 8px; padding: 0 3px; color: {INK}; }}
QGroupBox QLabel {{ font-weight: normal; }}
QLabel#ComputeProblem {{
    background: #fdeceb; border: 1px solid #e0a5a0; border-radius: 4px; padding: 6px;
    color: #6d1c16;
}}
QFrame#Caution {{
    background: #fff5dc; border: 1px solid #e2b34c; border-left: 5px solid #d39a1c;
    border-radius: 4px;
}}
QFrame#Warning {{
    background: #eef3f8; border: 1px solid #b9cadb; border-left: 5px solid #5d87b0;
    border-radius: 4px;
}}
QLabel#NoteHeading {{ font-weight: 700; color: {INK}; }}
QHeaderView::section {{
    background: #ebe8e1; border: none; border-right: 1px solid {GROUP_BORDER}; padding: 3px 6px;
    font-weight: 600;
}}
QTabWidget::pane {{ border: 1px solid {GROUP_BORDER}; background: {PLOT_BACKGROUND}; }}
""" + SCROLLBAR_STYLE


def colour_list(view: QAbstractItemView) -> None:
    """Give a list, tree or table the workbench's row colours through its palette (see the
    module notes for why not through the style sheet)."""
    palette = view.palette()
    palette.setColor(QPalette.ColorRole.Base, QColor(LIST_BASE))
    palette.setColor(QPalette.ColorRole.AlternateBase, QColor(LIST_ALTERNATE))
    view.setPalette(palette)


def colour_window(widget: QWidget) -> None:
    """The window's paper and ink in ``widget``'s palette (its children inherit them)."""
    palette = widget.palette()
    palette.setColor(QPalette.ColorRole.Window, QColor(WINDOW))
    palette.setColor(QPalette.ColorRole.WindowText, QColor(INK))
    widget.setPalette(palette)


def flat_scrollbars(area: QAbstractScrollArea) -> None:
    """Give a scroll area outside the style sheet the flat scroll bars (:data:`SCROLLBAR_STYLE`,
    set on the two bars alone)."""
    for bar in (area.verticalScrollBar(), area.horizontalScrollBar()):
        bar.setStyleSheet(SCROLLBAR_STYLE)


def set_role(label: QWidget, role: str) -> None:
    """Mark ``label`` as a unit, a problem or a hint (its ``role`` property) and colour its
    text so; "" makes it plain ink again."""
    label.setProperty("role", role)
    palette = label.palette()
    palette.setColor(QPalette.ColorRole.WindowText, QColor(ROLE_COLOURS.get(role, INK)))
    label.setPalette(palette)


def mark_invalid(widget: QWidget, invalid: bool) -> None:
    """Outline an entry in red (and set its ``invalid`` property) or clear the outline. The
    outline is a style sheet of the entry alone, so only refused entries pay for one."""
    widget.setProperty("invalid", invalid)
    cls = widget.metaObject().className()
    widget.setStyleSheet(INVALID_STYLE.format(cls=cls) if invalid else "")
