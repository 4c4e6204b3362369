"""The numeric core is fully typed: mypy finds nothing in core/ (STYLE: mypy-clean)."""

import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]


def test_core_is_mypy_clean() -> None:
    out = subprocess.run([sys.executable, "-m", "mypy", "core"], cwd=ROOT, capture_output=True,
                         text=True, timeout=600)
    assert out.returncode == 0, out.stdout + out.stderr
    assert "Success: no issues found" in out.stdout
