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

That placement looks only at the rules, not at the boards: a 12' 6" segment
is cut from a 14 ft board. :func:`aim_scarfs` then aims the scarfs at the
boards. It keeps each phase's count of scarfs and every rule above, and
tries placements where the segments come out as long as a board, or as half
or a third of one (less the gaps between them), measured along the face:

1. every such placement of each phase that keeps the rules is generated
   (at most ``AimWork.sequences`` per phase) and given a quick estimate of
   the board feet its staves need (:func:`~stavegen.layout.lumber.board_feet_rate`);
2. the best ``AimWork.per_phase`` of each phase, and the slack-first
   placement, are combined across phases where the stagger allows;
3. the ``AimWork.combined`` best combinations by the estimate are ordered by
   the lumber solver (the same two-stage model, with a light work limit);
4. the best of them and the slack-first placement are ordered again with the
   full work limit, and the one that needs fewer board feet is kept (the
   slack-first one on a tie, and the one with more slack between aimed ones).

So the chosen placement never needs more board feet than the slack-first
one, and every limit is a count: the same spar gives the same scarfs on any
machine.
"""

from __future__ import annotations

import bisect
import itertools
import math
from dataclasses import dataclass
from typing import Callable, Sequence

import numpy as np
from scipy.optimize import Bounds, LinearConstraint

from ..errors import DesignError
from ..model.spar import Stock
from ..units import format_length
from . import highs
from .lumber import WORK, LumberOrder, Piece, Work, board_feet_rate, order_lumber
from .staves import StavePlan

MIN_SEGMENT_FACTOR = 2.0  # a segment is at least twice the scarf length
SCARF_NODES = 2000  # branch-and-bound nodes of the slack-first placement
TOUCH = 1e-6  # mm: a rule is kept when it holds to this
AIM_MARGIN = 0.5  # mm: an aimed segment is this much shorter than the board length it is aimed at


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
    # A node limit, not a time limit: the same spar gives the same scarfs on any machine (the time limit is a
    # last guard only; these models are small and prove in a few nodes).
    result = highs.solve(objective, constraints=LinearConstraint(np.array(rows), lo, hi), integrality=integrality,
                         bounds=Bounds(lower, upper), options={"node_limit": SCARF_NODES, "time_limit": 60})
    if result.x is None:
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


# --------------------------------------------------------------------------- aimed at the boards


@dataclass(frozen=True)
class AimWork:
    """Limits on aiming the scarfs at the boards: counts only, so the answer depends on the spar alone."""

    fills: int = 3  # a segment is aimed at a board length, or 1/2 ... 1/fills of one
    sequences: int = 2000  # most placements generated per phase
    per_phase: int = 12  # placements of each phase kept after the quick estimate
    combined: int = 8  # whole placements ordered with the lumber solver's light work
    light: Work = Work(rounds=20, nodes=200)
    full: Work = WORK


AIM = AimWork()


@dataclass(frozen=True)
class ScarfAim:
    """Aiming the scarfs at the boards: board feet the cutting plan uses (before the waste allowance) with the
    slack-first placement and with the chosen one (full work limit, both); the chosen one's LP bound; how many
    placements were ordered."""

    slack_first_board_feet: float
    board_feet: float
    lower_bound_board_feet: float
    tried: int
    aimed: bool

    @property
    def saved_board_feet(self) -> float:
        return self.slack_first_board_feet - self.board_feet


@dataclass(frozen=True)
class ScarfChoice:
    """The scarfs chosen, the slack-first placement beside them, and what aiming found (None: nothing to aim)."""

    plan: ScarfPlan
    slack_first: ScarfPlan
    aim: ScarfAim | None


def _interp(x: float, xp: list[float], fp: list[float]) -> float:
    """``numpy.interp`` for one value, in plain Python (the same formula, so the same figure to the last bit):
    a scalar lookup without numpy's per-call cost, which aiming pays tens of thousands of times."""
    if x <= xp[0]:
        return fp[0]
    if x >= xp[-1]:
        return fp[-1]
    j = bisect.bisect_right(xp, x) - 1
    slope = (fp[j + 1] - fp[j]) / (xp[j + 1] - xp[j])
    value = slope * (x - xp[j]) + fp[j]
    return value if value == value else slope * (x - xp[j + 1]) + fp[j + 1]  # numpy's fallback for a NaN


