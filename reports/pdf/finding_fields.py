"""Reading findings through their attribute names, tolerant of the parts that may be absent.

A finding (``hazards.findings.Finding``) is expected to carry ``id``, ``severity``, ``title``,
``figures``, ``why``, ``cautions``, ``checklist`` (items to tick before work), ``sources``,
``deferral`` and optionally ``blocking``; every reader here falls back to a neutral value.
"""
from __future__ import annotations

from typing import Any

# Severity words from most to least pressing, used when the hazards package gives no order.
_FALLBACK_ORDER = ["stop", "blocking", "must_resolve", "danger", "high", "serious", "warning", "caution",
                   "medium", "moderate", "advice", "notice", "low", "info", "information", "note"]
_BLOCKING_WORDS = {"stop", "blocking", "must_resolve", "danger", "high", "serious"}



def text_of(value: Any) -> str:
    """Enum members print their value; everything else its str."""
    value = getattr(value, "value", value)
    return "" if value is None else str(value)


def severity_order() -> list[str]:
    """Severity words, most pressing first (from the hazards package when it declares them).

    ``hazards.findings.SEVERITIES`` lists them from least to most pressing.
    """
    try:
        import hazards.findings as module
    except Exception:  # noqa: BLE001 - the hazards package may still be being written
        return list(_FALLBACK_ORDER)
    declared = getattr(module, "SEVERITIES", None)
    if declared:
        words = [text_of(word) for word in reversed(declared)]
        return words + [word for word in _FALLBACK_ORDER if word not in words]
    return list(_FALLBACK_ORDER)


def severity_meaning(word: str) -> str:
    """What a severity word asks of the reader (from the hazards package), or ''."""
    try:
        import hazards.findings as module
    except Exception:  # noqa: BLE001
        return ""
    return getattr(module, "SEVERITY_MEANINGS", {}).get(word, "")


def severity(finding) -> str:
    return text_of(getattr(finding, "severity", "")) or "unrated"


def severity_rank(finding, order: list[str] | None = None) -> int:
    order = order or severity_order()
    word = severity(finding).lower()
    return order.index(word) if word in order else len(order)


def blocking(finding) -> bool:
    """Must this be resolved before work starts?"""
    declared = getattr(finding, "blocking", None)
    if declared is not None and not callable(declared):
        return bool(declared)
    return severity(finding).lower() in _BLOCKING_WORDS


def title(finding) -> str:
    return text_of(getattr(finding, "title", "")) or text_of(getattr(finding, "id", "")) or "untitled finding"


def items(finding, *names: str) -> list[str]:
    """The first non-empty list attribute among `names`, as strings (a lone string becomes a list)."""
    for name in names:
        value = getattr(finding, name, None)
        if value:
            if isinstance(value, str):
                return [value]
            return [_item_text(item) for item in value]
    return []


def _item_text(item) -> str:
    """A list entry as text; a (threshold id, source) pair gives its source text."""
    if isinstance(item, (tuple, list)) and len(item) == 2:
        return text_of(item[1])
    if isinstance(item, dict):
        return text_of(item.get("source") or item.get("text") or item)
    return text_of(getattr(item, "text", item))


def cautions(finding) -> list[str]:
    return items(finding, "cautions")


def checklist(finding) -> list[str]:
    return items(finding, "checklist", "checklist_items", "actions")


def sources(finding) -> list[str]:
    """Source texts of a finding (for (threshold id, source) pairs, the source text)."""
    return items(finding, "sources", "references")


def source_pairs(finding) -> list[tuple[str, str]]:
    """(threshold id or '', source text) for each source of a finding."""
    result = []
    for item in getattr(finding, "sources", None) or []:
        if isinstance(item, (tuple, list)) and len(item) == 2:
            result.append((text_of(item[0]), text_of(item[1])))
        else:
            result.append(("", _item_text(item)))
    return result


def figures(finding) -> list[tuple[str, str]]:
    """The figures behind a finding as (label, value text) pairs.

    Accepts a dict of unit-suffixed keys, a list of (label, value) pairs, or a list of objects
    with ``label``/``name`` and ``text``/``value`` attributes.
    """
    from reports.pdf.formatting import key_label, value_text

    value = getattr(finding, "figures", None)
    if not value:
        return []
    if isinstance(value, dict):
        return [(key_label(str(key))[0], value_text(str(key), item)) for key, item in value.items()]
    pairs = []
    for entry in value:
        if isinstance(entry, (tuple, list)) and len(entry) == 2:
            pairs.append((text_of(entry[0]), text_of(entry[1])))
        elif isinstance(entry, dict):
            label = entry.get("label") or entry.get("name") or ""
            pairs.append((text_of(label), text_of(entry.get("text", entry.get("value", "")))))
        elif isinstance(entry, str):
            pairs.append(("", entry))
        else:
            label = getattr(entry, "label", None) or getattr(entry, "name", "")
            shown = getattr(entry, "text", None) or getattr(entry, "value", "")
            pairs.append((text_of(label), text_of(shown)))
    return pairs


def ordered(findings: list, order: list[str] | None = None) -> list:
    """Findings, most pressing first, otherwise in their given order."""
    order = order or severity_order()
    return sorted(findings, key=lambda f: (not blocking(f), severity_rank(f, order)))
