"""The lumber order: which boards to buy and where every stave segment is cut from them.

Lengths are mm and volumes mm³ unless a name says otherwise (``board_feet``, ``volume_m3``).

How a board is cut, in two stages as on a table saw:

1. it is ripped along its length into strips ("rips"); neighbouring rips are one gap
   apart, so  Σ rip widths + (rips − 1) × gap ≤ board width; a rip is as wide as the
   widest piece in it;
2. each rip is cross-cut into pieces laid end to end, one gap apart, so
   Σ piece lengths + (pieces − 1) × gap ≤ board length.

The gap is what parts neighbouring pieces (``Stock.gap``): the saw's kerf, or the router
bit's diameter when the pieces are routed out of the board (``stock.separate_with``).

The edges and ends of a dressed board are used as they come; trimming checked ends is
the builder's to allow for (``stock.waste``, or a longer ``end_allowance``).

Measure (North American lumber grading rules: NHLA rules, PS 20): one board foot is
144 in³ tallied on nominal thickness × nominal width × length; 1 in = 25.4 mm.
``volume_m3`` is the same nominal measure in cubic metres, the tally of a metric order.

Solver. Identical pieces (length and width within 0.01 mm) are grouped into types with
demands. The model is the two-stage pattern model: integer counts of rip patterns (pieces
along a board length) and of slot patterns (rip widths across a board of one size),
linked by one row per board length and rip width, solved with HiGHS
(``scipy.optimize.milp``). When every pattern enumerates within ``pattern_limit`` the
model is complete and HiGHS's answer is the optimum. Otherwise patterns are made by
column generation, both kinds priced exactly (a Pareto-front knapsack, exact for real
sizes), and HiGHS solves the integer model over the patterns made; first-fit plans
stand by in case it stops before it finds a plan.

Work limits, not time limits. The answer depends on the input only: column generation
runs at most ``Work.rounds`` rounds and the integer solve at most ``Work.nodes``
branch-and-bound nodes (HiGHS is deterministic), so a busy machine gives the same boards
as a quiet one, only later. A wall-clock guard (``Work.time_guard``) stays as a last
resort against a run-away solve; if it ever stops one, the order says so in its notes
(``LumberOrder.stopped_by_clock``), since that answer could differ on another machine.

Lower bound. ``lower_bound_board_feet`` is the LP relaxation of the two-stage model when
it is complete or column generation converged. When generation stops early it is the
Farley bound from the last duals, or the area bound, whichever is higher: weaker, still a
bound no plan can beat.
"""

from __future__ import annotations

import contextlib
import math
import os
import sys
import time
from collections import defaultdict
from dataclasses import dataclass, field, replace

import numpy as np
from scipy.optimize import LinearConstraint, linprog
from scipy.sparse import coo_matrix

from ..errors import InputError
from ..model.spar import Stock
from ..units import format_length
from . import highs

MM_PER_INCH = 25.4
BOARD_FOOT_MM3 = 144.0 * MM_PER_INCH**3  # one board foot, mm³
SAME = 0.01  # mm: pieces this close in length and in width are cut as one type
SAME_PROBLEM = 1e-9  # mm: cutting problems whose types agree to this are one problem (far inside EPS)
EPS = 1e-6  # mm: slack on every fit test, against rounding in sums

PATTERN_CAP = 4000  # most rip patterns per board length, and slot patterns per board width, enumerated


@dataclass(frozen=True)
class Work:
    """How much work one order may take: limits that depend on nothing but the input.

    ``rounds``: column-generation rounds; ``nodes``: branch-and-bound nodes of the integer
    solve; ``time_guard``: seconds of wall clock, a last guard against a run-away solve
    only (never reached on the benchmark jobs; when it stops a solve the order says so).
    """

    rounds: int = 120
    nodes: int = 1500
    time_guard: float = 120.0


WORK = Work()
CLOCK_NOTE = ("the solve was stopped by its time guard, not by its work limits: on another machine the "
              "plan could differ")


def board_feet(nominal_thickness: float, nominal_width: float, length: float) -> float:
    """Board feet of a board given its nominal thickness and width and its length (mm)."""
    return nominal_thickness * nominal_width * length / BOARD_FOOT_MM3


# --------------------------------------------------------------------------- the report


@dataclass(frozen=True)
class Piece:
    """One stave segment to cut.

    ``length`` (mm) along the stave; ``width`` (mm) the rip width it needs (its widest
    point plus edge allowances); ``volume`` (mm³) the finished stave wood in it.
    ``stave`` and ``segment`` count from 1.
    """

    label: str
    stave: int
    segment: int
    length: float
    width: float
    volume: float


@dataclass(frozen=True)
class BoardSize:
    """A board as sold: dressed width, length, thickness and nominal width, thickness (mm)."""

    width: float
    length: float
    thickness: float
    nominal_width: float
    nominal_thickness: float

    @property
    def board_feet(self) -> float:
        """Board feet on nominal thickness × nominal width × length."""
        return board_feet(self.nominal_thickness, self.nominal_width, self.length)

    @property
    def volume_m3(self) -> float:
        """Nominal volume, m³."""
        return self.nominal_thickness * self.nominal_width * self.length * 1e-9


@dataclass(frozen=True)
class Cut:
    """A piece placed in a rip, ``offset`` (mm) from the board's end to the piece's near end."""

    piece: Piece
    offset: float


@dataclass(frozen=True)
class Rip:
    """A strip ripped off a board: ``offset`` (mm) from the board's edge, ``width`` (mm)."""

    offset: float
    width: float
    cuts: tuple[Cut, ...]

    @property
    def length(self) -> float:
        """Length of the rip taken by its pieces and the kerfs between them (mm)."""
        last = self.cuts[-1]
        return last.offset + last.piece.length


