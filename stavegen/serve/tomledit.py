"""Edit a spar file's text key by key, keeping its comments and layout (tomlkit).

Keys are written as the loader names them in its messages: ``hollow.wall``,
``hollow.plug[2].from`` (list items counted from 1), so a message's key and
the field the page edits are the same string. A value arrives as the page's
field text and is written as the builder would write it in the file: text that
is a TOML value on its own (``1.0``, ``[[0, 4.5], ["2 ft", 5]]``, ``true``,
``"auto"``) is written as it is typed; anything else (``4 1/4``, ``20 ft``,
``auto``) becomes a string, which the loader then reads as a length or a word.
"""

from __future__ import annotations

import re
import tomllib
from typing import Any

import tomlkit
from tomlkit.items import AoT, Item

from ..errors import InputError

_PART = re.compile(r"([A-Za-z0-9_-]+)((?:\[\d+\])*)")


class EditError(InputError):
    """An edit that cannot be made (a key that names no place in the file)."""


def parse_key(key: str) -> list[str | int]:
    """``"hollow.plug[2].from"`` → ``["hollow", "plug", 1, "from"]`` (list positions from 0)."""
    parts: list[str | int] = []
    for piece in key.split("."):
        match = _PART.fullmatch(piece.strip())
        if not match:
            raise EditError(f"not a key of a spar file: {key!r}", key)
        parts.append(match.group(1))
        for index in re.findall(r"\[(\d+)\]", match.group(2)):
            if int(index) < 1:
                raise EditError("list positions count from 1", key)
            parts.append(int(index) - 1)
    return parts


def _literal(text: str) -> Item:
    """The item for one field's text: a TOML value as typed, or else a string."""
    text = text.strip()
    try:
        parsed = tomllib.loads(f"v = {text}")["v"]
    except tomllib.TOMLDecodeError:
        return tomlkit.string(text)
    if not isinstance(parsed, (str, int, float, bool, list, dict)):  # dates and times: keep the words
        return tomlkit.string(text)
    try:
        return tomlkit.value(text)
    except Exception:  # tomlkit and tomllib disagree on an odd literal: write the parsed value
        return tomlkit.item(parsed)


def to_item(value: Any, as_string: bool = False) -> Item | None:
    """A tomlkit item for a value from the page; None for "no value" (the key is removed)."""
    if value is None:
        return None
    if isinstance(value, bool) or isinstance(value, (int, float)):
        return tomlkit.item(value)
    if isinstance(value, str):
        if not value.strip():
            return None
        return tomlkit.string(value.strip()) if as_string else _literal(value)
    if isinstance(value, list):
        array = tomlkit.array()
        for element in value:
            item = to_item(element) if not (isinstance(element, str) and not element.strip()) else tomlkit.string("")
            array.append(item if item is not None else tomlkit.string(""))
        return array
    if isinstance(value, dict):
        table = tomlkit.inline_table()
        for k, v in value.items():
            item = to_item(v, as_string=k in ("name", "source"))
            if item is not None:
                table[str(k)] = item
        return table
    raise EditError(f"cannot write a {type(value).__name__} into a spar file")


def _step(node: Any, part: str | int, key: str, create: bool, created: list | None = None) -> Any:
    if isinstance(part, int):
        if not isinstance(node, (list, AoT)) or part >= len(node):
            raise EditError("no such item in the file", key)
        return node[part]
    if not hasattr(node, "get") or not hasattr(node, "__setitem__"):
        raise EditError("is not a table in the file", key)
    if part not in node:
        if not create:
            raise EditError("no such key in the file", key)
        node[part] = tomlkit.table()
        if created is not None:
            created.append(node[part])
    return node[part]


def _parent(doc: Any, parts: list[str | int], key: str, create: bool, created: list | None = None) -> Any:
    node = doc
    for part in parts[:-1]:
        node = _step(node, part, key, create, created)
    return node


