"""Write solved values back into a spar file's text, keeping its comments and layout.

Only the values of ``hollow.staves``, ``hollow.wall`` and ``hollow.stations``
that were ``"auto"`` are replaced, in place, each on its own line. Solved
lengths are rounded up (never down) to the 1/32 in or 0.1 mm a builder
dresses to, so the written spar is at least as stiff as the solved one.
"""

from __future__ import annotations

import math
import re

from ..units import MM_PER_INCH, format_inches
from .spar import AUTO, WALL_SOLVES, Profile, Spar

_TABLE = re.compile(r"^\s*\[(?!\[)([^\]]+)\]\s*(#.*)?$")


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


def _replace_in_hollow(text: str, key: str, value: str) -> str:
    """Replace ``key = ...`` (one line) in the [hollow] table of ``text``, keeping a trailing comment."""
    lines = text.splitlines(keepends=True)
    table = None
    for i, line in enumerate(lines):
        header = _TABLE.match(line)
        if header:
            table = header.group(1).strip()
            continue
        if line.lstrip().startswith("[["):
            table = None
            continue
        if table != "hollow":
            continue
        m = re.match(rf"^(\s*{key}\s*=\s*)(\"[^\"]*\"|'[^']*'|[^#\n]*?)(\s*#.*)?(\r?\n)?$", line)
        if m:
            lines[i] = f"{m.group(1)}{value}{m.group(3) or ''}{m.group(4) or ''}"
            return "".join(lines)
    raise ValueError(f"no {key} in [hollow]")


def with_solved_values(text: str, original: Spar, solved: Spar) -> str:
    """``text`` (the spar file) with the values ``original`` left "auto" filled in from ``solved``."""
    h, s = original.hollow, solved.hollow
    units = original.units
    if h.staves == AUTO:
        text = _replace_in_hollow(text, "staves", str(s.staves))
    if isinstance(h.wall, str) and h.wall in WALL_SOLVES:
        text = _replace_in_hollow(text, "wall", _profile(s.wall, units))
    if h.diameter == AUTO:
        text = _replace_in_hollow(text, "stations", _profile(s.diameter, units, pairs=True))
    return text
