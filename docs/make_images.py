"""Regenerate the README's pictures of the PDFs from the demo boat, samples/daysailer.toml.

    python docs/make_images.py

Needs stavegen installed (``pip install -e .``) and pdftoppm and pdftotext (poppler-utils).
Writes docs/images/report-page1.png (page 1 of the boat's report), docs/images/report-boards.png
(the page where the boat's board order starts) and docs/images/fullsize-page.png (a template page of
the boat's mast).
"""

from __future__ import annotations

import shutil
import subprocess
import sys
import tempfile
from pathlib import Path

from stavegen.boat import design_boat
from stavegen.model.boat import load_boat
from stavegen.render.boat_report import write_boat_report
from stavegen.render.pdf_fullsize import write_fullsize

ROOT = Path(__file__).resolve().parent.parent
BOAT = ROOT / "samples" / "daysailer.toml"
IMAGES = ROOT / "docs" / "images"
DPI = "100"
FULLSIZE_PAGE = 2  # the first template page: the heel end, station labels, a scarf's centre


def render(pdf: Path, page: int, target: Path) -> None:
    """One page of ``pdf`` as a PNG at ``target`` (pdftoppm adds the .png)."""
    subprocess.run(["pdftoppm", "-png", "-r", DPI, "-f", str(page), "-l", str(page), "-singlefile",
                    str(pdf), str(target.with_suffix(""))], check=True)


def page_with(pdf: Path, words: str) -> int:
    """The first page of ``pdf`` (from 1) whose text has a line that is exactly ``words``."""
    text = subprocess.run(["pdftotext", "-layout", str(pdf), "-"], check=True, capture_output=True,
                          text=True).stdout
    for number, page in enumerate(text.split("\f"), start=1):
        if any(line.strip() == words for line in page.splitlines()):
            return number
    raise SystemExit(f"no page of {pdf} has the heading {words!r}")


def main() -> int:
    if shutil.which("pdftoppm") is None or shutil.which("pdftotext") is None:
        sys.stderr.write("pdftoppm and pdftotext (poppler-utils) are needed to render the pages\n")
        return 1
    IMAGES.mkdir(parents=True, exist_ok=True)
    boat = design_boat(load_boat(BOAT), layout=True)
    with tempfile.TemporaryDirectory() as tmp:
        report, full = Path(tmp) / "report.pdf", Path(tmp) / "fullsize.pdf"
        write_boat_report(boat, report)
        write_fullsize(boat.designs[0], full)
        render(report, 1, IMAGES / "report-page1.png")
        render(report, page_with(report, "Board order"), IMAGES / "report-boards.png")
        render(full, FULLSIZE_PAGE, IMAGES / "fullsize-page.png")
    for name in ("report-page1.png", "report-boards.png", "fullsize-page.png"):
        print(IMAGES / name)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
