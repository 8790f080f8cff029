"""Writing a set of files all-or-nothing, and telling a full disk or a locked folder from a bug.

How a set is written (:class:`OutputSet`), in the output folder itself so
that every rename stays on one file system:

1. The folder is locked (``flock`` on the folder) for the whole write, so a
   second stavegen writing into it waits; whatever temporaries the folder
   holds at that moment are an earlier, dead run's.
2. An earlier run's leftovers are dealt with (:func:`recover`): a commit it
   left half done is finished (or undone), its temporaries are removed.
3. Each file is written under a hidden temporary name
   (``.NAME.XXXXXXXX.stavegen.part``) and flushed to the disk.
4. The commit: a journal (``.stavegen-commit.XXXXXXXX.json``) is written
   first, listing every temporary, its final name and a hard-linked backup
   of the file it replaces; then each temporary is renamed onto its name;
   then the backups and the journal are removed. SIGTERM, SIGHUP and SIGINT
   wait while it runs.
5. A rename that fails undoes the ones done (the backups go back); a run
   killed outright (SIGKILL, power) leaves the journal, and the next run
   into the folder finishes the commit from it, since every temporary it
   lists was complete before it was written.

What a reader can trust: when the folder holds no ``.stavegen-commit.*``
journal, its files are each one whole set; while one is there, a set is
being committed (or was, by a run that was killed) and is whole again once
the next run into the folder has read the journal.

SIGTERM and SIGHUP while a set is being written remove its temporaries
(and a folder made for it), and the process ends with one line and exit
code 128 + the signal's number.
Only regular files are ever replaced: a device, a folder, a fifo or a link
in a file's place is refused, as bad input.
"""

from __future__ import annotations

import errno
import json
import os
import re
import signal
import stat
import tempfile
import threading
from pathlib import Path
from typing import Callable

from .errors import InputError

Writer = Callable[[Path], None]

TEMP_SUFFIX = ".stavegen.part"
BACKUP_SUFFIX = ".stavegen.old"
JOURNAL_PREFIX = ".stavegen-commit."
JOURNAL_SUFFIX = ".json"
# Our own leftovers: temporaries and backups of this module, and the ".NAME.XXXXXXXX.part" of earlier versions.
_LEFTOVER = re.compile(r"^\..+\.[a-z0-9_]{8}(\.stavegen\.part|\.stavegen\.old|\.part)$")
_JOURNAL = re.compile(r"^" + re.escape(JOURNAL_PREFIX) + r"[a-z0-9_]{8}" + re.escape(JOURNAL_SUFFIX) + "$")
_STOP_SIGNALS = tuple(s for s in (getattr(signal, "SIGTERM", None), getattr(signal, "SIGHUP", None)) if s)
_BLOCKED_IN_COMMIT = _STOP_SIGNALS + (signal.SIGINT,)


# Plain words for the OS errors a user can act on (the rest keep the system's own words).
_REASONS = {
    errno.ENOSPC: "the disk is full",
    errno.EDQUOT: "the disk quota is used up",
    errno.EACCES: "permission denied",
    errno.EPERM: "permission denied",
    errno.EROFS: "the file system is read-only",
    errno.EFBIG: "the file grew past the size the system allows",
    errno.ENAMETOOLONG: "the file name is too long for the file system",
}


def _os_error(exc: BaseException) -> OSError | None:
    """The OSError behind ``exc`` (itself, or what it was raised from), if any."""
    seen = 0
    while exc is not None and seen < 8:
        if isinstance(exc, OSError) and exc.errno is not None:
            return exc
        exc = exc.__cause__ or exc.__context__
        seen += 1
    return None


def write_failure(exc: BaseException, what: str, key: str = "") -> InputError | None:
    """An InputError for an OS error met writing ``what`` (full disk, permission...), or None for other errors."""
    found = _os_error(exc)
    if found is None:
        return None
    reason = _REASONS.get(found.errno, found.strerror or str(found))
    return InputError(f"cannot write {what}: {reason}", key)


def prepare_folder(folder: Path) -> Path:
    """Create the output folder if needed; an InputError naming ``-o`` if it cannot be written."""
    try:
        folder.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise InputError(f"cannot create the output folder {folder}: {_REASONS.get(exc.errno, exc.strerror or exc)}",
                         "-o/--out") from None
    if not folder.is_dir() or not os.access(folder, os.W_OK):
        raise InputError(f"cannot write into {folder}", "-o/--out")
    return folder


