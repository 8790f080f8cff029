"""SVG drawings for the page, drawn from the geometry the engine computed.

The section is the engine's own stave polygon (:meth:`Section.stave_polygon`)
turned about the axis by :func:`stavegen.section.staves.placed_ring`, cut by the
finished round, with the bore of :func:`stavegen.section.properties.bore_ring`.
The stave along its length is the layout's segment outlines; the boards are
the lumber order's rips and cuts. Coordinates are millimetres; each drawing
is a standalone ``<svg>`` with its styles inline. Figures printed on the
drawings are worded by :mod:`stavegen.units`; nothing is computed here that
the engine has not.
"""

from __future__ import annotations

import math
from typing import Iterable
from xml.sax.saxutils import escape

import shapely
from shapely.geometry import Point, Polygon

from ..model.spar import Spar
from ..pipeline import Design
from ..section.properties import Section
from ..section.staves import placed_ring
from ..stations.evaluate import Station
from ..render.figures import Figures
from ..units import format_length

ROUND_QUADS = 90  # segments per quarter circle of the drawn round (drawing only; figures are exact)
STAVE_FILL = ("#d9b98c", "#caa572")
FINISHED_FILL = ("#b5894f", "#a77b43")


def _attr(words: str) -> str:
    """Text for an attribute value in double quotes."""
    return escape(words, {'"': "&quot;"})


def _num(v: float) -> str:
    return f"{v:.3f}".rstrip("0").rstrip(".") if abs(v) >= 1e-9 else "0"


def _ring_path(coords: Iterable[tuple[float, float]], flip: bool = True) -> str:
    points = list(coords)
    if not points:
        return ""
    sign = -1.0 if flip else 1.0
    head = f"M{_num(points[0][0])},{_num(sign * points[0][1])}"
    return head + "".join(f"L{_num(x)},{_num(sign * y)}" for x, y in points[1:]) + "Z"


def _path(geometry, flip: bool = True) -> str:
    """SVG path data of a polygon or multipolygon (holes included); y flipped so that up is up."""
    if geometry.is_empty:
        return ""
    polygons = list(getattr(geometry, "geoms", [geometry]))
    parts = []
    for polygon in polygons:
        if polygon.geom_type != "Polygon":
            continue
        parts.append(_ring_path(polygon.exterior.coords[:-1], flip))
        parts += [_ring_path(ring.coords[:-1], flip) for ring in polygon.interiors]
    return "".join(parts)


def _svg(view: tuple[float, float, float, float], body: list[str], title: str, cls: str, data: dict[str, str],
         width: str = "100%") -> str:
    x, y, w, h = view
    attrs = " ".join(f'data-{k}="{_attr(v)}"' for k, v in data.items())
    return (f'<svg xmlns="http://www.w3.org/2000/svg" class="{cls}" viewBox="{_num(x)} {_num(y)} {_num(w)} '
            f'{_num(h)}" width="{width}" role="img" aria-label="{_attr(title)}" {attrs}>'
            f"<title>{escape(title)}</title>" + "".join(body) + "</svg>")


def _text(x: float, y: float, words: str, size: float, anchor: str = "middle", fill: str = "#222",
          cls: str = "label") -> str:
    return (f'<text class="{cls}" x="{_num(x)}" y="{_num(y)}" font-size="{_num(size)}" text-anchor="{anchor}" '
            f'font-family="sans-serif" fill="{fill}">{escape(words)}</text>')


