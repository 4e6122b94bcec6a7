"""Read and validate a run log (JSON Lines, plain or gzip) or a CSV node table.

`RunLogReader` streams validated events and, in the same pass, fills compact
per-node columns (in order of appearance) that serve both the consistency
checks and `RunTable`. `read_run` loads a whole (small) log as dicts.

What is an error (`RunLogError`, or a skipped line with a warning when
``lenient``): a line that is not JSON or breaks the contract, a node whose
parent has not appeared, a duplicate node id, a second root, a node under a
parent that is not ``branched``, a depth that is not the parent's plus one.
What is a warning: a cut-off last line or gzip stream (the valid prefix is
loaded), a child whose bound is more optimistic than its parent's by more than
`BOUND_TOLERANCE`, an unknown event kind, events after ``end``, no ``end``.
"""

from __future__ import annotations

import math
import os
from array import array
from collections.abc import Iterable, Iterator
from dataclasses import dataclass, field
from typing import Any

from pydantic_core import from_json

from ._fastcheck import incumbent_ok, node_ok, progress_ok
from ._lines import LineSource, gzip_problem
from .codes import (
    BOUND_TOLERANCE,
    BRANCHED,
    DIRECTION_CODE,
    FORMAT,
    SOURCE_CODE,
    STATUS_CODE,
    STATUSES,
    VERSION,
)
from .errors import RunLogError, RunLogVersionError

__all__ = ["RunLog", "RunLogReader", "read_run"]

MAX_WARNINGS = 100  # kept in full; further warnings are only counted
NODE_COLUMNS = (
    "id", "parent", "parent_row", "depth", "order", "time", "bound", "lp_objective", "status",
    "branch_var", "branch_dir", "branch_value", "iterations", "fractional", "incumbent",
    "dual_bound",
)  # fmt: skip
_TYPECODE = dict.fromkeys(
    ("time", "bound", "lp_objective", "branch_value", "incumbent", "dual_bound"), "d"
)
_BYTE_COLUMNS = frozenset({"status", "branch_dir"})
INCUMBENT_FIELDS = ("time", "order", "node", "objective", "source")
PROGRESS_FIELDS = ("time", "nodes", "open", "dual_bound", "primal_bound", "gap", "tree_weight")


def _is_csv(path: str) -> bool:
    return path.lower().endswith((".csv", ".csv.gz"))


