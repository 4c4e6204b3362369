"""The phase-plane view: angular velocity against angle."""

from __future__ import annotations

import numpy as np
from PySide6.QtCore import QSignalBlocker
from PySide6.QtGui import QAction
from PySide6.QtWidgets import QCheckBox, QWidget

from app import theme
from app.views.axes import degrees
from app.views.catalogue import from_card
from app.views.chart import ChartView, fill_slots, on_view
from core import Result

__all__ = ["PhasePlot"]


@from_card("phase")
class PhasePlot(ChartView):
    """Angular velocity against angle: this swing, neighbouring semi-arcs, the separatrix
    and orbits going over the top.

    A damped swing is drawn as the motion itself (the core's θ and θ̇ from release: a
    spiral, as tight as the damping is light); an undamped one as its closed orbit. The
    view frames this swing and its neighbours — and, from a semi-arc of
    ``WIDE_SWING_DEG``, the whole ±180° with the separatrix and the orbits over the top,
    which then lie close by; "Show separatrix" frames ±180° and the separatrix for any
    swing (a clock's ±2° orbit is then a small ellipse in the middle). The legend names only
    the lines on view.
    """

    caption = ("Angular velocity against angle: this swing (with damping, the motion from "
               "release), neighbouring semi-arcs and, where they reach the view, the "
               "separatrix between swinging and going over the top.")
    NEIGHBOUR_SLOTS = 8
    OVER_THE_TOP_SLOTS = 4
    WIDE_SWING_DEG = 90.0
    LOOPS_COINCIDE_PX = 0.5  # a damped motion's loops closer than this are drawn once in a drag

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        item = self.getPlotItem()
        item.setLabel("bottom", "Angle (°)")
        item.setLabel("left", "Angular velocity (°/s)")
        self.ghost = self._curve(theme.GHOST, 2.0, None, z=-10)
        self.current = self._curve(theme.EXACT, 2.5, "This swing", z=3, smooth=True)
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
        fill_slots(self.neighbours, phase.neighbours)
        if phase.separatrix is None:
            self.separatrix.setData([], [])
        else:
            self.separatrix.setData(degrees(phase.separatrix.angle_rad),
                                    degrees(phase.separatrix.angular_velocity_rad_s))
        fill_slots(self.over_the_top, phase.rotating)
        self._show_ghost(self.ghost, None if baseline is None else self._this_swing(baseline))
        if self.follows_result:
            self._frame(result)
        self.current.setData(*self._drawn_swing(result))
        self._settle()

    def _stream_ended(self) -> None:
        """At rest the damped motion is drawn whole again (see :meth:`_drawn_swing`)."""
        if self._alive() and self._result is not None:
            self.current.setData(*self._this_swing(self._result))
        super()._stream_ended()

    def _reframe(self) -> None:
        if self._result is not None:
            self._frame(self._result)
            self._settle()

    @staticmethod
    def _damped(result: Result) -> bool:
        return result.design.swing.quality_factor is not None

    def _this_swing(self, result: Result) -> tuple[np.ndarray, np.ndarray]:
        """This swing in ° and °/s: the damped motion from release, or the closed orbit."""
        if self._damped(result):
            m = result.motion
            return degrees(m.angle_rad), degrees(m.angular_velocity_rad_s)
        orbit = result.phase.current
        return degrees(orbit.angle_rad), degrees(orbit.angular_velocity_rad_s)

    def _drawn_swing(self, result: Result) -> tuple[np.ndarray, np.ndarray]:
        """This swing as drawn now: whole at rest; during a live drag, a damped motion whose
        later loops lie within ``LOOPS_COINCIDE_PX`` of its first on screen is drawn for its
        first period only (the thick line's later loops would be painted over it, at a cost
        in every step)."""
        x, y = self._this_swing(result)
        if not (self._streaming and self._damped(result)):
            return x, y
        first = result.motion.time_s <= result.period_s
        n = int(np.count_nonzero(first)) + 1
        if n >= x.size:
            return x, y
        vb = self.getPlotItem().vb
        (x0, x1), (y0, y1) = vb.viewRange()
        shrink_px = max(
            (np.max(np.abs(x[:n])) - np.max(np.abs(x[-n:]))) * vb.width() / max(x1 - x0, 1e-300),
            (np.max(np.abs(y[:n])) - np.max(np.abs(y[-n:]))) * vb.height() / max(y1 - y0, 1e-300))
        return (x[:n], y[:n]) if shrink_px < self.LOOPS_COINCIDE_PX else (x, y)

    def _frame(self, result: Result) -> None:
        """Frame this swing and its neighbours; or ±180° with the separatrix (asked for,
        or a wide swing, which also brings the orbits over the top on view)."""
        phase = result.phase
        wide = result.amplitude_deg >= self.WIDE_SWING_DEG
        whole = self._show_separatrix or wide
        orbits = [phase.current, *phase.neighbours]
        if whole and phase.separatrix is not None:
            orbits.append(phase.separatrix)
        if wide:
            orbits.extend(phase.rotating)
        xs = [degrees(o.angle_rad) for o in orbits]
        ys = [degrees(o.angular_velocity_rad_s) for o in orbits]
        extra = [self._this_swing(result)]
        if self._baseline is not None:
            extra.append(self._this_swing(self._baseline))
        xs += [e[0] for e in extra]
        ys += [e[1] for e in extra]
        x = 180.0 if whole else 1.08 * max(float(np.max(np.abs(a))) for a in xs if a.size)
        y = 1.08 * max(float(np.max(np.abs(a))) for a in ys if a.size)
        vb = self.getPlotItem().vb
        self._show_range(vb, 0, -x, x)
        self._show_range(vb, 1, -y, y)
        self._name_curves(result, (-x, x), (-y, y))

    def _name_curves(self, result: Result, x_range: tuple[float, float],
                     y_range: tuple[float, float]) -> None:
        """Name the lines on view: this swing (damped or its undamped orbit), the other
        semi-arcs, and the separatrix and orbits over the top when they reach the view."""
        entries = [(self.current, "This swing, damped" if self._damped(result)
                    else "This swing")]
        others = "Other semi-arcs" + (", undamped" if self._damped(result) else "")
        for curves, name in ((self.neighbours, others),
                             ([self.separatrix], "Separatrix"),
                             (self.over_the_top, "Over the top")):
            seen = next((c for c in curves
                         if on_view(c.getData()[0], c.getData()[1], x_range, y_range)), None)
            if seen is not None:
                entries.append((seen, name))
        self._name_in_legend(entries)


