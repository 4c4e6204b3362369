"""The exhibit planning in the window: plan view, client sheet, swing GIF, purpose switch."""

from __future__ import annotations

import math
import subprocess
from pathlib import Path

import pytest

from app.views.plan_view import PlanView
from core import analyse, load_design, with_value

EXAMPLES = Path(__file__).resolve().parents[2] / "resources" / "examples"
HALL = EXAMPLES / "science_hall_pendulum.pendulum.json"


@pytest.fixture
def hall():
    return analyse(load_design(HALL))


def _wrapped(angle: float) -> float:
    return (angle + 90.0) % 180.0 - 90.0  # a line's direction, modulo 180°


@pytest.mark.parametrize("latitude", [41.2, -33.9])
def test_plane_lines_turn_with_the_signed_foucault_rate(qtbot, latitude):
    result = analyse(with_value(load_design(HALL), "site.latitude_deg", latitude))
    view = PlanView()
    qtbot.addWidget(view)
    view.set_hours(5)
    view.show_result(result)
    lines = view.plane_lines()
    assert [line.hours for line in lines] == [0.0, 1.0, 2.0, 3.0, 4.0, 5.0]
    rate = result.exhibit.foucault_deg_per_hour
    # Foucault: 360° sin φ per sidereal day, clockwise from above in the north [pub, memory]
    assert rate == pytest.approx(360.0 * math.sin(math.radians(latitude)) / 23.9344696,
                                 rel=1e-9)
    for line in lines:
        assert _wrapped(line.angle_deg) == pytest.approx(_wrapped(rate * line.hours), abs=1e-9)
    # north: the +1 h line lies clockwise (positive x at the top); south: counter-clockwise
    assert (_wrapped(lines[1].angle_deg) > 0) == (latitude > 0)


def test_barrier_circle_and_pins(qtbot, hall):
    view = PlanView()
    qtbot.addWidget(view)
    view.set_pins(4)
    view.show_result(hall)
    assert view.barrier_radius() == pytest.approx(hall.design.exhibit.barrier_radius_m,
                                                  rel=1e-9)
    rate = hall.exhibit.foucault_deg_per_hour
    # pins at 45°, 135°, 225°, 315° clockwise: the plane (a line) reaches them at 45° and
    # 135° of turn (plain geometry)
    assert view.pin_hours() == pytest.approx([45 / rate, 135 / rate, 45 / rate, 135 / rate])


def test_client_sheet_is_one_page_with_name_and_caution(tmp_path, qtbot, hall):
    from app.report.client_sheet import write_client_sheet
    from core.analysis import LOAD_CAUTION

    path = write_client_sheet(hall, tmp_path / "sheet.pdf")
    info = subprocess.run(["pdfinfo", str(path)], capture_output=True, text=True,
                          check=True).stdout
    assert "Pages:           1" in info
    assert path.stat().st_size < 1_000_000
    text = " ".join(subprocess.run(["pdftotext", str(path), "-"], capture_output=True,
                                   text=True, check=True).stdout.split())
    assert hall.design.name in text
    assert " ".join(LOAD_CAUTION.split()[:8]) in text
    assert "Animation" not in text  # no window state


def test_swing_gif_lasts_one_period(tmp_path, qtbot, hall):
    from PIL import Image

    from app.report.swing_animation_export import write_swing_gif

    path = write_swing_gif(hall, tmp_path / "swing.gif", size=(160, 200))
    with Image.open(path) as im:
        durations = []
        for i in range(im.n_frames):
            im.seek(i)
            durations.append(im.info["duration"])
    assert len(durations) >= 20
    assert sum(durations) / 1000.0 == pytest.approx(hall.period_s, abs=max(durations) / 1000.0)


def test_purpose_switch_is_one_undo_step_and_opens_the_preview(window):
    before = window.document.design
    window.design_panel.row("purpose")  # the row is there
    window.design_panel._on_chosen("purpose", "exhibit")
    window.compute_now()
    assert window.document.design.purpose == "exhibit"
    shown = [window.plots[i].slug for i in window.plot_area.shown_indices()]
    assert "swing_preview" in shown
    assert window.document.undo_stack.count() == 1
    window.document.undo_stack.undo()
    assert window.document.design == before


def test_exhibit_rows_create_the_section(window):
    panel = window.design_panel
    panel._enable_optional("exhibit.barrier_radius_m")
    assert window.document.design.exhibit is not None
    assert window.document.design.exhibit.barrier_radius_m is not None
