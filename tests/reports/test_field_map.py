"""The to-scale field map (reports.field_map): it renders, carries its labels, keeps scale.

Scale checks use the definition of the PostScript point (1 pt = 1/72 in, 1 in = 25.4 mm;
Adobe PostScript Language Reference, 3rd ed. (1999), section 4.3.1).
"""
from __future__ import annotations

import io

import numpy as np
import pytest
from pypdf import PdfReader
from reportlab.graphics import renderPDF
from reportlab.graphics.shapes import Circle, Rect

from reports.field_map import KeepOutLine, MapScene, Shape, build_drawing, round_length, svg_text, write_pdf, write_svg


def circle_polyline(radius, centre=(0.0, 0.0), count=73):
    angle = np.linspace(0, 2 * np.pi, count)
    return np.column_stack([centre[0] + radius * np.cos(angle), centre[1] + radius * np.sin(angle)])


def scene(view="plan"):
    shapes = (
        Shape("magnet", "circle", "disc 20 x 5 mm", centre=(0.0, 0.0), radius=0.01),
        Shape("magnet", "rectangle", "block 10 x 10 x 20 mm", corner_low=(0.05, -0.005), corner_high=(0.06, 0.005)),
        Shape("steel", "rectangle", "steel plate", corner_low=(-0.2, -0.25), corner_high=(0.2, -0.22)),
        Shape("coil", "polygon", "coil", points=((0.15, 0.1), (0.2, 0.1), (0.2, 0.15), (0.15, 0.15))),
        Shape("zone", "rectangle", "first row", corner_low=(-0.2, 0.2), corner_high=(0.2, 0.3)),
    )
    lines = (KeepOutLine((circle_polyline(0.12),), "0.5 mT", "keep-out 12 cm"),
             KeepOutLine((circle_polyline(0.05), circle_polyline(0.02, (0.055, 0.0))), "3 mT"))
    return MapScene(view, "Invented bench for a test", shapes, lines, ("invented example",))


@pytest.mark.parametrize("view", ["plan", "elevation"])
def test_svg_carries_every_label(view, tmp_path):
    text = svg_text(scene(view))
    for label in ["0.5 mT, keep-out 12 cm", "3 mT", "disc 20 x 5 mm", "steel plate", "first row",
                  "Key", "along the bench", "10 cm"]:
        assert label in text
    assert ("z, up" in text) == (view == "elevation")  # axes named in the setup frame
    write_svg(scene(view), tmp_path / "map.svg")
    assert (tmp_path / "map.svg").read_text().startswith("<?xml")


def test_pdf_renders_with_its_labels(tmp_path):
    path = tmp_path / "map.pdf"
    write_pdf(scene(), path)
    words = PdfReader(str(path)).pages[0].extract_text()
    for label in ["0.5 mT", "keep-out 12 cm", "3 mT", "first row", "steel plate", "coil"]:
        assert label in words


def test_drawing_is_to_scale():
    drawing = build_drawing(scene(), width_mm=180)
    in_groups = [n for group in drawing.getContents() for n in getattr(group, "contents", [])]  # not the key
    circles = [n for n in in_groups if isinstance(n, Circle)]
    rectangles = [n for n in in_groups if isinstance(n, Rect) and n.strokeDashArray == (4, 3)]
    (disc,) = circles
    (zone,) = rectangles
    # Same scale in both directions and for every shape: 20 mm disc, 0.4 m x 0.1 m zone.
    scale = zone.width / 0.4
    assert zone.height / 0.1 == pytest.approx(scale)
    assert 2 * disc.r / 0.02 == pytest.approx(scale)
    # The stated ratio matches: 1 pt = 25.4/72 mm on paper.
    paper_mm_per_metre = scale * 25.4 / 72
    assert 1000 / paper_mm_per_metre == pytest.approx(float(_stated_ratio(drawing)), rel=1e-2)


def _stated_ratio(drawing):
    for node in drawing.getContents():
        text = getattr(node, "text", "")
        if "1 : " in text:
            return text.split("1 : ")[1].split()[0]
    raise AssertionError("no scale ratio printed")


@pytest.mark.parametrize("longest, expected", [(0.37, 0.2), (0.09, 0.05), (1.0, 1.0), (0.0149, 0.01), (3.3, 2.0)])
def test_round_scale_bar_length(longest, expected):
    # The scale bar uses 1, 2 or 5 times a power of ten (common drafting practice).
    assert round_length(longest) == pytest.approx(expected)


def test_pdf_bytes_render_in_memory():
    buffer = io.BytesIO()
    renderPDF.drawToFile(build_drawing(scene()), buffer)
    assert buffer.getvalue().startswith(b"%PDF")
