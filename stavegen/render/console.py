"""What the commands print: rich tables in the spar's units, drawn from computed results only."""

from __future__ import annotations

from rich import box
from rich.console import Console
from rich.markup import escape
from rich.panel import Panel
from rich.table import Table
from rich.text import Text

from ..cautions import CAUTIONS, HEADLINE
from ..checks.ratios import StationCheck
from ..layout.machining import CutterSettings
from ..model.spar import Spar
from ..model.woods import Wood
from ..pipeline import Design
from ..section.properties import Section
from ..units import KG_M3_PER_LB_FT3, format_force, format_length, format_mass, format_small_mass, stress_in
from .figures import Figures
from .fit import Prose, fit
from .wording import (FENCE_NOTE, GUARD_NOTE, REGION_NOTE, aimed_words, cutter_rows, order_words, region_rows,
                      steps_words)


def length(spar: Spar, mm: float | None, tape: bool = False) -> str:
    return "—" if mm is None else format_length(mm, spar.units, tape)


def cautions_panel() -> Panel:
    body = Text()
    for i, line in enumerate(CAUTIONS):
        body.append("• " + line + ("\n" if i < len(CAUTIONS) - 1 else ""))
    return Panel(body, title=HEADLINE, border_style="red", title_align="left")


def _headline(spar: Spar) -> str:
    h = spar.hollow
    wall = h.wall
    fig = Figures(spar)
    wall_text = (fig.dress(wall.largest) if wall.is_constant
                 else f"{fig.dress(wall.smallest)} to {fig.dress(wall.largest)}")
    return (f"[bold]{escape(spar.name)}[/]  {fig.position(spar.length)} long\n"
            f"plan: solid {escape(spar.plan.wood.name)}   hollow: "
            + (f"a box of {escape(h.wood.name)} (two faces, two sides), {h.corner} corners" if h.is_box
               else f"{h.staves} staves of {escape(h.wood.name)}, {h.joint.kind}")
            + f", wall {wall_text}")


def station_table(design: Design) -> Table:
    spar = design.spar
    result = design.assessment
    fig = Figures(spar)
    weakest = result.weakest_stiffness
    table = Table(title="Station by station against the plan", header_style="bold", title_justify="left",
                  box=box.SIMPLE_HEAD, pad_edge=False)
    if result.two_axis:
        return _two_axis_rows(design, table)
    for col, justify in (("from\nheel", "right"), ("plan\nOD", "right"), ("\nOD", "right"), ("\nwall", "right"),
                         ("stave\nwidth", "right"), ("notch\ndepth", "right"), ("EI\nratio", "right"),
                         ("strength\nratio", "right"), ("\nplug", "center"), ("", "left")):
        table.add_column(col, justify=justify, no_wrap=bool(col))  # the notes may wrap, never a figure
    for c in result.stations:
        s = c.station
        sec = s.section
        short = [w for w, ok in (("EI", c.ei_ok), ("strength", c.strength_ok)) if not ok]
        style = "red" if short else ("bold yellow" if c is weakest else None)
        table.add_row(
            fig.position(s.z) if spar.units == "in" else f"{s.z:.0f} mm",
            fig.describe(s.plan_diameter), fig.dress(s.diameter), fig.dress(s.wall),
            fig.mark_width(sec.stave_width), fig.notch_depth(sec.notch.depth if sec.notch else None),
            f"{c.ei_ratio:.3f}", f"{c.strength_ratio:.3f}", "●" if s.plug else "",
            ("SHORT: " + " and ".join(short)) if short else ("least EI" if c is weakest else "ok"),
            style=style,
        )
    return table