def section_svg(spar: Spar, station: Station) -> str:
    """The assembled section at one station: every stave, the finished round, the bore (or its plug),
    any voids, and the plan's solid round dashed for comparison."""
    sec: Section = station.section
    units = spar.units
    n = sec.staves
    oval = sec.shape != "round"
    if oval:
        staves = [Polygon(ring) for ring in sec.placed_rings()]
    else:
        staves = list(placed_ring(sec.stave_polygon(), n, range(n)))
    reach = max(math.hypot(x, y) for p in staves for x, y in p.exterior.coords)
    plan_r = max(station.plan_diameter, station.plan_athwart) / 2
    extent = max(reach, plan_r, sec.radius) * 1.05
    disc = (Polygon(sec.finished_points(4 * ROUND_QUADS * 4)) if oval
            else Point(0.0, 0.0).buffer(sec.radius, quad_segs=ROUND_QUADS))
    bore = Polygon(sec.bore_points())
    line = extent / 250
    body = []
    for k, stave in enumerate(staves):
        body.append(f'<path class="stave" data-stave="{k + 1}" d="{_path(stave)}" fill="{STAVE_FILL[k % 2]}" '
                    f'fill-opacity="0.45" stroke="#7a5a32" stroke-width="{_num(line)}"/>')
    for k, stave in enumerate(staves):
        body.append(f'<path class="finished" d="{_path(disc.intersection(stave))}" fill="{FINISHED_FILL[k % 2]}" '
                    f'stroke="#5c4020" stroke-width="{_num(line * 0.7)}" stroke-linejoin="round"/>')
    plug = station.plug is not None
    body.append(f'<path class="{"bore plug" if plug else "bore"}" d="{_path(bore)}" '
                f'fill="{"#8aa37b" if plug else "#ffffff"}" stroke="#555" stroke-width="{_num(line)}"/>')
    if sec.void_area > 0:
        voids = disc.difference(shapely.union_all(staves + [bore]))
        body.append(f'<path class="void" d="{_path(voids)}" fill="#d33" stroke="none"/>')
    if oval:
        a, b = sec.semi_axes
        pa, pb = station.plan_diameter / 2, station.plan_athwart / 2
        body.append(f'<ellipse class="round" cx="0" cy="0" rx="{_num(a)}" ry="{_num(b)}" fill="none" stroke="#222" '
                    f'stroke-width="{_num(line * 1.6)}"/>')
        if spar.plan.shape == "rectangle":
            body.append(f'<rect class="plan" x="{_num(-pa)}" y="{_num(-pb)}" width="{_num(2 * pa)}" '
                        f'height="{_num(2 * pb)}" rx="{_num(spar.plan.corner_radius)}" fill="none" stroke="#2563eb" '
                        f'stroke-width="{_num(line)}" stroke-dasharray="{_num(line * 6)} {_num(line * 4)}"/>')
        else:
            body.append(f'<ellipse class="plan" cx="0" cy="0" rx="{_num(pa)}" ry="{_num(pb)}" fill="none" '
                        f'stroke="#2563eb" stroke-width="{_num(line)}" '
                        f'stroke-dasharray="{_num(line * 6)} {_num(line * 4)}"/>')
    else:
        body.append(f'<circle class="round" cx="0" cy="0" r="{_num(sec.radius)}" fill="none" stroke="#222" '
                    f'stroke-width="{_num(line * 1.6)}"/>')
        body.append(f'<circle class="plan" cx="0" cy="0" r="{_num(plan_r)}" fill="none" stroke="#2563eb" '
                    f'stroke-width="{_num(line)}" stroke-dasharray="{_num(line * 6)} {_num(line * 4)}"/>')
    size = extent * 0.075
    fig = Figures(spar)
    sheathed = station.diameter - 2 * sec.radius > 1e-9 and not oval
    if sheathed:  # the sheathing over the rounded wood, to the finished diameter
        body.append(f'<circle class="sheathing" cx="0" cy="0" r="{_num(station.diameter / 2)}" fill="none" '
                    f'stroke="#4a8a4a" stroke-width="{_num(line * 1.6)}"/>')
    if oval:
        pieces = "a box of 4 pieces" if sec.joint == "box" else f"{n} staves"
        words = (f"{pieces}, {fig.dress(sec.fore_aft)} fore-and-aft (across) by {fig.dress(sec.athwartships)} "
                 f"athwartships, wall {fig.dress(station.wall)}" + (", plugged" if plug else ""))
        plan_words = (f"plan (dashed, {spar.plan.shape}): {format_length(station.plan_diameter, units)} by "
                      f"{format_length(station.plan_athwart, units)}")
    else:
        words = (f"{n} staves, OD {fig.dress(station.diameter)}"
                 + (f" (wood {fig.dress(2 * sec.radius)}, sheathed)" if sheathed else "")
                 + f", wall {fig.dress(station.wall)}" + (", plugged" if plug else ""))
        plan_words = f"plan (dashed): OD {format_length(station.plan_diameter, units)}"
    body.append(_text(0, extent + size * 1.3, words, size))
    body.append(_text(0, extent + size * 2.6, plan_words, size * 0.85, fill="#2563eb"))
    title = f"Section at {format_length(station.z, units, tape=True)} from the heel"
    return _svg((-extent, -extent, 2 * extent, 2 * extent + size * 3.2), body, title, "section-svg",
                {"staves": str(n), "od-mm": _num(station.diameter), "wall-mm": _num(station.wall),
                 "z-mm": _num(station.z)})


