"""`RunTable`: a run log as columns, one numpy array per field, built in one pass.

Rows are nodes in order of appearance in the log (row != node id: ids may be
any non-negative integers; `row_of` maps back). Unknown values are -1 for
integers and NaN for floats. Code tables:

    status  (uint8)  0 branched, 1 integral, 2 pruned, 3 infeasible,
                     4 discarded, 5 open, 6 failed      (`STATUSES[code]`)
    branch_dir       0 none (root or unknown), 1 down, 2 up
    source  (uint8)  0 integral, 1 rounding, 2 start, 3 external

``incumbent`` and ``dual_bound`` are the global figures when the node's event
appeared: the best incumbent event so far and the last progress dual bound.

A table is cached beside the run as ``<file>.table.npz``, keyed by the file's
size, modification time and a blake2b hash of its first and last 64 KiB (plus
the size); a stale, foreign or damaged cache is rebuilt and rewritten, and an
unwritable directory just means no cache.
"""

from __future__ import annotations

import contextlib
import gc
import hashlib
import json
import os
import secrets
from array import array
from collections import deque
from collections.abc import Iterator
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from ..runlog.codes import SOURCES, STATUSES

__all__ = ["IncumbentSeries", "ProgressSeries", "RunTable", "STATUSES", "SOURCES"]

CACHE_SUFFIX = ".table.npz"
CACHE_FORMAT = 1  # bump when the arrays or their meaning change
_HASH_SPAN = 1 << 16

NODE_COLUMNS: dict[str, str] = {
    "id": "int64",
    "parent": "int64",
    "parent_row": "int64",
    "depth": "int64",
    "order": "int64",
    "time": "float64",
    "bound": "float64",
    "lp_objective": "float64",
    "status": "uint8",
    "branch_var": "int64",
    "branch_dir": "uint8",
    "branch_value": "float64",
    "iterations": "int64",
    "fractional": "int64",
    "incumbent": "float64",
    "dual_bound": "float64",
}
INCUMBENT_COLUMNS = {"time": "float64", "order": "int64", "node": "int64",
                     "objective": "float64", "source": "uint8"}  # fmt: skip
PROGRESS_COLUMNS = {"time": "float64", "nodes": "int64", "open": "int64", "dual_bound": "float64",
                    "primal_bound": "float64", "gap": "float64",
                    "tree_weight": "float64"}  # fmt: skip


@dataclass
class IncumbentSeries:
    """Each improving solution: time, processing order (-1), node id (-1), objective, source."""

    time: np.ndarray
    order: np.ndarray
    node: np.ndarray
    objective: np.ndarray
    source: np.ndarray

    def __len__(self) -> int:
        return len(self.time)


@dataclass
class ProgressSeries:
    """Global snapshots: time, nodes, open, dual and primal bound, gap (NaN unknown), weight."""

    time: np.ndarray
    nodes: np.ndarray
    open: np.ndarray
    dual_bound: np.ndarray
    primal_bound: np.ndarray
    gap: np.ndarray
    tree_weight: np.ndarray

    def __len__(self) -> int:
        return len(self.time)


@dataclass(eq=False)
class RunTable:
    """Columns of one run. Open one with `RunTable.open`."""

    path: str
    header: dict[str, Any]
    end: dict[str, Any] | None
    warnings: list[str]
    columns: dict[str, np.ndarray]
    incumbents: IncumbentSeries
    progress: ProgressSeries
    var_names: dict[int, str] = field(default_factory=dict)
    skipped: int = 0  # lines skipped by a lenient read
    from_cache: bool = False

    # ---------------------------------------------------------------- access
    def __getattr__(self, name: str) -> np.ndarray:
        # Node columns read as attributes: table.bound, table.status, ...
        columns = self.__dict__.get("columns")
        if columns is not None and name in columns:
            return columns[name]
        raise AttributeError(name)

    def __len__(self) -> int:
        return len(self.columns["id"])

    @property
    def sense(self) -> str:
        return self.header["model"]["sense"]

    def row_of(self, node_id: int) -> int:
        """Row of a node id; KeyError if the run has no such node."""
        ids = self.columns["id"]
        if "_sorted" not in self.__dict__:
            self.__dict__["_sorted"] = np.argsort(ids, kind="stable")
        order = self.__dict__["_sorted"]
        at = int(np.searchsorted(ids, node_id, sorter=order))
        if at < len(ids) and ids[order[at]] == node_id:
            return int(order[at])
        raise KeyError(f"no node with id {node_id}")

    def count_by_status(self) -> dict[str, int]:
        counts = np.bincount(self.columns["status"], minlength=len(STATUSES))
        return {name: int(counts[code]) for code, name in enumerate(STATUSES)}

    # ---------------------------------------------------------------- opening
    @classmethod
    def open(
        cls,
        path: str | os.PathLike[str],
        *,
        lenient: bool = False,
        use_cache: bool = True,
        cache_file: str | os.PathLike[str] | None = None,
    ) -> RunTable:
        """Read a run log or CSV node table (RunLogError if invalid), from cache if current.

        ``cache_file`` puts the cache somewhere other than beside the run (for runs in
        a directory that should not be written to)."""
        path = os.fspath(path)
        target = os.fspath(cache_file) if cache_file is not None else cache_path(path)
        key = _cache_key(path) if use_cache else None
        if key is not None:
            table = _load_cache(path, key, lenient=lenient, target=target)
            if table is not None:
                return table
        table = build_table(path, lenient=lenient)
        if key is not None:
            _save_cache(table, key, target=target)
        return table


