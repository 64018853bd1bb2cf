"""The sign-off register: an append-only SQLite file of who signed which exact setup, and when.

Where it lives
    ``--register FILE`` if given; otherwise ``$BENCHPLAN_REGISTER`` if set; otherwise
    ``benchplan-register.sqlite3`` in the same folder as the setup file. One register may hold
    the sign-offs of many setups.

How it guards itself
    * Rows are only ever added. Triggers refuse UPDATE and DELETE through SQLite.
    * Each row stores the hash of the row before it and a hash of its own content (a hash chain),
      and rows are numbered 1, 2, 3... without gaps, so a row edited or deleted by other means
      (another tool, a hex editor, dropped triggers) is found by :func:`check_register`.
    * Writers take the write lock first (``BEGIN IMMEDIATE``), wait up to 30 s for one another
      (busy timeout) and use write-ahead logging, so concurrent signers lose nothing; every
      write is one transaction, so a crash mid-write leaves the register as it was before.

Rows store the canonical setup JSON, so a later status check can say which top-level parts of
the setup changed since it was signed.
"""
from __future__ import annotations

import datetime
import hashlib
import json
import os
import sqlite3
from dataclasses import asdict, dataclass
from pathlib import Path

DEFAULT_FILE_NAME = "benchplan-register.sqlite3"
ENVIRONMENT_VARIABLE = "BENCHPLAN_REGISTER"
STAGES = ("prepared", "reviewed", "approved")
BUSY_TIMEOUT_S = 30.0
GENESIS_HASH = "0" * 64
SCHEMA_VERSION = 1

_SCHEMA = """
CREATE TABLE IF NOT EXISTS register_info (key TEXT PRIMARY KEY, value TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS signoffs (
    number INTEGER PRIMARY KEY AUTOINCREMENT,
    signed_at TEXT NOT NULL,
    stage TEXT NOT NULL,
    name TEXT NOT NULL,
    role TEXT NOT NULL,
    note TEXT NOT NULL,
    setup_file TEXT NOT NULL,
    title TEXT NOT NULL,
    fingerprint TEXT NOT NULL,
    program_version TEXT NOT NULL,
    setup_json TEXT NOT NULL,
    previous_hash TEXT NOT NULL,
    row_hash TEXT NOT NULL
);
CREATE INDEX IF NOT EXISTS signoffs_by_fingerprint ON signoffs (fingerprint);
CREATE TRIGGER IF NOT EXISTS signoffs_no_update BEFORE UPDATE ON signoffs
    BEGIN SELECT RAISE(ABORT, 'sign-off rows cannot be changed'); END;
CREATE TRIGGER IF NOT EXISTS signoffs_no_delete BEFORE DELETE ON signoffs
    BEGIN SELECT RAISE(ABORT, 'sign-off rows cannot be deleted'); END;
"""
_TRIGGERS = {"signoffs_no_update", "signoffs_no_delete"}
_CONTENT_FIELDS = ("number", "signed_at", "stage", "name", "role", "note", "setup_file", "title",
                   "fingerprint", "program_version", "setup_json")


class RegisterError(Exception):
    """The register cannot be opened or written (not a SQLite file, no permission, locked too long)."""


@dataclass(frozen=True)
class SignOff:
    """One row of the register."""

    number: int
    signed_at: str          # ISO 8601 UTC, seconds, e.g. 2027-03-01T09:30:00+00:00
    stage: str              # prepared, reviewed or approved
    name: str
    role: str
    note: str
    setup_file: str         # the setup file's name (no folder), used to find its earlier sign-offs
    title: str
    fingerprint: str
    program_version: str
    setup_json: str
    previous_hash: str
    row_hash: str

    @property
    def signed_time(self) -> datetime.datetime:
        return datetime.datetime.fromisoformat(self.signed_at)

    def to_dict(self) -> dict:
        data = asdict(self)
        data.pop("setup_json")
        return data


def default_register_path(setup_path: str | Path) -> Path:
    """``$BENCHPLAN_REGISTER`` if set, else ``benchplan-register.sqlite3`` beside the setup file."""
    override = os.environ.get(ENVIRONMENT_VARIABLE)
    if override:
        return Path(override)
    return Path(setup_path).resolve().parent / DEFAULT_FILE_NAME


def row_hash(content: dict, previous_hash: str) -> str:
    """SHA-256 over the previous row's hash and this row's content fields (canonical JSON)."""
    payload = {field: content[field] for field in _CONTENT_FIELDS}
    payload["previous_hash"] = previous_hash
    text = json.dumps(payload, sort_keys=True, separators=(",", ":"), ensure_ascii=False)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def _connect(path: Path) -> sqlite3.Connection:
    try:
        connection = sqlite3.connect(str(path), timeout=BUSY_TIMEOUT_S, isolation_level=None)
        connection.execute(f"PRAGMA busy_timeout = {int(BUSY_TIMEOUT_S * 1000)}")
        mode = connection.execute("PRAGMA journal_mode = WAL").fetchone()
        connection.execute("PRAGMA synchronous = FULL")
    except sqlite3.DatabaseError as error:
        raise RegisterError(f"{path}: cannot open the sign-off register ({error})") from None
    if mode is None:
        raise RegisterError(f"{path}: cannot open the sign-off register")
    return connection


