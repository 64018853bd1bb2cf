"""evaluate() never raises; the terminal summary and `benchplan assess` (with a stand-in for the
lead's assess() until it lands, and the real one on every example setup once it has)."""
import json
import sys
import types
from pathlib import Path

import pytest
from click.testing import CliRunner
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import hazards
from hazards.evaluate import evaluate
from hazards.findings import BLOCKING, SEVERITIES, Finding
from hazards.rules import RULES
from hazards.thresholds import effective_thresholds
from planner.assessment import InductionFigures, ProjectileFigures, ShippingFigures
from planner.setup import site_rules_of
from planner.setup.model import SiteRules
from tests.hazards import assessment, keep_out, magnet, pair, setup_from, zone_reach

SETUPS = sorted(p for p in Path("setups").glob("*.yaml") if "site-rules" not in p.name)
T = effective_thresholds(SiteRules())


def test_a_failing_rule_becomes_a_blocking_finding(monkeypatch):
    def broken(setup, assessment, thresholds):
        raise ZeroDivisionError("boom")
    monkeypatch.setattr("hazards.rules.RULES", [("implants", broken)] + RULES[1:])
    found = evaluate(setup_from(), assessment(magnets=[magnet()]), T)
    failed = [f for f in found if f.id == "implants.could-not-run"]
    assert failed and failed[0].severity == BLOCKING and "boom" in failed[0].why


def test_findings_sorted_and_carry_the_deferral_line():
    setup = setup_from("site_rules: {competent_persons: [{name: A. Example, role: safety officer}]}\n",
                       audience="audience: {groups: [public]}\n")
    a = assessment(magnets=[magnet()], keep_out=[keep_out("implant_keep_out", 0.2)],
                   zone_reach=[zone_reach("seats", "implant_keep_out", 1e-3)])
    found = evaluate(setup, a, T)
    ranks = [f.rank for f in found]
    assert ranks == sorted(ranks, reverse=True) and found[0].severity == BLOCKING
    assert all("A. Example" in f.deferral and "competent persons" in f.deferral for f in found)
    json.dumps([f.to_dict() for f in found])


def test_package_exports():
    assert hazards.evaluate is evaluate and hazards.effective_thresholds is effective_thresholds


# --- hypothesis sweep: random figures never make a rule raise ---------------------------------

numbers = st.one_of(st.floats(allow_nan=True, allow_infinity=True), st.just(0.0), st.just(float("nan")),
                    st.just(float("inf")), st.just(-float("inf")))
names = st.sampled_from(["disc", "disc2", "ghost", "seats"])
magnets_st = st.builds(lambda i, f, b, c, mw, hc, n: magnet(i, pole_face_field_T=f, fits_small_parts_cylinder=b,
                                                            flux_index_kG2_mm2=c, max_working_temperature_C=mw,
                                                            coercivity_min_A_per_m=hc, pole_area_m2=n, count=3),
                       names, numbers, st.booleans(), numbers, st.one_of(st.none(), numbers),
                       st.one_of(st.none(), numbers), numbers)
keep_st = st.builds(lambda t, d, m: keep_out(t, d, m), st.sampled_from(["implant_keep_out", "cards", "watches",
                                                                        "projectile_line", "instruments"]), numbers, names)
reach_st = st.builds(lambda z, t, f, p: zone_reach(z, t, f, p), st.sampled_from(["seats", "desk"]),
                     st.sampled_from(["implant_keep_out", "public_exposure", "cards"]), numbers, st.booleans())
pair_st = st.builds(lambda a, b, c, d, e, f, g: pair(magnet_id=a, other_id=b, force_at_finger_gap_N=c, pinch_energy_J=d,
                                                     snap_distance_bench_m=e, snap_distance_hand_m=f, both_brittle=g),
                    names, names, numbers, numbers, numbers, numbers, st.booleans())
projectile_st = st.builds(lambda d, p, l, b: ProjectileFigures("nut", "disc", d, p, l, 0.01, b, b),
                          numbers, numbers, numbers, st.booleans())
shipping_st = st.builds(lambda a, b: ShippingFigures("send", ["disc"], 10, 1.0, a, b, False), numbers, numbers)
induction_st = st.builds(lambda v: InductionFigures("run", "pass_through_coil", v, ["remark"]),
                         st.dictionaries(st.sampled_from(["peak_emf_V", "emf_rms_V", "switch_off_peak_V",
                                                          "peak_current_A", "full_scale_A", "peak_to_full_scale",
                                                          "stored_energy_J", "stored_charge_C", "odd_key"]),
                                         st.one_of(numbers, st.none(), st.text(max_size=3)), max_size=6))

