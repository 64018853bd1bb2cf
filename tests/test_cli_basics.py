"""The command line's basic verbs: --version, check, grades, schema, new, and the exit codes.

DESIGN.md fixes the exit codes: 0 done; 2 bad input or usage; 3 internal error, with the
traceback only under --debug.
"""
from __future__ import annotations

import json
import subprocess
import sys
from importlib import metadata

import jsonschema
import pytest
import yaml
from click.testing import CliRunner

import planner
from planner.cli import main
from tests.conftest import SETUPS, example_setup_paths


@pytest.fixture
def run():
    def invoke(*arguments):
        return CliRunner().invoke(main, list(arguments))
    return invoke


def test_version_is_the_installed_package_version(run):
    result = run("--version")
    assert result.exit_code == 0
    # The installed distribution's metadata is the independent source of the version number.
    assert result.stdout.strip() == f"benchplan, version {metadata.version('benchplan')}"
    assert metadata.version("benchplan") == planner.__version__


def test_python_dash_m_planner_runs_the_same_command_line():
    run = subprocess.run([sys.executable, "-m", "planner", "--version"], capture_output=True, text=True, timeout=60)
    assert run.returncode == 0 and run.stdout.strip() == f"benchplan, version {planner.__version__}"


def test_help_lists_the_verbs(run):
    result = run("--help")
    assert result.exit_code == 0
    for verb in ("check", "grades", "schema", "new"):
        assert verb in result.stdout


@pytest.mark.parametrize("path", example_setup_paths(), ids=lambda p: p.name)
def test_check_on_an_example_exits_0_and_names_every_magnet(path, run):
    result = run("check", str(path))
    assert result.exit_code == 0, result.output
    assert "valid" in result.stdout
    # The magnet ids are read from the YAML directly, not through the loader under test.
    magnet_ids = [magnet["id"] for magnet in yaml.safe_load(path.read_text(encoding="utf-8"))["magnets"]]
    for magnet_id in magnet_ids:
        assert f"{magnet_id}:" in result.stdout or f"{magnet_id} x" in result.stdout
    assert result.stderr == ""


def test_check_reports_the_numbers_it_read(run):
    # open-day: big-disc is a 50 x 25 mm N42 cylinder. Mass = rho pi r^2 h with the trade density of
    # sintered NdFeB, 7500 kg/m^3 (standards.md / trade tables): 7500 * pi * 0.025^2 * 0.025 = 0.368 kg.
    result = run("check", str(SETUPS / "open-day-induction-bench.yaml"))
    line = next(line for line in result.stdout.splitlines() if line.strip().startswith("big-disc:"))
    assert "50 mm dia. x 25 mm" in line and "N42" in line and "368 g" in line
    assert "Br 1.32 T" in line  # the top of N42's 1.28-1.32 T trade range (standards.md)


def test_check_without_a_file_is_a_usage_error(run):
    result = run("check")
    assert result.exit_code == 2 and "Traceback" not in result.output


def test_an_unknown_verb_is_a_usage_error(run):
    result = run("frobnicate")
    assert result.exit_code == 2 and "Traceback" not in result.output


# --- grades ----------------------------------------------------------------------------------

def test_grades_lists_n42_and_smco5_with_their_sources(run):
    result = run("grades")
    assert result.exit_code == 0
    magnet_section = result.stdout.split("conductors (20 degC)")[0]
    lines = magnet_section.splitlines()
    rows = {line.split()[0]: line for line in lines if line.startswith("  ") and not line.strip().startswith("[")}
    sources = {line.strip()[1:].split("]")[0]: line.split("]", 1)[1].strip() for line in lines
               if line.strip().startswith("[")}
    assert "N42" in rows and "SmCo5" in rows
    # N42 1.28-1.32 T, SmCo5 0.8-1.0 T: standards.md "Permanent-magnet materials".
    assert "1.28-1.32" in rows["N42"] and "0.80-1.00" in rows["SmCo5"]
    for name in ("N42", "SmCo5"):
        assert sources[rows[name].split()[-1]]  # the row's source is printed below the table
    assert "GB/T 13560" in sources[rows["N42"].split()[-1]]  # the suffix scheme's standard
    assert "IEC 60028" in result.stdout


def test_grades_json_parses_and_every_row_points_to_a_source(run):
    result = run("grades", "--json")
    assert result.exit_code == 0
    tables = json.loads(result.stdout)
    grades = tables["magnet grades"]
    names = [row[0] for row in grades["rows"]]
    assert "N42" in names and "SmCo5" in names
    for table in tables.values():
        source_column = table["columns"].index("source")
        for row in table["rows"]:
            assert len(row) == len(table["columns"])
            assert table["sources"][row[source_column]].strip()
    copper = next(row for row in tables["conductors (20 degC)"]["rows"] if row[0] == "copper")
    assert float(copper[1]) == pytest.approx(58.0)  # 100 % IACS = 58.0 MS/m (IEC 60028)


