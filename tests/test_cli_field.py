"""`benchplan field`: values at points, along lines and over planes, and the map drawings."""
from __future__ import annotations

import csv
import io

import pytest
from click.testing import CliRunner

from planner.cli import main

SPHERE = """\
title: One sphere
magnets:
  - id: ball
    shape: sphere
    diameter: 10 mm
    remanence: 1.2 T
    at: [0 mm, 0 mm, 0 mm]
    magnetization: +z
zones:
  - id: seats
    kind: seating
    from: [-30 cm, 10 cm, -5 cm]
    to: [30 cm, 40 cm, 5 cm]
"""


@pytest.fixture
def sphere_file(tmp_path):
    path = tmp_path / "sphere.yaml"
    path.write_text(SPHERE, encoding="utf-8")
    return path


def run(*arguments):
    return CliRunner().invoke(main, [str(a) for a in arguments])


def axial_field(distance, remanence=1.2, radius=5e-3):
    """Outside a uniformly magnetized sphere: B = (2/3) J (R/r)^3 on its axis (Jackson, 3rd ed., sec. 5.10)."""
    return 2.0 / 3.0 * remanence * (radius / distance) ** 3


def test_field_at_a_point_on_the_axis(sphere_file):
    result = run("field", sphere_file, "--at", "0, 0, 20 mm")
    assert result.exit_code == 0, result.output
    # the expected text comes from the closed form (axial_field), printed to four figures
    assert f"|B| = {axial_field(0.02) * 1e3:.4g} mT" in result.output
    # and that closed form worked by hand: B = (2/3) J (R/r)^3 = 0.8 T (5/20)^3 = 12.5 mT
    assert axial_field(0.02) == pytest.approx(12.5e-3)


def test_field_along_a_line_as_csv(sphere_file):
    result = run("field", sphere_file, "--along", "0,0,10 mm", "0,0,40 mm", "--samples", "4")
    assert result.exit_code == 0, result.output
    rows = list(csv.DictReader(io.StringIO(result.output)))
    assert [float(r["z_m"]) for r in rows] == pytest.approx([0.01, 0.02, 0.03, 0.04])
    for row in rows:
        assert float(row["Bz_T"]) == pytest.approx(axial_field(float(row["z_m"])), rel=1e-5)


def test_plan_map_at_a_stated_height(sphere_file, tmp_path):
    out = tmp_path / "map.svg"
    result = run("field", sphere_file, "--map", "plan", "--plane", "z=20 mm", "--out", out)
    assert result.exit_code == 0, result.output
    text = out.read_text(encoding="utf-8")
    assert "height z = 20 mm" in text  # the title says which plane was drawn
    assert "seats" in text


def test_map_plane_must_match_the_view(sphere_file, tmp_path):
    result = run("field", sphere_file, "--map", "plan", "--plane", "y=0 mm", "--out", tmp_path / "m.svg")
    assert result.exit_code == 2 and "plane z=" in result.output
    result = run("field", sphere_file, "--at", "0,0,1 m", "--plane", "z=0 mm")
    assert result.exit_code == 2 and "--plane chooses the plane of --map" in result.output


def test_a_plane_no_line_crosses_is_refused_with_its_height(sphere_file, tmp_path):
    out = tmp_path / "far.svg"
    # 2 m above a 1.2 T, 10 mm sphere the field is far below 0.1 mT (Jackson, sec. 5.10): no line
    result = run("field", sphere_file, "--map", "plan", "--plane", "z=2 m", "--out", out)
    assert result.exit_code == 2
    assert "z = 2000 mm" in result.output and not out.exists()


def test_exactly_one_kind_of_output(sphere_file):
    result = run("field", sphere_file, "--at", "0,0,1 m", "--grid", "z=0 mm")
    assert result.exit_code == 2 and "exactly one" in result.output
