"""The reference of every key of the spar file and the boat file, generated from the loader's schema.

``python -m stavegen.model.reference > docs/spar-file.md`` writes it; a test
compares that file with :func:`reference_markdown`, so it cannot drift from
what the loader reads.
"""

from __future__ import annotations

from . import schema
from .schema import PerUnit, Words, toml_text

_INTRO = """\
# The spar file: every key

<!-- Generated from stavegen/model/schema.py by `python -m stavegen.model.reference > docs/spar-file.md`;
     tests/test_spar_file.py fails when it is out of date. Do not edit by hand. -->

A spar file is TOML. `stavegen init FILE [--units in|mm]` writes one with every key below in it,
commented; the samples in `samples/` are worked examples. Bad input is refused with one line naming the
file, the key and what is wrong (exit code 2). A key the loader does not know is refused first, with the
nearest known key, before any value is read.

Lengths are bare numbers in the file's unit (`units = "in"` or `"mm"`) or strings that carry their own.
A fraction with no unit (`"1/8"`, `"4 3/4"`) is inches by nature: in a millimetre file it is refused,
with both readings in the message, until you write its unit (`"1/8 in"`) or a decimal of millimetres.

Figures no spar could have are refused as slips (a diameter 2.5 times its neighbour's, a kerf of an inch
or more); unlikely ones are printed as one warning line each (by `check`, `build`, `section` and `size`,
and in the JSON's `warnings`) and the run goes on.
"""

_BOAT_HEAD = """\
# The boat file

A boat file lists spar files to build as one job: `stavegen check`, `build` and `size` take it where they take
a spar file, and `stavegen init FILE --boat` writes a starter boat. It has a `[boat]` table, and one `[stock]`
and one `[output]` for every spar: the keys of a spar file's `[stock]` (less `no_scarf`, which stays each
spar's own; `scarf_ratio` and `scarf_stagger` replace a spar's own only where the boat gives them) and of its
`[output]`, above. Each spar file stays an ordinary spar file that builds alone.
"""

_KINDS_HEAD = """\
## Kinds of values

| kind | written as |
| --- | --- |
"""


def _cell(text: str) -> str:
    return text.replace("|", "\\|").replace("\n", " ")



def _default(key: schema.Key) -> str:
    d = key.default
    if d is schema.REQUIRED:
        return "**required**"
    if d is schema.UNSET:
        return "not set"
    if isinstance(d, Words):
        return d.text
    if isinstance(d, PerUnit):
        return f"`{toml_text(d.inch)}` (in), `{toml_text(d.mm)}` (mm)"
    return f"`{toml_text(d)}`"


def _value(key: schema.Key) -> str:
    if key.kind == "choice":
        return "one of " + ", ".join(f'`"{c}"`' for c in key.choices)
    text = key.kind
    if key.kind == "length":
        text += ", 0 or more" if key.zero_ok else ", above 0"
    elif key.kind == "number":
        low = "" if key.low is None else (f"above {key.low:g}" if key.low_open else f"at least {key.low:g}")
        high = "" if key.high is None else f"at most {key.high:g}"
        text += ", " + ", ".join(p for p in (low, high) if p) if (low or high) else ""
    elif key.kind == "text" and key.longest:
        text += f", at most {key.longest} characters"
    elif key.kind == "table":
        text = "table"
    elif key.kind == "tables":
        text = "array of tables"
    return text


def _table(decl: schema.Table) -> list[str]:
    header = f"[[{decl.path}]]" if decl.array else f"[{decl.path}]"
    if decl is schema.WOOD:
        header = "A wood of your own"
    state = "required" if decl.required else "optional"
    out = [f"## {header}" + ("" if decl is schema.WOOD else f" ({state})"), "", decl.meaning]
    if decl.note:
        out += ["", decl.note]
    out += ["", "| key | value | default | meaning |", "| --- | --- | --- | --- |"]
    for key in decl.keys:
        out.append(f"| `{key.name}` | {_cell(_value(key))} | {_cell(_default(key))} | {_cell(key.meaning)} |")
    notes = [k for k in decl.keys if k.note or k.choice_notes]
    if notes:
        out.append("")
    for key in notes:
        line = f"- `{key.name}`:"
        if key.note:
            line += f" {key.note}"
        out.append(line)
        for choice in key.choices:
            if choice in key.choice_notes:
                out.append(f"  - `\"{choice}\"`: {key.choice_notes[choice]}.")
    return out + [""]


def reference_markdown() -> str:
    """The whole reference (spar file, then boat file), as docs/spar-file.md holds it."""
    out = [_INTRO]
    for decl in schema.SPAR_FILE:
        out += _table(decl)
    from .boat import BOAT, BOAT_SPAR

    out.append(_BOAT_HEAD)
    for decl, header in ((BOAT, "### [boat] (required)"),
                         (BOAT_SPAR, "### Each entry of `spars`: a file name, or a table with these keys")):
        out += [header if line.startswith("## ") else line for line in _table(decl)]
    out.append(_KINDS_HEAD.rstrip("\n"))
    used = {key.kind for decl in schema.SPAR_FILE for key in decl.keys}
    for kind, words in schema.KINDS.items():
        if kind in used:
            out.append(f"| {kind} | {_cell(words)} |")
    return "\n".join(out) + "\n"


if __name__ == "__main__":
    import sys

    sys.stdout.write(reference_markdown())
