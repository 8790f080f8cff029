"""Read a spar file (TOML) and validate it into a :class:`~stavegen.model.spar.Spar`.

Every problem becomes an :class:`~stavegen.errors.InputError` that names the
key with its table path (``hollow.plug[2].from``) and says what is wrong.
Tables are read through their declarations in :mod:`stavegen.model.schema`:
unknown keys anywhere in the file are reported first (with the nearest known
key), then the values, then their plausibility (:func:`_plausibility`).
"""

from __future__ import annotations

import contextvars
import difflib
import math
import os
import re
import stat
import tomllib
from pathlib import Path
from typing import Any

from ..errors import InputError, is_control, key_text, printable, shown
from ..errors import density as density_figure
from ..errors import length as length_figure
from ..errors import position as position_figure
from ..errors import stress as stress_figure
from ..units import (
    MM_PER_INCH,
    UnitError,
    format_length,
    parse_density,
    parse_force,
    parse_length,
    parse_stress,
)
from . import schema
from .spar import (
    AUTO,
    BOX_PIECES,
    REBATED_CORNERS,
    MAX_STAVES,
    MIN_STAVES,
    WALL_SOLVES,
    Hollow,
    Joint,
    Layer,
    OutputOptions,
    Parting,
    Plan,
    Plug,
    Profile,
    Spar,
    Stock,
    Strip,
)
from .materials import Laminate, known_laminate_keys, laminate_table
from .tubes import tube_table
from .woods import BASIS_WORDS, Wood, known_wood_keys, wood_table

_OWN: contextvars.ContextVar[dict[str, Any]] = contextvars.ContextVar("own_materials", default={})
"""The spar file's own ``[materials.NAME]`` while it is read: woods and laminates by name."""
POSITION_TOLERANCE = 0.5  # mm: a station this close to an end counts as at the end
LARGEST_FILE = 1 << 20  # bytes: a spar file is a few kilobytes; anything over a mebibyte is not one
_QUARTERS = re.compile(r"^\s*(\d{1,3})\s*/\s*4\s*$")

# Plausibility (common practice for wooden spars, no source): between two neighbouring stations a spar's
# diameter changes far less than this; more is a slipped digit or a wrong unit.
DIAMETER_JUMP_REFUSED = 2.5
DIAMETER_JUMP_WARNED = 1.8
HOLLOW_AGAINST_PLAN_WARNED = 1.5  # a given hollow diameter this many times the plan's (or under 1/this)
SLENDERNESS_WARNED = 8.0  # length over largest diameter: spars run 15 (a bowsprit) to 80 (a mast)
KERF_WARNED = MM_PER_INCH / 4  # wider than any ripping blade's kerf
KERF_REFUSED = MM_PER_INCH  # no saw cuts this wide
SHORTEST_BOARD = 12 * MM_PER_INCH  # boards are sold in feet; a "board" under a foot is a slip (8 for "8 ft")


class _Table:
    """One TOML table being read through its declaration in :mod:`schema`: values by key, defaults from there."""

    def __init__(self, data: Any, path: str, units: str, decl: schema.Table) -> None:
        if not isinstance(data, dict):
            raise InputError(f"expected a table, got {_kind(data)}", path)
        self.data = data
        self.path = path
        self.units = units
        self.decl = decl
        _check_names(data, path, decl)

    def key(self, name: str) -> str:
        return f"{self.path}.{key_text(name)}" if self.path else key_text(name)

    def has(self, name: str) -> bool:
        self.decl.get(name)
        return name in self.data

    def raw(self, name: str) -> Any:
        """The value as written, or the declared default as a file would write it (None when unset)."""
        decl = self.decl.get(name)
        if name in self.data:
            return self.data[name]
        if decl.required:
            raise InputError("missing (required)", self.key(name))
        return decl.default_for(self.units)

    def fail(self, name: str, problem: str) -> InputError:
        return InputError(problem, self.key(name))

    def get(self, name: str) -> Any:
        """The value read and checked by its declared kind; None for an optional key left unset."""
        decl = self.decl.get(name)
        value = self.raw(name)
        if value is None:
            return None
        return _READERS[decl.kind](value, decl, self.key(name), self.units)

    def fields(self) -> dict[str, Any]:
        """Every key declared with a ``field``, read: the keyword arguments of the model's dataclass."""
        return {k.field: self.get(k.name) for k in self.decl.keys if k.field}

    def sub(self, name: str) -> "_Table | None":
        decl = self.decl.get(name)
        if name not in self.data:
            if decl.required:
                raise InputError(f"missing table [{self.key(name)}]", self.key(name))
            return None
        return _Table(self.data[name], self.key(name), self.units, schema.TABLES[_decl_path(self.decl, name)])


def _decl_path(decl: schema.Table, name: str) -> str:
    return f"{decl.path}.{name}" if decl.path else name


def _check_names(data: dict, path: str, decl: schema.Table) -> None:
    """Refuse the first key ``decl`` does not declare, naming the nearest known key."""
    for name in data:
        if name in decl.names:
            continue
        where = f"{path}.{key_text(name)}" if path else key_text(name)
        near = difflib.get_close_matches(str(name).lower(), decl.names, n=1, cutoff=0.6)
        hint = f"; did you mean {near[0]}?" if near else ""
        raise InputError(f"unknown key{hint} (known here: {', '.join(sorted(decl.names))})", where)


