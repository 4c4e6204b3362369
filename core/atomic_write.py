"""The one way Penduline writes a file: atomically, and respecting the file it replaces.

Every save (design files, recovery copies, PNG/PDF/CSV exports) goes through this module:

* The data goes to a temporary file beside the target, is flushed and ``fsync``-ed, then
  renamed over the target (``os.replace``), and the folder is ``fsync``-ed. A failure at any
  step leaves the old file as it was and removes the temporary file.
* A **symbolic link** is written through: the file it points to gets the new content and the
  link stays a link (a dangling link creates its target).
* The **mode** of the file being replaced is kept (and its owner and group where the process
  may set them); a new file gets 0666 less the process's umask, as any program's new file.
* A **read-only** file (no write permission bit, or not writable by this process) is refused:
  :class:`ReadOnlyFileError`, "… is read-only; save under another name". The file is untouched.
* A target that is a **folder, a pipe (FIFO), a socket or a device** is refused.
* The temporary name stays within the folder's name limit (``PC_NAME_MAX``, 255 bytes when the
  system does not say): a 255-byte file name saves.
* **Changed on disk**: pass ``expect`` — the :class:`FileStamp` taken when the file was opened
  (:func:`file_stamp`) or returned by the last save — and the save is refused with
  :class:`FileChangedError` when the file's content on disk is no longer what it was, unless
  ``force=True``. A file whose timestamps changed but whose bytes did not (touched, or rewritten
  with the same content) counts as unchanged; a file removed since is simply written again.
* **Hard links** are not preserved: a save *replaces* the file, so another hard link to the old
  file keeps the old content (the rename is what makes the save atomic; writing in place would
  lose the old file on a failed write). This is documented behaviour, tested.

Errors are :class:`core.DesignError` with ``field="file"`` and a plain sentence.
"""

from __future__ import annotations

import hashlib
import os
import secrets
import stat
from collections.abc import Iterator
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path

from .errors import DesignError

__all__ = ["FileStamp", "FileChangedError", "ReadOnlyFileError", "file_stamp", "file_changed",
           "write_text_atomic", "write_bytes_atomic", "atomic_path", "resolve_target"]

_DEFAULT_NAME_MAX = 255
_WRITE_BITS = stat.S_IWUSR | stat.S_IWGRP | stat.S_IWOTH


@dataclass(frozen=True)
class FileStamp:
    """What a file on disk was at one moment.

    Attributes
    ----------
    mtime_ns : modification time, ns since the epoch.
    size : size, bytes.
    inode, device : the file's identity on its file system.
    sha256 : hex SHA-256 of the content (what decides whether the file changed).
    """

    mtime_ns: int
    size: int
    inode: int
    device: int
    sha256: str


class FileChangedError(DesignError):
    """The file on disk is no longer the one that was opened or last saved."""

    def __init__(self, path: str | os.PathLike[str]) -> None:
        super().__init__("file", f"{Path(path)} was changed by another program since it was "
                                 "opened; save again to overwrite it, or save under another "
                                 "name")
        self.path = Path(path)


class ReadOnlyFileError(DesignError):
    """The file to be replaced is read-only."""

    def __init__(self, path: str | os.PathLike[str]) -> None:
        super().__init__("file", f"{Path(path)} is read-only; save under another name")
        self.path = Path(path)


def resolve_target(path: str | os.PathLike[str]) -> Path:
    """The file a save to ``path`` writes: symbolic links followed (also a dangling one)."""
    return Path(os.path.realpath(os.fspath(path)))


def _stamp(info: os.stat_result, digest: str) -> FileStamp:
    return FileStamp(info.st_mtime_ns, info.st_size, info.st_ino, info.st_dev, digest)


def file_stamp(path: str | os.PathLike[str]) -> FileStamp | None:
    """The stamp of the regular file at ``path`` (links followed), or None when there is no
    such file (missing, a folder, a pipe or a device) or it cannot be read."""
    target = resolve_target(path)
    try:
        info = target.stat()
        if not stat.S_ISREG(info.st_mode):
            return None
        digest = hashlib.sha256()
        with open(target, "rb") as fh:
            for chunk in iter(lambda: fh.read(1 << 20), b""):
                digest.update(chunk)
        return _stamp(os.stat(target), digest.hexdigest())
    except OSError:
        return None


def file_changed(path: str | os.PathLike[str], expect: FileStamp | None) -> bool:
    """True when the content at ``path`` differs from the stamped one (``expect``). A file
    that no longer exists counts as unchanged (saving loses nothing); None expects nothing."""
    if expect is None:
        return False
    now = file_stamp(path)
    if now is None:
        return resolve_target(path).exists()  # replaced by a folder or a pipe: changed
    return now.sha256 != expect.sha256


def _check_target(path: str | os.PathLike[str], target: Path, expect: FileStamp | None,
                  force: bool) -> os.stat_result | None:
    """Refuse special files, read-only files and changed files; the target's stat or None."""
    try:
        info = target.stat()
    except FileNotFoundError:
        info = None
    except OSError as exc:
        raise DesignError("file", f"could not save {path}: {exc.strerror or exc}") from None
    if info is not None:
        if stat.S_ISDIR(info.st_mode):
            raise DesignError("file", f"could not save {path}: it is a folder; give a file "
                                      "name to save to")
        if not stat.S_ISREG(info.st_mode):
            raise DesignError("file", f"could not save {path}: it is not an ordinary file (a "
                                      "pipe, socket or device); Penduline saves only to "
                                      "ordinary files")
        if not info.st_mode & _WRITE_BITS or not os.access(target, os.W_OK):
            raise ReadOnlyFileError(path)
    if not force and file_changed(target, expect):
        raise FileChangedError(path)
    return info


