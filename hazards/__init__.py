"""Hazard rules: setup + assessment + site rules -> findings and checklist items.

``evaluate(setup, assessment, thresholds)`` runs every rule; ``effective_thresholds(site_rules)``
gives the threshold table with the site's overrides.
"""
from hazards.evaluate import evaluate
from hazards.findings import Finding, SEVERITIES
from hazards.thresholds import effective_thresholds, load_thresholds

__all__ = ["evaluate", "Finding", "SEVERITIES", "effective_thresholds", "load_thresholds"]