def _check_all_names(data: Any, path: str, decl: schema.Table) -> None:
    """Check key names throughout the file before any value, so a misspelt key is reported as itself."""
    if not isinstance(data, dict):
        return
    _check_names(data, path, decl)
    for key in decl.keys:
        value = data.get(key.name)
        where = f"{path}.{key.name}" if path else key.name
        if key.kind == "table" and isinstance(value, dict):
            _check_all_names(value, where, schema.TABLES[_decl_path(decl, key.name)])
        elif key.kind == "tables" and isinstance(value, list):
            for i, item in enumerate(value):
                _check_all_names(item, f"{where}[{i + 1}]", schema.TABLES[_decl_path(decl, key.name)])
        elif key.kind == "wood" and isinstance(value, dict):
            _check_all_names(value, where, schema.WOOD)
        elif key.kind == "materials" and isinstance(value, dict):
            for name, item in value.items():
                if isinstance(item, dict):
                    _check_names(item, f"{where}.{key_text(name)}", schema.MATERIAL)


def _kind(value: Any) -> str:
    if isinstance(value, bool):
        return str(value).lower()
    if isinstance(value, dict):
        return "a table"
    if isinstance(value, list):
        return "a list"
    return f"{type(value).__name__} {shown(value)}"


def _number(value: Any, key: str, low: float | None = None, high: float | None = None,
            low_open: bool = False) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise InputError(f"expected a number, got {_kind(value)}", key)
    if isinstance(value, int) and abs(value) > 1e15:
        raise InputError(f"too large, got {shown(value)}", key)
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
        if minimum == 0:
            raise InputError(f"must be {'positive' if strict else 'zero or more'}, got {shown(value)}", key)
        raise InputError(f"must be at least {{least}}, got {shown(value)}", key, units=units,
                         figures={"least": length_figure(minimum)})
    return mm


def _text(value: Any, key: str, choices: tuple[str, ...] = (), longest: int | None = None) -> str:
    if not isinstance(value, str):
        raise InputError(f"expected a string, got {_kind(value)}", key)
    if choices and value not in choices:
        raise InputError(f"{shown(value)} is not one of {', '.join(choices)}", key)
    if not value.strip():
        raise InputError("must not be empty", key)
    bad = next((ch for ch in value if is_control(ch)), None)
    if bad is not None:
        raise InputError(f"holds a control character ({printable(bad)}) in {shown(value)}; write plain text", key)
    if longest is not None and len(value) > longest:
        raise InputError(f"is {len(value):,} characters long; keep it to {longest}", key)
    return value


def _quantity(parse):
    def read(value: Any, decl: schema.Key, key: str, units: str) -> float:
        try:
            number = parse(value, units)
        except UnitError as exc:
            raise InputError(str(exc), key) from None
        if number <= 0:
            raise InputError(f"must be positive, got {shown(value)}", key)
        return number
    return read


def _read_bool(value: Any, decl: schema.Key, key: str, units: str) -> bool:
    if not isinstance(value, bool):
        raise InputError(f"expected true or false, got {_kind(value)}", key)
    return value


_READERS = {
    "length": lambda v, d, k, u: _length(v, u, k, 0.0, strict=not d.zero_ok),
    "number": lambda v, d, k, u: _number(v, k, d.low, d.high, d.low_open),
    "text": lambda v, d, k, u: _text(v, k, longest=d.longest),
    "choice": lambda v, d, k, u: _text(v, k, choices=d.choices),
    "bool": _read_bool,
    "force": _quantity(parse_force),
    "stress": _quantity(parse_stress),
    "density": _quantity(parse_density),
}
"""Readers of the kinds a key can be read by generically: (value, declaration, key path, units) -> value."""


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
            raise InputError(f"position {shown(pos)} is past the spar's length", k)
        if zs and z <= zs[-1]:
            raise InputError(f"position {shown(pos)} is not after the one before it (stations must go heel to head)",
                             k)
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


def _wood(value: Any, units: str, key: str, own: dict[str, Any] | None = None) -> Wood:
    table = wood_table()
    own = own if own is not None else _OWN.get()
    if isinstance(value, str) and value in own:
        if not isinstance(own[value], Wood):
            raise InputError(f"{shown(value)} is a laminate (strength_mpa); a wood takes mor_mpa", key)
        return own[value]
    if isinstance(value, str):
        if value not in table:
            near = difflib.get_close_matches(value.lower(), list(table), n=1, cutoff=0.6)
            hint = f"did you mean {near[0]}? " if near else ""
            raise InputError(f"unknown wood {shown(value)}; {hint}known: {', '.join(known_wood_keys())}, "
                             "or a table with name, moe, mor, density", key)
        return table[value]
    if isinstance(value, dict):
        t = _Table(value, key, units, schema.WOOD)
        name = t.get("name")
        moe, mor, density = t.get("moe"), t.get("mor"), t.get("density")
        source = t.get("source")
        if not 1000 <= moe <= 40000:
            raise InputError("modulus {moe} is outside the range of woods ({low} to {high}); psi for inch files, "
                             "MPa for mm files, or write the unit", t.key("moe"), units=units,
                             figures={"moe": stress_figure(moe), "low": stress_figure(1000),
                                      "high": stress_figure(40000)})
        if not 100 <= density <= 1400:
            raise InputError("density {density} is outside the range of woods ({low} to {high})", t.key("density"),
                             units=units, figures={"density": density_figure(density), "low": density_figure(100),
                                      "high": density_figure(1400)})
        if mor >= moe:
            raise InputError("modulus of rupture must be far below the modulus of elasticity", t.key("mor"))
        return Wood(key=re.sub(r"[^a-z0-9]+", "-", name.lower()).strip("-"), name=name, moe=moe, mor=mor,
                    density=density, source=source, compression_perp=t.get("compression_perp"))
    raise InputError(f"expected a wood name or a table, got {_kind(value)}", key)