def _dimension(x1: float, y1: float, x2: float, y2: float, words: str, size: float, line: float,
               offset: tuple[float, float]) -> list[str]:
    """A dimension line from (x1, y1) to (x2, y2) (page coordinates), ticks at both ends, words beside it."""
    dx, dy = offset
    tick = size * 0.35
    ux, uy = (x2 - x1), (y2 - y1)
    length = math.hypot(ux, uy) or 1.0
    nx, ny = -uy / length * tick, ux / length * tick
    parts = [f'<line x1="{_num(x1)}" y1="{_num(y1)}" x2="{_num(x2)}" y2="{_num(y2)}" stroke="#333" '
             f'stroke-width="{_num(line)}"/>']
    for x, y in ((x1, y1), (x2, y2)):
        parts.append(f'<line x1="{_num(x - nx)}" y1="{_num(y - ny)}" x2="{_num(x + nx)}" y2="{_num(y + ny)}" '
                     f'stroke="#333" stroke-width="{_num(line)}"/>')
    parts.append(_text((x1 + x2) / 2 + dx, (y1 + y2) / 2 + dy, words, size, cls="dim"))
    return parts


def stave_svg(spar: Spar, sec: Section) -> str:
    """One stave's cross-section at the station, outer face up: the engine's polygon, the wood left after
    rounding shaded, and its width, thickness and notch dimensioned."""
    fig = Figures(spar)
    if sec.shape != "round":  # an oval: its widest stave, in its own frame, the oval turned with it
        from shapely.affinity import rotate

        from ..section.oval import normal_angle

        j = max(sec.kinds, key=lambda kind: kind.width).index
        turn = math.degrees(normal_angle(sec.staves, j)) - 90.0
        disc = rotate(Polygon(sec.finished_points(4 * ROUND_QUADS * 4)), -turn, origin=(0.0, 0.0))
        sec = sec.kind_section(j)
    else:
        disc = Point(0.0, 0.0).buffer(sec.radius, quad_segs=ROUND_QUADS)
    frame = sec.frame
    polygon = sec.stave_polygon()
    finished = disc.intersection(polygon)
    minx, miny, maxx, maxy = polygon.bounds
    w, t = maxx - minx, maxy - miny
    size = max(w, t) * 0.07
    line = max(w, t) / 300
    pad = size * 3.2
    body = [f'<path class="one-stave" d="{_path(polygon)}" fill="{STAVE_FILL[0]}" stroke="#7a5a32" '
            f'stroke-width="{_num(line)}"/>',
            f'<path class="finished" d="{_path(finished)}" fill="{FINISHED_FILL[0]}" stroke="none"/>']
    below = -miny + size * 1.2
    body += _dimension(frame.x_notch_edge, below, frame.x_square_edge, below,
                       f"width {fig.mark_width(sec.stave_width)}", size, line, (0, size * 1.3))
    right = maxx + size * 0.8
    body += _dimension(right, -frame.inner, right, -frame.outer,
                       f"{fig.dress(sec.thickness)}", size, line, (size * 0.4, size * 0.35))
    body[-1] = body[-1].replace('text-anchor="middle"', 'text-anchor="start"')
    if sec.notch is not None and frame.apex is not None:
        ax, ay = frame.apex
        body.append(f'<circle cx="{_num(ax)}" cy="{_num(-ay)}" r="{_num(line * 2.5)}" fill="#c2410c"/>')
        body.append(_text(frame.x_notch_edge, -frame.outer - size * 0.6,
                          f"notch {fig.notch_depth(sec.notch.depth)} deep, apex "
                          f"{fig.apex_height(sec.notch.apex_height)} up", size * 0.9, anchor="start",
                          fill="#c2410c"))
    elif sec.joint == "box":  # a box's piece: square edges, a rebate where the corner joint has one
        said = "square edges" + (f", rebated {fig.dress(sec.rebate[0])} deep" if sec.rebate else "")
        body.append(_text((minx + maxx) / 2, -frame.outer - size * 0.6, said, size * 0.9, fill="#c2410c"))
    else:
        body.append(_text((minx + maxx) / 2, -frame.outer - size * 0.6,
                          f"edges bevelled {sec.bevel_angle:.2f}° off square", size * 0.9, fill="#c2410c"))
    view = (minx - size, -maxy - pad * 0.75, w + size * 2 + pad * 1.6, t + pad * 1.9)
    return _svg(view, body, "One stave at this station, outer face up", "stave-svg",
                {"width-mm": _num(sec.stave_width), "thickness-mm": _num(sec.thickness)})


