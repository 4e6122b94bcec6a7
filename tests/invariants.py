"""What every search's event stream must satisfy, whatever the rule, order or model.

`check_search(problem, events, settings, optimum=...)` walks the events once
and asserts each invariant with a message naming the node or event at fault.
It returns a `Checked` summary (nodes by id, processed nodes by order, the
incumbent, progress and end events) so tests can assert more on top.

Values in events are in the model's own sense; the checks compare them in
minimisation form (``sign · value`` with sign −1 for a maximisation model).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from undergrowth.model import Problem
from undergrowth.search import STATUSES, SearchSettings, relative_gap

NODE_STATUSES = ("branched", "integral", "pruned", "infeasible", "discarded", "open", "failed")
INCUMBENT_SOURCES = ("integral", "rounding", "start")
# End statuses of a search that stopped before the tree was exhausted.
STOPPED_EARLY = ("gap-reached", "node-limit", "time-limit", "cancelled")
# Relative slack for comparing bounds and objectives computed by the LP solver.
BOUND_TOLERANCE = 1e-7
# A reported solution must satisfy rows, bounds and integrality this closely.
SOLUTION_TOLERANCE = 1e-6
TIME_FIELDS = ("time", "seconds", "lp_seconds", "other_seconds", "started")


def slack(value: float) -> float:
    return BOUND_TOLERANCE * max(1.0, abs(value))


@dataclass
class Checked:
    nodes: dict[int, dict] = field(default_factory=dict)  # every node event by id
    processed: list[dict] = field(default_factory=list)  # processed node events by order
    incumbents: list[dict] = field(default_factory=list)
    progress: list[dict] = field(default_factory=list)
    end: dict = field(default_factory=dict)

    def children(self, node_id: int) -> list[dict]:
        return [e for e in self.nodes.values() if e["parent"] == node_id]

    def with_status(self, status: str) -> list[dict]:
        return [e for e in self.nodes.values() if e["status"] == status]


def solution_vector(problem: Problem, solution: dict[str, float]) -> np.ndarray:
    """The end event's sparse ``{name: value}`` solution as a full column vector."""
    index = {name: j for j, name in enumerate(problem.col_names)}
    x = np.zeros(problem.num_cols)
    for name, value in solution.items():
        assert name in index, f"solution names unknown column {name!r}"
        x[index[name]] = value
    return x


def assert_feasible(problem: Problem, x: np.ndarray, what: str = "solution") -> None:
    """Rows, column bounds and integrality hold for ``x`` (within SOLUTION_TOLERANCE)."""
    tol = SOLUTION_TOLERANCE
    assert np.all(x >= problem.col_lower - tol), f"{what} is below a column's lower bound"
    assert np.all(x <= problem.col_upper + tol), f"{what} is above a column's upper bound"
    xi = x[problem.integrality]
    assert np.all(np.abs(xi - np.round(xi)) <= tol), f"{what} has a fractional integer column"
    if problem.num_rows:
        act = problem.A @ x
        scale = tol * (1.0 + np.abs(act))
        bad = (act < problem.row_lower - scale) | (act > problem.row_upper + scale)
        first = int(np.flatnonzero(bad)[0]) if bad.any() else -1
        assert first < 0, f"{what} violates row {problem.row_names[first]}"


