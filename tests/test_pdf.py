"""The two PDFs, read back with independent tools: pypdf and pdfplumber for text, sizes and drawn objects,
pdftoppm (poppler) for rendering, shapely for the tiling. Expected figures come from the CSV and JSON
outputs and from exact facts of the paper and the inch:

- 1 in = 72 pt and 1 in = 25.4 mm exactly (PDF and international inch), so 4 in = 288 pt and
  100 mm = 283.46 pt;
- letter is 8 1/2 × 11 in = 612 × 792 pt; A4 is 210 × 297 mm = 595.28 × 841.89 pt (ISO 216);
- ordinary desktop printers leave at most about 1/4 in unprinted at each edge (common practice).
"""

from __future__ import annotations

import csv
import io
import json
import os
import re
import shutil
import subprocess

import pdfplumber
import pytest
from pypdf import PdfReader
from shapely.geometry import Polygon, box
from shapely.ops import unary_union

from stavegen.cautions import CAUTIONS, HEADLINE
from stavegen.model.loader import load_spar
from stavegen.pipeline import design
from stavegen.render.csv_cutlist import to_csv
from stavegen.render.json_doc import to_json
from stavegen.render.pdf_fullsize import end_pages, crosses, pages_of, sheet, write_fullsize
from stavegen.render.pdf_report import write_report
from stavegen.units import format_length, format_mass

from stavegen.render.figures import Figures
from conftest import SAMPLES, cut_list, make_spar

PT_PER_MM = 72 / 25.4
SCALE_BAR_PT = {"in": 288.0, "mm": 283.46}  # 4 in; 100 mm
PAPER_PT = {"letter": (612.0, 792.0), "a4": (595.28, 841.89)}
PRINTER_MARGIN_PT = 18.0  # 1/4 in
BUILD_DAY = "2023-11-14"  # SOURCE_DATE_EPOCH 1700000000 is 2023-11-14 22:13:20 UTC

SPARS = {"mast": ("daysailer-mast.toml", "in", "letter"), "yawl": ("yawl-mainmast-metric.toml", "mm", "a4")}


def _flat(text: str) -> str:
    return " ".join(text.split())


@pytest.fixture(scope="module", params=sorted(SPARS))
def built(request, tmp_path_factory):
    """Both PDFs of one sample spar, with what an independent reader makes of them."""
    name, units, paper = SPARS[request.param]
    folder = tmp_path_factory.mktemp(request.param)
    with pytest.MonkeyPatch.context() as mp:
        mp.setenv("SOURCE_DATE_EPOCH", "1700000000")
        d = design(load_spar(SAMPLES / name), layout=True)
        report, full = folder / "report.pdf", folder / "fullsize.pdf"
        write_report(d, report)
        write_fullsize(d, full)
    with pdfplumber.open(report) as pdf:
        report_lines = [page.extract_text().splitlines() for page in pdf.pages]
    with pdfplumber.open(full) as pdf:
        full_pages = [{"text": page.extract_text(), "rects": page.rects, "lines": page.lines, "curves": page.curves,
                       "size": (float(page.width), float(page.height))} for page in pdf.pages]
    return {"design": d, "units": units, "paper": paper, "report": report, "fullsize": full, "name": name,
            "report_pages": [p.extract_text() for p in PdfReader(report).pages], "report_lines": report_lines,
            "full_pages": full_pages}


# The report -----------------------------------------------------------------------------------------------


def test_report_page_one_carries_the_verdict_and_the_cautions(built):
    d = built["design"]
    page1 = _flat(built["report_pages"][0])
    assert d.spar.name in page1
    assert HEADLINE in page1
    for caution in CAUTIONS:
        assert _flat(caution) in page1, caution
    everything = _flat(" ".join(built["report_pages"]))
    word, other = ("PASS", "FAIL") if d.passed else ("FAIL", "PASS")
    assert word in page1 and other not in everything
    doc = json.loads(to_json(d))
    assert f"{doc['check']['min_ei_ratio']:.3f}" in page1
    assert format_mass(doc["mass"]["hollow_kg"], built["units"]) in page1
    assert format_mass(doc["mass"]["plan_kg"], built["units"]) in page1
    assert format_mass(doc["mass"]["saved_kg"], built["units"]) in page1


