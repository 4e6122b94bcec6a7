"""Turn a search described node by node into contract-shaped events, checking as it goes.

Shared by `Recorder` (a user's own search) and the CSV import, so both fill in
the same defaults: processing order, depth from the parent, the relaxation
record, inherited bounds for discarded/open nodes, and the global figures of a
progress or end event (open nodes, dual bound, gap, tree weight).

Open-node accounting assumes two children per branched node, which is what
the contract's ``branch`` (down/up) describes; record every child, including
ones you discard without solving, or the run will end as "incomplete".
"""

from __future__ import annotations

import heapq
import math
import operator
from typing import Any, NamedTuple

from .codes import (
    CLOSED_LEAF_STATUSES,
    END_STATUSES,
    LP_STATUSES,
    SOLVED_STATUSES,
    SOURCES,
    STATUSES,
    gap,
)

__all__ = ["TreeError", "TreeTracker"]


class TreeError(ValueError):
    """A node or incumbent that does not fit the tree recorded so far; ``field`` names the input."""

    def __init__(self, message: str, *, field: str) -> None:
        self.field = field
        super().__init__(message)


class _Seen(NamedTuple):
    status: str
    depth: int
    bound: float | None
    order: int | None


def _int(value: Any, field: str, *, minimum: int | None = 0) -> int:
    try:
        number = operator.index(value)  # int and numpy integers, not floats or bools
    except TypeError:
        raise TreeError(f"{field} must be an integer, not {value!r}", field=field) from None
    if isinstance(value, bool):
        raise TreeError(f"{field} must be an integer, not {value!r}", field=field)
    if minimum is not None and number < minimum:
        raise TreeError(f"{field} must be >= {minimum}, not {number}", field=field)
    return number


def _float(value: Any, field: str, *, finite: bool = True) -> float:
    try:
        number = float(value)
    except (TypeError, ValueError):
        raise TreeError(f"{field} must be a number, not {value!r}", field=field) from None
    if isinstance(value, bool) or (finite and not math.isfinite(number)):
        raise TreeError(f"{field} must be a finite number, not {value!r}", field=field)
    return number


def _opt_float(value: Any, field: str) -> float | None:
    """A number, or None for None, NaN and ±inf (the log's "unknown")."""
    if value is None:
        return None
    number = _float(value, field, finite=False)
    return number if math.isfinite(number) else None