@dataclass(frozen=True)
class Board:
    """One board bought, ``id`` like ``"B1"``, and the rips cut from it."""

    id: str
    size: BoardSize
    rips: tuple[Rip, ...]

    @property
    def pieces(self) -> tuple[Piece, ...]:
        return tuple(cut.piece for rip in self.rips for cut in rip.cuts)


@dataclass(frozen=True)
class SizeCount:
    """How many boards of one size."""

    size: BoardSize
    count: int

    @property
    def board_feet(self) -> float:
        return self.count * self.size.board_feet

    @property
    def volume_m3(self) -> float:
        return self.count * self.size.volume_m3


@dataclass(frozen=True)
class LumberOrder:
    """The boards that cut every piece, and the order to place.

    ``used`` counts the boards of :attr:`boards` by size; ``to_buy`` adds spare boards until
    the order holds at least (1 + waste) × the board feet used (see :func:`add_waste`). ``lower_bound_board_feet``: no cutting plan can use
    fewer board feet; it is the LP relaxation of the two-stage model when ``bound_is_lp``,
    else a weaker bound (Farley or area). ``stave_volume`` is Σ piece.volume (mm³).
    ``method`` is "enumerated patterns" or "column generation"; ``proven_optimal`` says
    the board feet are the least possible. ``gap`` (mm) parts neighbouring pieces on a board
    (kerf or router bit); ``stopped_by_clock`` says the time guard, not the work limits,
    ended the solve.
    """

    boards: tuple[Board, ...]
    used: tuple[SizeCount, ...]
    to_buy: tuple[SizeCount, ...]
    waste: float
    lower_bound_board_feet: float
    stave_volume: float
    method: str
    proven_optimal: bool
    bound_is_lp: bool
    notes: tuple[str, ...] = field(default=())
    gap: float = 0.0
    stopped_by_clock: bool = False

    @property
    def board_feet(self) -> float:
        """Board feet of the boards used (nominal measure)."""
        return sum(s.board_feet for s in self.used)

    @property
    def volume_m3(self) -> float:
        """Nominal volume of the boards used, m³."""
        return sum(s.volume_m3 for s in self.used)

    @property
    def yield_ratio(self) -> float:
        """Stave wood over the nominal volume of the boards used (board feet × 144 in³).

        Waste allowance is not in it: it compares the pieces with the boards they are cut
        from. 0 when there are no boards.
        """
        bought = self.board_feet * BOARD_FOOT_MM3
        return self.stave_volume / bought if bought > 0 else 0.0

    @property
    def to_buy_board_feet(self) -> float:
        return sum(s.board_feet for s in self.to_buy)

    @property
    def to_buy_volume_m3(self) -> float:
        return sum(s.volume_m3 for s in self.to_buy)


def add_waste(used: tuple[SizeCount, ...], waste: float) -> tuple[SizeCount, ...]:
    """The order: the boards used plus spares until it holds (1 + waste) × their board feet.

    The waste fraction is a share of the whole order, not of each size (one
    board of a size would otherwise become two). Spares go one at a time to
    the size with the most boards used per spare given so far (ties: the
    smaller board), so spares follow the sizes the job eats; the order stops
    at the first board that reaches the target.
    """
    counts = {u.size: u.count for u in used}
    target = (1.0 + waste) * sum(u.board_feet for u in used)
    extras = {u.size: 0 for u in used}

    def total() -> float:
        return sum((counts[k] + extras[k]) * k.board_feet for k in counts)
    while total() < target - 1e-9:
        # Spread spares over sizes in proportion to use: the size with most boards per spare so far.
        size = max(counts, key=lambda k: (counts[k] / (1 + extras[k]), -k.board_feet))
        extras[size] += 1
    return tuple(SizeCount(u.size, u.count + extras[u.size]) for u in used)


# ----------------------------------------------------------------------- the problem


@dataclass
class _Type:
    """Pieces cut alike: the largest length and width (mm) among its members."""

    length: float
    width: float
    members: list[int]

    @property
    def demand(self) -> int:
        return len(self.members)


@dataclass
class _Problem:
    types: list[_Type]
    sizes: list[BoardSize]
    kerf: float
    cost: np.ndarray = field(init=False)  # board feet of each size
    classes: list[float] = field(init=False)  # distinct rip widths, ascending (mm)
    type_class: list[int] = field(init=False)
    class_demand: list[int] = field(init=False)
    lengths: list[float] = field(init=False)  # distinct board lengths (mm)
    size_length: list[int] = field(init=False)

    def __post_init__(self) -> None:
        self.cost = np.array([s.board_feet for s in self.sizes])
        self.classes = sorted({t.width for t in self.types})
        index = {w: i for i, w in enumerate(self.classes)}
        self.type_class = [index[t.width] for t in self.types]
        self.class_demand = [0] * len(self.classes)
        for t, c in zip(self.types, self.type_class):
            self.class_demand[c] += t.demand
        self.lengths = sorted({s.length for s in self.sizes})
        lindex = {L: i for i, L in enumerate(self.lengths)}
        self.size_length = [lindex[s.length] for s in self.sizes]

    @property
    def demand(self) -> np.ndarray:
        return np.array([t.demand for t in self.types], dtype=float)


# A solution before pieces are placed: (size index, [rip as counts per type, ...]) per board.
_Plan = list[tuple[int, list[tuple[int, ...]]]]


class _TooMany(Exception):
    """Pattern enumeration passed its cap."""


