"""Writing output files atomically: the app's door to :mod:`core.atomic_write`.

Every file the app writes goes through the core's one writer: a temporary file beside the
target, synced and renamed over it, so a failed write leaves any earlier file untouched and no
temporary file behind; a symbolic link is written through to its target, the mode of a
replaced file is kept, and a read-only file, a folder, a pipe or a device is refused. Text and
bytes (a PNG grabbed into memory) are written whole; a file that another library writes by name
(an SVG from pyqtgraph's exporter, a PDF from Qt's PDF writer) is written to the temporary
name :func:`atomic_path` gives and renamed into place when the block ends.
"""

from __future__ import annotations

import os
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path

from core.atomic_write import FileStamp
from core.atomic_write import atomic_path as _core_atomic_path
from core.atomic_write import write_bytes_atomic as _core_write_bytes_atomic
from core.atomic_write import write_text_atomic as _core_write_text_atomic

__all__ = ["write_text_atomic", "write_bytes_atomic", "atomic_path"]


def write_text_atomic(path: str | os.PathLike[str], text: str) -> Path:
    """Write ``text`` as UTF-8 (newlines as given) to ``path``; returns the path.

    Raises
    ------
    core.DesignError
        ``field="file"`` when the file cannot be written (the old file is untouched).
    """
    _core_write_text_atomic(path, text)
    return Path(path)


def write_bytes_atomic(path: str | os.PathLike[str], data: bytes) -> Path:
    """Write ``data`` to ``path``; returns the path. Errors as :func:`write_text_atomic`."""
    _core_write_bytes_atomic(path, data)
    return Path(path)


@contextmanager
def atomic_path(path: str | os.PathLike[str], *, expect: FileStamp | None = None,
                force: bool = False) -> Iterator[Path]:
    """Yield a temporary path (same folder, same suffix) for a library to write; on success
    it is renamed to ``path``, on failure removed (:func:`core.atomic_write.atomic_path`).

    Raises
    ------
    core.DesignError
        ``field="file"`` when the target is refused or the file cannot be written; nothing
        written by the library is also a failure.
    """
    with _core_atomic_path(path, expect=expect, force=force) as tmp:
        yield tmp
