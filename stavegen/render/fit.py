"""Tables and lines that fit the terminal without cutting a figure.

Rich shortens a cell that does not fit its column with "…" and wraps text at
any space, which would print ``3 11/32"`` as ``3 11/…`` or split it over two
lines as ``3`` and ``11/32"``. Here instead:

- :class:`Fitted` prints a table whole when it fits; when it is too wide it
  prints as several tables side by side in the rows, each repeating the key
  columns (the station, the stave count), and, should even one column beside
  the keys not fit, as one block of "heading: value" lines per row;
- :class:`Prose` wraps a line of words only at spaces that are not inside a
  figure (a whole number and its fraction, feet and inches, a number and its
  unit stay on one line).

Neither decides anything: they lay out what the tables and lines hold.
"""

from __future__ import annotations

import copy
import re

from rich.cells import cell_len
from rich.console import Console, ConsoleOptions, RenderResult
from rich.measure import Measurement
from rich.table import Table
from rich.text import Text

# Spaces that belong to a figure: 3 7/16, 5' 3, 1' 6", 24.5 lb, 900.0 mm, 1,204 lbf, 27 %, 45.00 °.
_UNITS = (r"mm|cm|m|in|ft|lb|lbf|kg|N|kN|psi|ksi|MPa|GPa|L|BF|mm²|mm³|mm⁴|in²|in³|in⁴|ft²|ft³|m²|m³|"
          r"lb/ft³|kg/m³|lbf/in|N/mm|%|°|board\s+feet|board\s+foot|staves?|thicknesses?")
_GLUE = re.compile(rf"(?<=\d)\s(?=\d+/\d+)|(?<=\d['’])\s(?=\d)|(?<=[\d\"”])\s(?=(?:{_UNITS})(?![A-Za-z]))")
_WORD = re.compile(r"\S+\s*")
_KEEP = "\x00"  # stands in for a glued space while the line is cut into words


def glued(text: str) -> str:
    """``text`` with every space inside a figure replaced by a stand-in character of the same length."""
    return _GLUE.sub(_KEEP, text)


def words(text: str) -> list[tuple[int, int]]:
    """(start, end) of each unbreakable word of one line of ``text``, its trailing spaces included."""
    return [m.span() for m in _WORD.finditer(glued(text))]


def break_offsets(text: str, width: int) -> list[int]:
    """Offsets at which to break ``text`` (which may hold newlines) into lines of at most ``width`` cells,
    breaking only between words; a word longer than the width gets a line of its own."""
    offsets: list[int] = []
    start = 0
    for line in text.split("\n"):
        used = 0
        for a, b in words(line):
            word = line[a:b]
            if used and used + cell_len(word.rstrip()) > width:
                offsets.append(start + a)
                used = 0
            used += cell_len(word)
        start += len(line) + 1
        if start <= len(text):
            offsets.append(start)
    return [o for o in offsets if 0 < o < len(text)]


class Prose:
    """A line (or a few) of words wrapped to the width without splitting a figure."""

    def __init__(self, text: Text | str, style: str = "") -> None:
        self.text = text.copy() if isinstance(text, Text) else Text(text, style=style)

    def __rich_measure__(self, console: Console, options: ConsoleOptions) -> Measurement:
        plain = self.text.plain
        longest = max((cell_len(plain[a:b].rstrip()) for line in plain.split("\n") for a, b in words(line)),
                      default=0)
        widest = max((cell_len(line) for line in plain.split("\n")), default=0)
        return Measurement(longest, widest).clamp(None, options.max_width)

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        text = self.text
        plain = text.plain
        offsets = break_offsets(plain, max(1, options.max_width))
        lines = text.divide(offsets) if offsets else [text]
        out = Text(style=text.style, end=text.end, overflow="fold", no_wrap=False)
        for i, line in enumerate(lines):
            line = line.copy()
            line.rstrip()
            if line.plain.endswith("\n"):
                line.right_crop(1)
            out.append_text(line)
            if i < len(lines) - 1:
                out.append("\n")
        yield out


# Tables ------------------------------------------------------------------------------------------------------


def _cell_width(console: Console, cell, no_wrap: bool) -> int:
    """The least width a cell needs: its widest line when it must not wrap, else its longest word."""
    if isinstance(cell, str):
        cell = console.render_str(cell)
    if isinstance(cell, Text):
        lines = cell.plain.split("\n")
        if no_wrap:
            return max(cell_len(line) for line in lines)
        return max((cell_len(line[a:b].rstrip()) for line in lines for a, b in words(line)), default=0)
    return Measurement.get(console, console.options, cell).minimum