def _own_materials(value: Any, units: str) -> dict[str, Wood | Laminate]:
    """The spar file's own ``[materials.NAME]``: a wood (with ``mor_mpa``) or a laminate (``strength_mpa``)."""
    if value is None:
        return {}
    if not isinstance(value, dict):
        raise InputError(f"expected [materials.NAME] tables, got {_kind(value)}", "materials")
    out: dict[str, Wood | Laminate] = {}
    for name, item in value.items():
        key = f"materials.{key_text(name)}"
        t = _Table(item, key, units, schema.MATERIAL)
        label = t.get("name") or str(name)
        moe, density = t.get("E_mpa"), t.get("density_kg_m3")
        mor, strength = t.get("mor_mpa"), t.get("strength_mpa")
        source = t.get("source")
        if (mor is None) == (strength is None):
            raise t.fail("strength_mpa", "give mor_mpa for a wood or strength_mpa for a laminate (one of them)")
        limit = mor if mor is not None else strength
        if limit >= moe:
            raise t.fail("mor_mpa" if mor is not None else "strength_mpa",
                         "must be far below the modulus E_mpa (both in MPa)")
        if mor is not None:
            if t.has("ply_thickness"):
                raise t.fail("ply_thickness", "is for a laminate (strength_mpa), not a wood (mor_mpa)")
            if not 1000 <= moe <= 40000:
                raise InputError("modulus {moe} is outside the range of woods ({low} to {high})", t.key("E_mpa"),
                                 units=units, figures={"moe": stress_figure(moe), "low": stress_figure(1000),
                                                       "high": stress_figure(40000)})
            if not 100 <= density <= 1400:
                raise InputError("density {density} is outside the range of woods ({low} to {high})",
                                 t.key("density_kg_m3"), units=units,
                                 figures={"density": density_figure(density), "low": density_figure(100),
                                          "high": density_figure(1400)})
            out[str(name)] = Wood(key=str(name), name=label, moe=moe, mor=mor, density=density, source=source)
        else:
            out[str(name)] = Laminate(key=str(name), name=label, moe=moe, strength=strength, density=density,
                                      ply_thickness=t.get("ply_thickness"), source=source, kind="own")
    return out


def _laminate(value: Any, key: str, own: dict[str, Any]) -> Laminate:
    """A laminate by name: the file's own ``[materials.NAME]`` first, then the built-in ones."""
    table = laminate_table()
    if not isinstance(value, str):
        raise InputError(f"expected the name of a laminate, got {_kind(value)}", key)
    if value in own:
        found = own[value]
        if not isinstance(found, Laminate):
            raise InputError(f"{shown(value)} is a wood (mor_mpa); a layer or strip takes a laminate "
                             "(strength_mpa)", key)
        return found
    if value in table:
        return table[value]
    names = list(own) + known_laminate_keys()
    near = difflib.get_close_matches(value.lower(), names, n=1, cutoff=0.6)
    hint = f"did you mean {near[0]}? " if near else ""
    raise InputError(f"unknown laminate {shown(value)}; {hint}known: {', '.join(names)}, or a [materials.NAME] "
                     "table with E_mpa, strength_mpa, density_kg_m3, ply_thickness", key)


def _span(t: "_Table", length: float) -> tuple[float | None, float | None]:
    start = t.get("from") if t.has("from") else None
    end = t.get("to") if t.has("to") else None
    if end is not None and end > length + POSITION_TOLERANCE:
        raise t.fail("to", "is past the spar's length")
    if start is not None and start >= length - POSITION_TOLERANCE:
        raise t.fail("from", "is at or past the head")
    if start is not None and end is not None and end <= start:
        raise t.fail("to", "must be after from")
    return start, (min(end, length) if end is not None else None)


def _thickness(t: "_Table", material: Laminate) -> tuple[float, int | None]:
    """(thickness mm, plies) from ``plies`` or ``thickness``: exactly one, plies needing a ply thickness."""
    plies, thickness = t.get("plies") if t.has("plies") else None, t.get("thickness") if t.has("thickness") else None
    if plies is not None and thickness is not None:
        raise t.fail("thickness", "give plies or thickness, not both")
    if thickness is not None:
        return thickness, None
    plies = 1 if plies is None else plies
    if plies != int(plies):
        raise t.fail("plies", f"must be a whole number of plies, got {plies:g}")
    if material.ply_thickness is None:
        raise t.fail("plies", f"{shown(material.key)} has no ply_thickness; give thickness instead")
    return int(plies) * material.ply_thickness, int(plies)


def _layers(value: Any, units: str, length: float, own: dict[str, Any]) -> tuple[Layer, ...]:
    if value is None:
        return ()
    if not isinstance(value, list):
        raise InputError("expected [[hollow.layer]] tables", "hollow.layer")
    out = []
    for i, item in enumerate(value):
        t = _Table(item, f"hollow.layer[{i + 1}]", units, schema.LAYER)
        material = _laminate(t.raw("material"), t.key("material"), own)
        thickness, plies = _thickness(t, material)
        start, end = _span(t, length)
        out.append(Layer(material=material, thickness=thickness, plies=plies, start=start, end=end))
    return tuple(out)


def _strips(value: Any, units: str, length: float, own: dict[str, Any]) -> tuple[Strip, ...]:
    if value is None:
        return ()
    if not isinstance(value, list):
        raise InputError("expected [[hollow.strip]] tables", "hollow.strip")
    out = []
    for i, item in enumerate(value):
        t = _Table(item, f"hollow.strip[{i + 1}]", units, schema.STRIP)
        material = _laminate(t.raw("material"), t.key("material"), own)
        thickness, plies = _thickness(t, material)
        start, end = _span(t, length)
        out.append(Strip(material=material, width=t.get("width"), thickness=thickness, plies=plies,
                         place=t.get("place"), start=start, end=end))
    return tuple(out)