def _two_axis_rows(design: Design, table: Table) -> Table:
    """The station table of a spar that is not round: both dimensions, and the EI and strength ratios
    fore-and-aft (f-a) and athwartships (ath); the staves' widths are in `section`, the cut list and the report."""
    from ..checks.ratios import ATHWARTSHIPS, FORE_AFT

    spar, result = design.spar, design.assessment
    fig = Figures(spar)
    weakest = result.weakest_stiffness
    for col in ("from\nheel", "plan\nf-a x ath", "\nf-a x ath", "\nwall", "EI ratio\nf-a", "EI ratio\nath", "strength\nf-a", "strength\nath"):
        table.add_column(col, justify="right", no_wrap=True)
    table.add_column("\nplug", justify="center", no_wrap=True)
    table.add_column("", justify="left")
    for c in result.stations:
        s = c.station
        short = [w for w, ok in (("EI", c.ei_ok), ("strength", c.strength_ok)) if not ok]
        style = "red" if short else ("bold yellow" if c is weakest else None)
        table.add_row(
            fig.position(s.z) if spar.units == "in" else f"{s.z:.0f} mm",
            f"{fig.describe(s.plan_diameter)} x {fig.describe(s.plan_athwart)}",
            f"{fig.dress(s.fore_aft)} x {fig.dress(s.athwart)}", fig.dress(s.wall),
            f"{c.ei_ratio_in(FORE_AFT):.3f}", f"{c.ei_ratio_in(ATHWARTSHIPS):.3f}",
            f"{c.strength_ratio_in(FORE_AFT):.3f}", f"{c.strength_ratio_in(ATHWARTSHIPS):.3f}",
            "●" if s.plug else "",
            ("SHORT: " + " and ".join(short)) if short else ("least EI" if c is weakest else "ok"),
            style=style,
        )
    return table


def spar_table(design: Design) -> Table:
    spar = design.spar
    r = design.assessment
    fig = Figures(spar)
    table = Table(title="The whole spar", header_style="bold", title_justify="left", box=box.SIMPLE_HEAD)
    table.add_column("")
    table.add_column("plan (solid)", justify="right", no_wrap=True)
    table.add_column("hollow", justify="right", no_wrap=True)
    table.add_column("hollow / plan", justify="right", no_wrap=True)
    stiff = "lbf/in" if spar.units == "in" else "N/mm"
    per = 25.4 / 4.4482216152605 if spar.units == "in" else 1.0
    rows = [
        ("weight", format_mass(r.plan.mass.mass, spar.units), format_mass(r.hollow.mass.mass, spar.units),
         r.compared("mass")),
        ("centre of gravity from heel", fig.position(r.plan.mass.centre), fig.position(r.hollow.mass.centre),
         r.compared("centre")),
        (f"head stiffness, sideways load per {'inch' if spar.units == 'in' else 'mm'} at the head, heel held",
         f"{r.plan.head_stiffness * per:,.1f} {stiff}", f"{r.hollow.head_stiffness * per:,.1f} {stiff}",
         r.compared("head_stiffness")),
        (f"head deflection under {format_force(r.head_load, spar.units)} sideways"
         + ("" if spar.head_load_given else " (reference load)"),
         fig.describe(r.plan.tip_deflection), fig.describe(r.hollow.tip_deflection), r.compared("deflection")),
        ("Euler load, heel fixed, head free", format_force(r.plan.euler_load, spar.units),
         format_force(r.hollow.euler_load, spar.units), r.compared("euler")),
    ]
    if r.hollow.direction:  # a spar that is not round: the beam figures are the weaker direction's, then the other
        from ..checks.ratios import ATHWARTSHIPS, FORE_AFT

        words = {FORE_AFT: "fore-and-aft", ATHWARTSHIPS: "athwartships"}
        weak = r.hollow.direction
        other = ATHWARTSHIPS if weak == FORE_AFT else FORE_AFT
        rows = rows[:2] + [(label + f", {words[weak]} (the weaker way)", a, b, ratio) for label, a, b, ratio in rows[2:]]
        pd, pe = r.plan.in_direction(other)
        hd, he = r.hollow.in_direction(other)
        rows += [(f"head deflection, {words[other]}", fig.describe(pd), fig.describe(hd), hd / pd),
                 (f"Euler load, {words[other]}", format_force(pe, spar.units), format_force(he, spar.units), he / pe)]
    for label, a, b, ratio in rows:
        table.add_row(label, a, b, f"{ratio:.3f}")
    return table


