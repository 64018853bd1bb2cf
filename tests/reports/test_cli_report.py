"""`benchplan report`, `sign` and `status` end to end: files written, states, exit codes.

The real ``planner.assess`` is used (each distinct setup assessed once per test, to keep the
file fast); where it is absent, a stand-in returning an invented assessment is installed.
"""
from __future__ import annotations

import importlib
import io
import sys
import types
from pathlib import Path

import pypdf
import pytest
from click.testing import CliRunner

from planner.cli import main
from planner.setup import load_setup
from reports.fingerprint import fingerprint

SETUP = """\
# An invented bench for the report command's tests.
title: Report command bench
site: Room 4
date: 2027-06-01
audience: {groups: [staff, students], youngest_age: 16, implant_wearers: may_be_present}
magnets:
  - {id: disc, shape: cylinder, diameter: 20 mm, height: 10 mm, grade: N42,
     at: [0 mm, 0 mm, 5 mm], magnetization: +z}
site_rules:
  review_interval: 6 months
"""


def _real_assess_available() -> bool:
    try:
        importlib.import_module("planner.assess")
    except ModuleNotFoundError:
        return False
    return True


@pytest.fixture
def assess_function(monkeypatch):
    """The assess function the commands will call (the real one when it exists)."""
    if _real_assess_available():
        module = importlib.import_module("planner.assess")
        real, cache = module.assess, {}

        def remembered(setup):      # the real assessment, computed once per distinct setup
            from reports.fingerprint import canonical_json, canonical_setup

            key = canonical_json(canonical_setup(setup))
            if key not in cache:
                cache[key] = real(setup)
            return cache[key]

        monkeypatch.setattr(module, "assess", remembered)
        return remembered
    from tests.reports.test_pdf import sample_assessment

    def stand_in(setup):
        return sample_assessment(setup.title)

    module = types.ModuleType("planner.assess")
    module.assess = stand_in
    monkeypatch.setitem(sys.modules, "planner.assess", module)
    return stand_in


@pytest.fixture
def bench(tmp_path, monkeypatch, assess_function) -> Path:
    monkeypatch.delenv("BENCHPLAN_REGISTER", raising=False)
    monkeypatch.setenv("SOURCE_DATE_EPOCH", "1800000000")
    path = tmp_path / "bench.yaml"
    path.write_text(SETUP, encoding="utf-8")
    return path


def run(*args):
    result = CliRunner().invoke(main, [str(a) for a in args], catch_exceptions=False)
    return result.exit_code, result.output


def text_of(pdf: Path) -> str:
    return " ".join(" ".join(page.extract_text().split()) for page in pypdf.PdfReader(io.BytesIO(pdf.read_bytes())).pages)


def test_report_writes_the_pdf_beside_the_setup_with_fingerprint_and_findings(bench, assess_function):
    code, output = run("report", bench)
    assert code == 0, output
    pdf = bench.with_name("bench-checklist.pdf")
    assert pdf.is_file() and str(pdf) in output
    text = text_of(pdf)
    setup = load_setup(bench)
    assert fingerprint(setup) in text
    for finding in assess_function(setup).findings:   # ids between backticks print without the backticks
        assert " ".join(finding.title.replace("`", "").split()) in text
    assert not list(bench.parent.glob("*.part"))


def test_same_setup_and_epoch_give_identical_pdf_bytes(bench, tmp_path):
    assert run("report", bench, "--out", tmp_path / "one.pdf")[0] == 0
    assert run("report", bench, "--out", tmp_path / "two.pdf")[0] == 0
    assert (tmp_path / "one.pdf").read_bytes() == (tmp_path / "two.pdf").read_bytes()


