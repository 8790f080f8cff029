"""Where along the spar things are evaluated (positions in mm from the heel)."""

from __future__ import annotations

from dataclasses import dataclass

from ..model.spar import Profile, Spar

MERGE_TOLERANCE = 0.05  # mm: positions closer than this are one station
MOST_STATIONS = 8_000  # a build stays under 300 MB up to here, 24 staves and all (docs/benchmarks.md)


@dataclass(frozen=True)
class StationMark:
    """A position (mm from the heel) and why it is there: heel, head, plan, hollow, wall, mark, plug."""

    z: float
    reasons: tuple[str, ...]


def station_marks(spar: Spar, extra: dict[str, list[float]] | None = None) -> tuple[StationMark, ...]:
    """The stations of a spar: ends, file stations, plug ends and every ``output.mark_spacing``.

    ``extra`` adds positions with a reason of the caller's (scarf ends, segment ends).
    """
    refuse_too_many(spar)
    found: list[tuple[float, str]] = [(0.0, "heel"), (spar.length, "head")]
    found += [(z, "plan") for z in spar.plan.diameter.z]
    if spar.hollow.diameter_given:
        found += [(z, "hollow") for z in spar.hollow.diameter.z]
    if isinstance(spar.hollow.wall, Profile) and not spar.hollow.wall.is_constant:
        found += [(z, "wall") for z in spar.hollow.wall.z]
    for plug in spar.hollow.plugs:
        found += [(plug.start, "plug"), (plug.end, "plug")]
    if spar.parting is not None:  # a two-piece spar is checked, and marked across both parts, where it parts
        found.append((spar.parting.at, "parting"))
    step = spar.output.mark_spacing
    k = 1
    while k * step < spar.length - MERGE_TOLERANCE:
        found.append((k * step, "mark"))
        k += 1
    for reason, positions in (extra or {}).items():
        found += [(z, reason) for z in positions]
    found.sort()
    marks: list[StationMark] = []
    for z, reason in found:
        z = min(max(z, 0.0), spar.length)
        if marks and z - marks[-1].z <= MERGE_TOLERANCE:
            last = marks[-1]
            reasons = last.reasons if reason in last.reasons else last.reasons + (reason,)
            # Ends stay exactly at 0 and L; a position from the file wins over a computed mark.
            keep = last.z if (last.z in (0.0, spar.length) or reason == "mark") else z
            marks[-1] = StationMark(keep, reasons)
        else:
            marks.append(StationMark(z, (reason,)))
    return tuple(marks)


def intervals(positions: list[float] | tuple[float, ...]) -> list[tuple[float, float, float]]:
    """(start, middle, end) of each stretch between neighbouring positions, for Simpson's rule."""
    return [(a, (a + b) / 2, b) for a, b in zip(positions, positions[1:])]


def refuse_too_many(spar: Spar, most: int = MOST_STATIONS, why: str = "") -> None:
    """InputError, naming the key, when the spar would have more than ``most`` stations (counted before any
    is made, so a spacing of a micron is refused at once): work and memory grow with them."""
    from ..errors import InputError
    from ..units import format_length, format_length_up

    file_keys = {"plan.stations": len(spar.plan.diameter.z)}
    if spar.hollow.diameter_given:
        file_keys["hollow.stations"] = len(spar.hollow.diameter.z)
    if isinstance(spar.hollow.wall, Profile) and not spar.hollow.wall.is_constant:
        file_keys["hollow.wall"] = len(spar.hollow.wall.z)
    fixed = 2 + sum(file_keys.values()) + 2 * len(spar.hollow.plugs)
    step = spar.output.mark_spacing
    marks = spar.length / step if step > 0 else float("inf")
    if fixed + marks <= most:
        return
    limit = f"stavegen works with at most {most:,} stations{why}"
    if marks >= max(file_keys.values()):
        least = format_length_up(spar.length / max(1, most - fixed), spar.units)
        shown = format_length(step, spar.units)
        count = "more than a million" if marks > 1e6 else f"{int(marks) + fixed:,}"
        raise InputError(f"{shown} puts {count} stations on the spar; {limit}: use a spacing of at least {least}",
                         "output.mark_spacing", spar.source)
    key = max(file_keys, key=lambda k: file_keys[k])
    raise InputError(f"{file_keys[key]:,} positions; with the marks that makes {int(marks) + fixed:,} stations, "
                     f"and {limit}", key, spar.source)
