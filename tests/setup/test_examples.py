"""Every example setup and the starter file validate, by the loader and by the JSON Schema.

The JSON Schema (`benchplan schema`, planner.setup.json_schema()) is generated from the same
declaration that validates; here the independent `jsonschema` package (Draft 2020-12 validator)
checks the example files against it, as an editor would.
"""
from __future__ import annotations

import json

import jsonschema
import pytest
import yaml
from click.testing import CliRunner

from planner import Setup, SetupError, load_setup, parse_setup
from planner.cli import main
from planner.setup import json_schema
from tests.conftest import NOT_SETUPS, SETUPS, example_setup_paths

EXAMPLES = example_setup_paths()


def _as_json(path_or_text) -> object:
    """YAML -> the JSON data an editor validates (dates become ISO text)."""
    text = path_or_text.read_text(encoding="utf-8") if hasattr(path_or_text, "read_text") else path_or_text
    return json.loads(json.dumps(yaml.safe_load(text), default=str))


@pytest.fixture(scope="module")
def validator() -> jsonschema.Draft202012Validator:
    schema = json_schema()
    jsonschema.Draft202012Validator.check_schema(schema)
    return jsonschema.Draft202012Validator(schema, format_checker=jsonschema.Draft202012Validator.FORMAT_CHECKER)


@pytest.fixture(scope="module")
def starter_text() -> str:
    result = CliRunner().invoke(main, ["new"])
    assert result.exit_code == 0, result.output
    return result.stdout


def test_there_are_example_setups_and_the_site_rules_file_is_not_one():
    assert len(EXAMPLES) >= 3
    assert all(path.name not in NOT_SETUPS for path in EXAMPLES)
    assert (SETUPS / "example-site-rules.yaml").exists()


@pytest.mark.parametrize("path", EXAMPLES, ids=[p.name for p in EXAMPLES])
def test_every_example_loads(path):
    setup = load_setup(path)
    assert isinstance(setup, Setup)
    assert setup.magnets


@pytest.mark.parametrize("path", EXAMPLES, ids=[p.name for p in EXAMPLES])
def test_every_example_validates_against_the_json_schema(path, validator):
    errors = [error.message for error in validator.iter_errors(_as_json(path))]
    assert errors == []


@pytest.mark.parametrize("path", sorted(SETUPS.glob("*.yaml")), ids=lambda p: p.name)
def test_every_example_file_says_it_is_an_invented_scenario(path):
    # ORIGINALITY.md rule 4: example setups are scenarios we invent, and say so in the file.
    head = path.read_text(encoding="utf-8")[:400].lower()
    assert "invented" in head


def test_the_site_rules_example_validates_against_the_site_rules_part_of_the_schema():
    schema = json_schema()
    rules_schema = {"$ref": "#/$defs/SiteRules", "$defs": schema["$defs"]}
    errors = list(jsonschema.Draft202012Validator(rules_schema).iter_errors(_as_json(SETUPS / "example-site-rules.yaml")))
    assert errors == []


def test_the_open_day_example_reads_its_site_rules_file():
    setup = load_setup(SETUPS / "open-day-induction-bench.yaml")
    assert setup.site_rules.name == "Example physics department demonstration rules"
    assert setup.site_rules.hand_force == pytest.approx(20.0)          # `20 N`
    assert setup.site_rules.finger_gap == pytest.approx(0.010)         # `10 mm`
    assert setup.site_rules.review_interval == pytest.approx(365.25 * 86400)  # 12 months = 1 Julian year


def test_the_starter_file_validates_both_ways(starter_text, validator):
    setup = parse_setup(starter_text)
    assert setup.magnets[0].id == "disc"
    assert list(validator.iter_errors(_as_json(starter_text))) == []


def test_the_starter_written_by_new_out_loads(tmp_path):
    target = tmp_path / "mine.yaml"
    result = CliRunner().invoke(main, ["new", "--out", str(target)])
    assert result.exit_code == 0
    load_setup(target)


def test_the_schema_command_prints_the_generated_schema():
    result = CliRunner().invoke(main, ["schema"])
    assert result.exit_code == 0
    assert json.loads(result.stdout) == json_schema()


@pytest.mark.parametrize("change", [
    lambda d: d["magnets"][0].update(height=25),                  # bare number
    lambda d: d["magnets"][0].update(heigth="1 mm"),              # unknown key
    lambda d: d["magnets"][0].update(shape="cone"),               # unknown shape
    lambda d: d["magnets"][0].pop("diameter"),                    # missing key for the shape
    lambda d: d.pop("title"),                                     # missing title
    lambda d: d["magnets"][0].update(magnetization="up"),         # not a direction
    lambda d: d.update(date="2027-02-30"),                        # not a date (format check)
    lambda d: d["audience"].update(groups=["aliens"]),            # not an audience group
], ids=["bare number", "unknown key", "unknown shape", "missing diameter", "missing title", "bad direction",
        "bad date", "bad audience"])
def test_the_schema_and_the_loader_both_refuse_typical_mistakes(change, validator):
    # Editors see the same rules as the loader: each mistake is refused by both.
    data = _as_json(SETUPS / "open-day-induction-bench.yaml")
    change(data)
    assert list(validator.iter_errors(data)), "the JSON Schema accepted it"
    with pytest.raises(SetupError):
        parse_setup(yaml.safe_dump(data, sort_keys=False), base_directory=SETUPS)