class TreeTracker:
    """Validate nodes against the tree so far and build their events."""

    def __init__(self, *, sense: str = "min", rule: str = "custom") -> None:
        if sense not in ("min", "max"):
            raise TreeError(f"sense must be 'min' or 'max', not {sense!r}", field="sense")
        self.sense = sense
        self.rule = rule
        self._sign = -1.0 if sense == "max" else 1.0
        self.nodes: dict[int, _Seen] = {}
        self.root: int | None = None
        self.solved = 0
        self.lp_iterations = 0
        self.lp_seconds = 0.0
        self.best: float | None = None
        self.tree_weight = 0.0
        self.last_time = 0.0
        self._next_order = 0
        self._pending: dict[int, int] = {}  # branched node -> children not yet recorded
        self._open = 0
        self._slots: list[tuple[float, int]] = []  # (bound in min form, branched node id)
        self._open_nodes: list[float] = []  # bounds (min form) of nodes recorded as open

    # ---------------------------------------------------------------- nodes
    def node(
        self,
        id: Any,
        parent: Any,
        status: str,
        bound: Any,
        *,
        time: float,
        depth: Any = None,
        order: Any = None,
        branch: Any = None,
        lp_objective: Any = None,
        lp_status: str | None = None,
        iterations: Any = 0,
        lp_seconds: Any = 0.0,
        fractional: Any = 0,
        branching: Any = None,
        message: str | None = None,
        extra: dict[str, Any] | None = None,
    ) -> dict[str, Any]:
        """Check one node against the tree so far and return its node event."""
        nid = _int(id, "id")
        if nid in self.nodes:
            raise TreeError(f"node {nid} was already recorded", field="id")
        if status not in STATUSES:
            raise TreeError(
                f"node {nid}: status {status!r} is not one of {', '.join(STATUSES)}",
                field="status",
            )
        pid: int | None = None
        if parent is None:
            if self.root is not None:
                raise TreeError(
                    f"node {nid} has no parent, but the root (node {self.root}) was already "
                    "recorded",
                    field="parent",
                )
            expected_depth = 0
            inherited = None
        else:
            pid = _int(parent, "parent")
            seen = self.nodes.get(pid)
            if seen is None:
                raise TreeError(
                    f"node {nid}: parent {pid} has not been recorded (record a parent first)",
                    field="parent",
                )
            if seen.status != "branched":
                raise TreeError(
                    f"node {nid}: parent {pid} is {seen.status}, not branched", field="parent"
                )
            expected_depth = seen.depth + 1
            inherited = seen.bound
        if depth is None:
            depth = expected_depth
        elif _int(depth, "depth") != expected_depth:
            raise TreeError(
                f"node {nid}: depth {depth} does not follow from its parent "
                f"(expected {expected_depth})",
                field="depth",
            )
        value = _opt_float(bound, "bound")
        solved = status in SOLVED_STATUSES
        if value is None and not solved:
            value = inherited  # a discarded or open node keeps its parent's bound
        if order is not None:
            order = _int(order, "order")
        elif solved:
            order = self._next_order
        if order is not None:
            self._next_order = max(self._next_order, order + 1)
        lp = None
        if solved:
            if lp_status is None:
                lp_status = status if status in ("infeasible", "failed") else "optimal"
            elif lp_status not in LP_STATUSES:
                raise TreeError(
                    f"lp_status {lp_status!r} is not one of {', '.join(LP_STATUSES)}",
                    field="lp.status",
                )
            objective = _opt_float(lp_objective, "lp.objective")
            if objective is None and lp_status == "optimal":
                objective = value
            lp = {
                "status": lp_status,
                "objective": objective,
                "iterations": _int(iterations, "lp.iterations"),
                "seconds": _float(lp_seconds, "lp.seconds"),
            }
        elif lp_objective is not None:
            raise TreeError(
                f"node {nid} is {status}, so it was never solved: lp_objective must be None",
                field="lp.objective",
            )
        decision = self._branching(branching) if branching is not None else None
        if decision is not None and status != "branched":
            raise TreeError(
                f"node {nid} is {status}: branching is only for branched nodes", field="branching"
            )
        event: dict[str, Any] = {
            "kind": "node",
            "id": nid,
            "parent": pid,
            "depth": depth,
            "order": order,
            "time": _float(time, "time"),
            "branch": self._branch(branch) if branch is not None else None,
            "lp": lp,
            "bound": value,
            "fractional": _int(fractional, "fractional"),
            "status": status,
            "branching": decision,
            "message": None if message is None else str(message),
        }
        if extra:
            event.update((k, v) for k, v in extra.items() if k not in event)
        self._accept(event, inherited_from=pid)
        return event

    def _accept(self, event: dict[str, Any], *, inherited_from: int | None) -> None:
        nid, status, value = event["id"], event["status"], event["bound"]
        self.nodes[nid] = _Seen(status, event["depth"], value, event["order"])
        if inherited_from is None:
            self.root = nid
        elif self._pending.get(inherited_from, 0) > 0:
            self._pending[inherited_from] -= 1
            self._open -= 1
        key = -math.inf if value is None else self._sign * value
        if status == "branched":
            self._pending[nid] = 2
            self._open += 2
            heapq.heappush(self._slots, (key, nid))
        elif status == "open":
            self._open += 1
            heapq.heappush(self._open_nodes, key)
        if status in CLOSED_LEAF_STATUSES:
            self.tree_weight += 2.0 ** -event["depth"]
        if event["lp"] is not None:
            self.solved += 1
            self.lp_iterations += event["lp"]["iterations"]
            self.lp_seconds += event["lp"]["seconds"]
        self.last_time = max(self.last_time, event["time"])

    def _branch(self, branch: Any) -> dict[str, Any]:
        if isinstance(branch, tuple | list) and len(branch) == 3:
            branch = dict(zip(("var", "dir", "value"), branch, strict=True))
        if not isinstance(branch, dict):
            raise TreeError(
                f"branch must be a dict with var, dir, value (or a tuple), not {branch!r}",
                field="branch",
            )
        for key in ("var", "dir", "value"):
            if key not in branch:
                raise TreeError(f"branch needs {key!r}", field=f"branch.{key}")
        var = _int(branch["var"], "branch.var")
        if branch["dir"] not in ("down", "up"):
            raise TreeError(
                f"branch dir must be 'down' or 'up', not {branch['dir']!r}", field="branch.dir"
            )
        return {
            "var": var,
            "name": str(branch.get("name") or f"x{var}"),
            "dir": branch["dir"],
            "value": _float(branch["value"], "branch.value"),
        }

    def _branching(self, decision: Any) -> dict[str, Any]:
        if not isinstance(decision, dict) or "var" not in decision or "value" not in decision:
            raise TreeError(
                f"branching must be a dict with at least var and value, not {decision!r}",
                field="branching",
            )
        var = _int(decision["var"], "branching.var")
        runner = decision.get("runner_up")
        if runner is not None:
            if not isinstance(runner, dict) or "var" not in runner:
                raise TreeError("runner_up must be a dict with var", field="branching.runner_up")
            rvar = _int(runner["var"], "branching.runner_up.var")
            runner = {
                "var": rvar,
                "name": str(runner.get("name") or f"x{rvar}"),
                "score": _opt_float(runner.get("score"), "branching.runner_up.score"),
            }
        return {
            "var": var,
            "name": str(decision.get("name") or f"x{var}"),
            "value": _float(decision["value"], "branching.value"),
            "score": _opt_float(decision.get("score"), "branching.score"),
            "rule": str(decision.get("rule") or self.rule),
            "down_bound": _opt_float(decision.get("down_bound"), "branching.down_bound"),
            "up_bound": _opt_float(decision.get("up_bound"), "branching.up_bound"),
            "runner_up": runner,
        }

    # ---------------------------------------------------------------- global figures
    @property
    def open(self) -> int:
        """Nodes created but not closed: unrecorded children plus nodes recorded as open."""
        return self._open

    def dual_bound(self) -> float | None:
        """Best bound over open nodes and the incumbent; None while unknown."""
        slots = self._slots
        while slots and self._pending.get(slots[0][1], 0) == 0:
            heapq.heappop(slots)  # every child of that node is recorded
        keys = []
        if slots:
            keys.append(slots[0][0])
        if self._open_nodes:
            keys.append(self._open_nodes[0])
        if self.best is not None:
            keys.append(self._sign * self.best)
        if not keys or min(keys) == -math.inf:
            return None
        return self._sign * min(keys)

    def incumbent(
        self,
        objective: Any,
        *,
        time: float,
        node: Any = None,
        source: str | None = None,
        order: Any = None,
    ) -> dict[str, Any] | None:
        """The incumbent event for an improving solution, or None if it does not improve."""
        value = _float(objective, "objective")
        if source is None:
            source = "integral" if node is not None else "external"
        if source not in SOURCES:
            raise TreeError(
                f"source {source!r} is not one of {', '.join(SOURCES)}", field="source"
            )
        nid = None if node is None else _int(node, "node")
        if order is None and nid is not None and nid in self.nodes:
            order = self.nodes[nid].order
        elif order is not None:
            order = _int(order, "order")
        if self.best is not None and self._sign * value >= self._sign * self.best:
            return None
        self.best = value
        t = _float(time, "time")
        self.last_time = max(self.last_time, t)
        return {
            "kind": "incumbent",
            "time": t,
            "node": nid,
            "order": order,
            "objective": value,
            "source": source,
        }

    def progress(self, *, time: float, **given: Any) -> dict[str, Any]:
        """A progress event from the tree so far; keyword arguments override a figure."""
        unknown = set(given) - {"nodes", "open", "dual_bound", "primal_bound", "gap", "tree_weight"}
        if unknown:
            raise TreeError(f"unknown progress figure {sorted(unknown)[0]!r}", field="progress")
        dual = given.get("dual_bound", self.dual_bound())
        primal = given.get("primal_bound", self.best)
        return {
            "kind": "progress",
            "time": _float(time, "time"),
            "nodes": _int(given.get("nodes", self.solved), "nodes"),
            "open": _int(given.get("open", self._open), "open"),
            "dual_bound": _opt_float(dual, "dual_bound"),
            "primal_bound": _opt_float(primal, "primal_bound"),
            "gap": _opt_float(given["gap"], "gap") if "gap" in given else gap(primal, dual),
            "tree_weight": _float(given.get("tree_weight", self.tree_weight), "tree_weight"),
        }

    def end(
        self,
        *,
        time: float,
        status: str | None = None,
        message: str | None = None,
        solution: dict[str, Any] | None = None,
    ) -> dict[str, Any]:
        """The end event; the status defaults to what the tree shows."""
        if status is None:
            if self._open:
                status = "incomplete"
            else:
                status = "infeasible" if self.best is None else "optimal"
        if status not in END_STATUSES:
            raise TreeError(
                f"end status {status!r} is not one of {', '.join(END_STATUSES)}", field="status"
            )
        t = _float(time, "time")
        dual = self.dual_bound()
        if solution is not None:
            solution = {
                str(k): _float(v, f"solution[{k!r}]") for k, v in solution.items() if v != 0
            }
        return {
            "kind": "end",
            "time": t,
            "status": status,
            "objective": self.best,
            "dual_bound": dual,
            "gap": gap(self.best, dual),
            "nodes": self.solved,
            "lp_iterations": self.lp_iterations,
            "lp_seconds": self.lp_seconds,
            "other_seconds": max(0.0, t - self.lp_seconds),
            "complete": self._open == 0,
            "message": message,
            "solution": solution,
        }
