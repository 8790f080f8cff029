"""Read a spar file (TOML) and validate it into a :class:`~stavegen.model.spar.Spar`.

Every problem becomes an :class:`~stavegen.errors.InputError` that names the
key with its table path (``hollow.plug[2].from``) and says what is wrong.
"""

from __future__ import annotations

import math
import re
import tomllib
from pathlib import Path
from typing import Any

from ..errors import InputError
from ..units import UnitError, parse_density, parse_force, parse_length, parse_stress
from .spar import (
    AUTO,
    DEFAULT_HEAD_LOAD,
    DEFAULT_STRENGTH_TARGET,
    JOINTS,
    MAX_STAVES,
    NOTCH_CUTS,
    MIN_STAVES,
    PAPERS,
    TAPERS,
    WALL_SOLVES,
    Hollow,
    Joint,
    OutputOptions,
    Plan,
    Plug,
    Profile,
    Spar,
    Stock,
)
from .woods import Wood, known_wood_keys, wood_table

POSITION_TOLERANCE = 0.5  # mm: a station this close to an end counts as at the end
_QUARTERS = re.compile(r"^\s*(\d+)\s*/\s*4\s*$")


class _Table:
    """One TOML table being read: hands out values by key and rejects leftovers."""

    def __init__(self, data: Any, path: str, units: str) -> None:
        if not isinstance(data, dict):
            raise InputError(f"expected a table, got {_kind(data)}", path)
        self.data = data
        self.path = path
        self.units = units
        self.used: set[str] = set()

    def key(self, name: str) -> str:
        return f"{self.path}.{name}" if self.path else name

    def has(self, name: str) -> bool:
        return name in self.data

    def raw(self, name: str, default: Any = ..., required: bool = False) -> Any:
        self.used.add(name)
        if name not in self.data:
            if required or default is ...:
                raise InputError("missing (required)", self.key(name))
            return default
        return self.data[name]

    def fail(self, name: str, problem: str) -> InputError:
        return InputError(problem, self.key(name))

    def length(self, name: str, default: Any = ..., minimum: float | None = 0.0, strict: bool = True) -> Any:
        value = self.raw(name, default)
        if name not in self.data:
            return value
        return _length(value, self.units, self.key(name), minimum, strict)

    def number(self, name: str, default: Any = ..., low: float | None = None, high: float | None = None,
               low_open: bool = False) -> Any:
        value = self.raw(name, default)
        if name not in self.data:
            return value
        return _number(value, self.key(name), low, high, low_open)

    def string(self, name: str, default: Any = ..., choices: tuple[str, ...] | None = None) -> Any:
        value = self.raw(name, default)
        if name not in self.data:
            return value
        if not isinstance(value, str):
            raise self.fail(name, f"expected a string, got {_kind(value)}")
        if choices is not None and value not in choices:
            raise self.fail(name, f"{value!r} is not one of {', '.join(choices)}")
        if not value.strip():
            raise self.fail(name, "must not be empty")
        return value

    def boolean(self, name: str, default: bool) -> bool:
        value = self.raw(name, default)
        if not isinstance(value, bool):
            raise self.fail(name, f"expected true or false, got {_kind(value)}")
        return value

    def sub(self, name: str, required: bool = False) -> "_Table | None":
        if name not in self.data:
            self.used.add(name)
            if required:
                raise InputError(f"missing table [{self.key(name)}]", self.key(name))
            return None
        return _Table(self.raw(name), self.key(name), self.units)

    def finish(self) -> None:
        extra = [k for k in self.data if k not in self.used]
        if extra:
            known = ", ".join(sorted(self.used))
            raise InputError(f"unknown key (known here: {known})", self.key(extra[0]))


def _kind(value: Any) -> str:
    if isinstance(value, bool):
        return str(value).lower()
    if isinstance(value, dict):
        return "a table"
    if isinstance(value, list):
        return "a list"
    return f"{type(value).__name__} {value!r}"


def _number(value: Any, key: str, low: float | None = None, high: float | None = None,
            low_open: bool = False) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise InputError(f"expected a number, got {_kind(value)}", key)
    value = float(value)
    if not math.isfinite(value):
        raise InputError(f"must be a finite number, got {value}", key)
    if low is not None and (value < low or (low_open and value == low)):
        raise InputError(f"must be {'greater than' if low_open else 'at least'} {low:g}, got {value:g}", key)
    if high is not None and value > high:
        raise InputError(f"must be at most {high:g}, got {value:g}", key)
    return value


