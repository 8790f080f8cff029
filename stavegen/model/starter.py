"""The commented starter spar file that ``stavegen init`` writes, in inches or millimetres.

One template for both unit systems, drawn from the schema
(:mod:`stavegen.model.schema`): every key of every table is written with
its meaning as a comment. Keys the example sets are live; the others are
commented out at their default (or at a value to show), so removing the
``#`` is all it takes to use them.
"""

from __future__ import annotations

import textwrap

from . import schema
from .schema import PerUnit, toml_text

COLUMN = 34  # where the comments start
WIDTH = 110  # longest line

_HEAD = {
    "in": ["# Lengths are bare numbers in the file's unit or strings that carry their own:",
           '# "16 ft", "3 ft 4 in", "4 3/4", "1/8 in", "120 mm".'],
    "mm": ["# Lengths are bare numbers in the file's unit or strings that carry their own:",
           '# "4.9 m", "120 mm", "16 ft", "4 3/4 in" (a fraction in a millimetre file needs its unit).'],
}
# The second plug of the example (the first is drawn from the schema's examples).
_MASTHEAD_PLUG = {"from": PerUnit('"15 ft"', "4600"), "to": PerUnit('"16 ft"', "4900")}



def _comment_lines(prefix: str, comment: str) -> list[str]:
    """``prefix`` padded to the comment column, then ``# comment`` wrapped under it."""
    if len(prefix) < COLUMN - 1:
        parts = textwrap.wrap(comment, WIDTH - COLUMN - 2) or [""]
        return [f"{prefix:<{COLUMN - 1}} # {parts[0]}"] + [f"{'':<{COLUMN - 1}} # {part}" for part in parts[1:]]
    if len(prefix) + 4 + len(comment) <= WIDTH:
        return [f"{prefix}  # {comment}"]
    return [prefix] + [f"{'':<{COLUMN - 1}} # {part}" for part in textwrap.wrap(comment, WIDTH - COLUMN - 2)]


def _meaning(key: schema.Key, live: bool, units: str) -> str:
    text = key.meaning
    if key.kind == "choice":
        text += ": " + " | ".join(key.choices)
    if not live:
        if key.required:
            text += " (required)"
        elif key.default is schema.UNSET:
            text += " (not set unless given)"
        elif isinstance(key.default, schema.Words):
            text += f" (default: {key.default.text})"
        elif key.aside is None:
            text += " (the default)"
        else:
            text += f" (default {toml_text(key.default_for(units))})"
    return text


def _key(key: schema.Key, units: str, off: bool = False, value: PerUnit | None = None,
         comment: bool = True) -> list[str]:
    """The line(s) for one key: live at its example, or commented out (``off``, or when it has none)."""
    value = value or key.example
    live = value is not None and not off
    if value is None:
        value = key.aside
    text = value.get(units) if value is not None else toml_text(key.default_for(units))
    line = f"{'' if live else '# '}{key.name} = {text}"
    return _comment_lines(line, _meaning(key, live, units)) if comment else [line]


def _table(decl: schema.Table, units: str, off: bool = False, skip: tuple[str, ...] = ()) -> list[str]:
    header = f"[[{decl.path}]]" if decl.array else f"[{decl.path}]"
    header = ("# " if off else "") + header
    lines = _comment_lines(header, decl.short) if decl.short else [header]
    for key in decl.keys:
        if key.name not in skip:
            lines += _key(key, units, off=off)
    return lines


def starter_text(units: str = "in") -> str:
    """A commented, valid spar file in inches (``"in"``) or millimetres (``"mm"``) with every key in it."""
    out = ["# stavegen spar file: every key is here. Lines starting with # are comments: the keys commented out",
           "# are optional, shown at their default. docs/spar-file.md explains every key.",
           *_HEAD[units],
           "# Replace every figure below with your own plans' figures before you cut wood.", ""]
    out += _table(schema.SPAR, units) + [""]
    out += _table(schema.PLAN, units) + [""]
    out += _table(schema.HOLLOW, units, skip=("notch", "plug", "layer", "strip")) + [""]
    out += _table(schema.NOTCH, units, off=True) + [""]
    out += _table(schema.PLUG, units) + [""]
    out += _comment_lines("[[hollow.plug]]", "and masthead")
    for key in schema.PLUG.keys:
        if key.name in _MASTHEAD_PLUG:
            out += _key(key, units, value=_MASTHEAD_PLUG[key.name], comment=False)
    out += [""] + _table(schema.LAYER, units, off=True) + [""]
    out += _table(schema.STRIP, units, off=True) + [""]
    out += [""] + _table(schema.STOCK, units) + [""]
    out += _table(schema.OUTPUT, units) + [""]
    out += ["# A spar that comes apart (two pieces): remove the # before [parting] and the keys you use."]
    out += _table(schema.PARTING, units, off=True) + [""]
    out += ["# A wood of your own: wherever a wood is asked for (plan, hollow, a plug), a table in place of the",
            "# wood's key. For the staves, delete wood = ... under [hollow] and write:"]
    out += _table(schema.WOOD, units, off=True)
    out += ["", "# Materials of your own, used by NAME wherever a wood or a laminate is asked for (a wood with",
            "# mor_mpa, a laminate with strength_mpa and ply_thickness):"]
    out += _table(schema.MATERIAL, units, off=True)
    text = "\n".join(out).replace("# [wood]", "# [hollow.wood]", 1) + "\n"
    return text
