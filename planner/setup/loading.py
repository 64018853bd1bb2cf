"""Reading a setup file safely and turning every problem into a message with its key path and line.

Safety limits (refused with a clear message before any object is built): files over 1 MB,
nesting deeper than 40 levels, and YAML anchors/aliases (which allow expansion bombs and
are never needed in a setup file). Only a ``yaml.SafeLoader`` (subclassed to report bad
scalars with their line) builds Python objects.
"""
from __future__ import annotations

import difflib
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import yaml
from pydantic import ValidationError

MAX_BYTES = 1_000_000
MAX_DEPTH = 40


@dataclass(frozen=True)
class Problem:
    """One problem in a setup file: where (key path and line) and what."""

    path: str
    message: str
    line: int | None = None

    def __str__(self) -> str:
        where = f"`{self.path}` " if self.path else ""
        line = f" (line {self.line})" if self.line else ""
        return f"{where}{self.message}{line}"


class SetupError(ValueError):
    """A setup file that cannot be used; ``problems`` lists every problem found, each with its line."""

    def __init__(self, problems: list[Problem], source: str | None = None):
        self.problems = sorted(problems, key=lambda p: (p.line or 0))
        self.source = source
        super().__init__(self.summary())

    def summary(self) -> str:
        head = f"{self.source}: " if self.source else ""
        count = len(self.problems)
        lines = [f"{head}{count} problem{'s' if count != 1 else ''} in the setup file:"]
        lines += [f"  - {problem}" for problem in self.problems]
        return "\n".join(lines)


def format_path(loc) -> str:
    """('magnets', 1, 'height') -> 'magnets[1].height'."""
    text = ""
    for part in loc:
        if isinstance(part, int):
            text += f"[{part}]"
        else:
            text += ("." if text else "") + str(part)
    return text


class LineIndex:
    """Maps key paths of a YAML document to the line where each key or item starts (1-based)."""

    def __init__(self, root: yaml.Node | None):
        self._lines: dict[tuple, int] = {}
        self.duplicates: list[Problem] = []
        if root is not None:
            self._walk(root, ())

    def _walk(self, node: yaml.Node, path: tuple) -> None:
        self._lines.setdefault(path, node.start_mark.line + 1)
        if isinstance(node, yaml.MappingNode):
            seen: set = set()
            for key_node, value_node in node.value:
                key = key_node.value if isinstance(key_node, yaml.ScalarNode) else str(key_node.start_mark)
                if key in seen:
                    self.duplicates.append(Problem(format_path(path + (key,)), "appears twice; keep one",
                                                   key_node.start_mark.line + 1))
                seen.add(key)
                self._lines[path + (key,)] = key_node.start_mark.line + 1
                self._walk(value_node, path + (key,))
                self._lines[path + (key,)] = key_node.start_mark.line + 1
        elif isinstance(node, yaml.SequenceNode):
            for index, item in enumerate(node.value):
                self._walk(item, path + (index,))

    def line(self, path: tuple) -> int | None:
        """Line of the deepest known prefix of ``path``."""
        path = tuple(path)
        while path:
            if path in self._lines:
                return self._lines[path]
            path = path[:-1]
        return self._lines.get(())


class _SetupLoader(yaml.SafeLoader):
    """``yaml.SafeLoader`` that never lets a bad scalar escape as a bare ``ValueError``.

    An impossible date such as ``2027-02-30`` is kept as text, so the schema reports it with
    its key path and line; any other scalar that cannot be built (``!!int abc``,
    ``!!float x``) becomes a YAML error carrying the line of the value.
    """

    def construct_object(self, node, deep=False):
        try:
            return super().construct_object(node, deep=deep)
        except (ValueError, TypeError, AttributeError, OverflowError) as error:
            raise yaml.constructor.ConstructorError(
                None, None, f"cannot read the value `{getattr(node, 'value', '')}` ({error})",
                node.start_mark) from None


def _timestamp_or_text(loader: yaml.SafeLoader, node: yaml.Node):
    try:
        return yaml.constructor.SafeConstructor.construct_yaml_timestamp(loader, node)
    except (ValueError, TypeError, AttributeError, OverflowError):
        return loader.construct_scalar(node)


_SetupLoader.add_constructor("tag:yaml.org,2002:timestamp", _timestamp_or_text)