def _joint(t: _Table) -> Joint:
    kind = t.get("joint")
    notch = t.sub("notch")
    if kind != "birdsmouth-custom":
        if notch is not None:
            raise t.fail("notch", f"a [hollow.notch] table is for joint = \"birdsmouth-custom\", not {shown(kind)}")
        return Joint(kind)
    if notch is None:
        raise t.fail("notch", "joint \"birdsmouth-custom\" needs a [hollow.notch] table with depth and apex_height"
                              " (or apex_fraction)")
    depth = notch.get("depth")
    height = notch.get("apex_height")
    fraction = notch.get("apex_fraction")
    if (height is None) == (fraction is None):
        raise notch.fail("apex_height", "give exactly one of apex_height (a length) and apex_fraction (0 to 1)")
    if fraction is not None and fraction >= 1.0:
        raise notch.fail("apex_fraction", "must be below 1: the apex lies inside the stave")
    return Joint(kind, depth=depth, apex_height=height, apex_fraction=fraction)


def _plugs(value: Any, units: str, length: float, default_wood: Wood) -> tuple[Plug, ...]:
    if value is None:
        return ()
    if not isinstance(value, list):
        raise InputError("expected [[hollow.plug]] tables", "hollow.plug")
    plugs = []
    for i, item in enumerate(value):
        t = _Table(item, f"hollow.plug[{i + 1}]", units, schema.PLUG)
        start = t.get("from")
        end = t.get("to")
        wood = _wood(t.raw("wood"), units, t.key("wood")) if t.has("wood") else default_wood
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
        raise InputError(f"{shown(value)} is not a wall; give a thickness, [[position, thickness], ...], "
                         f"or one of {', '.join(repr(v) for v in WALL_SOLVES)}", "hollow.wall")
    if isinstance(value, list):
        return _profile(value, units, "hollow.wall", length, "thickness", whole_length=False)
    return Profile.constant(_length(value, units, "hollow.wall"), length)


def _staves(t: _Table) -> int | str:
    staves = t.raw("staves")
    box = t.raw("joint") == "box"
    if staves is None:
        if not box:
            raise InputError("missing (required)", t.key("staves"))
        return BOX_PIECES
    if box and staves != BOX_PIECES:
        raise t.fail("staves", f"a box spar is built of {BOX_PIECES} pieces (two faces and two sides), not "
                               f"{shown(staves)}: leave staves out or give {BOX_PIECES}")
    if staves != AUTO:
        if isinstance(staves, bool) or not isinstance(staves, int):
            raise t.fail("staves", f"expected a whole number of staves or \"auto\", got {_kind(staves)}")
        if not MIN_STAVES <= staves <= MAX_STAVES:
            raise t.fail("staves", f"must be from {MIN_STAVES} to {MAX_STAVES}, got {shown(staves)}")
    return staves


def _plan(t: _Table, units: str, length: float) -> Plan:
    """The plan's wood, shape and stations (diameters, or two dimensions for an oval or a rectangle)."""
    wood = _wood(t.raw("wood"), units, t.key("wood"))
    shape = t.get("shape")
    corner = t.get("corner_radius")
    if shape == "round":
        diameter, athwartships = _diameters(t.raw("stations"), units, t.key("stations"), length, shape), None
    else:
        diameter, athwartships = _dimensions(t.raw("stations"), units, t.key("stations"), length)
    if corner > 0:
        if shape != "rectangle":
            raise t.fail("corner_radius", f'rounds a rectangle\'s corners; the plan is {shape} (shape = "rectangle")')
        least = min(min(diameter.value), min(athwartships.value))
        if corner >= least / 2:
            raise InputError("corner radius {corner} is not less than half the smallest dimension ({least})",
                             t.key("corner_radius"), units=units,
                             figures={"corner": length_figure(corner), "least": length_figure(least)})
    return Plan(wood=wood, diameter=diameter, shape=shape, athwartships=athwartships, corner_radius=corner)


def _dimensions(value: Any, units: str, key: str, length: float) -> tuple[Profile, Profile]:
    """Fore-and-aft and athwartships profiles from ``[position, fore_aft, athwartships]`` triples."""
    if not isinstance(value, list) or not value:
        raise InputError(f"expected a list of [position, fore_aft, athwartships] triples, got {_kind(value)}", key)
    for i, triple in enumerate(value):
        if not isinstance(triple, list) or len(triple) != 3:
            raise InputError(f"expected [position, fore_aft, athwartships] for a shape that is not round, "
                             f"got {_kind(triple)}", f"{key}[{i + 1}]")
    fore_aft = _diameters([[p, f] for p, f, _ in value], units, key, length)
    athwartships = _diameters([[p, a] for p, _, a in value], units, key, length)
    return fore_aft, athwartships