def _group(pieces: list[Piece]) -> list[_Type]:
    types: list[_Type] = []
    reps: list[tuple[float, float]] = []
    order = sorted(range(len(pieces)), key=lambda i: (pieces[i].width, pieces[i].length))
    for i in order:
        p = pieces[i]
        for t, (l0, w0) in zip(types, reps):
            if abs(p.length - l0) <= SAME and abs(p.width - w0) <= SAME:
                t.members.append(i)
                t.length = max(t.length, p.length)
                t.width = max(t.width, p.width)
                break
        else:
            types.append(_Type(p.length, p.width, [i]))
            reps.append((p.length, p.width))
    for t in types:
        t.members.sort(key=lambda i: (pieces[i].stave, pieces[i].segment, pieces[i].label, i))
    return types


def _check(pieces: list[Piece], stock: Stock, units: str) -> None:
    if not stock.widths or not stock.lengths:
        raise InputError("needs at least one board width and one board length", "stock")
    longest, widest = max(stock.lengths), max(stock.widths)
    for p in pieces:
        if not (p.length > 0 and p.width > 0 and p.volume >= 0):
            raise ValueError(f"piece {p.label}: length and width must be positive, volume not negative")
        if p.volume > p.length * p.width * stock.thickness * (1 + 1e-9):
            raise ValueError(f"piece {p.label}: more stave wood than its length × width × board thickness")
        if p.length > longest + EPS:
            raise InputError(
                f"stave segment {p.label} is {format_length(p.length, units, tape=True)} long, "
                f"longer than the longest board ({format_length(longest, units, tape=True)}); "
                "add a longer board or more scarfs",
                "stock.lengths",
            )
        if p.width > widest + EPS:
            raise InputError(
                f"stave segment {p.label} needs a rip {format_length(p.width, units)} wide, "
                f"wider than the widest board ({format_length(widest, units)})",
                "stock.widths",
            )


def _sizes(stock: Stock) -> list[BoardSize]:
    seen: dict[tuple[float, float, float], BoardSize] = {}
    for w, nw in zip(stock.widths, stock.nominal_widths):
        for L in stock.lengths:
            seen.setdefault((w, nw, L), BoardSize(w, L, stock.thickness, nw, stock.nominal_thickness))
    return list(seen.values())


# ------------------------------------------------------------------------ knapsacks


