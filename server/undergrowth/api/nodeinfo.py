"""One node in full: its event, the path from the root, its children, and why it
ended as it did.

`RunTable` keeps the columns a tree needs; the rest of a node event (the
relaxation's status and seconds, the branching decision's score, look-ahead
bounds and runner-up, messages) is read in a second pass the first time a
node of a run is asked for, and cached beside the table cache as
``<file>.nodes.npz``. Rows line up with the table's because both come from the
same validating reader over the same file (a live run's file only grows, so
a longer pass still agrees on every row both have).
"""

from __future__ import annotations

import contextlib
import gc
import json
import math
import os
import secrets
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..analysis.reasons import status_reason
from ..analysis.table import RunTable
from ..runlog.codes import DIRECTIONS, LP_STATUSES, SOURCES, STATUSES

__all__ = ["NodeExtras", "load_extras", "node_detail", "node_events"]

NO_LP = 255
EXTRAS_FORMAT = 2  # 2 added the fractional candidates (_CANDS)
_FLOATS = ("lp_seconds", "score", "br_value", "down_bound", "up_bound", "runner_score")
_INTS = ("br_var", "runner_var")
# A branched node's recorded fractional candidates, ragged: row r holds
# cand_var/cand_value[cand_start[r]:cand_start[r + 1]]; cand_has[r] is 0 for a row
# whose event recorded none (older logs, nodes that did not branch).
_CANDS = ("cand_start", "cand_has", "cand_var", "cand_value")


@dataclass
class NodeExtras:
    """Per-row fields of node events that the table does not hold."""

    arrays: dict[str, np.ndarray]  # lp_status (uint8), rule (int16), _FLOATS, _INTS, _CANDS
    rules: list[str]
    names: dict[int, str]
    messages: dict[int, str]

    def __len__(self) -> int:
        return len(self.arrays["lp_status"])


def _nan(v: Any) -> float:
    return math.nan if v is None else float(v)


def build_extras(path: str) -> NodeExtras:
    from ..runlog.reader import RunLogReader

    reader = RunLogReader(path, lenient=True)
    lp_status, rule = bytearray(), []
    cols: dict[str, list[Any]] = {k: [] for k in _FLOATS + _INTS}
    rules: dict[str, int] = {}
    names: dict[int, str] = {}
    messages: dict[int, str] = {}
    cand_start: list[int] = []
    cand_has = bytearray()
    cand_var: list[int] = []
    cand_value: list[float] = []
    codes = {s: i for i, s in enumerate(LP_STATUSES)}
    row = 0
    was_enabled = gc.isenabled()
    gc.disable()  # many short-lived dicts, no cycles (as in the table's pass)
    try:
        for ev in reader:
            if ev.get("kind") != "node":
                continue
            lp = ev["lp"]
            lp_status.append(NO_LP if lp is None else codes.get(lp["status"], NO_LP))
            cols["lp_seconds"].append(math.nan if lp is None else float(lp["seconds"]))
            b = ev["branching"]
            if b is None:
                for k in _FLOATS[1:]:
                    cols[k].append(math.nan)
                cols["br_var"].append(-1)
                cols["runner_var"].append(-1)
                rule.append(-1)
                cand_start.append(len(cand_var))
                cand_has.append(0)
            else:
                cols["score"].append(_nan(b["score"]))
                cols["br_value"].append(float(b["value"]))
                cols["down_bound"].append(_nan(b["down_bound"]))
                cols["up_bound"].append(_nan(b["up_bound"]))
                cols["br_var"].append(b["var"])
                names.setdefault(b["var"], b["name"])
                ru = b["runner_up"]
                cols["runner_var"].append(-1 if ru is None else ru["var"])
                cols["runner_score"].append(math.nan if ru is None else _nan(ru["score"]))
                if ru is not None:
                    names.setdefault(ru["var"], ru["name"])
                rule.append(rules.setdefault(str(b["rule"]), len(rules)))
                cands = b.get("candidates")
                cand_start.append(len(cand_var))
                cand_has.append(cands is not None)
                if cands is not None:
                    for j, v in cands:
                        cand_var.append(int(j))
                        cand_value.append(float(v))
            br = ev["branch"]
            if br is not None:
                names.setdefault(br["var"], br["name"])
            if ev["message"]:
                messages[row] = ev["message"]
            row += 1
    finally:
        if was_enabled:
            gc.enable()
    arrays = {"lp_status": np.frombuffer(bytes(lp_status), dtype=np.uint8).copy(),
              "rule": np.asarray(rule, dtype=np.int16)}
    arrays.update({k: np.asarray(cols[k], dtype=np.float64) for k in _FLOATS})
    arrays.update({k: np.asarray(cols[k], dtype=np.int64) for k in _INTS})
    arrays["cand_start"] = np.asarray(cand_start + [len(cand_var)], dtype=np.int64)
    arrays["cand_has"] = np.frombuffer(bytes(cand_has), dtype=np.uint8).copy()
    arrays["cand_var"] = np.asarray(cand_var, dtype=np.int64)
    arrays["cand_value"] = np.asarray(cand_value, dtype=np.float64)
    return NodeExtras(arrays, list(rules), names, messages)