def _hollow(t: _Table, units: str, length: float, plan: Plan) -> Hollow:
    wood = _wood(t.raw("wood"), units, t.key("wood"))
    staves = _staves(t)
    joint = _joint(t)
    wall = _wall(t.raw("wall"), units, length)
    if t.has("shape"):
        shape = t.get("shape")
    elif plan.shape in schema.HOLLOW_SHAPES:
        shape = plan.shape
    else:
        raise t.fail("shape", f"missing: the plan is a {plan.shape}, and stavegen builds hollow spars round or oval; "
                              'say which (shape = "oval" or "round") and give the stations')
    athwartships = None
    if t.has("stations") and t.raw("stations") == AUTO:
        diameter, given = AUTO, False
        athwartships = AUTO if shape != "round" else None
        if (shape == "round") != (plan.shape == "round"):
            raise t.fail("stations", f'"auto" scales the plan\'s dimensions, but the plan is {plan.shape} and the '
                                     f"hollow spar {shape}: give the hollow spar's stations")
    elif t.has("stations") and isinstance(t.raw("stations"), str):
        raise t.fail("stations", f"expected [[position, diameter], ...] or \"auto\", got {shown(t.raw('stations'))}")
    elif t.has("stations") and shape != "round":
        diameter, athwartships = _dimensions(t.raw("stations"), units, t.key("stations"), length)
        given = True
    elif t.has("stations"):
        diameter = _diameters(t.raw("stations"), units, t.key("stations"), length, shape)
        given = True
    elif (shape == "round") != (plan.shape == "round"):
        raise t.fail("stations", f"missing: a {shape} hollow spar of a {plan.shape} plan needs its own stations")
    else:
        diameter, athwartships, given = plan.diameter, plan.athwartships, False
    if (shape == "rectangle") != joint.is_box:
        if joint.is_box:
            raise t.fail("shape", f'joint = "box" builds a rectangle (shape = "rectangle"), not {shape}')
        raise t.fail("joint", f'a rectangular hollow spar is built as a box (joint = "box"), not {joint.kind}')
    if not joint.is_box:
        for name, unused in (("corner", t.get("corner") == "sides-between-faces"),
                             ("rebate_depth", not t.has("rebate_depth")), ("corner_radius", t.get("corner_radius") == 0)):
            if not unused:  # written at its default it changes nothing, as every key's default
                raise t.fail(name, 'is for a box spar (shape = "rectangle", joint = "box")')
    if shape != "round" and not joint.is_box:
        if joint.kind not in ("birdsmouth-flush", "bevel", "birdsmouth-centered", "birdsmouth-custom"):
            raise t.fail("joint", f"an oval hollow spar is built with a birdsmouth or bevel joint, not {joint.kind}")
        if isinstance(staves, int) and staves % 2:
            raise t.fail("staves", f"an oval spar needs an even number of staves (not {staves}), so that its "
                                   "section is symmetric fore-and-aft and athwartships")
    plugs = _plugs(t.raw("plug"), units, length, wood)
    own = _OWN.get()
    layers = _layers(t.raw("layer"), units, length, own)
    strips = _strips(t.raw("strip"), units, length, own)
    hollow = Hollow(wood=wood, staves=staves, joint=joint, wall=wall, diameter=diameter, diameter_given=given,
                    plugs=plugs, strength_target_given=t.has("min_strength_ratio"), shape=shape,
                    athwartships=athwartships, layers=layers, strips=strips, **t.fields())
    if (layers or strips) and hollow.is_box:
        raise InputError("sheathing layers and reinforcing strips are counted on round and oval spars only (a box "
                         "not yet)", "hollow.layer" if layers else "hollow.strip")
    if layers and isinstance(diameter, Profile):
        for z, d in zip(diameter.z, diameter.value):
            sheath = hollow.sheath(z, length)
            if isinstance(athwartships, Profile):  # an oval: its smaller dimension
                d = min(d, float(athwartships.at(z)))
            if 2 * sheath >= d / 2:
                raise InputError("the layers, {sheath} thick, leave too little wood inside a {d} diameter at {z} "
                                 "from the heel", "hollow.layer", units=units,
                                 figures={"sheath": length_figure(sheath), "d": length_figure(d),
                                          "z": position_figure(z)})
    if isinstance(wall, Profile) and isinstance(diameter, Profile):
        for z, thick in zip(wall.z, wall.value):
            radius = float(diameter.at(z)) / 2 - hollow.sheath(z, length)
            if isinstance(athwartships, Profile):
                radius = min(radius, float(athwartships.at(z)) / 2 - hollow.sheath(z, length))
            if thick >= radius:
                raise InputError("wall {wall} is as thick as the spar's radius ({radius}) at {z} from the heel: "
                                 "there is no bore", "hollow.wall", units=units,
                                 figures={"wall": length_figure(thick), "radius": length_figure(radius),
                                          "z": position_figure(z)})
    if joint.is_box:
        _box_checks(t, hollow, units)
    if joint.kind == "birdsmouth-custom" and joint.apex_height is not None and isinstance(wall, Profile):
        if joint.apex_height >= wall.smallest:
            raise InputError("apex_height must be less than the wall thickness", "hollow.notch.apex_height")
    return hollow


def _box_checks(t: _Table, hollow: Hollow, units: str) -> None:
    """A box's rebate and corner rounding against its wall (when the wall is given): the rebate shallower than the
    wall, the rounding no larger than the finished wall (so it stays in the face's corner, clear of the bore and
    of the side)."""
    if hollow.notch_cut == "follow-wall":
        raise t.fail("notch_cut", 'is for a notch; a box\'s pieces are dressed to the thickest wall, its taper the '
                                  'bore\'s (leave notch_cut out)')
    wall = hollow.wall
    if not isinstance(wall, Profile):
        if hollow.corner in REBATED_CORNERS and hollow.rebate_depth is None:
            return
        least = None
    else:
        least = wall.smallest
    if hollow.corner not in REBATED_CORNERS and t.has("rebate_depth"):
        raise t.fail("rebate_depth", 'is for corner = "rebated" or "pinwheel"')
    if least is None:
        return
    if hollow.corner in REBATED_CORNERS and hollow.rebate_depth is not None and hollow.rebate_depth >= least:
        raise InputError("a rebate {depth} deep is not less than the wall ({wall}): the face would be cut through",
                         t.key("rebate_depth"), units=units,
                         figures={"depth": length_figure(hollow.rebate_depth), "wall": length_figure(least)})
    finished = least - hollow.planing_allowance
    if hollow.corner_radius > finished + 1e-9:
        raise InputError("corner radius {radius} is more than the finished wall ({finished}: the wall less the "
                         "planing allowance): the rounding would reach past the face's corner toward the bore",
                         t.key("corner_radius"), units=units,
                         figures={"radius": length_figure(hollow.corner_radius),
                                  "finished": length_figure(max(finished, 0.0))})


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


