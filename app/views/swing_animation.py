"""The swing preview's animation: clocks, and playing at true speed or slowed.

True speed: the swing time shown is read from a clock, not counted up frame by frame. Playing
anchors the swing time to the clock's reading; each frame shows the pose at
``anchor swing time + speed × (clock now − anchor reading)``. A late or dropped frame (a busy
event loop during a drag) therefore never slows the swing down: the next frame drawn shows
where the pendulum truly is. The clock is a small object with a ``now_s()`` method
(:class:`WallClock` by default); tests hand the preview one they move by hand.

Angles come from the core's sampled motion (interpolated in time, and repeated every period
when the design has no damping); nothing is integrated here.
"""

from __future__ import annotations

import math
import time
from typing import TYPE_CHECKING, Any, Protocol, cast

import numpy as np
import shiboken6
from PySide6 import QtCore, QtGui

from app.views.swing_drawing import Drawing
from core import Result

__all__ = ["SPEEDS", "SPEED_LABELS", "FRAME_INTERVAL_MS", "TimeSource", "WallClock",
           "MotionClock", "SwingAnimation"]

SPEEDS: tuple[float, ...] = (1.0, 0.5, 0.25, 0.1)
"""Playback speed factors offered: true speed, ½×, ¼× and 1/10×."""

SPEED_LABELS = {1.0: "1×", 0.5: "½×", 0.25: "¼×", 0.1: "1/10×"}
FRAME_INTERVAL_MS = 16  # ≈ 60 frames per second


class TimeSource(Protocol):
    """Where the animation reads the time."""

    def now_s(self) -> float:
        """Seconds on a clock that never goes back (any origin)."""
        ...


class WallClock:
    """The animation's time source in the window: the monotonic performance counter, s."""

    def now_s(self) -> float:
        """Seconds on the monotonic performance counter (arbitrary origin)."""
        return time.perf_counter()


class MotionClock:
    """Angle against time from the core's sampled motion; loops for display.

    Without damping the motion is periodic and is repeated every ``period_s``; with damping the
    sampled span is played from release and then restarted.
    """

    def __init__(self, result: Result) -> None:
        m = result.motion
        self.time_s = np.asarray(m.time_s, dtype=float)
        self.angle_rad = np.asarray(m.angle_rad, dtype=float)
        damped = result.design.swing.quality_factor is not None
        self.loop_s = float(self.time_s[-1] if damped else result.period_s)
        self.amplitude_rad = math.radians(float(result.amplitude_deg))

    def angle_at(self, time_s: float) -> float:
        """Exact angle (rad) at ``time_s`` after release, interpolated between samples."""
        t = math.fmod(time_s, self.loop_s)
        if t < 0:
            t += self.loop_s
        return float(np.interp(t, self.time_s, self.angle_rad))


