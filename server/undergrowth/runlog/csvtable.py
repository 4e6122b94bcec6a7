"""Import a CSV node table: the simplest way to inspect any solver's tree.

One row per node, parents before their children, a header row naming the
columns (any order, case-insensitive). Required columns:

    id, parent, bound, status

Optional columns: ``depth``, ``time``, ``order``, ``variable``, ``name``,
``direction``, ``value``, ``objective``, ``iterations``, ``fractional``.
``variable``/``direction``/``value`` describe the bound change that created the
row's node (down: x_variable <= value, up: x_variable >= value) and ``name``
that variable's name; ``objective`` is the relaxation value. Other columns are
ignored. An empty cell means "unknown"; a root has an empty ``parent`` (or -1).
Defaults: depth from the parent, order = row order among solved nodes, time 0,
name ``x<variable>``. Lines starting with ``#`` before the header row are
comments; ``# sense: max`` and ``# name: my model`` set the header. Without a
sense line the sense is inferred from the bounds (children's bounds rise in a
minimisation), defaulting to min. Improving integral nodes become incumbents.
"""

from __future__ import annotations

import csv
import gzip
import io
import math
import os
from collections.abc import Callable, Iterator
from datetime import UTC, datetime
from typing import Any

from .. import __version__
from .codes import BOUND_TOLERANCE, STATUSES
from .errors import RunLogError
from .tracker import TreeError, TreeTracker

__all__ = ["CSV_COLUMNS", "REQUIRED_COLUMNS", "csv_to_events", "import_csv", "iter_csv_events"]

REQUIRED_COLUMNS = ("id", "parent", "bound", "status")
CSV_COLUMNS = REQUIRED_COLUMNS + (
    "depth",
    "time",
    "order",
    "variable",
    "name",
    "direction",
    "value",
    "objective",
    "iterations",
    "fractional",
)
# Which column to blame for a problem the tree tracker finds in a field.
_COLUMN_OF = {
    "branch.var": "variable",
    "branch.dir": "direction",
    "branch.value": "value",
    "branch": "variable",
    "lp.objective": "objective",
    "lp.iterations": "iterations",
}
_UNKNOWN = frozenset({"", "null", "none", "nan"})


class _Bad(Exception):
    def __init__(self, column: str, message: str) -> None:
        self.column = column
        super().__init__(message)


def _int(row: dict[str, str], column: str) -> int | None:
    cell = row.get(column, "").strip()
    if cell.lower() in _UNKNOWN:
        return None
    try:
        return int(cell)
    except ValueError:
        pass
    try:
        number = float(cell)
    except ValueError:
        raise _Bad(column, f"{cell!r} is not an integer") from None
    if not number.is_integer():
        raise _Bad(column, f"{cell!r} is not an integer")
    return int(number)


def _float(row: dict[str, str], column: str) -> float | None:
    cell = row.get(column, "").strip()
    if cell.lower() in _UNKNOWN:
        return None
    try:
        number = float(cell)
    except ValueError:
        raise _Bad(column, f"{cell!r} is not a number") from None
    return number if math.isfinite(number) else None


def _parse_row(row: dict[str, str]) -> dict[str, Any]:
    nid = _int(row, "id")
    if nid is None:
        raise _Bad("id", "every row needs a node id")
    parent = _int(row, "parent")
    if parent == -1:
        parent = None
    status = row.get("status", "").strip().lower()
    if status not in STATUSES:
        raise _Bad("status", f"{status!r} is not one of {', '.join(STATUSES)}")
    var = _int(row, "variable")
    direction = row.get("direction", "").strip().lower() or None
    value = _float(row, "value")
    branch = None
    if var is not None:
        if direction not in ("down", "up"):
            raise _Bad("direction", f"{direction!r} must be 'down' or 'up' when variable is set")
        if value is None:
            raise _Bad("value", "the branch value is needed when variable is set")
        branch = {"var": var, "dir": direction, "value": value, "name": row.get("name", "").strip()}
    elif direction is not None:
        raise _Bad("variable", "a direction is given but no variable")
    return {
        "id": nid,
        "parent": parent,
        "status": status,
        "bound": _float(row, "bound"),
        "depth": _int(row, "depth"),
        "order": _int(row, "order"),
        "time": _float(row, "time") or 0.0,
        "branch": branch,
        "lp_objective": _float(row, "objective"),
        "iterations": _int(row, "iterations") or 0,
        "fractional": _int(row, "fractional") or 0,
    }


def _open_text(path: str) -> io.TextIOBase:
    with open(path, "rb") as f:
        compressed = f.read(2) == b"\x1f\x8b"
    if compressed:
        return io.TextIOWrapper(gzip.open(path, "rb"), encoding="utf-8-sig", newline="")
    return open(path, encoding="utf-8-sig", newline="")  # noqa: SIM115 - caller closes


