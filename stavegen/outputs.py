"""Writing outputs all-or-nothing: each file under a temporary name, renamed when every one is done."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path
from typing import Callable

from .errors import InputError

Writer = Callable[[Path], None]


def prepare_folder(folder: Path) -> Path:
    """Create the output folder if needed; an InputError naming ``-o`` if it cannot be written."""
    try:
        folder.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise InputError(f"cannot create the output folder {folder}: {exc.strerror or exc}", "-o/--out") from None
    if not folder.is_dir() or not os.access(folder, os.W_OK):
        raise InputError(f"cannot write into {folder}", "-o/--out")
    return folder


class OutputSet:
    """Files written into one folder that appear together or not at all.

    ``add(name, writer)`` calls ``writer(temp_path)`` at once; ``commit()``
    renames every temporary file onto its name. If anything fails before the
    commit, ``discard()`` (or leaving the ``with`` block by an exception)
    removes the temporary files and leaves earlier outputs as they were.
    """

    def __init__(self, folder: Path) -> None:
        self.folder = prepare_folder(Path(folder))
        self._pending: list[tuple[Path, Path]] = []

    def add(self, name: str, writer: Writer) -> Path:
        fd, temp = tempfile.mkstemp(prefix=f".{name}.", suffix=".part", dir=self.folder)
        os.close(fd)
        temp_path = Path(temp)
        self._pending.append((temp_path, self.folder / name))
        writer(temp_path)
        return self.folder / name

    def add_text(self, name: str, text: str) -> Path:
        return self.add(name, lambda p: p.write_text(text, encoding="utf-8"))

    def commit(self) -> list[Path]:
        done = []
        mask = os.umask(0)
        os.umask(mask)
        for temp, final in self._pending:
            os.chmod(temp, 0o666 & ~mask)
            os.replace(temp, final)
            done.append(final)
        self._pending.clear()
        return done

    def discard(self) -> None:
        for temp, _ in self._pending:
            try:
                temp.unlink()
            except FileNotFoundError:
                pass
        self._pending.clear()

    def __enter__(self) -> "OutputSet":
        return self

    def __exit__(self, exc_type, exc, tb) -> None:
        if exc_type is not None:
            self.discard()
