"""`benchplan assess SETUP [--json] [--fail-on SEVERITY]`: figures and findings in the terminal."""
from __future__ import annotations

import json
import sys
from pathlib import Path

import click

from hazards.findings import SEVERITIES, severity_rank
from planner.cli import EXIT_BLOCKING, announce_long_work, guarded, setup_argument
from planner.setup import load_setup


@click.command()
@setup_argument
@click.option("--json", "as_json", is_flag=True, help="Print the figures and findings as JSON (SI units in the keys).")
@click.option("--fail-on", type=click.Choice(list(reversed(SEVERITIES))), default=None,
              help="Exit with status 1 when a finding of this severity or a more pressing one exists "
                   "(blocking: resolve before work starts; action: precaution during the work; note).")
@guarded
def assess(setup_file: Path, as_json: bool, fail_on: str | None) -> None:
    """Compute the figures for SETUP and list the findings, most pressing first."""
    setup = load_setup(setup_file)
    _check_site_thresholds(setup, setup_file)
    from planner.assess import assess as assess_setup
    from reports.terminal import render_terminal

    announce_long_work(setup)
    assessment = assess_setup(setup)
    if as_json:
        click.echo(json.dumps(assessment.to_dict(), indent=2, allow_nan=False))
    else:
        click.echo(render_terminal(setup, assessment), nl=False)
    if fail_on is not None:
        floor = severity_rank(fail_on)
        if any(getattr(f, "severity", None) in SEVERITIES and severity_rank(f.severity) >= floor
               for f in assessment.findings):
            sys.exit(EXIT_BLOCKING)


def _check_site_thresholds(setup, setup_file: Path) -> None:
    """Refuse bad threshold overrides (unknown id, wrong unit, looser without a reason) as bad input,
    with the line of each in the setup file where it is known."""
    from hazards.thresholds import effective_thresholds
    from planner.setup import Problem, SetupError, line_of, site_rules_of

    try:
        effective_thresholds(site_rules_of(setup))
    except SetupError as error:
        problems = [Problem(p.path, p.message, p.line or line_of(setup, *p.path.split(".")[:4]))
                    for p in error.problems]
        raise SetupError(problems, str(setup_file)) from None


COMMANDS = [assess]