def _no_scarf(t: _Table, units: str, length: float) -> tuple[tuple[float, float], ...]:
    value = t.raw("no_scarf")
    if value is None or value == []:
        return ()
    if not isinstance(value, list):
        raise t.fail("no_scarf", f"expected a list of [from, to] ranges, got {_kind(value)}")
    ranges = []
    for i, pair in enumerate(_pairs(value, t.key("no_scarf"), "position")):
        k = f"{t.key('no_scarf')}[{i + 1}]"
        a = _length(pair[0], units, k, minimum=0.0, strict=False)
        b = _length(pair[1], units, k, minimum=0.0, strict=False)
        if b <= a:
            raise InputError("the range must end after it starts", k)
        if a > length + POSITION_TOLERANCE:
            raise InputError("starts past the spar's length", k)
        ranges.append((a, min(b, length)))
    return tuple(sorted(ranges))


def _stock(t: _Table, units: str, length: float, hollow: Hollow) -> Stock:
    thickness = t.get("thickness")
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
    no_scarf = _no_scarf(t, units, length)
    fields = t.fields()
    del fields["thickness"]
    if fields["separate_with"] == "router" and fields["router_bit"] is None:
        raise t.fail("router_bit", 'missing: separate_with = "router" needs the diameter of the bit that cuts the '
                                   "pieces out")
    if fields["separate_with"] == "saw" and fields["router_bit"] is not None:
        raise t.fail("router_bit", 'is for separate_with = "router"; the saw parts pieces by its kerf')
    stock = Stock(thickness=thickness, nominal_thickness=nominal, widths=widths, nominal_widths=nominal_widths,
                  lengths=lengths, no_scarf=no_scarf, **fields)
    if isinstance(hollow.wall, Profile) and hollow.wall.largest > thickness + 1e-9:
        raise InputError("boards {boards} thick are thinner than the wall ({wall})", "stock.thickness", units=units,
                         figures={"boards": length_figure(thickness), "wall": length_figure(hollow.wall.largest)})
    return stock


def _output(t: _Table | None, units: str, length: float) -> OutputOptions:
    t = t or _Table({}, "output", units, schema.OUTPUT)
    options = OutputOptions(**t.fields())
    if length / options.mark_spacing > 20000:
        raise t.fail("mark_spacing", "is so small that the spar would carry over 20,000 station marks")
    return options


def _parting(t: _Table, units: str, length: float, hollow: Hollow, hollow_key: str) -> Parting:
    """[parting]: where the spar comes apart and what joins it; what a kind does not use is refused."""
    if hollow.two_axis:
        shape = "box" if hollow.is_box else "oval"
        raise InputError(f"a two-piece {shape} spar is not built yet: its spigot and bore checks are for a round; "
                         f"build the {shape} in one piece, or the two-piece spar round", t.path)
    at = t.get("at")
    kind = t.get("kind")
    overlap, clearance = t.get("overlap"), t.get("clearance")
    wood = _wood(t.raw("wood"), units, t.key("wood")) if t.has("wood") else None
    material = t.get("material")
    outside, wall = t.get("outside_diameter"), t.get("wall")
    if at >= length - POSITION_TOLERANCE:
        raise InputError("{at} is not inside the spar ({length} long): give where the spar parts, from the heel",
                         t.key("at"), units=units, figures={"at": length_figure(at), "length": length_figure(length)})
    tube_words = 'is for kind = "tube-spigot" or "sleeve"; a wooden spigot is shaped to the bore'
    if kind == "wood-spigot":
        for name in ("material", "outside_diameter", "wall"):
            if t.has(name):
                raise t.fail(name, tube_words)
        wood = wood or hollow.wood
    else:
        if wood is not None:
            raise t.fail("wood", f'is for kind = "wood-spigot"; a {kind} is given by material, wall'
                                 + (" and outside_diameter" if kind == "tube-spigot" else ""))
        if material is None:
            raise t.fail("material", f'missing: kind = "{kind}" needs the tube\'s material '
                                     f"(one of {', '.join(tube_table())})")
        if wall is None:
            raise t.fail("wall", f'missing: kind = "{kind}" needs the tube\'s wall thickness')
        if kind == "tube-spigot":
            if outside is None:
                raise t.fail("outside_diameter", 'missing: kind = "tube-spigot" needs the tube\'s outside diameter')
            if 2 * wall >= outside:
                raise InputError("a wall of {wall} fills a tube {od} across: there is no bore", t.key("wall"),
                                 units=units, figures={"wall": length_figure(wall), "od": length_figure(outside)})
        elif outside is not None:
            raise t.fail("outside_diameter", "is for a tube spigot; a sleeve's bore is the spar's diameter plus "
                                             "the clearance")
    if overlap is not None and (at - overlap <= 0 or at + overlap >= length):
        raise InputError("an overlap of {overlap} each way from {at} runs past an end of the spar", t.key("overlap"),
                         units=units, figures={"overlap": length_figure(overlap), "at": position_figure(at)})
    if overlap is not None and kind != "sleeve":
        for i, plug in enumerate(hollow.plugs, start=1):
            if plug.start < at + overlap and plug.end > at - overlap:
                raise InputError("plug {i} fills the bore where the spigot goes ({lo} to {hi} from the heel); "
                                 "move the plug or the parting".replace("{i}", str(i)), f"hollow.plug[{i}]",
                                 units=units, figures={"lo": position_figure(at - overlap),
                                                       "hi": position_figure(at + overlap)})
    bearing = [(hollow.wood, f"{hollow_key}.wood")] + ([(wood, t.key("wood"))] if kind == "wood-spigot" else [])
    for bears, key in bearing:
        if bears.compression_perp is None:
            raise InputError(f"the parting's {kind} bears on {shown(bears.name)}, which gives no compression_perp "
                             "(compression perpendicular to grain): add it to the wood's table", key)
    return Parting(at=at, kind=kind, overlap=overlap, clearance=clearance, wood=wood if kind == "wood-spigot" else None,
                   material=tube_table()[material] if material else None, outside_diameter=outside, wall=wall)


