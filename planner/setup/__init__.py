"""Setup files: YAML -> frozen, validated models with the YAML path and line in every message.

>>> s = parse_setup('''
... title: One disc
... magnets:
...   - {id: disc, shape: cylinder, diameter: 20 mm, height: 10 mm, grade: N42,
...      at: [0 mm, 0 mm, 5 mm], magnetization: +z}
... ''')
>>> s.magnets[0].diameter
0.02
"""
from __future__ import annotations

from pathlib import Path

from pydantic import ValidationError

from planner.setup import model
from planner.setup.checks import all_problems, grade_problems_of_left_out
from planner.setup.loading import (LineIndex, Problem, SetupError, problems_from_validation, read_document,
                                   read_file_text)
from planner.setup.model import Setup, SiteRules

__all__ = ["Setup", "SetupError", "Problem", "parse_setup", "load_setup", "json_schema", "site_rules_of"]


def parse_setup(text: str, base_directory: str | Path | None = None, source: str | None = None) -> Setup:
    """Validate setup YAML text.

    Parameters
    ----------
    text : str
        The YAML document.
    base_directory : path, optional
        Where a `site_rules` path is resolved from (default: the current directory).
    source : str, optional
        Name used in messages (normally the file path).

    Raises
    ------
    SetupError
        Listing every problem found, each with its key path and line.
    """
    if not isinstance(text, str):
        raise SetupError([Problem("", f"must be YAML text; got {type(text).__name__}")], source)
    try:
        data, index = read_document(text)
    except SetupError as error:
        raise SetupError(error.problems, source) from None
    try:
        setup = Setup.model_validate(data)
    except ValidationError as error:
        problems = problems_from_validation(error, data, index, Setup)
        raise SetupError(problems + _problems_of_the_rest(data, error, index), source) from None
    problems = all_problems(setup, index)
    site_rules, site_problems = _resolve_site_rules(setup, Path(base_directory or "."), index)
    problems += site_problems
    if problems:
        raise SetupError(problems, source)
    if site_rules is not setup.site_rules:
        setup = setup.model_copy(update={"site_rules": site_rules})
    setup._lines = index
    return setup


_GROUPS = ("magnets", "steel_surfaces", "loose_steel", "conductors", "coils", "activities", "zones")


def _problems_of_the_rest(data: dict, error: ValidationError, index: LineIndex) -> list[Problem]:
    """Cross-check what did validate, so one bad item does not hide the others' problems.

    Invalid list items are left out (their ids remembered so references to them are not
    reported again); invalid top-level values are replaced by neutral ones.
    """
    bad_items: set = set()
    bad_keys: set = set()
    for item in error.errors(include_url=False):
        loc = item["loc"]
        if len(loc) >= 2 and loc[0] in _GROUPS and isinstance(loc[1], int):
            bad_items.add((loc[0], loc[1]))
        elif loc:
            bad_keys.add(loc[0])
    rest = {key: value for key, value in data.items() if key not in bad_keys}
    rest.setdefault("title", "untitled")
    rest.setdefault("magnets", [])
    rest.pop("site_rules", None)
    positions: dict = {}
    ignored: set = set()
    for group in _GROUPS:
        items = rest.get(group)
        if not isinstance(items, list):
            continue
        kept = [i for i in range(len(items)) if (group, i) not in bad_items]
        ignored |= {str(items[i].get("id")) for i in range(len(items)) if (group, i) in bad_items and isinstance(items[i], dict)}
        rest[group] = [items[i] for i in kept]
        positions[group] = kept
    left_out_magnets = sorted(i for group, i in bad_items if group == "magnets")
    extra = grade_problems_of_left_out(data["magnets"], left_out_magnets, index) \
        if isinstance(data.get("magnets"), list) else []
    try:
        salvaged = Setup.model_validate(rest)
    except ValidationError:
        return extra
    return extra + all_problems(salvaged, index, positions, frozenset(ignored))


def load_setup(path: str | Path) -> Setup:
    """Read and validate the setup file at ``path`` (see :func:`parse_setup`)."""
    path = Path(path)
    text = read_file_text(path)
    return parse_setup(text, base_directory=path.parent, source=str(path))


def _resolve_site_rules(setup: Setup, base: Path, index: LineIndex) -> tuple[SiteRules | None, list[Problem]]:
    """Load `site_rules` given as a path; return (rules, problems)."""
    rules = setup.site_rules
    if not isinstance(rules, str):
        return rules, []
    path = (base / rules) if not Path(rules).is_absolute() else Path(rules)
    line = index.line(("site_rules",))
    try:
        text = read_file_text(path)
        data, rules_index = read_document(text)
    except SetupError as error:
        return None, [Problem("site_rules", f"file `{rules}`: {p}", line) for p in error.problems]
    try:
        return SiteRules.model_validate(data), []
    except ValidationError as error:
        inner = problems_from_validation(error, data, rules_index, SiteRules)
        return None, [Problem(f"site_rules -> {rules}: {p.path}", f"{p.message}"
                              + (f" (line {p.line} of that file)" if p.line else ""), line) for p in inner]


def site_rules_of(setup: Setup) -> SiteRules:
    """The setup's site rules, or empty rules when it has none."""
    return setup.site_rules if isinstance(setup.site_rules, SiteRules) else SiteRules()


def line_of(setup: Setup, *path) -> int | None:
    """Line of a key path in the file the setup was read from, if known."""
    index = setup._lines
    return index.line(tuple(path)) if index else None


def json_schema() -> dict:
    """JSON Schema of the setup file, generated from the declaration that validates it."""
    schema = Setup.model_json_schema(by_alias=True)
    schema["$schema"] = "https://json-schema.org/draft/2020-12/schema"
    schema["title"] = "benchplan setup file"
    return schema


del model
