"""Map scenes draw steel and conductors to scale, as the setup file gives them."""
from __future__ import annotations

import pytest

from planner.assess import assess
from planner.setup import load_setup
from reports.pdf.scenes import scenes_from_setup

SETUP = """\
title: Parts on the map
magnets:
  - id: ball
    shape: sphere
    diameter: 20 mm
    remanence: 1.2 T
    at: [0 mm, 0 mm, 10 mm]
    magnetization: +z
steel_surfaces:
  - id: plate
    at: [100 mm, 0 mm, 0 mm]
    normal: +z
    thickness: 3 mm
    size: [40 cm, 20 cm]
  - id: bench-frame
    at: [0 mm, 0 mm, -20 mm]
    normal: +z
    thickness: 5 mm
loose_steel:
  - id: nut
    shape: sphere
    diameter: 12 mm
    at: [150 mm, 50 mm, 6 mm]
conductors:
  - id: tube
    kind: tube
    material: copper
    inner_diameter: 22 mm
    outer_diameter: 26 mm
    length: 500 mm
    at: [-150 mm, 0 mm, 250 mm]
"""


@pytest.fixture(scope="module")
def scenes(tmp_path_factory):
    path = tmp_path_factory.mktemp("scenes") / "parts.yaml"
    path.write_text(SETUP, encoding="utf-8")
    setup = load_setup(path)
    return scenes_from_setup(setup, assess(setup))


def shape(scene, label):
    (found,) = [s for s in scene.shapes if s.label == label]
    return found


def test_sized_steel_face_and_its_thickness(scenes):
    plan, elevation = scenes["plan"][0], scenes["elevation"][0]
    # identity: a 40 x 20 cm face centred on (100, 0) mm, 3 mm thick below its face at z = 0
    face = shape(plan, "plate")
    assert face.kind == "steel"
    assert face.corner_low == pytest.approx((-0.1, -0.1)) and face.corner_high == pytest.approx((0.3, 0.1))
    side = shape(elevation, "plate")
    assert side.corner_low == pytest.approx((-0.1, -0.003)) and side.corner_high == pytest.approx((0.3, 0.0))


def test_large_face_parallel_to_the_plan_is_a_note_not_a_cover(scenes):
    plan = scenes["plan"][0]
    assert not [s for s in plan.shapes if s.label == "bench-frame"]
    assert any(note.startswith("bench-frame: a large steel face parallel to this view") for note in plan.notes)
    # seen edge-on in the elevation it is a band 5 mm thick below z = -20 mm
    band = shape(scenes["elevation"][0], "bench-frame")
    assert band.corner_low[1] == pytest.approx(-0.025) and band.corner_high[1] == pytest.approx(-0.020)


def test_loose_steel_and_a_tube(scenes):
    plan, elevation = scenes["plan"][0], scenes["elevation"][0]
    nut = shape(plan, "nut")
    assert nut.kind == "steel" and nut.radius == pytest.approx(0.006) and nut.centre == pytest.approx((0.15, 0.05))
    # a vertical tube: its outer circle seen from above, a 26 mm x 500 mm rectangle from the front
    assert shape(plan, "tube").kind == "conductor" and shape(plan, "tube").radius == pytest.approx(0.013)
    front = shape(elevation, "tube")
    assert front.corner_low == pytest.approx((-0.163, 0.0)) and front.corner_high == pytest.approx((-0.137, 0.5))
