"""Shared test helpers: where the example setups live."""
from __future__ import annotations

import functools
from pathlib import Path

REPOSITORY = Path(__file__).resolve().parent.parent
SETUPS = REPOSITORY / "setups"
#: Files in setups/ that are not setups (a site-rules file read by an example).
NOT_SETUPS = {"example-site-rules.yaml"}


def example_setup_paths() -> list[Path]:
    """Every example setup file (site-rules files excluded)."""
    return sorted(p for p in SETUPS.glob("*.yaml") if p.name not in NOT_SETUPS)


@functools.lru_cache(maxsize=None)
def assessed_example(name: str):
    """(setup, assessment) of the example setup ``name`` (file stem), computed once per test run.

    The examples are assessed by several test files; the assessment takes seconds, so it is shared.
    """
    from planner import assess, load_setup

    setup = load_setup(SETUPS / f"{name}.yaml")
    return setup, assess(setup)