# -------------------------------------------------------------------- one pass
def build_table(path: str, *, lenient: bool = False) -> RunTable:
    """Read and validate the run once; the reader fills the columns as lines go by."""
    from ..runlog.reader import RunLogReader

    reader = RunLogReader(path, lenient=lenient)
    with _gc_paused():
        header = reader.read_header()
        deque(reader, maxlen=0)  # run the pass; the events themselves are not kept
    return RunTable(
        path=path,
        header=header,
        end=reader.end,
        warnings=list(reader.warnings),
        columns={k: _as_array(v, NODE_COLUMNS[k]) for k, v in reader.columns.items()},
        incumbents=IncumbentSeries(
            **{k: np.asarray(v, dtype=INCUMBENT_COLUMNS[k]) for k, v in reader.incumbents.items()}
        ),
        progress=ProgressSeries(
            **{k: np.asarray(v, dtype=PROGRESS_COLUMNS[k]) for k, v in reader.progress.items()}
        ),
        var_names=reader.var_names,
        skipped=reader.skipped,
    )


@contextlib.contextmanager
def _gc_paused() -> Iterator[None]:
    # The pass allocates millions of short-lived, acyclic dicts; the cycle collector
    # would rescan the growing heap again and again (about a third of the time at 1M nodes).
    was_enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if was_enabled:
            gc.enable()


def _as_array(values: array | bytearray, dtype: str) -> np.ndarray:
    # array.array holds machine values: numpy views them without a copy.
    kind = np.uint8 if isinstance(values, bytearray) else values.typecode
    view = np.frombuffer(values, dtype=kind)
    return view if view.dtype == dtype else view.astype(dtype)


# -------------------------------------------------------------------- cache
def _cache_key(path: str) -> dict[str, Any] | None:
    try:
        st = os.stat(path)
        with open(path, "rb") as f:
            digest = hashlib.blake2b(digest_size=16)
            digest.update(str(st.st_size).encode())
            digest.update(f.read(_HASH_SPAN))
            if st.st_size > _HASH_SPAN:
                f.seek(max(_HASH_SPAN, st.st_size - _HASH_SPAN))
                digest.update(f.read(_HASH_SPAN))
    except OSError:
        return None
    return {
        "cache_format": CACHE_FORMAT,
        "size": st.st_size,
        "mtime_ns": st.st_mtime_ns,
        "hash": digest.hexdigest(),
    }


def cache_path(path: str) -> str:
    return path + CACHE_SUFFIX


def _load_cache(
    path: str, key: dict[str, Any], *, lenient: bool, target: str | None = None
) -> RunTable | None:
    try:
        with np.load(target or cache_path(path), allow_pickle=False) as npz:
            meta = json.loads(bytes(npz["meta"]).decode("utf-8"))
            if meta.get("key") != key:
                return None
            # A lenient read that skipped lines is not what a strict open must report.
            if meta["skipped"] and not lenient:
                return None
            columns = {k: npz["node_" + k] for k in NODE_COLUMNS}
            inc = {k: npz["inc_" + k] for k in INCUMBENT_COLUMNS}
            prog = {k: npz["prog_" + k] for k in PROGRESS_COLUMNS}
            var_ids, var_names = npz["var_ids"], npz["var_names"]
        n = len(columns["id"])
        if any(len(a) != n or a.dtype != NODE_COLUMNS[k] for k, a in columns.items()):
            return None
        return RunTable(
            path=path,
            header=meta["header"],
            end=meta["end"],
            warnings=meta["warnings"],
            columns=columns,
            incumbents=IncumbentSeries(**inc),
            progress=ProgressSeries(**prog),
            var_names=dict(zip(var_ids.tolist(), var_names.tolist(), strict=True)),
            skipped=meta["skipped"],
            from_cache=True,
        )
    except Exception:  # noqa: BLE001 - any unreadable cache is simply rebuilt
        return None


def _save_cache(table: RunTable, key: dict[str, Any], *, target: str | None = None) -> None:
    meta = {
        "key": key,
        "header": table.header,
        "end": table.end,
        "warnings": table.warnings,
        "skipped": table.skipped,
    }
    arrays = {"meta": np.frombuffer(json.dumps(meta).encode("utf-8"), dtype=np.uint8)}
    arrays.update({"node_" + k: v for k, v in table.columns.items()})
    inc, prog = table.incumbents, table.progress
    arrays.update({"inc_" + k: getattr(inc, k) for k in INCUMBENT_COLUMNS})
    arrays.update({"prog_" + k: getattr(prog, k) for k in PROGRESS_COLUMNS})
    arrays["var_ids"] = np.array(list(table.var_names), dtype=np.int64)
    arrays["var_names"] = np.array(list(table.var_names.values()), dtype=np.str_)
    target = target or cache_path(table.path)
    tmp = None
    try:
        # A unique name beside the target, then an atomic rename: readers never see half a file.
        tmp = f"{target}.{os.getpid()}.{secrets.token_hex(4)}.tmp"
        with open(tmp, "xb") as f:
            np.savez(f, **arrays)  # uncompressed: a warm open is a plain read
        os.replace(tmp, target)
        tmp = None
    except OSError:
        pass  # a read-only directory: no cache, no complaint
    finally:
        if tmp is not None:
            with contextlib.suppress(OSError):
                os.unlink(tmp)
