"""The one error a user sees for bad input: file, key, what is wrong.

Also the helpers that keep such a line short and safe to print: text from a
spar file or the command line is shown with its control characters escaped
(an escape sequence in a name must not clear the screen), values are quoted
cut to a sensible length, and odd key names are quoted as TOML writes them.
"""

from __future__ import annotations

import re
import unicodedata
from typing import Any

# Characters that steer a terminal or reorder text: C0 and C1 controls, DEL, and the bidirectional overrides.
_BIDI = {0x200E, 0x200F, 0x2028, 0x2029, *range(0x202A, 0x202F), *range(0x2066, 0x206A)}
_BARE_KEY = re.compile(r"[A-Za-z0-9_-]+")
VALUE_LIMIT = 40  # characters of a quoted value in a message
KEY_LIMIT = 40  # characters of a quoted key name
SOURCE_LIMIT = 300  # characters of a file name
PROBLEM_LIMIT = 500  # characters of the problem


def is_control(ch: str) -> bool:
    """A character that is not printed but acts on the terminal (or on the order of the text around it)."""
    return unicodedata.category(ch) == "Cc" or ord(ch) in _BIDI


def printable(text: str) -> str:
    """``text`` with every control character written as an escape (``\\x1b``); tabs and newlines become spaces."""
    if not any(is_control(ch) for ch in text):
        return text
    out = []
    for ch in text:
        if ch in "\t\n\r":
            out.append(" ")
        elif is_control(ch):
            code = ord(ch)
            out.append(f"\\x{code:02x}" if code < 0x100 else f"\\u{code:04x}")
        else:
            out.append(ch)
    return "".join(out)


def cut(text: str, limit: int) -> str:
    """``text`` cut to ``limit`` characters, the cut marked with an ellipsis and the full length."""
    if len(text) <= limit:
        return text
    return f"{text[:limit]}… ({len(text):,} characters)"


def shown(value: Any, limit: int = VALUE_LIMIT) -> str:
    """A value quoted for a message: repr-like, control characters escaped, cut to ``limit`` characters."""
    if isinstance(value, bool):
        return str(value).lower()
    if isinstance(value, int) and value.bit_length() > 64:
        digits = int(value.bit_length() * 0.30103) + 1
        return f"{'-' if value < 0 else ''}a whole number of about {digits:,} digits"
    if isinstance(value, str):
        body = cut(value, limit)
        return "'" + printable(body.replace("\\", "\\\\").replace("'", "\\'")) + "'"
    if isinstance(value, (list, dict)):
        return cut(printable(repr(value)), limit)
    return cut(printable(repr(value)), limit)


def key_text(name: str) -> str:
    """A key name as it reads in a dotted path: bare if TOML allows it bare, else quoted (``"stave count"``)."""
    if _BARE_KEY.fullmatch(name):
        return cut(name, KEY_LIMIT)
    escaped = cut(name, KEY_LIMIT).replace("\\", "\\\\").replace('"', '\\"')
    return '"' + printable(escaped) + '"'


class InputError(Exception):
    """Bad input, reported as one line and exit code 2.

    ``source`` is the file (or a label such as ``--at``), ``key`` the dotted
    table path of the offending entry (``hollow.plug[2].from``), ``problem``
    what is wrong with it, in plain words.
    """

    def __init__(self, problem: str, key: str = "", source: str = "") -> None:
        super().__init__(problem)
        self.problem = problem
        self.key = key
        self.source = source

    def __reduce__(self):  # whole across processes (the stave-count comparison's workers), key and file too
        return (self.__class__, (self.problem, self.key, self.source))

    def located(self, source: str) -> "InputError":
        """The same error, naming ``source`` if it named no file yet."""
        if not self.source:
            self.source = source
        return self

    def one_line(self) -> str:
        """``file: key: problem`` on one line, control characters escaped, each part of a sensible length."""
        parts = [cut(printable(self.source), SOURCE_LIMIT) if self.source else "",
                 printable(self.key), cut(printable(self.problem), PROBLEM_LIMIT)]
        text = ": ".join(p for p in parts if p)
        return " ".join(text.split())


class DesignError(InputError):
    """Geometry the spar file asks for cannot be built (still exit code 2)."""
