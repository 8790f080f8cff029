"""The boat's JSON document and its one cut list, composed from the single-spar renderers.

``BOAT.json`` holds ``boat`` (name, units, file, verdict, and each spar's tag, file and
verdict), ``spars[]`` (each spar's own document, exactly as ``stavegen build SPAR``
writes it, its ``stock`` the spar bought alone) and one ``stock``: the boat's order,
whose ``cutting[]`` pieces carry the boat-wide labels ("M-S3-2"), beside
``separate_board_feet`` (the spars' own orders to buy, summed), ``separate_used_board_feet``
and ``saved_board_feet``. The cut list is every spar's cut list (in the boat's units),
one after another, with the spar and the boat-wide label in front and the boat's boards.
"""

from __future__ import annotations

import csv
import io
import json
from typing import Any

from .. import __version__
from ..boat import BoatDesign
from .csv_cutlist import cutlist_rows
from .json_doc import SCHEMA_VERSION, _clean, _stock, document

LABEL = 2  # the label column of cutlist_rows


def boat_document(bd: BoatDesign) -> dict[str, Any]:
    """Every figure of the boat as JSON-ready data (SI units)."""
    boat = bd.boat
    doc: dict[str, Any] = {
        "stavegen": {"version": __version__, "schema": SCHEMA_VERSION},
        "boat": {
            "name": boat.name,
            "units": boat.units,
            "source": boat.source,
            "passed": bd.passed,
            "spars": [{"tag": bs.tag, "file": bs.file, "name": d.spar.name, "passed": d.passed}
                      for bs, d in bd.spars],
        },
        "spars": [document(d) for d in bd.designs],
    }
    if bd.order is not None:
        stock = _stock(bd.order)
        stock.update({
            "separate_board_feet": bd.separate_board_feet,
            "separate_used_board_feet": bd.separate_used_board_feet,
            "saved_board_feet": bd.separate_board_feet - bd.order.to_buy_board_feet,
            "separate": [{"tag": bs.tag, "board_feet": d.layout.lumber.to_buy_board_feet,
                          "used_board_feet": d.layout.lumber.board_feet} for bs, d in bd.spars],
            "separate_with": boat.stock.separate_with,
            "gap_mm": bd.order.gap,
        })
        doc["stock"] = stock
    return doc


def to_boat_json(bd: BoatDesign) -> str:
    return json.dumps(_clean(boat_document(bd)), indent=2, ensure_ascii=False) + "\n"


def boat_cutlist_rows(bd: BoatDesign) -> list[list[str]]:
    """Every spar's cut list in one table, in the boat's units: the spar's tag and name in front of each row.

    A spar that misses its target says so first (its cut list's own warning line, after its tag); then one
    header (every spar's columns, in order of first appearance: spars differ in their passes); then each spar's
    segments, boat-wide labels and the boat's boards; then each spar's order of operations.
    """
    warnings: list[list[str]] = []
    header: list[str] = []
    body: list[dict[str, str]] = []
    tail: list[list[str]] = []
    for i, (bs, d) in enumerate(bd.spars):
        own = cutlist_rows(bd.spar_view(i, units=bd.boat.units))
        at = next(k for k, row in enumerate(own) if row[:3] == ["stave", "segment", "label"])
        warnings += [[f"{bs.tag} ({d.spar.name}): {row[0]}"] for row in own[:at] if row]
        names = own[at]
        header += [name for name in names if name not in header]
        end = next((k for k in range(at + 1, len(own)) if not own[k]), len(own))
        for row in own[at + 1:end]:
            cells = dict(zip(names, row))
            cells["label"] = bs.label(cells["label"])
            body.append(cells)
            cells["spar"], cells["spar name"] = bs.tag, d.spar.name
        rest = [row for row in own[end + 1:]]
        if rest:
            tail += [[], [f"{bs.tag}: {d.spar.name}: {rest[0][0]}"]] + rest[1:]
    header = ["spar", "spar name"] + header
    return warnings + [header] + [[cells.get(name, "") for name in header] for cells in body] + tail


def to_boat_csv(bd: BoatDesign) -> str:
    buffer = io.StringIO()
    csv.writer(buffer, lineterminator="\n").writerows(boat_cutlist_rows(bd))
    return buffer.getvalue()