def test_every_report_page_names_the_spar_file_date_and_page(built):
    pages = built["report_pages"]
    assert len(pages) >= 3
    for number, text in enumerate(pages, start=1):
        flat = _flat(text)
        assert f"page {number} of {len(pages)}" in flat
        assert built["name"] in flat and BUILD_DAY in flat and built["design"].spar.name in flat


def test_report_cut_list_matches_the_csv_and_json(built):
    from stavegen.render.pdf_report import _BOARD_COLUMN, _CUT_COLUMNS

    d = built["design"]
    _, rows, _ = cut_list(to_csv(d))
    header = list(rows[0])
    shown = [next(h for h in header if h.startswith(w) and "decimal" not in h) for w in _CUT_COLUMNS + (_BOARD_COLUMN,)]
    lines = [line for page in built["report_lines"] for line in page]
    doc = json.loads(to_json(d))
    lengths = {seg["label"]: seg["length_mm"] for stave in doc["staves"] for seg in stave["segments"]}
    assert len(rows) == len(lengths) == len(d.layout.segments)
    fig = Figures(d.spar)
    for row in rows:
        expected = " ".join(row[k] for k in shown)
        found = [line for line in lines if line.startswith(row["label"] + " ")]
        assert expected in found, (expected, found)
        length_col = next(k for k in header if k.startswith("length along face"))
        # A length to cut, rounded up: never shorter than the segment.
        assert row[length_col] == fig.cell("cut-length", lengths[row["label"]])


def test_report_station_table_matches_the_json(built):
    doc = json.loads(to_json(built["design"]))
    lines = [line for page in built["report_lines"] for line in page]
    for st in doc["stations"]:
        pos = (format_length(st["z_mm"], "in", tape=True) if built["units"] == "in" else f"{st['z_mm']:.1f}")
        ratios = f"{st['ei_ratio']:.3f} {st['strength_ratio']:.3f}"
        assert any(line.startswith(pos + " ") and ratios in line for line in lines), (pos, ratios)


def test_report_paper_and_rendering(built, tmp_path):
    w, h = PAPER_PT[built["paper"]]
    reader = PdfReader(built["report"])
    for page in reader.pages:
        assert float(page.mediabox.width) == pytest.approx(w, abs=0.01)
        assert float(page.mediabox.height) == pytest.approx(h, abs=0.01)
    if shutil.which("pdftoppm") is None:
        pytest.skip("pdftoppm (poppler) is not installed")
    done = subprocess.run(["pdftoppm", "-r", "20", "-png", str(built["report"]), str(tmp_path / "p")],
                          capture_output=True, text=True, timeout=60)
    assert done.returncode == 0 and not done.stderr.strip(), done.stderr
    assert len(list(tmp_path.glob("p-*.png"))) == len(reader.pages)


def test_a_failing_spar_says_fail(tmp_path):
    d = design(load_spar(SAMPLES / "skiff-boom-too-light.toml"), layout=True)
    assert not d.passed
    write_report(d, tmp_path / "r.pdf")
    text = _flat(" ".join(p.extract_text() for p in PdfReader(tmp_path / "r.pdf").pages))
    assert "FAIL" in text and "PASS" not in text and "short by" in text


def test_report_without_a_layout_has_no_cut_list(tmp_path):
    d = design(load_spar(SAMPLES / "daysailer-mast.toml"))
    write_report(d, tmp_path / "r.pdf")
    text = _flat(" ".join(p.extract_text() for p in PdfReader(tmp_path / "r.pdf").pages))
    assert "Station by station" in text and "Cut list" not in text and "Scarf map" not in text


def _section_lines(built, heading: str, until: str) -> list[str]:
    """The report's text lines from the line ``heading`` up to the next line starting with ``until``."""
    lines = [line for page in built["report_lines"] for line in page]
    start = lines.index(heading)
    end = next(i for i in range(start + 1, len(lines)) if lines[i].startswith(until))
    return lines[start:end]