def _read_rows(
    path: str, *, lenient: bool, warn: Callable[[str], None]
) -> tuple[dict[str, str], list[tuple[int, dict[str, Any]]]]:
    directives: dict[str, str] = {}
    rows: list[tuple[int, dict[str, Any]]] = []
    with _open_text(path) as f:
        lineno = 0
        # Comment lines before the header row.
        for text in f:
            lineno += 1
            if not text.startswith("#"):
                break
            key, sep, value = text[1:].partition(":")
            if sep:
                directives[key.strip().lower()] = value.strip()
        else:
            raise RunLogError("no header row", path=path, line=lineno or None)
        header_line = lineno
        columns = [c.strip().lower() for c in next(csv.reader([text]))]
        for column in REQUIRED_COLUMNS:
            if column not in columns:
                raise RunLogError(
                    f"the required column {column!r} is missing (columns: {', '.join(columns)})",
                    path=path,
                    line=header_line,
                    field=column,
                )
        for column in columns:
            if columns.count(column) > 1:
                raise RunLogError(
                    "the column appears twice", path=path, line=header_line, field=column
                )
        reader = csv.reader(f)
        for cells in reader:
            line = header_line + reader.line_num
            if not cells or all(not c.strip() for c in cells):
                continue
            if len(cells) != len(columns):
                message = f"{len(cells)} cells but the header row has {len(columns)} columns"
                if not lenient:
                    raise RunLogError(message, path=path, line=line)
                warn(f"line {line}: {message}; row skipped")
                continue
            try:
                rows.append((line, _parse_row(dict(zip(columns, cells, strict=True)))))
            except _Bad as exc:
                if not lenient:
                    raise RunLogError(str(exc), path=path, line=line, field=exc.column) from None
                warn(f"line {line}, column {exc.column!r}: {exc}; row skipped")
    return directives, rows


def _infer_sense(rows: list[tuple[int, dict[str, Any]]]) -> str:
    """min if children's bounds mostly rise from their parents', max if they mostly fall."""
    bound_of = {r["id"]: r["bound"] for _, r in rows}
    rising = falling = 0
    for _, r in rows:
        child, parent = r["bound"], bound_of.get(r["parent"])
        if child is None or parent is None:
            continue
        slack = BOUND_TOLERANCE * max(1.0, abs(parent))
        if child > parent + slack:
            rising += 1
        elif child < parent - slack:
            falling += 1
    return "max" if falling > rising else "min"


def iter_csv_events(
    path: str | os.PathLike[str],
    *,
    sense: str | None = None,
    lenient: bool = False,
    warn: Callable[[str], None] | None = None,
) -> Iterator[tuple[int, dict[str, Any]]]:
    """``(line number, event)`` pairs, the header first (line 1), from a CSV node table."""
    from .recorder import make_header

    path = os.fspath(path)
    warnings: list[str] = []
    warn = warn or warnings.append
    try:
        directives, rows = _read_rows(path, lenient=lenient, warn=warn)
    except (UnicodeDecodeError, csv.Error, EOFError, gzip.BadGzipFile) as exc:
        raise RunLogError(f"not a readable CSV file ({exc})", path=path) from None
    sense = sense or directives.get("sense", "").lower() or _infer_sense(rows)
    if sense not in ("min", "max"):
        raise RunLogError(f"sense must be min or max, not {sense!r}", path=path, field="sense")
    name = directives.get("name") or os.path.basename(path).split(".")[0] or "model"
    started = datetime.fromtimestamp(os.path.getmtime(path), UTC).strftime("%Y-%m-%dT%H:%M:%SZ")
    header = make_header(
        {"name": name, "sense": sense},
        {"branching": "unknown", "select": "unknown"},
        producer=f"undergrowth {__version__} csv import",
        started=started,
    )
    yield 1, header
    tracker = TreeTracker(sense=sense, rule="unknown")
    line = 1
    for line, row in rows:
        objective = row.pop("lp_objective")
        try:
            event = tracker.node(**row, lp_objective=objective)
        except TreeError as exc:
            column = _COLUMN_OF.get(exc.field, exc.field)
            if not lenient:
                raise RunLogError(str(exc), path=path, line=line, field=column) from None
            warn(f"line {line}, column {column!r}: {exc}; row skipped")
            continue
        yield line, event
        if event["status"] == "integral":
            value = objective if objective is not None else event["bound"]
            if value is not None:
                found = tracker.incumbent(value, time=event["time"], node=event["id"])
                if found is not None:
                    yield line, found
    end_time = tracker.last_time
    yield line, tracker.progress(time=end_time)
    yield line, {**tracker.end(time=end_time), "message": "imported from a CSV node table"}


def csv_to_events(
    path: str | os.PathLike[str], *, sense: str | None = None, lenient: bool = False
) -> list[dict[str, Any]]:
    """All events of a CSV node table, header first, in the run-log event format."""
    return [event for _, event in iter_csv_events(path, sense=sense, lenient=lenient)]


def import_csv(
    path: str | os.PathLike[str],
    out_path: str | os.PathLike[str],
    *,
    sense: str | None = None,
    lenient: bool = False,
) -> int:
    """Write a CSV node table as a run log (gzip if ``out_path`` ends in .gz); returns lines."""
    from .writer import RunLogWriter

    events = iter_csv_events(path, sense=sense, lenient=lenient)
    _, header = next(events)
    with RunLogWriter(out_path, header) as writer:
        for _, event in events:
            writer.write(event)
        return writer.lines_written