def _missing_folders(folder: Path) -> list[Path]:
    """The folders ``mkdir(parents=True)`` would create for ``folder``, deepest first."""
    out = []
    here = Path(os.path.abspath(folder))
    while not here.exists() and here != here.parent:
        out.append(here)
        here = here.parent
    return out


_KINDS = ((stat.S_ISDIR, "a folder"), (stat.S_ISLNK, "a symbolic link"), (stat.S_ISCHR, "a device"),
          (stat.S_ISBLK, "a device"), (stat.S_ISFIFO, "a named pipe"), (stat.S_ISSOCK, "a socket"))


def not_replaceable(path: Path) -> str | None:
    """Why ``path`` may not be replaced by a file (it is a folder, a device...), or None when it may."""
    if path.name in ("", ".", ".."):
        return "is a folder"
    try:
        mode = os.lstat(path).st_mode
    except FileNotFoundError:
        return None
    except OSError as exc:
        return f"cannot be examined ({_REASONS.get(exc.errno, exc.strerror)})"
    if stat.S_ISREG(mode):
        return None
    kind = next((words for test, words in _KINDS if test(mode)), "not a regular file")
    return f"is {kind}; stavegen replaces only regular files"


def _fsync(path: Path) -> None:
    fd = os.open(path, os.O_RDONLY)
    try:
        os.fsync(fd)
    finally:
        os.close(fd)


def _fsync_folder(folder: Path) -> None:
    try:
        _fsync(folder)
    except OSError:  # some file systems cannot sync a folder; the renames still happened
        pass


class _FolderLock:
    """An exclusive ``flock`` on the folder itself (no lock file left behind); a no-op where unsupported."""

    def __init__(self, folder: Path) -> None:
        self.fd: int | None = None
        try:
            import fcntl

            self.fd = os.open(folder, os.O_RDONLY)
            fcntl.flock(self.fd, fcntl.LOCK_EX)
            self.held = True
        except (ImportError, OSError):
            self.held = False

    def release(self) -> None:
        if self.fd is not None:
            os.close(self.fd)  # closing the descriptor drops the lock
            self.fd = None


def _redo(folder: Path, entries: list[dict]) -> None:
    """Finish a commit: every temporary still there onto its name, then drop the backups (idempotent)."""
    for entry in entries:
        temp = folder / entry["temp"]
        if temp.exists():
            os.replace(temp, folder / entry["final"])
    for entry in entries:
        if entry.get("backup"):
            try:
                os.unlink(folder / entry["backup"])
            except FileNotFoundError:
                pass


def _undo(folder: Path, entries: list[dict]) -> None:
    """Undo a commit: each replaced file back from its backup, each new file removed (idempotent)."""
    for entry in entries:
        final, temp = folder / entry["final"], folder / entry["temp"]
        if entry.get("backup"):
            backup = folder / entry["backup"]
            if backup.exists():
                if final.exists() and os.path.samefile(backup, final):
                    os.unlink(backup)  # not replaced yet (rename would do nothing between two links of one file)
                else:
                    os.replace(backup, final)
        elif not temp.exists() and final.exists():
            os.unlink(final)  # it was renamed from the temporary: there was no file before
        try:
            os.unlink(temp)
        except FileNotFoundError:
            pass


def _write_journal(folder: Path, entries: list[dict], undo: bool = False, path: Path | None = None) -> Path:
    """Write the journal atomically (temporary, flushed, renamed); ``path`` rewrites an existing one."""
    if path is None:
        fd, name = tempfile.mkstemp(prefix=JOURNAL_PREFIX, suffix=JOURNAL_SUFFIX, dir=folder)
        os.close(fd)
        path = Path(name)
    fd, temp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=TEMP_SUFFIX, dir=folder)
    with os.fdopen(fd, "w", encoding="utf-8") as handle:
        json.dump({"undo": undo, "files": entries}, handle)
        handle.flush()
        os.fsync(handle.fileno())
    os.replace(temp, path)
    _fsync_folder(folder)
    return path


def recover(folder: Path) -> list[str]:
    """Deal with what an earlier, dead run left in ``folder``: finish (or undo) its commits, remove its
    temporaries. Call only with the folder locked. Returns the names of the files a finished commit wrote."""
    finished: list[str] = []
    try:
        names = sorted(os.listdir(folder))
    except OSError:
        return finished
    for name in names:
        if not _JOURNAL.match(name):
            continue
        path = folder / name
        try:
            journal = json.loads(path.read_text(encoding="utf-8"))
            entries = journal["files"]
        except (OSError, ValueError, KeyError, TypeError):
            entries, journal = [], {}
        if entries:
            if journal.get("undo"):
                _undo(folder, entries)
            else:
                _redo(folder, entries)
                finished += [e["final"] for e in entries]
        path.unlink()
    for name in names:
        if _LEFTOVER.match(name):
            try:
                os.unlink(folder / name)
            except OSError:
                pass
    if finished:
        _fsync_folder(folder)
    return finished


