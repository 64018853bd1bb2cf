"""The setup fingerprint: one hash that changes whenever anything a sign-off relies on changes.

The fingerprint is the SHA-256 of three parts, each length-prefixed so no two inputs can run
together:

1. the validated setup in canonical SI form (``setup.model_dump(mode="json")``, floats rounded to
   12 significant digits so that `25 mm` and `2.5 cm` give the same bytes, keys sorted, compact
   separators, UTF-8);
2. the threshold table's bytes (``hazards/thresholds.yaml``, read as data; empty if it is absent);
3. the program version.

The short form (the first 12 hex digits) is printed on every page of the report.

>>> short_fingerprint("0123456789abcdef" * 4)
'0123456789ab'
>>> top_level_changes({"title": "a", "magnets": [1]}, {"title": "b", "magnets": [1], "zones": []})
['title', 'zones']
"""
from __future__ import annotations

import hashlib
import json
import math
from importlib import resources
from typing import Any

SHORT_LENGTH = 12
SIGNIFICANT_DIGITS = 12
_FORMAT_TAG = b"benchplan setup fingerprint, format 1"


def _round_floats(value: Any) -> Any:
    """Round every float to 12 significant digits (and turn -0.0 into 0.0), recursively."""
    if isinstance(value, bool) or value is None:
        return value
    if isinstance(value, float):
        if not math.isfinite(value):
            return str(value)
        rounded = float(f"{value:.{SIGNIFICANT_DIGITS}g}")
        return 0.0 if rounded == 0 else rounded
    if isinstance(value, dict):
        return {str(key): _round_floats(item) for key, item in value.items()}
    if isinstance(value, (list, tuple)):
        return [_round_floats(item) for item in value]
    return value


def canonical_setup(setup) -> dict:
    """The validated setup as plain JSON data in SI units, floats rounded to 12 significant digits."""
    return _round_floats(setup.model_dump(mode="json"))


def canonical_json(data: dict) -> str:
    """Canonical text of plain data: sorted keys, no spaces, non-ASCII kept as UTF-8."""
    return json.dumps(data, sort_keys=True, separators=(",", ":"), ensure_ascii=False, allow_nan=False)


def threshold_table_bytes() -> bytes:
    """The bytes of the threshold table shipped with the hazard rules (empty if not present)."""
    try:
        return resources.files("hazards").joinpath("thresholds.yaml").read_bytes()
    except (FileNotFoundError, ModuleNotFoundError, OSError):
        return b""


def _program_version() -> str:
    from planner import __version__

    return __version__


def fingerprint_of_canonical(canonical: dict | str, thresholds: bytes | None = None,
                             version: str | None = None) -> str:
    """SHA-256 hex digest of canonical setup data (dict or its canonical JSON), thresholds and version."""
    text = canonical if isinstance(canonical, str) else canonical_json(canonical)
    parts = [_FORMAT_TAG, text.encode("utf-8"),
             threshold_table_bytes() if thresholds is None else thresholds,
             (_program_version() if version is None else version).encode("utf-8")]
    digest = hashlib.sha256()
    for part in parts:
        digest.update(len(part).to_bytes(8, "big"))
        digest.update(part)
    return digest.hexdigest()


def fingerprint(setup, thresholds: bytes | None = None, version: str | None = None) -> str:
    """The fingerprint of a validated setup (64 hex digits).

    Parameters
    ----------
    setup : planner.setup.Setup
        The validated setup.
    thresholds : bytes, optional
        The threshold table's content (default: the shipped ``hazards/thresholds.yaml``).
    version : str, optional
        The program version (default: the installed benchplan version).
    """
    return fingerprint_of_canonical(canonical_setup(setup), thresholds, version)


def short_fingerprint(full: str) -> str:
    """The first 12 hex digits, printed on every page."""
    return full[:SHORT_LENGTH]


def top_level_changes(old_canonical: dict | str, new_canonical: dict | str) -> list[str]:
    """Top-level keys whose values differ between two canonical setups (added, removed or changed).

    Either argument may be the canonical dict or its JSON text. The result is sorted.
    """
    old = json.loads(old_canonical) if isinstance(old_canonical, str) else old_canonical
    new = json.loads(new_canonical) if isinstance(new_canonical, str) else new_canonical
    keys = set(old) | set(new)
    return sorted(key for key in keys if canonical_json({"v": old.get(key)}) != canonical_json({"v": new.get(key)}))
