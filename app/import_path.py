"""Importing modules without PySide's feature scan, and starting up without the cyclic
collector.

PySide replaces ``builtins.__import__`` with a hook that serves ``from __feature__ import …``
(per-module switches such as ``snake_case``). For every other module imported after PySide it
reads the module's whole source to see whether it names PySide, and records the answer in its
feature table. For numpy, scipy and pyqtgraph that is ~150 ms and ~30 MB of cached source
(``benchmarks/app_bench.py``). A module missing from the table keeps the default selection —
no feature — which is what every module here and in those libraries uses; nothing here
imports ``__feature__``. :func:`without_feature_scan` imports through the import PySide's hook
itself calls when no feature is asked for (``builtins.__orig_import__``), and puts the hook
back after. Qt-free: it touches only ``builtins`` and ``gc``.
"""

from __future__ import annotations

import builtins
import gc
from collections.abc import Iterator
from contextlib import contextmanager

__all__ = ["without_feature_scan", "start_up"]


@contextmanager
def without_feature_scan() -> Iterator[None]:
    """Imports made inside skip PySide's feature scan (a no-op before PySide is imported)."""
    hook = builtins.__import__
    builtins.__import__ = getattr(builtins, "__orig_import__", hook)
    try:
        yield
    finally:
        builtins.__import__ = hook


@contextmanager
def start_up(freeze: bool) -> Iterator[None]:
    """Import the libraries and build the first window: without the feature scan, and with
    the cyclic collector paused (start-up makes ~100 000 long-lived objects and no garbage
    worth the passes the collector would make over them). With ``freeze`` (the first window,
    which lives as long as the program), what start-up made is then moved out of the
    collector's sight for good (``gc.freeze``), so the collections a drag sets off do not walk
    it again."""
    collecting = gc.isenabled()
    gc.disable()
    try:
        with without_feature_scan():
            yield
    finally:
        if collecting:
            if freeze:
                gc.freeze()
            gc.enable()
