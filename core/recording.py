"""Reading sound recordings of a clock: WAV, mono or stereo, 8–96 kHz, read in blocks.

Accepted: integer PCM of 16, 24 or 32 bit and IEEE float of 32 or 64 bit, one or two channels,
8000–96000 samples per second. Anything else is refused with a sentence naming what was found
(:class:`core.DesignError` on ``recording``; a bad channel number on ``channel``).

The header is parsed by :func:`scipy.io.wavfile.read` (``mmap=True``, so no sample is loaded);
samples are then read block by block with :func:`numpy.fromfile` at the data chunk's offset,
so an hour at 48 kHz never sits in memory and no mapping of the whole file stays resident.
scipy cannot map 24-bit data; for it the RIFF chunks are walked here to find the data offset and
the three-byte samples are widened to 32 bit one block at a time.
"""

from __future__ import annotations

import struct
import warnings
from dataclasses import dataclass
from pathlib import Path
from typing import Protocol

import numpy as np
from numpy.typing import NDArray
from scipy.io import wavfile

from .errors import DesignError

__all__ = ["SampleSource", "WavSource", "ArraySource", "open_recording", "read_recording",
           "MIN_RATE_HZ", "MAX_RATE_HZ"]

FloatArray = NDArray[np.float64]
MIN_RATE_HZ = 8000
MAX_RATE_HZ = 96000
_ACCEPTED = "16-, 24- or 32-bit integer PCM or 32/64-bit float, mono or stereo, 8–96 kHz"
_TAGS = {1: "integer PCM", 2: "Microsoft ADPCM", 3: "IEEE float", 6: "A-law", 7: "µ-law",
         0x11: "IMA ADPCM", 0x31: "GSM 6.10", 0x50: "MPEG", 0x55: "MPEG layer 3"}


class SampleSource(Protocol):
    """Anything the tick detector can read: mono samples (full scale ±1) by frame range."""

    @property
    def rate_hz(self) -> int:
        """Samples per second."""
        ...

    @property
    def frames(self) -> int:
        """Number of samples."""
        ...

    def read(self, start: int, stop: int) -> FloatArray:
        """Samples of frames [start, stop), mono, full scale ±1."""
        ...

    def read_windows(self, starts: NDArray[np.int64], length: int) -> FloatArray:
        """One row per start: frames [start, start + length), zero outside the recording."""
        ...


@dataclass(frozen=True)
class WavSource:
    """A WAV file opened for block reading. Make it with :func:`open_recording`.

    Attributes
    ----------
    path : the file.
    rate_hz : samples per second per channel.
    frames : samples per channel.
    channels : 1 or 2.
    channel : the channel read (None: the channels' mean).
    sample_format : a description such as "16-bit integer PCM".
    """

    path: Path
    rate_hz: int
    frames: int
    channels: int
    channel: int | None
    sample_format: str
    _offset: int
    _dtype: str
    _scale: float

    @property
    def duration_s(self) -> float:
        """Length of the recording, s."""
        return self.frames / self.rate_hz

    def _decode(self, raw: NDArray[np.generic], n: int) -> FloatArray:
        if self._dtype == "int24":
            b = raw.reshape(n * self.channels, 3).astype(np.int32)
            v = (b[:, 0] | (b[:, 1] << 8) | (b[:, 2] << 16)) << 8 >> 8
            x = v.astype(np.float64)
        else:
            x = raw.astype(np.float64)
        x = x.reshape(n, self.channels) * self._scale
        if self.channel is not None:
            return np.ascontiguousarray(x[:, self.channel])
        return x[:, 0] if self.channels == 1 else x.mean(axis=1)

    def _read_open(self, fh: object, start: int, stop: int) -> FloatArray:
        start, stop = max(0, start), min(self.frames, stop)
        n = max(0, stop - start)
        if n == 0:
            return np.zeros(0)
        if self._dtype == "int24":
            fh.seek(self._offset + 3 * self.channels * start)  # type: ignore[attr-defined]
            raw = np.fromfile(fh, dtype=np.uint8, count=3 * self.channels * n)  # type: ignore[call-overload]
        else:
            size = np.dtype(self._dtype).itemsize
            fh.seek(self._offset + size * self.channels * start)  # type: ignore[attr-defined]
            raw = np.fromfile(fh, dtype=self._dtype, count=self.channels * n)  # type: ignore[call-overload]
        if raw.size < (3 if self._dtype == "int24" else 1) * self.channels * n:
            raise DesignError("recording", f"{self.path.name} ends before its header says it "
                                           "does (the file is truncated)")
        return self._decode(raw, n)

    def read(self, start: int, stop: int) -> FloatArray:
        """Samples of frames [start, stop) (clipped to the recording), mono, full scale ±1."""
        with open(self.path, "rb") as fh:
            return self._read_open(fh, start, stop)

    def read_windows(self, starts: NDArray[np.int64], length: int) -> FloatArray:
        """One row per start: frames [start, start + length), zero outside the recording."""
        out = np.zeros((len(starts), length))
        with open(self.path, "rb") as fh:
            for row, s in enumerate(starts):
                lo, hi = max(0, int(s)), min(self.frames, int(s) + length)
                if lo < hi:
                    out[row, lo - s:hi - s] = self._read_open(fh, lo, hi)
        return out


