"""assess(setup): every figure for a setup, then the hazard rules' findings.

This is the one place where the planner composes its figures with the ``hazards`` package, so
that the public API returns findings. The import is local to the function: planner modules do
not depend on hazards at import time, and hazards depends on planner, never the reverse.
"""
from __future__ import annotations

from planner import __version__
from planner.assessment import Assessment, Threshold
from planner.calculations.handling import pair_figures, projectile_figures, steel_lift_gradient_distances
from planner.calculations.induction import induction_figures
from planner.calculations.keep_out import PendingKeepOut, contours, zone_reaches
from planner.calculations.magnets import magnet_figures
from planner.calculations.methods import assumptions, references
from planner.calculations.shipping import shipping_figures
from planner.setup import Setup, site_rules_of


def compute_figures(setup: Setup, thresholds: list[Threshold], with_maps: bool = True) -> Assessment:
    """All figures of ``setup`` for the given thresholds, without findings."""
    assessment = Assessment(title=setup.title, program_version=__version__, thresholds=list(thresholds))
    assessment.magnets = magnet_figures(setup)
    # The keep-out distances, the longest part, run in worker processes while this one
    # works out the other figures.
    keep_out = PendingKeepOut(setup, thresholds)
    try:
        if with_maps:
            assessment.contours = contours(setup, thresholds)
        assessment.zone_reach = zone_reaches(setup, thresholds)
        assessment.pairs = pair_figures(setup)
        assessment.projectiles = projectile_figures(setup)
        assessment.steel_lift_gradient_distance_m = steel_lift_gradient_distances(setup)
        assessment.induction = induction_figures(setup)
        assessment.shipping = shipping_figures(setup)
        assessment.keep_out = keep_out.result()
    finally:
        keep_out.close()
    assessment.assumptions = assumptions(setup, assessment)
    assessment.references = references(assessment)
    return assessment


def assess(setup: Setup, with_maps: bool = True) -> Assessment:
    """Figures and findings for ``setup``.

    Parameters
    ----------
    setup : Setup
        A validated setup (:func:`planner.load_setup`).
    with_maps : bool
        Compute the contour lines for the maps (the slowest part for large rooms).

    Returns
    -------
    Assessment
        With ``findings`` filled by the hazard rules; ``.to_dict()`` is JSON-ready.

    Raises
    ------
    SetupError
        If the site's threshold overrides are not acceptable (for example a looser value
        without a written reason).
    """
    from hazards import effective_thresholds, evaluate  # the one composition point (see module docstring)

    thresholds = effective_thresholds(site_rules_of(setup))
    assessment = compute_figures(setup, thresholds, with_maps=with_maps)
    assessment.findings = evaluate(setup, assessment, thresholds)
    return assessment