def test_report_board_order_matches_the_json_stock(built):
    """Boards to buy by size, the tallies, the bound and the yield: the JSON ``stock`` figures, read back."""
    units = built["units"]
    stock = json.loads(to_json(built["design"]))["stock"]
    lines = _section_lines(built, "Board order", "Cutting diagrams")
    text = _flat(" ".join(lines))
    used = {(b["width_mm"], b["length_mm"]): b["count"] for b in stock["used"]}
    for b in stock["boards"]:
        # The size as sold: dressed width, and the length in feet or mm.
        if units == "in":
            size = (format_length(b["width_mm"], units), f"{b['length_mm'] / 304.8:g} ft")
        else:
            size = (f"{b['width_mm']:g} mm", f"{b['length_mm']:g} mm")
        each, total = f"{b['board_feet_each']:.1f}", f"{b['count'] * b['board_feet_each']:.1f}"
        ending = f"{each} {used[(b['width_mm'], b['length_mm'])]} {b['count']} {total}"
        if units == "mm":  # nominal cubic metres: count x nominal thickness x nominal width x length
            m3 = b["count"] * b["nominal_thickness_mm"] * b["nominal_width_mm"] * b["length_mm"] * 1e-9
            ending += f" {m3:.3f}"
        rows = [line for line in lines if all(words in line for words in size) and line.endswith(ending)]
        assert len(rows) == 1, (size, ending, lines)
    n_used, n_buy = sum(b["count"] for b in stock["used"]), sum(b["count"] for b in stock["boards"])
    total = f"total {n_used} {n_buy} {stock['board_feet']:.1f}"
    if units == "mm":
        total += f" {stock['volume_m3']:.3f}"
    assert total in lines
    assert f"uses {n_used} boards, {stock['used_board_feet']:.1f} board feet" in text
    assert f"buy {stock['board_feet']:.1f} board feet" in text
    assert f"{100 * stock['waste']:g} %" in text
    assert f"less than {stock['lower_bound_board_feet']:.1f} board feet" in text
    assert ("proven the least possible" in text) == stock["proven_optimal"]
    assert ("LP relaxation" in text) == stock["bound_is_lp"]
    assert f"stave wood is {100 * stock['yield']:.0f} % of the wood in the boards the plan uses" in text
    if units == "mm":
        assert f"({stock['volume_m3']:.3f} m³)" in text and f"({stock['used_volume_m3']:.3f} m³)" in text
    # And on page 1: the boards to buy and their board feet.
    page1 = _flat(built["report_pages"][0])
    assert f"{n_buy} boards, {stock['board_feet']:.1f} board feet" in page1


def test_report_cutting_diagrams_draw_every_board_to_the_stated_scales(built):
    """Every board of the JSON's cutting plan is a rectangle at the stated scales, with each segment a rectangle
    at its rip and offset (rip widths from the CSV), labelled inside."""
    d = built["design"]
    stock = json.loads(to_json(d))["stock"]
    rip_width = {row["label"]: float(row["rip_width_mm"]) for row in cut_list(to_csv(d))[1]}
    text = _flat(" ".join(built["report_pages"]))
    found = re.search(r"lengths at 1:([\d.]+), widths at 1:([\d.]+)", text)
    assert found, "no scales stated"
    kx, ky = PT_PER_MM / float(found.group(1)), PT_PER_MM / float(found.group(2))
    tol = 0.05
    with pdfplumber.open(built["report"]) as pdf:
        pages = [(page.rects, page.extract_words()) for page in pdf.pages]

    def near(a, b):
        return abs(a - b) <= tol

    matched = set()
    for board in stock["cutting"]:
        hit = False
        for number, (rects, words) in enumerate(pages):
            for outline in rects:
                if (number, outline["x0"], outline["top"]) in matched:
                    continue
                if not (near(outline["width"], board["length_mm"] * kx) and
                        near(outline["height"], board["width_mm"] * ky)):
                    continue
                ok = True
                for rip in board["rips"]:
                    for piece in rip["pieces"]:
                        x0 = outline["x0"] + piece["offset_mm"] * kx
                        top = outline["top"] + rip["offset_mm"] * ky
                        box_ = next((r for r in rects if near(r["x0"], x0) and near(r["top"], top)
                                     and near(r["width"], piece["length_mm"] * kx)
                                     and near(r["height"], rip_width[piece["label"]] * ky)), None)
                        if box_ is None or not any(
                                w["text"] == piece["label"] and box_["x0"] <= w["x0"] and w["x1"] <= box_["x1"]
                                and box_["top"] <= w["top"] and w["bottom"] <= box_["bottom"] for w in words):
                            ok = False
                            break
                    if not ok:
                        break
                if ok:
                    matched.add((number, outline["x0"], outline["top"]))
                    hit = True
                    break
            if hit:
                break
        assert hit, board["board"]
    # Several boards share a page.
    assert max(sum(1 for key in matched if key[0] == n) for n in range(len(pages))) >= 2


