"""The builder's page and its API (Starlette), over the same engine as the command line.

Every API request carries the spar file's text itself: the server never opens
a path a request names. Bodies are capped in size; the engine's work runs in
worker processes with a time cap (:mod:`.workers`). Bad input is answered 422
with ``{"message": the one-line message the command line prints, "key": the key}``.
"""

from __future__ import annotations

import json
import tomllib
from contextlib import asynccontextmanager
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import anyio
from starlette.applications import Starlette
from starlette.middleware import Middleware
from starlette.middleware.trustedhost import TrustedHostMiddleware
from starlette.requests import Request
from starlette.responses import FileResponse, JSONResponse, Response
from starlette.routing import Mount, Route
from starlette.staticfiles import StaticFiles

from ..model.boat import is_boat
from ..model.spar import JOINTS, PAPERS, TAPERS
from ..model.woods import wood_table
from .workers import TimeLimit, Workers

STATIC = Path(__file__).resolve().parent / "static"
LOOPBACK_HOSTS = ["127.0.0.1", "localhost", "[::1]", "::1"]
NAME_LIMIT = 200  # characters of a spar file's label


@dataclass
class Settings:
    """What the server was started with, and its caps."""

    text: str                         # the spar file the page opens with
    name: str                         # its label: the path given on the command line, or a sample's name
    max_body: int = 1_000_000         # bytes in a request body
    time_limit: float = 60.0          # seconds of engine work for a live request (check, view, section, edit)
    slow_time_limit: float = 300.0    # seconds for the stave-count comparison and the zip of outputs
    allowed_hosts: list[str] = field(default_factory=lambda: list(LOOPBACK_HOSTS))
    samples: dict[str, str] = field(default_factory=dict)
    boat: dict[str, Any] | None = None  # a boat the page opens with: {"text", "name", "spars": {file: text}}
    boats: dict[str, dict[str, Any]] = field(default_factory=dict)  # bundled boats, by file name


class Refused(Exception):
    def __init__(self, status: int, message: str, key: str = "") -> None:
        super().__init__(message)
        self.status, self.message, self.key = status, message, key


def bundled_samples(folder: Path) -> dict[str, str]:
    """The sample spar files shipped with stavegen (in ``folder``), by file name: read once, at start.

    Boat files (a [boat] table listing spar files) are left out: the page edits one spar file."""
    texts = {path.name: path.read_text(encoding="utf-8") for path in sorted(folder.glob("*.toml"))}
    return {name: text for name, text in texts.items() if not is_boat(tomllib.loads(text))}


def boat_texts(path: Path) -> dict[str, Any]:
    """A boat file and the spar files it lists, as text: {"text", "name", "spars": {file: text}} (the files are
    named by the boat file, read once when the server starts, never by a request). The boat is validated first,
    so a bad boat file stops ``serve`` with the message ``check`` gives."""
    from ..model.boat import _entries, load_boat

    load_boat(path)
    text = path.read_text(encoding="utf-8")
    files = [file for file, _, _ in _entries(tomllib.loads(text)["boat"]["spars"], "boat.spars")]
    return {"text": text, "name": path.name,
            "spars": {file: (path.parent / file).read_text(encoding="utf-8") for file in files}}


def bundled_boats(folder: Path) -> dict[str, dict[str, Any]]:
    """The sample boats shipped with stavegen (in ``folder``), by file name, each with its spar files' text."""
    out = {}
    for path in sorted(folder.glob("*.toml")):
        if is_boat(tomllib.loads(path.read_text(encoding="utf-8"))):
            out[path.name] = boat_texts(path)
    return out


def _error(status: int, message: str, key: str = "") -> JSONResponse:
    return JSONResponse({"message": message, "key": key}, status_code=status)


