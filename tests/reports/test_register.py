"""The sign-off register: hash chain, tamper detection, concurrent writers, a killed writer,
and the approval states.

Hashes are re-computed here with hashlib from the documented row layout (an independent
computation); dates are checked against datetime arithmetic.
"""
from __future__ import annotations

import datetime
import hashlib
import json
import multiprocessing
import os
import signal
import sqlite3
import time

import pytest

from reports.register import (DEFAULT_REVIEW_INTERVAL_S, GENESIS_HASH, RegisterError, append_signoff,
                              approval_status, read_register)

UTC = datetime.timezone.utc
T0 = datetime.datetime(2027, 1, 10, 9, 0, tzinfo=UTC)


def _sign(path, stage="approved", name="Ελένη <b>&", fingerprint="a" * 64, setup_json='{"title":"x"}',
          now=T0, setup_file="bench.yaml", title="Bench"):
    return append_signoff(path, stage=stage, name=name, role="Safety officer", note="", setup_file=setup_file,
                          title=title, fingerprint=fingerprint, program_version="0.1.0", setup_json=setup_json,
                          now=now)


def _independent_hash(row: dict) -> str:
    fields = ("number", "signed_at", "stage", "name", "role", "note", "setup_file", "title", "fingerprint",
              "program_version", "setup_json", "previous_hash")
    text = json.dumps({f: row[f] for f in fields}, sort_keys=True, separators=(",", ":"), ensure_ascii=False)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def _raw_rows(path):
    connection = sqlite3.connect(path)
    connection.row_factory = sqlite3.Row
    rows = [dict(r) for r in connection.execute("SELECT * FROM signoffs ORDER BY number")]
    connection.close()
    return rows


def _tamper(path, statement, parameters=()):
    """Change the file behind the register's back (as another tool would)."""
    connection = sqlite3.connect(path)
    connection.execute("DROP TRIGGER IF EXISTS signoffs_no_update")
    connection.execute("DROP TRIGGER IF EXISTS signoffs_no_delete")
    connection.execute(statement, parameters)
    connection.commit()
    connection.close()


def test_rows_form_a_hash_chain_that_an_independent_computation_confirms(tmp_path):
    path = tmp_path / "r.sqlite3"
    for k in range(3):
        _sign(path, now=T0 + datetime.timedelta(hours=k))
    rows = _raw_rows(path)
    assert [r["number"] for r in rows] == [1, 2, 3]
    previous = GENESIS_HASH
    for row in rows:
        assert row["previous_hash"] == previous
        assert row["row_hash"] == _independent_hash(row)
        previous = row["row_hash"]
    contents = read_register(path)
    assert contents.problems == [] and len(contents.rows) == 3
    assert contents.rows[0].name == "Ελένη <b>&"


def test_sqlite_itself_refuses_to_change_or_delete_rows(tmp_path):
    path = tmp_path / "r.sqlite3"
    _sign(path)
    connection = sqlite3.connect(path)
    with pytest.raises(sqlite3.DatabaseError, match="cannot be changed"):
        connection.execute("UPDATE signoffs SET name = 'someone else'")
    with pytest.raises(sqlite3.DatabaseError, match="cannot be deleted"):
        connection.execute("DELETE FROM signoffs")
    connection.close()


@pytest.mark.parametrize("statement, expected", [
    ("UPDATE signoffs SET name = 'someone else' WHERE number = 2", "sign-off 2 was changed"),
    ("UPDATE signoffs SET fingerprint = 'b' WHERE number = 1", "sign-off 1 was changed"),
    ("DELETE FROM signoffs WHERE number = 2", "sign-off 2 is missing"),
    ("DELETE FROM signoffs WHERE number = 3", "removed"),
    ("DELETE FROM signoffs WHERE number = 1", "sign-off 1 is missing"),
])
def test_an_edited_or_deleted_row_is_detected(tmp_path, statement, expected):
    path = tmp_path / "r.sqlite3"
    for k in range(3):
        _sign(path, name=f"person {k}")
    _tamper(path, statement)
    problems = read_register(path).problems
    assert any(expected in p for p in problems), problems
    assert any("protection" in p for p in problems)     # the dropped triggers are noticed too


def test_a_row_rewritten_with_a_recomputed_own_hash_still_breaks_the_next_link(tmp_path):
    path = tmp_path / "r.sqlite3"
    for k in range(3):
        _sign(path, name=f"person {k}")
    row = _raw_rows(path)[1]
    row["name"] = "forger"
    _tamper(path, "UPDATE signoffs SET name = ?, row_hash = ? WHERE number = 2", ("forger", _independent_hash(row)))
    problems = read_register(path).problems
    assert any("sign-off 3 does not follow on" in p for p in problems), problems


def test_damaged_register_gives_the_damaged_state_and_not_a_file_is_reported(tmp_path):
    path = tmp_path / "r.sqlite3"
    _sign(path)
    _tamper(path, "UPDATE signoffs SET role = 'x'")
    status = approval_status(read_register(path), setup_file="bench.yaml", title="Bench", fingerprint="a" * 64,
                             setup_json='{"title":"x"}', now=T0)
    assert status.state == "damaged"
    junk = tmp_path / "junk.sqlite3"
    junk.write_bytes(b"this is not a database" * 100)
    assert read_register(junk).damaged
    with pytest.raises(RegisterError):
        _sign(junk)