def test_report_cutter_settings_match_the_json(built):
    """Both stations' table-saw passes and router set-up, as the JSON ``machining`` gives them, each rounded
    the way that leaves wood (the report, the section command and the steps word them alike)."""
    units = built["units"]
    fig = Figures(built["design"].spar)
    m = json.loads(to_json(built["design"]))["machining"]
    text = _flat(" ".join(_section_lines(built, "Cutter settings", "Plugs")))
    for what in ("widest", "narrowest"):
        at = m[what]
        assert f"at the {what} stave, {format_length(at['z_mm'], units, tape=True)} from the heel" in text
        for p in at["table_saw"]:
            assert f"makes the {p['makes']}" in text
            assert fig.fence(p["fence_distance_mm"], nearer=p["stave_side"] == "far side") in text
            for key in ("depth_along_blade_mm", "height_mm"):
                assert fig.blade(p[key]) in text, (what, key)
            assert f"{p['tilt_deg']:.2f}°" in text
        if at["router"]:
            assert fig.blade(at["router"]["bit_height_mm"]) in text
            assert fig.describe(at["router"]["fence_to_tip_mm"]) in text
            assert fig.at_least(at["router"]["least_bit_diameter_mm"]) in text
        if at["notch_depth_mm"] is not None:
            assert fig.notch_depth(at["notch_depth_mm"]) + " / " + fig.apex_height(at["apex_height_mm"]) in text
    assert ("The notch changes along the stave" in text) == m["notch_varies"]


def test_report_order_of_operations_matches_the_json_and_csv(built):
    """The same order of operations in the report, the JSON and the CSV cut list."""
    d = built["design"]
    steps = json.loads(to_json(d))["machining"]["steps"]
    text = _flat(" ".join(_section_lines(built, "Order of operations", "Cutter settings")))
    _, _, block = cut_list(to_csv(d))
    assert block[0] == ["order of operations"]
    for step, row in zip(steps, block[1:]):
        assert _flat(step["text"]) in text
        assert row == [str(step["step"]), step["text"]]


# The full-size templates ---------------------------------------------------------------------------------


def test_every_fullsize_page_is_the_paper_asked_with_a_true_scale_bar(built):
    w, h = PAPER_PT[built["paper"]]
    bar = SCALE_BAR_PT[built["units"]]
    words = "4 in" if built["units"] == "in" else "100 mm"
    pages = built["full_pages"]
    placed, too_big = end_pages(built["design"], sheet(built["design"]))
    assert len(pages) == 1 + len(sheet(built["design"]).tiles) + max((p.page for p in placed), default=0)
    for page in pages:
        assert sorted(page["size"]) == pytest.approx(sorted((w, h)), abs=0.01)
        bars = [r for r in page["rects"] if abs(r["width"] - bar) <= 0.1 and r["height"] < 20]
        bars += [ln for ln in page["lines"] if abs(abs(ln["x1"] - ln["x0"]) - bar) <= 0.1 and ln["top"] == ln["bottom"]]
        assert bars, "no scale bar on a page"
        text = _flat(page["text"])
        assert "ACTUAL SIZE" in text and f"exactly {words}" in text


def _check_tiling(d) -> None:
    """Every tile is the page's window inside the printable area; together the tiles cover every outline."""
    s = sheet(d)
    pw, ph = s.page_size
    wx, wy, ww, wh = s.window
    px0, py0, px1, py1 = s.printable
    assert px0 >= PRINTER_MARGIN_PT and py0 >= PRINTER_MARGIN_PT
    assert pw - px1 >= PRINTER_MARGIN_PT and ph - py1 >= PRINTER_MARGIN_PT
    assert px0 <= wx and py0 <= wy and wx + ww <= px1 + 1e-9 and wy + wh <= py1 + 1e-9
    for t in s.tiles:  # a tile is the page's window, in mm
        assert t.width * PT_PER_MM == pytest.approx(ww) and t.height * PT_PER_MM == pytest.approx(wh)
    tiles = unary_union([box(*t.bounds) for t in s.tiles])
    served = {}
    for place in s.placements:
        for seg in place.template.segments:
            served[seg.label] = place
    assert sorted(served) == sorted(seg.label for seg in d.layout.segments)
    for seg in d.layout.segments:
        place = served[seg.label]
        drawn = place.template.segment
        assert len(seg.outline) == len(drawn.outline)
        assert all(a == pytest.approx(b, abs=1e-6) for a, b in zip(seg.outline, drawn.outline))
        outline = Polygon([(place.x0 + x, place.y0 - y) for x, y in seg.outline])
        assert outline.area > 0
        assert outline.difference(tiles).area <= 1e-6 * outline.area, seg.label