class SwingAnimation:
    """Playing, pausing, speed and swing time for :class:`~app.views.swing_preview.
    SwingPreview` (a mixin: the widget owns the drawings, the signals and the figures box)."""

    playingChanged: Any  # the widget's signals
    speedChanged: Any
    _drawing: Drawing | None
    _ghost: Drawing | None
    _clock: MotionClock | None
    _ghost_clock: MotionClock | None

    def _setup_animation(self, clock: TimeSource | None) -> None:
        """The animation's state and frame timer (stopped), and its context-menu entries."""
        self._time_s = 0.0
        self._speed = 1.0
        self._playing = False
        self._wall_clock: TimeSource = clock if clock is not None else WallClock()
        # While playing, the swing time shown is _anchor_time_s + speed × (now − _anchor_wall_s)
        self._anchor_wall_s = 0.0
        self._anchor_time_s = 0.0
        self._timer = QtCore.QTimer(cast(QtCore.QObject, self))
        self._timer.setTimerType(QtCore.Qt.TimerType.PreciseTimer)
        self._timer.setInterval(FRAME_INTERVAL_MS)
        self._timer.timeout.connect(self.draw_frame)
        self._setup_animation_menu()

    if TYPE_CHECKING:  # provided by the widget
        def _alive(self) -> bool: ...

        def _update_info(self) -> None: ...

        def getPlotItem(self) -> Any: ...

    def _setup_animation_menu(self) -> None:
        """Play/pause and speed in the view's context menu."""
        menu = self.getPlotItem().getViewBox().menu
        menu.addSeparator()
        self._play_action = menu.addAction("Play swing")
        self._play_action.setCheckable(True)
        self._play_action.toggled.connect(self.set_playing)
        speed_menu = menu.addMenu("Swing speed")
        group = QtGui.QActionGroup(cast(QtCore.QObject, self))
        self._speed_actions: dict[float, QtGui.QAction] = {}
        for factor in SPEEDS:
            action = speed_menu.addAction(SPEED_LABELS[factor])
            action.setCheckable(True)
            action.setChecked(factor == self._speed)
            action.triggered.connect(lambda _=False, f=factor: self.set_speed(f))
            group.addAction(action)
            self._speed_actions[factor] = action

    def set_playing(self, playing: bool) -> None:
        """Start or stop the animation (the timer runs only while playing)."""
        playing = bool(playing) and self._clock is not None
        if playing == self._playing:
            return
        if playing:
            self._anchor()
            self._playing = True
            self._timer.start()
        else:
            self._catch_up()  # pause where the swing truly is now
            self._playing = False
            self._timer.stop()
        if shiboken6.isValid(self._play_action):  # gone once the view is closed and deleted
            with QtCore.QSignalBlocker(self._play_action):
                self._play_action.setChecked(playing)
        self._update_info()
        self.playingChanged.emit(playing)

    def is_playing(self) -> bool:
        """True while the animation timer runs."""
        return self._playing and self._timer.isActive()

    @property
    def speed(self) -> float:
        """Playback speed factor: 1.0 is true speed (one of ``SPEEDS``)."""
        return self._speed

    def set_speed(self, factor: float) -> None:
        """Set the playback speed factor; it must be one of ``SPEEDS``."""
        if factor not in SPEEDS:
            raise ValueError(f"speed={factor!r} is not offered: choose one of {SPEEDS}")
        if factor == self._speed:
            return
        self._catch_up()  # the time so far at the old speed, from now on at the new one
        self._speed = factor
        self._speed_actions[factor].setChecked(True)
        self._update_info()
        self.speedChanged.emit(factor)

    @property
    def time_s(self) -> float:
        """Swing time shown by the last frame, s after release (while playing it runs at
        ``speed`` × the clock's time)."""
        return self._time_s

    def set_time(self, time_s: float) -> None:
        """Show the pendulum as it is ``time_s`` seconds after release from rest at θ₀ (while
        playing, the swing runs on from there)."""
        self._time_s = float(time_s)
        self._anchor()
        self._apply_time()

    def shown_angle_rad(self) -> float:
        """The angle the drawing currently shows, rad (positive: bob to the right)."""
        return 0.0 if self._drawing is None else self._drawing.angle_rad()

    def angle_at(self, time_s: float) -> float:
        """Exact angle (rad) of the shown design at ``time_s`` after release."""
        if self._clock is None:
            return 0.0
        return self._clock.angle_at(time_s)

    def draw_frame(self) -> None:
        """One animation frame (the frame timer calls this): pose the drawing at the swing
        time the clock says it is now. Does nothing while paused."""
        if not self._playing:
            return
        self._time_s = self._swing_time_now()
        self._apply_time()

    def _swing_time_now(self) -> float:
        """Swing time (s after release) at the clock's reading now, while playing."""
        elapsed = max(self._wall_clock.now_s() - self._anchor_wall_s, 0.0)
        return self._anchor_time_s + self._speed * elapsed

    def _anchor(self) -> None:
        """From now on, the swing time runs on from the one shown."""
        self._anchor_wall_s = self._wall_clock.now_s()
        self._anchor_time_s = self._time_s

    def _catch_up(self) -> None:
        """While the animation runs: bring the shown swing time up to the clock's now and
        anchor there (before a change of speed, a pause or hiding). While hidden the swing
        time holds, and nothing is caught up."""
        if not (self._playing and self._timer.isActive()):
            return
        self._time_s = self._swing_time_now()
        self._anchor()
        if self._alive():
            self._apply_time()

    def advance(self, wall_s: float) -> None:
        """Step the swing on by ``speed`` × ``wall_s`` seconds (by hand, whether playing or
        not; a playing animation runs on from the new time)."""
        self._time_s += self._speed * max(float(wall_s), 0.0)
        self._anchor()
        self._apply_time()

    def _apply_time(self) -> None:
        if self._drawing is not None and self._clock is not None:
            self._drawing.set_angle(self._clock.angle_at(self._time_s))
        if self._ghost is not None and self._ghost_clock is not None:
            self._ghost.set_angle(self._ghost_clock.angle_at(self._time_s))