def _length(value: Any, units: str, key: str, minimum: float | None = 0.0, strict: bool = True) -> float:
    """mm from a length; ``minimum`` bounds it below (``strict``: must exceed it)."""
    try:
        mm = parse_length(value, units)
    except UnitError as exc:
        raise InputError(str(exc), key) from None
    if minimum is not None and (mm < minimum or (strict and mm <= minimum)):
        word = "positive" if minimum == 0 and strict else f"at least {minimum:g} mm"
        raise InputError(f"must be {word}, got {value!r}", key)
    return mm


def _pairs(value: Any, key: str, what: str) -> list[Any]:
    if not isinstance(value, list) or not value:
        raise InputError(f"expected a list of [position, {what}] pairs, got {_kind(value)}", key)
    for i, pair in enumerate(value):
        if not isinstance(pair, list) or len(pair) != 2:
            raise InputError(f"expected [position, {what}], got {_kind(pair)}", f"{key}[{i + 1}]")
    return value


def _profile(value: Any, units: str, key: str, length: float, what: str, whole_length: bool) -> Profile:
    """A [position, value] list: positions increasing from the heel; values positive."""
    pairs = _pairs(value, key, what)
    zs: list[float] = []
    vs: list[float] = []
    for i, (pos, val) in enumerate(pairs):
        k = f"{key}[{i + 1}]"
        z = _length(pos, units, k, minimum=0.0, strict=False)
        if z > length + POSITION_TOLERANCE:
            raise InputError(f"position {pos!r} is past the spar's length", k)
        if zs and z <= zs[-1]:
            raise InputError(f"position {pos!r} is not after the one before it (stations must go heel to head)", k)
        zs.append(min(z, length))
        vs.append(_length(val, units, k))
    if whole_length:
        if zs[0] > POSITION_TOLERANCE:
            raise InputError("the first station must be at the heel (position 0)", f"{key}[1]")
        if zs[-1] < length - POSITION_TOLERANCE:
            raise InputError("the last station must be at the head (the spar's length)", f"{key}[{len(zs)}]")
        if len(zs) < 2:
            raise InputError("needs stations at the heel and at the head", key)
        zs[0], zs[-1] = 0.0, length
    elif len(zs) == 1:
        return Profile.constant(vs[0], length)
    else:
        if zs[0] > POSITION_TOLERANCE or zs[-1] < length - POSITION_TOLERANCE:
            raise InputError("stations must run from the heel (0) to the head (the spar's length)", key)
        zs[0], zs[-1] = 0.0, length
    return Profile(tuple(zs), tuple(vs))


def _wood(value: Any, units: str, key: str) -> Wood:
    table = wood_table()
    if isinstance(value, str):
        if value not in table:
            raise InputError(f"unknown wood {value!r}; known: {', '.join(known_wood_keys())}, "
                             "or a table with name, moe, mor, density", key)
        return table[value]
    if isinstance(value, dict):
        t = _Table(value, key, units)
        name = t.string("name")
        try:
            moe = parse_stress(t.raw("moe"), units)
            mor = parse_stress(t.raw("mor"), units)
        except UnitError as exc:
            raise InputError(str(exc), key) from None
        try:
            density = parse_density(t.raw("density"), units)
        except UnitError as exc:
            raise InputError(str(exc), t.key("density")) from None
        source = t.string("source", "defined in the spar file")
        t.finish()
        for label, v in (("moe", moe), ("mor", mor), ("density", density)):
            if v <= 0:
                raise InputError("must be positive", t.key(label))
        if not 1000 <= moe <= 40000:
            raise InputError(f"modulus {moe:.0f} MPa is outside the range of woods (1,000 to 40,000 MPa); "
                             "psi for inch files, MPa for mm files, or write the unit", t.key("moe"))
        if not 100 <= density <= 1400:
            raise InputError(f"density {density:.0f} kg/m³ is outside the range of woods", t.key("density"))
        if mor >= moe:
            raise InputError("modulus of rupture must be far below the modulus of elasticity", t.key("mor"))
        return Wood(key=re.sub(r"[^a-z0-9]+", "-", name.lower()).strip("-"), name=name, moe=moe, mor=mor,
                    density=density, source=source)
    raise InputError(f"expected a wood name or a table, got {_kind(value)}", key)


