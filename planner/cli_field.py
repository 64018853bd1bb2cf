"""`benchplan field`: the flux density at points, along a line, over a plane, or a map drawing."""
from __future__ import annotations

import csv
import io
from pathlib import Path

import click
import numpy as np

from planner.cli import UserInputError, guarded, setup_argument
from planner.setup import load_setup
from planner.units import UnitError, format_flux_density, to_si, vector_to_si


def _point(text: str) -> np.ndarray:
    try:
        return np.asarray(vector_to_si(text, "length"))
    except UnitError as error:
        raise UserInputError(f"point `{text}`: {error}") from None


def _plane(text: str, option: str = "--grid") -> tuple[int, float]:
    """`z=10 mm` -> (2, 0.01)."""
    axis, _, value = text.partition("=")
    axis = axis.strip().lower()
    if axis not in ("x", "y", "z") or not value:
        raise UserInputError(f"{option} must name a plane such as `z=0 mm` or `y=0 mm`; got `{text}`")
    try:
        return "xyz".index(axis), to_si(value.strip(), "length")
    except UnitError as error:
        raise UserInputError(f"{option} `{text}`: {error}") from None


def _csv(points: np.ndarray, values: np.ndarray) -> str:
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(["x_m", "y_m", "z_m", "Bx_T", "By_T", "Bz_T", "B_T"])
    magnitude = np.linalg.norm(values, axis=1)
    for p, b, m in zip(points, values, magnitude):
        writer.writerow([f"{v:.6g}" for v in (*p, *b, m)])
    return buffer.getvalue()


def _format_tesla(value: float) -> str:
    text = format_flux_density(value, digits=4)
    return "undefined (on a surface or edge)" if text == "not available" else text


@click.command()
@setup_argument
@click.option("--at", "at", multiple=True, metavar="POINT", help='A point, e.g. "0, 0, 30 mm" (repeatable).')
@click.option("--along", nargs=2, metavar="START END", help='A line from START to END, e.g. "0,0,10 mm" "0,0,300 mm".')
@click.option("--grid", metavar="PLANE", help='A plane, e.g. "z=0 mm" (plan) or "y=0 mm" (elevation).')
@click.option("--span", default="-30 cm, 30 cm", show_default=True, help="Range of both in-plane axes of --grid.")
@click.option("--samples", default=101, show_default=True, type=click.IntRange(2, 2001),
              help="Points along --along, or per side of --grid.")
@click.option("--map", "map_view", type=click.Choice(["plan", "elevation"]), help="Draw a to-scale keep-out map.")
@click.option("--plane", metavar="PLANE",
              help='Plane of --map: "z=450 mm" for a plan at that height (e.g. seated head height above the '
                   'bench top), "y=0 mm" for an elevation; default: through the strongest magnet.')
@click.option("--out", type=click.Path(dir_okay=False, path_type=Path), help="CSV file (or .svg/.pdf for --map).")
@guarded
def field(setup_file, at, along, grid, span, samples, map_view, plane, out):
    """Flux density of SETUP's magnets at points, along a line or over a plane."""
    chosen = sum(bool(x) for x in (at, along, grid, map_view))
    if chosen != 1:
        raise UserInputError("give exactly one of --at, --along, --grid or --map")
    if plane and not map_view:
        raise UserInputError("--plane chooses the plane of --map; for a grid of values use --grid")
    offset = None
    if plane:
        from planner.physics.zones.refine import VIEWS   # (across, up, normal) axes of each view

        axis, offset = _plane(plane, "--plane")
        if axis != VIEWS[map_view][2]:
            wanted = "xyz"[VIEWS[map_view][2]]
            raise UserInputError(f"--plane `{plane}`: a {map_view} map lies in a plane {wanted}=..., "
                                 f"such as `{wanted}=0 mm`")
    setup = load_setup(setup_file)
    if map_view:
        from planner.cli_maps import write_map

        if out is None:
            raise UserInputError("--map needs --out FILE.svg or FILE.pdf")
        click.echo(write_map(setup, map_view, out, offset))
        return
    from planner.queries import field as field_at

    if at:
        points = np.array([_point(text) for text in at])
        values = field_at(setup, points)
        if out:
            out.write_text(_csv(points, values), encoding="utf-8")
            click.echo(f"wrote {len(points)} points to {out}")
            return
        for text, b in zip(at, values):
            click.echo(f"at ({text}): |B| = {_format_tesla(float(np.linalg.norm(b)))}   "
                       f"Bx = {_format_tesla(b[0])}, By = {_format_tesla(b[1])}, Bz = {_format_tesla(b[2])}")
        return
    if along:
        start, end = _point(along[0]), _point(along[1])
        t = np.linspace(0.0, 1.0, samples)[:, None]
        points = start + t * (end - start)
    else:
        axis, offset = _plane(grid)
        low, high = _span(span)
        u = np.linspace(low, high, samples)
        a, b = np.meshgrid(u, u, indexing="ij")
        others = [i for i in range(3) if i != axis]
        points = np.zeros((a.size, 3))
        points[:, axis] = offset
        points[:, others[0]], points[:, others[1]] = a.ravel(), b.ravel()
    values = field_at(setup, points)
    text = _csv(points, values)
    if out:
        out.write_text(text, encoding="utf-8")
        click.echo(f"wrote {len(points)} points to {out}")
    else:
        click.echo(text, nl=False)


def _span(text: str) -> tuple[float, float]:
    parts = [p.strip() for p in text.split(",")]
    if len(parts) != 2:
        raise UserInputError(f"--span must be two lengths such as `-30 cm, 30 cm`; got `{text}`")
    unit = parts[1].split()[-1] if len(parts[1].split()) > 1 else ""
    try:
        low = to_si(parts[0] if len(parts[0].split()) > 1 else f"{parts[0]} {unit}", "length")
        high = to_si(parts[1], "length")
    except UnitError as error:
        raise UserInputError(f"--span: {error}") from None
    if not high > low:
        raise UserInputError(f"--span must go from low to high; got `{text}`")
    return low, high


COMMANDS = [field]
