"""The one error a user sees for bad input: file, key, what is wrong."""

from __future__ import annotations


class InputError(Exception):
    """Bad input, reported as one line and exit code 2.

    ``source`` is the file (or a label such as ``--at``), ``key`` the dotted
    table path of the offending entry (``hollow.plug[2].from``), ``problem``
    what is wrong with it, in plain words.
    """

    def __init__(self, problem: str, key: str = "", source: str = "") -> None:
        super().__init__(problem)
        self.problem = problem
        self.key = key
        self.source = source

    def located(self, source: str) -> "InputError":
        """The same error, naming ``source`` if it named no file yet."""
        if not self.source:
            self.source = source
        return self

    def one_line(self) -> str:
        parts = [p for p in (self.source, self.key) if p]
        text = ": ".join(parts + [self.problem])
        return " ".join(text.split())


class DesignError(InputError):
    """Geometry the spar file asks for cannot be built (still exit code 2)."""
