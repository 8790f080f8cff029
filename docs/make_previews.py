"""Regenerate the README's previews of the DXF template sheet from the demo boat's mast, and of its boards.

    python docs/make_previews.py        # writes docs/images/templates-preview.png and templates-on-boards.png

Needs the docs extra (matplotlib): ``pip install -e ".[docs]"``. The picture is
drawn from the DXF file stavegen writes, by ezdxf's drawing add-on: the whole
sheet on top, then three details at a readable scale (the heel end of stave
1, the scarf between its two segments, and the end views); and the demo boat with
``output.templates_on_boards = true``: its boards sheet, every board of the boat's
order with every spar's segments on it, and the left end of the first board.
"""

from __future__ import annotations

import dataclasses
import sys
import tempfile
from pathlib import Path

import ezdxf
import ezdxf.bbox
import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
from ezdxf.addons.drawing import Frontend, RenderContext  # noqa: E402
from ezdxf.addons.drawing.config import BackgroundPolicy, ColorPolicy, Configuration  # noqa: E402
from ezdxf.addons.drawing.matplotlib import MatplotlibBackend  # noqa: E402

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from stavegen.model.loader import load_spar  # noqa: E402
from stavegen.pipeline import design  # noqa: E402
from stavegen.render.dxf_templates import CUT, write_templates  # noqa: E402

SAMPLE = ROOT / "samples" / "daysailer-mast.toml"  # the demo boat's mast
BOAT = ROOT / "samples" / "daysailer.toml"
OUT = ROOT / "docs" / "images" / "templates-preview.png"
BOARDS_OUT = ROOT / "docs" / "images" / "templates-on-boards.png"
CONFIG = Configuration(background_policy=BackgroundPolicy.WHITE, color_policy=ColorPolicy.COLOR)


def draw(doc, fig, rect, title: str, window) -> None:
    """Draw the modelspace into a new axes at ``rect`` (figure fractions) showing ``window`` exactly.

    ``window`` is ((x0, x1), (y0, y1)) in drawing units; the caller makes ``rect`` the window's shape,
    so the drawing keeps its true proportions.
    """
    ax = fig.add_axes(rect)
    Frontend(RenderContext(doc), MatplotlibBackend(ax, adjust_figure=False), config=CONFIG).draw_layout(doc.modelspace(), finalize=True)
    (x0, x1), (y0, y1) = window
    ax.set_aspect("auto")
    ax.set_xlim(x0, x1)
    ax.set_ylim(y0, y1)
    ax.axis("on")
    ax.set_xticks([])
    ax.set_yticks([])
    ax.set_title(title, fontsize=11, loc="left")


def bounds(entity) -> tuple[float, float, float, float]:
    xs, ys = zip(*entity.get_points("xy"))
    return min(xs), min(ys), max(xs), max(ys)