# --- schema ----------------------------------------------------------------------------------

def test_schema_is_valid_json_and_a_valid_draft_2020_12_schema(run):
    result = run("schema")
    assert result.exit_code == 0
    schema = json.loads(result.stdout)
    assert schema["$schema"] == "https://json-schema.org/draft/2020-12/schema"
    jsonschema.Draft202012Validator.check_schema(schema)  # raises SchemaError if not
    assert {"title", "magnets"} <= set(schema["required"])


# --- new -------------------------------------------------------------------------------------

def test_new_prints_a_starter_file(run):
    result = run("new")
    assert result.exit_code == 0
    assert yaml.safe_load(result.stdout)["title"]


def test_new_out_writes_a_file_and_refuses_to_overwrite_without_force(run, tmp_path):
    target = tmp_path / "my-bench.yaml"
    first = run("new", "--out", str(target))
    assert first.exit_code == 0 and target.exists()
    assert str(target) in first.stdout
    target.write_text("title: my own work\n", encoding="utf-8")
    refused = run("new", "--out", str(target))
    assert refused.exit_code == 2
    assert "already exists" in refused.stderr and "--force" in refused.stderr
    assert "Traceback" not in refused.output
    assert target.read_text(encoding="utf-8") == "title: my own work\n"  # untouched
    forced = run("new", "--out", str(target), "--force")
    assert forced.exit_code == 0
    assert target.read_text(encoding="utf-8") == run("new").stdout  # the starter again


# --- internal errors -------------------------------------------------------------------------

def _break_describe(monkeypatch):
    import planner.summary

    def broken(setup):
        raise RuntimeError("deliberate failure for the test")
    monkeypatch.setattr(planner.summary, "describe_setup", broken)


def test_an_internal_error_exits_3_with_one_line_and_no_traceback(run, monkeypatch):
    _break_describe(monkeypatch)
    result = run("check", str(SETUPS / "open-day-induction-bench.yaml"))
    assert result.exit_code == 3
    assert "Traceback" not in result.output
    lines = result.stderr.strip().splitlines()
    assert len(lines) == 1
    assert "internal error" in lines[0] and "deliberate failure for the test" in lines[0] and "--debug" in lines[0]


def test_debug_shows_the_traceback_of_an_internal_error(run, monkeypatch):
    _break_describe(monkeypatch)
    result = run("--debug", "check", str(SETUPS / "open-day-induction-bench.yaml"))
    assert result.exit_code == 3
    assert "Traceback (most recent call last)" in result.stderr
    assert "RuntimeError: deliberate failure for the test" in result.stderr


def test_an_internal_error_in_grades_is_caught_too(run, monkeypatch):
    import planner.summary

    monkeypatch.setattr(planner.summary, "material_tables", lambda: 1 / 0)
    result = run("grades")
    assert result.exit_code == 3 and "ZeroDivisionError" in result.stderr and "Traceback" not in result.output


def test_a_setup_with_many_magnets_is_announced_before_the_long_work(run, tmp_path):
    # 20 magnets and up: keep-out distances take seconds (benchmarks/zones.py), so the
    # assess and report commands say so on stderr first; the examples (at most 12) stay quiet
    from planner.cli import MANY_MAGNETS, long_work_notice
    from planner.setup import load_setup
    from tests.hazards import setup_from

    def discs(count):
        return "".join(f"  - {{id: m{k}, shape: cylinder, diameter: 5 mm, height: 2 mm, grade: N42, "
                       f"at: [{100 * k} mm, 0 mm, 1 mm], magnetization: +z}}\n" for k in range(count))
    notice = long_work_notice(setup_from(magnets=discs(MANY_MAGNETS)))
    assert notice is not None and f"{MANY_MAGNETS} magnets" in notice
    assert long_work_notice(setup_from(magnets=discs(MANY_MAGNETS - 1))) is None
    assert all(long_work_notice(load_setup(path)) is None for path in example_setup_paths())
    # and assess prints it, on stderr, before its figures
    path = tmp_path / "many.yaml"
    path.write_text("title: many discs\nmagnets:\n" + discs(MANY_MAGNETS))
    result = run("assess", str(path))
    assert result.exit_code in (0, 1) and notice in result.stderr and notice not in result.stdout
