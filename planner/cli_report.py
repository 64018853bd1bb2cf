"""`benchplan report`, `sign` and `status`: the PDF checklist and its sign-off register.

The register is ``--register FILE`` if given, else ``$BENCHPLAN_REGISTER``, else
``benchplan-register.sqlite3`` beside the setup file (see :mod:`reports.register`).
"""
from __future__ import annotations

import json
import os
import tempfile
from pathlib import Path

import click

from planner.cli import EXIT_BLOCKING, UserInputError, announce_long_work, guarded, setup_argument
from planner.setup import load_setup

register_option = click.option(
    "--register", "register_file", type=click.Path(dir_okay=False, path_type=Path),
    help="Sign-off register file (default: $BENCHPLAN_REGISTER, else benchplan-register.sqlite3 beside SETUP).")
MAX_TEXT = 200


def _register_path(setup_file: Path, register_file: Path | None) -> Path:
    from reports.register import default_register_path

    return register_file if register_file is not None else default_register_path(setup_file)


def _setup_identity(setup_file: Path, setup):
    """(file name, title, fingerprint, canonical JSON, review interval [s] or None) of a setup."""
    from reports.fingerprint import canonical_json, canonical_setup, fingerprint_of_canonical

    canonical = canonical_json(canonical_setup(setup))
    rules = setup.site_rules if not isinstance(setup.site_rules, (str, type(None))) else None
    interval = getattr(rules, "review_interval", None) if rules else None
    return setup_file.name, setup.title, fingerprint_of_canonical(canonical), canonical, interval


def _status(setup_file: Path, setup, register_file: Path | None):
    from reports.register import RegisterError, approval_status, read_register

    name, title, fingerprint, canonical, interval = _setup_identity(setup_file, setup)
    try:
        contents = read_register(_register_path(setup_file, register_file))
    except RegisterError as error:
        raise UserInputError(str(error)) from None
    status = approval_status(contents, setup_file=name, title=title, fingerprint=fingerprint,
                             setup_json=canonical, review_interval_s=interval)
    return status, fingerprint


def write_atomically(path: Path, data: bytes) -> None:
    """Write `data` to `path` through a temporary file in the same folder and a rename.

    Readers see either the old file or the complete new one, never half of it; on any error
    the temporary file is removed and the old file is left as it was.
    """
    folder = path.parent if str(path.parent) else Path(".")
    if not folder.is_dir():
        raise UserInputError(f"cannot write {path}: the folder {folder} does not exist")
    handle, temporary = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".part", dir=folder)
    try:
        with os.fdopen(handle, "wb") as stream:
            stream.write(data)
            stream.flush()
            os.fsync(stream.fileno())
        os.replace(temporary, path)
    except BaseException:
        try:
            os.unlink(temporary)
        except FileNotFoundError:
            pass
        raise


@click.command()
@setup_argument
@click.option("--out", type=click.Path(dir_okay=False, path_type=Path),
              help="Where to write the PDF (default: <setup name>-checklist.pdf beside SETUP).")
@register_option
@guarded
def report(setup_file: Path, out: Path | None, register_file: Path | None) -> None:
    """Write the pre-work checklist PDF for SETUP.

    Set SOURCE_DATE_EPOCH for byte-identical output from the same setup, program version and
    register entries.
    """
    from planner.assess import assess
    from reports.pdf import inputs_from_setup, render_pdf

    setup = load_setup(setup_file)
    status, fingerprint = _status(setup_file, setup, register_file)
    announce_long_work(setup)
    assessment = assess(setup)
    pdf = render_pdf(inputs_from_setup(setup, assessment, fingerprint, status))
    target = out if out is not None else setup_file.with_name(f"{setup_file.stem}-checklist.pdf")
    try:
        write_atomically(target, pdf)
    except OSError as error:
        raise UserInputError(f"cannot write {target}: {error.strerror or error}") from None
    click.echo(f"wrote {target} (setup fingerprint {fingerprint[:12]}; sign-off: {status.state})")


def _clean(value: str, option: str) -> str:
    text = " ".join((value or "").split())
    if not text:
        raise UserInputError(f"{option} must not be empty")
    if len(text) > MAX_TEXT:
        raise UserInputError(f"{option} is longer than {MAX_TEXT} characters")
    return text


@click.command()
@setup_argument
@click.option("--name", required=True, help="Full name of the person signing.")
@click.option("--role", required=True, help="Their role, e.g. 'Departmental safety officer'.")
@click.option("--stage", type=click.Choice(["prepared", "reviewed", "approved"]), default="approved",
              show_default=True, help="Which step this signature records.")
@click.option("--note", default="", help="A short remark kept with the sign-off.")
@register_option
@guarded
def sign(setup_file: Path, name: str, role: str, stage: str, note: str, register_file: Path | None) -> None:
    """Record a sign-off of SETUP, bound to its exact fingerprint."""
    from planner import __version__
    from reports.register import RegisterError, append_signoff, read_register

    name, role = _clean(name, "--name"), _clean(role, "--role")
    if len(note) > 2000:
        raise UserInputError("--note is longer than 2000 characters")
    setup = load_setup(setup_file)
    file_name, title, fingerprint, canonical, _ = _setup_identity(setup_file, setup)
    path = _register_path(setup_file, register_file)
    contents = read_register(path)
    if contents.damaged:
        raise UserInputError(f"{path}: the sign-off register is damaged ({'; '.join(contents.problems)}); "
                             "nothing was recorded. Keep it as evidence and ask the site's competent person.")
    try:
        row = append_signoff(path, stage=stage, name=name, role=role, note=note.strip(), setup_file=file_name,
                             title=title, fingerprint=fingerprint, program_version=__version__,
                             setup_json=canonical)
    except RegisterError as error:
        raise UserInputError(str(error)) from None
    click.echo(f"recorded sign-off {row.number} in {path}: {stage} by {name} ({role}) "
               f"for setup fingerprint {fingerprint[:12]}")


@click.command()
@setup_argument
@register_option
@click.option("--json", "as_json", is_flag=True, help="Print the state as JSON.")
@click.option("--strict", is_flag=True, help="Exit with 1 unless the setup is approved and within its review interval.")
@guarded
def status(setup_file: Path, register_file: Path | None, as_json: bool, strict: bool) -> None:
    """Say whether SETUP's sign-off still holds: approved, changed, lapsed, unsigned or damaged."""
    setup = load_setup(setup_file)
    state, fingerprint = _status(setup_file, setup, register_file)
    if as_json:
        click.echo(json.dumps({"fingerprint": fingerprint, **state.to_dict()}, indent=2, ensure_ascii=False))
    else:
        click.echo(f"{state.state}: {state.message}")
        click.echo(f"setup fingerprint {fingerprint[:12]}")
        if not state.interval_from_site and state.state in ("approved", "lapsed"):
            click.echo("review interval: 12 months (the default; the site rules give none)")
    if strict and state.state != "approved":
        raise SystemExit(EXIT_BLOCKING)


COMMANDS = [report, sign, status]