@dataclass(frozen=True)
class ArraySource:
    """Samples already in memory (mono, any scale), for :func:`core.beats.analyse_ticks`."""

    samples: FloatArray
    rate_hz: int

    @property
    def frames(self) -> int:
        """Number of samples."""
        return int(self.samples.shape[0])

    def read(self, start: int, stop: int) -> FloatArray:
        """Samples of frames [start, stop), clipped to the array."""
        return np.asarray(self.samples[max(0, start):max(0, stop)], dtype=np.float64)

    def read_windows(self, starts: NDArray[np.int64], length: int) -> FloatArray:
        """One row per start: frames [start, start + length), zero outside the array."""
        idx = np.asarray(starts, dtype=np.int64)[:, None] + np.arange(length)[None, :]
        inside = (idx >= 0) & (idx < self.frames)
        rows = np.asarray(self.samples, dtype=np.float64)[np.clip(idx, 0, max(0, self.frames - 1))]
        return np.where(inside, rows, 0.0)


def _riff_layout(path: Path) -> tuple[int, int, int, int, int, int]:
    """Walk the RIFF chunks: (format tag, channels, rate, bits, data offset, data bytes)."""
    with open(path, "rb") as fh:
        head = fh.read(12)
        if len(head) < 12 or head[:4] not in (b"RIFF", b"RIFX", b"RF64") or head[8:] != b"WAVE":
            raise DesignError("recording", f"{path.name} is not a WAV file (no RIFF/WAVE header)"
                                           f"; a recording must be a WAV file ({_ACCEPTED})")
        if head[:4] != b"RIFF":
            raise DesignError("recording", f"{path.name} is a {head[:4].decode()} WAV file, "
                                           f"which cannot be read; save it as plain RIFF WAV")
        fmt: tuple[int, int, int, int] | None = None
        while True:
            ch = fh.read(8)
            if len(ch) < 8:
                raise DesignError("recording", f"{path.name} has no data chunk")
            cid, size = ch[:4], struct.unpack("<I", ch[4:])[0]
            if cid == b"fmt ":
                body = fh.read(size + (size & 1))
                tag, nch, rate, _, _, bits = struct.unpack("<HHIIHH", body[:16])
                if tag == 0xFFFE and size >= 26:
                    tag = struct.unpack("<H", body[24:26])[0]
                fmt = (tag, nch, rate, bits)
            elif cid == b"data":
                if fmt is None:
                    raise DesignError("recording", f"{path.name} has data before its format")
                return (*fmt, fh.tell(), size)
            else:
                fh.seek(size + (size & 1), 1)


def _describe(tag: int, bits: int) -> str:
    return f"{bits}-bit {_TAGS.get(tag, f'format tag {tag:#06x}')}"


def open_recording(path: str | Path, channel: int | None = None) -> WavSource:
    """Open a WAV recording for block reading, refusing what cannot be used.

    Parameters
    ----------
    path : the WAV file.
    channel : 0-based channel to read from a stereo file; None mixes the channels (their mean).

    Raises
    ------
    DesignError
        On ``recording`` for an unreadable file or a format other than 16/24/32-bit integer or
        32/64-bit float PCM, one or two channels, 8–96 kHz; on ``channel`` for a channel the
        file does not have.
    """
    p = Path(path)
    if not p.is_file():
        raise DesignError("recording", f"{p} does not exist or is not a file")
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", wavfile.WavFileWarning)
            rate, data = wavfile.read(p, mmap=True)
        dtype = data.dtype
        offset = int(data.offset)
        frames = int(data.shape[0])
        channels = 1 if data.ndim == 1 else int(data.shape[1])
        del data
        kind = dtype.kind
        bits = dtype.itemsize * 8
        desc = f"{bits}-bit " + ("IEEE float" if kind == "f" else
                                 "unsigned integer PCM" if kind == "u" else "integer PCM")
        ok = (kind == "i" and bits in (16, 32)) or (kind == "f" and bits in (32, 64))
        scale = 1.0 if kind == "f" else 2.0 ** -(bits - 1)
        dtype_name = dtype.str
    except DesignError:
        raise
    except (ValueError, OSError, EOFError, struct.error) as exc:
        tag, channels, rate, bits, offset, nbytes = _riff_layout(p)
        desc = _describe(tag, bits)
        if not (tag == 1 and bits == 24):
            raise DesignError("recording", f"{p.name} is {desc}, which cannot be used; a "
                                           f"recording must be {_ACCEPTED} ({exc})") from None
        ok, scale, dtype_name = True, 2.0 ** -23, "int24"
        frames = nbytes // (3 * max(channels, 1))
    if not ok:
        raise DesignError("recording", f"{p.name} is {desc}, which cannot be used; a recording "
                                       f"must be {_ACCEPTED}")
    if channels not in (1, 2):
        raise DesignError("recording", f"{p.name} has {channels} channels; a recording must be "
                                       "mono or stereo")
    if not MIN_RATE_HZ <= rate <= MAX_RATE_HZ:
        raise DesignError("recording", f"{p.name} is sampled at {rate} Hz; it must be "
                                       f"{MIN_RATE_HZ}–{MAX_RATE_HZ} Hz")
    if frames == 0:
        raise DesignError("recording", f"{p.name} holds no samples")
    if channel is not None and not 0 <= channel < channels:
        raise DesignError("channel", f"channel={channel} is out of range: {p.name} has "
                                     f"{channels} channel{'s' if channels > 1 else ''} "
                                     f"(0{'' if channels == 1 else ' or 1'})")
    return WavSource(path=p, rate_hz=int(rate), frames=frames, channels=channels,
                     channel=channel, sample_format=desc, _offset=offset, _dtype=dtype_name,
                     _scale=scale)


def read_recording(path: str | Path, channel: int | None = None) -> tuple[FloatArray, int]:
    """The whole recording as mono samples (full scale ±1) and its rate in Hz (short files)."""
    src = open_recording(path, channel)
    return src.read(0, src.frames), src.rate_hz