def _saved_words(design: Design) -> str:
    r, units = design.assessment, design.spar.units
    if r.weight_saved >= 0:
        return (f"{format_mass(r.weight_saved, units)} lighter than the plan "
                f"({100 * r.weight_saved_share:.0f} %)")
    return f"{format_mass(-r.weight_saved, units)} heavier than the plan"


def joint_words(design: Design) -> list[str]:
    """One sentence for each joint of a two-piece spar: its figures against the plan's, and what binds."""
    fig = Figures(design.spar)
    out = []
    for j in design.assessment.joints:
        out.append(f"Joint at {fig.position(j.at)} ({j.kind}, overlap {fig.cut_length(j.overlap)}): "
                   f"{'passes' if j.passed else 'FAILS'}; E·I {j.ei_ratio:.3f} and moment {j.strength_ratio:.3f} "
                   f"of the plan's there, bearing {j.bearing_ratio:.3f} of the allowable, kink {j.kink_deg:.2f}°; "
                   f"{j.binding} binds.")
    return out


def verdict(design: Design) -> Text:
    r = design.assessment
    spar = design.spar
    fig = Figures(spar)
    w = r.weakest_stiffness
    s = r.weakest_strength
    if r.passed:
        text = Text("PASS ", style="bold green")
        text.append(f"EI ratio at least {w.ei_ratio:.3f} (target {r.ei_target:.3f}), least at "
                    f"{fig.position(w.station.z)} from the heel; strength ratio at least {s.strength_ratio:.3f} "
                    f"(target {r.strength_target:.3f}); {_saved_words(design)}.")
        if r.strength_accepted_below_plan:
            text.append(f" The spar file accepts a spar weaker than the plan (min_strength_ratio "
                        f"{r.strength_target:g}).", style="bold yellow")
        for line in joint_words(design):
            text.append(" " + line)
    else:
        text = Text("FAIL ", style="bold red")
        text.append(" ".join(r.shortfalls()) + ".")
    return text


def print_build_summary(console: Console, design: Design, written: list) -> None:
    """The few lines a build ends with: pass or fail, boards to buy, scarfs, weight saved, files written."""
    spar, r, lay = design.spar, design.assessment, design.layout
    for line in design.solved:
        console.print(Prose(Text("solved: ", style="cyan") + Text(line)))
    for line in design.warnings:
        console.print(Prose(Text("warning: ", style="bold yellow") + Text(line)))
    w = r.weakest_stiffness
    if r.passed:
        head = Text("PASS ", style="bold green")
        head.append(f"the hollow spar meets its targets at every station (least EI ratio {w.ei_ratio:.3f}, "
                    f"target {r.ei_target:.3f}; least strength ratio {r.weakest_strength.strength_ratio:.3f}, "
                    f"target {r.strength_target:.3f})")
    else:
        head = Text("FAIL ", style="bold red")
        head.append(" ".join(r.shortfalls()) + ". Do not build it as drawn.")
    console.print(Prose(head))
    table = Table(show_header=False, box=None, pad_edge=False, padding=(0, 2, 0, 2))
    table.add_column("", style="bold", no_wrap=True)
    table.add_column("")
    if lay is not None and lay.lumber is not None and lay.lumber.boards:
        table.add_row("boards to buy", Prose(order_words(lay.lumber, spar.units)))
    fig = Figures(spar)
    if lay is not None:
        table.add_row("scarfs", Prose((f"{lay.scarfs.count}, each {fig.cut_length(lay.scarfs.length)} long"
                                       + aimed_words(lay.scarf_aim)) if lay.scarfs.count
                                      else "none: every stave is one piece"))
    for line in joint_words(design):
        table.add_row("joint", Prose(line))
    saved = r.weight_saved
    table.add_row("weight saved", Prose(f"{format_mass(saved, spar.units)}, {100 * r.weight_saved_share:.0f} % "
                                        f"({format_mass(r.hollow.mass.mass, spar.units)} hollow against "
                                        f"{format_mass(r.plan.mass.mass, spar.units)} solid)"
                                        if saved >= 0 else
                                        f"none: {format_mass(-saved, spar.units)} heavier than the solid spar"))
    if written:
        names = [p.name for p in written]
        stem = spar.slug
        short = [names[0]] + [n[len(stem):] if n.startswith(stem + "-") else n for n in names[1:]]
        table.add_row("written", Prose(f"{len(names)} files into {written[0].parent}: {', '.join(short)}"))
    console.print(table)
    if lay is not None:
        console.print(Text("Order of operations", style="bold"))
        for line in steps_words(fig, lay.machining.steps):
            console.print(Prose(line))
        for note in lay.machining.notes:
            console.print(Prose(Text("note: ", style="bold yellow") + Text(note)))
    if not r.passed:
        console.print(Text("The templates and cut list are marked: this design fails its target.", style="bold red"))
    console.print(Text("Before cutting, read the safety notes on page 1 of the report.", style="bold red"))