class _Geometry:
    """Face lengths and rip widths of stave pieces, read off the stave plan (straight between stations)."""

    def __init__(self, plan: StavePlan, rough: Callable[[float], float] | None = None) -> None:
        self.z = [float(st.z) for st in plan.stations]
        self.s = [float(st.s) for st in plan.stations]
        self.width = [float(st.width) for st in plan.stations]
        self.rough = rough or (lambda widest: widest + 2 * plan.edge_allowance)
        self._pieces: dict[tuple[float, float], tuple[float, float]] = {}

    def s_at(self, z: float) -> float:
        return _interp(z, self.z, self.s)

    def z_at(self, s: float) -> float:
        return _interp(s, self.s, self.z)

    def piece(self, a: float, b: float) -> tuple[float, float]:
        """(face length, rip width) of the stave from z = a to b (remembered: placements share pieces)."""
        found = self._pieces.get((a, b))
        if found is None:
            inside = self.width[bisect.bisect_right(self.z, a):bisect.bisect_left(self.z, b)]
            widest = max(_interp(a, self.z, self.width), _interp(b, self.z, self.width), *inside, 0.0)
            found = self._pieces[(a, b)] = (self.s_at(b) - self.s_at(a), self.rough(widest))
        return found


def _adjacent(phases: int) -> list[tuple[int, int]]:
    return [] if phases < 2 else [(0, 1)] if phases == 2 else [(0, 1), (1, 2), (0, 2)]


class _Aim:
    """One spar's scarf aiming: the rules, the stave geometry and the stock."""

    def __init__(self, geo: _Geometry, start: float, end: float, spar_length: float, rules: ScarfRules,
                 stock: Stock) -> None:
        self.geo, self.start, self.end, self.rules, self.stock = geo, start, end, rules, stock
        self.zones = _allowed_zones(spar_length, rules)
        self.least = MIN_SEGMENT_FACTOR * rules.length
        self.half = rules.length / 2
        self.gap = rules.length + rules.stagger
        self._orders: dict[tuple, LumberOrder] = {}
        self.solved: dict | None = None  # the layout's cutting problems solved so far (lumber.order_lumber)

    # -- rules --

    def slack(self, centres: Sequence[float]) -> float | None:
        """The least margin by which one stave's scarfs keep the rules (mm), or None if they break one."""
        margins = []
        for c in centres:
            inside = [min(c - lo, hi - c) for lo, hi in self.zones if lo - TOUCH <= c <= hi + TOUCH]
            if not inside:
                return None
            margins.append(max(inside))
        if any(b <= a for a, b in zip(centres, centres[1:])):
            return None
        for a, b in segment_bounds(self.start, self.end, centres, self.rules.length):
            length, _ = self.geo.piece(a, b)
            margins += [self.rules.longest_piece - length, (b - a) - self.least]
        least = min(margins)
        return least if least >= -TOUCH else None

    def stagger_slack(self, one: Sequence[float], other: Sequence[float]) -> float:
        return min((abs(a - b) - self.gap for a in one for b in other), default=math.inf)

    # -- placements aimed at the boards --

    def fills(self, work: AimWork) -> list[float]:
        """Face lengths that fill a board length alone, or 2 ... ``work.fills`` to a rip, gaps between."""
        g = self.stock.gap
        out = {round((L + g) / n - g - AIM_MARGIN, 6) for L in self.stock.lengths for n in range(1, work.fills + 1)}
        return sorted((f for f in out if self.least <= f <= self.rules.longest_piece), reverse=True)

    def sequences(self, count: int, fills: list[float], cap: int) -> list[tuple[float, ...]]:
        """Placements of ``count`` scarfs where every segment but one is aimed at a fill length."""
        geo, h = self.geo, self.half
        out: list[tuple[float, ...]] = []
        for free in range(count + 1):  # segments before ``free`` aimed from the heel, those after from the head
            for heel in itertools.product(fills, repeat=free):
                cs, z = [], self.start
                for f in heel:
                    c = geo.z_at(geo.s_at(z) + f) - h
                    cs.append(c)
                    z = c - h
                for head in itertools.product(fills, repeat=count - free):
                    ds, z = [], self.end
                    for f in head:
                        c = geo.z_at(geo.s_at(z) - f) + h
                        ds.append(c)
                        z = c + h
                    out.append(tuple(cs + ds[::-1]))
                    if len(out) >= cap:
                        return out
        return out

    def pieces(self, centres: tuple[tuple[float, ...], ...], phases: tuple[int, ...]) -> list[Piece]:
        out = []
        for k, p in enumerate(phases, start=1):
            for i, (a, b) in enumerate(segment_bounds(self.start, self.end, centres[p], self.rules.length), 1):
                length, width = self.geo.piece(a, b)
                out.append(Piece(f"S{k}-{i}", k, i, length, width, 0.0))
        return out

    def rate(self, centres: tuple[float, ...], staves: int) -> float:
        one = [self.geo.piece(a, b) for a, b in segment_bounds(self.start, self.end, centres, self.rules.length)]
        return staves * board_feet_rate([Piece("x", 1, 1, length, width, 0.0) for length, width in one], self.stock)

    def order(self, centres: tuple[tuple[float, ...], ...], phases: tuple[int, ...], work: Work) -> LumberOrder:
        """The lumber order of a placement's pieces. Placements that cut the same pieces (the order depends only on
        their sorted widths and lengths, see lumber._group) share one solve."""
        pieces = self.pieces(centres, phases)
        key = (work, tuple(sorted((p.width, p.length) for p in pieces)))
        if key not in self._orders:
            self._orders[key] = order_lumber(pieces, self.stock, units=self.rules.units, work=work,
                                             solved=self.solved)
        return self._orders[key]