SWEEP_SETUP = setup_from("""
zones:
  - {id: seats, kind: seating, from: [1 m, 1 m, 0 m], to: [2 m, 2 m, 1 m], contains: [cards, watches, instruments]}
activities:
  - {id: heat, kind: bring_together, magnet: disc, other: disc2, temperature: 200 degC}
  - {id: send, kind: ship_package, magnets: [disc], package_size: [10 cm, 10 cm, 10 cm]}
loose_steel:
  - {id: nut, shape: sphere, diameter: 10 mm, at: [5 cm, 0 cm, 5 mm]}
""", magnets="  - {id: disc, shape: cylinder, diameter: 10 mm, height: 5 mm, grade: N42, at: [0 mm, 0 mm, 2.5 mm], magnetization: +z}\n"
             "  - {id: disc2, shape: sphere, diameter: 5 mm, grade: N42, at: [50 mm, 0 mm, 2.5 mm], magnetization: +z}\n",
    audience="audience: {groups: [public]}\n")


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.lists(magnets_st, max_size=3), st.lists(keep_st, max_size=4), st.lists(reach_st, max_size=4),
       st.lists(pair_st, max_size=2), st.lists(projectile_st, max_size=2), st.lists(shipping_st, max_size=1),
       st.lists(induction_st, max_size=2))
def test_no_rule_raises_on_random_figures(mags, keeps, reaches, pairs, items, packages, inductions):
    a = assessment(magnets=mags, keep_out=keeps, zone_reach=reaches, pairs=pairs, projectiles=items,
                   shipping=packages, induction=inductions)
    for concern, rule in RULES:
        produced = rule(SWEEP_SETUP, a, T)   # called directly: an exception fails the test
        assert all(isinstance(f, Finding) and f.severity in SEVERITIES for f in produced), concern
    found = evaluate(SWEEP_SETUP, a, T)
    assert not [f for f in found if f.id.endswith("could-not-run")]
    json.dumps([f.to_dict() for f in found], allow_nan=False)


# --- terminal summary and the command -------------------------------------------------------------

def _full_assessment(setup):
    thresholds = effective_thresholds(site_rules_of(setup))
    a = assessment(magnets=[magnet()], keep_out=[keep_out("implant_keep_out", 0.2), keep_out("cards", 0.1)],
                   zone_reach=[zone_reach("seats", "implant_keep_out", 1e-3)], pairs=[pair()])
    a.thresholds = thresholds
    a.findings = evaluate(setup, a, thresholds)
    return a


def test_terminal_summary_shows_sources_origins_and_findings():
    from reports.terminal import render_terminal
    setup = setup_from("site_rules:\n  thresholds:\n    cards: {value: 2 mT, reason: High-coercivity cards only.}\n",
                       audience="audience: {groups: [public]}\n")
    text = render_terminal(setup, _full_assessment(setup))
    assert text.index("Magnets") < text.index("Keep-out distances") < text.index("Findings")
    assert "ICNIRP" in text                                    # the source beside the 0.5 mT line
    assert "High-coercivity cards only." in text and "default 1 mT" in text   # site value and its reason
    assert "BLOCKING: resolve before work starts" in text
    assert text.rstrip().endswith("the site's rules win.")


class _Stand_in:
    """Installs a stand-in `planner.assess` module returning a prepared assessment."""

    def __init__(self, monkeypatch, build):
        module = types.ModuleType("planner.assess")
        module.assess = build
        monkeypatch.setitem(sys.modules, "planner.assess", module)


def _run(*args):
    from planner.cli import main
    return CliRunner().invoke(main, list(args))


@pytest.mark.parametrize("fail_on, code", [("blocking", 1), ("action", 1), ("note", 1), (None, 0)])
def test_fail_on_blocking_findings(monkeypatch, fail_on, code):
    _Stand_in(monkeypatch, _full_assessment)   # has a blocking finding (implant line in the seats)
    args = ["assess", str(SETUPS[0])] + (["--fail-on", fail_on] if fail_on else [])
    assert _run(*args).exit_code == code


@pytest.mark.parametrize("fail_on, code", [("blocking", 0), ("action", 1)])
def test_fail_on_counts_only_that_severity_or_worse(monkeypatch, fail_on, code):
    def only_actions(setup):
        a = assessment(magnets=[magnet(flux_index_kG2_mm2=1.0)], keep_out=[keep_out("implant_keep_out", 0.2)])
        a.findings = [f for f in evaluate(setup_from(), a, T)]
        assert {f.severity for f in a.findings} <= {"action", "note"}
        return a
    _Stand_in(monkeypatch, only_actions)
    assert _run("assess", str(SETUPS[0]), "--fail-on", fail_on).exit_code == code


def test_json_output(monkeypatch):
    _Stand_in(monkeypatch, _full_assessment)
    result = _run("assess", str(SETUPS[0]), "--json")
    assert result.exit_code == 0
    data = json.loads(result.output)
    assert data["findings"] and {"severity", "title", "figures", "sources", "deferral"} <= set(data["findings"][0])


def test_bad_setup_exits_2(tmp_path):
    bad = tmp_path / "bad.yaml"
    bad.write_text("title: x\nmagnets: []\nsite_rules:\n  thresholds:\n    implant_keep_out: {value: 5 mT}\n")
    result = _run("assess", str(bad))
    assert result.exit_code == 2
    assert "less strict than the default 0.5 mT" in result.output and "(line 5)" in result.output


@pytest.mark.parametrize("path", SETUPS, ids=lambda p: p.stem)
def test_example_setups_assess_without_rule_failures(path):
    from tests.conftest import assessed_example

    setup, a = assessed_example(path.stem)
    found = evaluate(setup, a, effective_thresholds(site_rules_of(setup)))
    assert not [f.id for f in found if f.id.endswith("could-not-run")]
    from reports.terminal import render_terminal
    assert "Findings" in render_terminal(setup, a)
