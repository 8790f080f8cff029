"""Where the scarfs go: the fewest the stock allows, clear of no-scarf ranges, staggered.

A stave longer than the longest board is glued up from segments; each
scarf overlaps two segments over its length ℓ = scarf_ratio × thickness.
Staves are given scarf "phases": neighbouring staves (k and k+1, and N and
1) never share a phase, so two phases serve an even N and three an odd one.
Within every phase the scarf centres are placed by a small mixed-integer
program (scipy's milp, HiGHS) that meets every rule with the largest common
slack, so scarfs sit well inside their windows rather than on their limits:

- each segment, scarf overlaps included, fits the longest board (less one kerf);
- no scarf touches a no-scarf range, the spar's ends or the end allowances;
- scarfs in neighbouring phases are at least ``stagger`` apart, end to end;
- scarfs of one stave are at least one scarf length apart.

Positions are z, mm from the heel. Lengths along the face differ from z by
the stave's slope; the bounds here use the steepest slope, so they hold.
"""

from __future__ import annotations

import itertools
import math
from dataclasses import dataclass
from typing import Sequence

import numpy as np
from scipy.optimize import Bounds, LinearConstraint, milp

from ..errors import DesignError
from ..units import format_length

MIN_SEGMENT_FACTOR = 2.0  # a segment is at least twice the scarf length


@dataclass(frozen=True)
class ScarfRules:
    """What the scarfs must respect (mm): scarf length, stagger, no-scarf ranges, longest piece."""

    length: float
    stagger: float
    no_scarf: tuple[tuple[float, float], ...]
    longest_piece: float
    slope_factor: float = 1.0
    units: str = "mm"

    def show(self, mm: float) -> str:
        """A length for messages, in the spar's units."""
        return format_length(mm, self.units, tape=mm > 600)


@dataclass(frozen=True)
class ScarfPlan:
    """Scarf centres (z, mm) for every stave (index 0 = stave 1), and each stave's phase."""

    centres: tuple[tuple[float, ...], ...]
    phases: tuple[int, ...]
    length: float

    @property
    def count(self) -> int:
        return sum(len(c) for c in self.centres)


def phase_of_staves(staves: int) -> tuple[int, ...]:
    """Phase of each stave round the ring: 0,1,0,1,… and, for an odd count, 2 for the last."""
    phases = [k % 2 for k in range(staves)]
    if staves % 2:
        phases[-1] = 2
    return tuple(phases)


def least_segments(span: float, rules: ScarfRules) -> int:
    """Fewest segments (≥ 1) that cover ``span`` (mm along the face) from boards of the longest length."""
    piece = rules.longest_piece
    if span <= piece:
        return 1
    if piece <= rules.length * MIN_SEGMENT_FACTOR:
        raise DesignError(f"the longest board ({rules.show(piece)}) is too short to carry a segment with "
                          f"{rules.show(rules.length)} scarfs", "stock.lengths")
    return math.ceil((span - rules.length) / (piece - rules.length))


def _allowed_zones(spar_length: float, rules: ScarfRules) -> list[tuple[float, float]]:
    """Intervals where a scarf centre may lie: the scarf inside the spar, clear of no-scarf ranges."""
    half = rules.length / 2
    zones = [(half, spar_length - half)]
    for a, b in rules.no_scarf:
        nxt = []
        for lo, hi in zones:
            cut_lo, cut_hi = a - half, b + half
            if cut_hi <= lo or cut_lo >= hi:
                nxt.append((lo, hi))
                continue
            if cut_lo > lo:
                nxt.append((lo, cut_lo))
            if cut_hi < hi:
                nxt.append((cut_hi, hi))
        zones = nxt
    return [(lo, hi) for lo, hi in zones if hi > lo]


