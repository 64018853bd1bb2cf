"""Annotated field types for the setup schema: quantity strings become SI floats on validation.

Each type declares both how a value is checked and how it appears in the JSON Schema, so the
schema that editors use and the validator cannot drift apart.
"""
from __future__ import annotations

import math
from typing import Annotated, Any

import numpy as np
from pydantic import BeforeValidator, WithJsonSchema
from pydantic_core import PydanticCustomError

from planner.units import KINDS, UnitError, to_si, vector_to_si

_QUANTITY_PATTERN = r"^\s*[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?\s*\S.*$"


def _quantity_schema(kind: str) -> dict:
    example = KINDS[kind].example
    return {
        "anyOf": [{"type": "string", "pattern": _QUANTITY_PATTERN}, {"const": 0}],
        "description": f"{kind} with its unit, e.g. `{example}`",
        "examples": [example],
    }


def _quantity_checker(kind: str, positive: bool):
    def check(value: Any) -> float:
        try:
            number = to_si(value, kind)
        except UnitError as error:
            raise PydanticCustomError("quantity", str(error)) from None
        if positive and not number > 0:
            raise PydanticCustomError("positive", f"must be greater than zero; got `{value}`")
        return number
    return check


def Quantity(kind: str, positive: bool = False):  # noqa: N802 - reads as a type in declarations
    """A float field read from a quantity string of ``kind`` (SI value after validation)."""
    return Annotated[float, BeforeValidator(_quantity_checker(kind, positive)), WithJsonSchema(_quantity_schema(kind))]


def _vector_checker(kind: str):
    def check(value: Any) -> tuple[float, float, float]:
        try:
            return vector_to_si(value, kind)
        except UnitError as error:
            raise PydanticCustomError("vector", str(error)) from None
    return check


def Vector(kind: str):  # noqa: N802
    """A 3-vector of quantities of ``kind``, in the setup frame (x along the bench, y across, z up)."""
    example = KINDS[kind].example
    schema = {
        "anyOf": [
            {"type": "array", "minItems": 3, "maxItems": 3, "items": _quantity_schema(kind)},
            {"type": "string"},
        ],
        "description": f"[x, y, z], each a {kind} with its unit, e.g. `[0 mm, 0 mm, {example}]`",
    }
    return Annotated[tuple[float, float, float], BeforeValidator(_vector_checker(kind)), WithJsonSchema(schema)]


def _pair_checker(kind: str):
    def check(value: Any) -> tuple[float, float]:
        if not isinstance(value, (list, tuple)) or len(value) != 2:
            raise PydanticCustomError("pair", f"must be two {kind} values such as `[30 cm, 20 cm]`; got `{value}`")
        try:
            first, second = (to_si(v, kind) for v in value)
        except UnitError as error:
            raise PydanticCustomError("pair", str(error)) from None
        if not (first > 0 and second > 0):
            raise PydanticCustomError("positive", f"both values must be greater than zero; got `{value}`")
        return first, second
    return check


def Pair(kind: str):  # noqa: N802
    """Two positive quantities of ``kind`` (for example a sheet's length and width)."""
    schema = {"type": "array", "minItems": 2, "maxItems": 2, "items": _quantity_schema(kind)}
    return Annotated[tuple[float, float], BeforeValidator(_pair_checker(kind)), WithJsonSchema(schema)]


_NAMED_DIRECTIONS = {f"{sign}{axis}": tuple(float(s) * (1.0 if sign == "+" else -1.0) for s in unit)
                     for axis, unit in (("x", (1, 0, 0)), ("y", (0, 1, 0)), ("z", (0, 0, 1)))
                     for sign in "+-"}


def _direction(value: Any) -> tuple[float, float, float]:
    if isinstance(value, str):
        key = value.strip().lower()
        if key in ("x", "y", "z"):
            key = "+" + key
        if key in _NAMED_DIRECTIONS:
            return _NAMED_DIRECTIONS[key]
        raise PydanticCustomError(
            "direction", f"must be a direction such as `+z`, `-x` or a vector `[0, 1, 1]`; got `{value}`")
    if isinstance(value, (list, tuple)) and len(value) == 3 and all(
            isinstance(v, (int, float)) and not isinstance(v, bool) for v in value):
        vector = np.asarray(value, dtype=float)
        norm = float(np.linalg.norm(vector))
        if not math.isfinite(norm) or norm == 0:
            raise PydanticCustomError("direction", f"must be a non-zero direction vector; got `{value}`")
        return tuple(float(v) for v in vector / norm)
    raise PydanticCustomError(
        "direction", f"must be a direction such as `+z`, `-x` or a vector `[0, 1, 1]`; got `{value}`")


Direction = Annotated[
    tuple[float, float, float],
    BeforeValidator(_direction),
    WithJsonSchema({
        "anyOf": [
            {"type": "string", "enum": sorted(_NAMED_DIRECTIONS) + ["x", "y", "z"]},
            {"type": "array", "minItems": 3, "maxItems": 3, "items": {"type": "number"}},
        ],
        "description": "a direction in the setup frame: `+z`, `-x`, ... or a vector such as `[0, 1, 1]`",
    }),
]
