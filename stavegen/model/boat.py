"""A boat file: several spar files built as one job, with one [stock] and one [output].

```toml
[boat]
name = "Day-sailer"
units = "in"
spars = [{ file = "mast.toml", tag = "M" }, { file = "boom.toml", tag = "B" }, "gaff.toml"]

[stock]      # the boards of the one lumber order: the keys of a spar file's [stock], less no_scarf
[output]     # paper, mark_spacing, templates_on_boards: for every paper of the boat
```

Each entry of ``spars`` is a spar file (a path relative to the boat file), given as
a string or as a table with ``file`` and an optional ``tag``: a short name (1 to 4
letters or digits) that starts the labels of its segments in the boat's order and
cut list ("M-S3-2": spar M, stave 3, segment 2). A spar without a tag gets the first
of A, B, C, ... that no other spar uses. Tags and spar names are unique in a boat
(the spar's name names its files).

The spar files stay ordinary spar files that build alone. In the boat, every spar is
built from the boat's boards: the boat's [stock] gives the boards and how they are cut
(thickness, nominal thickness, widths, nominal widths, lengths, kerf, separate_with,
router_bit, edge_allowance, waste), each with its usual default; ``scarf_ratio`` and
``scarf_stagger`` replace a spar file's own only where the boat gives them; the
no-scarf ranges stay each spar's own. The boat's [output] replaces every spar's.
A spar whose own [stock] lists other boards is built with the boat's, and its
warnings say so.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, replace
from pathlib import Path
from types import SimpleNamespace
from typing import Any, Mapping

from ..errors import InputError, length
from . import schema
from .loader import _Table, _kind, _output, _stock, parse_spar, read_toml, toml_from_bytes
from .schema import UNSET, Key, Table, Words
from .spar import OutputOptions, Profile, Spar, Stock

TAG = re.compile(r"^[A-Za-z0-9]{1,4}$")

# The boat file's own tables, declared as the spar file's are (schema.py); [stock] and [output] are the spar
# file's own declarations.
BOAT = Table("boat", "What the boat is, the unit of its file, and its spar files.", required=True, keys=(
    Key("name", "text", "what the boat is called; it titles the boat's papers and names their files", longest=120),
    Key("units", "choice", "the unit of bare numbers in the boat file and of the boat's printed figures",
        default="in", choices=("in", "mm")),
    Key("spars", "spars", "the spar files, from the boat file's folder: names, or tables with file and tag"),
))
BOAT_SPAR = Table("boat.spars", "One spar of the boat.", array=True, keys=(
    Key("file", "text", "the spar file, from the boat file's folder", longest=300),
    Key("tag", "text", "1 to 4 letters or digits that start its segments' labels", default=UNSET, longest=4),
))
BOAT_TOP = Table("", "The boat file.", required=True, keys=(
    Key("boat", "table", BOAT.meaning),
    Key("stock", "table", "the boards of the boat's one order", default=UNSET),
    Key("output", "table", "drawing and printing, for every paper of the boat", default=Words("the defaults")),
))
BOARD_KEYS = ("thickness", "nominal_thickness", "widths", "nominal_widths", "lengths", "kerf", "separate_with",
              "router_bit", "edge_allowance", "waste")


@dataclass(frozen=True)
class BoatSpar:
    """One spar of a boat: as the boat builds it (its boards and output the boat's), its tag and its file."""

    spar: Spar
    tag: str
    file: str
    own_boards_differ: bool = False

    def label(self, segment_label: str) -> str:
        """The boat-wide label of one of this spar's segments: tag, then the spar's own label."""
        return f"{self.tag}-{segment_label}"


@dataclass(frozen=True)
class Boat:
    """A boat file, validated: its spars (each resolved against the boat's stock and output)."""

    name: str
    units: str
    spars: tuple[BoatSpar, ...]
    stock: Stock | None
    output: OutputOptions
    source: str = ""

    @property
    def slug(self) -> str:
        words = re.findall(r"[a-z0-9]+", self.name.lower())
        return "-".join(words) or "boat"


def is_boat(data: dict[str, Any]) -> bool:
    """Whether parsed TOML is a boat file (it has a [boat] table)."""
    return isinstance(data, dict) and "boat" in data


def _entries(value: Any, key: str) -> list[tuple[str, str | None, str]]:
    """(file, tag or None, key) for every entry of boat.spars."""
    if not isinstance(value, list) or not value:
        raise InputError(f"expected a list of spar files, got {_kind(value)}", key)
    out = []
    for i, item in enumerate(value, start=1):
        k = f"{key}[{i}]"
        if isinstance(item, str):
            file, tag = item, None
        elif isinstance(item, dict):
            t = _Table(item, k, "in", BOAT_SPAR)
            file, tag = t.get("file"), t.get("tag")
            if tag is not None and not TAG.match(tag):
                raise InputError(f"tag {tag!r} must be 1 to 4 letters or digits", f"{k}.tag")
        else:
            raise InputError(f"expected a spar file name or a table with file and tag, got {_kind(item)}", k)
        if not file.strip():
            raise InputError("must not be empty", k)
        out.append((file, tag, k))
    return out


def _tags(entries: list[tuple[str, str | None, str]]) -> list[str]:
    """Each spar's tag: its own, or the first free letter A, B, C, ... (unique, ignoring case)."""
    taken: dict[str, str] = {}
    for _, tag, key in entries:
        if tag is not None:
            if tag.upper() in taken:
                raise InputError(f"tag {tag!r} is already the tag of {taken[tag.upper()]}; tags label the "
                                 "segments and must differ", f"{key}.tag")
            taken[tag.upper()] = key
    letters = (chr(c) for c in range(ord("A"), ord("Z") + 1))
    out = []
    for _, tag, key in entries:
        if tag is None:
            tag = next(c for c in letters if c not in taken)
            taken[tag] = key
        out.append(tag)
    return out


def _boat_stock(data: Any, units: str) -> Stock:
    """The boat's [stock], read as a spar file's is; the no-scarf ranges belong to each spar."""
    t = _Table(data, "stock", units, schema.STOCK)
    if t.has("no_scarf"):
        raise t.fail("no_scarf", "belongs in each spar file: where no scarf may fall differs from spar to spar")
    return _stock(t, units, math.inf, SimpleNamespace(wall=None))


def _in_boat(spar: Spar, stock: Stock | None, given: set[str], output: OutputOptions, boat_source: str) -> tuple[Spar, bool]:
    """The spar as the boat builds it: the boat's boards and output; True if its own boards differ."""
    if stock is None:
        return replace(spar, output=output), False
    own = spar.stock
    merged = stock
    if own is not None:
        merged = replace(stock, no_scarf=own.no_scarf,
                         scarf_ratio=stock.scarf_ratio if "scarf_ratio" in given else own.scarf_ratio,
                         scarf_stagger=stock.scarf_stagger if "scarf_stagger" in given else own.scarf_stagger)
    differ = own is not None and any(getattr(own, f) != getattr(merged, f) for f in BOARD_KEYS)
    wall = spar.hollow.wall
    if isinstance(wall, Profile) and wall.largest > merged.thickness + 1e-9:
        raise InputError(f"boards {{boards}} thick are thinner than the wall of {spar.name} ({{wall}}, {spar.source})",
                         "stock.thickness", boat_source,
                         figures={"boards": length(merged.thickness), "wall": length(wall.largest)})
    return replace(spar, stock=merged, output=output), differ


def parse_boat(data: dict[str, Any], source: str = "", texts: Mapping[str, bytes] | None = None) -> Boat:
    """A validated :class:`Boat` from parsed TOML. Its spar files are read relative to ``source``'s folder or,
    when ``texts`` is given, taken from it by the names the boat file lists (the page sends them; no path is
    opened then)."""
    folder = Path(source).parent if source else Path(".")
    units = ""
    try:
        _Table(data, "", "in", BOAT_TOP)  # refuses a key the boat file does not declare
        boat_t = _Table(data["boat"], "boat", "in", BOAT) if "boat" in data else None
        if boat_t is None:
            raise InputError("missing table [boat]", "boat")
        units = boat_t.get("units")
        name = boat_t.get("name")
        entries = _entries(boat_t.raw("spars"), boat_t.key("spars"))
        tags = _tags(entries)
        given = set(data["stock"]) if isinstance(data.get("stock"), dict) else set()
        stock = _boat_stock(data["stock"], units) if "stock" in data else None
        output_t = _Table(data["output"], "output", units, schema.OUTPUT) if "output" in data else None
    except InputError as exc:
        raise exc.located(source, units)
    loaded = []
    for (file, _, key), tag in zip(entries, tags):
        if texts is not None:
            if file not in texts:
                raise InputError(f"no spar file {file!r} came with the boat file", key, source)
            spar_source = file
            spar_data = toml_from_bytes(texts[file], spar_source)
        else:
            path = folder / file
            if not path.exists():
                raise InputError(f"no spar file {file!r} (paths are from the boat file's folder)", key, source)
            spar_source = str(path)
            spar_data = read_toml(path)
        if "boat" in spar_data:
            raise InputError(f"{file!r} is a boat file; a boat lists spar files", key, source)
        loaded.append((parse_spar(spar_data, spar_source), tag, file, key))
    try:
        output = _output(output_t, units, max(s.length for s, *_ in loaded))
    except InputError as exc:
        raise exc.located(source, units)
    spars = []
    slugs: dict[str, str] = {}
    for spar, tag, file, key in loaded:
        if spar.slug in slugs:
            raise InputError(f"the spar {spar.name!r} ({file}) would write files of the same name as the spar "
                             f"{slugs[spar.slug]}; give each spar a name of its own", key, source)
        slugs[spar.slug] = repr(spar.name)
        try:
            merged, differ = _in_boat(spar, stock, given, output, source)
        except InputError as exc:
            raise exc.in_units(units)
        spars.append(BoatSpar(spar=merged, tag=tag, file=file, own_boards_differ=differ))
    return Boat(name=name, units=units, spars=tuple(spars), stock=stock, output=output, source=source)


def load_boat(path: str | Path) -> Boat:
    """Read and validate the boat file at ``path`` and every spar file it lists."""
    return parse_boat(read_toml(path), str(path))


def load_job(path: str | Path) -> Spar | Boat:
    """A spar file or a boat file (one with a [boat] table), validated."""
    data = read_toml(path)
    if is_boat(data):
        return parse_boat(data, str(path))
    return parse_spar(data, str(path))
