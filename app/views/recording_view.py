"""The Recording view: a clock's beat and rate from a sound recording of its ticking.

"Open recording…" reads a WAV file (a stereo file's channels mixed, or the left or the right
one); the analysis (:func:`core.beats.analyse_recording`) runs on a worker thread
(:class:`app.views.recording_worker.RecordingAnalyser`) while the window stays live, and a newer
request supersedes an older one. The analysis is rated against the design's target period with
:meth:`core.beats.BeatAnalysis.rated`: a new target re-rates it without detecting the ticks
again. On view: each beat's interval against time (tick and tock with their own marker shapes),
the timing residuals, the sound around a chosen tick (click a point, or step with the spin box)
with its detected onset at 0, and the figures.

"Use this rate" offers to move the bob (:func:`core.rating_model.fit_model_to_clock` with the
default field) so the model's rate at the design's own conditions
(:func:`core.rating_model.reference_conditions`) equals the measured one — one undoable edit
through the document. The recording is not part of the design: only its path is remembered
(QSettings ``recording/last_path``). A tab of its own, not in the grid, the export or the PDF.
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING, Any

from PySide6.QtCore import QSignalBlocker, QSize, Qt
from PySide6.QtWidgets import (
    QComboBox,
    QFileDialog,
    QGroupBox,
    QHBoxLayout,
    QLabel,
    QMessageBox,
    QProgressBar,
    QPushButton,
    QScrollArea,
    QSpinBox,
    QSplitter,
    QVBoxLayout,
    QWidget,
)

from app import theme
from app.document.settings import app_settings
from app.views.catalogue import from_card
from app.views.document_view import DocumentView
from app.views.recording_figures import figures_html
from app.views.recording_plots import IntervalPlot, ResidualPlot, WaveformPlot
from app.views.recording_worker import RecordingAnalyser, Request, refusal_sentence
from core import Design, DesignError
from core.rating_model import fit_model_to_clock, reference_conditions

if TYPE_CHECKING:  # the recording analysis (scipy.signal…) loads when first used
    from core.beats import BeatAnalysis
    from core.recording import WavSource

__all__ = ["RecordingView", "CHANNELS", "LAST_PATH_KEY"]

CHANNELS = (("Channels mixed", None), ("Left channel", 0), ("Right channel", 1))
LAST_PATH_KEY = "recording/last_path"


@from_card("recording")
class RecordingView(DocumentView, QWidget):
    """A recording's beat, rate and ticks (see the module notes)."""

    caption = ""

    def __init__(self, parent: QWidget | None = None) -> None:
        super().__init__(parent)
        self.setMinimumSize(QSize(420, 320))
        self.document: Any = None
        self._design: Design | None = None
        self.path: Path | None = None
        self.source: WavSource | None = None
        self.raw_analysis: BeatAnalysis | None = None  # without a target
        self.analysis: BeatAnalysis | None = None  # rated against the design's target
        self.problem = ""
        self.chosen: int | None = None
        self._stale = False
        self.confirm = self._ask_confirm  # tests replace the question
        self.analyser = RecordingAnalyser(self)
        self.analyser.analysed.connect(self._on_analysed)
        self.analyser.refused.connect(self._on_refused)
        self.analyser.busyChanged.connect(self._on_busy)
        self._build()
        self._refuse("")

    # ------------------------------------------------------------------ building
    def _build(self) -> None:
        self.open_button = QPushButton("Open recording…")
        self.open_button.setToolTip("Read a WAV file of the clock ticking (8–96 kHz, mono or "
                                    "stereo); a minute is enough")
        self.open_button.clicked.connect(lambda _checked=False: self.ask_open())
        self.channel_box = QComboBox()
        for text, channel in CHANNELS:
            self.channel_box.addItem(text, channel)
        self.channel_box.setToolTip("Which channel of a stereo recording to listen to")
        self.channel_box.setEnabled(False)
        self.channel_box.currentIndexChanged.connect(lambda _i: self._channel_changed())
        self.file_label = QLabel("No recording")
        theme.set_role(self.file_label, "hint")
        self.busy_bar = QProgressBar()
        self.busy_bar.setRange(0, 0)  # busy: no measure of progress
        self.busy_bar.setMaximumWidth(120)
        self.busy_bar.setMaximumHeight(14)
        self.busy_bar.setTextVisible(False)
        self.busy_bar.hide()
        self.use_button = QPushButton("Use this rate…")
        self.use_button.setToolTip("Move the bob so the model's rate at the design's own "
                                   "conditions equals the rate measured here (one undo step)")
        self.use_button.clicked.connect(lambda _checked=False: self.ask_use_rate())
        bar = QHBoxLayout()
        bar.setContentsMargins(6, 4, 6, 2)
        bar.setSpacing(8)
        for w in (self.open_button, self.channel_box, self.file_label, self.busy_bar):
            bar.addWidget(w)
        bar.addStretch(1)
        bar.addWidget(self.use_button)

        self.interval_plot = IntervalPlot()
        self.residual_plot = ResidualPlot()
        self.residual_plot.setXLink(self.interval_plot)
        self.waveform_plot = WaveformPlot()
        for plot in (self.interval_plot, self.residual_plot):
            plot.tickClicked.connect(self.choose_tick)

        self.tick_spin = QSpinBox()
        self.tick_spin.setPrefix("tick ")
        self.tick_spin.setRange(0, 0)
        self.tick_spin.setToolTip("Step through the ticks (or click a point in the plots)")
        self.tick_spin.valueChanged.connect(lambda v: self.choose_tick(v - 1))
        self.tick_of = QLabel("")
        theme.set_role(self.tick_of, "hint")
        wave_box = QWidget()
        wave_layout = QVBoxLayout(wave_box)
        wave_layout.setContentsMargins(0, 0, 0, 0)
        wave_layout.setSpacing(2)
        step = QHBoxLayout()
        step.setContentsMargins(6, 0, 6, 0)
        step.addWidget(QLabel("Chosen:"))
        step.addWidget(self.tick_spin)
        step.addWidget(self.tick_of, 1)
        wave_layout.addLayout(step)
        wave_layout.addWidget(self.waveform_plot, 1)

        self.figures = QLabel()
        self.figures.setWordWrap(True)
        self.figures.setTextFormat(Qt.TextFormat.RichText)
        self.figures.setAlignment(Qt.AlignmentFlag.AlignTop | Qt.AlignmentFlag.AlignLeft)
        self.figures.setTextInteractionFlags(Qt.TextInteractionFlag.TextSelectableByMouse)
        self.figures.setStyleSheet("background: transparent;")
        scroll = QScrollArea()
        scroll.setWidgetResizable(True)
        scroll.setFrameShape(QScrollArea.Shape.NoFrame)
        scroll.setWidget(self.figures)
        scroll.viewport().setAutoFillBackground(False)
        self.figures_box = QGroupBox("Figures")
        QVBoxLayout(self.figures_box).addWidget(scroll)
        self.figures_box.setMinimumWidth(280)

        bottom = QSplitter(Qt.Orientation.Horizontal)
        bottom.setChildrenCollapsible(False)
        bottom.addWidget(wave_box)
        bottom.addWidget(self.figures_box)
        bottom.setStretchFactor(0, 1)
        bottom.setStretchFactor(1, 0)
        bottom.setSizes([390, 320])
        self.splitter = QSplitter(Qt.Orientation.Vertical)
        self.splitter.setChildrenCollapsible(False)
        for part in (self.interval_plot, self.residual_plot, bottom):
            self.splitter.addWidget(part)
        self.splitter.setSizes([250, 220, 360])
        self.bottom_splitter = bottom

        self.message = QLabel()
        self.message.setWordWrap(True)
        theme.set_role(self.message, "hint")
        layout = QVBoxLayout(self)
        layout.setContentsMargins(0, 0, 0, 4)
        layout.setSpacing(2)
        layout.addLayout(bar)
        layout.addWidget(self.splitter, 1)
        layout.addWidget(self.message)

    # ------------------------------------------------------------------ the view shape

    @property
    def busy(self) -> bool:
        """True while an analysis is awaited."""
        return self.analyser.busy

    # ------------------------------------------------------------------ the design's target
    def _on_design_changed(self, design: Design) -> None:
        old = self._design
        self._design = design
        if old is None or old.target != design.target:
            self._stale = True
            if self.isVisible():
                self._rerate()

    def showEvent(self, event: Any) -> None:  # Qt override
        super().showEvent(event)
        if self._stale:
            self._rerate()

    def _target(self) -> float | None:
        return None if self._design is None else self._design.target.target_period_s

    def _rerate(self) -> None:
        """Rate the analysis against the design's target (arithmetic in the core)."""
        self._stale = False
        if self.raw_analysis is not None:
            try:
                self.analysis = self.raw_analysis.rated(self._target())
            except DesignError as exc:  # a target outside what a clock's ticking can have
                self.analysis = self.raw_analysis
                self._say(f"The design's target cannot rate a recording: {exc.reason}.")
        self._show_figures()

    # ------------------------------------------------------------------ opening
    def ask_open(self) -> None:
        """Ask for a WAV file and analyse it."""
        start = str(self.path or app_settings().value(LAST_PATH_KEY, "") or "")
        name, _ = QFileDialog.getOpenFileName(self, "Open recording", start,
                                              "WAV recordings (*.wav *.wave);;All files (*)")
        if name:
            self.open_recording(name)

    def open_recording(self, path: str | Path, channel: int | None = None) -> None:
        """Analyse ``path`` (``channel``: 0 left, 1 right, None mixed) on a worker thread;
        the answer arrives as :meth:`_on_analysed` or a sentence in :attr:`problem`."""
        path = Path(path)
        self.path = path
        app_settings().setValue(LAST_PATH_KEY, str(path))
        self.file_label.setText(path.name)
        self.file_label.setToolTip(str(path))
        try:
            from core.recording import open_recording

            self.source = open_recording(path, None)
        except DesignError as exc:  # unreadable: no need to start a worker
            self.source = None
            self.analyser.cancel()
            self._refuse(refusal_sentence(path, exc))
            return
        stereo = self.source.channels == 2
        self.channel_box.setEnabled(stereo)
        with QSignalBlocker(self.channel_box):
            self.channel_box.setCurrentIndex(
                next(i for i, (_t, c) in enumerate(CHANNELS) if c == (channel if stereo
                                                                       else None)))
        self._request()

    def _channel(self) -> int | None:
        value = self.channel_box.currentData()
        return None if value is None else int(value)

    def _channel_changed(self) -> None:
        if self.path is not None and self.source is not None:
            self._request()

    def _request(self) -> None:
        assert self.path is not None
        minutes = (self.source.duration_s / 60.0) if self.source is not None else 0.0
        self._say(f"Listening to {self.path.name} ({minutes:.1f} min of sound)…")
        self.analyser.request(Request(self.path, self._channel()))

    def _on_busy(self, busy: bool) -> None:
        self.busy_bar.setVisible(busy)
        self.open_button.setText("Open another…" if busy else "Open recording…")

    def _on_analysed(self, request: Request, analysis: BeatAnalysis) -> None:
        self.raw_analysis = analysis
        self.problem = ""
        self._rerate()
        self.interval_plot.show_analysis(self.analysis)
        self.residual_plot.show_analysis(self.analysis)
        with QSignalBlocker(self.tick_spin):
            self.tick_spin.setRange(1, analysis.ticks)
        self.tick_spin.setEnabled(True)
        self.tick_of.setText(f"of {analysis.ticks}")
        self._say(f"{request.path.name}: {analysis.ticks} ticks in "
                  f"{analysis.duration_s:.1f} s. Click a point, or step the tick number, to see "
                  "its sound.")
        self.choose_tick(0)

    def _on_refused(self, _request: Request, sentence: str) -> None:
        self._refuse(sentence)

    def _refuse(self, sentence: str) -> None:
        self.raw_analysis = self.analysis = None
        self.problem = sentence
        self.chosen = None
        self.interval_plot.show_analysis(None)
        self.residual_plot.show_analysis(None)
        self.waveform_plot.clear_waveform()
        with QSignalBlocker(self.tick_spin):
            self.tick_spin.setRange(0, 0)
        self.tick_spin.setEnabled(False)
        self.tick_of.setText("")
        self._say(sentence)
        self._show_figures()

    # ------------------------------------------------------------------ showing
    def _say(self, text: str) -> None:
        self.message.setText(text)

    def _show_figures(self) -> None:
        self.figures.setText(figures_html(self.analysis, self.problem))
        self.use_button.setEnabled(self.analysis is not None and self.document is not None
                                   and self.analysis.rate_s_per_day is not None)

    def choose_tick(self, position: int) -> None:
        """Show the sound around accepted tick ``position`` (0-based), its onset at 0."""
        a = self.analysis
        if a is None or self.source is None or not 0 <= position < a.ticks:
            return
        self.chosen = position
        with QSignalBlocker(self.tick_spin):
            self.tick_spin.setValue(position + 1)
        time_s = float(a.tick_times_s[position])
        from core.beats import tick_waveform
        from core.recording import open_recording

        try:
            source = self.source if self._channel() is None else \
                open_recording(self.source.path, self._channel())
            t, raw, filtered = tick_waveform(source, time_s)
        except DesignError as exc:
            self.waveform_plot.clear_waveform()
            self._say(refusal_sentence(self.source.path, exc))
            return
        kind = "tick" if a.tick_index[position] % 2 == 0 else "tock"
        self.waveform_plot.show_waveform(
            t, raw, filtered, f"Beat {int(a.tick_index[position]) + 1}, a {kind}, at "
                              f"{time_s:.3f} s ({1e6 * a.residuals_s[position]:+.0f} µs)")
        self.interval_plot.mark(position)
        self.residual_plot.mark(position)

    # ------------------------------------------------------------------ the edit
    def _ask_confirm(self, text: str) -> bool:
        answer = QMessageBox.question(self, "Use this rate", text)
        return answer == QMessageBox.StandardButton.Yes

    def ask_use_rate(self) -> None:
        """Offer to fit the model to the measured rate (asks first)."""
        a = self.analysis
        if a is None or a.rate_s_per_day is None:
            self._say("Open a recording, and give the design a target period, first.")
            return
        if self.confirm(f"The recording says the clock gains {a.rate_s_per_day:+.3f} s/day "
                        f"(± {a.rate_sigma_s_per_day:.3f}). Move the bob so the model's rate "
                        "at the design's own temperature, pressure and semi-arc is the same? "
                        "(Undo takes it back.)"):
            self.use_rate()

    def use_rate(self, field_path: str | None = None) -> bool:
        """Move ``field_path`` (default: the bob's position) so the model's rate at the
        design's reference conditions equals the measured rate (one undo step). Returns
        whether the design changed."""
        a = self.analysis
        if self.document is None or a is None or a.rate_s_per_day is None:
            self._say("There is no measured rate to use (open a recording; the design needs "
                      "a target period).")
            return False
        rate = a.rate_s_per_day
        design = self.document.design
        try:
            fit = fit_model_to_clock(design, field_path, rate, reference_conditions(design))
        except DesignError as exc:
            self._say(f"{exc.field}: {exc.reason}. The design is unchanged.")
            return False
        self.document.commit(fit.design, "Fit the model to the recorded rate", fit.field)
        self._say(f"{fit.field} moved from {fit.old_value:.6g} to {fit.value:.6g}: the model "
                  f"now gains {fit.rate_s_per_day:+.3f} s/day at the design's own conditions, "
                  "as the recording says the clock does.")
        return True
