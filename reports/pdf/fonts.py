"""Fonts for the report, and turning any text from a setup into safe Paragraph markup.

The body font is DejaVu Sans (wide coverage: Latin with all accents, Greek, Cyrillic, Armenian,
Georgian, Hebrew and many symbols), embedded as a subset so names render as text in any viewer.
It is looked for, in this order:

1. the folder in ``$BENCHPLAN_FONT_DIR`` (holding ``DejaVuSans.ttf`` and ``DejaVuSans-Bold.ttf``);
2. the copy shipped with benchplan in ``reports/fonts`` (DejaVu fonts licence in ``LICENSE_DEJAVU``
   there), so a plain ``pip install`` needs nothing else;
3. the copy that the matplotlib wheel ships in ``matplotlib/mpl-data/fonts/ttf`` (found without
   importing matplotlib), so no system package is needed;
4. Debian's ``fonts-dejavu-core`` in ``/usr/share/fonts/truetype/dejavu``.

If none is found the report falls back to the PDF standard Helvetica and says so on its first
page: letters outside Latin-1 then cannot be shown.

Chinese, Japanese and Korean characters (absent from DejaVu) are set in the standard Adobe
CJK fonts that PDF viewers provide (``STSong-Light``, ``HYSMyeongJo-Medium``): they stay text
(searchable, copyable) and show wherever the viewer has its Asian font support.

Ids in the texts of findings are written between backticks (```magnet-a```), which reads well in
a terminal; :func:`safe_with_code` sets them in the PDF standard monospaced font Courier instead
(every PDF viewer has it, so nothing is embedded) and leaves the backticks out.
"""
from __future__ import annotations

import functools
import importlib.util
import os
from dataclasses import dataclass
from pathlib import Path
from xml.sax.saxutils import escape

from reportlab.pdfbase import pdfmetrics
from reportlab.pdfbase.cidfonts import UnicodeCIDFont
from reportlab.pdfbase.ttfonts import TTFont

REGULAR_FILE, BOLD_FILE = "DejaVuSans.ttf", "DejaVuSans-Bold.ttf"
FONT_DIRECTORY_VARIABLE = "BENCHPLAN_FONT_DIR"
_DEBIAN_DIRECTORY = Path("/usr/share/fonts/truetype/dejavu")
_HAN_FONT, _HANGUL_FONT = "STSong-Light", "HYSMyeongJo-Medium"
#: Monospaced fonts for ids between backticks: PDF standard fonts, Latin-1 only (ids are ASCII).
CODE_FONT, CODE_FONT_BOLD = "Courier", "Courier-Bold"


@dataclass(frozen=True)
class Fonts:
    """Registered font names and where the body font came from."""

    regular: str
    bold: str
    origin: str                 # a path, or "" for the Helvetica fallback
    covered: frozenset[int]     # code points the body font has glyphs for (empty: Latin-1 only)

    @property
    def wide(self) -> bool:
        return bool(self.origin)


def _matplotlib_font_directory() -> Path | None:
    spec = importlib.util.find_spec("matplotlib")
    if spec is None or not spec.submodule_search_locations:
        return None
    return Path(list(spec.submodule_search_locations)[0]) / "mpl-data" / "fonts" / "ttf"


def font_directories() -> list[Path]:
    """Folders searched for DejaVu Sans, in order."""
    folders = []
    if os.environ.get(FONT_DIRECTORY_VARIABLE):
        folders.append(Path(os.environ[FONT_DIRECTORY_VARIABLE]))
    folders.append(Path(__file__).resolve().parents[1] / "fonts")
    matplotlib_folder = _matplotlib_font_directory()
    if matplotlib_folder is not None:
        folders.append(matplotlib_folder)
    folders.append(_DEBIAN_DIRECTORY)
    return folders


@functools.lru_cache(maxsize=None)
def _register(directory: str) -> Fonts:
    folder = Path(directory)
    regular = TTFont("BenchplanBody", str(folder / REGULAR_FILE))
    bold = TTFont("BenchplanBold", str(folder / BOLD_FILE))
    pdfmetrics.registerFont(regular)
    pdfmetrics.registerFont(bold)
    pdfmetrics.registerFontFamily("BenchplanBody", normal="BenchplanBody", bold="BenchplanBold",
                                  italic="BenchplanBody", boldItalic="BenchplanBold")
    for name in (_HAN_FONT, _HANGUL_FONT):
        pdfmetrics.registerFont(UnicodeCIDFont(name))
    covered = frozenset(regular.face.charToGlyph)
    return Fonts("BenchplanBody", "BenchplanBold", str(folder / REGULAR_FILE), covered)