def _keep_comment_column(old: Item, new: Item) -> None:
    """Move a trailing comment so that it starts where it did before the value changed."""
    if not old.trivia.comment:
        return
    shift = len(old.as_string()) - len(new.as_string())
    new.trivia.comment = old.trivia.comment
    new.trivia.comment_ws = " " * max(1, len(old.trivia.comment_ws) + shift)


def set_value(doc: Any, key: str, value: Any, as_string: bool = False, created: list | None = None) -> None:
    """Set (or, for None or an empty text, remove) ``key``; tables on the way are made as needed (and
    listed in ``created``)."""
    parts = parse_key(key)
    item = to_item(value, as_string)
    if item is None:
        delete(doc, key, missing_ok=True)
        return
    parent = _parent(doc, parts, key, create=True, created=created)
    last = parts[-1]
    if isinstance(last, int):
        if not isinstance(parent, list) or last >= len(parent):
            raise EditError("no such item in the file", key)
        parent[last] = item
        return
    if not hasattr(parent, "__setitem__") or isinstance(parent, (list, AoT)):
        raise EditError("is not a table in the file", key)
    old = parent.get(last) if last in parent else None
    parent[last] = item
    if isinstance(old, Item) and not isinstance(old, (AoT,)) and hasattr(old, "trivia"):
        new = parent[last]
        if isinstance(new, Item):
            _keep_comment_column(old, new)


def delete(doc: Any, key: str, missing_ok: bool = False) -> None:
    """Remove ``key`` (a key, a table, or one ``[[...]]`` table by position)."""
    parts = parse_key(key)
    try:
        parent = _parent(doc, parts, key, create=False)
    except EditError:
        if missing_ok:
            return
        raise
    last = parts[-1]
    if isinstance(last, int):
        if not isinstance(parent, (list, AoT)) or last >= len(parent):
            if missing_ok:
                return
            raise EditError("no such item in the file", key)
        del parent[last]
        return
    if last in parent:
        del parent[last]
    elif not missing_ok:
        raise EditError("no such key in the file", key)


def append_table(doc: Any, key: str, values: dict[str, Any]) -> None:
    """Add a ``[[key]]`` table (a plug) at the end of the list, with ``values``."""
    parts = parse_key(key)
    parent = _parent(doc, parts, key, create=True)
    last = parts[-1]
    if isinstance(last, int):
        raise EditError("name the list, not an item of it", key)
    if last not in parent:
        parent[last] = tomlkit.aot()
    aot = parent[last]
    if not isinstance(aot, AoT):
        raise EditError("is not a list of [[tables]] in the file", key)
    table = tomlkit.table()
    for k, v in values.items():
        item = to_item(v)
        if item is not None:
            table[str(k)] = item
    table.add(tomlkit.nl())
    aot.append(table)


def syntax_check(text: str, source: str) -> dict[str, Any]:
    """The file's tables as the loader sees them; bad TOML is reported in the loader's words."""
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(f"TOML syntax error: {exc}", source=source) from None


def apply_edits(text: str, ops: list[dict[str, Any]], source: str = "") -> str:
    """``text`` with each edit made in turn: ``{"set": key, "value": v, "string": bool}``,
    ``{"delete": key}`` or ``{"append": key, "value": {...}}``. Comments and layout elsewhere are kept."""
    syntax_check(text, source)
    if not ops:
        return text
    doc = tomlkit.parse(text)
    created: list = []
    for op in ops:
        if not isinstance(op, dict):
            raise EditError("each edit is a table: set, delete or append")
        if "set" in op:
            set_value(doc, str(op["set"]), op.get("value"), bool(op.get("string")), created)
        elif "delete" in op:
            delete(doc, str(op["delete"]), missing_ok=True)
        elif "append" in op:
            values = op.get("value") or {}
            if not isinstance(values, dict):
                raise EditError("append takes a table of values", str(op["append"]))
            append_table(doc, str(op["append"]), values)
        else:
            raise EditError("each edit is one of set, delete or append")
    for table in created:  # a blank line after a table the edits added, before the next one
        if len(table):
            table.add(tomlkit.nl())
    result = tomlkit.dumps(doc)
    syntax_check(result, source)  # an edit must never leave a file the loader cannot read
    return result