def aim_scarfs(plan: StavePlan, spar_length: float, staves: int, rules: ScarfRules, stock: Stock,
               work: AimWork = AIM, rough: Callable[[float], float] | None = None,
               solved: dict | None = None) -> ScarfChoice:
    """Scarfs that keep every rule and need the fewest board feet of the placements tried (see the module).

    ``plan`` is the stave before its segments are cut (its stations give face lengths and widths);
    ``rough(widest)`` is a segment's rip width from its widest finished width (default: an edge allowance on
    each edge). ``solved``: the layout's cutting problems solved so far, shared with its other lumber orders
    (:func:`~stavegen.layout.lumber.order_lumber`). Raises DesignError as :func:`place_scarfs` does when no
    placement keeps the rules.
    """
    base = place_scarfs(plan.start, plan.end, plan.cut_length, spar_length, staves, rules)
    if base.count == 0:
        return ScarfChoice(base, base, None)
    aim = _Aim(_Geometry(plan, rough), plan.start, plan.end, spar_length, rules, stock)
    aim.solved = solved
    phases = base.phases
    n_phases = max(phases) + 1
    first = {p: phases.index(p) for p in range(n_phases)}
    slack_first = tuple(base.centres[first[p]] for p in range(n_phases))
    fills = aim.fills(work)
    kept: list[list[tuple[float, tuple[float, ...]]]] = []
    for p in range(n_phases):
        share = phases.count(p)
        found: dict[tuple[float, ...], tuple[float, float]] = {}
        for centres in [slack_first[p]] + aim.sequences(len(slack_first[p]), fills, work.sequences):
            key = tuple(round(c, 3) for c in centres)
            if key in found:
                continue
            slack = aim.slack(centres)
            if slack is not None:
                found[key] = (aim.rate(centres, share), slack, centres)
        ranked = sorted(found.values(), key=lambda v: (round(v[0], 9), -v[1]))
        best = [(rate, centres) for rate, _, centres in ranked[:work.per_phase]]
        if all(c != slack_first[p] for _, c in best):
            best.append((found[tuple(round(c, 3) for c in slack_first[p])][0], slack_first[p]))
        kept.append(best)
    combos = []
    for pick in itertools.product(*kept):
        centres = tuple(c for _, c in pick)
        stagger = min((aim.stagger_slack(centres[p], centres[q]) for p, q in _adjacent(n_phases)), default=math.inf)
        if stagger < -TOUCH or centres == slack_first:
            continue
        slack = min([stagger] + [aim.slack(c) for c in centres])
        combos.append((round(sum(rate for rate, _ in pick), 9), -slack, centres))
    combos.sort(key=lambda v: (v[0], v[1]))
    tried = [slack_first] + [centres for _, _, centres in combos[:work.combined]]
    light = [(aim.order(c, phases, work.light).board_feet, i) for i, c in enumerate(tried)]
    best_light = min(light, key=lambda v: (round(v[0], 9), v[1]))[1]  # the slack-first one wins a tie
    full_base = aim.order(slack_first, phases, work.full)
    chosen, full = slack_first, full_base
    if best_light != 0:
        candidate = aim.order(tried[best_light], phases, work.full)
        if candidate.board_feet < full_base.board_feet - 1e-9:
            chosen, full = tried[best_light], candidate
    result = ScarfAim(slack_first_board_feet=full_base.board_feet, board_feet=full.board_feet,
                      lower_bound_board_feet=full.lower_bound_board_feet, tried=len(tried), aimed=chosen != slack_first)
    if chosen == slack_first:
        return ScarfChoice(base, base, result)
    plan_out = ScarfPlan(centres=tuple(tuple(chosen[phases[k]]) for k in range(staves)), phases=phases,
                         length=rules.length)
    return ScarfChoice(plan_out, base, result)
