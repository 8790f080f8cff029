"""Shared helpers: spar files built in code, and the command line run in-process."""

from __future__ import annotations

import copy
import os
from pathlib import Path

# reportlab checks every attribute its graphics shapes are given while the tests draw (stavegen turns the check
# off for speed; the drawing is the same): set before stavegen or reportlab is imported.
os.environ.setdefault("RL_shapeChecking", "1")

import pytest
from typer.testing import CliRunner

from stavegen.cli import app
from stavegen.model.loader import parse_spar

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = ROOT / "samples"
# The sample spar files (the boat files beside them list some of these and are tested in test_boat.py).
SPAR_SAMPLES = sorted(p for p in SAMPLES.glob("*.toml") if "[boat]" not in p.read_text(encoding="utf-8"))

# A plain uniform spar, invented for the tests (not a design).
UNIFORM = {
    "spar": {"name": "Test spar", "units": "mm", "length": 3000},
    "plan": {"wood": "sitka-spruce", "stations": [[0, 100], [3000, 100]]},
    "hollow": {"wood": "sitka-spruce", "staves": 8, "joint": "birdsmouth-flush", "wall": 20,
               "planing_allowance": 0},
}


def spar_dict(**changes) -> dict:
    """A copy of the uniform test spar with tables updated: spar_dict(hollow={"staves": 12})."""
    data = copy.deepcopy(UNIFORM)
    for table, values in changes.items():
        if values is None:
            data.pop(table, None)
        elif isinstance(values, dict) and table in data:
            data[table].update(values)
        else:
            data[table] = values
    return data


def make_spar(**changes):
    return parse_spar(spar_dict(**changes), "test.toml")


@pytest.fixture
def run():
    """Run the stavegen command line in-process: run(["check", path]) -> Result."""
    runner = CliRunner()

    def _run(args, **kw):
        return runner.invoke(app, [str(a) for a in args], **kw)

    return _run


def cut_list(text: str) -> tuple[list[str], list[dict[str, str]], list[list[str]]]:
    """The cut list CSV read as a builder's spreadsheet would: (warning lines, segment rows, the steps block).

    A failing design's first row is its warning; the segment table ends at the first empty row, after
    which come the order of operations and any notes.
    """
    import csv
    import io

    rows = list(csv.reader(io.StringIO(text)))
    warnings = []
    while rows and len(rows[0]) == 1:
        warnings.append(rows.pop(0)[0])
    end = rows.index([])
    header, body = rows[0], rows[1:end]
    return warnings, [dict(zip(header, r)) for r in body], rows[end + 1:]