def test_fullsize_tiles_lie_in_the_printable_area_and_cover_every_outline(built):
    _check_tiling(built["design"])


def test_fullsize_outlines_are_drawn_at_one_to_one(built):
    """On a page that shows a template, a drawn path spans its true length and width in points."""
    s = sheet(built["design"])
    pages = built["full_pages"]
    for place in s.placements:
        seg = place.template.segment
        ys = [y for _, y in seg.outline]
        want_w, want_h = seg.length * PT_PER_MM, (max(ys) - min(ys)) * PT_PER_MM
        page = pages[pages_of(s, place)[0].page - 1]
        assert any(abs((c["x1"] - c["x0"]) - want_w) < 0.05 and abs((c["bottom"] - c["top"]) - want_h) < 0.05
                   for c in page["curves"]), seg.label


def test_fullsize_tile_pages_draw_only_what_shows_in_their_window(built):
    """A tile page holds no path that lies wholly outside its window (pdfplumber's bounding boxes, in points):
    what is clipped away is not written. The marks that do show are checked against the DXF in test_templates."""
    s = sheet(built["design"])
    wx, wy, ww, wh = s.window
    slack = 1.5 * PT_PER_MM  # a stroke's half width and the drawing's own margin
    for t in s.tiles:
        page = built["full_pages"][t.page - 1]
        height = page["size"][1]
        drawn = page["curves"] + page["lines"]
        assert drawn
        for c in drawn:
            if height - c["top"] > wy + wh + slack:  # the page header above the window: its scale bar
                continue
            assert c["x1"] >= wx - slack and c["x0"] <= wx + ww + slack, (t.name, c["x0"], c["x1"])
            assert height - c["top"] >= wy - slack and height - c["bottom"] <= wy + wh + slack, t.name


def test_fullsize_end_views_are_drawn_at_one_to_one_inside_the_window(built):
    """The layout's end views (stave ends, assembled sections, plug ends) on their own pages after the
    templates: every outline drawn at 1:1 (its width and height in points, read back by pdfplumber) wholly inside
    the page's window, with its caption; every view the layout holds is placed, or named as too large."""
    d = built["design"]
    s = sheet(d)
    placed, too_big = end_pages(d, s)
    assert len(placed) + len(too_big) == len(d.layout.end_views) and placed
    assert {v.kind for v in d.layout.end_views} >= {"stave end", "assembled"}
    first = 1 + len(s.tiles)  # index of the first end-view page
    wx, wy, ww, wh = s.window
    for place in placed:
        page = built["full_pages"][first + place.page - 1]
        assert "end views at 1:1" in page["text"]
        assert _flat(place.caption[0]) in _flat(page["text"])
        for outline in place.view.outlines:
            xs, ys = [x for x, _ in outline.points], [y for _, y in outline.points]
            want_w, want_h = (max(xs) - min(xs)) * PT_PER_MM, (max(ys) - min(ys)) * PT_PER_MM
            found = [c for c in page["curves"] + page["lines"]
                     if abs((c["x1"] - c["x0"]) - want_w) < 0.05 and abs((c["bottom"] - c["top"]) - want_h) < 0.05]
            assert found, (place.view.kind, outline.role)
            height = page["size"][1]
            assert any(wx - 0.01 <= c["x0"] and c["x1"] <= wx + ww + 0.01
                       and wy - 0.01 <= height - c["bottom"] and height - c["top"] <= wy + wh + 0.01 for c in found)