def report_fonts() -> Fonts:
    """Register and return the report's fonts (DejaVu Sans if found, else Helvetica)."""
    for folder in font_directories():
        if (folder / REGULAR_FILE).is_file() and (folder / BOLD_FILE).is_file():
            return _register(str(folder))
    for name in (_HAN_FONT, _HANGUL_FONT):
        pdfmetrics.registerFont(UnicodeCIDFont(name))
    return Fonts("Helvetica", "Helvetica-Bold", "", frozenset(range(256)))


def _fallback_font(character: str) -> str | None:
    code = ord(character)
    if 0xAC00 <= code <= 0xD7AF or 0x1100 <= code <= 0x11FF or 0x3130 <= code <= 0x318F:
        return _HANGUL_FONT
    if (0x2E80 <= code <= 0x9FFF or 0xF900 <= code <= 0xFAFF or 0xFF00 <= code <= 0xFFEF
            or 0x20000 <= code <= 0x2FFFF):
        return _HAN_FONT
    return None


def runs(text: str, fonts: Fonts) -> list[tuple[str, str]]:
    """Split plain text into (text, font name) runs: the body font, or a CJK font where it lacks glyphs."""
    result: list[tuple[str, str]] = []
    for character in text:
        font = (None if ord(character) in fonts.covered else _fallback_font(character)) or fonts.regular
        if result and result[-1][1] == font:
            result[-1] = (result[-1][0] + character, font)
        else:
            result.append((character, font))
    return result


def safe(text, fonts: Fonts | None = None) -> str:
    """Any text (from a setup, a finding, a register) as Paragraph markup that shows it literally.

    Escapes ``&``, ``<`` and ``>`` (so ``<b>&`` prints as written and never as markup), keeps
    line breaks, and sets runs of CJK characters that the body font lacks in a CJK font.
    """
    fonts = fonts or report_fonts()
    text = "" if text is None else str(text)
    pieces: list[str] = []
    run_font, run = None, ""
    for character in text:
        font = None if ord(character) in fonts.covered else _fallback_font(character)
        if font != run_font and run:
            pieces.append(_wrap(run, run_font))
            run = ""
        run_font = font
        run += character
    if run:
        pieces.append(_wrap(run, run_font))
    return "".join(pieces).replace("\n", "<br/>")


def _wrap(run: str, font: str | None) -> str:
    escaped = escape(run)
    return f'<font name="{font}">{escaped}</font>' if font else escaped


def safe_with_code(text, fonts: Fonts | None = None, bold: bool = False) -> str:
    """Like :func:`safe`, but text between a pair of backticks is set in Courier, without the backticks.

    Finding titles and checklist items name ids as ```magnet-a```. A span is set in
    :data:`CODE_FONT` (:data:`CODE_FONT_BOLD` when ``bold``, for bold headings) if it is
    non-empty printable ASCII, the characters Courier has; any other span, and an unpaired
    backtick, are shown as written. Everything is escaped as :func:`safe` does, so ``<``, ``>``
    and ``&`` print as themselves inside and outside the spans.

    >>> safe_with_code("Move `desk-1` & <b>", Fonts("F", "FB", "", frozenset(range(256))))
    'Move <font name="Courier">desk-1</font> &amp; &lt;b&gt;'
    """
    fonts = fonts or report_fonts()
    parts = ("" if text is None else str(text)).split("`")
    if len(parts) % 2 == 0:  # an odd number of backticks: the last one has no partner
        parts[-2:] = [parts[-2] + "`" + parts[-1]]
    pieces = []
    for index, part in enumerate(parts):
        if index % 2 == 0:
            pieces.append(safe(part, fonts))
        elif part and all(" " <= character <= "~" for character in part):
            pieces.append(f'<font name="{CODE_FONT_BOLD if bold else CODE_FONT}">{escape(part)}</font>')
        else:
            pieces.append(safe(f"`{part}`", fonts))
    return "".join(pieces)