def check_search(problem: Problem, events: list[dict], settings: SearchSettings | None = None,
                 *, optimum: float | None = None) -> Checked:
    """Assert every invariant of one search's event stream; see the module docstring.

    ``optimum`` (model sense) is the known optimal value when the test has one:
    no dual bound may pass it and no incumbent may beat it.
    """
    sign = 1.0 if problem.sense == "min" else -1.0

    def mf(v: float | None) -> float | None:  # model sense -> minimisation form
        return None if v is None else sign * float(v)

    opt = mf(optimum)
    events = list(events)
    if events and events[0].get("kind") == "header":
        head = events.pop(0)
        assert head["model"]["sense"] == problem.sense
        assert head["model"]["columns"] == problem.num_cols
    kinds = [e["kind"] for e in events]
    assert set(kinds) <= {"node", "incumbent", "progress", "end"}, f"unknown kinds {set(kinds)}"
    assert kinds.count("end") == 1, f"expected exactly one end event, got {kinds.count('end')}"
    assert kinds[-1] == "end", "the end event must be the last one"

    out = Checked()
    # Best incumbent each node produced: a rounding incumbent is announced just
    # after the node event it came from, yet that node was pruned against it.
    own_incumbent: dict[int, float] = {}
    for e in events:
        if e["kind"] == "incumbent" and e["node"] is not None:
            v = mf(e["objective"])
            own_incumbent[e["node"]] = min(own_incumbent.get(e["node"], math.inf), v)

    incumbent = math.inf  # minimisation form
    dual = -math.inf
    last_time = 0.0
    tree_weight = 0.0
    children_of: dict[int, dict[str, int]] = {}
    lp_iterations = 0
    counts: dict[str, int] = {"branched": 0, "discarded": 0}  # node events so far
    end: dict = {}

    for k, e in enumerate(events):
        where = f"event {k} ({e['kind']}"
        where += f" id {e['id']})" if e["kind"] == "node" else ")"
        t = e["time"]
        assert t >= last_time - 1e-9, f"{where}: time {t} is before the previous {last_time}"
        last_time = t

        if e["kind"] == "node":
            nid = e["id"]
            assert nid not in out.nodes, f"{where}: node id repeated"
            status = e["status"]
            assert status in NODE_STATUSES, f"{where}: status {status!r} not in the design set"
            # -- tree shape
            if e["parent"] is None:
                assert not out.nodes, f"{where}: the root must be the first node event"
                assert e["depth"] == 0 and e["branch"] is None and nid == 0
                parent = None
            else:
                assert e["parent"] in out.nodes, f"{where}: parent {e['parent']} not seen before"
                parent = out.nodes[e["parent"]]
                assert parent["status"] == "branched", (
                    f"{where}: parent {parent['id']} has status {parent['status']}, not branched")
                assert e["depth"] == parent["depth"] + 1, f"{where}: depth is not parent's + 1"
                br, pb = e["branch"], parent["branching"]
                assert br is not None and br["var"] == pb["var"], (
                    f"{where}: child branches on {br}, parent chose {pb['var']}")
                assert br["name"] == problem.col_names[br["var"]]
                assert br["dir"] in ("down", "up")
                expect = math.floor(pb["value"]) if br["dir"] == "down" else math.ceil(pb["value"])
                assert br["value"] == expect, (
                    f"{where}: {br['dir']} child bound {br['value']}, parent value {pb['value']}")
                seen = children_of.setdefault(parent["id"], {})
                assert br["dir"] not in seen, f"{where}: second {br['dir']} child of {parent['id']}"
                seen[br["dir"]] = nid
            # -- processing order and relaxation record
            if status in ("discarded", "open"):
                assert e["order"] is None and e["lp"] is None, f"{where}: {status} with an order"
            else:
                assert e["order"] == len(out.processed), (
                    f"{where}: order {e['order']}, expected {len(out.processed)}")
                out.processed.append(e)
                lp = e["lp"]
                assert lp is not None, f"{where}: processed node without relaxation record"
                lp_iterations += lp["iterations"]
                want = {"infeasible": "infeasible", "failed": "failed"}.get(status, "optimal")
                assert lp["status"] == want, f"{where}: {status} node with lp status {lp['status']}"
                if want == "optimal" and lp["objective"] is not None and e["bound"] is not None:
                    assert mf(e["bound"]) >= mf(lp["objective"]) - slack(lp["objective"]), (
                        f"{where}: bound {e['bound']} is weaker than its relaxation value")
                if status == "failed":
                    assert e["message"], f"{where}: a failed node must say why"
            # -- bounds only tighten going down (minimisation form)
            if status in ("branched", "integral", "pruned", "discarded"):
                assert e["bound"] is not None, f"{where}: {status} node without a bound"
            if parent is not None and e["bound"] is not None and parent["bound"] is not None:
                assert mf(e["bound"]) >= mf(parent["bound"]) - slack(parent["bound"]), (
                    f"{where}: bound {e['bound']} is better than parent's {parent['bound']}")
            if opt is not None and parent is None and e["bound"] is not None:
                assert mf(e["bound"]) <= opt + slack(opt), f"{where}: root bound passes the optimum"
            # -- why it closed
            if status == "branched":
                b = e["branching"]
                assert b is not None, f"{where}: branched node without a branching record"
                assert problem.integrality[b["var"]], f"{where}: branched on a continuous column"
                assert b["name"] == problem.col_names[b["var"]]
                frac = b["value"] - math.floor(b["value"])
                assert 0 < frac < 1, f"{where}: branching value {b['value']} is integral"
                assert e["fractional"] >= 1
                if settings is not None:
                    assert b["rule"] == settings.branching
            else:
                assert e["branching"] is None, f"{where}: branching record on a {status} node"
                if status != "open":  # the tree weight counts closed leaves only
                    tree_weight += 2.0 ** -e["depth"]
            if status == "integral":
                assert e["fractional"] == 0
            if status == "pruned":
                at = min(incumbent, own_incumbent.get(nid, math.inf))
                assert math.isfinite(at), f"{where}: pruned with no incumbent"
                assert mf(e["bound"]) >= at - slack(at), (
                    f"{where}: pruned at bound {e['bound']} but the incumbent was {sign * at}")
            if status == "discarded":
                assert math.isfinite(incumbent), f"{where}: discarded with no incumbent"
                assert mf(e["bound"]) >= incumbent - slack(incumbent), (
                    f"{where}: discarded at bound {e['bound']}, incumbent {sign * incumbent}")
            out.nodes[nid] = e
            counts[status] = counts.get(status, 0) + 1
            if e["branching"] is not None:
                lp_iterations += e["branching"].get("lookahead_iterations", 0)

        elif e["kind"] == "incumbent":
            assert e["source"] in INCUMBENT_SOURCES, f"{where}: source {e['source']!r}"
            v = mf(e["objective"])
            assert v < incumbent, f"{where}: incumbent {e['objective']} does not improve"
            if e["source"] == "start":
                assert e["node"] is None and e["order"] is None
            else:
                assert e["node"] in out.nodes, f"{where}: found at a node not yet reported"
                found = out.nodes[e["node"]]
                assert e["order"] == found["order"]
                if e["source"] == "integral":
                    assert found["status"] == "integral"
                    assert abs(v - mf(found["lp"]["objective"])) <= slack(v)
                else:
                    assert found["status"] != "integral"
            if opt is not None:
                assert v >= opt - slack(opt), f"{where}: {e['objective']} beats the optimum"
            incumbent = v
            out.incumbents.append(e)

        elif e["kind"] == "progress":
            assert e["nodes"] == len(out.processed), f"{where}: nodes {e['nodes']}"
            created = 1 + 2 * counts["branched"]
            closed = len(out.processed) + counts["discarded"]
            assert e["open"] == created - closed, (
                f"{where}: {e['open']} open, but {created} nodes were created and {closed} closed")
            pb = mf(e["primal_bound"])
            assert (pb if pb is not None else math.inf) == incumbent, (
                f"{where}: primal bound {e['primal_bound']} is not the incumbent")
            d = mf(e["dual_bound"])
            if d is not None:
                assert d >= dual - slack(dual if math.isfinite(dual) else 0.0), (
                    f"{where}: dual bound fell from {sign * dual} to {e['dual_bound']}")
                dual = d
                if opt is not None:
                    assert d <= opt + slack(opt), (
                        f"{where}: dual bound {e['dual_bound']} passes the optimum")
                assert d <= incumbent + slack(d), f"{where}: dual bound beyond the primal bound"
            assert e["gap"] == relative_gap(e["primal_bound"], e["dual_bound"])
            assert -1e-12 <= e["tree_weight"] <= 1.0 + 1e-12
            assert abs(e["tree_weight"] - tree_weight) <= 1e-9, (
                f"{where}: tree weight {e['tree_weight']}, closed leaves give {tree_weight}")
            out.progress.append(e)
        else:
            end = e

    # -- the end
    out.end = end
    status = end["status"]
    assert status in STATUSES, f"end status {status!r}"
    assert end["nodes"] == len(out.processed), (
        f"end says {end['nodes']} nodes, {len(out.processed)} were processed")
    assert end["lp_iterations"] == lp_iterations, "end lp_iterations is not the nodes' sum"
    best = out.incumbents[-1]["objective"] if out.incumbents else None
    assert end["objective"] == best, f"end objective {end['objective']}, last incumbent {best}"
    assert out.progress, "no progress event"
    last = out.progress[-1]
    assert last["nodes"] == end["nodes"] and last["dual_bound"] == end["dual_bound"]
    assert end["gap"] == relative_gap(end["objective"], end["dual_bound"])
    assert end["complete"] == (status in ("optimal", "infeasible")), (
        f"end complete={end['complete']} with status {status}")
    if end["dual_bound"] is not None and end["objective"] is not None:
        assert mf(end["dual_bound"]) <= mf(end["objective"]) + slack(end["objective"])
    if opt is not None and end["dual_bound"] is not None:
        assert mf(end["dual_bound"]) <= opt + slack(opt), "end dual bound passes the optimum"

    # Every branched node has exactly two children (open ones if the search stopped).
    for e in out.nodes.values():
        if e["status"] == "branched":
            assert set(children_of.get(e["id"], {})) == {"down", "up"}, (
                f"branched node {e['id']} has children {children_of.get(e['id'])}")
    # The leaves of a binary tree weigh 1 in total (Σ 2^-depth).
    leaves = sum(2.0 ** -e["depth"] for e in out.nodes.values() if e["status"] != "branched")
    assert abs(leaves - 1.0) <= 1e-9, f"leaf weights sum to {leaves}"
    opened = out.with_status("open")
    if status not in STOPPED_EARLY:
        assert not opened, f"{len(opened)} node(s) left open with end status {status}"
        assert abs(last["tree_weight"] - 1.0) <= 1e-9
    failed = out.with_status("failed")
    if status == "incomplete":
        assert failed, "incomplete without a failed node"
        assert end["message"]
    elif status in ("optimal", "infeasible"):
        assert not failed, f"status {status} despite failed node(s)"
    if status == "optimal":
        assert end["objective"] is not None and end["dual_bound"] == end["objective"]
        if opt is not None:
            assert abs(mf(end["objective"]) - opt) <= 1e-6 * max(1.0, abs(opt)), (
                f"optimum {end['objective']}, expected {optimum}")
    if status == "infeasible":
        assert end["objective"] is None and not out.incumbents
    if settings is not None and settings.node_limit is not None:
        extra = 2 if settings.branching in ("strong", "reliability") else 0
        assert end["nodes"] <= settings.node_limit + extra
    if end["objective"] is not None:
        assert end["solution"] is not None
        x = solution_vector(problem, end["solution"])
        assert_feasible(problem, x)
        value = problem.objective_value(x)
        assert abs(value - end["objective"]) <= 1e-6 * max(1.0, abs(value)), (
            f"the solution evaluates to {value}, the end event says {end['objective']}")
    else:
        assert end["solution"] is None
    return out


def without_times(value: object) -> object:
    """A copy of an event (or list of events) with every time field removed."""
    if isinstance(value, dict):
        return {k: without_times(v) for k, v in value.items() if k not in TIME_FIELDS}
    if isinstance(value, list):
        return [without_times(v) for v in value]
    return value
