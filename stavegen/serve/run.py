"""Start the page's server (uvicorn) on the loopback address and open the browser."""

from __future__ import annotations

import errno
import socket
import sys
import threading
import time
import webbrowser
from pathlib import Path

import uvicorn

from ..errors import InputError
from ..model.loader import load_spar
from .app import LOOPBACK_HOSTS, Settings, boat_texts, bundled_boats, bundled_samples, create_app

DEFAULT_PORT = 8471


def read_spar_text(path: Path) -> str:
    """The text of the spar file named on the command line; unreadable files fail as ``check`` fails."""
    try:
        return path.read_bytes().decode("utf-8")
    except (OSError, UnicodeDecodeError):
        load_spar(path)  # raises the loader's own one-line message for this file
        raise InputError("cannot read the file", source=str(path)) from None


def is_boat_file(path: Path) -> bool:
    """Whether the file named on the command line is a boat file (a bad file is left to the spar reader)."""
    from ..model.boat import is_boat
    from ..model.loader import read_toml

    try:
        return is_boat(read_toml(path))
    except InputError:
        return False


def is_loopback(host: str) -> bool:
    return host in LOOPBACK_HOSTS or host.startswith("127.")


def check_port(host: str, port: int) -> None:
    """Fail in one line, before anything starts, when the address cannot be served on."""
    try:
        family = socket.AF_INET6 if ":" in host else socket.AF_INET
        with socket.socket(family, socket.SOCK_STREAM) as probe:
            probe.setsockopt(socket.SOL_SOCKET, socket.SO_REUSEADDR, 1)
            probe.bind((host, port))
    except OSError as exc:
        words = exc.strerror or str(exc)
        if exc.errno == errno.EADDRINUSE:
            raise InputError(f"port {port} on {host} is in use; choose another with --port", "--port",
                             source="serve") from None
        raise InputError(f"cannot serve on {host!r}: {words}", "--host", source="serve") from None


def serve(path: Path | None, default: Path, host: str = "127.0.0.1", port: int = DEFAULT_PORT,
          open_browser: bool = True) -> None:
    """Serve the page for ``path`` (or the bundled ``default``) until interrupted."""
    samples = bundled_samples(default.parent)
    boats = bundled_boats(default.parent)
    boat = None
    called = str(path) if path is not None else default.name  # what the server's first line names
    if path is None:
        text, name = default.read_text(encoding="utf-8"), default.name
    elif is_boat_file(path):
        boat = boat_texts(path)
        name, text = next(iter(boat["spars"].items()))  # the page opens on the boat's first spar
    else:
        text, name = read_spar_text(path), str(path)
    check_port(host, port)
    allowed = list(LOOPBACK_HOSTS)
    if not is_loopback(host):
        sys.stderr.write(f"stavegen: warning: serving on {host}, not only this machine: anyone who can reach it "
                         "can use the page and make the server work. Use --host only on a network you trust.\n")
        allowed = ["*"]
    app = create_app(Settings(text=text, name=name, samples=samples, allowed_hosts=allowed, boat=boat, boats=boats))
    config = uvicorn.Config(app, host=host, port=port, log_level="warning", limit_concurrency=64,
                            timeout_keep_alive=5, h11_max_incomplete_event_size=64 * 1024)
    server = uvicorn.Server(config)

    def announce() -> None:
        while not server.started:
            if server.should_exit:
                return
            time.sleep(0.05)
        bound = server.servers[0].sockets[0].getsockname()[1] if server.servers else port
        shown = f"[{host}]" if ":" in host else host
        url = f"http://{shown}:{bound}/"
        sys.stdout.write(f"stavegen: the page for {called} is at {url} (Ctrl+C stops the server)\n")
        sys.stdout.flush()
        if open_browser:
            webbrowser.open(url)

    threading.Thread(target=announce, daemon=True).start()
    try:
        server.run()
    except KeyboardInterrupt:  # Ctrl+C is how the server is meant to stop
        pass
    sys.stdout.write("stavegen: the server has stopped\n")