def _joint(t: _Table, units: str) -> Joint:
    kind = t.string("joint", "birdsmouth-flush", JOINTS)
    notch = t.sub("notch")
    if kind != "birdsmouth-custom":
        if notch is not None:
            raise t.fail("notch", f"a [hollow.notch] table is for joint = \"birdsmouth-custom\", not {kind!r}")
        return Joint(kind)
    if notch is None:
        raise t.fail("notch", "joint \"birdsmouth-custom\" needs a [hollow.notch] table with depth and apex_height"
                              " (or apex_fraction)")
    depth = notch.length("depth")
    height = notch.length("apex_height", None)
    fraction = notch.number("apex_fraction", None, low=0.0, high=1.0, low_open=True)
    notch.finish()
    if (height is None) == (fraction is None):
        raise notch.fail("apex_height", "give exactly one of apex_height (a length) and apex_fraction (0 to 1)")
    if fraction is not None and fraction >= 1.0:
        raise notch.fail("apex_fraction", "must be below 1: the apex lies inside the stave")
    return Joint(kind, depth=depth, apex_height=height, apex_fraction=fraction)


def _plugs(value: Any, units: str, length: float, default_wood: Wood) -> tuple[Plug, ...]:
    if not isinstance(value, list):
        raise InputError("expected [[hollow.plug]] tables", "hollow.plug")
    plugs = []
    for i, item in enumerate(value):
        t = _Table(item, f"hollow.plug[{i + 1}]", units)
        start = t.length("from", minimum=0.0, strict=False)
        end = t.length("to", minimum=0.0, strict=False)
        wood = _wood(t.raw("wood"), units, t.key("wood")) if t.has("wood") else default_wood
        t.used.add("wood")
        t.finish()
        if end > length + POSITION_TOLERANCE:
            raise t.fail("to", "is past the spar's length")
        if end <= start:
            raise t.fail("to", "must be after from")
        plugs.append(Plug(start, min(end, length), wood))
    plugs.sort(key=lambda p: p.start)
    for a, b in zip(plugs, plugs[1:]):
        if b.start < a.end:
            raise InputError("plugs overlap; join them into one", "hollow.plug")
    return tuple(plugs)


def _wall(value: Any, units: str, length: float) -> Profile | str:
    """A wall thickness, a [position, thickness] schedule, or one of :data:`WALL_SOLVES` to be solved."""
    if value in WALL_SOLVES:
        return value
    if isinstance(value, str) and value.strip().lower().startswith("auto"):
        raise InputError(f"{value!r} is not a wall; give a thickness, [[position, thickness], ...], "
                         f"or one of {', '.join(repr(v) for v in WALL_SOLVES)}", "hollow.wall")
    if isinstance(value, list):
        return _profile(value, units, "hollow.wall", length, "thickness", whole_length=False)
    return Profile.constant(_length(value, units, "hollow.wall"), length)


