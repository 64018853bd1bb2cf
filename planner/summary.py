"""Plain-text descriptions of what a setup file says, and the material tables, for `check` and `grades`."""
from __future__ import annotations

from planner import materials
from planner.setup import Setup, site_rules_of
from planner.setup import model
from planner.setup.geometry import grade_of, mass_of, remanence_of


def _mm(value: float) -> str:
    return f"{value * 1e3:g} mm"


def _point(vector) -> str:
    return "(" + ", ".join(f"{v * 1e3:g}" for v in vector) + ") mm"


def _direction(vector) -> str:
    names = {(1, 0, 0): "+x", (-1, 0, 0): "-x", (0, 1, 0): "+y", (0, -1, 0): "-y", (0, 0, 1): "+z", (0, 0, -1): "-z"}
    key = tuple(int(round(v)) if abs(v - round(v)) < 1e-9 else None for v in vector)
    return names.get(key, "[" + ", ".join(f"{v:.3g}" for v in vector) + "]")


def magnet_size(magnet) -> str:
    """Size of a magnet in words: `50 mm dia. x 25 mm`."""
    if isinstance(magnet, model.Cylinder):
        return f"{_mm(magnet.diameter)} dia. x {_mm(magnet.height)}"
    if isinstance(magnet, model.Ring):
        return f"{_mm(magnet.diameter)} / {_mm(magnet.inner_diameter)} dia. x {_mm(magnet.height)}"
    if isinstance(magnet, model.Block):
        return " x ".join(_mm(v) for v in magnet.size)
    return f"{_mm(magnet.diameter)} dia."


def describe_setup(setup: Setup) -> str:
    """A short account of everything read from the file, in the order of the file."""
    lines = [f"{setup.title}: the setup file is valid."]
    if setup.site or setup.date:
        lines.append(f"  site: {setup.site or '-'}   date: {setup.date or '-'}")
    audience = setup.audience
    age = f", youngest {audience.youngest_age} years" if audience.youngest_age is not None else ""
    implants = "screened out" if audience.implant_wearers == "screened_out" else "may be present"
    lines.append(f"  audience: {', '.join(audience.groups)}{age}; implant wearers {implants}")
    lines.append(f"\n  magnets ({len(setup.magnets)}):")
    for magnet in setup.magnets:
        grade = grade_of(magnet)
        material = magnet.grade if grade else "given remanence"
        count = f" x{magnet.count}" if magnet.count > 1 else ""
        lines.append(f"    {magnet.id}{count}: {magnet.shape} {magnet_size(magnet)}, {material}, "
                     f"Br {remanence_of(magnet):.3g} T, {mass_of(magnet) * 1e3:.3g} g, "
                     f"at {_point(magnet.at)}, magnetized {_direction(magnet.magnetization)}")
    groups = [
        ("steel surfaces", setup.steel_surfaces, lambda s: f"{s.steel}, {_mm(s.thickness)} thick, face at {_point(s.at)} facing {_direction(s.normal)}"),
        ("loose steel", setup.loose_steel, lambda s: f"{s.shape} of {s.steel} at {_point(s.at)}"),
        ("conductors", setup.conductors, lambda c: f"{c.kind} of {c.material or f'{c.conductivity / 1e6:g} MS/m'} at {_point(c.at)}"),
        ("coils", setup.coils, lambda c: f"{c.turns} turns, bore {_mm(c.inner_diameter)}, length {_mm(c.length)}"
                                          + (f", to a {c.connected_to.kind}" if c.connected_to else "")),
        ("activities", setup.activities, lambda a: a.kind.replace("_", " ")),
        ("zones", setup.zones, lambda z: f"{z.kind.replace('_', ' ')} from {_point(z.corner_from)} to {_point(z.corner_to)}"),
    ]
    for name, parts, text in groups:
        if parts:
            lines.append(f"\n  {name} ({len(parts)}):")
            lines += [f"    {part.id}: {text(part)}" for part in parts]
    rules = site_rules_of(setup)
    if setup.site_rules is not None:
        lines.append(f"\n  site rules: {rules.name or 'given'}; {len(rules.thresholds)} threshold override(s)")
    return "\n".join(lines)


def material_tables() -> dict:
    """Grades, conductors and steels as tables of strings, each with its sources."""
    grade_rows, grade_sources = [], {}
    for grade in materials.grades().values():
        key = _source_key(grade.source, grade_sources)
        grade_rows.append([grade.name, grade.family, f"{grade.remanence_min:.2f}-{grade.remanence_max:.2f}",
                           f"{grade.coercivity_min / 1e3:.0f}", f"{grade.max_working_temperature:.0f}",
                           f"{grade.density:.0f}", grade.confidence, key])
    conductor_rows, conductor_sources = [], {}
    for conductor in materials.conductors().values():
        key = _source_key(conductor.source, conductor_sources)
        conductor_rows.append([conductor.name, f"{conductor.conductivity / 1e6:g}", f"{conductor.density:.0f}",
                               conductor.confidence, key])
    steel_rows, steel_sources = [], {}
    for steel in materials.steels().values():
        key = _source_key(steel.source, steel_sources)
        steel_rows.append([steel.name, f"{steel.saturation:g}", f"{steel.density:.0f}", steel.confidence, key])
    return {
        "magnet grades": {"columns": ["grade", "family", "Br (T)", "HcJ min (kA/m)", "max temp (degC)",
                                      "density (kg/m3)", "conf.", "source"],
                          "rows": grade_rows, "sources": grade_sources},
        "conductors (20 degC)": {"columns": ["material", "conductivity (MS/m)", "density (kg/m3)", "conf.", "source"],
                                 "rows": conductor_rows, "sources": conductor_sources},
        "steels": {"columns": ["steel", "saturation Js (T)", "density (kg/m3)", "conf.", "source"],
                   "rows": steel_rows, "sources": steel_sources},
    }


def _source_key(text: str, sources: dict) -> str:
    for key, value in sources.items():
        if value == text:
            return key
    key = str(len(sources) + 1)
    sources[key] = text
    return key