def main() -> Path:
    result = design(load_spar(SAMPLE), layout=True)
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "templates.dxf"
        write_templates(result, path)
        doc = ezdxf.readfile(path)
    unit = 25.4 if result.spar.units == "in" else 1.0  # the sample is in inches: the windows below are inches
    ext_min, ext_max = doc.header["$EXTMIN"], doc.header["$EXTMAX"]
    outlines = sorted((bounds(e) for e in doc.modelspace().query("LWPOLYLINE") if e.dxf.layer == CUT),
                      key=lambda b: (-b[1], b[0]))
    first, second = outlines[0], outlines[1]  # stave 1's two segments: the top row
    seg = result.layout.staves[0][0]
    # Stave 1's row: from the text under its notch edge to the top of the station figures above it.
    texts = [t for t in doc.modelspace().query("TEXT") if first[0] <= t.dxf.insert.x <= second[2]]
    below = [t.dxf.insert.y for t in texts if first[1] - 1.5 < t.dxf.insert.y < first[1]]
    figures = ezdxf.bbox.extents(t for t in texts if t.dxf.layer == "TEXT-STATIONS"
                                 and first[3] <= t.dxf.insert.y < first[3] + 2)
    y_window = (min(below) - 0.4, figures.extmax.y + 0.3)
    scarf = first[2] - seg.scarf_length / unit
    views = ezdxf.bbox.extents(e for e in doc.modelspace() if e.dxf.layer.startswith(("END-", "SHEET-")))

    whole = ((ext_min[0], ext_max[0]), (ext_min[1], ext_max[1]))
    heel = ((first[0] - 0.5, first[0] + 10.5), y_window)
    joint = ((scarf - 1.5, second[0] + seg.scarf_length / unit + 1.5), y_window)
    ends = ((views.extmin.x - 0.3, views.extmin.x + 30.0), (views.extmin.y - 0.3, views.extmax.y + 0.3))
    panels = [(whole, 16.0, "The whole sheet: one row per stave, segments heel to head; end views and notes on top"),
              (heel, 11.0 * 0.45, "Heel end of stave 1: stations, grain, edges"),
              (joint, (joint[0][1] - joint[0][0]) * 0.45, "Where S1-1 meets S1-2: feather lines and scarf notes"),
              (ends, 16.0, "End views at 1:1: one stave at the widest and narrowest stations, assembled sections")]

    def height(panel) -> float:
        (x0, x1), (y0, y1) = panel[0]
        return panel[1] * (y1 - y0) / (x1 - x0)

    title, pad = 0.35, 0.15
    rows = [[panels[0]], [panels[1], panels[2]], [panels[3]]]
    row_heights = [max(height(p) for p in row) + title + pad for row in rows]
    fig_w, fig_h = 16.6, sum(row_heights) + pad
    fig = plt.figure(figsize=(fig_w, fig_h), dpi=150)
    top = fig_h - pad
    for row, row_h in zip(rows, row_heights):
        x = 0.3
        for window, width, text in row:
            h = height((window, width))
            y = top - title - h
            draw(doc, fig, (x / fig_w, y / fig_h, width / fig_w, h / fig_h), text, window)
            x += width + 0.4
        top -= row_h
    OUT.parent.mkdir(parents=True, exist_ok=True)
    fig.savefig(OUT)
    plt.close(fig)
    return OUT


def boards_preview() -> Path:
    """The demo boat's boards sheet (templates on boards): the whole sheet, then the left end of board B1."""
    from stavegen.boat import design_boat
    from stavegen.model.boat import load_boat
    from stavegen.render.boat_dxf import write_boat_boards

    boat = load_boat(BOAT)
    boat = dataclasses.replace(boat, output=dataclasses.replace(boat.output, templates_on_boards=True))
    result = design_boat(boat, layout=True)
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "boards.dxf"
        write_boat_boards(result, path)
        doc = ezdxf.readfile(path)
    boards = sorted((bounds(e) for e in doc.modelspace().query("LWPOLYLINE") if e.dxf.layer == "BOARD-OUTLINE"),
                    key=lambda b: (-b[3], b[0]))
    first = boards[0]  # B1, the top board
    ext_min, ext_max = doc.header["$EXTMIN"], doc.header["$EXTMAX"]
    whole = ((ext_min[0], ext_max[0]), (ext_min[1], ext_max[1]))
    span = 40.0 if boat.units == "in" else 1000.0
    pad = (first[3] - first[1]) * 0.15
    detail = ((first[0] - pad, first[0] + span), (first[1] - pad, first[3] + 2.5 * pad))
    panels = [(whole, 16.0, "Templates on boards: each board of the boat's order at true size, every spar's "
                            "segments where the order cuts them"),
              (detail, 16.0, "Left end of board B1: the board outline (grey), rip lines, segment outlines to cut")]

    def height(panel) -> float:
        (x0, x1), (y0, y1) = panel[0]
        return panel[1] * (y1 - y0) / (x1 - x0)

    title, gap = 0.35, 0.15
    fig_w = 16.6
    fig_h = sum(height(p) + title + gap for p in panels) + gap
    fig = plt.figure(figsize=(fig_w, fig_h), dpi=150)
    top = fig_h - gap
    for window, width, text in panels:
        h = height((window, width))
        draw(doc, fig, (0.3 / fig_w, (top - title - h) / fig_h, width / fig_w, h / fig_h), text, window)
        top -= h + title + gap
    fig.savefig(BOARDS_OUT)
    plt.close(fig)
    return BOARDS_OUT


if __name__ == "__main__":
    print(main())
    print(boards_preview())