def test_sign_status_and_the_report_follow_the_register(bench, tmp_path):
    register = tmp_path / "signoffs.sqlite3"
    code, output = run("status", bench, "--register", register)
    assert code == 0 and output.startswith("unsigned: never signed")
    assert run("status", bench, "--register", register, "--strict")[0] == 1
    assert run("sign", bench, "--name", "Ελένη Łódź", "--role", "Teaching lab manager", "--stage", "prepared",
               "--register", register)[0] == 0
    code, output = run("sign", bench, "--name", "東京 <b>&", "--role", "Safety officer", "--register", register)
    assert code == 0 and "approved by 東京 <b>&" in output
    code, output = run("status", bench, "--register", register, "--strict")
    assert code == 0 and output.startswith("approved:")
    assert run("report", bench, "--out", tmp_path / "signed.pdf", "--register", register)[0] == 0
    text = text_of(tmp_path / "signed.pdf")
    for expected in ("Ελένη Łódź", "Teaching lab manager", "東京 <b>&", "Safety officer", "6 months after approval"):
        assert expected in text
    bench.write_text(SETUP.replace("height: 10 mm", "height: 12 mm"), encoding="utf-8")
    code, output = run("status", bench, "--register", register)
    assert code == 0 and output.startswith("changed:") and "changed: magnets" in output
    assert run("status", bench, "--register", register, "--strict")[0] == 1


def test_default_register_sits_beside_the_setup_or_where_the_environment_says(bench, tmp_path, monkeypatch):
    assert run("sign", bench, "--name", "A", "--role", "B")[0] == 0
    assert (bench.parent / "benchplan-register.sqlite3").is_file()
    elsewhere = tmp_path / "elsewhere.sqlite3"
    monkeypatch.setenv("BENCHPLAN_REGISTER", str(elsewhere))
    assert run("status", bench)[1].startswith("unsigned")
    assert run("sign", bench, "--name", "A", "--role", "B")[0] == 0 and elsewhere.is_file()


def test_status_json_names_the_state_and_changed_keys(bench, tmp_path):
    import json

    register = tmp_path / "r.sqlite3"
    run("sign", bench, "--name", "A", "--role", "B", "--register", register)
    bench.write_text(SETUP.replace("Room 4", "Room 5"), encoding="utf-8")
    code, output = run("status", bench, "--register", register, "--json")
    data = json.loads(output)
    assert code == 0 and data["state"] == "changed" and data["changed_keys"] == ["site"]


def test_a_damaged_register_is_reported_and_refuses_new_sign_offs(bench, tmp_path):
    import sqlite3

    register = tmp_path / "r.sqlite3"
    run("sign", bench, "--name", "A", "--role", "B", "--register", register)
    connection = sqlite3.connect(register)
    connection.execute("DROP TRIGGER signoffs_no_update")
    connection.execute("UPDATE signoffs SET name = 'C'")
    connection.commit()
    connection.close()
    code, output = run("status", bench, "--register", register)
    assert code == 0 and output.startswith("damaged:")
    code, output = run("sign", bench, "--name", "D", "--role", "E", "--register", register)
    assert code == 2 and "damaged" in output


@pytest.mark.parametrize("arguments, message", [
    (["report", "{missing}"], "missing.yaml"),
    (["report", "{bench}", "--out", "{tmp}/no/such/folder/x.pdf"], "does not exist"),
    (["sign", "{bench}", "--name", "  ", "--role", "B"], "--name must not be empty"),
    (["sign", "{bench}", "--name", "A", "--role", "B", "--stage", "finished"], "finished"),
    (["status", "{bench}", "--register", "{tmp}"], ""),
])
def test_bad_input_exits_with_2_and_a_message(bench, tmp_path, arguments, message):
    values = {"bench": bench, "missing": tmp_path / "missing.yaml", "tmp": tmp_path}
    code, output = run(*[a.format(**values) for a in arguments])
    assert code == 2, output
    assert message in output


def test_a_failed_render_or_write_leaves_the_old_pdf_and_no_partial_file(bench, tmp_path, monkeypatch):
    target = tmp_path / "kept.pdf"
    target.write_bytes(b"old contents")
    import reports.pdf

    def broken(inputs):
        raise RuntimeError("renderer broke")

    with monkeypatch.context() as patch:
        patch.setattr(reports.pdf, "render_pdf", broken)
        code, output = run("report", bench, "--out", target)
    assert code == 3 and "internal error" in output

    def no_disk(descriptor):
        raise OSError(28, "No space left on device")

    with monkeypatch.context() as patch:
        patch.setattr("os.fsync", no_disk)
        code, output = run("report", bench, "--out", target)
    assert code == 2 and "No space left on device" in output
    assert target.read_bytes() == b"old contents"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["bench.yaml", "kept.pdf"]
