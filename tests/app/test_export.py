"""``penduline export FILE --out DIR``: every plot as PNG and SVG, the CSV data and the PDF
report, written atomically, without a display; bad input exits 2 with one line."""

from __future__ import annotations

import csv
import os
import shutil
import subprocess
import sys
import xml.etree.ElementTree as ET
from pathlib import Path

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")

import pytest
from PySide6 import QtGui

from app.cli import main
from app.report.export import PLOT_SIZE_PX, export_all
from core import DesignError

ROOT = Path(__file__).resolve().parents[2]
ATRIUM = ROOT / "resources" / "examples" / "atrium_pendulum.pendulum.json"
PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"
SLUGS = ("motion", "phase", "period_curve", "swing_preview", "plan_view")
EXPECTED = ({f"{s}.png" for s in SLUGS} | {f"{s}.svg" for s in SLUGS}
            | {"motion.csv", "period_curve.csv", "parts.csv", "report.pdf"})


@pytest.fixture(scope="module")
def exported(tmp_path_factory):
    """One export of the atrium example through the command line (shared by the checks)."""
    out = tmp_path_factory.mktemp("export") / "new" / "folder"  # created by the export
    return out, main(["export", str(ATRIUM), "--out", str(out)])


def test_cli_export_writes_everything(exported, capsys):
    out, rc = exported
    assert rc == 0
    assert {p.name for p in out.iterdir()} == EXPECTED  # nothing else: no temporary files


def test_png_files(exported, qapp):
    out, _ = exported
    width, height = PLOT_SIZE_PX
    for slug in SLUGS:
        data = (out / f"{slug}.png").read_bytes()
        assert data.startswith(PNG_SIGNATURE)
        image = QtGui.QImage()
        assert image.loadFromData(data, "PNG")
        assert image.width() >= width
        assert image.height() / image.width() == pytest.approx(height / width, abs=0.01)


def test_svg_files(exported):
    out, _ = exported
    for slug in SLUGS:
        root = ET.parse(out / f"{slug}.svg").getroot()
        assert root.tag.endswith("svg")
        assert len(list(root.iter())) > 20  # a drawing, not an empty page


def test_csv_files(exported):
    out, _ = exported
    with open(out / "motion.csv", newline="", encoding="utf-8") as fh:
        rows = list(csv.reader(fh))
    assert rows[0][:2] == ["time_s", "exact_angle_deg"]
    numeric = [[float(x) for x in row] for row in rows[1:]]
    assert len(numeric) >= 500 and len(numeric) == 1201
    with open(out / "period_curve.csv", newline="", encoding="utf-8") as fh:
        curve = list(csv.reader(fh))
    assert curve[0] == ["semi_arc_deg", "period_s", "circular_error_s_per_day"]
    assert len(curve) - 1 == 400 and all(float(r[1]) > 0 for r in curve[1:])


def test_pdf_file(exported):
    out, _ = exported
    data = (out / "report.pdf").read_bytes()
    assert data.startswith(b"%PDF-") and data.rstrip().endswith(b"%%EOF")
    assert len(data) > 20_000
    # Every plot is drawn as vectors, each under its numbered title.
    assert len(data) < 1_000_000
    if shutil.which("pdftotext"):
        text = subprocess.run(["pdftotext", str(out / "report.pdf"), "-"], check=True,
                              timeout=60, capture_output=True, text=True).stdout
        assert all(f"Figure {i}." in text for i in range(1, 5))


@pytest.mark.slow
def test_export_all_returns_the_written_paths(tmp_path, qapp):
    paths = export_all(ATRIUM, tmp_path)
    assert {p.name for p in paths} == EXPECTED
    assert all(p.is_file() and p.parent == tmp_path for p in paths)


def test_bad_design_exits_2_with_one_line(tmp_path, capsys):
    bad = tmp_path / "bad.pendulum.json"
    bad.write_text(ATRIUM.read_text(encoding="utf-8").replace('"length_m": 18.0',
                                                              '"length_m": -18.0'))
    with pytest.raises(DesignError) as err:
        export_all(bad, tmp_path / "out")
    assert err.value.field == "parts[0].length_m"
    assert main(["export", str(bad), "--out", str(tmp_path / "out")]) == 2
    lines = capsys.readouterr().err.strip().splitlines()
    assert len(lines) == 1 and "parts[0].length_m" in lines[0]
    assert not (tmp_path / "out").exists()


def test_unwritable_output_exits_2(tmp_path, capsys):
    blocker = tmp_path / "a_file"
    blocker.write_text("not a folder")
    assert main(["export", str(ATRIUM), "--out", str(blocker)]) == 2
    assert main(["export", str(ATRIUM), "--out", str(blocker / "below")]) == 2
    lines = capsys.readouterr().err.strip().splitlines()
    assert len(lines) == 2 and all(line.startswith("penduline: out:") for line in lines)


@pytest.mark.slow
def test_export_needs_no_display(tmp_path):
    env = {k: v for k, v in os.environ.items()
           if k not in ("QT_QPA_PLATFORM", "DISPLAY", "WAYLAND_DISPLAY")}
    out = tmp_path / "headless"
    code = ("import sys; from app.cli import main; "
            f"sys.exit(main(['export', {str(ATRIUM)!r}, '--out', {str(out)!r}]))")
    run = subprocess.run([sys.executable, "-c", code], cwd=ROOT, env=env, timeout=120,
                         capture_output=True, text=True)
    assert run.returncode == 0, run.stderr
    assert {p.name for p in out.iterdir()} == EXPECTED
    assert run.stdout.strip().splitlines() == [str(out / n) for n in (
        "motion.png", "motion.svg", "phase.png", "phase.svg", "period_curve.png",
        "period_curve.svg", "swing_preview.png", "swing_preview.svg", "plan_view.png",
        "plan_view.svg", "motion.csv",
        "period_curve.csv", "parts.csv", "report.pdf")]
