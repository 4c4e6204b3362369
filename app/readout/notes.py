"""The readout's notes: the result's warnings and safety cautions, each in its own box."""

from __future__ import annotations

from collections.abc import Sequence

from PySide6.QtCore import Qt
from PySide6.QtWidgets import QFrame, QLabel, QScrollArea, QSplitter, QVBoxLayout, QWidget

from app.readout.cells import bullets

__all__ = ["NotesPane"]


class NotesPane(QScrollArea):
    """Warnings and cautions of the latest result; a box is hidden when it has none."""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setWidgetResizable(True)
        self.setFrameShape(QFrame.Shape.NoFrame)
        body = QWidget()
        self.notes_layout = QVBoxLayout(body)
        self.notes_layout.setContentsMargins(0, 0, 4, 0)
        self.notes_layout.setSpacing(6)
        self.warning_box, self.warning_text = _note_box("Warning", "Warnings")
        self.caution_box, self.caution_text = _note_box("Caution", "Safety cautions")
        self.notes_layout.addWidget(self.warning_box)
        self.notes_layout.addWidget(self.caution_box)
        self.notes_layout.addStretch(1)
        self.setWidget(body)

    def show_notes(self, warnings: Sequence[str], cautions: Sequence[str]) -> None:
        """Show ``warnings`` and ``cautions`` as bullet lists."""
        self.warning_box.setVisible(bool(warnings))
        self.warning_text.setText(bullets(warnings))
        self.caution_box.setVisible(bool(cautions))
        self.caution_text.setText(bullets(cautions))


    def fit_in(self, splitter: QSplitter) -> None:
        """Take only the height the notes need in ``splitter`` (at most half of it); the pane
        above takes the rest."""
        total = sum(splitter.sizes())
        if total <= 0:
            return
        body = self.widget()
        if body is not None:
            body.adjustSize()
        need = self.needed_height(self.viewport().width() or self.width())
        self.setVisible(need > 0)  # no notes: the figures take the whole column
        if need == 0:
            return
        notes = min(need, total // 2)
        splitter.setSizes([total - notes, notes])

    def needed_height(self, width: int) -> int:
        """Height that shows every note whole at ``width`` px, px (0 when there are none)."""
        layout = self.notes_layout
        boxes = [b for b in (self.warning_box, self.caution_box) if not b.isHidden()]
        if not boxes:
            return 0
        margins = layout.contentsMargins()
        inner = max(50, width - margins.left() - margins.right())
        total = sum(_box_height(b, inner) for b in boxes)
        return total + layout.spacing() * (len(boxes) - 1) + margins.top() + margins.bottom() + 12


def _box_height(box: QFrame, width: int) -> int:
    layout = box.layout()
    if layout is not None and layout.hasHeightForWidth():
        return layout.totalHeightForWidth(width)
    return box.sizeHint().height()


def _note_box(name: str, heading: str) -> tuple[QFrame, QLabel]:
    box = QFrame()
    box.setObjectName(name)
    inner = QVBoxLayout(box)
    inner.setContentsMargins(10, 6, 8, 8)
    inner.setSpacing(3)
    title = QLabel(heading)
    title.setObjectName("NoteHeading")
    text = QLabel()
    text.setWordWrap(True)
    text.setTextFormat(Qt.TextFormat.RichText)
    text.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
    inner.addWidget(title)
    inner.addWidget(text)
    return box, text