def _check_structure(text: str) -> list[Problem]:
    """Refuse aliases and deep nesting by scanning parser events (no objects are built)."""
    depth = 0
    try:
        for event in yaml.parse(text, Loader=yaml.SafeLoader):
            if isinstance(event, yaml.AliasEvent) or getattr(event, "anchor", None):
                return [Problem("", "uses YAML anchors or aliases (`&name`, `*name`); write each value out in full",
                                event.start_mark.line + 1)]
            if isinstance(event, (yaml.MappingStartEvent, yaml.SequenceStartEvent)):
                depth += 1
                if depth > MAX_DEPTH:
                    return [Problem("", f"is nested more than {MAX_DEPTH} levels deep; a setup file never needs that",
                                    event.start_mark.line + 1)]
            elif isinstance(event, (yaml.MappingEndEvent, yaml.SequenceEndEvent)):
                depth -= 1
    except yaml.YAMLError as error:
        return [_yaml_problem(error)]
    return []


def _yaml_problem(error: yaml.YAMLError) -> Problem:
    mark = getattr(error, "problem_mark", None) or getattr(error, "context_mark", None)
    reason = getattr(error, "problem", None) or str(error).splitlines()[0]
    return Problem("", f"is not valid YAML: {reason}", mark.line + 1 if mark else None)


def read_document(text: str) -> tuple[Any, LineIndex]:
    """Parse YAML text safely. Returns (data, line index) or raises SetupError."""
    if len(text.encode("utf-8", errors="replace")) > MAX_BYTES:
        raise SetupError([Problem("", f"is larger than {MAX_BYTES // 1_000_000} MB; a setup file is a few kB")])
    problems = _check_structure(text)
    if problems:
        raise SetupError(problems)
    try:
        root = yaml.compose(text, Loader=yaml.SafeLoader)
        data = yaml.load(text, Loader=_SetupLoader)  # noqa: S506 - a SafeLoader subclass
    except yaml.YAMLError as error:
        raise SetupError([_yaml_problem(error)]) from None
    except RecursionError:
        raise SetupError([Problem("", "is nested too deeply")]) from None
    index = LineIndex(root)
    if index.duplicates:
        raise SetupError(index.duplicates)
    if data is None:
        raise SetupError([Problem("", "is empty; start from `benchplan new`")])
    if not isinstance(data, dict):
        raise SetupError([Problem("", f"must be a mapping of keys such as `title:` and `magnets:`; got a {type(data).__name__}", 1)])
    return data, index


def _normalise_location(loc: tuple, data: Any) -> tuple | None:
    """Drop pydantic's union-tag and validator entries from an error location, walking the data.

    Returns None for errors that belong to a union member the data did not choose (for
    example the "path" form of `site_rules` when the file gives the rules inline).
    """
    path: list = []
    current = data
    for part in loc:
        if isinstance(current, dict) and part in current:
            path.append(part)
            current = current[part]
        elif isinstance(current, list) and isinstance(part, int) and 0 <= part < len(current):
            path.append(part)
            current = current[part]
        elif part in ("str", "constrained-str"):
            if not isinstance(current, str):
                return None
        elif part == "SiteRules":
            if not isinstance(current, dict):
                return None
        elif isinstance(part, str) and (part in _UNION_TAGS or any(c in part for c in "[](")):
            continue
        else:
            path.append(part)
            current = None
    return tuple(path)


# Tags of discriminated unions and names of union members that pydantic puts in locations.
_UNION_TAGS = {"cylinder", "ring", "block", "sphere", "rod", "plate", "tube", "sheet", "meter", "load", "supply",
               "pass_through_coil", "drop_through_tube", "swing_over_sheet", "crank_generator", "bring_together",
               "ship_package", "couple_coils", "switch_off", "SiteRules", "str", "constrained-str"}


def problems_from_validation(error: ValidationError, data: Any, index: LineIndex, model) -> list[Problem]:
    """Turn pydantic's errors into user messages with key path, line and a hint."""
    problems: list[Problem] = []
    seen: set = set()
    for item in error.errors(include_url=False):
        loc = _normalise_location(tuple(item["loc"]), data)
        if loc is None:
            continue
        kind = item["type"]
        if kind in ("union_tag_invalid", "union_tag_not_found") and isinstance(_value_at(data, loc), dict):
            tag = item.get("ctx", {}).get("discriminator", "").strip("'")
            if kind == "union_tag_invalid":
                loc = loc + (tag,)
        message = _message_for(kind, item, loc, data, model)
        if message is None:
            continue
        key = (loc, message)
        if key in seen:
            continue
        seen.add(key)
        problems.append(Problem(format_path(loc), message, index.line(loc)))
    return problems


def _value_at(data: Any, loc: tuple) -> Any:
    current = data
    for part in loc:
        try:
            current = current[part]
        except (KeyError, IndexError, TypeError):
            return None
    return current


