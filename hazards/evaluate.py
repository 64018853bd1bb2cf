"""Run every hazard rule over a setup and its assessment; a rule that fails becomes a finding.

>>> from planner.assessment import Assessment
>>> evaluate(None, Assessment(title="empty", program_version="0"), [])
[]
"""
from __future__ import annotations

from hazards.findings import BLOCKING, Finding, deferral_line
from hazards.grouping import group_findings

__all__ = ["evaluate"]


def evaluate(setup, assessment, thresholds) -> list[Finding]:
    """Findings for a setup: every rule of :data:`hazards.rules.RULES`, each inside a guard.

    Parameters
    ----------
    setup : planner.setup.Setup
    assessment : planner.assessment.Assessment
        The computed figures (the rules read them, they compute no physics).
    thresholds : list of planner.assessment.Threshold
        The effective thresholds (``hazards.thresholds.effective_thresholds``); rows missing
        here are taken from the default table.

    Returns
    -------
    list of Finding
        Most pressing first; never raises for a rule's failure (that becomes a ``blocking``
        finding saying which check could not run and why). Findings that say the same thing
        about different parts are merged into one naming them all, and remarks of the
        calculation that another finding already states are left out
        (:func:`hazards.grouping.group_findings`).
    """
    from hazards.rules import RULES

    deferral = deferral_line(setup)
    findings: list[Finding] = []
    for concern, rule in RULES:
        try:
            produced = rule(setup, assessment, thresholds)
            if not isinstance(produced, list) or not all(isinstance(f, Finding) for f in produced):
                raise TypeError(f"the rule returned {type(produced).__name__}, not a list of findings")
        except Exception as error:  # noqa: BLE001 - a failing rule must not hide the others
            produced = [_could_not_run(concern, error)]
        for finding in produced:
            finding.deferral = deferral
            finding.concern = finding.concern or concern
        findings.extend(produced)
    return group_findings(sorted(findings, key=lambda f: -f.rank))


def _could_not_run(concern: str, error: Exception) -> Finding:
    return Finding(
        id=f"{concern}.could-not-run", severity=BLOCKING, concern=concern,
        title=f"The {concern.replace('_', ' ')} check could not run",
        why=f"{type(error).__name__}: {error}. Nothing is known about this concern until it is checked another way.",
        checklist=[f"Check the {concern.replace('_', ' ')} hazards by hand with the site's competent person "
                   "before work starts, and report this failure as a bug."])
