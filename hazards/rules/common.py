"""Small read-only helpers the rules share: looking things up in the setup and the assessment.

Every helper tolerates missing parts (a setup without zones, an assessment without figures),
so a rule can never fail on an attribute that is simply absent.
"""
from __future__ import annotations

from hazards.findings import is_number

__all__ = ["items", "magnet_figures_by_id", "setup_magnets_by_id", "activities_of", "audience_has_children",
           "public_present", "implant_wearers_screened", "reaches", "largest_distance_per_magnet",
           "zone_max_field"]


def items(container, name: str) -> list:
    """``container.name`` as a list, or an empty list when absent or None."""
    value = getattr(container, name, None) if container is not None else None
    return list(value) if value else []


def magnet_figures_by_id(assessment) -> dict:
    return {m.id: m for m in items(assessment, "magnets")}


def setup_magnets_by_id(setup) -> dict:
    return {m.id: m for m in items(setup, "magnets")}


def activities_of(setup, *kinds: str) -> list:
    return [a for a in items(setup, "activities") if not kinds or getattr(a, "kind", None) in kinds]


def _audience(setup):
    return getattr(setup, "audience", None)


def public_present(setup) -> bool:
    return "public" in items(_audience(setup), "groups")


def audience_has_children(setup, age_limit: float) -> tuple[bool, str]:
    """(children may be present, why): youngest age under the limit, or unknown with the public present."""
    youngest = getattr(_audience(setup), "youngest_age", None)
    if youngest is not None:
        if youngest < age_limit:
            return True, f"the youngest person present is {youngest}, under {age_limit:g}"
        return False, f"the youngest person present is {youngest}"
    if public_present(setup):
        return True, "the public is present and the youngest age is not given"
    return False, "no children are expected (no youngest age given, no public)"


def implant_wearers_screened(setup) -> bool:
    return getattr(_audience(setup), "implant_wearers", "may_be_present") == "screened_out"


def reaches(max_field, threshold_value: float, flagged: bool = False) -> bool:
    """True when a zone's largest field reaches a threshold (or the calculation flagged it as
    reached for this same value); an unknown field counts as reaching it."""
    return bool(flagged) or (bool(max_field >= threshold_value) if is_number(max_field) else True)


def largest_distance_per_magnet(assessment, threshold_id: str) -> dict[str, float]:
    """Keep-out distance of each magnet for one threshold id (largest if listed twice); NaN kept."""
    result: dict[str, float] = {}
    for row in items(assessment, "keep_out"):
        if getattr(row, "threshold_id", None) != threshold_id:
            continue
        distance = getattr(row, "distance_m", float("nan"))
        previous = result.get(row.magnet_id)
        if previous is None or (is_number(distance) and (not is_number(previous) or distance > previous)):
            result[row.magnet_id] = distance
    return result


def zone_max_field(assessment, zone_id: str):
    """Largest field in a zone over its reach rows (they share it); None when the zone has no row."""
    values = [r.max_field_T for r in items(assessment, "zone_reach") if getattr(r, "zone_id", None) == zone_id]
    if not values:
        return None
    numbers = [v for v in values if is_number(v)]
    return max(numbers) if len(numbers) == len(values) else float("nan")