def _message_for(kind: str, item: dict, loc: tuple, data: Any, model) -> str | None:
    value = item.get("input")
    if kind in ("quantity", "vector", "direction", "positive", "pair"):
        return item["msg"]
    if kind == "missing":
        parent = _value_at(data, loc[:-1])
        what = ""
        if isinstance(parent, dict) and ("shape" in parent or "kind" in parent):
            what = f" for {parent.get('shape') or parent.get('kind')}"
        return f"is required{what}"
    if kind == "extra_forbidden":
        known = _known_keys(model, loc[:-1], data)
        close = difflib.get_close_matches(str(loc[-1]), known, n=1, cutoff=0.6)
        hint = f"; did you mean `{close[0]}`?" if close else (f"; known keys here: {', '.join(sorted(known))}" if known else "")
        return f"is not a known key{hint}"
    if kind == "union_tag_invalid":
        expected = item.get("ctx", {}).get("expected_tags", "")
        return f"must be one of {expected}; got `{item.get('ctx', {}).get('tag')}`"
    if kind == "union_tag_not_found":
        tag = item.get("ctx", {}).get("discriminator", "").strip("'")
        return f"needs `{tag}:` to say what it is"
    if kind == "literal_error":
        expected = item.get("ctx", {}).get("expected", "")
        return f"must be one of {expected}; got `{value}`"
    if kind in ("int_type", "int_parsing", "int_from_float"):
        return f"must be a whole number; got `{value}`"
    if kind in ("greater_than_equal", "greater_than", "less_than_equal", "less_than"):
        return f"{item['msg'].lower()}; got `{value}`"
    if kind in ("string_type",):
        return f"must be text; got `{value}`"
    if kind == "string_pattern_mismatch":
        return f"must be a short name of letters, digits, `-`, `_` or `.`; got `{value}`"
    if kind in ("string_too_short", "too_short"):
        return "must not be empty"
    if kind in ("string_too_long", "too_long"):
        return item["msg"].lower()
    if kind in ("list_type",):
        return f"must be a list (items starting with `- `); got `{value}`"
    if kind in ("model_type", "model_attributes_type", "dict_type"):
        return f"must be a mapping of keys; got `{value}`"
    if kind in ("bool_type", "bool_parsing"):
        return f"must be true or false; got `{value}`"
    if kind in ("date_type", "date_parsing", "date_from_datetime_parsing"):
        return f"must be a date such as 2026-12-01; got `{value}`"
    if kind in ("float_type", "float_parsing", "finite_number"):
        return f"must be a number; got `{value}`"
    return item["msg"]


def _known_keys(model, loc: tuple, data: Any) -> list[str]:
    """Keys accepted by the model at ``loc`` (following union tags in the data)."""
    from typing import get_args

    annotation: Any = model
    walked: Any = data
    for part in loc:
        if isinstance(part, int):
            args = get_args(annotation)
            annotation = args[0] if args else None
        else:
            current = _model_in(annotation, walked)
            fields = getattr(current, "model_fields", {})
            field = fields.get(part) or next((f for f in fields.values() if f.alias == part), None)
            if field is None:
                return []
            annotation = field.annotation
        walked = _value_at(walked, (part,))
    current = _model_in(annotation, walked)
    if current is None:
        return []
    return [f.alias or name for name, f in current.model_fields.items()]


def _model_in(annotation, value) -> Any:
    """Find the pydantic model inside an annotation, choosing the union member the data's tag names."""
    from typing import get_args

    from pydantic import BaseModel

    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        return annotation
    candidates = []
    stack = [annotation]
    while stack:
        item = stack.pop()
        if isinstance(item, type) and issubclass(item, BaseModel):
            candidates.append(item)
        else:
            stack.extend(get_args(item))
    if isinstance(value, dict):
        for candidate in reversed(candidates):
            for tag_name in ("shape", "kind"):
                field = candidate.model_fields.get(tag_name)
                if field is not None and value.get(tag_name) in get_args(field.annotation):
                    return candidate
    return candidates[-1] if candidates else None


def read_file_text(path: str | Path) -> str:
    """Read a setup file as UTF-8 text, refusing huge files before reading them."""
    path = Path(path)
    try:
        size = path.stat().st_size
    except OSError as error:
        raise SetupError([Problem("", f"cannot be read: {error.strerror}")], source=str(path)) from None
    if size > MAX_BYTES:
        raise SetupError([Problem("", f"is larger than {MAX_BYTES // 1_000_000} MB; a setup file is a few kB")], source=str(path))
    try:
        return path.read_text(encoding="utf-8")
    except UnicodeDecodeError:
        raise SetupError([Problem("", "is not UTF-8 text")], source=str(path)) from None
    except OSError as error:
        raise SetupError([Problem("", f"cannot be read: {error.strerror}")], source=str(path)) from None
