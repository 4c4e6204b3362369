"""The one shape every result view follows: :class:`ResultView`.

A view draws a :class:`core.Result` (and, in grey, a pinned baseline result) and can write
itself to PNG or SVG. What every view shares lives here, once:

- ``title`` and ``slug`` (the tab's and the file's name), ``grid_member`` (whether the "All
  plots" grid holds it), ``in_report`` (whether the headless exporter and the PDF show it),
  ``caption`` (the PDF's sentence under it);
- ``show_result(result, baseline)``, which every view implements, starting with
  :meth:`ResultView._result_arrived` (it keeps ``_result`` and ``_baseline`` and notes whether
  results are streaming in, as during a drag);
- following results: each new result is framed until the person pans or zooms; while results
  stream in the axes hold still as long as the data fit them well (:meth:`_show_range`), and
  are framed exactly once the stream stops (:meth:`_reframe`, which views override);
- the control bar: a strip over pyqtgraph's title row holding the title and the view's own
  controls (:meth:`control_bar`); it is a widget, not part of the drawing, so exports show
  the plot's own title;
- export: "Export PNG…" and "Export SVG…" in the view's context menu, :meth:`ask_export`
  and :meth:`export`, through :func:`app.views.plot_export.export_plot`;
- the baseline ghost's legend entry (:meth:`_set_ghost`).

Nothing here computes physics.
"""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path
from typing import Any, ClassVar, Protocol

import numpy as np
import pyqtgraph as pg
from PySide6.QtCore import QSignalBlocker, Qt, QTimer
from PySide6.QtGui import QAction, QColor, QPainter
from PySide6.QtWidgets import QComboBox, QFileDialog, QHBoxLayout, QLabel, QWidget

from app import theme
from app.views.plot_export import export_plot
from core import Result

__all__ = ["ResultView", "View", "select_quietly", "STREAM_SETTLE_MS", "KEEP_FILL",
           "DRAG_MARGIN", "TITLE_ROW_PX"]

TITLE_ROW_PX = 30  # pyqtgraph's fixed title row; the control bar covers it
STREAM_SETTLE_MS = 300  # results closer together than this are a live drag
KEEP_FILL = 0.6  # while dragging, a view range is kept while the data fill this much of it
DRAG_MARGIN = 0.2  # ... and a new one leaves this share of the data's span free each side
LEADING_GAP_PX = 12  # a bar with its controls on the left: room after the title


class View(Protocol):
    """What the window, the plot area and the exporters rely on in a view: a widget (the
    few ``QWidget`` methods they call are listed) with these names. :class:`ResultView`
    implements it; :class:`app.views.sweep.SweepPlot` follows it around a ``ResultView``."""

    title: str
    slug: str
    grid_member: bool
    in_report: bool
    caption: str

    def show_result(self, result: Result, baseline: Result | None = None) -> None: ...

    def export(self, path: str | Path) -> Path: ...

    def attach_controls(self) -> None: ...

    def pose_for_export(self) -> None: ...

    # QWidget's
    def resize(self, width: int, height: int, /) -> None: ...

    def show(self) -> None: ...

    def hide(self) -> None: ...

    def deleteLater(self) -> None: ...

    def setAttribute(self, attribute: Qt.WidgetAttribute, on: bool = True, /) -> None: ...


