"""The PDF checklist: content, escaping, fonts, page furniture, reproducible bytes, non-blank pages.

The assessment here is built by hand (an invented scenario) so the report is tested on its own:
the checks compare the PDF's text with the data it was given, which is independent of how the
report lays it out.
"""
from __future__ import annotations

import datetime
import io
import math

import pypdf
import pytest

from hazards.findings import Finding
from planner.assessment import (Assessment, Contour, InductionFigures, KeepOut, MagnetFigures, PairFigures,
                                ProjectileFigures, ShippingFigures, Threshold, ZoneReach)
from reports.pdf import ReportInputs, render_pdf
from reports.pdf.formatting import quantity
from reports.register import SignOff

FINGERPRINT = "3f" * 32
EPOCH = 1_800_000_000
MARKUP_TITLE = 'Bench of Ελένη in Łódź and 東京 <b>&amp; "quoted" </para>'


def _circle(radius, centre_x=0.0, centre_y=0.0, steps=72):
    return [(centre_x + radius * math.cos(2 * math.pi * k / steps), centre_y + radius * math.sin(2 * math.pi * k / steps))
            for k in range(steps + 1)]


def sample_assessment(title: str = "Invented demonstration bench") -> Assessment:
    """An invented assessment exercising every table (values are demo data, not results)."""
    a = Assessment(title=title, program_version="0.1.0")
    a.thresholds = [
        Threshold("implant_keep_out", 5e-4, "T", "people with active implants", "Source A: implant guidance 2009",
                  "V", kind="field"),
        Threshold("magnetic_cards", 1e-3, "T", "cards <and> media", "Source B: card standard & clause 9", "S",
                  origin="site", default_value=2e-3, reason="our cards are old", kind="field"),
    ]
    a.magnets = [MagnetFigures("disc-a", "cylinder", "50 mm x 25 mm", "N42", 1.3, "middle of the grade's range",
                               2, 0.368, 4.9e-5, 50.0, 0.45, 1.96e-3, 3.9e5, False, 80.0, 9.5e5, "NdFeB")]
    a.keep_out = [KeepOut("implant_keep_out", 5e-4, "disc-a", 0.41, "default", "Source A: implant guidance 2009"),
                  KeepOut("magnetic_cards", 1e-3, "disc-a", 0.33, "site", "Source B: card standard & clause 9")]
    a.contours = [Contour("implant_keep_out", 5e-4, "plan", 0.0125, [_circle(0.41, -0.4)]),
                  Contour("magnetic_cards", 1e-3, "plan", 0.0125, [_circle(0.33, -0.4)]),
                  Contour("implant_keep_out", 5e-4, "elevation", 0.0,
                          [[(x, max(z, 0.0)) for x, z in _circle(0.42, -0.4)]])]
    a.zone_reach = [ZoneReach("front-row", "seating", "implant_keep_out", 5e-4, 2e-6, False, True, ["cards"])]
    a.pairs = [PairFigures("two-discs", "disc-a", "disc-b", "magnet", "sliding_on_bench", 35.0, 12.0, 0.01,
                           12.0 / 7.85e-5, 0.09, 0.05, 0.4, 2.1, None, True, False,
                           ["both brittle: chips may fly"])]
    a.projectiles = [ProjectileFigures("screwdriver", "disc-a", 0.3, 0.12, 0.06, 0.045, False, False)]
    a.induction = [InductionFigures("through-coil", "pass_through_coil",
                                    {"peak_emf_V": 0.012, "peak_current_A": 5.8e-5, "transit_time_s": 0.02}, [])]
    a.shipping = [ShippingFigures("post", ["disc-a"], 20, 0.3, 2e-6, 3e-7, False)]
    a.assumptions = ["Uniform magnetization at the top of the grade's range: fields err high."]
    a.references = ["Reference one: a handbook of magnet design"]
    a.findings = [
        Finding("implants.keep-out", "blocking", "Keep-out line reaches the presenter's path",
                figures=[("implant keep-out distance", "410 mm")], why="Implant wearers may be present.",
                cautions=["Mark the line before doors open."], checklist=["Mark the 0.5 mT line on the floor."],
                sources=[("implant_keep_out", "Source A: implant guidance 2009")]),
        Finding("pinch.two-discs", "action", "Pinch <danger> & snap between two discs",
                figures=[("force at contact", "35 N")], cautions=["Wear safety glasses."],
                checklist=["Keep a spacer between the discs."]),
        Finding("media.cards", "note", "Cards kept outside the 1 mT line", why="Cards may be wiped."),
    ]
    return a


def sample_inputs(**changes) -> ReportInputs:
    values = dict(assessment=sample_assessment(), fingerprint=FINGERPRINT, site="Room 2 <b>", work_date="2027-03-13",
                  audience={"groups": ["staff", "public"], "youngest_age": 8, "implant_wearers": "may_be_present",
                            "size": 80}, created_epoch=EPOCH)
    values.update(changes)
    return ReportInputs(**values)


