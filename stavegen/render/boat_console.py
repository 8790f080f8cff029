"""The terminal for a boat: each spar's check as ``stavegen check`` prints it, and the boat's summary."""

from __future__ import annotations

from rich.console import Console
from rich.table import Table
from rich.text import Text

from ..boat import BoatDesign
from ..units import format_mass
from . import console as single
from .wording import board_feet_words, order_words


def spar_rows(bd: BoatDesign) -> Table:
    """One row per spar: its verdict (its check's), least ratios, weights and the board feet bought alone."""
    units = bd.boat.units
    table = Table(title=f"{bd.boat.name}: {len(bd.designs)} spars", title_justify="left")
    for name, right in (("spar", False), ("verdict", False), ("least EI ratio", True),
                        ("least strength ratio", True), ("plan", True), ("hollow", True), ("saved", True)):
        table.add_column(name, justify="right" if right else "left")
    if bd.order is not None:
        table.add_column("board feet bought alone", justify="right")
    for bs, d in bd.spars:
        a = d.assessment
        saved = a.plan.mass.mass - a.hollow.mass.mass
        row = [Text(f"{bs.tag}  {d.spar.name}"), Text("PASS", style="bold green") if d.passed else
               Text("FAIL", style="bold red"), f"{a.weakest_stiffness.ei_ratio:.3f}",
               f"{a.weakest_strength.strength_ratio:.3f}", format_mass(a.plan.mass.mass, units),
               format_mass(a.hollow.mass.mass, units), f"{format_mass(saved, units)} ({100 * saved / a.plan.mass.mass:.0f} %)"]
        if bd.order is not None:
            row.append(board_feet_words(d.layout.lumber.to_buy_board_feet))
        table.add_row(*row)
    return table


def boat_verdict(bd: BoatDesign) -> Text:
    failed = [d.spar.name for d in bd.designs if not d.passed]
    if not failed:
        return Text("PASS ", style="bold green") + Text("every spar of the boat meets its target.")
    return Text("FAIL ", style="bold red") + Text(f"{', '.join(failed)} {'misses' if len(failed) == 1 else 'miss'} "
                                                  "the target; do not build as drawn.")


def print_boat_check(console: Console, bd: BoatDesign) -> None:
    """Each spar's station table and verdict, then the boat's table, verdict and the cautions once."""
    for bs, d in bd.spars:
        console.rule(Text(f"{bs.tag}: {d.spar.name} ({bs.file})"))
        console.print(single._headline(d.spar))
        for line in d.solved:
            console.print(f"[cyan]solved:[/] {line}")
        console.print(single.station_table(d))
        console.print(single.spar_table(d))
        for line in d.warnings:
            console.print(Text("warning: ", style="bold yellow") + Text(line))
        console.print(single.verdict(d))
    console.rule(Text(bd.boat.name))
    console.print(spar_rows(bd))
    console.print(boat_verdict(bd))
    console.print(single.cautions_panel())


def print_boat_build_summary(console: Console, bd: BoatDesign, written: list) -> None:
    """The lines a boat build ends with: the spars, the boards to buy together and apart, the files."""
    for bs, d in bd.spars:
        for line in d.solved:
            console.print(f"[cyan]solved ({bs.tag}):[/] {line}")
        for line in d.warnings:
            console.print(Text(f"warning ({bs.tag}): ", style="bold yellow") + Text(line))
    console.print(spar_rows(bd))
    console.print(boat_verdict(bd))
    table = Table(show_header=False, box=None, pad_edge=False, padding=(0, 2, 0, 2))
    table.add_column("", style="bold", no_wrap=True)
    table.add_column("")
    order = bd.order
    units = bd.boat.units
    if order is not None and order.boards:
        apart = bd.separate_board_feet
        table.add_row("boards to buy", order_words(order, units))
        table.add_row("together / apart", f"{board_feet_words(order.to_buy_board_feet)} board feet ordered "
                                          f"together against {board_feet_words(apart)} for the spars bought "
                                          f"alone: {board_feet_words(apart - order.to_buy_board_feet)} saved")
    if written:
        table.add_row("written", f"{len(written)} files into {written[0].parent}: "
                                 f"{', '.join(p.name for p in written)}")
    console.print(table)
    console.print(Text("Before cutting, read the safety notes on page 1 of the report.", style="bold red"))