def _hollow(t: _Table, units: str, length: float, plan: Plan) -> Hollow:
    imperial = units == "in"
    wood = _wood(t.raw("wood"), units, t.key("wood"))
    staves = t.raw("staves")
    if staves != AUTO:
        if isinstance(staves, bool) or not isinstance(staves, int):
            raise t.fail("staves", f"expected a whole number of staves or \"auto\", got {_kind(staves)}")
        if not MIN_STAVES <= staves <= MAX_STAVES:
            raise t.fail("staves", f"must be from {MIN_STAVES} to {MAX_STAVES}, got {staves}")
    joint = _joint(t, units)
    wall = _wall(t.raw("wall"), units, length)
    if t.has("stations") and t.raw("stations") == AUTO:
        diameter, given = AUTO, False
    elif t.has("stations") and isinstance(t.raw("stations"), str):
        raise t.fail("stations", f"expected [[position, diameter], ...] or \"auto\", got {t.raw('stations')!r}")
    elif t.has("stations"):
        diameter = _profile(t.raw("stations"), units, t.key("stations"), length, "diameter", whole_length=True)
        given = True
    else:
        t.used.add("stations")
        diameter, given = plan.diameter, False
    plugs = _plugs(t.raw("plug", []), units, length, wood)
    hollow = Hollow(
        wood=wood,
        staves=staves,
        joint=joint,
        wall=wall,
        diameter=diameter,
        diameter_given=given,
        lamination_factor=t.number("lamination_factor", 1.0, low=0.0, high=2.0, low_open=True),
        margin=t.number("margin", 0.0, low=0.0, high=5.0),
        min_strength_ratio=t.number("min_strength_ratio", DEFAULT_STRENGTH_TARGET, low=0.0, high=10.0,
                                    low_open=True),
        strength_target_given=t.has("min_strength_ratio"),
        min_corner_wall=t.length("min_corner_wall", None),
        planing_allowance=t.length("planing_allowance", 1.5875 if imperial else 1.5, strict=False),
        end_allowance=t.length("end_allowance", 76.2 if imperial else 75.0, strict=False),
        taper=t.string("taper", "square-edge", TAPERS),
        notch_cut=t.string("notch_cut", "thickest-wall", NOTCH_CUTS),
        plugs=plugs,
    )
    t.finish()
    if isinstance(wall, Profile) and isinstance(diameter, Profile):
        for z, thick in zip(wall.z, wall.value):
            radius = float(diameter.at(z)) / 2
            if thick >= radius:
                raise InputError(f"wall {thick:.1f} mm is as thick as the spar's radius ({radius:.1f} mm) at "
                                 f"{z:.0f} mm from the heel: there is no bore", "hollow.wall")
    if joint.kind == "birdsmouth-custom" and joint.apex_height is not None and isinstance(wall, Profile):
        if joint.apex_height >= wall.smallest:
            raise InputError("apex_height must be less than the wall thickness", "hollow.notch.apex_height")
    return hollow


def _thickness_quarters(value: Any, units: str, key: str) -> float:
    """Nominal thickness: quarters of an inch ("5/4") in any file, or a length."""
    if isinstance(value, str) and _QUARTERS.match(value):
        quarters = int(_QUARTERS.match(value).group(1))
        if quarters <= 0:
            raise InputError("must be positive", key)
        return quarters * 25.4 / 4
    return _length(value, units, key)


def _lengths(value: Any, units: str, key: str) -> tuple[float, ...]:
    if not isinstance(value, list) or not value:
        raise InputError(f"expected a list of lengths, got {_kind(value)}", key)
    return tuple(_length(v, units, f"{key}[{i + 1}]") for i, v in enumerate(value))


def _stock(t: _Table, units: str, length: float, hollow: Hollow) -> Stock:
    imperial = units == "in"
    thickness = t.length("thickness")
    nominal = thickness
    if t.has("nominal_thickness"):
        nominal = _thickness_quarters(t.raw("nominal_thickness"), units, t.key("nominal_thickness"))
        if nominal < thickness - 1e-9:
            raise t.fail("nominal_thickness", "must not be less than the dressed thickness")
    widths = _lengths(t.raw("widths"), units, t.key("widths"))
    nominal_widths = widths
    if t.has("nominal_widths"):
        nominal_widths = _lengths(t.raw("nominal_widths"), units, t.key("nominal_widths"))
        if len(nominal_widths) != len(widths):
            raise t.fail("nominal_widths", "needs one nominal width for each width")
        for i, (n, w) in enumerate(zip(nominal_widths, widths)):
            if n < w - 1e-9:
                raise InputError("must not be less than the dressed width", f"{t.key('nominal_widths')}[{i + 1}]")
    lengths = _lengths(t.raw("lengths"), units, t.key("lengths"))
    no_scarf_raw = t.raw("no_scarf", [])
    ranges = []
    if no_scarf_raw:
        for i, pair in enumerate(_pairs(no_scarf_raw, t.key("no_scarf"), "position")):
            k = f"{t.key('no_scarf')}[{i + 1}]"
            a = _length(pair[0], units, k, minimum=0.0, strict=False)
            b = _length(pair[1], units, k, minimum=0.0, strict=False)
            if b <= a:
                raise InputError("the range must end after it starts", k)
            if a > length + POSITION_TOLERANCE:
                raise InputError("starts past the spar's length", k)
            ranges.append((a, min(b, length)))
    elif not isinstance(no_scarf_raw, list):
        raise t.fail("no_scarf", f"expected a list of [from, to] ranges, got {_kind(no_scarf_raw)}")
    stock = Stock(
        thickness=thickness,
        nominal_thickness=nominal,
        widths=widths,
        nominal_widths=nominal_widths,
        lengths=lengths,
        kerf=t.length("kerf", 3.175 if imperial else 3.0, strict=False),
        scarf_ratio=t.number("scarf_ratio", 8.0, low=1.0, high=50.0),
        scarf_stagger=t.length("scarf_stagger", 304.8 if imperial else 300.0, strict=False),
        no_scarf=tuple(sorted(ranges)),
        waste=t.number("waste", 0.10, low=0.0, high=0.9),
        edge_allowance=t.length("edge_allowance", 1.5875 if imperial else 1.5, strict=False),
    )
    t.finish()
    if isinstance(hollow.wall, Profile) and hollow.wall.largest > thickness + 1e-9:
        raise InputError(f"boards {thickness:.1f} mm thick are thinner than the wall "
                         f"({hollow.wall.largest:.1f} mm)", "stock.thickness")
    return stock


