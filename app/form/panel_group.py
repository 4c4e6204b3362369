"""A titled group of entries in the design panel, drawn by hand in the theme's colours.

The design panel carries no style sheet (see :mod:`app.theme`), so its groups draw their own
frame: a rounded, lightly filled box in the theme's rule colour with the title, in semi-bold
ink, set into the top edge on the window's paper.
"""

from __future__ import annotations

from PySide6.QtCore import QRectF, Qt
from PySide6.QtGui import QColor, QFont, QFontMetrics, QPainter, QPaintEvent, QPen
from PySide6.QtWidgets import QGroupBox, QWidget

from app import theme

__all__ = ["PanelGroup", "TITLE_INSET_PX", "CORNER_PX"]

TITLE_INSET_PX = 8  # from the frame's left edge to the title's patch
CORNER_PX = 5.0     # corner radius of the frame


class PanelGroup(QGroupBox):
    """A :class:`QGroupBox` whose frame and title are painted in the theme's colours."""

    def __init__(self, title: str, parent: QWidget | None = None) -> None:
        super().__init__(title, parent)
        self._title_font = QFont(self.font())
        self._title_font.setWeight(QFont.Weight.DemiBold)

    def paintEvent(self, _event: QPaintEvent) -> None:
        """Frame from half the title's height down; the title on a patch of paper."""
        metrics = QFontMetrics(self._title_font)
        top = metrics.height() / 2.0
        painter = QPainter(self)
        painter.setRenderHint(QPainter.RenderHint.Antialiasing)
        frame = QRectF(self.rect()).adjusted(0.5, top + 0.5, -0.5, -0.5)
        painter.setPen(QPen(QColor(theme.GROUP_BORDER), 1.0))
        painter.setBrush(QColor(theme.GROUP_BACKGROUND))
        painter.drawRoundedRect(frame, CORNER_PX, CORNER_PX)
        text = self.title()
        if text:
            width = metrics.horizontalAdvance(text) + 6
            patch = QRectF(TITLE_INSET_PX, 0, width, metrics.height())
            painter.fillRect(patch, QColor(theme.WINDOW))
            painter.setFont(self._title_font)
            painter.setPen(QColor(theme.INK))
            painter.drawText(patch, Qt.AlignmentFlag.AlignCenter, text)
        painter.end()
