"""The numeric core never imports Qt or pyqtgraph (DESIGN §2): checked in a fresh interpreter."""

import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]


def test_core_imports_without_qt() -> None:
    code = (
        "import sys\n"
        "class Block:\n"
        "    def find_spec(self, name, path=None, target=None):\n"
        "        if name.split('.')[0] in ('PySide6', 'pyqtgraph', 'shiboken6'):\n"
        "            raise ImportError('Qt is forbidden in core: ' + name)\n"
        "sys.meta_path.insert(0, Block())\n"
        "import core, core.solve, core.tuning, core.exhibit, core.motion, core.phase\n"
        "r = core.analyse(core.load_design("
        "'resources/examples/workshop_regulator.pendulum.json'))\n"
        "assert r.period_s > 0\n"
        "print(sorted(m for m in sys.modules if m.split('.')[0] in ('PySide6', 'pyqtgraph')))\n"
    )
    out = subprocess.run([sys.executable, "-c", code], cwd=ROOT, capture_output=True, text=True,
                         timeout=120)
    assert out.returncode == 0, out.stderr
    assert out.stdout.strip() == "[]"


def test_no_qt_import_statements_in_core() -> None:
    for path in (ROOT / "core").rglob("*.py"):
        text = path.read_text(encoding="utf-8")
        for banned in ("PySide6", "pyqtgraph", "shiboken6"):
            assert f"import {banned}" not in text and f"from {banned}" not in text, path