def regions_table(design: Design) -> Table | None:
    """The sheathing layers and reinforcing strips, one row each, worded as the report words them
    (:func:`~stavegen.render.wording.region_rows`); None when the spar has neither."""
    rows = region_rows(design)
    if not rows:
        return None
    table = Table(title="Sheathing and reinforcement", header_style="bold", title_justify="left",
                  box=box.SIMPLE_HEAD)
    for k, head in enumerate(rows[0]):
        table.add_column(head, justify="right" if k >= 4 else "left", no_wrap=k > 0)  # only the name may wrap
    for row in rows[1:]:
        table.add_row(*row)
    return table


def print_check(console: Console, design: Design) -> None:
    console.print(Prose(Text.from_markup(_headline(design.spar))))
    for line in design.solved:
        console.print(Prose(Text("solved: ", style="cyan") + Text(line)))
    console.print(fit(station_table(design)))
    console.print(fit(spar_table(design)))
    regions = regions_table(design)
    if regions is not None:
        console.print(fit(regions, keys=1))
        console.print(Prose(REGION_NOTE, style="dim"))
    for line in design.warnings:
        console.print(Prose(Text("warning: ", style="bold yellow") + Text(line)))
    console.print(Prose(verdict(design)))
    console.print(cautions_panel())


def section_table(spar: Spar, check: StationCheck, si: bool = False) -> Table:
    """One section's figures; areas, the second moment and the modulus in the file's units (mm with ``si``)."""
    s = check.station
    sec: Section = s.section
    fig = Figures(spar)
    table = Table(title=f"Section at {length(spar, s.z, True)} from the heel", show_header=False,
                  title_justify="left")
    table.add_column("", style="bold")
    table.add_column("", justify="right", no_wrap=True)
    two = check.two_axis
    rows: list[tuple[str, str]] = [("staves, joint", f"{sec.staves}, {sec.joint}")]
    if two:
        rows += [("finished fore-and-aft x athwartships (plan)",
                  f"{fig.dress(s.fore_aft)} x {fig.dress(s.athwart)} ({fig.describe(s.plan_diameter)} x "
                  f"{fig.describe(s.plan_athwart)}, {spar.plan.shape})"),
                 ("stave widths round the section", ", ".join(
                     f"{fig.mark_width(k.width)} ({k.count})" for k in sec.kinds) + " (how many)")]
    else:
        rows.append(("finished diameter (plan)", f"{fig.dress(s.diameter)} ({fig.describe(s.plan_diameter)})"))
    box = sec.joint == "box"
    if box:
        from ..section.box import KIND_NAMES

        rows[0] = ("pieces, corners", f"4 (two faces, two sides), {sec.corner}"
                   + (f", rebates {fig.dress(sec.rebate_depth)} deep" if sec.rebate else ""))
        rows[2] = ("piece widths", ", ".join(f"{KIND_NAMES[k.index]}s {fig.mark_width(k.width)}" for k in sec.kinds))
        rows += [
            ("faces fore and aft before planing", fig.describe(sec.across_flats)),
            ("wall (the bore's)", fig.dress(s.wall)),
            ("piece thickness", fig.dress(sec.thickness)),
            ("outside corners rounded to", fig.describe(sec.corner_radius) if sec.corner_radius else "sharp"),
            ("bore fore-and-aft x athwartships", f"{fig.describe(sec.bore_across_flats)} x "
                                                 f"{fig.describe(sec.bore_across_flats_athwartships)}"),
            ("least wall after planing", fig.least(sec.least_wall)),
            ("glue line per joint", fig.describe(sec.glue_line)),
            ("wood area", fig.units.area(sec.area, si)),
        ]
    else:
        rows += [
            ("across flats before rounding", fig.describe(sec.across_flats)),
            ("wall (the bore's)", fig.dress(s.wall)),
            ("stave thickness", fig.dress(sec.thickness)),
            ("stave width before the notch" + (", widest" if two else ""), fig.mark_width(sec.stave_width)),
        ]
    if box:
        pass
    elif sec.notch:
        phi, other = sec.v_face_angles
        rows += [
            ("notch depth (along the width)", fig.notch_depth(sec.notch.depth)),
            ("notch apex above the inner face", fig.apex_height(sec.notch.apex_height)),
            ("V faces to the broad face", f"{phi:.2f}° and {other:.2f}° (a 90° V)"),
        ]
    else:
        rows.append(("edge bevel off square", f"{sec.bevel_angle:.2f}°"))
    rows += [] if box else [
        ("bore across flats", fig.describe(2 * sec.inner_apothem)),
        ("wall after rounding, mid-stave", fig.least(sec.flat_wall)),
        ("least wall after rounding, over bore and voids", fig.least(sec.least_wall)),
        ("voids inside the round", fig.units.area(sec.void_area, si)),
        ("glue line per joint", fig.describe(sec.glue_line)),
        ("wood area", fig.units.area(sec.area, si)),
    ]
    if two:
        from ..checks.ratios import ATHWARTSHIPS, FORE_AFT

        rows += [
            ("I of the wall, fore-and-aft / athwartships", f"{fig.units.second_moment(sec.inertia_fore_aft, si)} / "
                                                           f"{fig.units.second_moment(sec.inertia_athwartships, si)}"),
            ("plug", escape(s.plug.wood.name) if s.plug else "none"),
            ("EI ratio fore-and-aft / athwartships", f"{check.ei_ratio_in(FORE_AFT):.3f} / "
                                                     f"{check.ei_ratio_in(ATHWARTSHIPS):.3f}"),
            ("strength ratio fore-and-aft / athwartships", f"{check.strength_ratio_in(FORE_AFT):.3f} / "
                                                           f"{check.strength_ratio_in(ATHWARTSHIPS):.3f}"),
            ("form factor fore-and-aft, hollow / plan", f"{check.hollow.form_factor_in(FORE_AFT):.3f} / "
                                                        f"{check.plan.form_factor_in(FORE_AFT):.3f}"),
        ]
    else:
        rows += [
            ("I of the wall", fig.units.second_moment(sec.inertia, si)),
            ("section modulus I/R", fig.units.section_modulus(sec.modulus, si)),
            ("plug", escape(s.plug.wood.name) if s.plug else "none"),
            ("EI ratio / strength ratio", f"{check.ei_ratio:.3f} / {check.strength_ratio:.3f}"),
            ("form factor, hollow / plan", f"{check.hollow.form_factor:.3f} / {check.plan.form_factor:.3f}"),
        ]
    rows += [
        ("meets the targets here", "yes" if check.ok else "NO: " + " and ".join(
            w for w, ok in (("EI", check.ei_ok), ("strength", check.strength_ok)) if not ok)),
    ]
    for label, value in rows:
        table.add_row(label, value)
    return table