class RunLogReader:
    """Validate a run log as a stream; iterate it for the events after the header.

    ``header`` is available once the first event has been produced (or after
    `read_header`); ``end``, ``warnings`` and the columns are complete after the
    iteration. ``columns`` hold one entry per accepted node, in order of
    appearance (`RunTable` wraps them), ``incumbents`` and ``progress`` one per
    event.
    """

    def __init__(self, path: str | os.PathLike[str], *, lenient: bool = False) -> None:
        self.path = os.fspath(path)
        self.lenient = lenient
        self.header: dict[str, Any] | None = None
        self.end: dict[str, Any] | None = None
        self.warnings: list[str] = []
        self.skipped = 0  # lines skipped because lenient
        self.rows: dict[int, int] = {}  # node id -> row
        self.line = array("q")  # line number of each node
        # Node columns (see `RunTable` for their meaning): -1 / NaN where unknown.
        self.columns: dict[str, array[Any] | bytearray] = {
            name: bytearray() if name in _BYTE_COLUMNS else array(_TYPECODE.get(name, "q"))
            for name in NODE_COLUMNS
        }
        self.var_names: dict[int, str] = {}  # from the branches seen
        self.incumbents: dict[str, list[Any]] = {k: [] for k in INCUMBENT_FIELDS}
        self.progress: dict[str, list[Any]] = {k: [] for k in PROGRESS_FIELDS}
        self.sense = "min"
        self._dropped_warnings = 0
        self._compressed = False
        self._gzip_checked: str | None = None
        self._source: Iterator[tuple[int, Any]] | None = None

    # ---------------------------------------------------------------- public
    def read_header(self) -> dict[str, Any]:
        """Read and check the header line (idempotent)."""
        if self.header is None:
            self._source = iter(self._csv_lines() if _is_csv(self.path) else self._json_lines())
            try:
                first = next(self._source, None)
            except _StopReading:
                first = None
            if first is None:
                raise RunLogError(
                    "empty, or cut off before the header line was complete", path=self.path
                )
            self._take_header(*first)
        return self.header  # type: ignore[return-value]

    def __iter__(self) -> Iterator[dict[str, Any]]:
        self.read_header()
        assert self._source is not None
        yield from self._events(self._source)
        if self.end is None:
            self.warn("no end event: the search was interrupted or is still running")
        if self._dropped_warnings:
            self.warnings.append(f"... and {self._dropped_warnings} more warnings")
            self._dropped_warnings = 0

    def warn(self, message: str) -> None:
        if len(self.warnings) < MAX_WARNINGS:
            self.warnings.append(message)
        else:
            self._dropped_warnings += 1

    # ---------------------------------------------------------------- sources
    def _json_lines(self) -> Iterator[tuple[int, Any]]:
        source = LineSource(self.path)
        self._compressed = source.compressed
        for lineno, raw, terminated in source:
            if lineno == 1 and raw.startswith(b"\xef\xbb\xbf"):
                raw = raw[3:]  # a byte-order mark some editors add
            try:
                data = from_json(raw)
            except ValueError as exc:
                if not raw.strip():
                    continue  # a blank line
                if not terminated:
                    # The last line, without its newline: cut off by a crash mid-write.
                    if lineno > 1:
                        self.warn(f"line {lineno} is cut off (the file ends mid-line); ignored")
                    break
                if lineno == 1:
                    raise RunLogError(
                        f"the header line is not valid JSON ({exc})", path=self.path, line=1
                    ) from None
                self._bad_line(lineno, "", f"not valid JSON ({exc})")
                continue
            yield lineno, data
        if source.corrupt is not None:
            self._corrupt(source.corrupt, None)
        elif source.truncated:
            self.warn("the gzip stream ends early (file cut off); loaded what was written")

    def _csv_lines(self) -> Iterator[tuple[int, Any]]:
        from .csvtable import iter_csv_events  # CSV import is rarely needed

        self._compressed = False
        yield from iter_csv_events(self.path, lenient=self.lenient, warn=self.warn)

    # ---------------------------------------------------------------- checks
    def _take_header(self, lineno: int, data: Any) -> None:
        if not isinstance(data, dict) or data.get("kind") != "header":
            kind = data.get("kind") if isinstance(data, dict) else type(data).__name__
            raise RunLogError(
                f"the first line must be the header (kind 'header'), not {kind!r}",
                path=self.path,
                line=lineno,
                field="kind",
            )
        if data.get("format") != FORMAT:
            raise RunLogError(
                f"not an undergrowth run log (format {data.get('format')!r}, expected {FORMAT!r})",
                path=self.path,
                line=lineno,
                field="format",
            )
        version = data.get("version")
        if type(version) is int and version > VERSION:
            raise RunLogVersionError(
                f"run-log version {version} is newer than this reader, which supports "
                f"version {VERSION}; upgrade undergrowth to read it",
                path=self.path,
                line=lineno,
                field="version",
            )
        from .schema import explain

        problem = explain(data)
        if problem is not None:
            raise RunLogError(problem[1], path=self.path, line=lineno, field=problem[0])
        self.header = data
        self.sense = data["model"]["sense"]

    def _bad_line(self, lineno: int, field: str, message: str) -> None:
        if self._compressed:
            # Damaged gzip data often decodes to garbage before zlib notices: say so.
            if self._gzip_checked is None:
                self._gzip_checked = gzip_problem(self.path) or ""
            if self._gzip_checked and self._gzip_checked != "truncated":
                self._corrupt(self._gzip_checked, lineno)
        if self._gzip_checked == "truncated":
            message += " (and the gzip stream ends early: the file may be damaged)"
        if not self.lenient:
            raise RunLogError(message, path=self.path, line=lineno, field=field or None)
        self.skipped += 1
        where = f"line {lineno}" + (f", field {field!r}" if field else "")
        self.warn(f"{where}: {message}; line skipped")

    def _corrupt(self, problem: str, lineno: int | None) -> None:
        message = f"the gzip data is damaged ({problem})"
        if lineno is not None:
            message += f"; line {lineno} and what follows cannot be trusted"
        if not self.lenient:
            raise RunLogError(message, path=self.path)
        self.warn(message + "; loaded what came before")
        raise _StopReading

    def _explain(self, lineno: int, data: Any) -> None:
        from .schema import explain

        problem = explain(data) or ("", "does not match the event contract")
        self._bad_line(lineno, problem[0], problem[1])

    def _events(self, source: Iterable[tuple[int, Any]]) -> Iterator[dict[str, Any]]:
        # The hot loop: one pass checks every line and fills the node columns.
        c = self.columns
        rows, lines = self.rows, self.line
        parent_rows, depths, statuses, bounds = (
            c["parent_row"], c["depth"], c["status"], c["bound"])  # fmt: skip
        add_id, add_parent, add_prow, add_depth, add_order, add_time, add_bound = (
            c["id"].append, c["parent"].append, parent_rows.append, depths.append,
            c["order"].append, c["time"].append, bounds.append)  # fmt: skip
        add_lp, add_status, add_bvar, add_bdir, add_bval, add_iter, add_frac = (
            c["lp_objective"].append, statuses.append, c["branch_var"].append,
            c["branch_dir"].append, c["branch_value"].append, c["iterations"].append,
            c["fractional"].append)  # fmt: skip
        add_inc, add_dual, add_line = c["incumbent"].append, c["dual_bound"].append, lines.append
        names = self.var_names
        sign = -1.0 if self.sense == "max" else 1.0  # compare in minimisation form
        status_code, direction_code = STATUS_CODE, DIRECTION_CODE
        nan = math.nan
        best, best_key, dual = nan, math.inf, nan
        root_row = root_id = -1
        after_end = False
        try:
            for lineno, data in source:
                kind = data.get("kind") if type(data) is dict else None
                if after_end and kind != "note":
                    self.warn(f"line {lineno}: {kind} event after the end event")
                    after_end = False  # say it once
                if kind == "node":
                    if not node_ok(data):
                        self._explain(lineno, data)
                        continue
                    nid, parent, depth = data["id"], data["parent"], data["depth"]
                    problem = None
                    prow = -1
                    if nid in rows:
                        first = lines[rows[nid]]
                        problem = "id", f"duplicate node id {nid} (first on line {first})"
                    elif parent is None:
                        if root_row >= 0:
                            problem = "parent", (
                                f"node {nid} is a second root (the root is node {root_id}, "
                                f"line {lines[root_row]})"
                            )
                        elif depth != 0:
                            problem = "depth", f"the root has depth {depth}, expected 0"
                    else:
                        prow = rows.get(parent, -1)
                        if prow < 0:
                            problem = "parent", f"node {nid}'s parent {parent} has not appeared"
                        elif statuses[prow] != BRANCHED:
                            problem = "parent", (
                                f"node {nid}'s parent {parent} (line {lines[prow]}) is "
                                f"{STATUSES[statuses[prow]]}, not branched"
                            )
                        elif depth != depths[prow] + 1:
                            problem = "depth", (
                                f"node {nid} has depth {depth} but its parent {parent} has "
                                f"depth {depths[prow]} (expected {depths[prow] + 1})"
                            )
                    if problem is not None:
                        self._bad_line(lineno, *problem)
                        continue
                    bound = data["bound"]
                    if bound is None:
                        bound = nan
                    elif prow >= 0:
                        pb = bounds[prow]
                        if sign * bound < sign * pb - BOUND_TOLERANCE * max(1.0, abs(pb)):
                            self.warn(
                                f"line {lineno}: node {nid}'s bound {bound!r} is better than its "
                                f"parent {parent}'s bound {pb!r} (a child cannot improve on it)"
                            )
                    if parent is None:
                        root_row, root_id = len(lines), nid
                        parent = -1
                    rows[nid] = len(lines)
                    add_line(lineno)
                    add_id(nid)
                    add_parent(parent)
                    add_prow(prow)
                    add_depth(depth)
                    v = data["order"]
                    add_order(-1 if v is None else v)
                    add_time(data["time"])
                    add_bound(bound)
                    lp = data["lp"]
                    if lp is None:
                        add_lp(nan)
                        add_iter(0)
                    else:
                        v = lp["objective"]
                        add_lp(nan if v is None else v)
                        add_iter(lp["iterations"])
                    add_status(status_code[data["status"]])
                    br = data["branch"]
                    if br is None:
                        add_bvar(-1)
                        add_bdir(0)
                        add_bval(nan)
                    else:
                        v = br["var"]
                        add_bvar(v)
                        add_bdir(direction_code[br["dir"]])
                        add_bval(br["value"])
                        if v not in names:
                            names[v] = br["name"]
                    add_frac(data["fractional"])
                    add_inc(best)
                    add_dual(dual)
                    yield data
                elif kind == "incumbent":
                    if not incumbent_ok(data):
                        self._explain(lineno, data)
                        continue
                    v = data["objective"]
                    if sign * v < best_key:
                        best_key, best = sign * v, v
                    self._series(self.incumbents, data)
                    yield data
                elif kind == "progress":
                    if not progress_ok(data):
                        self._explain(lineno, data)
                        continue
                    v = data["dual_bound"]
                    dual = nan if v is None else v
                    self._series(self.progress, data)
                    yield data
                elif kind == "end" or kind == "note":
                    from .schema import explain

                    problem = explain(data)
                    if problem is not None:
                        self._bad_line(lineno, *problem)
                        continue
                    if kind == "end":
                        if self.end is not None:
                            self.warn(f"line {lineno}: a second end event; the last one counts")
                        self.end = data
                        after_end = True
                    yield data
                elif kind == "header":
                    self._bad_line(
                        lineno, "kind", "a second header line (two run logs joined together?)"
                    )
                elif type(data) is dict and type(kind) is str:
                    self.warn(f"line {lineno}: unknown event kind {kind!r} ignored")
                else:
                    self._explain(lineno, data)
        except _StopReading:
            return

    @staticmethod
    def _series(series: dict[str, list[Any]], data: dict[str, Any]) -> None:
        for name, values in series.items():
            v = data[name]
            if v is None:
                v = -1 if name in ("order", "node") else math.nan
            elif name == "source":
                v = SOURCE_CODE[v]
            values.append(v)


class _StopReading(Exception):
    """Lenient reading of a damaged gzip stream stops at the damage."""


@dataclass
class RunLog:
    """A whole run log in memory: the header, the events after it, and warnings."""

    path: str
    header: dict[str, Any]
    events: list[dict[str, Any]]
    warnings: list[str] = field(default_factory=list)
    end: dict[str, Any] | None = None

    @property
    def nodes(self) -> list[dict[str, Any]]:
        return [e for e in self.events if e["kind"] == "node"]


def read_run(path: str | os.PathLike[str], *, lenient: bool = False) -> RunLog:
    """Read and validate a run log (or CSV node table) into memory."""
    reader = RunLogReader(path, lenient=lenient)
    events = list(reader)
    assert reader.header is not None
    return RunLog(reader.path, reader.header, events, reader.warnings, reader.end)