def _solve(start: float, end: float, spar_length: float, rules: ScarfRules, counts: Sequence[int],
           stagger: bool) -> list[list[float]] | None:
    """Scarf centres per phase (``counts[p]`` in phase p) with the largest common slack, or None."""
    zones = _allowed_zones(spar_length, rules)
    if not zones:
        return None
    k = rules.slope_factor
    reach = rules.longest_piece / k  # most z a segment may cover
    least = MIN_SEGMENT_FACTOR * rules.length
    half = rules.length / 2
    big = 4 * (end - start + rules.longest_piece)
    P, Z = len(counts), len(zones)
    offsets = np.concatenate([[0], np.cumsum(counts)]).astype(int)
    # Variables: centres c[p,i], zone picks y[p,i,z], order picks o[pair], slack t.
    n_c = int(offsets[-1])
    n_y = n_c * Z
    pairs = []
    if stagger and P > 1:
        adjacent = [(0, 1)] if P == 2 else [(0, 1), (1, 2), (0, 2)]
        pairs = [(p, i, q, j) for p, q in adjacent for i in range(counts[p]) for j in range(counts[q])]
    n_o = len(pairs)
    n = n_c + n_y + n_o + 1
    t_index = n - 1

    def c(p: int, i: int) -> int:
        return int(offsets[p]) + i

    def y(p: int, i: int, z: int) -> int:
        return n_c + c(p, i) * Z + z

    rows, lo, hi = [], [], []

    def add(coeffs: dict[int, float], low: float, high: float) -> None:
        row = np.zeros(n)
        for idx, v in coeffs.items():
            row[idx] += v
        rows.append(row)
        lo.append(low)
        hi.append(high)

    for p in range(P):
        m = counts[p]
        for i in range(m):
            # Segment lengths: first, between, last; each fits a board and is no shorter than `least`.
            if i == 0:
                add({c(p, 0): 1, t_index: 1}, -np.inf, start + reach - half)
                add({c(p, 0): 1, t_index: -1}, start + least - half, np.inf)
            else:
                add({c(p, i): 1, c(p, i - 1): -1, t_index: 1}, -np.inf, reach - rules.length)
                add({c(p, i): 1, c(p, i - 1): -1, t_index: -1}, least - rules.length, np.inf)
            if i == m - 1:
                add({c(p, i): -1, t_index: 1}, -np.inf, reach - half - end)
                add({c(p, i): -1, t_index: -1}, least - half - end, np.inf)
            # One zone each, and the centre inside it with slack.
            add({y(p, i, z): 1 for z in range(Z)}, 1, 1)
            for z, (zlo, zhi) in enumerate(zones):
                add({c(p, i): 1, y(p, i, z): -big, t_index: -1}, zlo - big, np.inf)
                add({c(p, i): 1, y(p, i, z): big, t_index: 1}, -np.inf, zhi + big)
    gap = rules.length + rules.stagger
    for o, (p, i, q, j) in enumerate(pairs):
        oi = n_c + n_y + o
        # o = 1: c[p,i] after c[q,j] by the gap; o = 0: before it.
        add({c(p, i): 1, c(q, j): -1, oi: -big, t_index: -1}, gap - big, np.inf)
        add({c(q, j): 1, c(p, i): -1, oi: big, t_index: -1}, gap, np.inf)
    objective = np.zeros(n)
    objective[t_index] = -1.0
    integrality = np.zeros(n)
    integrality[n_c:n_c + n_y + n_o] = 1
    lower = np.full(n, -np.inf)
    upper = np.full(n, np.inf)
    lower[n_c:n_c + n_y + n_o] = 0
    upper[n_c:n_c + n_y + n_o] = 1
    lower[t_index], upper[t_index] = 0.0, rules.longest_piece
    result = milp(objective, constraints=LinearConstraint(np.array(rows), lo, hi), integrality=integrality,
                  bounds=Bounds(lower, upper), options={"time_limit": 20})
    if result.x is None or (not result.success and result.status != 1):
        return None
    return [[float(result.x[c(p, i)]) for i in range(counts[p])] for p in range(P)]


def place_scarfs(start: float, end: float, face_length: float, spar_length: float, staves: int,
                 rules: ScarfRules) -> ScarfPlan:
    """Scarfs for every stave running from z = ``start`` to ``end`` (mm), ``face_length`` long.

    Raises DesignError naming the rule that blocks a placement.
    """
    count = least_segments(face_length, rules) - 1
    phases = phase_of_staves(staves)
    if count == 0:
        return ScarfPlan(centres=tuple(() for _ in range(staves)), phases=phases, length=rules.length)
    n_phases = max(phases) + 1
    share = [phases.count(p) for p in range(n_phases)]
    options = sorted(itertools.product(range(count, count + 3), repeat=n_phases),
                     key=lambda cs: (sum(c * k for c, k in zip(cs, share)), max(cs)))
    for counts in options:
        found = _solve(start, end, spar_length, rules, counts, stagger=True)
        if found is not None:
            centres = tuple(tuple(found[phases[k]]) for k in range(staves))
            return ScarfPlan(centres=centres, phases=phases, length=rules.length)
    if _solve(start, end, spar_length, rules, [count], stagger=False) is None:
        if not _allowed_zones(spar_length, rules):
            raise DesignError("the no-scarf ranges cover the whole spar: there is nowhere to put a scarf",
                              "stock.no_scarf")
        raise DesignError(
            f"the staves need {count} scarf(s) each with boards of {rules.show(rules.longest_piece)}, but the "
            "no-scarf ranges leave no place where every segment fits a board; allow scarfs somewhere or "
            "list longer boards", "stock.no_scarf" if rules.no_scarf else "stock.lengths")
    raise DesignError(
        f"scarfs in neighbouring staves cannot be kept {rules.show(rules.stagger)} apart with boards of "
        f"{rules.show(rules.longest_piece)} and these no-scarf ranges; reduce the stagger or list longer boards",
        "stock.scarf_stagger")


def segment_bounds(start: float, end: float, centres: Sequence[float], scarf_length: float) -> list[tuple[float, float]]:
    """(from, to) in z (mm) of each segment of a stave, scarf overlaps included."""
    half = scarf_length / 2
    edges = [start] + [c for c in centres] + [end]
    out = []
    for i in range(len(edges) - 1):
        a = edges[i] - (half if i > 0 else 0.0)
        b = edges[i + 1] + (half if i + 1 < len(edges) - 1 else 0.0)
        out.append((a, b))
    return out
