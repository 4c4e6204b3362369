"""The swing preview's on-screen controls: play/pause, speed and a clearance line."""

from __future__ import annotations

from typing import TYPE_CHECKING

from PySide6 import QtCore, QtWidgets

from app.form.units import ReadoutUnit
from app.views.swing_animation import SPEED_LABELS, SPEEDS

if TYPE_CHECKING:
    from app.views.swing_preview import SwingPreview

__all__ = ["SwingPreviewControls", "LINE_WORDS"]

LINE_WORDS = ("Line below pivot", "Line")  # the clearance line's check box: wide, narrow


class SwingPreviewControls(QtWidgets.QWidget):
    """Play/pause, speed and clearance-line controls for a :class:`SwingPreview`."""

    def __init__(self, preview: SwingPreview, parent: QtWidgets.QWidget | None = None) -> None:
        super().__init__(parent)
        self.preview = preview
        self.play_button = QtWidgets.QToolButton()
        self.play_button.setText("Play")
        self.play_button.setCheckable(True)
        self.speed_box = QtWidgets.QComboBox()
        for factor in SPEEDS:
            self.speed_box.addItem(SPEED_LABELS[factor], factor)
        self.speed_box.setToolTip("Animation speed (1× is true speed)")
        self.speed_label = QtWidgets.QLabel("Speed")
        self.line_check = QtWidgets.QCheckBox(LINE_WORDS[0])
        self.line_check.setToolTip("Show a horizontal line (floor, barrier) below the pivot "
                                   "and the clearance of the swing above it")
        self.line_depth = QtWidgets.QDoubleSpinBox(suffix=" m", decimals=3, minimum=0.0,
                                                   maximum=1000.0, singleStep=0.05)
        self.line_depth.setToolTip("Depth of the line below the pivot")
        self.line_depth.setEnabled(False)
        self.line_depth.setVisible(False)  # shown with the line: the bar keeps its room
        self.narrow = False
        self._unit = ReadoutUnit("m")  # the depth entry's unit (the preview's axes' unit)
        layout = QtWidgets.QHBoxLayout(self)
        for w in (self.play_button, self.speed_label, self.speed_box,
                  self.line_check, self.line_depth):
            layout.addWidget(w)
        layout.addStretch(1)  # the preview's control bar puts its title before these
        self.play_button.toggled.connect(preview.set_playing)
        self.speed_box.currentIndexChanged.connect(
            lambda i: preview.set_speed(self.speed_box.itemData(i)))
        self.line_check.toggled.connect(self._on_line_toggled)
        self.line_depth.valueChanged.connect(self._on_depth_edited)
        preview.playingChanged.connect(self._on_playing_changed)
        preview.speedChanged.connect(self._on_speed_changed)
        preview.clearanceChanged.connect(self._on_clearance_changed)

    def set_narrow(self, narrow: bool) -> None:
        """Short words in a small pane (the grid): no "Speed" label, "Line" for the line."""
        if narrow == self.narrow:
            return
        self.narrow = narrow
        self.speed_label.setVisible(not narrow)
        self.line_check.setText(LINE_WORDS[1 if narrow else 0])

    def set_unit(self, unit: ReadoutUnit) -> None:
        """Give the line's depth in ``unit`` (the preview's axes' unit; the line stays put)."""
        depth_m = self.depth_m()
        self._unit = unit
        with QtCore.QSignalBlocker(self.line_depth):
            self.line_depth.setSuffix(f" {unit.text}")
            self.line_depth.setMaximum(1000.0 * unit.scale)
            self.line_depth.setSingleStep({"m": 0.05, "ft": 0.1}.get(unit.text, 1.0))
            self.line_depth.setValue(unit.convert(depth_m))

    def depth_m(self) -> float:
        """The depth typed in the entry, m."""
        return self.line_depth.value() / self._unit.scale

    def _on_line_toggled(self, on: bool) -> None:
        self.line_depth.setEnabled(on)
        self.line_depth.setVisible(on)
        if on and self.line_depth.value() <= 0.0:
            depth = self.preview.deepest_point_m() + 0.5  # half a metre under the swing
            self.line_depth.setValue(round(self._unit.convert(depth), 3))
        self.preview.set_clearance_line(self.depth_m() if on else None)

    def _on_depth_edited(self, _value: float) -> None:
        if self.line_check.isChecked():
            self.preview.set_clearance_line(self.depth_m())

    def _on_playing_changed(self, playing: bool) -> None:
        with QtCore.QSignalBlocker(self.play_button):
            self.play_button.setChecked(playing)
            self.play_button.setText("Pause" if playing else "Play")

    def _on_speed_changed(self, factor: float) -> None:
        with QtCore.QSignalBlocker(self.speed_box):
            self.speed_box.setCurrentIndex(SPEEDS.index(factor))

    def _on_clearance_changed(self) -> None:
        depth = self.preview.clearance_line_m()
        if depth is not None and abs(depth - self.depth_m()) > 5e-4:
            with QtCore.QSignalBlocker(self.line_depth):
                self.line_depth.setValue(self._unit.convert(depth))

