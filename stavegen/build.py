"""``stavegen build``: the whole job from spar file to every output file, all or nothing."""

from __future__ import annotations

from pathlib import Path

from rich.console import Console

from .model.loader import load_spar
from .outputs import OutputSet
from .pipeline import Design, design
from .render.console import verdict
from .units import format_mass


def output_names(slug: str) -> dict[str, str]:
    """The files a build writes, by what they are."""
    return {"json": f"{slug}.json", "csv": f"{slug}-cutlist.csv", "templates": f"{slug}-templates.dxf",
            "report": f"{slug}-report.pdf", "fullsize": f"{slug}-fullsize.pdf"}


def write_outputs(result: Design, folder: Path) -> list[Path]:
    """Render every output into ``folder`` under temporary names, then rename them all."""
    from .render import dxf_templates
    from .render.csv_cutlist import to_csv
    from .render.json_doc import to_json
    from .render.pdf_fullsize import write_fullsize
    from .render.pdf_report import write_report

    names = output_names(result.spar.slug)
    with OutputSet(folder) as out:
        out.add_text(names["json"], to_json(result))
        out.add_text(names["csv"], to_csv(result))
        out.add(names["report"], lambda p: write_report(result, p))
        out.add(names["fullsize"], lambda p: write_fullsize(result, p))
        out.add(names["templates"], lambda p: dxf_templates.write_templates(result, p))
        return out.commit()


def run_build(path: Path, folder: Path, console: Console) -> Design:
    """Check, lay out and write; prints progress and a short summary."""
    with console.status("reading the spar file"):
        spar = load_spar(path)
    with console.status("checking sections against the plan and laying out the staves"):
        result = design(spar, layout=True)
    with console.status("writing outputs"):
        written = write_outputs(result, folder)
    r = result.assessment
    for line in result.solved:
        console.print(f"[cyan]solved:[/] {line}")
    console.print(verdict(result))
    console.print(f"weight: {format_mass(r.hollow.mass.mass, spar.units)} hollow against "
                  f"{format_mass(r.plan.mass.mass, spar.units)} solid")
    for line in result.warnings:
        console.print(f"[bold yellow]warning:[/] {line}")
    for p in written:
        console.print(f"wrote {p}")
    return result