def machining_table(spar: Spar, settings: CutterSettings) -> Table:
    """Table-saw passes and the router set-up for one section, lengths in the spar's units."""
    title = "Cutter settings" + (", a face (its rebates)" if settings.joint == "box" else "")
    table = Table(title=title, show_header=False, title_justify="left",
                  caption=f"{FENCE_NOTE} {GUARD_NOTE}", caption_justify="left")
    table.add_column("", style="bold")
    table.add_column("", justify="right")
    for row in cutter_rows(Figures(spar), settings):  # values wrap between figures on a narrow terminal
        if row.heading:
            table.add_section()
            table.add_row(row.label, Prose(row.value), style="cyan")
        else:
            table.add_row(row.label, Prose(row.value))
    return table


def woods_table(woods: list[Wood], units: str) -> Table:
    """The wood table; each row's source is a numbered note under the table."""
    stress = "psi" if units == "in" else "MPa"
    sources = list(dict.fromkeys(w.source for w in woods))
    notes = "\n".join(f"[{i + 1}] {text}" for i, text in enumerate(sources))
    table = Table(title="Built-in woods, 12 % moisture content", header_style="bold", title_justify="left",
                  caption=notes, caption_justify="left")
    for col in ("key", "wood", "SG", f"MOR, {stress}", f"MOE, {stress}", "density", "source"):
        table.add_column(col, justify="left" if col in ("key", "wood") else "right", no_wrap=col != "wood")
    system = "psi" if units == "in" else "mpa"
    for w in woods:
        density = f"{w.density / KG_M3_PER_LB_FT3:.1f} lb/ft³" if units == "in" else f"{w.density:.0f} kg/m³"
        table.add_row(w.key, w.name, f"{w.specific_gravity:.2f}" if w.specific_gravity else "—",
                      f"{stress_in(w.mor, system):,.0f}", f"{stress_in(w.moe, system):,.0f}", density,
                      f"[{sources.index(w.source) + 1}]")
    return table


