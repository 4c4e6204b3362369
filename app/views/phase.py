"""The phase-plane view: angular velocity against angle."""

from __future__ import annotations

import numpy as np
from PySide6.QtCore import QSignalBlocker
from PySide6.QtGui import QAction
from PySide6.QtWidgets import QCheckBox, QWidget

from app import theme
from app.views.axes import degrees
from app.views.chart import ChartView, fill_slots
from core import Result

__all__ = ["PhasePlot"]


class PhasePlot(ChartView):
    """Angular velocity against angle: this swing's orbit, neighbouring semi-arcs, the
    separatrix and orbits going over the top.

    The view frames this swing and its neighbours; "Show separatrix" frames ±180° and the
    separatrix instead (a clock's ±2° orbit is then a small ellipse in the middle).
    """

    title = "Phase plane"
    slug = "phase"
    caption = ("Angular velocity against angle: this swing's orbit, neighbouring semi-arcs "
               "and the separatrix between swinging and going over the top.")
    NEIGHBOUR_SLOTS = 8
    OVER_THE_TOP_SLOTS = 4

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        item = self.getPlotItem()
        item.setLabel("bottom", "Angle (°)")
        item.setLabel("left", "Angular velocity (°/s)")
        self.ghost = self._curve(theme.GHOST, 2.0, None, z=-10)
        self.current = self._curve(theme.EXACT, 2.5, "This swing", z=3)
        self.neighbours = [self._curve(theme.NEIGHBOUR, 1.0, "Other semi-arcs" if i == 0
                                       else None, z=1) for i in range(self.NEIGHBOUR_SLOTS)]
        self.separatrix = self._curve(theme.SEPARATRIX, 1.5, "Separatrix", z=2)
        self.over_the_top = [self._curve(theme.OVER_THE_TOP, 1.0, "Over the top" if i == 0
                                         else None, z=0) for i in range(self.OVER_THE_TOP_SLOTS)]
        self._show_separatrix = False
        strip = self.control_bar()
        self.separatrix_box = QCheckBox("Show separatrix")
        self.separatrix_box.setToolTip("Zoom out to ±180° to see the separatrix between "
                                       "swinging and going over the top")
        self.separatrix_box.toggled.connect(self.set_show_separatrix)
        strip.addWidget(self.separatrix_box)
        action = QAction("Show separatrix (±180°)", item.vb.menu)
        action.setCheckable(True)
        action.toggled.connect(self.set_show_separatrix)
        item.vb.menu.addAction(action)
        self.separatrix_action = action

    def set_show_separatrix(self, show: bool) -> None:
        """Frame ±180° and the separatrix (True) or this swing and its neighbours (False);
        the view follows each new result again."""
        self._show_separatrix = bool(show)
        for control in (self.separatrix_box, self.separatrix_action):
            if control.isChecked() != self._show_separatrix:
                with QSignalBlocker(control):
                    control.setChecked(self._show_separatrix)
        self._follow = True
        self._reframe()

    @property
    def shows_separatrix(self) -> bool:
        """True while the view is zoomed out to the separatrix."""
        return self._show_separatrix

    def show_result(self, result: Result, baseline: Result | None = None) -> None:
        """Draw ``result.phase`` in degrees and degrees per second."""
        self._result_arrived(result, baseline)
        phase = result.phase
        self.current.setData(degrees(phase.current.angle_rad),
                             degrees(phase.current.angular_velocity_rad_s))
        fill_slots(self.neighbours, phase.neighbours)
        if phase.separatrix is None:
            self.separatrix.setData([], [])
        else:
            self.separatrix.setData(degrees(phase.separatrix.angle_rad),
                                    degrees(phase.separatrix.angular_velocity_rad_s))
        fill_slots(self.over_the_top, phase.rotating)
        self._show_ghost(self.ghost, None if baseline is None else
                   (degrees(baseline.phase.current.angle_rad),
                    degrees(baseline.phase.current.angular_velocity_rad_s)))
        if self.follows_result:
            self._frame(result)
        self._settle()

    def _reframe(self) -> None:
        if self._result is not None:
            self._frame(self._result)
            self._settle()

    def _frame(self, result: Result) -> None:
        """Frame this swing and its neighbours, or ±180° and the separatrix."""
        phase = result.phase
        orbits = (phase.current, *phase.neighbours)
        if self._show_separatrix:
            if phase.separatrix is not None:
                orbits = (*orbits, phase.separatrix)
            x = 180.0
        else:
            x = float(np.degrees(max(float(np.max(np.abs(o.angle_rad))) for o in orbits)))
        y = float(np.degrees(max(float(np.max(np.abs(o.angular_velocity_rad_s)))
                                 for o in orbits)))
        x, y = x * (1.0 if self._show_separatrix else 1.08), y * 1.08
        vb = self.getPlotItem().vb
        self._show_range(vb, 0, -x, x)
        self._show_range(vb, 1, -y, y)


