"""Write solved values back into a spar file's text, keeping its comments and layout.

The file is edited as a TOML document (tomlkit), not as lines of text: only
the values of ``hollow.staves``, ``hollow.wall`` and ``hollow.stations``
that were ``"auto"`` are replaced, each keeping its place and its trailing
comment; every other byte of the file stays as it was. Solved lengths are
rounded up (never down) to the 1/32 in or 0.1 mm a builder dresses to, so
the written spar is at least as stiff as the solved one.
"""

from __future__ import annotations

import math

import tomlkit
from tomlkit.items import Item

from ..units import MM_PER_INCH, format_inches
from .spar import AUTO, WALL_SOLVES, Profile, Spar


def _up(mm: float, units: str) -> str:
    """A length rounded up to the 1/32 in (bare inches, a string when it has a fraction) or 0.1 mm."""
    if units == "in":
        text = format_inches(math.ceil(mm / MM_PER_INCH * 32 - 1e-9) * MM_PER_INCH / 32, mark=False)
        return f'"{text}"' if "/" in text else text
    return f"{math.ceil(mm * 10 - 1e-9) / 10:g}"


def _position(mm: float, units: str) -> str:
    value = mm / MM_PER_INCH if units == "in" else mm
    return f"{value:.4f}".rstrip("0").rstrip(".")


def _profile(profile: Profile, units: str, pairs: bool = False) -> str:
    """A wall or diameter profile as a TOML value: one length if constant (unless ``pairs``), else pairs."""
    if profile.is_constant and not pairs:
        return _up(profile.largest, units)
    pairs = ", ".join(f"[{_position(z, units)}, {_up(v, units)}]" for z, v in zip(profile.z, profile.value))
    return f"[{pairs}]"


def _replace(table, key: str, toml_value: str) -> None:
    """Set ``key`` of ``table`` to the TOML value written ``toml_value``, keeping the old value's comment."""
    if key not in table:
        raise ValueError(f"no {key} in [hollow]")
    old = table.item(key) if hasattr(table, "item") else table[key]
    new = tomlkit.value(toml_value)
    if isinstance(old, Item):
        new.trivia.indent = old.trivia.indent
        new.trivia.comment_ws = old.trivia.comment_ws
        new.trivia.comment = old.trivia.comment
        new.trivia.trail = old.trivia.trail
    table[key] = new


def solved_values(original: Spar, solved: Spar) -> list[tuple[str, str]]:
    """(key of [hollow], TOML value) for each value ``original`` leaves "auto", as ``solved`` fills it in."""
    h, s = original.hollow, solved.hollow
    units = original.units
    out = []
    if h.staves == AUTO:
        out.append(("staves", str(s.staves)))
    if isinstance(h.wall, str) and h.wall in WALL_SOLVES:
        out.append(("wall", _profile(s.wall, units)))
    if h.diameter == AUTO and s.two_axis:  # [position, fore_aft, athwartships], each rounded up
        triples = ", ".join(f"[{_position(z, units)}, {_up(v, units)}, {_up(float(s.athwartships.at(z)), units)}]"
                            for z, v in zip(s.diameter.z, s.diameter.value))
        out.append(("stations", f"[{triples}]"))
    elif h.diameter == AUTO:
        out.append(("stations", _profile(s.diameter, units, pairs=True)))
    return out


def with_solved_values(text: str, original: Spar, solved: Spar) -> str:
    """``text`` (the spar file) with the values ``original`` left "auto" filled in from ``solved``."""
    doc = tomlkit.parse(text)
    hollow = doc["hollow"]
    for key, value in solved_values(original, solved):
        _replace(hollow, key, value)
    return tomlkit.dumps(doc)
