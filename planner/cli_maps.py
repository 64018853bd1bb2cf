"""`benchplan field SETUP --map plan|elevation --out FILE`: the to-scale keep-out map on its own."""
from __future__ import annotations

from pathlib import Path

from planner import __version__
from planner.assessment import Assessment
from planner.calculations.keep_out import MAP_THRESHOLDS, contours, keep_out_distances
from planner.cli import UserInputError
from planner.physics.zones.refine import VIEWS
from planner.setup import Setup, site_rules_of


def write_map(setup: Setup, view: str, out: Path, offset: float | None = None) -> str:
    """Draw the map of ``view`` to ``out`` (.svg or .pdf); return a one-line account.

    ``offset`` [m]: the plane (z of a plan, y of an elevation); default through the
    strongest magnet.
    """
    from hazards import effective_thresholds
    from reports.field_map import write_pdf, write_svg
    from reports.pdf.scenes import scenes_from_setup

    suffix = out.suffix.lower()
    if suffix not in (".svg", ".pdf"):
        raise UserInputError(f"--out must end in .svg or .pdf; got `{out.name}`")
    rows = [t for t in effective_thresholds(site_rules_of(setup)) if t.id in MAP_THRESHOLDS]
    assessment = Assessment(title=setup.title, program_version=__version__, thresholds=rows)
    assessment.keep_out = keep_out_distances(setup, rows)
    assessment.contours = [c for c in contours(setup, rows, {view: offset} if offset is not None else None)
                           if c.view == view]
    scenes = scenes_from_setup(setup, assessment).get(view)
    if not scenes:
        where = ""
        if assessment.contours:
            axis = "xyz"[VIEWS[view][2]]     # the plane's normal: z of a plan, y of an elevation
            where = f" ({axis} = {assessment.contours[0].plane_offset_m * 1e3:g} mm)"
        raise UserInputError(f"no keep-out line crosses the {view} plane{where}: the field stays below every "
                             "map threshold there; nothing to draw")
    partial = out.with_name(out.name + ".partial")
    (write_svg if suffix == ".svg" else write_pdf)(scenes[0], partial)
    partial.replace(out)
    return f"wrote the {view} map ({', '.join(t.id for t in rows)}) to {out}"
