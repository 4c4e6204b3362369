"""The core and its tests are ruff-clean under the rules in pyproject.toml (STYLE: no lint
debt, no `# noqa` that ruff does not need)."""

import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]


def test_core_is_ruff_clean() -> None:
    out = subprocess.run([sys.executable, "-m", "ruff", "check", "core", "tests/core"],
                         cwd=ROOT, capture_output=True, text=True, timeout=300)
    assert out.returncode == 0, out.stdout + out.stderr
    assert "All checks passed" in out.stdout
