"""``stavegen build``: the whole job from spar file to every output file, all or nothing."""

from __future__ import annotations

from pathlib import Path
from typing import Callable

from rich.console import Console

from .model.loader import load_spar
from .outputs import OutputSet
from .pipeline import Design, design
from .render.console import print_build_summary


def output_names(slug: str) -> dict[str, str]:
    """The files a build writes, by what they are."""
    return {"json": f"{slug}.json", "csv": f"{slug}-cutlist.csv", "templates": f"{slug}-templates.dxf",
            "cut": f"{slug}-cut.dxf", "report": f"{slug}-report.pdf", "fullsize": f"{slug}-fullsize.pdf"}


def write_outputs(result: Design, folder: Path, step: Callable[[str], None] | None = None) -> list[Path]:
    """Render every output into ``folder`` under temporary names, then rename them all.

    ``step``, if given, is told the name of each file as its writing starts.
    """
    from .render import dxf_templates
    from .render.csv_cutlist import to_csv
    from .render.json_doc import write_json
    from .render.pdf_fullsize import write_fullsize
    from .render.pdf_report import write_report

    tell = step or (lambda name: None)
    names = output_names(result.spar.slug)
    with OutputSet(folder) as out:
        tell(names["json"])
        out.add(names["json"], lambda p: write_json(result, p))
        tell(names["csv"])
        out.add_text(names["csv"], to_csv(result))
        tell(names["report"])
        out.add(names["report"], lambda p: write_report(result, p))
        tell(names["fullsize"])
        out.add(names["fullsize"], lambda p: write_fullsize(result, p))
        tell(names["templates"])
        sheet = dxf_templates.template_document(result)  # drawn once: the cut-only sheet is read off it
        out.add(names["templates"], lambda p: sheet.saveas(p))
        tell(names["cut"])
        out.add(names["cut"], lambda p: dxf_templates.cut_document(result, full=sheet).saveas(p))
        return out.commit()


def run_build(path: Path, folder: Path, console: Console) -> Design:
    """Check, lay out and write, showing each step as it runs; ends with a short summary."""
    with console.status("reading the spar file") as status:
        spar = load_spar(path)
        result = design(spar, layout=True, step=status.update)
        written = write_outputs(result, folder, step=lambda name: status.update(f"writing {name}"))
    print_build_summary(console, result, written)
    return result