def _create(connection: sqlite3.Connection, path: Path) -> None:
    """Create the tables and triggers if absent, in one transaction."""
    try:
        connection.executescript("BEGIN IMMEDIATE;" + _SCHEMA
                                 + "INSERT OR IGNORE INTO register_info VALUES ('schema_version', '"
                                 + str(SCHEMA_VERSION) + "');COMMIT;")
    except sqlite3.DatabaseError as error:
        if connection.in_transaction:
            connection.execute("ROLLBACK")
        raise RegisterError(f"{path}: not a usable sign-off register ({error})") from None


def append_signoff(register_path: str | Path, *, stage: str, name: str, role: str, note: str,
                   setup_file: str, title: str, fingerprint: str, program_version: str,
                   setup_json: str, now: datetime.datetime | None = None) -> SignOff:
    """Add one sign-off row (creating the register if needed) and return it.

    The row is written in a single ``BEGIN IMMEDIATE`` transaction that reads the last row's
    hash and number, so rows from concurrent writers still form one unbroken chain.
    """
    if stage not in STAGES:
        raise ValueError(f"stage must be one of {', '.join(STAGES)}; got {stage!r}")
    path = Path(register_path)
    moment = (now or datetime.datetime.now(datetime.timezone.utc)).astimezone(datetime.timezone.utc)
    connection = _connect(path)
    try:
        _create(connection, path)
        connection.execute("BEGIN IMMEDIATE")
        try:
            last = connection.execute("SELECT number, row_hash FROM signoffs ORDER BY number DESC LIMIT 1").fetchone()
            used = connection.execute("SELECT seq FROM sqlite_sequence WHERE name = 'signoffs'").fetchone()
            number = max(last[0] if last else 0, used[0] if used else 0) + 1
            content = {"number": number, "signed_at": moment.replace(microsecond=0).isoformat(), "stage": stage,
                       "name": name, "role": role, "note": note, "setup_file": setup_file, "title": title,
                       "fingerprint": fingerprint, "program_version": program_version, "setup_json": setup_json}
            previous = last[1] if last else GENESIS_HASH
            content["previous_hash"] = previous
            content["row_hash"] = row_hash(content, previous)
            columns = ", ".join(content)
            marks = ", ".join("?" for _ in content)
            connection.execute(f"INSERT INTO signoffs ({columns}) VALUES ({marks})", tuple(content.values()))
            connection.execute("COMMIT")
        except BaseException:
            if connection.in_transaction:
                connection.execute("ROLLBACK")
            raise
        return SignOff(**content)
    except sqlite3.OperationalError as error:
        raise RegisterError(f"{path}: could not record the sign-off ({error})") from None
    finally:
        connection.close()


@dataclass
class RegisterContents:
    """Every row of a register and the problems found while checking its chain."""

    path: Path
    rows: list[SignOff]
    problems: list[str]
    exists: bool = True

    @property
    def damaged(self) -> bool:
        return bool(self.problems)

    def for_setup(self, setup_file: str, title: str) -> list[SignOff]:
        """Rows of one setup: same file name, or (for a renamed file) the same title; oldest first."""
        same_file = [row for row in self.rows if row.setup_file == setup_file]
        return same_file or [row for row in self.rows if row.title == title]


def read_register(register_path: str | Path) -> RegisterContents:
    """Read every row and check the chain; a missing file reads as an empty, undamaged register.

    Never creates the file and never raises for damage: damage is listed in ``problems``.
    """
    path = Path(register_path)
    if not path.exists():
        return RegisterContents(path, [], [], exists=False)
    try:
        connection = sqlite3.connect(f"file:{path}?mode=ro", uri=True, timeout=BUSY_TIMEOUT_S)
    except sqlite3.DatabaseError as error:
        return RegisterContents(path, [], [f"cannot be opened: {error}"])
    try:
        names = {row[0] for row in connection.execute("SELECT name FROM sqlite_master")}
        if "signoffs" not in names:
            return RegisterContents(path, [], ["has no sign-off table (not a benchplan register)"])
        fields = list(SignOff.__dataclass_fields__)
        raw = connection.execute(f"SELECT {', '.join(fields)} FROM signoffs ORDER BY number").fetchall()
        used = connection.execute("SELECT seq FROM sqlite_sequence WHERE name = 'signoffs'").fetchone()
        triggers = names & _TRIGGERS
    except sqlite3.DatabaseError as error:
        return RegisterContents(path, [], [f"cannot be read: {error}"])
    finally:
        connection.close()
    rows = [SignOff(*(str(v) if isinstance(v, bytes) else v for v in row)) for row in raw]
    return RegisterContents(path, rows, check_chain(rows, used[0] if used else 0, triggers))


