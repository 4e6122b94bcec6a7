"""The run library: run files in the read-only samples directory and the writable
runs directory, their tables (memoised), summaries, uploads and deletes.

A run's id is its file name without ``.jsonl.gz`` / ``.jsonl`` / ``.csv``. When
both directories hold the same id, the samples' file wins (new uploads and
solves never pick a taken id). Tables are cached on disk under the cache
directory (``<cache>/<source>/<file>.table.npz``), so the samples directory
is never written to; a run that is still being written is read afresh.
"""

from __future__ import annotations

import contextlib
import gzip
import json
import math
import os
import threading
from collections import OrderedDict
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from ..analysis.table import RunTable
from ..runlog.codes import gap as relative_gap
from ..runlog.errors import RunLogError
from ..runlog.notes import notes_path
from .errors import Conflict, Forbidden, Invalid, NotFound
from .ids import RUN_SUFFIXES, check_id, split_name

__all__ = ["RunFile", "RunLibrary", "read_header_line"]

TABLE_MEMO = 2  # tables kept in memory: a million-node table is over 100 MB


@dataclass(frozen=True)
class RunFile:
    id: str
    source: str  # "samples" or "user"
    path: Path
    suffix: str

    @property
    def writable(self) -> bool:
        return self.source == "user"

    def stamp(self) -> tuple[int, int] | None:
        try:
            st = self.path.stat()
        except OSError:
            return None
        return st.st_size, st.st_mtime_ns


def read_header_line(path: Path) -> dict[str, Any] | None:
    """The header (first line) of a JSON Lines run log, plain or gzip; None if unreadable."""
    try:
        with open(path, "rb") as f:
            magic = f.read(2)
        opener = gzip.open if magic == b"\x1f\x8b" else open
        with opener(path, "rb") as f:
            line = f.readline(1 << 20)
        data = json.loads(line)
    except (OSError, EOFError, ValueError):
        return None
    return data if isinstance(data, dict) and data.get("kind") == "header" else None


def _num(v: Any) -> float | None:
    if v is None:
        return None
    v = float(v)
    return v if math.isfinite(v) else None


