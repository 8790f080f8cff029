"""What each request asks of the engine, as plain functions of a spar file's text.

These run in the server's worker processes (:mod:`.workers`), so every answer
is plain data (text, bytes, dicts). The spar file's text is read exactly as
``stavegen check`` reads a file (UTF-8, TOML, then
:func:`stavegen.model.loader.parse_spar`) and designed by
:func:`stavegen.pipeline.design`; the JSON is :func:`stavegen.render.json_doc.to_json`
and the outputs :func:`stavegen.build.write_outputs`. Each worker keeps the
last few designs by their text, so the check, the view, the section and the
build of one text design it once.

``name`` is a label for the text (the file name the page shows); it is put in
messages and the JSON's ``spar.source`` as the command line puts the path it
was given, and it is never opened.
"""

from __future__ import annotations

import io
import tempfile
import zipfile
from collections import OrderedDict
from dataclasses import replace
from pathlib import Path
from typing import Any, Callable

from ..errors import InputError, position, shown
from ..model.loader import spar_from_bytes
from ..model.spar import Spar
from ..pipeline import Design, design

CACHED_DESIGNS = 16
CACHED_BOATS = 4

_designs: OrderedDict[tuple[str, bytes, bool], Design | InputError] = OrderedDict()


def spar_from_text(raw: bytes, name: str) -> Spar:
    """The validated spar of a spar file's bytes, with the messages the loader gives a file (one reader for both:
    :func:`stavegen.model.loader.spar_from_bytes`); tests/test_serve_api.py holds every bad spar file's message to
    the command line's."""
    return spar_from_bytes(raw, name)


def _remembered(cache: OrderedDict, key: tuple, make: Callable[[], Any], keep: int) -> Any:
    """``make()`` once per ``key``: the last ``keep`` answers (an InputError among them, raised again) are kept."""
    found = cache.get(key)
    if found is None:
        try:
            found = make()
        except InputError as exc:
            found = exc
        cache[key] = found
        while len(cache) > keep:
            cache.popitem(last=False)
    else:
        cache.move_to_end(key)
    if isinstance(found, InputError):
        raise type(found)(found.problem, found.key, found.source)
    return found


def designed(raw: bytes, name: str, layout: bool) -> Design:
    """``pipeline.design`` of the text (with the shop plan when ``layout``), once per text."""
    return _remembered(_designs, (name, raw, layout), lambda: design(spar_from_text(raw, name), layout=layout),
                       CACHED_DESIGNS)


def check(raw: bytes, name: str, layout: bool = False) -> str:
    """The JSON of ``stavegen check --json`` (with ``layout``: of the build's NAME.json)."""
    from ..render.json_doc import to_json

    return to_json(designed(raw, name, layout))


def view(raw: bytes, name: str, layout: bool = False) -> dict[str, Any]:
    from .view import page_view

    return page_view(designed(raw, name, layout))


def section(raw: bytes, name: str, at: str, layout: bool = False) -> dict[str, Any]:
    """The section at ``at`` (a position as ``stavegen section --at`` takes it), worded and drawn."""
    from ..checks.ratios import check_station
    from ..stations.evaluate import evaluate_stations
    from ..stations.grid import StationMark
    from ..units import UnitError, parse_length
    from .view import section_view

    result = designed(raw, name, layout)
    model = result.spar
    try:
        z = parse_length(at, model.units)
    except UnitError as exc:
        raise InputError(str(exc), "at", name) from None
    if not 0 <= z <= model.length:
        raise InputError(f"{shown(at)} is not on the spar ({{heel}} to {{head}} from the heel)", "at", name,
                         figures={"heel": position(0.0), "head": position(model.length)}, units=model.units)
    try:
        station = evaluate_stations(model, (StationMark(z, ("asked",)),))[0]
    except InputError as exc:
        raise exc.located(name, model.units)
    return section_view(result, check_station(model, station))


def build(raw: bytes, name: str) -> tuple[str, bytes]:
    """Every output of ``stavegen build`` in one zip: (the zip's file name, its bytes)."""
    from ..build import write_outputs

    result = designed(raw, name, True)
    return f"{result.spar.slug}.zip", _zipped(lambda folder: write_outputs(result, folder))


def _zipped(write: Callable[[Path], list[Path]]) -> bytes:
    """The files ``write`` puts in a fresh temporary folder, zipped (names without folders, sorted)."""
    with tempfile.TemporaryDirectory(prefix="stavegen-serve-") as folder:
        written = write(Path(folder))
        buffer = io.BytesIO()
        with zipfile.ZipFile(buffer, "w", compression=zipfile.ZIP_DEFLATED) as archive:
            for path in sorted(written):
                archive.write(path, arcname=path.name)
    return buffer.getvalue()