def _name_max(folder: Path) -> int:
    try:
        value = os.pathconf(folder, "PC_NAME_MAX")
    except (OSError, ValueError, AttributeError):
        return _DEFAULT_NAME_MAX
    return value if isinstance(value, int) and value > 16 else _DEFAULT_NAME_MAX


def _temp_name(target: Path, keep_suffix: bool = False) -> Path:
    """A fresh hidden name beside ``target``, within the folder's name limit (bytes); with
    ``keep_suffix`` it ends in the target's suffix (``.png``), for libraries that choose the
    format by the name."""
    ext = target.suffix if keep_suffix and len(os.fsencode(target.suffix)) <= 16 else ""
    suffix = f".{secrets.token_hex(4)}.tmp{ext}"
    budget = _name_max(target.parent) - 1 - len(os.fsencode(suffix))
    stem = os.fsencode(target.name)[:max(budget, 1)]
    name = "." + os.fsdecode(stem.decode("utf-8", "ignore").encode("utf-8") or b"p") + suffix
    return target.with_name(name)


def _fsync_folder(folder: Path) -> None:
    try:
        fd = os.open(folder, os.O_RDONLY | getattr(os, "O_DIRECTORY", 0))
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass  # some file systems cannot sync a folder; the rename is done either way
    finally:
        os.close(fd)


def _open_temp(target: Path, existing: os.stat_result | None, keep_suffix: bool = False
               ) -> tuple[int, Path]:
    """Create the temporary file: mode 0666 & ~umask for a new file (the kernel applies the
    umask), the old file's mode (and owner where permitted) for a replacement."""
    for _ in range(20):
        tmp = _temp_name(target, keep_suffix)
        try:
            fd = os.open(tmp, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o600 if existing else 0o666)
        except FileExistsError:
            continue
        if existing is not None:
            try:
                if hasattr(os, "fchown") and (existing.st_uid, existing.st_gid) != (
                        os.geteuid(), os.getegid()):
                    os.fchown(fd, existing.st_uid, existing.st_gid)
            except OSError:
                pass  # not permitted: the file becomes ours, as any editor's save does
            if hasattr(os, "fchmod"):
                os.fchmod(fd, stat.S_IMODE(existing.st_mode))
            else:  # pragma: no cover - Windows before Python 3.13
                os.chmod(tmp, stat.S_IMODE(existing.st_mode))
        return fd, tmp
    raise OSError("no free temporary name")


def _cleanup(tmp: Path | None) -> None:
    if tmp is not None:
        try:
            os.unlink(tmp)
        except OSError:
            pass


def write_bytes_atomic(path: str | os.PathLike[str], data: bytes, *,
                       expect: FileStamp | None = None, force: bool = False) -> FileStamp:
    """Write ``data`` to ``path`` atomically (see the module notes).

    Parameters
    ----------
    path : str or PathLike
        The file to write; a symbolic link is written through to its target.
    data : bytes
        The whole new content.
    expect : FileStamp, optional
        The file as it was opened or last saved; the save is refused if it has changed since.
    force : bool
        Overwrite even when the file changed on disk (never a read-only or special file).

    Returns
    -------
    FileStamp
        The stamp of the file as written: pass it as ``expect`` to the next save.

    Raises
    ------
    FileChangedError, ReadOnlyFileError, DesignError
        ``field="file"``; the file on disk is then untouched and no temporary file remains.
    """
    if not isinstance(data, (bytes, bytearray, memoryview)):
        raise TypeError(f"write_bytes_atomic needs bytes, not {type(data).__name__}")
    target = resolve_target(path)
    existing = _check_target(path, target, expect, force)
    tmp: Path | None = None
    try:
        fd, tmp = _open_temp(target, existing)
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, target)
        tmp = None
        _fsync_folder(target.parent)
        return _stamp(os.stat(target), hashlib.sha256(data).hexdigest())
    except OSError as exc:
        raise DesignError("file", f"could not save {path}: {exc.strerror or exc}") from None
    finally:
        _cleanup(tmp)


def write_text_atomic(path: str | os.PathLike[str], text: str, *,
                      expect: FileStamp | None = None, force: bool = False) -> FileStamp:
    """Write ``text`` as UTF-8 (newlines as given) to ``path`` atomically; see
    :func:`write_bytes_atomic` for the parameters, the returned stamp and the errors."""
    if not isinstance(text, str):
        raise TypeError(f"write_text_atomic needs a str, not {type(text).__name__}")
    return write_bytes_atomic(path, text.encode("utf-8"), expect=expect, force=force)


@contextmanager
def atomic_path(path: str | os.PathLike[str], *, expect: FileStamp | None = None,
                force: bool = False) -> Iterator[Path]:
    """For writers that need a file name (PDF, image libraries): yield a temporary path beside
    the target, ending in the target's suffix, already created empty with the right mode;
    after the block it is synced and renamed over ``path`` with the same rules as
    :func:`write_bytes_atomic`. An exception in
    the block, or nothing written, leaves the target untouched and removes the temporary file.
    """
    target = resolve_target(path)
    existing = _check_target(path, target, expect, force)
    tmp: Path | None = None
    try:
        fd, tmp = _open_temp(target, existing, keep_suffix=True)
        os.close(fd)
        yield tmp
        if tmp.stat().st_size == 0:
            raise DesignError("file", f"could not save {path}: nothing was written")
        with open(tmp, "rb+") as fh:
            os.fsync(fh.fileno())
        if existing is not None:
            os.chmod(tmp, stat.S_IMODE(existing.st_mode))  # a library may have re-created it
        os.replace(tmp, target)
        tmp = None
        _fsync_folder(target.parent)
    except OSError as exc:
        raise DesignError("file", f"could not save {path}: {exc.strerror or exc}") from None
    finally:
        _cleanup(tmp)