def create_app(settings: Settings) -> Starlette:
    live = Workers(1)
    slow = Workers(1)

    async def body(request: Request) -> bytes:
        """The request body, at most ``max_body`` bytes, read within the time cap."""
        declared = request.headers.get("content-length")
        if declared is not None and declared.isdigit() and int(declared) > settings.max_body:
            raise Refused(413, f"request body over {settings.max_body} bytes")
        chunks, size = [], 0
        with anyio.fail_after(settings.time_limit):
            async for chunk in request.stream():
                size += len(chunk)
                if size > settings.max_body:
                    raise Refused(413, f"request body over {settings.max_body} bytes")
                chunks.append(chunk)
        return b"".join(chunks)

    def label(request: Request) -> str:
        name = request.query_params.get("name", settings.name)
        name = " ".join(name.split())[:NAME_LIMIT]
        return name or "spar.toml"

    def flag(request: Request, key: str) -> bool:
        return request.query_params.get(key, "") in ("1", "true", "yes")

    async def engine(operation: str, kwargs: dict[str, Any], slow_work: bool = False) -> Any:
        workers = slow if slow_work else live
        limit = settings.slow_time_limit if slow_work else settings.time_limit
        try:
            answer = await anyio.to_thread.run_sync(workers.call, operation, kwargs, limit)
        except TimeLimit:
            raise Refused(503, f"stopped: the engine took longer than {limit:g} s on this request") from None
        if answer[0] == "ok":
            return answer[1]
        if answer[0] == "input":
            raise Refused(422, answer[1], answer[2])
        raise Refused(500, f"internal error ({answer[1]}); please report it")

    def guarded(handler):
        async def wrapper(request: Request) -> Response:
            try:
                return await handler(request)
            except Refused as exc:
                return _error(exc.status, exc.message, exc.key)
            except TimeoutError:
                return _error(408, f"the request took longer than {settings.time_limit:g} s to arrive")
        return wrapper

    async def page(request: Request) -> Response:
        return FileResponse(STATIC / "index.html", headers={"Cache-Control": "no-store"})

    async def start(request: Request) -> Response:
        return JSONResponse({
            "text": settings.text,
            "name": settings.name,
            "samples": list(settings.samples),
            "boats": list(settings.boats),
            "boat": settings.boat,
            "woods": [{"key": w.key, "name": w.name} for w in wood_table().values()],
            "choices": {"units": ["in", "mm"], "joint": list(JOINTS), "taper": list(TAPERS), "paper": list(PAPERS)},
            "limits": {"max_body": settings.max_body, "time_limit": settings.time_limit},
        })

    async def sample(request: Request) -> Response:
        name = request.path_params["name"]
        if name in settings.boats:
            return JSONResponse({"boat": settings.boats[name], "name": name})
        if name not in settings.samples:  # a fixed list read at start: no path from the request is opened
            raise Refused(404, f"no bundled sample named {name!r}")
        return JSONResponse({"text": settings.samples[name], "name": name})

    async def check(request: Request) -> Response:
        raw = await body(request)
        text = await engine("check", {"raw": raw, "name": label(request), "layout": flag(request, "layout")})
        return Response(text, media_type="application/json")

    async def view(request: Request) -> Response:
        raw = await body(request)
        return JSONResponse(await engine("view", {"raw": raw, "name": label(request),
                                                  "layout": flag(request, "layout")}))

    async def section(request: Request) -> Response:
        raw = await body(request)
        at = request.query_params.get("at")
        if at is None:
            raise Refused(422, "missing: the position of the section (?at=, as stavegen section --at takes it)", "at")
        return JSONResponse(await engine("section", {"raw": raw, "name": label(request), "at": at,
                                                     "layout": flag(request, "layout")}))

    async def build(request: Request) -> Response:
        raw = await body(request)
        filename, data = await engine("build", {"raw": raw, "name": label(request)}, slow_work=True)
        return Response(data, media_type="application/zip",
                        headers={"Content-Disposition": f'attachment; filename="{filename}"'})

    async def size(request: Request) -> Response:
        raw = await body(request)
        return JSONResponse(await engine("size", {"raw": raw, "name": label(request)}, slow_work=True))

    async def edit(request: Request) -> Response:
        raw = await body(request)
        try:
            asked = json.loads(raw.decode("utf-8"))
        except (UnicodeDecodeError, json.JSONDecodeError) as exc:
            raise Refused(400, f"the edit is not JSON: {exc}") from None
        if not isinstance(asked, dict) or not isinstance(asked.get("text"), str) \
                or not isinstance(asked.get("ops", []), list):
            raise Refused(400, 'the edit is {"text": the spar file, "ops": [edits]}')
        return JSONResponse(await engine("edit", {"text": asked["text"], "ops": asked.get("ops", []),
                                                  "name": label(request)}))

    async def boat_body(request: Request) -> dict[str, Any]:
        """A boat request's body: {"boat": the boat file's text, "spars": {file name: the spar file's text}}."""
        raw = await body(request)
        try:
            asked = json.loads(raw.decode("utf-8"))
        except (UnicodeDecodeError, json.JSONDecodeError) as exc:
            raise Refused(400, f"the boat is not JSON: {exc}") from None
        spars = asked.get("spars") if isinstance(asked, dict) else None
        if not isinstance(asked, dict) or not isinstance(asked.get("boat"), str) or not isinstance(spars, dict) \
                or not all(isinstance(k, str) and isinstance(v, str) for k, v in spars.items()):
            raise Refused(400, 'a boat is {"boat": the boat file, "spars": {file name: spar file}}')
        return {"boat": asked["boat"].encode("utf-8"), "name": label(request),
                "spars": {k: v.encode("utf-8") for k, v in spars.items()}}

    async def boat_check(request: Request) -> Response:
        asked = await boat_body(request)
        text = await engine("boat_check", {**asked, "layout": flag(request, "layout")})
        return Response(text, media_type="application/json")

    async def boat_build(request: Request) -> Response:
        asked = await boat_body(request)
        filename, data = await engine("boat_build", asked, slow_work=True)
        return Response(data, media_type="application/zip",
                        headers={"Content-Disposition": f'attachment; filename="{filename}"'})

    @asynccontextmanager
    async def lifespan(app):
        live.start()
        slow.start()
        try:
            yield
        finally:
            live.close()
            slow.close()

    routes = [
        Route("/", page),
        Route("/api/start", guarded(start)),
        Route("/api/sample/{name}", guarded(sample)),
        Route("/api/check", guarded(check), methods=["POST"]),
        Route("/api/view", guarded(view), methods=["POST"]),
        Route("/api/section", guarded(section), methods=["POST"]),
        Route("/api/build", guarded(build), methods=["POST"]),
        Route("/api/size", guarded(size), methods=["POST"]),
        Route("/api/edit", guarded(edit), methods=["POST"]),
        Route("/api/boat/check", guarded(boat_check), methods=["POST"]),
        Route("/api/boat/build", guarded(boat_build), methods=["POST"]),
        Mount("/static", StaticFiles(directory=STATIC), name="static"),
    ]
    middleware = [Middleware(TrustedHostMiddleware, allowed_hosts=settings.allowed_hosts),
                  Middleware(SameOrigin)]
    return Starlette(routes=routes, middleware=middleware, lifespan=lifespan)


class SameOrigin:
    """Refuse a POST that another site's page sends (its Origin is not this server's)."""

    def __init__(self, app) -> None:
        self.app = app

    async def __call__(self, scope, receive, send) -> None:
        if scope["type"] == "http" and scope["method"] == "POST":
            headers = {k.decode("latin-1").lower(): v.decode("latin-1") for k, v in scope["headers"]}
            origin = headers.get("origin")
            if origin is not None:  # a browser always sends it with a POST; "null" from sandboxed pages
                host = headers.get("host", "")
                if origin.split("://", 1)[-1] != host:
                    await _error(403, "refused: the request came from another site's page")(scope, receive, send)
                    return
        await self.app(scope, receive, send)
