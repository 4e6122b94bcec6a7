"""The instrumented branch-and-bound.

`Search(problem, settings).events()` yields one plain dict per event (see
docs/run-log.md): a ``node`` event for every node (processed, discarded or
left open), ``incumbent`` on each improvement, ``progress`` snapshots and a
final ``end``. Internally everything is in minimisation form without the
objective offset; events carry values in the model's own sense.
"""

from __future__ import annotations

import math
import threading
import time
from collections.abc import Callable, Iterator
from datetime import UTC, datetime

import numpy as np

from .. import __version__
from ..model import Problem
from ..model.checks import objective_convexity
from . import relaxation as rx
from .branching import BranchContext, make_rule
from .node import Node, transition
from .pseudocost import Pseudocosts
from .result import SearchResult, relative_gap
from .selection import OpenList
from .settings import SearchSettings

Event = dict[str, object]
_DIRECTION = {1: "down", 2: "up"}
CANDIDATES_KEPT = 8  # fractional candidates recorded per branched node (lowest index first)


class NonConvexObjectiveError(ValueError):
    """The quadratic objective is not convex: its relaxation gives no valid bound."""


class Search:
    """One branch-and-bound search over ``problem``. Not reusable: one run per object."""

    def __init__(self, problem: Problem, settings: SearchSettings | None = None, *,
                 start: np.ndarray | None = None,
                 should_stop: Callable[[], bool] | None = None) -> None:
        self.problem = problem
        self.settings = settings or SearchSettings()
        if problem.Q is not None:
            conv = objective_convexity(problem)
            if not conv.convex:
                raise NonConvexObjectiveError(
                    f"model {problem.name!r}: the quadratic objective is not convex for "
                    f"{problem.sense}imisation (smallest eigenvalue of the sense-adjusted "
                    f"Hessian {conv.smallest_eigenvalue:.6g}), so its relaxation bound is "
                    "not valid; Undergrowth only searches convex objectives")
        self.sign = 1.0 if problem.sense == "min" else -1.0
        self._cancel = threading.Event()
        self._should_stop = should_stop
        self._start = None if start is None else np.asarray(start, dtype=float)
        self.result: SearchResult | None = None
        self._int_idx = np.flatnonzero(problem.integrality)
        # Pure integer models skip the gathers and scatters between x and its integer part.
        self._all_integer = len(self._int_idx) == problem.num_cols
        self._c_min = self.sign * np.asarray(problem.c, dtype=float)
        self._q_min = None if problem.Q is None else self.sign * problem.Q
        # Small matrices are multiplied dense: scipy's sparse product costs tens of
        # µs in call overhead, more than the arithmetic (rounding checks each node).
        size = problem.num_rows * problem.num_cols
        self._A_dense = problem.A.toarray() if size <= 250_000 else None

    # ---------------------------------------------------------------- API
    def cancel(self) -> None:
        """Ask the search to stop after the current node (safe from any thread)."""
        self._cancel.set()

    def header(self) -> Event:
        return {
            "kind": "header", "format": "undergrowth-run", "version": 1,
            "model": self.problem.summary(),
            "settings": self.settings.to_dict(),
            "started": datetime.now(UTC).strftime("%Y-%m-%dT%H:%M:%SZ"),
            "producer": f"undergrowth {__version__}",
        }

    def run(self, on_event: Callable[[Event], None] | None = None) -> SearchResult:
        for ev in self.events():
            if on_event is not None:
                on_event(ev)
        assert self.result is not None
        return self.result

    # ------------------------------------------------------------ helpers
    def _user(self, v: float) -> float | None:
        """Minimisation-form value -> the model's own sense, offset included."""
        if not math.isfinite(v):
            return None
        return self.sign * v + self.problem.offset

    def _feasible(self, x: np.ndarray, *, check_columns: bool = True) -> bool:
        """Rows (and column bounds) hold within the feasibility tolerance."""
        p, tol = self.problem, self.settings.feasibility_tolerance
        if check_columns and (np.any(x < p.col_lower - tol) or np.any(x > p.col_upper + tol)):
            return False
        if p.num_rows:
            act = self._A_dense @ x if self._A_dense is not None else p.A @ x
            viol = np.maximum(p.row_lower - act, act - p.row_upper)
            return bool((viol <= tol * (1.0 + np.abs(act))).all())
        return True

    def _min_objective(self, x: np.ndarray) -> float:
        """Objective at ``x`` in minimisation form, without the offset."""
        val = float(self._c_min @ x)
        if self._q_min is not None:
            val += 0.5 * float(x @ (self._q_min @ x))
        return val

    # -------------------------------------------------------------- search
    def events(self) -> Iterator[Event]:
        s = self.settings
        p = self.problem
        t0 = time.perf_counter()
        relax = rx.Relaxation(p)
        rule = make_rule(s.branching, s)
        pseudo = Pseudocosts(p.num_cols)
        rng = np.random.default_rng(s.seed)
        open_list = OpenList(s.select, down_first=s.down_first)
        int_idx = self._int_idx
        all_integer = self._all_integer
        int_tol = s.integrality_tolerance
        sign, offset = self.sign, p.offset

        incumbent = math.inf  # minimisation form, no offset
        inc_x: np.ndarray | None = None
        processed = 0
        lp_iterations = 0
        lp_seconds = 0.0
        failed = 0
        failed_bound = math.inf  # best inherited bound among failed nodes (unexplored)
        tree_weight = 0.0
        next_id = 1
        stop_status: str | None = None
        unbounded = False
        last_progress_t = 0.0
        last_progress_n = 0
        last_solved: Node | None = None
        plunge_from: list[Node] = []

        def now() -> float:
            return time.perf_counter() - t0

        def threshold() -> float:
            """A node whose bound reaches this cannot beat the incumbent."""
            if incumbent == math.inf:  # inf - tol * inf would be NaN, which compares False
                return math.inf
            return incumbent - s.prune_tolerance * max(1.0, abs(incumbent))

        def dual_min() -> float:
            return min(open_list.min_bound(), incumbent, failed_bound)

        def progress() -> Event:
            d = dual_min() if (processed or len(open_list)) else -math.inf
            pu, du = self._user(incumbent), self._user(d)
            return {"kind": "progress", "time": now(), "nodes": processed,
                    "open": len(open_list), "dual_bound": du, "primal_bound": pu,
                    "gap": relative_gap(pu, du), "tree_weight": tree_weight}

        def leaf_event(node: Node, status: str) -> Event:
            return {"kind": "node", "id": node.id,
                    "parent": node.parent.id if node.parent else None,
                    "depth": node.depth, "order": None, "time": now(),
                    "branch": branch_of(node), "lp": None, "bound": self._user(node.bound),
                    "fractional": 0, "status": status, "branching": None, "message": None}

        def branch_of(node: Node) -> dict[str, object] | None:
            if node.var < 0:
                return None
            value = node.upper if node.direction == 1 else node.lower
            return {"var": node.var, "name": p.col_names[node.var],
                    "dir": _DIRECTION[node.direction], "value": value}

        def new_incumbent(value: float, x: np.ndarray, node: Node | None, order: int | None,
                          source: str) -> Iterator[Event]:
            nonlocal incumbent, inc_x, tree_weight
            incumbent = value
            inc_x = x
            yield {"kind": "incumbent", "time": now(), "node": node.id if node else None,
                   "order": order, "objective": self._user(value), "source": source}
            for gone in open_list.sweep(threshold()):
                tree_weight += 2.0 ** -gone.depth
                yield leaf_event(gone, "discarded")

        # A user-supplied start solution becomes the first incumbent.
        if self._start is not None:
            x0 = self._start
            if x0.shape != (p.num_cols,):
                raise ValueError(f"start: expected {p.num_cols} values, got {x0.size}")
            xi = x0[int_idx]
            if np.any(np.abs(xi - np.round(xi)) > int_tol) or not self._feasible(x0):
                raise ValueError("start: the solution violates a bound, a row or integrality")
            yield from new_incumbent(self._min_objective(x0), x0, None, None, "start")

        root = Node(0, None, 0, -math.inf)
        open_list.push(root)

        while True:
            # ---- stop tests (between nodes, so a stop leaves a consistent tree)
            if not len(open_list):
                break
            if self._cancel.is_set() or (self._should_stop is not None and self._should_stop()):
                stop_status = "cancelled"
                break
            if s.node_limit is not None and processed >= s.node_limit:
                stop_status = "node-limit"
                break
            if s.time_limit is not None and now() >= s.time_limit:
                stop_status = "time-limit"
                break
            if incumbent < math.inf:
                d = dual_min()
                diff = incumbent - d  # = |primal − dual| in the model's sense too
                if diff <= s.absolute_gap or diff <= s.gap * max(
                        abs(sign * incumbent + offset), abs(sign * d + offset), 1e-10):
                    stop_status = "gap-reached"
                    break

            # ---- pick the next node
            node = None
            if s.select == "hybrid" and plunge_from:
                child = plunge_from[0]
                best = open_list.min_bound()
                room = (incumbent - best) if math.isfinite(incumbent) else math.inf
                if child.in_open and child.bound <= best + s.plunge_drift * room:
                    node = open_list.take(child)
            if node is None:
                node = open_list.pop()
            plunge_from = []
            assert node is not None

            # ---- solve its relaxation
            relax.change_bounds(transition(last_solved, node, relax.root_lower,
                                           relax.root_upper))
            if node.parent is not last_solved:
                relax.set_basis(node.basis)
            res = relax.solve()
            node.basis = None
            last_solved = node
            order = processed
            processed += 1
            lp_iterations += res.iterations
            lp_seconds += res.seconds
            lp = {"status": res.status, "objective": None, "iterations": res.iterations,
                  "seconds": res.seconds}
            # Stamped when the relaxation answered, so the incumbent and child events
            # that follow it in the stream never carry an earlier time.
            ev: Event = {"kind": "node", "id": node.id,
                         "parent": node.parent.id if node.parent else None,
                         "depth": node.depth, "order": order, "time": now(),
                         "branch": branch_of(node), "lp": lp, "bound": None,
                         "fractional": 0, "status": "", "branching": None, "message": None}
            after: list[Event] = []
            closed_children: list[tuple[Node, float]] = []
            status: str
            if res.status == rx.UNBOUNDED and node.parent is None:
                unbounded = True
                status = "failed"
                lp["status"] = "failed"
                ev["message"] = "the root relaxation is unbounded"
            elif res.status in (rx.FAILED, rx.UNBOUNDED, rx.ITERATION_LIMIT):
                status = "failed"
                lp["status"] = "failed"
                ev["message"] = res.message or "the relaxation solver gave no usable answer"
                failed += 1
                failed_bound = min(failed_bound, node.bound)
            elif res.status == rx.INFEASIBLE:
                status = "infeasible"
            else:
                obj = res.objective
                lp["objective"] = self._user(obj)
                node.bound = max(obj, node.bound)
                ev["bound"] = self._user(node.bound)
                if node.parent is not None and res.status == rx.OPTIMAL:
                    f = node.parent_value - math.floor(node.parent_value)
                    d = 0 if node.direction == 1 else 1
                    pseudo.update(node.var, d, obj - node.parent_objective,
                                  f if d == 0 else 1.0 - f)
                if res.status == rx.CUTOFF or node.bound >= threshold():
                    status = "pruned"
                else:
                    x = res.x
                    xi = x if all_integer else x[int_idx]
                    ri = np.rint(xi)
                    frac_mask = np.abs(xi - ri) > int_tol
                    nfrac = int(frac_mask.sum())
                    ev["fractional"] = nfrac
                    if nfrac == 0:
                        status = "integral"
                        if all_integer:
                            xs = ri
                        else:
                            xs = x.copy()
                            xs[int_idx] = ri
                        # value at the snapped point: users check it against their own
                        # evaluation, and it drops the relaxation's round-off
                        val = self._min_objective(xs)
                        if val < threshold():
                            after.extend(new_incumbent(val, xs, node, order, "integral"))
                    else:
                        if s.rounding:
                            if all_integer:
                                xr = ri
                            else:
                                xr = x.copy()
                                xr[int_idx] = ri
                            val = self._min_objective(xr)
                            # Objective first: the row check is the dear part. Rounding a
                            # value inside integral bounds stays inside them.
                            if val < threshold() and self._feasible(xr, check_columns=False):
                                after.extend(new_incumbent(val, xr, node, order, "rounding"))
                        if node.bound >= threshold():
                            status = "pruned"
                        else:
                            status = "branched"
                            cand = int_idx[frac_mask]
                            ctx = BranchContext(cand, x[cand], obj, relax, pseudo, rng,
                                                relax.basis(),
                                                incumbent if math.isfinite(incumbent) else None)
                            dec = rule.choose(ctx)
                            lp_iterations += dec.lookahead_iterations
                            lp_seconds += dec.lookahead_seconds
                            ev["branching"] = {
                                "var": dec.var, "name": p.col_names[dec.var], "value": dec.value,
                                "score": dec.score, "rule": s.branching,
                                "down_bound": None if dec.down_bound is None
                                else self._user(dec.down_bound),
                                "up_bound": None if dec.up_bound is None
                                else self._user(dec.up_bound),
                                "runner_up": None if dec.runner_up is None else {
                                    "var": dec.runner_up[0],
                                    "name": p.col_names[dec.runner_up[0]],
                                    "score": dec.runner_up[1]},
                                "lookahead_iterations": dec.lookahead_iterations,
                                # the first few fractional candidates, for narration
                                "candidates": [list(jv) for jv in zip(
                                    cand[:CANDIDATES_KEPT].tolist(),
                                    x[cand[:CANDIDATES_KEPT]].tolist(), strict=True)],
                            }
                            children = self._children(node, dec, next_id, relax, pseudo,
                                                      ctx.basis, obj)
                            next_id += 2
                            # A child the look-ahead already closed is reported at once
                            # instead of being solved a second time.
                            keep = []
                            for child, seen in zip(children, (dec.down_bound, dec.up_bound),
                                                   strict=True):
                                if seen is not None and (seen == math.inf or seen >= threshold()):
                                    closed_children.append((child, seen))
                                else:
                                    keep.append(child)
                            open_list.push_children(keep)
                            if s.select == "hybrid" and keep:
                                plunge_from = [keep[0] if s.down_first or len(keep) == 1
                                               else keep[1]]
            ev["status"] = status
            if status != "branched":
                tree_weight += 2.0 ** -node.depth
            yield ev
            yield from after
            for child, seen in closed_children:
                child_order = processed
                processed += 1
                tree_weight += 2.0 ** -child.depth
                infeasible = seen == math.inf
                yield {"kind": "node", "id": child.id, "parent": node.id, "depth": child.depth,
                       "order": child_order, "time": now(), "branch": branch_of(child),
                       "lp": {"status": "infeasible" if infeasible else "optimal",
                              "objective": None if infeasible else self._user(seen),
                              "iterations": 0, "seconds": 0.0},
                       "bound": None if infeasible else self._user(max(seen, node.bound)),
                       "fractional": 0, "status": "infeasible" if infeasible else "pruned",
                       "branching": None,
                       "message": "closed by the branching rule's look-ahead solve"}
            if unbounded:
                stop_status = "unbounded"
                break
            t = now()
            if after or processed - last_progress_n >= s.progress_every or t - last_progress_t >= 1:
                last_progress_n, last_progress_t = processed, t
                yield progress()

        # ---- the end: what is left open, the final snapshot, the verdict
        if stop_status is None:
            status = "incomplete" if failed else (
                "optimal" if math.isfinite(incumbent) else "infeasible")
            final_dual = min(incumbent, failed_bound)  # a failed node's region is unexplored
        else:
            status = stop_status
            final_dual = -math.inf if unbounded else dual_min()
        left_open = len(open_list)  # reported as open nodes, so the snapshot counts them
        for left in open_list.drain():
            yield leaf_event(left, "open")
        seconds = now()
        objective = self._user(incumbent)
        dual_user = self._user(final_dual)
        gap = relative_gap(objective, dual_user)
        yield {"kind": "progress", "time": seconds, "nodes": processed, "open": left_open,
               "dual_bound": dual_user, "primal_bound": objective, "gap": gap,
               "tree_weight": tree_weight}
        complete = stop_status is None and not failed
        message = None
        if failed:
            message = f"{failed} relaxation(s) gave no usable answer; the result is not proven"
        elif unbounded:
            message = ("the root relaxation is unbounded: the model is unbounded unless it has "
                       "no integer-feasible point")
        solution = None
        if inc_x is not None:
            solution = {p.col_names[j]: float(v) for j, v in enumerate(inc_x) if v != 0.0}
        self.result = SearchResult(
            status=status, objective=objective, dual_bound=dual_user, gap=gap,
            nodes=processed, lp_iterations=lp_iterations, seconds=seconds,
            lp_seconds=lp_seconds, complete=complete, message=message, x=inc_x,
        )
        yield {"kind": "end", "time": seconds, "status": status, "objective": objective,
               "dual_bound": dual_user, "gap": gap, "nodes": processed,
               "lp_iterations": lp_iterations, "lp_seconds": lp_seconds,
               "other_seconds": max(seconds - lp_seconds, 0.0), "complete": complete,
               "message": message, "solution": solution}

    def _children(self, node: Node, dec, next_id: int, relax: rx.Relaxation,
                  pseudo: Pseudocosts, basis: object | None, obj: float) -> list[Node]:
        j, v = dec.var, dec.value
        lo, up = float(relax.lower[j]), float(relax.upper[j])
        down = Node(next_id, node, node.depth + 1, node.bound)
        down.var, down.direction, down.lower, down.upper = j, 1, lo, math.floor(v)
        upc = Node(next_id + 1, node, node.depth + 1, node.bound)
        upc.var, upc.direction, upc.lower, upc.upper = j, 2, math.ceil(v), up
        for child, seen in ((down, dec.down_bound), (upc, dec.up_bound)):
            if seen is not None and math.isfinite(seen):
                child.bound = max(child.bound, seen)
            child.basis = basis
            child.parent_objective = obj
            child.parent_value = v
        if self.settings.select == "best-estimate":
            f = v - math.floor(v)
            psi_d, psi_u = pseudo.values(np.array([j]))
            down.estimate = down.bound + float(psi_d[0]) * f
            upc.estimate = upc.bound + float(psi_u[0]) * (1.0 - f)
        return [down, upc]