def column_needs(console: Console, table: Table) -> list[int]:
    """The least width of each column, padding included, such that no cell is cut."""
    needs = []
    last = len(table.columns) - 1
    for i, column in enumerate(table.columns):
        cells = [column.header] if table.show_header else []
        cells += list(column.cells)
        need = max((_cell_width(console, c, column.no_wrap) for c in cells), default=0)
        need = max(need, column.min_width or 0)
        _, pad_right, _, pad_left = table.padding
        if not table.pad_edge:
            pad_left = 0 if i == 0 else pad_left
            pad_right = 0 if i == last else pad_right
        if table.collapse_padding and i > 0:
            pad_left = max(0, pad_left - pad_right)
        needs.append(need + pad_left + pad_right)
    return needs


def _frame(table: Table, columns: int) -> int:
    """What the box takes of the width for ``columns`` columns: both edges and a rule between columns."""
    if not table.box:
        return 0
    return (2 if table.show_edge else 0) + columns - 1


def table_need(console: Console, table: Table) -> int:
    """The least width ``table`` prints in without cutting a cell."""
    return sum(column_needs(console, table)) + _frame(table, len(table.columns))


def _part(table: Table, indices: list[int], first: bool, last: bool) -> Table:
    """A table of the same rows and look holding only the columns ``indices``."""
    part = copy.copy(table)
    part.columns = []
    for i in indices:
        column = copy.copy(table.columns[i])
        column._index = len(part.columns)
        part.columns.append(column)
    if not first:
        part.title = f"{table.title.plain if isinstance(table.title, Text) else table.title} (continued)" \
            if table.title else None
    if not last:
        part.caption = None
    part.expand = False
    return part


class Fitted:
    """A table that prints without cutting a figure at any width (see the module's note).

    ``keys`` is how many leading columns identify a row and are repeated in every part.
    """

    def __init__(self, table: Table, keys: int = 1) -> None:
        self.table = table
        self.keys = keys

    def __rich_measure__(self, console: Console, options: ConsoleOptions) -> Measurement:
        return Measurement.get(console, options, self.table)

    def parts(self, console: Console, width: int) -> list[Table] | None:
        """The tables to print at ``width``: the table itself, or its parts; None when even the keys and one
        more column do not fit (print row by row)."""
        table = self.table
        needs = column_needs(console, table)
        if sum(needs) + _frame(table, len(needs)) <= width:
            return [table]
        tight = copy.copy(table)  # one space between columns (a box's rule, or the padding) before splitting
        tight.padding = (0, 0, 0, 0) if table.box else (0, 1, 0, 0)
        tight.pad_edge = False
        needs = column_needs(console, tight)
        if sum(needs) + _frame(tight, len(needs)) <= width:
            return [tight]
        table = tight
        keys = list(range(min(self.keys, len(needs))))

        def need(group: list[int]) -> int:
            return sum(needs[i] for i in keys + group) + _frame(table, len(keys) + len(group))

        groups: list[list[int]] = []
        for i in range(len(keys), len(needs)):
            if groups and need(groups[-1] + [i]) <= width:
                groups[-1].append(i)
            elif need([i]) <= width:
                groups.append([i])
            else:
                return None
        return [_part(table, keys + group, n == 0, n == len(groups) - 1) for n, group in enumerate(groups)]

    def __rich_console__(self, console: Console, options: ConsoleOptions) -> RenderResult:
        parts = self.parts(console, options.max_width)
        if parts is not None:
            for n, part in enumerate(parts):
                if n:
                    yield Text("")
                yield part
            return
        yield from self._stacked(console)

    def _stacked(self, console: Console) -> RenderResult:
        """One block per row: each cell under its column's heading, as "heading: value"."""
        table = self.table
        if table.title:
            yield table.title if isinstance(table.title, Text) else Text(str(table.title), style="italic")
        heads = [" ".join(console.render_str(c.header).plain.split()) if isinstance(c.header, str)
                 else " ".join(c.header.plain.split()) if isinstance(c.header, Text) else "" for c in table.columns]
        columns = [list(c.cells) for c in table.columns]
        for r in range(table.row_count):
            block = Text()
            for head, cells in zip(heads, columns):
                cell = cells[r]
                value = console.render_str(cell) if isinstance(cell, str) else cell
                if not isinstance(value, Text) or not value.plain:
                    continue
                block.append(f"{head}: " if head else "", style="bold")
                block.append_text(value)
                block.append("\n")
            block.rstrip()
            yield Prose(block)
            yield Text("")
        if table.caption:
            yield table.caption if isinstance(table.caption, Text) else Prose(console.render_str(str(table.caption)))


def fit(table: Table, keys: int = 1) -> Fitted:
    return Fitted(table, keys)