def pdf_text(data: bytes) -> list[str]:
    return [page.extract_text() for page in pypdf.PdfReader(io.BytesIO(data)).pages]


@pytest.fixture(scope="module")
def sample_pdf() -> bytes:
    return render_pdf(sample_inputs())


def _flat(text: str) -> str:
    return " ".join(text.split())


def test_every_page_carries_title_short_fingerprint_and_page_x_of_y(sample_pdf):
    pages = pdf_text(sample_pdf)
    assert len(pages) >= 4
    for number, text in enumerate(pages, start=1):
        assert FINGERPRINT[:12] in text
        assert f"page {number} of {len(pages)}" in text
        assert "Invented demonstration bench" in text
    assert FINGERPRINT in pages[0]          # the full fingerprint on the first page


def test_first_page_names_site_date_version_audience_and_what_to_settle(sample_pdf):
    first = _flat(pdf_text(sample_pdf)[0])
    for expected in ("Room 2 <b>", "2027-03-13", "benchplan 0.1.0", "members of the public",
                     "youngest 8 years", "Keep-out line reaches the presenter's path"):
        assert expected in first
    assert "2027-01-15" in first            # the printed date is SOURCE_DATE_EPOCH's (1.8e9 s) UTC date


def test_every_finding_title_and_caution_and_checklist_item_appears(sample_pdf):
    text = _flat(" ".join(pdf_text(sample_pdf)))
    for finding in sample_assessment().findings:
        assert finding.title in text
        for caution in finding.cautions:
            assert caution in text
        for item in finding.checklist:
            assert item in text


def test_every_threshold_source_a_figure_uses_is_printed(sample_pdf):
    text = _flat(" ".join(pdf_text(sample_pdf)))
    assessment = sample_assessment()
    used = {k.threshold_id for k in assessment.keep_out} | {c.threshold_id for c in assessment.contours}
    for threshold_id in used:
        assert assessment.threshold(threshold_id).source in text
    assert "our cards are old" in text     # a looser site value carries its written reason


def test_induction_values_print_with_the_unit_named_by_their_key(sample_pdf):
    text = _flat(" ".join(pdf_text(sample_pdf)))
    # 0.012 V = 12 mV; 5.8e-5 A = 58 µA; 0.02 s = 20 ms (SI prefixes, unit from the key's suffix)
    assert "peak emf 12 mV" in text
    assert "peak current 58 µA" in text
    assert "transit time 20 ms" in text


def test_markup_characters_and_non_latin_letters_render_as_text():
    data = render_pdf(sample_inputs(assessment=sample_assessment(MARKUP_TITLE)))
    text = _flat(" ".join(pdf_text(data)))
    assert 'Ελένη in Łódź and 東京 <b>&amp; "quoted" </para>' in text
    assert "Pinch <danger> & snap between two discs" in text


def test_the_body_font_is_embedded_so_names_are_real_text(sample_pdf):
    reader = pypdf.PdfReader(io.BytesIO(sample_pdf))
    embedded = set()
    for page in reader.pages:
        for font in page["/Resources"]["/Font"].values():
            font = font.get_object()
            descriptor = font.get("/FontDescriptor")
            if descriptor is not None and "/FontFile2" in descriptor.get_object():
                embedded.add(str(font["/BaseFont"]))
    assert any("DejaVu" in name for name in embedded), embedded


def test_signoff_entries_fill_the_block_with_names_roles_and_valid_until():
    row = SignOff(1, "2027-02-01T10:00:00+00:00", "approved", "Ελένη Παπαδοπούλου", "Safety officer", "ok",
                  "bench.yaml", "t", FINGERPRINT, "0.1.0", "{}", "0" * 64, "1" * 64)
    data = render_pdf(sample_inputs(signoffs=[row]))
    text = _flat(" ".join(pdf_text(data)))
    assert "Ελένη Παπαδοπούλου" in text and "Safety officer" in text and "2027-02-01" in text
    # default interval 12 months = 365.25 days after 2027-02-01 10:00 UTC -> 2028-02-01 16:00 UTC
    expected = (datetime.datetime(2027, 2, 1, 10) + datetime.timedelta(days=365.25)).date().isoformat()
    assert f"Valid until {expected}" in text


def test_same_inputs_and_epoch_give_identical_bytes_and_another_epoch_does_not(sample_pdf):
    assert render_pdf(sample_inputs()) == sample_pdf
    assert render_pdf(sample_inputs(created_epoch=EPOCH + 86400)) != sample_pdf


def test_no_page_is_blank(sample_pdf):
    pdfium = pytest.importorskip("pypdfium2")
    import numpy as np

    document = pdfium.PdfDocument(sample_pdf)
    for index in range(len(document)):
        image = np.asarray(document[index].render(scale=1.0).to_pil().convert("L"))
        band = image.shape[0] // 10           # leave out the header and footer bands (about 30 mm each)
        dark = np.count_nonzero(image[band:-band] < 128)
        # a body of a few lines of 9 pt text darkens thousands of pixels at 72 dpi; empty gives 0
        assert dark > 1000, f"page {index + 1} looks blank ({dark} dark pixels in the body)"


