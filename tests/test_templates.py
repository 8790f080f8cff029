"""One template model (``Layout.templates``), drawn by the DXF and the full-size PDF alike.

- A shop rule (common practice): a template marks only what is on its own piece. Every stave shares the
  spar's stations, so another stave's scarf centre or segment end falls on this piece too; marked, it
  would send a builder looking for a scarf that is not there. This stave's own scarf centres are marked.
- The two renderers draw the same marks: the DXF read back with the independent group-code reader of
  tests/test_dxf.py (mark lines across each outline at the template's positions), the full-size PDF read
  back with pdfplumber (every figure the DXF prints beside a mark is printed on the PDF too).
"""

from __future__ import annotations

import re

import pdfplumber
import pytest
import shapely
from shapely.geometry import Polygon

from conftest import SAMPLES, SPAR_SAMPLES
from test_dxf import MM_PER, read_dxf

from stavegen.model.loader import load_spar
from stavegen.pipeline import design
from stavegen.render.dxf_templates import CUT, write_templates
from stavegen.render.pdf_fullsize import write_fullsize

NEAR = 0.05  # mm: two stations closer than this are one


@pytest.fixture(scope="module", params=[p.name for p in SPAR_SAMPLES])
def laid_out(request):
    return design(load_spar(SAMPLES / request.param), layout=True)


def test_a_template_marks_its_own_scarfs_and_not_the_other_staves(laid_out):
    layout = laid_out.layout
    centres = layout.scarfs.centres
    checked_other = 0
    for seg in layout.segments:
        t = layout.template_of[seg.label]
        assert seg.label in t.labels
        own = centres[seg.stave - 1]
        at = {round(m.x, 6): m for m in t.marks}
        for mark in t.marks:
            if mark.kind == "scarf centre":
                assert any(abs(mark.z - c) < NEAR for c in own), (seg.label, mark)
        for c in own:  # every scarf of this stave that falls on the piece is marked
            if seg.start < c < seg.end:
                assert any(abs(m.z - c) < NEAR for m in t.marks), (seg.label, c)
        for tick in seg.ticks:
            reasons = set(tick.reasons)
            if reasons <= {"scarf", "segment end"} and not any(abs(tick.z - c) < NEAR for c in own):
                checked_other += 1
                assert round(tick.x, 6) not in at, (seg.label, tick)  # another stave's: not on this piece
        # marks in order along the piece, and labelled ones never closer than the template's label gap
        xs = [m.x for m in t.marks]
        assert xs == sorted(xs) and all(0 < x < seg.length for x in xs)
    if sum(len(c) for c in centres) > len(centres):  # staggered scarfs: other staves' marks were there to leave off
        assert checked_other > 0


@pytest.fixture(scope="module")
def drawn(laid_out, tmp_path_factory):
    """The sample's templates DXF and full-size PDF, written once: (the DXF read back, the PDF's path)."""
    folder = tmp_path_factory.mktemp("drawn")
    dxf_path, pdf_path = folder / "t.dxf", folder / "t.pdf"
    write_templates(laid_out, dxf_path)
    write_fullsize(laid_out, pdf_path)
    return read_dxf(dxf_path), pdf_path


def test_dxf_and_fullsize_pdf_draw_the_same_marks(laid_out, drawn):
    spar, layout = laid_out.spar, laid_out.layout
    unit = MM_PER[spar.units]
    dxf, pdf_path = drawn

    # The DXF: each outline's mark lines sit at its template's marks, square across the piece.
    outlines = [Polygon([(x * unit, y * unit) for x, y in e.points]) for e in dxf.on(CUT, "LWPOLYLINE")]
    # a segment's label; a two-piece spar's are lettered with their part (L-S1-1, U-S1-1)
    labels = [t for t in dxf.on("TEXT-LABELS", "TEXT") if re.fullmatch(r"(?:[LU]-)?S\d+-\d+", t.first(1))]
    lines = [((float(e.first(10)) * unit, float(e.first(20)) * unit), (float(e.first(11)) * unit,
              float(e.first(21)) * unit)) for e in dxf.on("MARK-STATIONS", "LINE")]
    for poly in outlines:
        label = next(t.first(1) for t in labels if poly.contains(shapely.Point(*[c * unit for c in t.anchor])))
        t = layout.template_of[label]
        x0 = poly.bounds[0]
        near = poly.buffer(1e-6)
        drawn = sorted(a[0] - x0 for a, b in lines if near.contains(shapely.LineString([a, b])))
        assert drawn == pytest.approx(sorted(m.x for m in t.marks), abs=1e-6), label

    # The full-size PDF: every figure the DXF prints beside a mark, the PDF prints too.
    with pdfplumber.open(pdf_path) as pdf:
        text = "\n".join(page.extract_text() or "" for page in pdf.pages)
    figures = [e.first(1) for e in dxf.on("TEXT-STATIONS", "TEXT")]
    assert figures
    for line in figures:
        for part in line.split("  "):
            assert part in text, part


def test_dxf_and_fullsize_pdf_draw_the_same_end_views(laid_out, drawn):
    """The end views are one model (``Layout.end_views``): the DXF's end-view outlines (read back with the
    independent group-code reader) are the model's, shape for shape, and every caption the DXF prints under an
    end view is printed on the full-size PDF's end-view pages too (pdfplumber), unless the view is too large
    for a page and the PDF says so."""
    from stavegen.layout.end_views import ROLES
    from stavegen.render.dxf_templates import END_LAYERS
    from stavegen.render.figures import Figures
    from stavegen.render.template_words import end_view_caption

    spar, layout = laid_out.spar, laid_out.layout
    unit = MM_PER[spar.units]
    dxf, pdf_path = drawn
    for role in ROLES:
        drawn = sorted(round(Polygon([(x * unit, y * unit) for x, y in e.points]).area, 1)
                       for e in dxf.on(END_LAYERS[role], "LWPOLYLINE"))
        model = sorted(round(Polygon(o.points).area, 1) for v in layout.end_views for o in v.outlines
                       if o.role == role)
        assert drawn == pytest.approx(model, abs=0.2), role
    with pdfplumber.open(pdf_path) as pdf:
        text = " ".join(" ".join((page.extract_text() or "").split()) for page in pdf.pages
                        if "end views at 1:1" in (page.extract_text() or ""))
    fig = Figures(spar)
    for view in layout.end_views:
        first = end_view_caption(fig, view)[0]
        assert first in " ".join(t.first(1) for t in dxf.on("SHEET-NOTES", "TEXT"))
        assert first in text