def _output(t: _Table | None, units: str, length: float) -> OutputOptions:
    if t is None:
        return OutputOptions(mark_spacing=304.8 if units == "in" else 250.0)
    options = OutputOptions(
        paper=t.string("paper", "letter" if units == "in" else "a4", PAPERS),
        mark_spacing=t.length("mark_spacing", 304.8 if units == "in" else 250.0),
        templates_on_boards=t.boolean("templates_on_boards", False),
    )
    t.finish()
    if length / options.mark_spacing > 20000:
        raise t.fail("mark_spacing", "is so small that the spar would carry over 20,000 station marks")
    return options


def parse_spar(data: dict[str, Any], source: str = "") -> Spar:
    """A validated :class:`Spar` from parsed TOML; raises InputError naming the key."""
    try:
        top = _Table(data, "", "in")
        spar_t = top.sub("spar", required=True)
        units = spar_t.string("units", "in", ("in", "mm"))
        spar_t.units = units
        top.units = units
        name = spar_t.string("name")
        length = spar_t.length("length")
        head_load = DEFAULT_HEAD_LOAD
        if spar_t.has("head_load"):
            try:
                head_load = parse_force(spar_t.raw("head_load"), units)
            except UnitError as exc:
                raise spar_t.fail("head_load", str(exc)) from None
            if not head_load > 0:
                raise spar_t.fail("head_load", f"must be a positive force, got {spar_t.raw('head_load')!r}")
        spar_t.used.add("head_load")
        spar_t.finish()
        plan_t = top.sub("plan", required=True)
        plan = Plan(
            wood=_wood(plan_t.raw("wood"), units, plan_t.key("wood")),
            diameter=_profile(plan_t.raw("stations"), units, plan_t.key("stations"), length, "diameter",
                              whole_length=True),
        )
        plan_t.finish()
        hollow = _hollow(top.sub("hollow", required=True), units, length, plan)
        stock_t = top.sub("stock")
        stock = None if stock_t is None else _stock(stock_t, units, length, hollow)
        output = _output(top.sub("output"), units, length)
        top.finish()
    except InputError as exc:
        raise exc.located(source)
    return Spar(name=name, units=units, length=length, plan=plan, hollow=hollow, stock=stock, output=output,
                source=source, head_load=head_load, head_load_given=spar_t.has("head_load"))


def load_spar(path: str | Path) -> Spar:
    """Read and validate the spar file at ``path``."""
    path = Path(path)
    source = str(path)
    try:
        raw = path.read_bytes()
    except FileNotFoundError:
        raise InputError("no such file", source=source) from None
    except IsADirectoryError:
        raise InputError("is a folder, not a spar file", source=source) from None
    except OSError as exc:
        raise InputError(f"cannot read: {exc.strerror}", source=source) from None
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise InputError(f"not UTF-8 text (byte {exc.start}); save the spar file as UTF-8", source=source) from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(f"TOML syntax error: {exc}", source=source) from None
    if not data:
        raise InputError("the file is empty (no tables); `stavegen init` writes a starter spar file", source=source)
    return parse_spar(data, source)