def stave_length_svg(design: Design, width_px: float = 1000.0, lane_px: float = 34.0) -> str:
    """Stave 1 along its length, heel at the left: each segment's outline (widths exaggerated), the scarf
    feather lines, and the segment labels. Segments alternate between two lanes so scarfs show."""
    layout = design.layout
    plan = layout.plan
    segments = layout.staves[0]
    s0 = plan.s_at(plan.start)
    total = plan.cut_length
    widest = max(seg.widest for seg in segments)
    kx = width_px / total
    ky = lane_px / widest
    body = []
    for i, seg in enumerate(segments):
        x0 = plan.s_at(seg.start) - s0
        lane = (i % 2) * (lane_px + 8)
        points = [((x0 + x) * kx, lane + (widest - y) * ky if plan.taper != "symmetric" else
                   lane + (widest / 2 - y) * ky) for x, y in seg.outline]
        d = _ring_path(points, flip=False)
        body.append(f'<path class="segment" data-label="{_attr(seg.label)}" d="{d}" fill="{STAVE_FILL[i % 2]}" '
                    f'stroke="#7a5a32" stroke-width="1"/>')
        for fx in seg.feather_lines:
            x = (x0 + fx) * kx
            body.append(f'<line x1="{_num(x)}" y1="{_num(lane)}" x2="{_num(x)}" y2="{_num(lane + lane_px)}" '
                        f'stroke="#c2410c" stroke-width="1" stroke-dasharray="3 2"/>')
        body.append(_text((x0 + seg.length / 2) * kx, lane + lane_px / 2 + 4, seg.label, 11))
    height = 2 * lane_px + 8 + 22
    body.append(_text(0, height - 4, f"stave 1 of {design.spar.hollow.staves}, "
                      f"{format_length(total, design.spar.units, tape=True)} cut length; widths drawn "
                      f"{ky / kx:.0f}× their true size; dashed: scarf feather lines", 11, anchor="start",
                      fill="#555"))
    return _svg((0, 0, width_px, height), body, "One stave along its length", "stave-length-svg",
                {"segments": str(len(segments))})


def boards_svg(design: Design, width_px: float = 900.0, exaggerate: float = 2.0) -> str:
    """Every board of the order with its rips and the segments cut from each (widths exaggerated)."""
    order = design.layout.lumber
    if not order.boards:
        return ""
    longest = max(b.size.length for b in order.boards)
    kx = width_px / longest
    ky = kx * exaggerate
    y = 0.0
    body = []
    for board in order.boards:
        h = board.size.width * ky
        body.append(_text(0, y + 12, f"{board.id}", 12, anchor="start", fill="#333"))
        top = y + 16
        body.append(f'<rect class="board" data-board="{_attr(board.id)}" x="0" y="{_num(top)}" '
                    f'width="{_num(board.size.length * kx)}" height="{_num(h)}" fill="#f3e6cf" stroke="#7a5a32"/>')
        for rip in board.rips:
            for k, cut in enumerate(rip.cuts):
                x = cut.offset * kx
                ry = top + rip.offset * ky
                body.append(f'<rect class="piece" x="{_num(x)}" y="{_num(ry)}" width="{_num(cut.piece.length * kx)}" '
                            f'height="{_num(rip.width * ky)}" fill="{STAVE_FILL[k % 2]}" stroke="#7a5a32" '
                            f'stroke-width="0.6"/>')
                if rip.width * ky >= 9:
                    body.append(_text(x + cut.piece.length * kx / 2, ry + rip.width * ky / 2 + 3.5,
                                      cut.piece.label, min(10.0, rip.width * ky * 0.8)))
        y = top + h + 10
    return _svg((0, 0, width_px + 2, y), body, "The boards and what is cut from each", "boards-svg",
                {"boards": str(len(order.boards))})