class _Front:
    """Every non-dominated fill of one capacity (mm), built item by item: exact for real sizes.

    Fills are kept in order of size used, each worth strictly more than every smaller one
    (Nemhauser–Ullmann), so the last fill is the best so far.
    """

    def __init__(self, n_items: int, capacity: float, limit: int = 20_000) -> None:
        self.capacity = capacity + EPS
        self.limit = limit
        self.used = np.zeros(1)
        self.value = np.zeros(1)
        self.counts = np.zeros((1, n_items), dtype=np.int32)

    def add(self, item: int, value: float, size: float, copies: int) -> None:
        """Allow up to ``copies`` of ``item`` (worth ``value``, ``size`` mm each)."""
        if value <= 0 or size > self.capacity:
            return
        copies = min(copies, int(self.capacity // size))
        parts_used, parts_value, parts_counts = [self.used], [self.value], [self.counts]
        for n in range(1, copies + 1):
            used = self.used + n * size
            ok = used <= self.capacity
            if not ok.any():
                break
            counts = self.counts[ok].copy()
            counts[:, item] += n
            parts_used.append(used[ok])
            parts_value.append(self.value[ok] + n * value)
            parts_counts.append(counts)
        if len(parts_used) == 1:
            return
        all_used = np.concatenate(parts_used)
        all_value = np.concatenate(parts_value)
        all_counts = np.concatenate(parts_counts)
        order = np.lexsort((-all_value, all_used))
        v = all_value[order]
        before = np.concatenate([[-np.inf], np.maximum.accumulate(v)[:-1]])
        keep = order[v > before + 1e-12]
        self.used, self.value, self.counts = all_used[keep], all_value[keep], all_counts[keep]
        if len(keep) > self.limit:
            raise _TooMany

    def best(self) -> tuple[float, tuple[int, ...]]:
        return float(self.value[-1]), tuple(int(c) for c in self.counts[-1])

    def top(self, n: int, above: float) -> list[tuple[float, tuple[int, ...]]]:
        """Up to ``n`` of the best fills worth more than ``above``, best first."""
        out = []
        for i in range(len(self.value) - 1, max(-1, len(self.value) - 1 - n), -1):
            if self.value[i] <= above:
                break
            out.append((float(self.value[i]), tuple(int(c) for c in self.counts[i])))
        return out


def _knapsack(
    values: list[float], sizes: list[float], bounds: list[int], capacity: float
) -> tuple[float, tuple[int, ...]]:
    """Bounded integer knapsack: most value in ``capacity`` (mm), ``bounds`` copies at most."""
    front = _Front(len(values), capacity)
    for i, (v, z, b) in enumerate(zip(values, sizes, bounds)):
        front.add(i, v, z, b)
    return front.best()


# ------------------------------------------------------------- the two-stage pattern model
#
# Variables: y[r], how many rips of pattern r (counts per type along one board length,
# class = its widest type), and x[s, q], how many boards of size s are ripped to slot
# pattern q (counts per rip-width class across the board width).
#   demand rows  Σ_r a[t, r] y[r] ≥ d[t]                                  (duals π ≥ 0)
#   link rows    Σ_{r on length j, class ≥ c} y[r] ≤ Σ_{s of length j, q} slots≥c(q) x[s, q]
#                for every board length j and class c                     (duals μ ≥ 0)
# A rip fits any slot at least as wide; the link rows are exactly the condition for the
# rips of a length to be dealt into its slots, widest rip into widest slot.
# Rips hold at most d[t] pieces of type t; slot patterns at most the class's demand of
# slots of a class: neither bound cuts off a cutting plan that has no surplus.

Rips = list[list[tuple[tuple[int, ...], int]]]  # per board length: (counts, class)
Slots = dict[float, list[tuple[int, ...]]]  # per board width: counts per class


@dataclass
class _Model:
    cost: np.ndarray
    A: object  # scipy sparse, rows: demand then link
    upper: np.ndarray
    cols: list[tuple]  # ("rip", j, counts, cls) or ("board", s, q)


def _model(prob: _Problem, rips: Rips, slots: Slots) -> _Model:
    T, C = len(prob.types), len(prob.classes)
    rows, cols, vals, cost = [], [], [], []
    info: list[tuple] = []

    def link(j: int, c: int) -> int:
        return T + j * C + c

    for j, pats in enumerate(rips):
        for counts, cls in pats:
            col = len(info)
            info.append(("rip", j, counts, cls))
            cost.append(0.0)
            for t, a in enumerate(counts):
                if a:
                    rows.append(t), cols.append(col), vals.append(-float(a))
            for c in range(cls + 1):
                rows.append(link(j, c)), cols.append(col), vals.append(1.0)
    for s, size in enumerate(prob.sizes):
        j = prob.size_length[s]
        for q in slots.get(size.width, ()):
            col = len(info)
            info.append(("board", s, q))
            cost.append(float(prob.cost[s]))
            at_least = 0
            for c in range(C - 1, -1, -1):
                at_least += q[c]
                if at_least:
                    rows.append(link(j, c)), cols.append(col), vals.append(-float(at_least))
    n_rows = T + len(prob.lengths) * C
    A = coo_matrix((vals, (rows, cols)), shape=(n_rows, len(info))).tocsr()
    upper = np.concatenate([-prob.demand, np.zeros(n_rows - T)])
    return _Model(np.array(cost), A, upper, info)


def _lp(prob: _Problem, m: _Model) -> tuple[float, np.ndarray, np.ndarray]:
    """LP relaxation: (board feet, π per type, μ per length and class)."""
    res = linprog(m.cost, A_ub=m.A, b_ub=m.upper, bounds=(0, None), method="highs")
    if res.status != 0:
        raise RuntimeError(f"LP of the two-stage model failed: {res.message}")
    duals = np.clip(-np.asarray(res.ineqlin.marginals), 0.0, None)
    T = len(prob.types)
    return float(res.fun), duals[:T], duals[T:].reshape(len(prob.lengths), len(prob.classes))


@contextlib.contextmanager
def _quiet_stdout():
    """Silence file descriptor 1: HiGHS prints a stray line from C++ on some integer solves
    ("HighsMipSolverData::transformNewIntegerFeasibleSolution ...", HiGHS issue #2783),
    whatever its output options say, and it would land in the middle of the command's output."""
    sys.stdout.flush()
    try:
        saved = os.dup(1)
    except OSError:  # no descriptor 1 to silence
        yield
        return
    try:
        with open(os.devnull, "w") as null:
            os.dup2(null.fileno(), 1)
        yield
    finally:
        sys.stdout.flush()
        os.dup2(saved, 1)
        os.close(saved)


def _ip(m: _Model, work: Work, clock_left: float) -> tuple[np.ndarray | None, bool, bool]:
    """Integer solve within ``work.nodes`` nodes: (counts per column or None, proven optimal,
    stopped by the clock guard)."""
    with _quiet_stdout():
        res = highs.solve(m.cost, constraints=LinearConstraint(m.A, -np.inf, m.upper),
                          integrality=np.ones(len(m.cost)),
                          options={"node_limit": work.nodes, "time_limit": max(0.5, clock_left), "mip_rel_gap": 1e-9})
    clock = res.status == 1  # scipy's status 1 is HiGHS's time limit (the node limit is status 4)
    if res.x is None:
        return None, False, clock
    return np.round(res.x).astype(int), res.status == 0, clock


def _decode(prob: _Problem, m: _Model, x: np.ndarray) -> _Plan:
    """Boards from integer counts: rips of each length dealt widest first into the widest slots."""
    pool: dict[int, list[tuple[int, tuple[int, ...]]]] = defaultdict(list)
    slots: dict[int, list[tuple[int, int]]] = defaultdict(list)  # length -> (class, board)
    plan: _Plan = []
    for n, info in zip(x, m.cols):
        if n <= 0:
            continue
        if info[0] == "rip":
            _, j, counts, cls = info
            pool[j].extend([(cls, counts)] * int(n))
        else:
            _, s, q = info
            for _ in range(int(n)):
                plan.append((s, []))
                slots[prob.size_length[s]].extend(
                    (c, len(plan) - 1) for c in range(len(q)) for _ in range(q[c])
                )
    for j, rips in pool.items():
        rips.sort(key=lambda r: -r[0])
        open_slots = sorted(slots[j], key=lambda sl: -sl[0])
        if len(rips) > len(open_slots):
            raise RuntimeError("two-stage model: more rips than slots")
        for (cls, counts), (slot_cls, b) in zip(rips, open_slots):
            if cls > slot_cls:
                raise RuntimeError("two-stage model: a rip wider than its slot")
            plan[b][1].append(counts)
    return plan


def _rip_patterns(prob: _Problem, length: float, cap: int) -> list[tuple[tuple[int, ...], int]]:
    """Every rip of one board length, maximal within its class: (counts per type, class)."""
    k = prob.kerf
    step = [t.length + k for t in prob.types]
    T = len(prob.types)
    out: list[tuple[tuple[int, ...], int]] = []
    counts = [0] * T
    visited = [0]

    def leaf(rem: float) -> None:
        used = [i for i in range(T) if counts[i]]
        if not used:
            return
        cls = max(prob.type_class[i] for i in used)
        for i in range(T):
            if prob.type_class[i] <= cls and counts[i] < prob.types[i].demand and step[i] <= rem + EPS:
                return  # another piece still fits: not maximal
        out.append((tuple(counts), cls))
        if len(out) > cap:
            raise _TooMany

    def rec(i: int, rem: float) -> None:
        visited[0] += 1
        if visited[0] > 20 * cap:
            raise _TooMany
        if i == T:
            leaf(rem)
            return
        most = min(prob.types[i].demand, int((rem + EPS) // step[i]))
        for c in range(most, -1, -1):
            counts[i] = c
            rec(i + 1, rem - c * step[i])
        counts[i] = 0

    rec(0, length + k)
    return out


def _slot_patterns(prob: _Problem, width: float, cap: int) -> list[tuple[int, ...]]:
    """Every slot pattern of one board width, maximal: counts per class."""
    k = prob.kerf
    step = [c + k for c in prob.classes]
    C = len(step)
    out: list[tuple[int, ...]] = []
    counts = [0] * C
    visited = [0]

    def rec(i: int, rem: float) -> None:
        visited[0] += 1
        if visited[0] > 20 * cap:
            raise _TooMany
        if i == C:
            if not any(counts):
                return
            for j in range(C):
                if counts[j] < prob.class_demand[j] and step[j] <= rem + EPS:
                    return
            out.append(tuple(counts))
            if len(out) > cap:
                raise _TooMany
            return
        most = min(prob.class_demand[i], int((rem + EPS) // step[i]))
        for c in range(most, -1, -1):
            counts[i] = c
            rec(i + 1, rem - c * step[i])
        counts[i] = 0

    rec(0, width + k)
    return out


def _enumerate(prob: _Problem, limit: int) -> tuple[Rips, Slots, bool]:
    """Every maximal pattern of each board length and width whose count stays within ``limit``.

    Families past the limit are left empty for column generation; the flag says whether
    every family was enumerated (then the model is complete and generation adds nothing).
    """
    rips: Rips = [[] for _ in prob.lengths]
    slots: Slots = defaultdict(list)
    complete, total = True, 0
    for j, L in enumerate(prob.lengths):
        try:
            pats = _rip_patterns(prob, L, limit)
        except _TooMany:
            complete = False
            continue
        if total + len(pats) > 2 * limit:
            complete = False
            continue
        rips[j], total = pats, total + len(pats)
    for w in sorted({z.width for z in prob.sizes}):
        try:
            pats = _slot_patterns(prob, w, limit)
        except _TooMany:
            complete = False
            continue
        columns = len(pats) * sum(1 for z in prob.sizes if z.width == w)  # one per size of that width
        if total + columns > 3 * limit:
            complete = False
            continue
        slots[w], total = pats, total + columns
    return rips, slots, complete


# --------------------------------------------------------------------- column generation


def _strips(
    prob: _Problem, pi: np.ndarray, price: np.ndarray | None = None, new: list | None = None, n: int = 3
) -> dict[tuple[int, int], tuple[float, tuple[int, ...]]]:
    """Best rip of every board length j and class c under duals π: (value, counts per type).

    With ``price`` (the worth of a slot of length j and class c), up to ``n`` rips worth
    more than their slot are put in ``new`` as (j, counts).
    """
    k = prob.kerf
    out = {}
    for j, L in enumerate(prob.lengths):
        front = _Front(len(prob.types), L + k)
        for c in range(len(prob.classes)):
            for t, typ in enumerate(prob.types):
                if prob.type_class[t] == c:
                    front.add(t, float(pi[t]), typ.length + k, typ.demand)
            out[j, c] = front.best()
            if price is not None and new is not None:
                above = price[j, c] + 1e-9 * max(1.0, price[j, c])
                new.extend((j, counts) for _, counts in front.top(n, above) if any(counts))
    return out


def _board_front(prob: _Problem, s: int, worth: np.ndarray) -> _Front:
    """Slot fills of a board of size ``s`` when a rip of class c on its length is worth worth[j, c]."""
    k, size, j = prob.kerf, prob.sizes[s], prob.size_length[s]
    front = _Front(len(prob.classes), size.width + k)
    for c, w in enumerate(prob.classes):
        if w <= size.width + EPS:
            front.add(c, float(worth[j, c]), w + k, prob.class_demand[c])
    return front


def _board_value(prob: _Problem, s: int, worth: np.ndarray) -> tuple[float, tuple[int, ...]]:
    """Most a board of size ``s`` is worth, and its slots, when a rip of class c is worth worth[j, c]."""
    return _board_front(prob, s, worth).best()


def _farley(prob: _Problem, pi: np.ndarray, strips: dict) -> float:
    """Lower bound from any π ≥ 0 (Farley): π / θ is dual feasible for the board-pattern LP.

    θ is the most any board is worth under π per board foot of its size, each board priced
    exactly by two nested knapsacks (pieces into a rip, rips across the board).
    """
    worth = np.array([[strips[j, c][0] for c in range(len(prob.classes))] for j in range(len(prob.lengths))])
    theta = max(_board_value(prob, s, worth)[0] / prob.cost[s] for s in range(len(prob.sizes)))
    return float(pi @ prob.demand) / max(1.0, theta)


def _area_bound(prob: _Problem) -> float:
    """Lower bound from area: a board holds at most (W + kerf)(L + kerf) of pieces padded by a kerf."""
    k = prob.kerf
    need = sum(t.demand * (t.length + k) * (t.width + k) for t in prob.types)
    return need * min(c / ((z.width + k) * (z.length + k)) for c, z in zip(prob.cost, prob.sizes))


def _start(prob: _Problem) -> tuple[Rips, Slots]:
    """Rips of one type each and boards of one rip width each: enough to cover any demand."""
    k = prob.kerf
    rips: Rips = [[] for _ in prob.lengths]
    for j, L in enumerate(prob.lengths):
        for t, typ in enumerate(prob.types):
            n = min(typ.demand, int((L + k + EPS) // (typ.length + k)))
            if n:
                rips[j].append((tuple(n if i == t else 0 for i in range(len(prob.types))), prob.type_class[t]))
    slots: Slots = defaultdict(list)
    for w in sorted({s.width for s in prob.sizes}):
        for c, cw in enumerate(prob.classes):
            n = min(prob.class_demand[c], int((w + k + EPS) // (cw + k)))
            if n:
                slots[w].append(tuple(n if i == c else 0 for i in range(len(prob.classes))))
    return rips, slots


def _one_type_boards(prob: _Problem) -> _Plan:
    """A plan needing no solver: each type on its own boards, of the size cheapest per piece."""
    k = prob.kerf
    plan: _Plan = []
    for t, typ in enumerate(prob.types):
        best = None
        for s, size in enumerate(prob.sizes):
            along = min(typ.demand, int((size.length + k + EPS) // (typ.length + k)))
            across = int((size.width + k + EPS) // (typ.width + k))
            if along and across:
                per = prob.cost[s] / (along * across)
                if best is None or per < best[0]:
                    best = (per, s, along, across)
        _, s, along, across = best
        rip = tuple(along if i == t else 0 for i in range(len(prob.types)))
        plan.extend((s, [rip] * across) for _ in range(math.ceil(typ.demand / (along * across))))
    return plan


def _first_fit(prob: _Problem, main: int, by_length: bool) -> _Plan:
    """Rips first fit decreasing, then rips first fit decreasing across boards of size ``main``.

    Pieces that do not fit that size go, by the same rule, to the cheapest size that takes
    the longest and the widest of them. No solver: a fallback and a yardstick.
    """
    k, T = prob.kerf, len(prob.types)
    order = sorted(range(T), key=lambda t: ((prob.types[t].length, prob.types[t].width) if by_length
                                            else (prob.types[t].width, prob.types[t].length)), reverse=True)
    plan: _Plan = []
    todo = list(order)
    size = prob.sizes[main]
    while todo:
        fits = [t for t in todo
                if prob.types[t].length <= size.length + EPS and prob.types[t].width <= size.width + EPS]
        if not fits:
            longest = max(prob.types[t].length for t in todo)
            widest = max(prob.types[t].width for t in todo)
            choice = [s for s, z in enumerate(prob.sizes) if z.length + EPS >= longest and z.width + EPS >= widest]
            main = min(choice, key=lambda s: prob.cost[s])
            size = prob.sizes[main]
            continue
        rips: list[list] = []  # [width, room left along, counts]
        for t in fits:
            typ = prob.types[t]
            for _ in range(typ.demand):
                for rip in rips:
                    if rip[0] + EPS >= typ.width and rip[1] + EPS >= typ.length + k:
                        rip[1] -= typ.length + k
                        rip[2][t] += 1
                        break
                else:
                    counts = [0] * T
                    counts[t] = 1
                    rips.append([typ.width, size.length - typ.length, counts])
        boards: list[list] = []  # [room left across, rips]
        for rip in sorted(rips, key=lambda r: -r[0]):
            for board in boards:
                if board[0] + EPS >= rip[0] + k:
                    board[0] -= rip[0] + k
                    board[1].append(tuple(rip[2]))
                    break
            else:
                boards.append([size.width - rip[0], [tuple(rip[2])]])
        plan.extend((main, b[1]) for b in boards)
        todo = [t for t in todo if t not in fits]
    return plan


@dataclass
class _Outcome:
    plan: _Plan
    bound: float
    optimal: bool
    complete: bool
    converged: bool
    stopped_by_clock: bool
    work: Work  # the limits it was solved within
    limited: bool  # a work limit or the clock ended a stage: more work could give another answer


def _solve(prob: _Problem, work: Work, limit: int) -> _Outcome:
    """The two-stage model: patterns enumerated up to ``limit`` per family, the rest generated.

    Column generation runs at most ``work.rounds`` rounds, the integer solve over every
    pattern made at most ``work.nodes`` nodes; ``work.time_guard`` seconds of wall clock
    stop either only as a last resort (and the outcome says so).
    """
    clock_end = time.monotonic() + work.time_guard
    rips, slots = _start(prob)
    full_rips, full_slots, complete = _enumerate(prob, limit) if limit > 0 else ([], {}, False)
    if not complete:  # a part-enumerated model only slows the integer solve: generate it all
        full_rips, full_slots = [], {}
    seen_rips = {(j, r) for j, pats in enumerate(rips) for r in pats}
    seen_slots = {(w, q) for w, qs in slots.items() for q in qs}
    for j, pats in enumerate(full_rips):
        rips[j].extend(r for r in pats if (j, r) not in seen_rips)
        seen_rips.update((j, r) for r in pats)
    for w, qs in full_slots.items():
        slots[w].extend(q for q in qs if (w, q) not in seen_slots)
        seen_slots.update((w, q) for q in qs)
    converged = False
    clock = False
    rounds_out = work.rounds == 0
    bound = _area_bound(prob)
    try:
        for done in range(1, work.rounds + 1):
            m = _model(prob, rips, slots)
            value, pi, mu = _lp(prob, m)
            price = np.cumsum(mu, axis=1)  # a slot of class c on length j is worth Σ_{c' ≤ c} μ[j, c']
            new_rips: list[tuple[int, tuple[int, ...]]] = []
            strips = _strips(prob, pi, price, new_rips)
            added = False
            for j, counts in new_rips:
                cls = max(prob.type_class[t] for t, a in enumerate(counts) if a)
                if (j, (counts, cls)) not in seen_rips:
                    seen_rips.add((j, (counts, cls)))
                    rips[j].append((counts, cls))
                    added = True
            for s, size in enumerate(prob.sizes):
                for _, q in _board_front(prob, s, price).top(3, prob.cost[s] * (1 + 1e-9)):
                    if (size.width, q) not in seen_slots:
                        seen_slots.add((size.width, q))
                        slots[size.width].append(q)
                        added = True
            if not added:
                converged = True
                bound = max(bound, value)
                break
            bound = max(bound, _farley(prob, pi, strips))
            if time.monotonic() > clock_end:  # the last guard only: work limits end every benchmark job
                clock = True
                break
            rounds_out = done == work.rounds
    except _TooMany:  # a knapsack front grew past its cap: keep the bound so far
        pass
    # first-fit plans: a fallback should the integer solve stop before it finds a plan
    plans = [_one_type_boards(prob)]
    plans += [_first_fit(prob, s, by_length) for s in range(len(prob.sizes)) for by_length in (False, True)]
    m = _model(prob, rips, slots)
    x, proven, ip_clock = _ip(m, work, clock_end - time.monotonic())
    clock = clock or ip_clock
    if x is not None:
        plans.append(_decode(prob, m, x))

    def plan_cost(plan: _Plan) -> float:
        return sum(prob.cost[s] for s, _ in plan)

    # least board feet; on a tie the solver's plan (last), then fewer boards
    plan = min(reversed(plans), key=lambda p: (round(plan_cost(p), 9), len(p)))
    cost = plan_cost(plan)
    # proven least: the plan meets the bound, or the model held every pattern and HiGHS proved it
    optimal = cost <= bound * (1 + 1e-9) + 1e-9 or (
        complete and converged and proven and x is not None and cost <= plan_cost(plans[-1]))
    return _Outcome(plan, bound, optimal, complete, converged, clock, work, rounds_out or clock or not proven)


# -------------------------------------------------------------------------- placing


def _place(prob: _Problem, plan: _Plan, pieces: list[Piece]) -> list[tuple[int, list[list[Piece]]]]:
    """Give each pattern slot an actual piece; drop surplus slots, empty rips and boards."""
    queues = [list(t.members) for t in prob.types]
    for q in queues:
        q.reverse()
    boards = []
    for s, rips in sorted(plan, key=lambda b: -prob.cost[b[0]]):
        filled = []
        for rip in rips:
            got = []
            for t, a in enumerate(rip):
                for _ in range(a):
                    if queues[t]:
                        got.append(pieces[queues[t].pop()])
            if got:
                filled.append(got)
        if filled:
            boards.append((s, filled))
    if any(queues):
        raise RuntimeError("cutting plan left pieces out")  # cannot happen: demand rows are ≥
    return boards


def _fits(size: BoardSize, rips: list[list[Piece]], kerf: float) -> bool:
    across = sum(max(p.width for p in r) for r in rips) + kerf * (len(rips) - 1)
    along = max(sum(p.length for p in r) + kerf * (len(r) - 1) for r in rips)
    return across <= size.width + EPS and along <= size.length + EPS


def _draw(sizes: list[BoardSize], boards: list[tuple[int, list[list[Piece]]]], kerf: float) -> list[Board]:
    out = []
    for s, rips in boards:
        # a board emptied of surplus pieces may now fit a smaller size
        s = min((i for i, z in enumerate(sizes) if _fits(z, rips, kerf)),
                key=lambda i: (sizes[i].board_feet, i != s))
        laid = []
        across = 0.0
        for r in sorted(rips, key=lambda r: -max(p.width for p in r)):
            along = 0.0
            cuts = []
            for p in sorted(r, key=lambda p: -p.length):
                cuts.append(Cut(p, along))
                along += p.length + kerf
            width = max(p.width for p in r)
            laid.append(Rip(across, width, tuple(cuts)))
            across += width + kerf
        out.append((s, laid))
    out.sort(key=lambda b: (-sizes[b[0]].width, -sizes[b[0]].length,
                            min((c.piece.stave, c.piece.segment) for r in b[1] for c in r.cuts)))
    return [Board(f"B{i + 1}", sizes[s], tuple(rips)) for i, (s, rips) in enumerate(out)]


# ---------------------------------------------------------------------------- the entry


def _problem_key(prob: _Problem, pattern_limit: int) -> tuple:
    """What a solve depends on besides its work limits: the types (sizes on a grid of :data:`SAME_PROBLEM` mm,
    and how many of each), the board sizes, the gap between pieces and the patterns enumerated."""
    grid = lambda mm: round(mm / SAME_PROBLEM)  # noqa: E731
    return (tuple((grid(t.length), grid(t.width), t.demand) for t in prob.types),
            tuple((s.width, s.length, s.board_feet) for s in prob.sizes), prob.kerf, pattern_limit)


def _reusable(out: _Outcome, work: Work) -> bool:
    """Whether ``out`` is what a solve within ``work`` would give: solved within the same limits, or within
    limits no higher that ended none of its stages (HiGHS and the column generation are deterministic, and a
    limit that is never reached does not change their path)."""
    if out.work == work:
        return True
    return not out.limited and work.rounds >= out.work.rounds and work.nodes >= out.work.nodes


def order_lumber(pieces: list[Piece] | tuple[Piece, ...], stock: Stock, *, units: str = "mm",
                 work: Work = WORK, pattern_limit: int = PATTERN_CAP, solved: dict | None = None) -> LumberOrder:
    """The boards to cut ``pieces`` from, least board feet first, and the order to place.

    ``units`` ("mm" or "in") is for error messages only. ``work`` bounds the solve by
    counts (the answer depends on the input only); past them the best plan found is
    returned with ``proven_optimal`` false. ``pattern_limit`` caps the patterns enumerated
    per board length or width (0: generate them all). Pieces are ``stock.gap`` apart (the
    kerf, or the router bit). Raises :class:`InputError` for a piece longer (key
    ``stock.lengths``) or wider (``stock.widths``) than every board.

    ``solved``, if given, remembers each cutting problem's solution for one caller's calls (one layout):
    pieces that are the same to :data:`SAME_PROBLEM` mm (a segment measured on the stave plan and again when
    cut, the two differing by roundoff) are solved once, and a solve that reached none of its work limits also
    answers a call with higher limits (the scarf aiming's light solves, then its full ones). The answer depends
    on the caller's input alone.
    """
    pieces = list(pieces)
    _check(pieces, stock, units)
    sizes = _sizes(stock)
    stave_volume = float(sum(p.volume for p in pieces))
    if not pieces:
        return LumberOrder((), (), (), stock.waste, 0.0, 0.0, "none", True, True, gap=stock.gap)
    prob = _Problem(_group(pieces), sizes, stock.gap)
    key = _problem_key(prob, pattern_limit)
    out = next((o for o in solved.get(key, ()) if _reusable(o, work)), None) if solved is not None else None
    if out is None:
        out = _solve(prob, work, pattern_limit)
        if solved is not None:
            solved.setdefault(key, []).append(out)
    notes = [] if out.optimal else [
        "the solve stopped at its work limit before the plan was proven least; compare its board feet with the "
        "lower bound"
    ]
    if out.stopped_by_clock:
        notes.append(CLOCK_NOTE)
    boards = _draw(sizes, _place(prob, out.plan, pieces), stock.gap)
    return _order_of(boards, sizes, stock, stave_volume, lower_bound_board_feet=out.bound,
                     method="enumerated patterns" if out.complete else "column generation",
                     proven_optimal=out.optimal, bound_is_lp=out.converged or out.complete, notes=tuple(notes),
                     stopped_by_clock=out.stopped_by_clock)


def _order_of(boards: list[Board], sizes: list[BoardSize], stock: Stock, stave_volume: float,
              spares: tuple[SizeCount, ...] | None = None, **figures) -> LumberOrder:
    """The order of ``boards``: the boards used, and to buy them with the waste allowance (or ``spares``, an
    order to buy that already holds every board used and the allowance, if it buys fewer board feet)."""
    tally: dict[int, int] = defaultdict(int)
    index = {z: i for i, z in enumerate(sizes)}
    for b in boards:
        tally[index[b.size]] += 1
    used = tuple(SizeCount(sizes[i], n) for i, n in sorted(tally.items()))
    to_buy = add_waste(used, stock.waste)
    if spares is not None and sum(c.board_feet for c in spares) < sum(c.board_feet for c in to_buy):
        to_buy = spares
    return LumberOrder(boards=tuple(boards), used=used, to_buy=to_buy, waste=stock.waste,
                       stave_volume=stave_volume, gap=stock.gap, **figures)


def board_feet_rate(pieces: list[Piece] | tuple[Piece, ...], stock: Stock) -> float:
    """A quick estimate of the board feet ``pieces`` need, for ranking many piece sets cheaply.

    Each piece is charged the least board feet per piece of any one board size cut into
    rips of that piece alone (as many along a rip and as many rips across as fit, one gap
    apart), counted as a fraction of a board. Additive over pieces, no solver; it sees how
    lengths fit board lengths and widths fit board widths, not pieces of different sizes
    sharing a rip. ``inf`` if a piece fits no board.
    """
    g = stock.gap
    sizes = _sizes(stock)
    total = 0.0
    for p in pieces:
        best = math.inf
        for z in sizes:
            along = int((z.length + g + EPS) // (p.length + g))
            across = int((z.width + g + EPS) // (p.width + g))
            if along and across:
                best = min(best, z.board_feet / (along * across))
        total += best
    return total


def relabel(order: LumberOrder, label: dict[str, str]) -> LumberOrder:
    """The same order with each piece's label mapped through ``label`` (labels not in it kept)."""
    def cut(c: Cut) -> Cut:
        return Cut(replace(c.piece, label=label.get(c.piece.label, c.piece.label)), c.offset)

    boards = tuple(Board(b.id, b.size, tuple(Rip(r.offset, r.width, tuple(cut(c) for c in r.cuts)) for r in b.rips))
                   for b in order.boards)
    return replace(order, boards=boards)


def side_by_side(orders: list[LumberOrder], stock: Stock, lower_bound: float, bound_is_lp: bool) -> LumberOrder:
    """One order holding every board of ``orders`` as each cuts it, renumbered B1, B2, ...

    For pieces ordered apart and then together: when cutting them apart is no worse, this
    is the plan. It buys what the orders buy between them (each with its own spares), or
    the boards used with the waste allowance on their sum, whichever is less. ``lower_bound``
    must be a bound for all the pieces together (the bound of the order made for them
    together); the plan is proven least when it meets it.
    """
    sizes = _sizes(stock)
    boards = [b for order in orders for b in order.boards]
    boards.sort(key=lambda b: (-b.size.width, -b.size.length))
    boards = [Board(f"B{i + 1}", b.size, b.rips) for i, b in enumerate(boards)]
    cost = sum(b.size.board_feet for b in boards)
    bought: dict[BoardSize, int] = defaultdict(int)  # each order's boards to buy, spares and all
    for order in orders:
        for c in order.to_buy:
            bought[c.size] += c.count
    spares = tuple(SizeCount(z, bought[z]) for z in sizes if bought.get(z))
    return _order_of(boards, sizes, stock, sum(o.stave_volume for o in orders), spares=spares,
                     lower_bound_board_feet=lower_bound,
                     method="each order kept apart", proven_optimal=cost <= lower_bound * (1 + 1e-9) + 1e-9,
                     bound_is_lp=bound_is_lp, notes=tuple(dict.fromkeys(n for o in orders for n in o.notes)),
                     stopped_by_clock=any(o.stopped_by_clock for o in orders))
