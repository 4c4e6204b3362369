"""Writing output files atomically: a temporary file beside the target, renamed over it.

A failed write leaves any earlier file untouched and no temporary file behind. Text goes
through the core's writer, :func:`core.fileformat.write_text_atomic` (the one implementation of
temporary-file-and-rename in the program). A file that another library writes by name (a PNG
or SVG from pyqtgraph's exporters, a PDF from Qt's PDF writer) is written to the temporary name
:func:`atomic_path` gives and renamed into place here.
"""

from __future__ import annotations

import os
import uuid
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path

from core.fileformat import write_text_atomic as _core_write_text_atomic

__all__ = ["write_text_atomic", "atomic_path"]


def write_text_atomic(path: str | os.PathLike[str], text: str) -> Path:
    """Write ``text`` as UTF-8 (newlines as given) to ``path``; returns the path.

    Raises
    ------
    core.DesignError
        ``field="file"`` when the file cannot be written (the core's writer).
    """
    _core_write_text_atomic(path, text)
    return Path(path)


@contextmanager
def atomic_path(path: str | os.PathLike[str]) -> Iterator[Path]:
    """Yield a temporary path (same folder, same suffix, not yet created) for a library to
    write; on success it is renamed to ``path``, on failure removed. Errors are ``OSError``.
    Files get the usual permissions (umask)."""
    target = Path(path)
    tmp = target.with_name(f".{target.stem}.{uuid.uuid4().hex[:12]}.tmp{target.suffix}")
    try:
        yield tmp
        if not tmp.exists() or tmp.stat().st_size == 0:
            raise OSError(f"nothing was written to {target.name}")
        os.replace(tmp, target)
    finally:
        if tmp.exists():
            tmp.unlink()