def test_an_empty_assessment_still_gives_a_complete_document():
    data = render_pdf(sample_inputs(assessment=Assessment(title="Nothing computed", program_version="0.1.0")))
    text = _flat(" ".join(pdf_text(data)))
    for heading in ("Findings", "Checklist before work starts", "Keep-out maps", "Sign-off",
                    "What this document does not replace"):
        assert heading in text


def test_maps_show_the_setup_parts_to_scale_with_the_contour_lines():
    from planner.setup import parse_setup
    from reports.pdf import inputs_from_setup

    setup = parse_setup("""
title: Map bench
magnets:
  - {id: disc-a, shape: cylinder, diameter: 50 mm, height: 25 mm, grade: N42,
     at: [-400 mm, 0 mm, 12.5 mm], magnetization: +z}
zones:
  - {id: desk-b, kind: desk, from: [1 m, -0.5 m, 0 m], to: [1.5 m, 0 m, 0.5 m]}
""")
    inputs = inputs_from_setup(setup, sample_assessment("Map bench"), FINGERPRINT, created_epoch=EPOCH)
    text = _flat(" ".join(pdf_text(render_pdf(inputs))))
    assert "Plan, seen from above" in text and "Elevation, seen from the front" in text
    assert "disc-a" in text and "desk-b" in text
    # the keep-out label carries the Assessment's largest distance for that threshold (0.41 m)
    assert "keep-out up to 410 mm" in text


@pytest.mark.parametrize("key, words, unit", [
    # the Assessment's key convention: snake_case words, then SI unit symbols (`per` = divide)
    ("peak_emf_V", "peak emf", "V"),
    ("drag_constant_N_s_per_m", "drag constant", "N·s/m"),   # F = c v, so c is in N/(m/s) = N·s/m
    ("terminal_speed_m_per_s", "terminal speed", "m/s"),
    ("moment_A_m2", "moment", "A·m²"),
    ("conductivity_S_per_m", "conductivity", "S/m"),
    ("peak_to_full_scale", "peak to full scale", ""),
])
def test_unit_suffixes_of_assessment_keys_are_read_as_units(key, words, unit):
    from reports.pdf.formatting import key_label

    assert key_label(key) == (words, unit)


def _check_report_of(setup_path, assessed=None):
    from planner.assess import assess
    from planner.setup import load_setup
    from reports.fingerprint import fingerprint
    from reports.pdf import inputs_from_setup

    if assessed is None:
        setup = load_setup(setup_path)
        assessment = assess(setup)
    else:
        setup, assessment = assessed
    full = fingerprint(setup)
    data = render_pdf(inputs_from_setup(setup, assessment, full, created_epoch=EPOCH))
    pages = pdf_text(data)
    text = _flat(" ".join(pages))
    assert full in pages[0] and all(full[:12] in page for page in pages)
    for finding in assessment.findings:   # ids between backticks print in Courier, without the backticks
        assert _flat(finding.title.replace("`", "")) in text
    used = {k.threshold_id for k in assessment.keep_out} | {z.threshold_id for z in assessment.zone_reach}
    for threshold_id in used:
        threshold = assessment.threshold(threshold_id)
        if threshold is None:     # a zone's own limit written in the setup (`zone:instrument_limit`), with its value
            value = next(z.threshold_T for z in assessment.zone_reach if z.threshold_id == threshold_id)
            assert ":" in threshold_id and f"own instrument limit ({quantity(value, 'T')}, from the setup)" in text
            continue
        assert _flat(threshold.source) in text
    return data


def test_report_of_a_real_assessment_of_a_small_setup():
    pytest.importorskip("planner.assess")
    from pathlib import Path
    import tempfile

    text = """
title: Small real bench
site_rules: {review_interval: 6 months}
magnets:
  - {id: disc, shape: cylinder, diameter: 20 mm, height: 10 mm, grade: N42,
     at: [0 mm, 0 mm, 5 mm], magnetization: +z}
zones:
  - {id: desk, kind: desk, from: [0.3 m, -0.2 m, 0 m], to: [0.6 m, 0.2 m, 0.3 m], contains: [computers]}
"""
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "small.yaml"
        path.write_text(text, encoding="utf-8")
        _check_report_of(path)


@pytest.mark.slow
@pytest.mark.parametrize("name", ["open-day-induction-bench", "magnet-store-beside-office", "teaching-lab-stations"])
def test_report_of_every_example_setup(name):
    pytest.importorskip("planner.assess")
    from tests.conftest import SETUPS, assessed_example

    _check_report_of(SETUPS / f"{name}.yaml", assessed_example(name))
