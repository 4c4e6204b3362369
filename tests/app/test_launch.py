"""`penduline [FILE] --screenshot OUT.png` and the window's refusal of a bad file."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

from PySide6.QtGui import QImage

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "resources/examples/workshop_regulator.pendulum.json"


def _run(*args: str) -> subprocess.CompletedProcess[str]:
    env = {**os.environ, "QT_QPA_PLATFORM": "offscreen"}
    code = "import sys; from app.cli import main; sys.exit(main(sys.argv[1:]))"
    return subprocess.run([sys.executable, "-c", code, *args], cwd=ROOT, env=env,
                          capture_output=True, text=True, timeout=120)


def test_screenshot_writes_a_png_of_the_window(tmp_path: Path) -> None:
    out = tmp_path / "shot.png"
    done = _run(str(EXAMPLE), "--screenshot", str(out))
    assert done.returncode == 0, done.stderr
    assert out.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    image = QImage(str(out))
    assert (image.width(), image.height()) == (1440, 900)


def test_a_bad_file_exits_2_with_one_line_naming_the_field(tmp_path: Path) -> None:
    bad = tmp_path / "bad.pendulum.json"
    bad.write_text(EXAMPLE.read_text(encoding="utf-8").replace('"length_m": 1.1131',
                                                               '"length_m": -1'),
                   encoding="utf-8")
    done = _run(str(bad), "--screenshot", str(tmp_path / "x.png"))
    assert done.returncode == 2
    lines = done.stderr.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("penduline: parts[0].length_m:")
    assert not (tmp_path / "x.png").exists()
