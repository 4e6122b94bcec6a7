"""Error type raised while reading or importing a run log (no heavy imports)."""

from __future__ import annotations


class RunLogError(ValueError):
    """A run log (or CSV node table) cannot be read as it stands.

    ``path``, ``line`` (1-based, or None when the whole file is at fault) and
    ``field`` (a dotted path such as ``branch.dir``, or a CSV column name) say
    where; the message repeats them so a user can find the spot.
    """

    def __init__(
        self,
        message: str,
        *,
        path: str,
        line: int | None = None,
        field: str | None = None,
    ) -> None:
        self.path = path
        self.line = line
        self.field = field
        self.reason = message
        where = path if line is None else f"{path}, line {line}"
        if field:
            where += f", field {field!r}"
        super().__init__(f"{where}: {message}")


class RunLogVersionError(RunLogError):
    """The file is a run log of a version this reader does not support."""