class ResultView(pg.PlotWidget):
    """Base of every view (see the module notes). Subclasses build their items in
    ``__init__``, fill them in ``show_result`` and frame them in ``_reframe``."""

    title: str = ""
    slug: str = ""
    grid_member: bool = True
    in_report: bool = True
    caption: str = ""
    follows_pan: ClassVar[bool] = True  # a pan or zoom stops framing each new result
    smooth_at_rest: ClassVar[bool] = False  # the whole view antialiased, but not in a drag

    def __init__(self, parent: QWidget | None = None,
                 background: str = theme.PLOT_BACKGROUND) -> None:
        super().__init__(parent=parent, background=background)
        self.strip: QWidget | None = None
        self._result: Result | None = None
        self._baseline: Result | None = None
        self._ghost_named = False
        item = self.getPlotItem()
        item.setTitle(self.title, color=theme.INK, size="10pt")
        self.sceneObj.contextMenu = []  # our own export actions replace the generic dialog
        self._add_export_actions(item.vb.menu)
        self._follow = True
        if self.follows_pan:
            item.vb.sigRangeChangedManually.connect(self._stop_following)
            item.autoBtn.clicked.connect(self._start_following)
        self._streaming = False
        self._stream_timer = QTimer(self)
        self._stream_timer.setSingleShot(True)
        self._stream_timer.setInterval(STREAM_SETTLE_MS)
        self._stream_timer.timeout.connect(self._stream_ended)

    # -------------------------------------------------------------- the view's API
    def show_result(self, result: Result, baseline: Result | None = None) -> None:
        """Draw ``result``, and ``baseline`` (when given) faintly in grey."""
        raise NotImplementedError  # pragma: no cover

    def attach_controls(self) -> None:
        """Put on-screen-only controls in place (views without any do nothing)."""

    def export(self, path: str | Path) -> Path:
        """Write this view to ``path`` (.png or .svg); returns the path."""
        return export_plot(self, path)

    def pose_for_export(self) -> None:
        """Hold still for a picture in a file (views that move override this)."""

    def ask_export(self, suffix: str) -> Path | None:
        """Ask for a file name, then export this view as ``suffix`` (".png" or ".svg")."""
        kind = "PNG image (*.png)" if suffix == ".png" else "SVG drawing (*.svg)"
        name, _ = QFileDialog.getSaveFileName(self, f"Export {self.title}",
                                              f"{self.slug}{suffix}", kind)
        if not name:
            return None
        path = Path(name)
        if path.suffix.lower() != suffix:
            path = path.with_name(path.name + suffix)
        self.export(path)
        return path

    @property
    def follows_result(self) -> bool:
        """True while the view frames each new result (until the person pans or zooms)."""
        return self._follow

    # -------------------------------------------------------------- following results
    def _result_arrived(self, result: Result, baseline: Result | None) -> None:
        """Call first in ``show_result``: keeps the result and baseline and notes whether new
        results are streaming in (the same result shown again, as for a baseline or an
        export, is not a stream)."""
        visible = self.isVisible()
        fresh = result is not self._result
        self._streaming = visible and fresh and self._stream_timer.isActive()
        if visible and fresh:
            self._stream_timer.start()
        self._result, self._baseline = result, baseline
        self._set_smooth(not self._streaming)

    def _alive(self) -> bool:
        """False while pyqtgraph builds or closes the widget (its items are gone then)."""
        return not getattr(self, "closed", False) and self.__dict__.get("plotItem") is not None

    def _set_smooth(self, on: bool) -> None:
        """Antialiased at rest, plain while results stream in (a live drag keeps its speed):
        the whole view with ``smooth_at_rest``; views that smooth only some items override
        this and :attr:`smooth`."""
        if self.smooth_at_rest and self._alive() and self.smooth != on:
            self.setAntialiasing(on)

    @property
    def smooth(self) -> bool:
        """True while the view is drawn antialiased."""
        return bool(self.renderHints() & QPainter.RenderHint.Antialiasing)

    def _stream_ended(self) -> None:
        self._streaming = False
        self._set_smooth(True)
        if self._follow and self._alive() and self._result is not None:
            self._reframe()

    def hideEvent(self, event: Any) -> None:  # Qt override
        """Hidden (another tab, or closing) in a stream: frame exactly now, not later."""
        if self._stream_timer.isActive():
            self._stream_timer.stop()
            self._stream_ended()
        super().hideEvent(event)

    def _show_range(self, view: pg.ViewBox, axis: int, lo: float, hi: float) -> None:
        """Show ``[lo, hi]`` on ``view``'s x (0) or y (1) axis; while results stream in,
        keep the current range as long as it frames ``[lo, hi]`` well."""
        if not (np.isfinite(lo) and np.isfinite(hi) and hi > lo):
            return
        if self._streaming:
            now_lo, now_hi = view.viewRange()[axis]
            if now_lo <= lo and hi <= now_hi and hi - lo >= KEEP_FILL * (now_hi - now_lo):
                return
            margin = DRAG_MARGIN * (hi - lo)
            lo, hi = lo - margin, hi + margin
        if axis == 0:
            view.setXRange(lo, hi, padding=0)
        else:
            view.setYRange(lo, hi, padding=0)

    def _stop_following(self, *_args: Any) -> None:
        self._follow = False

    def _start_following(self) -> None:
        self._follow = True
        self._reframe()

    def _reframe(self) -> None:
        """Frame the last result again (views override this)."""

    # -------------------------------------------------------------- the control bar
    def control_bar(self, leading: bool = False, strip: QWidget | None = None) -> QHBoxLayout:
        """The bar over the title row: the title (again, as a label) and this view's
        controls, right-aligned, or after the title when ``leading``. ``strip``: a widget
        already holding the controls in a ``QHBoxLayout`` (default: a new, empty one).
        Returns the bar's layout for the view to fill. The bar is not part of the scene, so
        exports show the plot's own title."""
        if strip is None:
            strip = QWidget(self)
            QHBoxLayout(strip)
        strip.setParent(self)
        strip.setObjectName("PlotControls")
        strip.setAutoFillBackground(True)
        palette = strip.palette()
        palette.setColor(strip.backgroundRole(), QColor(theme.PLOT_BACKGROUND))
        strip.setPalette(palette)
        layout = strip.layout()
        assert isinstance(layout, QHBoxLayout)
        layout.setContentsMargins(6, 2, 6, 2)
        layout.setSpacing(8)
        self.title_label = QLabel(self.title)
        self.title_label.setStyleSheet(f"color: {theme.INK}; font-size: 10pt;")
        layout.insertWidget(0, self.title_label)
        if leading:
            layout.insertSpacing(1, LEADING_GAP_PX)
        else:
            layout.insertStretch(1, 1)
        strip.show()
        self.strip = strip
        self._strip_layout = layout
        self._fit_strip()
        return layout

    def resizeEvent(self, event: Any) -> None:  # Qt override
        """Keep the control bar over the title row."""
        # pyqtgraph resizes once while its base is being built, and again while closing
        if self.__dict__.get("strip") is not None and self._alive():
            self._fit_strip()
        super().resizeEvent(event)

    def _fit_strip(self) -> None:
        """Keep the control bar over the title row; drop its title when the controls need
        the room (the tab or the grid cell already says which view it is)."""
        assert self.strip is not None
        self.strip.setGeometry(0, 0, self.width(), TITLE_ROW_PX)
        layout = self._strip_layout
        items = [layout.itemAt(i) for i in range(layout.count())]
        widgets = [item.widget() for item in items if item is not None]
        controls = sum(w.sizeHint().width() + layout.spacing() for w in widgets
                       if w is not None and w is not self.title_label)
        margins = layout.contentsMargins()
        room = self.width() - controls - margins.left() - margins.right() - layout.spacing()
        self.title_label.setVisible(self.title_label.sizeHint().width() <= room)

    def _set_title(self, text: str) -> None:
        """The title in the drawing (exports) and in the control bar (screen)."""
        self.getPlotItem().setTitle(text, color=theme.INK, size="10pt")
        if self.strip is not None:
            self.title_label.setText(text)
            self._fit_strip()

    # -------------------------------------------------------------- export menu
    def _add_export_actions(self, menu: Any) -> None:
        menu.addSeparator()
        for suffix, text in ((".png", "Export PNG…"), (".svg", "Export SVG…")):
            action = QAction(text, menu)
            action.triggered.connect(self._export_action(suffix))
            menu.addAction(action)

    def _export_action(self, suffix: str) -> Callable[[], None]:
        def run() -> None:
            self.ask_export(suffix)
        return run

    # -------------------------------------------------------------- baseline ghost
    def _set_ghost(self, curve: pg.PlotCurveItem, data: tuple[Any, Any] | None,
                   legend: pg.LegendItem | None = None) -> None:
        """Show the baseline's curve in grey, or hide it; its entry in ``legend`` (when
        given) follows."""
        if data is None:
            curve.setData([], [])
            if self._ghost_named and legend is not None:
                legend.removeItem(curve)
            self._ghost_named = False
            return
        curve.setData(np.asarray(data[0], dtype=float), np.asarray(data[1], dtype=float))
        if not self._ghost_named and legend is not None:
            legend.addItem(curve, "Baseline")
            self._ghost_named = True

    # -------------------------------------------------------------- painting
    def _settle(self) -> None:
        """Bring the view boxes' transforms up to date now.

        pyqtgraph defers them to the start of the next paint; changing them there marks every
        curve dirty again, and Qt paints the plot a second time straight after. Settling them
        here, once the new data and ranges are set, makes one paint per result.
        """
        if not self.isVisible():
            return
        views = [self.getPlotItem().vb] + [v for v in self.getPlotItem().scene().items()
                                            if isinstance(v, pg.ViewBox)]
        for view in views:
            view.prepareForPaint()


def select_quietly(box: QComboBox, key: Any) -> None:
    """Show ``key``'s entry in ``box`` without emitting its change signal."""
    index = box.findData(key)
    if index >= 0 and index != box.currentIndex():
        with QSignalBlocker(box):
            box.setCurrentIndex(index)
