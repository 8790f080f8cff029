"""What the two PDF renderers share: paper, points per millimetre, fonts, the build date, the scale bar.

Page geometry is in PDF points (1/72 in); model figures are in mm and are
turned into points only here (``MM``), never rescaled anywhere else.
"""

from __future__ import annotations

import datetime as _dt
import os
from pathlib import Path

from reportlab.lib.pagesizes import A4, letter
from reportlab.pdfbase import pdfmetrics
from reportlab.pdfbase.ttfonts import TTFont

from ..model.spar import Spar
from ..units import MM_PER_INCH

MM = 72.0 / MM_PER_INCH  # points per millimetre: 100 mm = 283.46 pt, 1 in = 72 pt
PAPER = {"letter": letter, "a4": A4}  # portrait (width, height) in points

# The PDFs' fonts: Liberation Sans (regular, bold, italic), which has Helvetica's metrics, shipped in fonts/
# with its licence (the SIL Open Font License: free to bundle and redistribute) and embedded, subset, in every
# PDF, so that text in Latin, Greek (polytonic too) or Cyrillic script (a spar's name, a wood's) prints
# as written, and so do the signs the papers use (≥ ≤ ⁴ φ • → ≈ √ π). CJK scripts are not in the font:
# their characters would print as empty boxes (see :func:`lacks_glyphs`).
FONT = "LiberationSans"
BOLD = "LiberationSans-Bold"
ITALIC = "LiberationSans-Italic"
_FONT_FILES = {FONT: "LiberationSans-Regular.ttf", BOLD: "LiberationSans-Bold.ttf", ITALIC: "LiberationSans-Italic.ttf"}


def _register_fonts() -> None:
    registered = set(pdfmetrics.getRegisteredFontNames())
    folder = Path(__file__).resolve().parent / "fonts"
    for name, file in _FONT_FILES.items():
        if name not in registered:
            pdfmetrics.registerFont(TTFont(name, str(folder / file)))
    pdfmetrics.registerFontFamily(FONT, normal=FONT, bold=BOLD, italic=ITALIC, boldItalic=BOLD)


_register_fonts()


def lacks_glyphs(text: str, font: str = FONT) -> str:
    """The characters of ``text`` the PDFs' font has no glyph for (they would print as empty boxes)."""
    face = pdfmetrics.getFont(font).face
    return "".join(dict.fromkeys(ch for ch in text if ord(ch) not in face.charToGlyph and not ch.isspace()))


def ask_actual_size(canvas) -> None:
    """Ask PDF viewers to print the document at actual size (the viewer preference PrintScaling /None):
    the templates are full size and the report's drawings carry a scale."""
    canvas.setViewerPreference("PrintScaling", "None")


def paper_size(spar: Spar, landscape: bool = False) -> tuple[float, float]:
    """The spar's chosen paper (``output.paper``), in points, portrait or landscape."""
    w, h = PAPER[spar.output.paper]
    return (h, w) if landscape else (w, h)


def build_date() -> str:
    """Today as YYYY-MM-DD, or the date of ``SOURCE_DATE_EPOCH`` when set (reproducible documents)."""
    epoch = os.environ.get("SOURCE_DATE_EPOCH")
    if epoch and epoch.strip().isdigit():
        return _dt.datetime.fromtimestamp(int(epoch), _dt.timezone.utc).date().isoformat()
    return _dt.date.today().isoformat()


def source_name(spar: Spar) -> str:
    """The spar file's name for page footers (without its folder)."""
    return Path(spar.source).name if spar.source else "(spar given in code)"


def scale_bar_length(spar: Spar) -> tuple[float, str, int]:
    """(length in points, words for it, number of divisions): 4 in for inch spars, 100 mm for metric."""
    if spar.units == "in":
        return 4 * 72.0, '4 in', 4
    return 100 * MM, "100 mm", 10


def draw_scale_bar(canvas, x: float, y: float, spar: Spar, height: float = 5.0) -> float:
    """A check bar at (x, y) (its lower left corner, points): ONE rectangle exactly 4 in or 100 mm long.

    Alternate divisions are filled so the bar reads like a rule; returns the bar's length in points.
    """
    length, words, parts = scale_bar_length(spar)
    step = length / parts
    canvas.saveState()
    canvas.setLineWidth(0.5)
    canvas.setFillGray(0.0)
    for k in range(0, parts, 2):
        canvas.rect(x + k * step, y, step, height, stroke=0, fill=1)
    canvas.rect(x, y, length, height, stroke=1, fill=0)
    canvas.setFont(FONT, 6)
    for k in range(parts + 1):
        label = str(k) if spar.units == "in" else str(10 * k)
        canvas.drawCentredString(x + k * step, y - 7, label if k < parts else f"{label} {words.split()[1]}")
    canvas.restoreState()
    return length