def laminates_table(laminates: list, units: str) -> Table:
    """The built-in laminates (sheathing cloth, reinforcing tape); each row's source a numbered note under it."""
    from ..units import format_thin

    stress = "psi" if units == "in" else "MPa"
    system = "psi" if units == "in" else "mpa"
    sources = list(dict.fromkeys(m.source for m in laminates))
    notes = "\n".join(f"[{i + 1}] {text}" for i, text in enumerate(sources))
    table = Table(title="Built-in laminates, as laid by hand", header_style="bold", title_justify="left",
                  caption=notes, caption_justify="left")
    for col in ("key", "laminate", f"E, {stress}", f"strength, {stress}", "density", "ply", "source"):
        table.add_column(col, justify="left" if col in ("key", "laminate") else "right", no_wrap=col != "laminate")
    for m in laminates:
        density = f"{m.density / KG_M3_PER_LB_FT3:.1f} lb/ft³" if units == "in" else f"{m.density:.0f} kg/m³"
        table.add_row(m.key, m.name, f"{stress_in(m.moe, system):,.0f}", f"{stress_in(m.strength, system):,.0f}",
                      density, format_thin(m.ply_thickness, units), f"[{sources.index(m.source) + 1}]")
    return table


def candidates_table(spar: Spar, comparison) -> Table:
    """The stave counts side by side, the chosen one marked (sizing.count.Comparison)."""
    imperial = spar.units == "in"
    table = Table(title="Stave counts compared", header_style="bold", title_justify="left", box=box.SIMPLE_HEAD,
                  pad_edge=False)
    heads = ("\nN", "least\nEI", "\nwall", "widest\nstave", "least\nw / t", "rips per\nboard",
             "board ft\nto buy", "planed\noff", "glue\narea", "\ncuts", "V-bit\n1 pass", "")
    for head in heads:
        table.add_column(head, justify="right", no_wrap=bool(head))  # the verdict may wrap, never a figure
    for c in comparison.candidates:
        chosen = c is comparison.chosen
        if c.refused:
            table.add_row(str(c.staves), *["—"] * 10, c.verdict(), style="dim")
            continue
        wall = c.spar.hollow.wall
        fig = Figures(c.spar)
        wall_text = (fig.dress(wall.largest) if wall.is_constant
                     else f"{fig.dress(wall.smallest)}–{fig.dress(wall.largest)}")
        volume = (f"{c.planed_away / 16387.064:,.0f} in³" if imperial else f"{c.planed_away / 1e6:,.2f} L")
        glue = (f"{c.glue_area / 92903.04:,.1f} ft²" if imperial else f"{c.glue_area / 1e6:,.2f} m²")
        laid_out = c.fits_stock
        table.add_row(
            str(c.staves), f"{c.assessment.weakest_stiffness.ei_ratio:.3f}", wall_text, fig.dress(c.widest),
            f"{c.width_over_thickness[0]:.2f}", str(c.rips_per_board) if laid_out else "—",
            f"{c.board_feet:.1f}" if laid_out else "—", volume, glue, str(c.cuts) if laid_out else "—",
            "yes" if c.v_bit_one_pass else "no", "◀ chosen" if chosen else c.verdict(),
            style="bold green" if chosen else (None if c.eligible else "dim"),
        )
    return table