def load_extras(path: str, *, cache_file: str | None) -> NodeExtras:
    """The extras of ``path``, from ``cache_file`` when it is current (None: no cache)."""
    from ..analysis.table import _cache_key  # the table's freshness key, on purpose

    key = None if cache_file is None else _cache_key(path)
    if key is not None:
        key = {**key, "extras_format": EXTRAS_FORMAT}
        cached = _load(cache_file, key)
        if cached is not None:
            return cached
    extras = build_extras(path)
    if key is not None:
        _save(cache_file, key, extras)
    return extras


def _load(target: str, key: dict[str, Any]) -> NodeExtras | None:
    try:
        with np.load(target, allow_pickle=False) as npz:
            meta = json.loads(bytes(npz["meta"]).decode("utf-8"))
            if meta.get("key") != key:
                return None
            arrays = {k: npz[k] for k in ("lp_status", "rule", *_FLOATS, *_INTS, *_CANDS)}
        return NodeExtras(arrays, meta["rules"], {int(k): v for k, v in meta["names"].items()},
                          {int(k): v for k, v in meta["messages"].items()})
    except Exception:  # noqa: BLE001 - an unreadable cache is simply rebuilt
        return None


def _save(target: str, key: dict[str, Any], extras: NodeExtras) -> None:
    meta = json.dumps({"key": key, "rules": extras.rules, "names": extras.names,
                       "messages": extras.messages}).encode("utf-8")
    tmp = f"{target}.{os.getpid()}.{secrets.token_hex(4)}.tmp"
    try:
        with open(tmp, "xb") as f:
            np.savez(f, meta=np.frombuffer(meta, dtype=np.uint8), **extras.arrays)
        os.replace(tmp, target)
    except OSError:
        with contextlib.suppress(OSError):
            os.unlink(tmp)


# ------------------------------------------------------------------------ one node
def _f(v: float) -> float | None:
    v = float(v)
    return v if math.isfinite(v) else None


class _View:
    """Reads node fields by row from the table and the extras."""

    def __init__(self, table: RunTable, extras: NodeExtras) -> None:
        self.t = table
        self.c = table.columns
        self.x = extras
        self.names = {**extras.names, **table.var_names}

    def name(self, var: int) -> str:
        return self.names.get(var, f"x{var}")

    def branch(self, r: int) -> dict[str, Any] | None:
        var = int(self.c["branch_var"][r])
        if var < 0:
            return None
        return {"var": var, "name": self.name(var),
                "dir": DIRECTIONS[int(self.c["branch_dir"][r])],
                "value": _f(self.c["branch_value"][r])}

    def candidates(self, r: int) -> list[list[Any]] | None:
        """The fractional [column, value] pairs the node's event recorded, or None."""
        a = self.x.arrays
        if r >= len(self.x) or not a["cand_has"][r]:
            return None
        start, stop = int(a["cand_start"][r]), int(a["cand_start"][r + 1])
        return [[int(j), float(v)] for j, v in
                zip(a["cand_var"][start:stop], a["cand_value"][start:stop], strict=True)]

    def branching(self, r: int) -> dict[str, Any] | None:
        a = self.x.arrays
        if r >= len(self.x) or a["br_var"][r] < 0:
            return None
        var = int(a["br_var"][r])
        ru = int(a["runner_var"][r])
        code = int(a["rule"][r])
        out = {"var": var, "name": self.name(var), "value": _f(a["br_value"][r]),
                "score": _f(a["score"][r]),
                "rule": self.x.rules[code] if code >= 0 else None,
                "down_bound": _f(a["down_bound"][r]), "up_bound": _f(a["up_bound"][r]),
                "runner_up": None if ru < 0 else {"var": ru, "name": self.name(ru),
                                                  "score": _f(a["runner_score"][r])}}
        cands = self.candidates(r)
        if cands is not None:
            out["candidates"] = cands
        return out

    def lp(self, r: int) -> dict[str, Any] | None:
        if r >= len(self.x) or self.x.arrays["lp_status"][r] == NO_LP:
            return None
        return {"status": LP_STATUSES[int(self.x.arrays["lp_status"][r])],
                "objective": _f(self.c["lp_objective"][r]),
                "iterations": int(self.c["iterations"][r]),
                "seconds": _f(self.x.arrays["lp_seconds"][r])}

    def event(self, r: int) -> dict[str, Any]:
        c = self.c
        prow = int(c["parent_row"][r])
        order = int(c["order"][r])
        return {"kind": "node", "id": int(c["id"][r]),
                "parent": None if prow < 0 else int(c["id"][prow]),
                "depth": int(c["depth"][r]), "order": None if order < 0 else order,
                "time": float(c["time"][r]), "branch": self.branch(r), "lp": self.lp(r),
                "bound": _f(c["bound"][r]), "fractional": int(c["fractional"][r]),
                "status": STATUSES[int(c["status"][r])], "branching": self.branching(r),
                "message": self.x.messages.get(r)}

    def step(self, r: int) -> dict[str, Any]:
        """One entry of the path from the root."""
        c = self.c
        b = self.branching(r)
        return {"id": int(c["id"][r]), "depth": int(c["depth"][r]),
                "status": STATUSES[int(c["status"][r])], "branch": self.branch(r),
                "bound": _f(c["bound"][r]), "lp_objective": _f(c["lp_objective"][r]),
                "iterations": int(c["iterations"][r]), "fractional": int(c["fractional"][r]),
                "branching": b}


