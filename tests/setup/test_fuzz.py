"""Property-based tests: whatever text arrives, the loader raises nothing but planner.SetupError.

Inputs are random YAML documents and random mutations of the example setups (delete a key or
item, replace a value by a random scalar, string or list, duplicate a list item, and text-level
edits such as dropping or repeating a line). A crash of any other type would reach users as an
internal error (exit 3) instead of a message about their file.
"""
from __future__ import annotations

import copy

import yaml
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from planner import SetupError, parse_setup
from planner.setup import Problem
from tests.conftest import SETUPS, example_setup_paths

# A few hundred examples in all, so the file runs in about 20 s. A one-off run with 1 500
# examples per test found nothing more.
_HEALTH = [HealthCheck.too_slow, HealthCheck.data_too_large]
RANDOM = settings(max_examples=100, deadline=None, database=None, suppress_health_check=_HEALTH)
MUTATIONS = settings(max_examples=50, deadline=None, database=None, suppress_health_check=_HEALTH)

EXAMPLE_TEXTS = [path.read_text(encoding="utf-8") for path in example_setup_paths()]
EXAMPLE_DATA = [yaml.safe_load(text) for text in EXAMPLE_TEXTS]
# Mutations start from the two smaller examples (the twelve-station one repeats the same
# parts and takes three times as long to check); between them they use most kinds of part.
SMALL = sorted(range(len(EXAMPLE_TEXTS)), key=lambda i: len(EXAMPLE_TEXTS[i]))[:2]


def _keys(value, found: set) -> set:
    if isinstance(value, dict):
        for key, item in value.items():
            found.add(key)
            _keys(item, found)
    elif isinstance(value, list):
        for item in value:
            _keys(item, found)
    return found


KNOWN_KEYS = sorted(set().union(*(_keys(d, set()) for d in EXAMPLE_DATA)) | {"shape", "kind", "remanence", "axis"})
TRICKY_TEXT = [
    "10 mm", "0", "-3 T", "0 T", "1e400 mm", "nan mm", "inf", "+z", "-q", "2027-02-30", "N42", "N99", "smco5",
    "5 T", "1.56 T", "60 rpm", "3 Hz", "100 %IACS", "12", "", " ", "~", "null", "[1, 2]", "cylinder", "ring",
    "block", "sphere", "tube", "sheet", "meter", "supply", "pass_through_coil", "switch_off", "big-disc", "disc",
    "copper", "iron", "0, 0, 30 mm", "[0 mm, 0 mm]", "1 in", "20 degC", "12 months", "\u00e9\u00e8", "\x00",
]
scalars = st.one_of(
    st.none(), st.booleans(), st.integers(min_value=-10**30, max_value=10**30),
    st.floats(allow_nan=True, allow_infinity=True), st.text(max_size=12), st.sampled_from(TRICKY_TEXT),
    st.builds(lambda number, unit: f"{number:g} {unit}", st.floats(-1e6, 1e6),
              st.sampled_from(["mm", "m", "T", "mT", "G", "kG", "g", "kg", "A/m", "Oe", "rpm", "Hz", "deg",
                               "ohm", "uA", "V", "ms", "m/s", "MS/m", "N", "furlong"])),
)
keys = st.one_of(st.sampled_from(KNOWN_KEYS), st.text(min_size=1, max_size=8))
values = st.recursive(
    scalars,
    lambda children: st.one_of(st.lists(children, max_size=4), st.dictionaries(keys, children, max_size=5)),
    max_leaves=25,
)


def _dump(data) -> str:
    return yaml.safe_dump(data, sort_keys=False, allow_unicode=True)


def _loads_or_explains(text: str) -> None:
    """The property: a Setup, or a SetupError whose problems are well-formed."""
    try:
        parse_setup(text, base_directory=SETUPS)
    except SetupError as error:
        assert error.problems, "a SetupError must list at least one problem"
        line_count = text.count("\n") + 2
        for problem in error.problems:
            assert isinstance(problem, Problem)
            assert problem.line is None or 1 <= problem.line <= line_count, problem
            assert str(problem)
        assert error.summary()


# --- random documents ------------------------------------------------------------------------

@RANDOM
@given(st.dictionaries(keys, values, max_size=8))
def test_random_mappings_raise_only_setup_error(data):
    _loads_or_explains(_dump(data))


@RANDOM
@given(values)
def test_random_documents_of_any_type_raise_only_setup_error(data):
    _loads_or_explains(_dump(data))


@settings(max_examples=80, deadline=None, database=None)
@given(st.text(alphabet=st.sampled_from(list("abz:-[]{}&*!|>'\"#%@` \n\t,.?0123456789")), max_size=120))
def test_random_yaml_like_text_raises_only_setup_error(text):
    _loads_or_explains(text)


# --- mutations of the example setups ---------------------------------------------------------

def _paths(value, prefix=()) -> list[tuple]:
    """Every key path inside ``value`` (not the root)."""
    found = []
    items = value.items() if isinstance(value, dict) else enumerate(value) if isinstance(value, list) else ()
    for key, item in items:
        found.append(prefix + (key,))
        found += _paths(item, prefix + (key,))
    return found


def _parent(data, path):
    for part in path[:-1]:
        data = data[part]
    return data


@st.composite
def mutated_examples(draw):
    data = copy.deepcopy(EXAMPLE_DATA[draw(st.sampled_from(SMALL))])
    for _ in range(draw(st.integers(1, 3))):
        paths = _paths(data)
        if not paths:
            break
        path = draw(st.sampled_from(paths))
        parent, last = _parent(data, path), path[-1]
        operation = draw(st.sampled_from(["delete", "scalar", "string", "list", "duplicate", "rename"]))
        if operation == "delete":
            del parent[last]
        elif operation == "scalar":
            parent[last] = draw(scalars)
        elif operation == "string":
            parent[last] = draw(st.sampled_from(TRICKY_TEXT))
        elif operation == "list":
            parent[last] = draw(st.lists(scalars, max_size=4))
        elif operation == "duplicate" and isinstance(parent, list):
            parent.insert(last, copy.deepcopy(parent[last]))
        elif operation == "rename" and isinstance(parent, dict):
            parent[draw(keys)] = parent.pop(last)
    return data


@MUTATIONS
@given(mutated_examples())
def test_mutated_examples_raise_only_setup_error(data):
    _loads_or_explains(_dump(data))


@st.composite
def text_edits(draw):
    lines = EXAMPLE_TEXTS[draw(st.sampled_from(SMALL))].splitlines(keepends=True)
    for _ in range(draw(st.integers(1, 3))):
        position = draw(st.integers(0, len(lines) - 1))
        operation = draw(st.sampled_from(["drop", "repeat", "insert", "cut"]))
        if operation == "drop" and len(lines) > 1:
            del lines[position]
        elif operation == "repeat":
            lines.insert(position, lines[position])
        elif operation == "insert":
            lines.insert(position, draw(st.text(max_size=30)) + "\n")
        elif operation == "cut":
            line = lines[position]
            cut = draw(st.integers(0, len(line)))
            lines[position] = line[:cut] + draw(st.sampled_from(["", ":", "- ", "[", "&a ", "*a", "!!int ", "\t"]))
    return "".join(lines)


@MUTATIONS
@given(text_edits())
def test_text_edits_of_examples_raise_only_setup_error(text):
    _loads_or_explains(text)


def test_the_unmutated_examples_load():
    # The property above is only meaningful if the starting points are valid.
    for text in EXAMPLE_TEXTS:
        parse_setup(text, base_directory=SETUPS)
