"""An animated GIF of one full swing at true speed, for presentations.

Frames are the swing preview's own drawing (:class:`app.views.swing_preview.SwingPreview`)
posed at even times over one period from the core's motion samples, rendered from the scene
alone (no control bar) with the figures box hidden, so no window state is in the picture.
Frame times are rounded to the GIF's centiseconds cumulatively, so the whole loop lasts the
period to within 5 ms. Written through Pillow.
"""

from __future__ import annotations

import math
import os
from pathlib import Path

from PySide6 import QtCore, QtGui

from core import Result

__all__ = ["write_swing_gif", "frame_durations_ms", "GIF_SIZE_PX", "MIN_FRAMES", "MAX_FRAMES"]

GIF_SIZE_PX = (480, 600)
MIN_FRAMES = 24
MAX_FRAMES = 200
FRAME_S = 0.05  # aimed-for frame length, s


def frame_durations_ms(period_s: float) -> list[int]:
    """Durations (ms, multiples of 10) of the frames of one loop lasting ``period_s``."""
    n = max(MIN_FRAMES, min(MAX_FRAMES, round(period_s / FRAME_S)))
    marks = [round(period_s * 100.0 * i / n) for i in range(n + 1)]  # centiseconds
    return [10 * max(b - a, 1) for a, b in zip(marks, marks[1:], strict=False)]


def _to_pillow(image: QtGui.QImage):  # type: ignore[no-untyped-def]
    from PIL import Image

    rgba = image.convertToFormat(QtGui.QImage.Format.Format_RGBA8888)
    data = bytes(rgba.constBits())  # type: ignore[call-overload]
    return Image.frombuffer("RGBA", (rgba.width(), rgba.height()), data, "raw", "RGBA",
                            rgba.bytesPerLine(), 1).convert("RGB")


def write_swing_gif(result: Result, path: str | os.PathLike[str],
                    size: tuple[int, int] = GIF_SIZE_PX) -> Path:
    """Write one full swing of ``result`` at true speed to ``path`` (GIF); returns the path."""
    from PySide6 import QtWidgets

    from app.views.swing_preview import SwingPreview

    if QtWidgets.QApplication.instance() is None:
        from app.report.export import ensure_application
        ensure_application()
    app = QtWidgets.QApplication.instance()
    assert app is not None
    preview = SwingPreview()
    preview.setAttribute(QtCore.Qt.WidgetAttribute.WA_DontShowOnScreen, True)
    preview.resize(*size)
    preview.show()
    app.processEvents()
    frames = []
    try:
        preview.show_result(result)
        preview.set_playing(False)
        preview._info.setVisible(False)  # the figures box names the animation's state
        app.processEvents()
        durations = frame_durations_ms(float(result.period_s))
        elapsed = 0
        scene = preview.scene()
        for d in durations:
            preview.set_time(elapsed / 1000.0)
            elapsed += d
            image = QtGui.QImage(size[0], size[1], QtGui.QImage.Format.Format_RGB32)
            image.fill(QtGui.QColor("white"))
            painter = QtGui.QPainter(image)
            painter.setRenderHint(QtGui.QPainter.RenderHint.Antialiasing, True)
            scene.render(painter, QtCore.QRectF(0, 0, size[0], size[1]),
                         QtCore.QRectF(0, 0, preview.width(), preview.height()))
            painter.end()
            frames.append(_to_pillow(image))
    finally:
        preview.hide()
        preview.deleteLater()
    out = Path(path)
    palette = frames[0].quantize(colors=128)
    quantised = [f.quantize(palette=palette, dither=0) for f in frames]
    quantised[0].save(out, format="GIF", save_all=True, append_images=quantised[1:],
                      duration=durations, loop=0, optimize=False, disposal=1)
    return out


def loop_length_s(durations_ms: list[int]) -> float:
    """Total length of a loop of frames, s."""
    return math.fsum(durations_ms) / 1000.0
