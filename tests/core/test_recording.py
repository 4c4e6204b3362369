"""Reading WAV recordings (core.recording): formats accepted and refused, channels, blocks."""

from __future__ import annotations

import struct
import wave
from pathlib import Path

import numpy as np
import pytest
from scipy.io import wavfile

from core import DesignError
from core.recording import ArraySource, open_recording, read_recording

RATE = 8000


def _signal(n: int = 4000, seed: int = 1) -> np.ndarray:
    return np.random.default_rng(seed).uniform(-0.9, 0.9, n)


class TestFormats:
    @pytest.mark.parametrize("dtype, full", [(np.int16, 2 ** 15), (np.int32, 2 ** 31)])
    def test_integer_pcm_reads_back_scaled(self, tmp_path: Path, dtype: type, full: int) -> None:
        ints = np.round(_signal() * (full - 1)).astype(dtype)
        path = tmp_path / "a.wav"
        wavfile.write(path, RATE, ints)
        x, rate = read_recording(path)
        assert rate == RATE
        # plain arithmetic: full scale is 2^(bits−1)
        np.testing.assert_array_equal(x, ints.astype(np.float64) / full)

    @pytest.mark.parametrize("dtype", [np.float32, np.float64])
    def test_float_reads_back_unchanged(self, tmp_path: Path, dtype: type) -> None:
        x0 = _signal().astype(dtype)
        path = tmp_path / "f.wav"
        wavfile.write(path, 48000, x0)
        src = open_recording(path)
        assert src.sample_format == f"{8 * np.dtype(dtype).itemsize}-bit IEEE float"
        np.testing.assert_array_equal(src.read(0, src.frames), x0.astype(np.float64))

    def test_24_bit_read_in_blocks(self, tmp_path: Path) -> None:
        # written with the standard library's wave module, three bytes per sample, stereo
        ints = np.round(_signal(6000).reshape(3000, 2) * (2 ** 23 - 1)).astype(np.int64)
        raw = b"".join(int(v).to_bytes(3, "little", signed=True) for v in ints.ravel())
        path = tmp_path / "w24.wav"
        with wave.open(str(path), "wb") as w:
            w.setnchannels(2)
            w.setsampwidth(3)
            w.setframerate(96000)
            w.writeframes(raw)
        src = open_recording(path, channel=1)
        assert (src.sample_format, src.frames, src.rate_hz) == ("24-bit integer PCM", 3000, 96000)
        np.testing.assert_array_equal(src.read(1000, 1200), ints[1000:1200, 1] / 2.0 ** 23)
        mixed = open_recording(path).read(0, 3000)
        np.testing.assert_allclose(mixed, ints.mean(axis=1) / 2.0 ** 23, rtol=0, atol=1e-15)

    def test_eight_bit_is_refused_by_name(self, tmp_path: Path) -> None:
        path = tmp_path / "u8.wav"
        wavfile.write(path, RATE, np.full(100, 128, dtype=np.uint8))
        with pytest.raises(DesignError) as err:
            open_recording(path)
        assert err.value.field == "recording"
        assert "8-bit unsigned integer PCM" in str(err.value)

    def test_64_bit_integer_is_refused(self, tmp_path: Path) -> None:
        path = tmp_path / "i64.wav"
        wavfile.write(path, RATE, np.zeros(100, dtype=np.int64))
        with pytest.raises(DesignError, match="64-bit integer PCM"):
            open_recording(path)

    def test_compressed_format_is_named(self, tmp_path: Path) -> None:
        # a hand-made RIFF header with format tag 6 (A-law), 8 bit, mono
        fmt = struct.pack("<HHIIHH", 6, 1, RATE, RATE, 1, 8)
        data = bytes(100)
        body = b"WAVE" + b"fmt " + struct.pack("<I", 16) + fmt + b"data" + \
            struct.pack("<I", len(data)) + data
        path = tmp_path / "alaw.wav"
        path.write_bytes(b"RIFF" + struct.pack("<I", len(body)) + body)
        with pytest.raises(DesignError, match="8-bit A-law"):
            open_recording(path)

    @pytest.mark.parametrize("rate", [4000, 192000])
    def test_rate_outside_8_to_96_khz(self, tmp_path: Path, rate: int) -> None:
        path = tmp_path / "r.wav"
        wavfile.write(path, rate, np.zeros(100, dtype=np.int16))
        with pytest.raises(DesignError, match=f"{rate} Hz"):
            open_recording(path)

    def test_three_channels_refused(self, tmp_path: Path) -> None:
        path = tmp_path / "c3.wav"
        wavfile.write(path, RATE, np.zeros((100, 3), dtype=np.int16))
        with pytest.raises(DesignError, match="3 channels"):
            open_recording(path)

    def test_not_a_wav_and_missing_file(self, tmp_path: Path) -> None:
        path = tmp_path / "notes.wav"
        path.write_text("tick tock", encoding="utf-8")
        with pytest.raises(DesignError, match="not a WAV file"):
            open_recording(path)
        with pytest.raises(DesignError, match="does not exist"):
            open_recording(tmp_path / "absent.wav")

    def test_truncated_file(self, tmp_path: Path) -> None:
        path = tmp_path / "t.wav"
        wavfile.write(path, RATE, np.zeros(4000, dtype=np.int16))
        src = open_recording(path)
        path.write_bytes(path.read_bytes()[:2000])
        with pytest.raises(DesignError, match="truncated"):
            src.read(0, src.frames)


class TestChannels:
    def test_pick_and_mix(self, tmp_path: Path) -> None:
        left, right = _signal(seed=2), _signal(seed=3)
        path = tmp_path / "st.wav"
        wavfile.write(path, RATE, np.column_stack([left, right]).astype(np.float32))
        np.testing.assert_array_equal(read_recording(path, 0)[0], left.astype(np.float32))
        np.testing.assert_array_equal(read_recording(path, 1)[0], right.astype(np.float32))
        np.testing.assert_allclose(read_recording(path)[0],
                                   (left.astype(np.float32) + right.astype(np.float32)) / 2,
                                   rtol=0, atol=1e-7)

    def test_channel_out_of_range(self, tmp_path: Path) -> None:
        path = tmp_path / "st.wav"
        wavfile.write(path, RATE, np.zeros((100, 2), dtype=np.int16))
        with pytest.raises(DesignError) as err:
            open_recording(path, channel=2)
        assert err.value.field == "channel" and "2 channels" in str(err.value)


class TestBlocks:
    def test_blocks_and_windows_match_the_whole(self, tmp_path: Path) -> None:
        ints = np.round(_signal(9000) * 32767).astype(np.int16)
        path = tmp_path / "b.wav"
        wavfile.write(path, RATE, ints)
        src = open_recording(path)
        whole = ints / 32768.0
        np.testing.assert_array_equal(src.read(1234, 5678), whole[1234:5678])
        np.testing.assert_array_equal(src.read(8990, 20000), whole[8990:])
        win = src.read_windows(np.array([-3, 100, 8995]), 10)
        np.testing.assert_array_equal(win[0], np.r_[np.zeros(3), whole[:7]])
        np.testing.assert_array_equal(win[1], whole[100:110])
        np.testing.assert_array_equal(win[2], np.r_[whole[8995:], np.zeros(5)])
        arr = ArraySource(whole, RATE)
        np.testing.assert_array_equal(arr.read_windows(np.array([-3, 100, 8995]), 10), win)
