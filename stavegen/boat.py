"""The boat pipeline: every spar through the single-spar pipeline, then one lumber order for them all.

Each spar is designed exactly as ``stavegen build SPAR`` designs it, from the boat's
boards (:func:`stavegen.pipeline.design`): its check, its scarfs (aimed at the boards
for that spar), its segments and its own order, the spar bought alone. Then every
segment of every spar goes into one cutting plan (:func:`~stavegen.layout.lumber.order_lumber`,
the same model and solver, with its LP bound), each labelled with its spar's tag.
Should cutting the spars together ever need more board feet than cutting them apart
(the solver stops on its work limits, so it could), the boat's order is the spars'
own orders side by side: the boat order never buys more than the spars bought alone.
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace
from typing import Callable

from .errors import InputError
from .layout.lumber import Board, Cut, LumberOrder, Piece, Rip, order_lumber, relabel, side_by_side
from .model.boat import BOARD_KEYS, Boat, BoatSpar
from .pipeline import Design, design

TIE = 1e-9  # board feet


@dataclass(frozen=True)
class BoatDesign:
    """What stavegen worked out for a boat: each spar's design, and the one order (None without a layout)."""

    boat: Boat
    designs: tuple[Design, ...]
    order: LumberOrder | None = None
    owners: dict[str, tuple[int, str]] = field(default_factory=dict)  # boat label -> (spar index, own label)

    @property
    def passed(self) -> bool:
        """Every spar meets its target (each spar's verdict is its check's)."""
        return all(d.passed for d in self.designs)

    @property
    def spars(self) -> tuple[tuple[BoatSpar, Design], ...]:
        return tuple(zip(self.boat.spars, self.designs))

    @property
    def apart(self) -> tuple[LumberOrder, ...]:
        """Each spar's own order: the spar bought alone from the boat's boards."""
        return tuple(d.layout.lumber for d in self.designs if d.layout is not None)

    @property
    def separate_board_feet(self) -> float:
        """Board feet to buy (waste allowance added) when each spar is bought alone, summed."""
        return sum(o.to_buy_board_feet for o in self.apart)

    @property
    def separate_used_board_feet(self) -> float:
        """Board feet the spars' own cutting plans use, summed."""
        return sum(o.board_feet for o in self.apart)

    def spar_view(self, index: int, units: str | None = None, boards: bool = True) -> Design:
        """Spar ``index``'s design as the boat's papers draw it: its segments on the boat's boards.

        The view's order holds the boat's boards that carry this spar's segments, with
        only those segments on them, under the spar's own labels (board ids are the
        boat's); its tallies are the boat's. ``boards=False`` drops the order (for parts of
        a paper that would print a spar's own order). ``units`` prints it in other units.
        """
        d = self.designs[index]
        spar = d.spar if units is None else replace(d.spar, units=units)
        if d.layout is None:
            return replace(d, spar=spar)
        if not boards or self.order is None:
            return replace(d, spar=spar, layout=replace(d.layout, lumber=None))
        mine = []
        for board in self.order.boards:
            rips = []
            for rip in board.rips:
                cuts = tuple(Cut(replace(c.piece, label=self.owners[c.piece.label][1]), c.offset)
                             for c in rip.cuts if self.owners[c.piece.label][0] == index)
                if cuts:
                    rips.append(Rip(rip.offset, rip.width, cuts))
            if rips:
                mine.append(Board(board.id, board.size, tuple(rips)))
        return replace(d, spar=spar, layout=replace(d.layout, lumber=replace(self.order, boards=tuple(mine))))

    def order_view(self) -> Design:
        """A design whose order is the boat's, in the boat's units, for the parts of a paper that draw an order."""
        first = self.designs[0]
        spar = replace(first.spar, units=self.boat.units, stock=self.boat.stock)
        return replace(first, spar=spar, layout=replace(first.layout, lumber=self.order, scarf_aim=None))


def _relocated(exc: InputError, boat: Boat, spar: BoatSpar) -> InputError:
    """An error about a stock key whose value the boat gave: name the boat file, and the spar it concerns."""
    root, _, rest = exc.key.partition(".")
    name = rest.split("[")[0]
    if root == "stock" and boat.stock is not None and name in BOARD_KEYS:
        return InputError(f"{spar.spar.name} ({spar.file}): {exc.in_units(boat.units).problem}", exc.key, boat.source)
    return exc


def design_boat(boat: Boat, layout: bool = False, step: Callable[[str], None] | None = None) -> BoatDesign:
    """Design every spar (with ``layout``, lay each out and order the boat's boards once for all of them)."""
    tell = step or (lambda words: None)
    if layout and boat.stock is None:
        raise InputError("missing: a boat build needs one [stock] table, the boards of its one order "
                         "(thickness, widths, lengths)", "stock", boat.source)
    designs = []
    for bs in boat.spars:
        def spar_step(words: str, name: str = bs.spar.name) -> None:
            tell(f"{name}: {words}")

        try:
            d = design(bs.spar, layout=layout, step=spar_step)
        except InputError as exc:
            raise _relocated(exc, boat, bs) from None
        if bs.own_boards_differ:
            d = replace(d, warnings=d.warnings + (
                f"{bs.file} lists other boards in its [stock]; in this boat it is built from the boat's boards",))
        designs.append(d)
    if not layout:
        return BoatDesign(boat=boat, designs=tuple(designs))
    tell("ordering lumber for the whole boat")
    owners: dict[str, tuple[int, str]] = {}
    pieces = []
    apart = []
    for i, (bs, d) in enumerate(zip(boat.spars, designs)):
        names = {}
        for seg in d.layout.segments:
            label = bs.label(seg.label)
            owners[label] = (i, seg.label)
            names[seg.label] = label
            pieces.append(Piece(label=label, stave=seg.stave, segment=seg.index, length=seg.length,
                                width=seg.rough_width, volume=seg.volume))
        # pieces that are no stave segment (a two-piece spar's wooden spigot) come from the same boards
        for piece in (c.piece for b in d.layout.lumber.boards for r in b.rips for c in r.cuts if c.piece.stave == 0):
            label = bs.label(piece.label)
            owners[label] = (i, piece.label)
            names[piece.label] = label
            pieces.append(replace(piece, label=label))
        apart.append(relabel(d.layout.lumber, names))
    together = order_lumber(pieces, boat.stock, units=boat.units)
    buy_apart = sum(o.to_buy_board_feet for o in apart)
    used_apart = sum(o.board_feet for o in apart)
    if together.to_buy_board_feet <= buy_apart + TIE and together.board_feet <= used_apart + TIE:
        order = together
    else:
        order = side_by_side(apart, boat.stock, together.lower_bound_board_feet, together.bound_is_lp)
    return BoatDesign(boat=boat, designs=tuple(designs), order=order, owners=owners)