STOPPED = "stopped by {name}; no output was changed"
_LIVE: list["OutputSet"] = []  # sets being written, for the signal handler
# Blocks of _SignalsHeld open now, and the stop signals that came while one was. Blocking a signal holds it for
# the main thread only: the kernel hands a process's signal to any thread that does not block it (rich's
# refresh thread, a solver's workers), and Python then runs the handler in the main thread all the same.
_HELD = {"depth": 0}
_DEFERRED: list[int] = []


class _SignalGuard:
    """While files are being written (main thread only), SIGTERM and SIGHUP remove every temporary of the
    sets being written, and any folder made for them, say so in one line and end the process with
    128 + the signal's number. The handler ends the process itself rather than raise: an exception
    raised at any line of a renderer can be caught and rewrapped by a library's bare ``except``.
    During a commit the signals wait (:class:`_SignalsHeld`), so a set is never left half renamed."""

    def __init__(self) -> None:
        self.previous: dict[int, object] = {}
        if threading.current_thread() is not threading.main_thread():
            return
        for signum in _STOP_SIGNALS:
            try:
                self.previous[signum] = signal.signal(signum, self._stop)
            except (OSError, ValueError):
                pass

    @staticmethod
    def _stop(signum, frame) -> None:
        if _HELD["depth"]:  # inside a held block: it runs when the block ends
            _DEFERRED.append(signum)
            return
        for out in list(_LIVE):
            out._abandon()
        name = signal.Signals(signum).name
        try:
            os.write(2, f"stavegen: {STOPPED.format(name=name)}\n".encode())
        finally:
            os._exit(128 + signum)

    def restore(self) -> None:
        for signum, handler in self.previous.items():
            signal.signal(signum, handler)
        self.previous.clear()


class _SignalsHeld:
    """SIGTERM, SIGHUP and SIGINT wait inside the block and take their course when it ends.

    They are blocked in the main thread, and, as a signal a thread other than the main one takes still runs
    its Python handler in the main thread at once, the handlers defer too: a stop signal's (see
    :class:`_SignalGuard`) and, for the block, SIGINT's."""

    def __enter__(self) -> "_SignalsHeld":
        main = threading.current_thread() is threading.main_thread()
        self.active = hasattr(signal, "pthread_sigmask") and main
        self.saved_int = None
        if main and _HELD["depth"] == 0:
            try:
                self.saved_int = signal.signal(signal.SIGINT, _defer)
            except (OSError, ValueError):
                pass
        if self.active:
            self.old = signal.pthread_sigmask(signal.SIG_BLOCK, _BLOCKED_IN_COMMIT)
        _HELD["depth"] += 1
        return self

    def __exit__(self, *exc) -> None:
        _HELD["depth"] -= 1
        if self.saved_int is not None:
            signal.signal(signal.SIGINT, self.saved_int)
        if self.active:
            signal.pthread_sigmask(signal.SIG_SETMASK, self.old)
        if _HELD["depth"] or not _DEFERRED:
            return
        pending = list(_DEFERRED)
        _DEFERRED.clear()
        for signum in pending:
            if signal.getsignal(signum) is _SignalGuard._stop:  # still writing: remove the temporaries, stop
                _SignalGuard._stop(signum, None)
        signal.raise_signal(pending[0])  # the set is in place, or SIGINT: the signal takes its usual course


def _defer(signum, frame) -> None:
    _DEFERRED.append(signum)