def sheathing_options_table(comparison) -> Table:
    """The spar bare, with its layers, and with its layers and strips side by side
    (:class:`stavegen.sheathing_options.SheathingComparison`): the sizes solved for each, weight, least ratios,
    and the weight each saves against the bare spar."""
    table = Table(title="Sheathing compared" + ("" if comparison.solves else " (sizes as drawn)"),
                  header_style="bold", title_justify="left", box=box.SIMPLE_HEAD, pad_edge=False)
    heads = ["option", "staves", "wall", "OD, heel to head", "weight", "least\nEI ratio", "least\nstrength ratio",
             "saves against\nbare", ""]
    for k, head in enumerate(heads):
        table.add_column(head, justify="left" if k == 0 else "right", no_wrap=k != len(heads) - 1)
    for option in comparison.options:
        if option.design is None:
            table.add_row(option.name, *["—"] * 7, "cannot be built (below)", style="dim")
            continue
        spar, r = option.spar, option.design.assessment
        fig = Figures(spar)
        wall = spar.hollow.wall
        wall_text = (fig.dress(wall.largest) if wall.is_constant
                     else f"{fig.dress(wall.smallest)}–{fig.dress(wall.largest)}")
        od = spar.hollow.diameter
        od_text = f"{fig.dress(float(od.at(0.0)))}–{fig.dress(float(od.at(spar.length)))}"
        saved = comparison.saved(option)
        share = saved / comparison.bare.mass if saved is not None and comparison.bare.mass > 0 else 0.0
        saved_text = ("—" if option is comparison.bare or saved is None else
                      f"{format_small_mass(saved, spar.units)} ({100 * share:.1f} %)" if saved >= 0 else
                      f"{format_small_mass(-saved, spar.units)} heavier ({-100 * share:.1f} %)")
        table.add_row(option.name, str(spar.hollow.staves), wall_text, od_text,
                      format_small_mass(r.hollow.mass.mass, spar.units), f"{r.weakest_stiffness.ei_ratio:.3f}", f"{r.weakest_strength.strength_ratio:.3f}", saved_text,
                      "passes" if r.passed else "FAILS", style=None if r.passed else "red")
    return table


def sheathing_option_notes(comparison) -> list[str]:
    """One line for each option that cannot be built: why (the line its check would end with)."""
    return [f"{o.name}: cannot be built: {o.refused}" for o in comparison.options if o.design is None]


def candidate_notes(comparison) -> list[str]:
    """One line per reason a stave count was ruled out, with the counts it rules out."""
    found: dict[str, list[int]] = {}
    for c in comparison.candidates:
        if not c.eligible:
            found.setdefault(c.why_not(), []).append(c.staves)
    return [f"{', '.join(map(str, counts))} staves: {why}" for why, counts in found.items()]