def _jumps(profile: Profile, key: str, units: str):
    """(key of the station, factor, words) for each stretch of a diameter profile: how much it changes."""
    for i in range(1, len(profile.value)):
        a, b = profile.value[i - 1], profile.value[i]
        jump = max(a, b) / min(a, b)
        yield (f"{key}[{i + 1}]", jump, f"the diameter goes from {format_length(a, units)} at {key}[{i}] to "
                                        f"{format_length(b, units)} ({jump:.2f} times) in one stretch")


def _diameters(value: Any, units: str, key: str, length: float, shape: str = "round") -> Profile:
    """A diameter profile heel to head, refused where it jumps as no spar does (a slipped digit, a wrong unit)."""
    if shape == "round" and isinstance(value, list):
        for i, pair in enumerate(value):
            if isinstance(pair, list) and len(pair) == 3:
                raise InputError("expected [position, diameter] for a round spar; three figures at a station "
                                 "need shape = \"oval\" (or \"rectangle\" in the plan)", f"{key}[{i + 1}]")
    profile = _profile(value, units, key, length, "diameter", whole_length=True)
    for here, jump, said in _jumps(profile, key, units):
        if jump >= DIAMETER_JUMP_REFUSED:
            raise InputError(f"{said}: no spar tapers that fast; a slipped digit or a wrong unit?", here)
    return profile


def _plausibility(spar: Spar) -> tuple[str, ...]:
    """Refuse figures no spar could have (a slipped digit, a wrong unit); one warning line for unlikely ones."""
    notices: list[str] = []
    show = lambda mm: format_length(mm, spar.units)  # noqa: E731
    woods = [("plan.wood", spar.plan.wood), ("hollow.wood", spar.hollow.wood)]
    woods += [(f"hollow.plug[{i + 1}].wood", p.wood) for i, p in enumerate(spar.hollow.plugs)]
    bases = {w.basis for _, w in woods}
    if len(bases) > 1:
        said = "; ".join(f"{key} {w.name}: {BASIS_WORDS.get(w.basis, w.basis)}" for key, w in woods)
        notices.append(f"the woods' figures are of different kinds ({said}): a graded class's characteristic "
                       "strength is several times below a clear-wood mean, so the comparison is not like for "
                       "like; use figures of one kind.")
    profiles = [("plan.stations", spar.plan.diameter)]
    if spar.hollow.diameter_given and isinstance(spar.hollow.diameter, Profile):
        profiles.append(("hollow.stations", spar.hollow.diameter))
    for key, profile in profiles:
        for here, jump, said in _jumps(profile, key, spar.units):
            if jump >= DIAMETER_JUMP_WARNED:
                notices.append(f"{here}: {said}; spars rarely taper so fast: check the figures.")
    largest = spar.plan.diameter.largest
    if spar.length < SLENDERNESS_WARNED * largest:
        notices.append(f"spar.length: {show(spar.length)} is only {spar.length / largest:.1f} times the plan's "
                       f"largest diameter ({show(largest)}); spars are far more slender: check the units.")
    if spar.hollow.diameter_given and isinstance(spar.hollow.diameter, Profile):
        hollow = spar.hollow.diameter
        for i, (z, d) in enumerate(zip(hollow.z, hollow.value)):
            plan = float(spar.plan.diameter.at(z))
            if not 1 / HOLLOW_AGAINST_PLAN_WARNED <= d / plan <= HOLLOW_AGAINST_PLAN_WARNED:
                notices.append(f"hollow.stations[{i + 1}]: {show(d)} against the plan's {show(plan)} there "
                               f"({d / plan:.2f} times): check the figures.")
                break
    wall, plan_d = spar.hollow.wall, spar.plan.diameter
    if spar.hollow.diameter == AUTO and isinstance(wall, Profile):
        # The diameters grow from the plan's until a bore is left: a wall past the plan's radius makes them.
        if wall.largest >= plan_d.largest / 2:
            raise InputError(f"a wall of {show(wall.largest)} is as thick as the plan's largest radius "
                             f"({show(plan_d.largest / 2)}): with stations = \"auto\" the spar would grow past "
                             "anything in the plans to leave a bore; a slipped digit or a wrong unit?", "hollow.wall")
        for z in sorted(set(wall.z) | set(plan_d.z)):
            thick, radius = float(wall.at(z)), float(plan_d.at(z)) / 2
            if thick >= radius:
                notices.append(f"hollow.wall: {show(thick)} is as thick as the plan's radius ({show(radius)}) at "
                               f"{format_length(z, spar.units, tape=True)} from the heel: stations = \"auto\" "
                               "enlarges the whole spar to leave a bore there; check the wall.")
                break
    stock = spar.stock
    if stock is not None:
        widest = max(stock.widths)
        if stock.kerf >= KERF_REFUSED or stock.kerf >= widest:
            limit = (f"as wide as the widest board ({show(widest)})" if stock.kerf >= widest
                     else f"{show(KERF_REFUSED)} or more")
            raise InputError(f"a kerf of {show(stock.kerf)} is {limit}: no saw cuts so wide; give the blade's "
                             "kerf (1/8 in or 3 mm is usual)", "stock.kerf")
        for i, board in enumerate(stock.lengths):
            if board < SHORTEST_BOARD:
                raise InputError(f"a board {show(board)} long is no stock for staves; lengths are board lengths "
                                 "(write \"8 ft\" or 2400, not 8)", f"stock.lengths[{i + 1}]")
        if stock.kerf > KERF_WARNED:
            notices.append(f"stock.kerf: {show(stock.kerf)} is wider than a ripping blade's kerf "
                           f"(under {show(KERF_WARNED)}): check the figure.")
    return tuple(notices)


