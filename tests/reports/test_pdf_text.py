"""Text of the PDF report: quantities with the micro sign, ids of findings in a monospaced font.

The report's text is read back with pypdf, independently of how the report lays it out.

Expected quantity strings follow from the SI prefixes (BIPM SI Brochure, 9th ed., 2019, table 7:
k = 1e3, m = 1e-3, micro = 1e-6 with the symbol µ, n = 1e-9), rounded to three significant figures.
"""
from __future__ import annotations

import io
import math

import pypdf
import pytest

from hazards.findings import Finding
from reports.pdf import render_pdf
from reports.pdf.fonts import Fonts, safe_with_code
from reports.pdf.formatting import quantity
from tests.reports.test_pdf import pdf_text, sample_assessment, sample_inputs


@pytest.mark.parametrize("value, unit, text", [
    (1.5e-6, "T", "1.5 µT"),        # micro = 1e-6, written with the micro sign in the PDF
    (5.8e-5, "A", "58 µA"),
    (5e-4, "T", "0.5 mT"),          # fields in mT from 0.1 mT up
    (5e-8, "T", "50 nT"),           # ... in nT below 0.1 µT
    (0.0125, "m", "12.5 mm"),
    (2.5e-6, "m", "2.5 µm"),
    (1507.0, "g", "1.51 kg"),       # 1507 g = 1.507 kg (kilo on the gram), three figures
    (0.25, "kg", "250 g"),
    (1234.0, "rpm", "1 230 rpm"),   # no prefix for rpm; three figures, digits grouped in threes (5.4.4)
    (-2500.0, "V", "-2.5 kV"),
    (0.0, "T", "0 T"),
])
def test_quantity_writes_si_prefixes_with_the_micro_sign(value, unit, text):
    assert quantity(value, unit) == text


@pytest.mark.parametrize("value", [5e-8, 3.2e-7, 2e-5, 4.5e-4, 0.0125, 0.4, 1.32])
def test_terminal_and_pdf_write_fields_and_lengths_alike(value):
    # identity: one choice of prefixes for both (planner.units), only micro is spelt u or µ
    from hazards.findings import show

    assert show(value, "field").replace("u", "µ") == quantity(value, "T")
    assert show(value, "length").replace("u", "µ") == quantity(value, "m")


def test_quantity_words_for_missing_and_unbounded_values():
    assert quantity(None, "m") == "-"
    assert quantity(math.inf, "m") == "no limit"
    assert quantity(math.nan, "m") == "not defined"


# --- ids between backticks ---------------------------------------------------------------------------------

LATIN_1 = Fonts("Helvetica", "Helvetica-Bold", "", frozenset(range(256)))  # the fallback fonts, no CJK runs


@pytest.mark.parametrize("text, markup", [
    # a pair of backticks: the id in Courier, backticks dropped
    ("Move `desk-1` now", 'Move <font name="Courier">desk-1</font> now'),
    # markup characters are escaped inside and outside the span (XML 1.0, 2.4: & < > as entities)
    ("`a<b>` & <i>", '<font name="Courier">a&lt;b&gt;</font> &amp; &lt;i&gt;'),
    # an unpaired backtick is shown as written
    ("one ` left", "one ` left"),
    ("`x` and ` left", '<font name="Courier">x</font> and ` left'),
    # an empty span, or one with letters Courier (Latin-1 at most) may lack, keeps its backticks
    ("a `` b", "a `` b"),
    ("`Łódź`", "`Łódź`"),
])
def test_ids_between_backticks_become_courier_markup(text, markup):
    assert safe_with_code(text, LATIN_1) == markup


def test_bold_headings_use_bold_courier():
    assert safe_with_code("`m-1`", LATIN_1, bold=True) == '<font name="Courier-Bold">m-1</font>'


def _fonts_on_pages(data: bytes) -> set[str]:
    names = set()
    for page in pypdf.PdfReader(io.BytesIO(data)).pages:
        for font in page["/Resources"]["/Font"].values():
            names.add(str(font.get_object()["/BaseFont"]).lstrip("/"))
    return names


def test_finding_ids_print_without_backticks_and_markup_characters_stay_text():
    assessment = sample_assessment()
    assessment.findings = [
        Finding("pinch.magnet-a", "blocking", "`magnet-a` and `plate<7>` pinch <b>fingers</b> & more",
                why="Keep `magnet-a` in its <case>.", cautions=["Hold `magnet-a` by its keeper & spacer."],
                checklist=["Store `magnet-a` on its keeper, label <here>."]),
        Finding("media.cards", "note", "Cards kept outside the 1 mT line around `magnet-a`"),
    ]
    data = render_pdf(sample_inputs(assessment=assessment))
    text = " ".join(" ".join(page.split()) for page in pdf_text(data))
    assert "magnet-a and plate<7> pinch <b>fingers</b> & more" in text    # title: ids bare, markup as text
    assert "Keep magnet-a in its <case>." in text
    assert "Hold magnet-a by its keeper & spacer." in text
    assert "Store magnet-a on its keeper, label <here>." in text
    assert "Cards kept outside the 1 mT line around magnet-a" in text
    assert "`" not in text
    assert {"Courier", "Courier-Bold"} <= _fonts_on_pages(data)            # the ids are set in Courier