def check_chain(rows: list[SignOff], highest_number_issued: int = 0,
                triggers: set[str] | frozenset[str] = frozenset(_TRIGGERS)) -> list[str]:
    """Problems with a register's rows: gaps, broken links, edited content, a missing last row."""
    problems = []
    previous = GENESIS_HASH
    for expected, row in enumerate(rows, start=1):
        if row.number != expected:
            problems.append(f"sign-off {expected} is missing (rows jump from {expected - 1} to {row.number})")
        content = {field: getattr(row, field) for field in _CONTENT_FIELDS}
        if row.previous_hash != previous:
            problems.append(f"sign-off {row.number} does not follow on from the row before it (a row was removed or changed)")
        if row_hash(content, row.previous_hash) != row.row_hash:
            problems.append(f"sign-off {row.number} was changed after it was recorded")
        previous = row.row_hash
    last_number = rows[-1].number if rows else 0
    if highest_number_issued > last_number:
        problems.append(f"the latest sign-off(s) after number {last_number} were removed "
                        f"({highest_number_issued} had been recorded)")
    missing = set(_TRIGGERS) - set(triggers)
    if missing:
        problems.append("the register's protection against changing rows was removed")
    return problems


# --- is the approval still good for this exact setup? ----------------------------------------

DEFAULT_REVIEW_INTERVAL_S = 365.25 * 86400.0   # 12 months when the site's rules give none
APPROVED, CHANGED, LAPSED, UNSIGNED, DAMAGED = "approved", "changed", "lapsed", "unsigned", "damaged"


@dataclass
class ApprovalStatus:
    """Where one setup stands against the register.

    ``state`` is one of:

    * ``approved`` - approved for exactly this setup, program version and thresholds, within the
      review interval;
    * ``changed`` - approved before, but the setup (or program version or threshold table) has
      changed since; ``changed_keys`` names the top-level parts of the setup that differ;
    * ``lapsed`` - approved for exactly this setup, but the review interval has passed;
    * ``unsigned`` - no approval recorded for this setup (it may have been prepared or reviewed);
    * ``damaged`` - the register fails its checks; nothing in it can be relied on.
    """

    state: str
    message: str
    changed_keys: list[str]
    approval: SignOff | None
    valid_until: datetime.datetime | None
    current_signoffs: list[SignOff]
    problems: list[str]
    review_interval_s: float
    interval_from_site: bool

    def to_dict(self) -> dict:
        return {"state": self.state, "message": self.message, "changed_keys": self.changed_keys,
                "approval": self.approval.to_dict() if self.approval else None,
                "valid_until": self.valid_until.isoformat() if self.valid_until else None,
                "current_signoffs": [row.to_dict() for row in self.current_signoffs],
                "problems": self.problems, "review_interval_s": self.review_interval_s,
                "interval_from_site": self.interval_from_site}


def _describe(row: SignOff) -> str:
    return f"{row.stage} by {row.name} ({row.role}) on {row.signed_at[:10]}"


def approval_status(contents: RegisterContents, *, setup_file: str, title: str, fingerprint: str,
                    setup_json: str, review_interval_s: float | None = None,
                    now: datetime.datetime | None = None) -> ApprovalStatus:
    """Decide the state of a setup from the register's rows (see :class:`ApprovalStatus`)."""
    from reports.fingerprint import top_level_changes

    now = (now or datetime.datetime.now(datetime.timezone.utc)).astimezone(datetime.timezone.utc)
    from_site = review_interval_s is not None
    interval = float(review_interval_s) if from_site else DEFAULT_REVIEW_INTERVAL_S
    rows = contents.for_setup(setup_file, title)
    current = [row for row in rows if row.fingerprint == fingerprint]

    def status(state, message, changed=(), approval=None, valid_until=None):
        return ApprovalStatus(state, message, list(changed), approval, valid_until, current,
                              list(contents.problems), interval, from_site)

    if contents.damaged:
        return status(DAMAGED, "the sign-off register is damaged: " + "; ".join(contents.problems))
    approvals = [row for row in current if row.stage == "approved"]
    if approvals:
        approval = approvals[-1]
        valid_until = approval.signed_time + datetime.timedelta(seconds=interval)
        if now <= valid_until:
            return status(APPROVED, f"approved for this exact setup: {_describe(approval)}; "
                          f"valid until {valid_until.date().isoformat()}", approval=approval, valid_until=valid_until)
        return status(LAPSED, f"the approval ({_describe(approval)}) lapsed on {valid_until.date().isoformat()}; "
                      "review the setup and sign again", approval=approval, valid_until=valid_until)
    earlier = [row for row in rows if row.stage == "approved"]
    if earlier:
        last = earlier[-1]
        changed = top_level_changes(last.setup_json, setup_json)
        what = (", ".join(changed) if changed
                else "nothing in the setup itself; the program version or the threshold table")
        return status(CHANGED, f"changed since it was approved ({_describe(last)}); changed: {what}",
                      changed=changed, approval=last)
    if current:
        done = "; ".join(_describe(row) for row in current)
        return status(UNSIGNED, f"not approved yet ({done})")
    where = "" if contents.exists else " (no register file yet)"
    return status(UNSIGNED, f"never signed{where}")