def parse_spar(data: dict[str, Any], source: str = "") -> Spar:
    """A validated :class:`Spar` from parsed TOML; raises InputError naming the key."""
    units = ""
    try:
        _check_all_names(data, "", schema.TOP)
        top = _Table(data, "", "in", schema.TOP)
        spar_t = top.sub("spar")
        units = spar_t.get("units")
        for t in (top, spar_t):
            t.units = units
        name = spar_t.get("name")
        length = spar_t.get("length")
        head_load = spar_t.get("head_load")
        own = _own_materials(top.raw("materials"), units)
        token = _OWN.set(own)
        plan_t = top.sub("plan")
        plan = _plan(plan_t, units, length)
        hollow = _hollow(top.sub("hollow"), units, length, plan)
        stock_t = top.sub("stock")
        stock = None if stock_t is None else _stock(stock_t, units, length, hollow)
        output = _output(top.sub("output"), units, length)
        parting_t = top.sub("parting")
        parting = None if parting_t is None else _parting(parting_t, units, length, hollow, "hollow")
        spar = Spar(name=name, units=units, length=length, plan=plan, hollow=hollow, stock=stock, output=output,
                    source=source, head_load=head_load, parting=parting)
        notices = _plausibility(spar)
    except InputError as exc:
        raise exc.located(source, units)
    finally:
        if "token" in locals():
            _OWN.reset(token)
    return Spar(name=name, units=units, length=length, plan=plan, hollow=hollow, stock=stock, output=output,
                source=source, head_load=head_load, head_load_given=spar_t.has("head_load"), notices=notices,
                parting=parting)


def read_spar_bytes(path: str | Path) -> bytes:
    """The bytes of the spar file at ``path``: a regular file (or a pipe) of at most :data:`LARGEST_FILE` bytes."""
    path = Path(path)
    source = str(path)
    try:
        with open(path, "rb") as handle:
            mode = os.fstat(handle.fileno()).st_mode
            if not (stat.S_ISREG(mode) or stat.S_ISFIFO(mode)):
                raise InputError("is not a spar file but a device or socket; give a file", source=source)
            raw = handle.read(LARGEST_FILE + 1)
    except FileNotFoundError:
        raise InputError("no such file", source=source) from None
    except IsADirectoryError:
        raise InputError("is a folder, not a spar file", source=source) from None
    except OSError as exc:
        raise InputError(f"cannot read: {exc.strerror or exc}", source=source) from None
    if len(raw) > LARGEST_FILE:
        raise InputError(f"is larger than {LARGEST_FILE // 1024:,} KiB: not a spar file", source=source)
    return raw


def _decoded(raw: bytes, source: str) -> str:
    try:
        return raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise InputError(f"not UTF-8 text (byte {exc.start}); save the spar file as UTF-8", source=source) from None


def read_spar_text(path: str | Path) -> str:
    """The text of the spar file at ``path`` (see :func:`read_spar_bytes`)."""
    return _decoded(read_spar_bytes(path), str(path))


def spar_from_bytes(raw: bytes, source: str) -> Spar:
    """The validated spar of a spar file's bytes; ``source`` names it in messages (a path, or a label)."""
    return parse_spar(toml_from_bytes(raw, source), source)


def read_toml(path: str | Path) -> dict[str, Any]:
    """The parsed TOML of the file at ``path`` (a spar file or a boat file), read as a spar file is."""
    return toml_from_bytes(read_spar_bytes(path), str(path))


def toml_from_bytes(raw: bytes, source: str) -> dict[str, Any]:
    """The parsed TOML of a file's bytes; InputError naming ``source`` if it is not TOML or is empty."""
    if len(raw) > LARGEST_FILE:
        raise InputError(f"is larger than {LARGEST_FILE // 1024:,} KiB: not a spar file", source=source)
    text = _decoded(raw, source)
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise InputError(f"TOML syntax error: {exc}", source=source) from None
    except ValueError as exc:  # tomllib's int() on a number of thousands of digits
        raise InputError(f"TOML: a number too long to read ({shown(str(exc), 60)})", source=source) from None
    if not data:
        raise InputError("the file is empty (no tables); `stavegen init` writes a starter spar file", source=source)
    return data


def load_spar(path: str | Path) -> Spar:
    """Read and validate the spar file at ``path``."""
    return spar_from_bytes(read_spar_bytes(path), str(path))
