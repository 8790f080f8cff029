"""Names in any script print in both PDFs, and both ask viewers to print at actual size.

Read back with two independent PDF readers (pypdf and pdfplumber): the spar's name, written in Greek and
Cyrillic, comes back exactly, from a font embedded in the file; and the document catalog carries the
viewer preference PrintScaling /None (PDF 1.7, ISO 32000-1, table 150: "None" asks the print dialog not
to scale the pages).
"""

from __future__ import annotations

import tomllib

import pdfplumber
import pytest
from pypdf import PdfReader

from stavegen.boat import design_boat
from stavegen.model.boat import load_boat
from stavegen.model.loader import parse_spar
from stavegen.pipeline import design
from stavegen.render.boat_report import write_boat_report
from stavegen.render.pdf_common import lacks_glyphs
from stavegen.render.pdf_fullsize import write_fullsize
from stavegen.render.pdf_report import write_report

from conftest import SAMPLES

NAME = "Ιστός Мачта №2 — Ωμέγα ёжик"  # Greek and Cyrillic letters, with accents, a numero sign and a dash
WOOD = "Ель ситхинская"  # a custom wood named in Russian


@pytest.fixture(scope="module")
def pdfs(tmp_path_factory):
    data = tomllib.loads((SAMPLES / "daysailer-mast.toml").read_text(encoding="utf-8"))
    data["spar"]["name"] = NAME
    data["hollow"]["wood"] = {"name": WOOD, "moe": "1.57e6 psi", "mor": "10200 psi", "density": "28 lb/ft3"}
    d = design(parse_spar(data, "greek.toml"), layout=True)
    folder = tmp_path_factory.mktemp("fonts")
    report, full = folder / "report.pdf", folder / "fullsize.pdf"
    write_report(d, report)
    write_fullsize(d, full)
    return {"report": report, "fullsize": full}


def _text_pypdf(path) -> str:
    return " ".join(page.extract_text() for page in PdfReader(path).pages[:3])


def _text_pdfplumber(path) -> str:
    with pdfplumber.open(path) as pdf:
        return " ".join(page.extract_text() for page in pdf.pages[:3])


@pytest.mark.parametrize("which", ["report", "fullsize"])
def test_a_greek_and_cyrillic_name_reads_back_exactly(pdfs, which):
    for text in (_text_pypdf(pdfs[which]), _text_pdfplumber(pdfs[which])):
        assert NAME in text
        assert "?????" not in text
    if which == "report":
        assert WOOD in _text_pypdf(pdfs[which])


@pytest.mark.parametrize("which", ["report", "fullsize"])
def test_every_character_is_drawn_in_the_embedded_font(pdfs, which):
    with pdfplumber.open(pdfs[which]) as pdf:
        used = {c["fontname"] for page in pdf.pages[:3] for c in page.chars}
    assert used and all("Liberation" in name for name in used), used
    reader = PdfReader(pdfs[which])
    for font in reader.pages[0]["/Resources"]["/Font"].values():
        font = font.get_object()
        if "Liberation" in str(font["/BaseFont"]):  # a TrueType font: its glyphs travel with the file
            assert "/FontFile2" in font["/FontDescriptor"].get_object()


@pytest.mark.parametrize("which", ["report", "fullsize"])
def test_viewers_are_asked_to_print_at_actual_size(pdfs, which):
    catalog = PdfReader(pdfs[which]).trailer["/Root"]
    assert catalog["/ViewerPreferences"]["/PrintScaling"] == "/None"


def test_the_boat_report_prints_a_cyrillic_boat_name(tmp_path):
    text = (SAMPLES / "daysailer.toml").read_text(encoding="utf-8")
    boat = tmp_path / "boat.toml"
    data = tomllib.loads(text)
    name = data["boat"]["name"]
    boat.write_text(text.replace(f'"{name}"', '"Шлюп Ἀθηνᾶ"', 1), encoding="utf-8")
    for spar in SAMPLES.glob("daysailer-*.toml"):
        (tmp_path / spar.name).write_text(spar.read_text(encoding="utf-8"), encoding="utf-8")
    bd = design_boat(load_boat(boat))
    path = tmp_path / "boat.pdf"
    write_boat_report(bd, path)
    reader = PdfReader(path)
    assert "Шлюп Ἀθηνᾶ" in reader.pages[0].extract_text()
    assert reader.trailer["/Root"]["/ViewerPreferences"]["/PrintScaling"] == "/None"


def test_the_font_covers_greek_and_cyrillic_not_cjk():
    """What the font covers, by the Unicode blocks: every letter of basic Greek (U+0386–U+03CE) and of
    Cyrillic (U+0400–U+045F), Latin-1 and Latin Extended-A; CJK ideographs are not in it."""
    blocks = [range(0x0386, 0x03CF), range(0x0400, 0x0460), range(0x00C0, 0x0100), range(0x0100, 0x0180)]
    letters = "".join(chr(c) for block in blocks for c in block if chr(c).isalpha())
    assert lacks_glyphs(letters) == ""
    assert lacks_glyphs("帆柱") == "帆柱"
