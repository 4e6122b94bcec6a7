"""Error types raised while building or reading a model."""

from __future__ import annotations


class ProblemError(ValueError):
    """A model's data is inconsistent (shapes, NaNs, empty domains).

    The message names the field and, where there is one, the index.
    """


class ModelFormatError(ProblemError):
    """A model file could not be read.

    ``path``, ``line`` (1-based, or None when the whole file is at fault) and
    ``token`` say where; the message repeats them so a user can find the spot.
    """

    def __init__(
        self, message: str, *, path: str, line: int | None = None, token: str | None = None
    ) -> None:
        self.path = path
        self.line = line
        self.token = token
        self.reason = message
        where = path if line is None else f"{path}, line {line}"
        if token is not None:
            where += f", token {token!r}"
        super().__init__(f"{where}: {message}")
