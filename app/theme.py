"""Colours and the style sheet of the workbench: a calm light scheme, ink on warm paper.

Plot colours are chosen to stay apart for the common colour-vision differences (blue, orange,
plum, slate) and to print legibly in grey.
"""

from __future__ import annotations

__all__ = ["PLOT_BACKGROUND", "PLOT_FOREGROUND", "INK", "EXACT", "LINEAR", "DIFFERENCE",
           "NEIGHBOUR", "SEPARATRIX", "OVER_THE_TOP", "GHOST", "MARKER", "PROBLEM",
           "STYLE_SHEET"]

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

STYLE_SHEET = f"""
QMainWindow, QWidget#DesignPanel, QWidget#ReadoutPanel {{ background: #f4f2ee; }}
QScrollArea#DesignScroll {{ border: none; background: #f4f2ee; }}
QGroupBox {{
    font-weight: 600; border: 1px solid #d8d4cc; border-radius: 5px;
    margin-top: 14px; padding: 8px 6px 6px 6px; background: #fbfaf7;
}}
QGroupBox::title {{ subcontrol-origin: margin; left: 8px; padding: 0 3px; color: {INK}; }}
QGroupBox QLabel {{ font-weight: normal; }}
QLabel[role="unit"] {{ color: #5d646c; }}
QLabel[role="problem"] {{ color: {PROBLEM}; }}
QLabel[role="hint"] {{ color: #6b7178; }}
NumberField[invalid="true"], QLineEdit[invalid="true"] {{
    border: 2px solid {PROBLEM}; border-radius: 3px; background: #fff6f5;
}}
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
QTreeWidget {{ background: #fffefc; alternate-background-color: #f7f5f0;
               border: 1px solid #d8d4cc; }}
QTreeWidget::item {{ padding: 1px 2px; }}
QHeaderView::section {{
    background: #ebe8e1; border: none; border-right: 1px solid #d8d4cc; padding: 3px 6px;
    font-weight: 600;
}}
QTabWidget::pane {{ border: 1px solid #d8d4cc; background: {PLOT_BACKGROUND}; }}
QListWidget {{ background: #fffefc; border: 1px solid #d8d4cc; }}
"""
