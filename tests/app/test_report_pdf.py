"""The PDF report: Qt's PDF writer, A4 portrait, the design, the readout, budget, exhibit
figures, boxed cautions and the plots as images."""

from __future__ import annotations

import datetime as dt
import os
import re
import shutil
import subprocess
import unicodedata
from pathlib import Path

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

import pytest
from PySide6 import QtCore, QtGui

from app.readout.readout_format import SECTIONS
from app.report.pdf import report_html, widget_image, write_report_pdf
from app.views.swing_preview import SwingPreview
from core import analyse, load_design
from core.analysis import LOAD_CAUTION, SPRING_CAUTION

EXAMPLES = Path(__file__).resolve().parents[2] / "resources" / "examples"
A4_RATIO = 297.0 / 210.0


@pytest.fixture(scope="module")
def atrium():
    return analyse(load_design(EXAMPLES / "atrium_pendulum.pendulum.json"))


@pytest.fixture
def preview_image(qtbot, atrium):
    view = SwingPreview()
    qtbot.addWidget(view)
    view.setAttribute(QtCore.Qt.WidgetAttribute.WA_DontShowOnScreen, True)
    view.resize(800, 520)
    view.show()
    view.show_result(atrium)
    view.set_time(0.0)
    qtbot.waitExposed(view)
    return widget_image(view, 1600)


def _plain(html_text: str) -> str:
    doc = QtGui.QTextDocument()
    doc.setHtml(html_text)
    return " ".join(doc.toPlainText().split())


class TestContents:
    def test_everything_is_in_the_report(self, qapp, atrium):
        text = _plain(report_html(atrium, source_name="atrium_pendulum.pendulum.json",
                                  date=dt.date(2031, 4, 5), image_urls={}))
        for needle in ("Atrium pendulum (preview)", "atrium_pendulum.pendulum.json",
                       "2031-04-05", "wire", "sphere", "Rod length 18 m",
                       "Rod diameter 2.5 mm", "Bob centre 18.15 m", "Latitude 47.3°",
                       "Knife edge", "Music wire", "Rate budget", "Temperature",
                       "Air pressure", "Semi-arc", "Exhibit figures", "Warnings",
                       "qualified engineer"):
            assert needle in text, needle
        for _section, rows in SECTIONS:
            for _key, label, _unit, _fmt in rows:
                # The atrium has no trim weight: its trim figure is quoted at the height chosen.
                shown = label.replace("at tray", "at 9.07 m").replace("Trim tray height",
                                                                      "Trim quoted at")
                assert shown in text, label
        # Figures as the readout formats them (app.readout.readout_format).
        assert "1442.45" in text            # peak pivot load, N
        assert "0.8151" in text             # bob peak speed, m/s
        assert "32.568" in text             # Foucault full turn, h

    def test_cautions_are_boxed_and_complete(self, qapp, atrium):
        html_text = report_html(atrium, source_name=None, date=dt.date(2031, 4, 5),
                                image_urls={})
        text = " ".join(html_text.split())
        for caution in (LOAD_CAUTION, SPRING_CAUTION, *atrium.cautions):
            assert _escape(caution) in text
        boxes = re.findall(r"<table[^>]*border='2'[^>]*>.*?</table>", html_text, re.S)
        assert len(boxes) == 2  # all cautions first; the load caution again by the figures
        assert _escape(LOAD_CAUTION) in boxes[0] and _escape(SPRING_CAUTION) in boxes[0]
        assert _escape(LOAD_CAUTION) in boxes[1]

    def test_no_file_key_reaches_the_page(self, qapp, atrium):
        text = _plain(report_html(atrium, source_name=None, date=dt.date(2031, 4, 5),
                                  image_urls={}))
        assert not re.search(r"\b[a-z]+_[a-z_]+\b", text), re.findall(r"\b[a-z]+_[a-z_]+\b",
                                                                     text)
        assert "amplitude" not in text.lower() and "Semi-arc" in text

    def test_inch_pound_reaches_the_report(self, qapp, atrium):
        from app.form.units import UnitSystem
        text = _plain(report_html(atrium, source_name=None, date=dt.date(2031, 4, 5),
                                  image_urls={}, system=UnitSystem.INCH_POUND))
        # 18 m = 708.661 in (1 in = 0.0254 m exactly, by definition).
        assert "Rod length 708.661 in" in text
        assert "Site 300 ft higher" in text and " lbf" in text


def _escape(text: str) -> str:
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace(
        "'", "&#x27;")


class TestPdf:
    def test_widget_image_is_wide_enough(self, preview_image):
        assert not preview_image.isNull()
        assert preview_image.width() == 1600 and preview_image.height() == 1040

    def test_pdf_is_valid_a4_and_renders(self, tmp_path, atrium, preview_image):
        path = write_report_pdf(atrium, tmp_path / "report.pdf",
                                {"Swing preview": preview_image},
                                captions={"Swing preview": "At release."},
                                source_name="atrium_pendulum.pendulum.json",
                                date=dt.date(2031, 4, 5))
        data = path.read_bytes()
        assert data.startswith(b"%PDF-")
        assert data.rstrip().endswith(b"%%EOF")
        assert len(data) > 20_000
        pages = re.findall(rb"/Type\s*/Page\b", data)
        assert 2 <= len(pages) <= 6
        # A4 portrait: 595 × 842 points.
        boxes = {tuple(round(float(v)) for v in m.groups())
                 for m in re.finditer(rb"/MediaBox\s*\[\s*0\s+0\s+([\d.]+)\s+([\d.]+)\s*\]",
                                      data)}
        assert boxes == {(595, 842)}
        assert re.search(rb"/Subtype\s*/Image", data)
        assert [p.name for p in tmp_path.iterdir()] == ["report.pdf"]
        if shutil.which("pdftoppm"):  # poppler present: render page 1 and look at it
            subprocess.run(["pdftoppm", "-png", "-r", "30", "-f", "1", "-l", "1", str(path),
                            str(tmp_path / "page")], check=True, timeout=60)
            page = QtGui.QImage(str(next(tmp_path.glob("page*.png"))))
            assert not page.isNull()
            assert page.height() / page.width() == pytest.approx(A4_RATIO, rel=0.01)
        if shutil.which("pdftotext"):
            out = subprocess.run(["pdftotext", str(path), "-"], check=True, timeout=60,
                                 capture_output=True, text=True).stdout
            flat = " ".join(unicodedata.normalize("NFKC", out).split())  # "ﬁ" → "fi"
            assert "Atrium pendulum (preview)" in flat
            assert "qualified engineer" in flat