def test_fullsize_pages_are_labelled_and_joined_by_crosses(built):
    d = built["design"]
    s = sheet(d)
    pages = built["full_pages"]
    text_all = " ".join(p["text"] for p in pages)
    for seg in d.layout.segments:
        assert re.search(rf"\b{re.escape(seg.label)}\b", text_all), seg.label
    points = crosses(s)
    for t in s.tiles:
        text = _flat(pages[t.page - 1]["text"])
        assert t.name in text and f"row {t.row} of {s.rows}, column {t.col}" in text
        assert BUILD_DAY in text and built["name"] in text
        right = s.tile_at(t.row, t.col + 1)
        if right is not None:  # crosses the two pages both show
            x0, y0, x1, y1 = t.bounds
            rx0, ry0, rx1, ry1 = right.bounds
            both = [(x, y) for x, y in points if max(x0, rx0) < x < min(x1, rx1) and max(y0, ry0) < y < min(y1, ry1)]
            assert len(both) >= 2
    assert "MAP" in pages[0]["text"]
    for t in s.tiles:
        assert t.name in pages[0]["text"]


def test_build_writes_both_pdfs(run, tmp_path):
    result = run(["build", SAMPLES / "daysailer-mast.toml", "-o", tmp_path])
    assert result.exit_code == 0, result.output
    for name in ("day-sailer-mast-report.pdf", "day-sailer-mast-fullsize.pdf"):
        data = (tmp_path / name).read_bytes()
        assert data.startswith(b"%PDF-") and len(PdfReader(tmp_path / name).pages) >= 2
    assert not [p for p in os.listdir(tmp_path) if p.endswith(".part")]


# Invented for the tests (not designs): a bevel-jointed spar with a symmetric taper, and one whose staves are
# wider than a page is tall, so that the pages must join across rows as well.
STOCK = {"thickness": 25, "widths": [150], "lengths": [2400], "kerf": 3, "scarf_ratio": 8, "scarf_stagger": 300}
OTHER_SPARS = {
    "bevel-symmetric": dict(hollow={"joint": "bevel", "taper": "symmetric"}, stock=STOCK,
                            plan={"wood": "sitka-spruce", "stations": [[0, 100], [3000, 70]]}),
    "wider-than-a-page": dict(plan={"wood": "sitka-spruce", "stations": [[0, 400], [3000, 380]]},
                              hollow={"staves": 6, "wall": 60}, stock=dict(STOCK, thickness=62, widths=[150, 300]),
                              output={"paper": "a4"}),
}


@pytest.mark.parametrize("case", sorted(OTHER_SPARS))
def test_other_joints_tapers_and_sizes(case, tmp_path):
    d = design(make_spar(**OTHER_SPARS[case]), layout=True)
    _check_tiling(d)
    if case == "wider-than-a-page":
        assert sheet(d).row_overlap > 0 and sheet(d).rows > 1
    write_report(d, tmp_path / "r.pdf")
    write_fullsize(d, tmp_path / "f.pdf")
    report = _flat(" ".join(p.extract_text() for p in PdfReader(tmp_path / "r.pdf").pages))
    assert all(_flat(c) in report for c in CAUTIONS)
    with pdfplumber.open(tmp_path / "f.pdf") as pdf:
        for page in pdf.pages:
            assert any(abs(r["width"] - SCALE_BAR_PT["mm"]) <= 0.1 for r in page.rects)


@pytest.mark.parametrize("name, notched", [("catboat-box-boom.toml", False), ("daysailer-mast.toml", True)])
def test_report_station_table_has_notch_columns_only_where_a_notch_is_cut(tmp_path, name, notched):
    """A box (no notch at any station) gets no notch-depth and apex-height columns of dashes, nor their words;
    a birdsmouth spar keeps both. Read back with pdfplumber: the table's header lines and its rows."""
    d = design(load_spar(SAMPLES / name), layout=True)
    assert any(c.station.section.notch is not None for c in d.assessment.stations) == notched
    write_report(d, tmp_path / "r.pdf")
    with pdfplumber.open(tmp_path / "r.pdf") as pdf:
        pages = [page.extract_text() for page in pdf.pages]
    start = next(i for i, t in enumerate(pages) if "Station by station against the plan" in t)
    lines = pages[start].splitlines()
    head = next(k for k, line in enumerate(lines) if line.startswith("from heel"))
    header = _flat(" ".join(lines[head - 1:head + 1]))  # the headers' two lines, words side by side
    assert ("notch apex" in header and "depth height" in header) == notched, header
    rows = [line for line in lines[head + 1:] if re.match(r"^\d", line)]
    assert rows
    if not notched:  # no pair of empty cells left where the notch columns were
        assert not any(" - - " in f" {line} " for line in rows), rows[:3]
    text = _flat(pages[start])
    assert ("apex height is above the stave's inner face" in text) == notched
    assert ("before the notch is cut" in text) == notched
