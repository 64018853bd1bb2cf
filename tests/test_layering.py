"""The direction of imports (DESIGN.md): physics <- setup/assess <- hazards <- reports <- cli.

Checked on the source text with ast, so a forbidden import anywhere in a module (also inside a
function) fails here.
"""
import ast
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]


def imported_modules(path: Path) -> set[str]:
    tree = ast.parse(path.read_text(encoding="utf-8"))
    names = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            names |= {alias.name for alias in node.names}
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            names.add(node.module)
    return names


def modules_under(folder: str) -> list[Path]:
    return sorted((ROOT / folder).rglob("*.py"))


def _starts(name: str, prefixes) -> bool:
    return any(name == p or name.startswith(p + ".") for p in prefixes)


@pytest.mark.parametrize("path", modules_under("planner/physics"), ids=lambda p: str(p.relative_to(ROOT)))
def test_physics_sees_no_setup_and_does_no_io(path):
    forbidden = ("planner.setup", "planner.calculations", "planner.assess", "planner.cli", "hazards", "reports",
                 "yaml", "click", "pint", "magpylib", "planner.units")
    bad = [n for n in imported_modules(path) if _starts(n, forbidden)]
    assert not bad, f"{path.name} imports {bad}"


@pytest.mark.parametrize("path", [p for p in modules_under("planner") if not p.name.startswith("cli")
                                  and p.name != "assess.py"], ids=lambda p: str(p.relative_to(ROOT)))
def test_planner_does_not_import_hazards_or_reports(path):
    bad = [n for n in imported_modules(path) if _starts(n, ("hazards", "reports"))]
    assert not bad, f"{path.name} imports {bad}"


def test_assess_imports_only_hazards_at_the_composition_point():
    names = imported_modules(ROOT / "planner/assess.py")
    assert not any(_starts(n, ("reports",)) for n in names)


@pytest.mark.parametrize("path", modules_under("hazards"), ids=lambda p: str(p.relative_to(ROOT)))
def test_hazards_never_draw_or_compute_physics(path):
    bad = [n for n in imported_modules(path) if _starts(n, ("reports", "planner.physics", "planner.calculations",
                                                            "reportlab", "planner.cli"))]
    assert not bad, f"{path.name} imports {bad}"


@pytest.mark.parametrize("path", modules_under("reports"), ids=lambda p: str(p.relative_to(ROOT)))
def test_reports_never_compute_physics(path):
    bad = [n for n in imported_modules(path) if _starts(n, ("planner.physics", "planner.calculations", "scipy"))]
    assert not bad, f"{path.name} imports {bad}"


def test_runtime_never_imports_the_reference_library():
    for folder in ("planner", "hazards", "reports"):
        for path in modules_under(folder):
            assert "magpylib" not in imported_modules(path), path


def test_the_program_starts_without_the_heavy_scipy_packages():
    # Measured start-up (python -X importtime): scipy.signal, scipy.integrate and scipy.optimize
    # together were about 0.6 s of the command line's 1.4 s, for one filter, one integral and two
    # root searches now written out in planner (physics/roots.py and its callers); scipy.linalg
    # (0.05 s) came with scipy.special.roots_legendre, replaced by physics/gauss.py.
    # scipy.special and scipy.constants (0.15-0.2 s with the array-API layer they load) gave
    # K, E, R_D, one hypergeometric series and three constants: now physics/fields/elliptic.py
    # and physics/constants.py.
    import subprocess
    import sys

    code = ("import sys, planner.assess, reports.pdf, planner.cli; "
            "print(' '.join(sorted(m for m in sys.modules if m.startswith(('scipy.', 'magpylib')))))")
    loaded = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True,
                            cwd=ROOT).stdout.split()
    heavy = ("scipy.signal", "scipy.integrate", "scipy.optimize", "scipy.stats", "scipy.linalg", "scipy.special",
             "scipy.constants", "magpylib")
    assert not [m for m in loaded if _starts(m, heavy)]
