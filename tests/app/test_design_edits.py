"""Structural design edits (no Qt): every result is a valid design or a named refusal."""

from __future__ import annotations

from pathlib import Path

import pytest

from app.form import design_edits as edits
from core import DesignError, load_design

EXAMPLE = (Path(__file__).resolve().parents[2]
           / "resources/examples/workshop_regulator.pendulum.json")


@pytest.fixture
def design():  # type: ignore[no-untyped-def]
    return load_design(EXAMPLE)


def test_add_each_kind_of_part(design) -> None:  # type: ignore[no-untyped-def]
    for kind in ("rod", "bob", "weight"):
        new, index = edits.add_part(design, kind)
        assert len(new.parts) == len(design.parts) + 1 and new.parts[index].kind == kind
    named = edits.add_part(design, "rod")[0]
    assert named.parts[-1].name == "rod 2"


def test_remove_refuses_a_part_that_carries_another(design) -> None:  # type: ignore[no-untyped-def]
    with pytest.raises(DesignError, match="carried by 'rod'"):
        edits.remove_part(design, 0)
    assert [p.name for p in edits.remove_part(design, 3).parts] == ["rod", "sleeve", "bob"]


def test_duplicate_a_trim_weight(design) -> None:  # type: ignore[no-untyped-def]
    new, index = edits.duplicate_part(design, 3)
    assert index == 4 and new.parts[4].name == "trim 2"
    assert new.parts[4].mass_kg == design.parts[3].mass_kg


def test_rename_follows_references(design) -> None:  # type: ignore[no-untyped-def]
    new = edits.rename_part(design, 0, "main rod")
    assert new.parts[1].on == "main rod" and new.parts[3].on == "main rod"


def test_bob_shape_and_mount(design) -> None:  # type: ignore[no-untyped-def]
    disc = edits.set_bob_shape(design, 2, "disc")
    assert disc.parts[2].thickness_m == 0.12 and disc.parts[2].height_m is None
    clamped = edits.set_bob_mount(design, 2, "clamp", 1.05)
    assert clamped.parts[2].mount.kind == "clamp" and clamped.parts[2].mount.centre_m == 1.05


def test_target_and_suspension_kinds(design) -> None:  # type: ignore[no-untyped-def]
    bph = edits.set_target_kind(design, "beats_per_hour")
    assert bph.target.beats_per_hour == pytest.approx(3600.0) and bph.target.period_s is None
    assert edits.set_target_kind(design, "none").target.target_period_s is None
    spring = edits.set_suspension_kind(design, "spring")
    assert spring.suspension.stiffness_n_m_per_rad == 0.02
    assert edits.set_suspension_kind(spring, "knife_edge").suspension.stiffness_n_m_per_rad == 0
