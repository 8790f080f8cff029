"""``stavegen build BOAT.toml``: the whole boat from boat file to every output file, all or nothing.

Into the folder go ``BOAT.json``, ``BOAT-report.pdf`` and ``BOAT-cutlist.csv`` (``BOAT`` the
slug of the boat's name), each spar's ``SPAR-templates.dxf`` and ``SPAR-fullsize.pdf`` as a
spar build writes them, and ``BOAT-boards.dxf`` when the boat file asks for templates on
boards. They are written as one set (:class:`~stavegen.outputs.OutputSet`): all of them or,
should anything fail, none.
"""

from __future__ import annotations

from pathlib import Path
from typing import Callable

from rich.console import Console

from .boat import BoatDesign, design_boat
from .build import output_names
from .model.boat import Boat, is_boat, load_boat
from .model.loader import read_toml
from .outputs import OutputSet


def is_boat_file(path: str | Path) -> bool:
    """Whether the file at ``path`` is a boat file (InputError if it cannot be read as TOML)."""
    return is_boat(read_toml(path))


def boat_output_names(bd: BoatDesign) -> dict[str, str]:
    """The files a boat build writes, by what they are: the boat's, then ``TAG:templates``, ``TAG:fullsize``."""
    slug = bd.boat.slug
    names = {"json": f"{slug}.json", "csv": f"{slug}-cutlist.csv", "report": f"{slug}-report.pdf"}
    if bd.boat.output.templates_on_boards:
        names["boards"] = f"{slug}-boards.dxf"
    for bs in bd.boat.spars:
        own = output_names(bs.spar.slug)
        names[f"{bs.tag}:templates"] = own["templates"]
        names[f"{bs.tag}:cut"] = own["cut"]
        names[f"{bs.tag}:fullsize"] = own["fullsize"]
    return names


def write_boat_outputs(bd: BoatDesign, folder: Path, step: Callable[[str], None] | None = None) -> list[Path]:
    """Render every output of the boat into ``folder`` as one set; returns the files written."""
    from .render import dxf_templates
    from .render.boat_dxf import write_boat_boards
    from .render.boat_papers import to_boat_csv, to_boat_json
    from .render.boat_report import write_boat_report
    from .render.pdf_fullsize import write_fullsize

    tell = step or (lambda name: None)
    names = boat_output_names(bd)
    with OutputSet(folder) as out:
        tell(names["json"])
        out.add_text(names["json"], to_boat_json(bd))
        tell(names["csv"])
        out.add_text(names["csv"], to_boat_csv(bd))
        tell(names["report"])
        out.add(names["report"], lambda p: write_boat_report(bd, p))
        if "boards" in names:
            tell(names["boards"])
            out.add(names["boards"], lambda p: write_boat_boards(bd, p))
        for i, (bs, d) in enumerate(bd.spars):
            tell(names[f"{bs.tag}:fullsize"])
            out.add(names[f"{bs.tag}:fullsize"], lambda p, d=d: write_fullsize(d, p))
            tell(names[f"{bs.tag}:templates"])
            view = bd.spar_view(i)
            sheet = dxf_templates.template_document(view)  # drawn once: the cut-only sheet is read off it
            out.add(names[f"{bs.tag}:templates"], lambda p, sh=sheet: sh.saveas(p))
            tell(names[f"{bs.tag}:cut"])
            out.add(names[f"{bs.tag}:cut"], lambda p, v=view, sh=sheet: dxf_templates.cut_document(v, full=sh).saveas(p))
        return out.commit()


def run_boat_build(path: Path, folder: Path, console: Console) -> BoatDesign:
    """Check, lay out and order the whole boat, write every output, and end with a short summary."""
    from .render.boat_console import print_boat_build_summary

    with console.status("reading the boat file") as status:
        boat: Boat = load_boat(path)
        bd = design_boat(boat, layout=True, step=status.update)
        written = write_boat_outputs(bd, folder, step=lambda name: status.update(f"writing {name}"))
    print_boat_build_summary(console, bd, written)
    return bd