def node_events(table: RunTable, extras: NodeExtras
                ) -> tuple[Callable[[int], dict[str, Any]], dict[int, str]]:
    """``event_of(row)`` rebuilding a node's full event, and the column names known."""
    view = _View(table, extras)
    return view.event, dict(view.names)


def _incumbent_entry(table: RunTable, i: int) -> dict[str, Any]:
    inc = table.incumbents
    node, order = int(inc.node[i]), int(inc.order[i])
    return {"objective": float(inc.objective[i]), "node": None if node < 0 else node,
            "order": None if order < 0 else order, "time": float(inc.time[i]),
            "source": SOURCES[int(inc.source[i])]}


def _best(table: RunTable, mask: np.ndarray) -> int | None:
    idx = np.flatnonzero(mask)
    if not len(idx):
        return None
    values = table.incumbents.objective[idx]
    pick = np.argmin(values) if table.sense == "min" else np.argmax(values)
    return int(idx[pick])  # argmin/argmax return the earliest among ties


def _incumbent_when_decided(table: RunTable, row: int, *, strictly_before: bool) -> int | None:
    inc = table.incumbents
    if not len(inc):
        return None
    order = int(table.columns["order"][row])
    if order >= 0:
        mask = inc.order < order if strictly_before else inc.order <= order
        return _best(table, mask)
    value = float(table.columns["incumbent"][row])  # never solved: best when it was written
    if math.isnan(value):
        return None
    hits = np.flatnonzero(inc.objective == value)
    return int(hits[0]) if len(hits) else None


def node_detail(table: RunTable, extras: NodeExtras, row: int) -> dict[str, Any]:
    """Everything `GET /api/runs/{id}/nodes/{node}` answers for the node in ``row``."""
    view = _View(table, extras)
    c = table.columns
    event = view.event(row)
    chain = []
    r = row
    while r >= 0:
        chain.append(r)
        r = int(c["parent_row"][r])
    chain.reverse()
    path = [view.step(r) for r in chain]
    changes = [{**s["branch"], "node": s["id"], "depth": s["depth"]} for s in path
               if s["branch"] is not None]
    kids = np.flatnonzero(c["parent_row"] == row)
    kids = kids[np.lexsort((kids, c["branch_dir"][kids]))]  # down child first
    children = [int(c["id"][k]) for k in kids]
    status = event["status"]
    node_id = event["id"]
    here = np.flatnonzero(table.incumbents.node == node_id)
    found_here = _incumbent_entry(table, int(here[-1])) if len(here) else None
    at = _incumbent_when_decided(table, row, strictly_before=status == "integral")
    incumbent = None if at is None else _incumbent_entry(table, at)
    end_status = None if table.end is None else table.end.get("status")
    return {
        "node": event,
        "row": int(row),
        "path": path,
        "bound_changes": changes,
        "children": children,
        "status": status,
        "reason": status_reason(status=status, node=event, incumbent=incumbent,
                                found_here=found_here, children=children,
                                end_status=end_status),
        "incumbent": incumbent,
        "found_incumbent": found_here,
    }
