"""Writing output files atomically: a temporary file beside the target, renamed over it.

A failed write leaves any earlier file untouched and no temporary file behind. Errors are
``OSError``; callers decide how to report them (the export turns them into
``core.DesignError(field="out")``).
"""

from __future__ import annotations

import os
import uuid
from collections.abc import Iterator
from contextlib import contextmanager
from pathlib import Path

__all__ = ["write_bytes_atomic", "write_text_atomic", "atomic_path"]


@contextmanager
def atomic_path(path: str | os.PathLike[str]) -> Iterator[Path]:
    """Yield a temporary path (same folder, same suffix, not yet created) to write; on success
    it is renamed to ``path``, on failure removed. Files get the usual permissions (umask)."""
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


def write_bytes_atomic(path: str | os.PathLike[str], data: bytes) -> Path:
    """Write ``data`` to ``path`` through a temporary file; returns the path."""
    with atomic_path(path) as tmp:
        with open(tmp, "wb") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
    return Path(path)


def write_text_atomic(path: str | os.PathLike[str], text: str) -> Path:
    """Write ``text`` as UTF-8 (newlines as given) to ``path``; returns the path."""
    return write_bytes_atomic(path, text.encode("utf-8"))