def _sign_many(path: str, writer: int, count: int) -> None:
    for k in range(count):
        _sign(path, name=f"writer {writer} row {k}", now=datetime.datetime.now(UTC))


def test_four_processes_signing_25_times_each_leave_100_rows_and_a_valid_chain(tmp_path):
    path = str(tmp_path / "r.sqlite3")
    _sign(path)                      # create the file first, as the first `benchplan sign` would
    context = multiprocessing.get_context("spawn")
    workers = [context.Process(target=_sign_many, args=(path, w, 25)) for w in range(4)]
    for worker in workers:
        worker.start()
    for worker in workers:
        worker.join(120)
        assert worker.exitcode == 0
    contents = read_register(path)
    assert contents.problems == []
    assert len(contents.rows) == 101
    assert [r.number for r in contents.rows] == list(range(1, 102))
    names = {r.name for r in contents.rows}
    assert all(f"writer {w} row {k}" in names for w in range(4) for k in range(25))


def _sign_forever(path: str) -> None:
    k = 0
    while True:
        _sign(path, name=f"row {k}", now=datetime.datetime.now(UTC))
        k += 1


def test_a_writer_killed_mid_write_leaves_a_readable_valid_register(tmp_path):
    path = str(tmp_path / "r.sqlite3")
    _sign(path)
    context = multiprocessing.get_context("spawn")
    for delay in (0.35, 0.5, 0.65):   # kill at different moments of the write loop
        before = len(read_register(path).rows)
        writer = context.Process(target=_sign_forever, args=(path,))
        writer.start()
        deadline = time.monotonic() + 60
        while len(read_register(path).rows) < before + 3 and time.monotonic() < deadline:
            time.sleep(0.02)
        time.sleep(delay * 0.1)
        os.kill(writer.pid, signal.SIGKILL)
        writer.join(10)
        contents = read_register(path)
        assert contents.problems == []
        assert len(contents.rows) >= before + 3
    after = _sign(path, name="after the crashes")
    contents = read_register(path)
    assert contents.problems == [] and contents.rows[-1].number == after.number


def _status(path, fingerprint="a" * 64, setup_json='{"title":"x"}', now=T0, interval=None):
    return approval_status(read_register(path), setup_file="bench.yaml", title="Bench", fingerprint=fingerprint,
                           setup_json=setup_json, review_interval_s=interval, now=now)


def test_states_unsigned_approved_changed_lapsed(tmp_path):
    path = tmp_path / "r.sqlite3"
    assert _status(path).state == "unsigned" and not path.exists()      # reading never creates the file
    _sign(path, stage="prepared")
    status = _status(path)
    assert status.state == "unsigned" and "prepared by" in status.message
    _sign(path, stage="approved", setup_json='{"title":"x","zones":[]}')
    approved = _status(path, setup_json='{"title":"x","zones":[]}')
    assert approved.state == "approved"
    # default interval: 12 months of 365.25/12 days each = 365.25 days (pint's month)
    assert DEFAULT_REVIEW_INTERVAL_S == 365.25 * 86400
    assert approved.valid_until == T0 + datetime.timedelta(days=365.25)
    assert _status(path, now=T0 + datetime.timedelta(days=365)).state == "approved"
    assert _status(path, now=T0 + datetime.timedelta(days=366)).state == "lapsed"
    # the site's own interval wins: 30 days
    assert _status(path, interval=30 * 86400, now=T0 + datetime.timedelta(days=31)).state == "lapsed"
    changed = _status(path, fingerprint="c" * 64, setup_json='{"title":"y","zones":[],"coils":[]}')
    assert changed.state == "changed" and changed.changed_keys == ["coils", "title"]
    same_text = _status(path, fingerprint="d" * 64, setup_json='{"title":"x","zones":[]}')
    assert same_text.state == "changed" and "program version" in same_text.message


def test_rows_of_other_setups_do_not_count(tmp_path):
    path = tmp_path / "r.sqlite3"
    _sign(path, setup_file="other.yaml", title="Other")
    assert _status(path).state == "unsigned"


def _die_inside_a_transaction(path: str, ready) -> None:
    """Take the write lock, add a half-made row, then wait to be killed before committing."""
    connection = sqlite3.connect(path, isolation_level=None)
    connection.execute("BEGIN IMMEDIATE")
    connection.execute("INSERT INTO signoffs (signed_at, stage, name, role, note, setup_file, title, fingerprint, "
                       "program_version, setup_json, previous_hash, row_hash) "
                       "VALUES ('', 'approved', 'half', '', '', '', '', '', '', '', '', '')")
    ready.set()
    time.sleep(60)


def test_a_writer_killed_inside_its_transaction_leaves_no_trace_and_no_lock(tmp_path):
    path = str(tmp_path / "r.sqlite3")
    _sign(path)
    context = multiprocessing.get_context("spawn")
    ready = context.Event()
    writer = context.Process(target=_die_inside_a_transaction, args=(path, ready))
    writer.start()
    assert ready.wait(60)
    os.kill(writer.pid, signal.SIGKILL)
    writer.join(10)
    contents = read_register(path)
    assert contents.problems == [] and [r.name for r in contents.rows] == ["Ελένη <b>&"]
    row = _sign(path, name="next signer")          # the dead writer's lock is gone
    assert row.number == 2 and read_register(path).problems == []
