"""A property-based sweep of small valid setups through the whole chain: no rule raises or gives up.

Setups are drawn at random (shapes, sizes, grades, audience, a zone, a loose steel item, a pair
brought together); each is validated by the real loader, assessed by the real physics and judged
by every rule. The property: evaluate() returns findings and none says a rule could not run.
"""
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from planner import assess, parse_setup

SHAPES = {
    "cylinder": "shape: cylinder, diameter: {d} mm, height: {h} mm",
    "ring": "shape: ring, diameter: {d} mm, inner_diameter: {i} mm, height: {h} mm",
    "block": "shape: block, size: [{d} mm, {h} mm, {h} mm]",
    "sphere": "shape: sphere, diameter: {d} mm",
}


@st.composite
def small_setups(draw):
    shape = draw(st.sampled_from(sorted(SHAPES)))
    diameter = draw(st.integers(3, 40))
    height = draw(st.integers(2, 30))
    grade = draw(st.sampled_from(["N35", "N42", "N52", "SmCo5", "ferrite", "AlNiCo5"]))
    direction = draw(st.sampled_from(["+z", "-z", "+x", "[0, 1, 1]"]))
    age = draw(st.integers(3, 70))
    groups = draw(st.sampled_from(["[staff]", "[students]", "[staff, public]"]))
    geometry = SHAPES[shape].format(d=diameter, h=height, i=max(1, diameter // 2))
    second_x = diameter + draw(st.integers(5, 200))
    text = f"""
title: Random bench
audience: {{groups: {groups}, youngest_age: {age}}}
magnets:
  - {{id: one, {geometry}, grade: {grade}, at: [0 mm, 0 mm, 50 mm], magnetization: {direction}}}
  - {{id: two, shape: cylinder, diameter: 10 mm, height: 5 mm, grade: N42, at: [{second_x} mm, 0 mm, 50 mm],
     magnetization: +z}}
loose_steel:
  - {{id: nut, shape: sphere, diameter: 8 mm, at: [0 mm, {draw(st.integers(60, 400))} mm, 4 mm]}}
activities:
  - {{id: join, kind: bring_together, magnet: two, other: one, by: hand{", temperature: 90 degC" if draw(st.booleans()) else ""}}}
zones:
  - {{id: seats, kind: seating, from: [-1 m, {draw(st.integers(10, 150))} cm, -0.5 m], to: [1 m, 2 m, 0.5 m],
     contains: [cards, watches]}}
"""
    return parse_setup(text)


@settings(max_examples=3, deadline=None, suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])
@given(setup=small_setups())
def test_every_rule_runs_on_random_valid_setups(setup):
    assessment = assess(setup, with_maps=False)
    assert assessment.findings, "a setup with magnets always gets at least the general findings"
    assert not [f.id for f in assessment.findings if f.id.endswith("could-not-run")]
    assert assessment.to_dict()["findings"]