class RunLibrary:
    def __init__(self, *, samples_dir: Path | None, runs_dir: Path, cache_dir: Path,
                 is_live: Callable[[str], bool]) -> None:
        self.dirs: list[tuple[str, Path]] = []
        if samples_dir is not None:
            self.dirs.append(("samples", samples_dir))
        self.dirs.append(("user", runs_dir))
        self.runs_dir = runs_dir
        self.cache_dir = cache_dir
        self.is_live = is_live
        self._tables: OrderedDict[tuple[str, int, int], RunTable] = OrderedDict()
        self._summaries: dict[str, tuple[tuple[int, int], dict[str, Any]]] = {}
        self._lock = threading.Lock()
        self._building: dict[str, threading.Lock] = {}

    # ---------------------------------------------------------------- finding runs
    def scan(self) -> list[RunFile]:
        """Every run file, one per id (samples first, then longest suffix first)."""
        seen: dict[str, RunFile] = {}
        for source, directory in self.dirs:
            try:
                names = sorted(os.listdir(directory))
            except OSError:
                continue
            found: dict[str, RunFile] = {}
            for name in names:
                parts = split_name(name, RUN_SUFFIXES)
                if parts is None:
                    continue
                run_id, suffix = parts
                rf = RunFile(run_id, source, directory / name, suffix)
                best = found.get(run_id)
                if best is None or RUN_SUFFIXES.index(suffix) < RUN_SUFFIXES.index(best.suffix):
                    found[run_id] = rf
            for run_id, rf in found.items():
                seen.setdefault(run_id, rf)
        return list(seen.values())

    def find(self, run_id: str) -> RunFile | None:
        check_id(run_id)
        for source, directory in self.dirs:
            for suffix in RUN_SUFFIXES:
                path = directory / f"{run_id}{suffix}"
                if path.is_file():
                    return RunFile(run_id, source, path, suffix)
        return None

    def require(self, run_id: str) -> RunFile:
        rf = self.find(run_id)
        if rf is None:
            raise NotFound(f"no run {run_id!r}", detail={"id": run_id})
        return rf

    def taken_ids(self) -> set[str]:
        return {rf.id for rf in self.scan()}

    def live(self, rf: RunFile) -> bool:
        return rf.writable and self.is_live(rf.id)

    # ---------------------------------------------------------------- tables
    def cache_file(self, rf: RunFile, suffix: str = ".table.npz") -> str:
        return str(self.cache_dir / rf.source / (rf.path.name + suffix))

    def open_table(self, rf: RunFile) -> RunTable:
        """The run as columns (blocking: call it from a worker thread). RunLogError → 422."""
        stamp = rf.stamp()
        if stamp is None:
            raise NotFound(f"no run {rf.id!r}", detail={"id": rf.id})
        if self.live(rf):
            return self._read(rf, use_cache=False)  # growing: nothing worth keeping
        key = (str(rf.path), *stamp)
        with self._lock:
            table = self._tables.get(key)
            if table is not None:
                self._tables.move_to_end(key)
                return table
            building = self._building.setdefault(str(rf.path), threading.Lock())
        with building:  # two requests for one big run: build it once
            with self._lock:
                table = self._tables.get(key)
            if table is None:
                table = self._read(rf, use_cache=True)
                with self._lock:
                    self._tables[key] = table
                    while len(self._tables) > TABLE_MEMO:
                        self._tables.popitem(last=False)
        return table

    def _read(self, rf: RunFile, *, use_cache: bool) -> RunTable:
        if use_cache:
            with contextlib.suppress(OSError):
                (self.cache_dir / rf.source).mkdir(parents=True, exist_ok=True)
        try:
            # Lenient: an inspector shows what it can of a damaged run, with warnings.
            return RunTable.open(rf.path, lenient=True, use_cache=use_cache,
                                 cache_file=self.cache_file(rf))
        except RunLogError as exc:
            raise Invalid(f"run {rf.id!r} cannot be read: {exc.reason}", code="unreadable-run",
                          detail={"id": rf.id, "line": exc.line, "field": exc.field}) from None
        except OSError as exc:
            raise NotFound(f"run {rf.id!r} cannot be opened: {exc.strerror}",
                           detail={"id": rf.id}) from None

    # ---------------------------------------------------------------- summaries
    def summary(self, rf: RunFile) -> dict[str, Any]:
        """Figures of the run (blocking; memoised per file version)."""
        stamp = rf.stamp()
        memo = self._summaries.get(str(rf.path))
        if memo is not None and memo[0] == stamp and not self.live(rf):
            return memo[1]
        table = self.open_table(rf)
        result = summarise(table)
        if stamp is not None and not self.live(rf):
            self._summaries[str(rf.path)] = (stamp, result)
        return result

    # ---------------------------------------------------------------- writing
    def delete(self, rf: RunFile) -> None:
        if not rf.writable:
            raise Forbidden(f"run {rf.id!r} is a bundled sample and cannot be deleted",
                            code="sample-run", detail={"id": rf.id})
        if self.is_live(rf.id):
            raise Conflict(f"run {rf.id!r} is still being solved; cancel it first",
                           detail={"id": rf.id})
        rf.path.unlink(missing_ok=True)
        # Its notes go with it: a later run of the same name would not match them.
        notes_path(rf.path).unlink(missing_ok=True)
        for suffix in (".table.npz", ".layout.npz", ".nodes.npz"):
            with contextlib.suppress(OSError):
                Path(self.cache_file(rf, suffix)).unlink()
        self._summaries.pop(str(rf.path), None)

    def place(self, tmp: Path, run_id: str, suffix: str) -> RunFile:
        """Move a validated upload into the runs directory under ``run_id``."""
        target = self.runs_dir / f"{run_id}{suffix}"
        fd = os.open(target, os.O_CREAT | os.O_EXCL | os.O_WRONLY, 0o644)  # reserve the name
        os.close(fd)
        os.replace(tmp, target)
        return RunFile(run_id, "user", target, suffix)


def summarise(table: RunTable) -> dict[str, Any]:
    """The figures `GET /api/runs/{id}` reports (JSON-ready: no NaN)."""
    end = table.end
    n = len(table)
    counts = table.count_by_status()
    processed = int((table.order >= 0).sum()) if n else 0
    sense = table.sense
    objective = dual = None
    if end is not None:
        objective, dual, gap = _num(end.get("objective")), _num(end.get("dual_bound")), \
            _num(end.get("gap"))
        seconds = _num(end.get("time"))
        nodes = int(end.get("nodes", processed))
    else:
        inc = table.incumbents.objective
        if len(inc):
            objective = _num(inc.min() if sense == "min" else inc.max())
        duals = table.progress.dual_bound
        if len(duals):
            dual = _num(duals[-1])
        gap = _num(relative_gap(objective, dual))
        times = [float(table.time.max())] if n else []
        if len(table.progress):
            times.append(float(table.progress.time[-1]))
        seconds = max(times) if times else None
        nodes = processed
    return {
        "nodes": nodes,
        "tree_nodes": n,
        "nodes_by_status": counts,
        "max_depth": int(table.depth.max()) if n else 0,
        "end_status": None if end is None else end.get("status"),
        "complete": None if end is None else end.get("complete"),
        "objective": objective,
        "dual_bound": dual,
        "gap": gap,
        "seconds": seconds,
        "incumbents": len(table.incumbents),
        "lp_iterations": int(end["lp_iterations"]) if end is not None and
        "lp_iterations" in end else int(table.iterations.sum()) if n else 0,
        "sense": sense,
    }