class OutputSet:
    """Files written into one folder that appear together or not at all.

    ``add(name, writer)`` calls ``writer(temp_path)`` at once; ``commit()``
    puts every file in place (see the module's note for how). If anything
    fails before the commit, ``discard()`` (or leaving the ``with`` block by
    an exception) removes the temporaries, and a folder made for the set,
    and leaves earlier outputs as they were. ``key`` names what the folder
    came from in messages (``-o/--out``).
    """

    def __init__(self, folder: Path, key: str = "-o/--out") -> None:
        folder = Path(folder)
        self.key = key
        self.folder = folder
        self._made = _missing_folders(folder)
        self._pending: list[tuple[Path, Path]] = []
        self._lock: _FolderLock | None = None
        _LIVE.append(self)
        self._signals = _SignalGuard()
        try:
            self.folder = prepare_folder(folder)
            self._lock = _FolderLock(self.folder)
            if self._lock.held:
                recover(self.folder)
        except BaseException:
            self.discard()
            raise

    def _refuse_odd(self, final: Path) -> None:
        why = not_replaceable(final)
        if why:
            raise InputError(why, "", str(final))

    def add(self, name: str, writer: Writer) -> Path:
        final = self.folder / name
        self._refuse_odd(final)
        with _SignalsHeld():  # the temporary is listed for removal the moment it exists
            try:
                fd, temp = tempfile.mkstemp(prefix=f".{name}.", suffix=TEMP_SUFFIX, dir=self.folder)
                os.close(fd)
            except OSError as exc:
                raise write_failure(exc, f"{name} into {self.folder}", self.key) from None
            temp_path = Path(temp)
            self._pending.append((temp_path, final))
        try:
            writer(temp_path)
            _fsync(temp_path)
        except Exception as exc:
            failure = write_failure(exc, f"{name} into {self.folder}", self.key)
            if failure is None:
                raise
            raise failure from None
        return final

    def add_text(self, name: str, text: str) -> Path:
        return self.add(name, lambda p: p.write_text(text, encoding="utf-8"))

    def commit(self) -> list[Path]:
        """Put every file in place together; on a failure undo what was done and raise."""
        for _, final in self._pending:
            self._refuse_odd(final)
        mask = os.umask(0)
        os.umask(mask)
        for temp, _ in self._pending:
            os.chmod(temp, 0o666 & ~mask)
        with _SignalsHeld():
            entries = []
            journal: Path | None = None
            try:
                for temp, final in self._pending:
                    backup = temp.name[: -len(TEMP_SUFFIX)] + BACKUP_SUFFIX if final.exists() else None
                    entries.append({"temp": temp.name, "final": final.name, "backup": backup})
                journal = _write_journal(self.folder, entries)
                for entry in entries:
                    if entry["backup"]:
                        _backup(self.folder / entry["final"], self.folder / entry["backup"])
                for temp, final in self._pending:
                    _rename(temp, final)
                _fsync_folder(self.folder)
                _redo(self.folder, entries)
                journal.unlink()  # not synced: should it come back after a power cut, finishing it again is a no-op
            except Exception as exc:
                self._roll_back(entries, journal)
                failure = write_failure(exc, f"the outputs into {self.folder}", self.key)
                if failure is None:
                    raise
                raise failure from None
            done = [final for _, final in self._pending]
            self._pending.clear()
            _LIVE.remove(self)
            # A signal that came during the commit now takes its usual course: the set is in place.
            self._signals.restore()
        self._close()
        return done

    def _roll_back(self, entries: list[dict], journal: Path | None) -> None:
        if journal is None:
            return
        try:
            _write_journal(self.folder, entries, undo=True, path=journal)
            _undo(self.folder, entries)
            journal.unlink()
        except OSError:  # the journal stays: the next run into the folder undoes the rest
            pass

    def discard(self) -> None:
        self._abandon()
        self._close()

    def _abandon(self) -> None:
        """Remove the temporaries written so far, and the folders made for the set if left empty."""
        for temp, _ in self._pending:
            try:
                temp.unlink()
            except FileNotFoundError:
                pass
        self._pending.clear()
        for made in self._made:
            try:
                made.rmdir()
            except OSError:
                break

    def _close(self) -> None:
        if self._lock is not None:
            self._lock.release()
        self._signals.restore()
        if self in _LIVE:
            _LIVE.remove(self)

    def __enter__(self) -> "OutputSet":
        return self

    def __exit__(self, exc_type, exc, tb) -> None:
        if exc_type is not None:
            self.discard()
        else:
            self._close()


def _rename(source: Path, target: Path) -> None:
    """One rename of the commit (a seam for tests that inject a fault between renames)."""
    os.replace(source, target)


def _backup(final: Path, backup: Path) -> None:
    """A second name for the file about to be replaced (a hard link; a copy where links are not supported)."""
    try:
        os.link(final, backup)
    except OSError:
        import shutil

        shutil.copy2(final, backup)


def write_file(path: Path, text: str, force: bool = False, key: str = "") -> Path:
    """Write one text file all-or-nothing: refuse to replace an existing file unless ``force``, and never
    replace anything but a regular file."""
    path = Path(path)
    why = not_replaceable(path)
    if why:
        raise InputError(why, key, str(path))
    if os.path.lexists(path) and not force:
        raise InputError("already exists; pass --force to overwrite it", key, str(path))
    parent = path.parent if str(path.parent) else Path(".")
    with OutputSet(parent, key=key) as out:
        out.add_text(path.name, text)
        return out.commit()[0]
