"""What the two PDF renderers share: paper, points per millimetre, fonts, the build date, the scale bar.

Page geometry is in PDF points (1/72 in); model figures are in mm and are
turned into points only here (``MM``), never rescaled anywhere else.
"""

from __future__ import annotations

import datetime as _dt
import os
from pathlib import Path

from reportlab.lib.pagesizes import A4, letter

from ..model.spar import Spar
from ..units import MM_PER_INCH

MM = 72.0 / MM_PER_INCH  # points per millimetre: 100 mm = 283.46 pt, 1 in = 72 pt
PAPER = {"letter": letter, "a4": A4}  # portrait (width, height) in points

FONT = "Helvetica"
BOLD = "Helvetica-Bold"
ITALIC = "Helvetica-Oblique"

# Characters the standard PDF fonts (WinAnsi) cannot show, with what to print instead.
_PLAIN = {"≥": ">=", "≤": "<=", "⁴": "^4", "φ": "phi", "●": "*", "→": "->", "←": "<-", "≈": "~",
          "√": "sqrt", "π": "pi", "\u2009": " ", "\u202f": " "}


def plain(text: str) -> str:
    """``text`` with every character the standard fonts lack replaced by a plain spelling."""
    out = []
    for ch in text:
        ch = _PLAIN.get(ch, ch)
        try:
            ch.encode("cp1252")
        except UnicodeEncodeError:
            ch = "?"
        out.append(ch)
    return "".join(out)


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
