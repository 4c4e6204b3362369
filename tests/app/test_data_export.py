"""CSV tables: a plain header row with units in the names, then the core's numbers."""

from __future__ import annotations

import csv
import math
from pathlib import Path

import numpy as np
import pytest

from app.report.csv_data import (
    MOTION_COLUMNS,
    PARTS_COLUMNS,
    PERIOD_CURVE_COLUMNS,
    write_motion_csv,
    write_parts_csv,
    write_period_curve_csv,
)
from core import analyse, load_design

EXAMPLES = Path(__file__).resolve().parents[2] / "resources" / "examples"


@pytest.fixture(scope="module")
def atrium():
    return analyse(load_design(EXAMPLES / "atrium_pendulum.pendulum.json"))


def _read(path: Path) -> tuple[list[str], np.ndarray | list[list[str]]]:
    with open(path, newline="", encoding="utf-8") as fh:
        rows = list(csv.reader(fh))
    return rows[0], rows[1:]


def test_motion_csv(tmp_path, atrium):
    path = write_motion_csv(atrium, tmp_path / "motion.csv")
    header, rows = _read(path)
    assert tuple(header) == MOTION_COLUMNS == (
        "time_s", "exact_angle_deg", "linear_angle_deg", "angular_velocity_deg_s",
        "difference_deg")
    data = np.array(rows, dtype=float)
    m = atrium.motion
    assert data.shape == (1201, 5)  # three periods at 400 samples a period, and the end
    np.testing.assert_allclose(data[:, 0], m.time_s, rtol=1e-11)
    np.testing.assert_allclose(data[:, 1], np.degrees(m.angle_rad), rtol=1e-11, atol=1e-13)
    np.testing.assert_allclose(data[:, 3], np.degrees(m.angular_velocity_rad_s), rtol=1e-11,
                               atol=1e-13)
    np.testing.assert_allclose(data[:, 4], data[:, 1] - data[:, 2], atol=1e-10)
    assert data[0, 1] == pytest.approx(3.5, abs=1e-12)  # released from rest at 3.5°
    assert data[0, 3] == pytest.approx(0.0, abs=1e-12)
    assert data[-1, 0] == pytest.approx(3 * atrium.period_s, rel=1e-12)


def test_period_curve_csv(tmp_path, atrium):
    path = write_period_curve_csv(atrium, tmp_path / "curve.csv")
    header, rows = _read(path)
    assert tuple(header) == PERIOD_CURVE_COLUMNS == (
        "semi_arc_deg", "period_s", "circular_error_s_per_day")
    data = np.array(rows, dtype=float)
    assert data.shape == (400, 3)
    assert data[0, 0] == pytest.approx(0.05) and data[-1, 0] == pytest.approx(179.9)
    assert np.all(np.diff(data[:, 0]) > 0) and np.all(np.diff(data[:, 1]) > 0)
    # The curve passes through the working point (3.5° → the exact period), to within linear
    # interpolation on its 0.5° grid: T0·h²/64 with h = 0.5° in rad, ≈ 1.2e-6 relative.
    assert np.interp(3.5, data[:, 0], data[:, 1]) == pytest.approx(atrium.period_s, rel=2e-6)
    # Circular error is 86400 (1 − T₀/T) (DESIGN §4).
    expected = 86400.0 * (1.0 - atrium.period_small_s / data[:, 1])
    np.testing.assert_allclose(data[:, 2], expected, rtol=1e-9, atol=1e-9)


def test_parts_csv(tmp_path, atrium):
    path = write_parts_csv(atrium, tmp_path / "parts.csv")
    header, rows = _read(path)
    assert tuple(header) == PARTS_COLUMNS
    assert [r[0] for r in rows] == ["wire", "sphere"]
    sphere = dict(zip(header, rows[1], strict=True))
    assert sphere["shape"] == "sphere" and sphere["material"] == "brass"
    # Brass sphere of 0.32 m, density 8500 kg/m³: 4/3 π 0.16³ · 8500 = 145.84 kg.
    assert float(sphere["mass_kg"]) == pytest.approx(4 / 3 * math.pi * 0.16**3 * 8500, rel=1e-3)
    assert float(sphere["width_m"]) == pytest.approx(0.32, rel=1e-4)
    assert float(sphere["inner_width_m"]) == 0.0


def test_no_temporary_file_is_left(tmp_path, atrium):
    write_motion_csv(atrium, tmp_path / "motion.csv")
    assert [p.name for p in tmp_path.iterdir()] == ["motion.csv"]