def size(raw: bytes, name: str) -> dict[str, Any]:
    """``stavegen size``: every stave count compared, the choice and why."""
    from ..sizing.count import compare_stave_counts
    from .view import size_view

    model = spar_from_text(raw, name)
    try:
        comparison = compare_stave_counts(replace(model, hollow=replace(model.hollow, staves="auto")))
    except InputError as exc:
        raise exc.located(name)
    return size_view(model, comparison)


def edit(text: str, ops: list[dict[str, Any]], name: str) -> dict[str, Any]:
    """The text with the page's edits made (comments kept), and its tables as the loader reads them."""
    from .tomledit import apply_edits, syntax_check

    try:
        result = apply_edits(text, ops, name)
    except InputError as exc:
        raise exc.located(name)
    return {"text": result, "data": _plain(syntax_check(result, name))}


def _plain(value: Any) -> Any:
    """TOML data as JSON data: dates and times become their text."""
    if isinstance(value, dict):
        return {k: _plain(v) for k, v in value.items()}
    if isinstance(value, list):
        return [_plain(v) for v in value]
    if isinstance(value, (str, int, float, bool)) or value is None:
        return value
    return str(value)


# ---- a boat: its file and the spar files it lists, all sent as text --------------------------------------

_boats: OrderedDict[tuple, Any] = OrderedDict()


def boat_from_texts(boat: bytes, spars: dict[str, bytes], name: str):
    """The validated boat of a boat file's bytes and its spar files' bytes (by the names the boat file lists),
    read as ``stavegen check BOAT`` reads them from disk (:func:`stavegen.model.boat.parse_boat`)."""
    from ..model.boat import is_boat, parse_boat
    from ..model.loader import toml_from_bytes

    data = toml_from_bytes(boat, name)
    if not is_boat(data):
        raise InputError("is not a boat file (it has no [boat] table)", "boat", name)
    return parse_boat(data, name, texts=spars)


def designed_boat(boat: bytes, spars: dict[str, bytes], name: str, layout: bool):
    """``design_boat`` of the texts, once per set of texts."""
    from ..boat import design_boat

    return _remembered(_boats, (name, boat, tuple(sorted(spars.items())), layout),
                       lambda: design_boat(boat_from_texts(boat, spars, name), layout=layout), CACHED_BOATS)


def boat_check(boat: bytes, spars: dict[str, bytes], name: str, layout: bool = False) -> str:
    """The JSON of ``stavegen check BOAT --json`` (with ``layout``: the boat build's BOAT.json)."""
    from ..render.boat_papers import to_boat_json

    return to_boat_json(designed_boat(boat, spars, name, layout))


def boat_build(boat: bytes, spars: dict[str, bytes], name: str) -> tuple[str, bytes]:
    """Every output of ``stavegen build BOAT`` in one zip: (the zip's file name, its bytes)."""
    from ..boat_build import write_boat_outputs

    result = designed_boat(boat, spars, name, True)
    return f"{result.boat.slug}.zip", _zipped(lambda folder: write_boat_outputs(result, folder))


OPERATIONS: dict[str, Callable[..., Any]] = {
    "check": check, "view": view, "section": section, "build": build, "size": size, "edit": edit,
    "boat_check": boat_check, "boat_build": boat_build,
}


def run(operation: str, kwargs: dict[str, Any]) -> tuple:
    """One request's work: ("ok", answer), ("input", one-line message, key) or ("internal", words)."""
    try:
        return ("ok", OPERATIONS[operation](**kwargs))
    except InputError as exc:
        return ("input", exc.one_line(), exc.key)
    except Exception as exc:  # a bug, not bad input: the server answers 500 and goes on
        return ("internal", f"{type(exc).__name__}: {exc}")


def warm_up() -> None:
    """Start a worker: leave Ctrl+C to the server (which ends its workers), and import what the engine
    needs, so that the first request is not slowed by it."""
    import signal

    signal.signal(signal.SIGINT, signal.SIG_IGN)
    from ..build import write_outputs  # noqa: F401
    from ..layout.plan import lay_out  # noqa: F401
    from ..render.json_doc import to_json  # noqa: F401
    from ..sizing.count import compare_stave_counts  # noqa: F401
    from . import tomledit, view  # noqa: F401
