"""Test-wide setup: Qt draws offscreen, so the suite needs no display."""

import os

os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
