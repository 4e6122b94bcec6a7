"""Plain-language narration of a search, one processing step at a time.

Step k is the k-th relaxation the search solved (processing order, 0-based; a
foreign log with gaps in its orders is renumbered 0, 1, 2, ...). Each step says,
in short sentences of our own:

1. which node was solved and which bound change created it;
2. the relaxation's answer (value, and how much worse than its parent's);
3. which integer variables are fractional (the first ones the event recorded, as
   ``name = value``; only the count for logs that recorded none);
4. for a branched node, which variable the rule chose, the rule's score against
   the runner-up, and what each child's bound turned out to be (look-ahead
   bounds, or the children's own relaxations, which come at later steps);
5. for a node that closed, why (the status sentences of `analysis.reasons`);
6. a new incumbent and the waiting nodes it made useless;
7. where the incumbent, the dual bound and the gap stand after the step.

The global figures come from `measures.node_trace`, which rebuilds them after
every processed node; node fields the table lacks (branching scores, runner-up,
candidates, messages) come from an ``event_of(row)`` callable that returns the
node's full event (the API passes its cached node extras; `Walk.from_log` reads
the log). Values are in the model's own sense and shown with up to six
significant digits, as everywhere else in Undergrowth.
"""

from __future__ import annotations

import copy
import math
import os
from collections.abc import Callable, Iterable
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from ..runlog.codes import DIRECTIONS, SOURCES, STATUSES
from .measures import NodeTrace, node_trace
from .reasons import num, status_reason
from .table import RunTable

__all__ = ["RULE_SCORES", "Walk", "gap_text", "narrate_log"]

EventOf = Callable[[int], dict[str, Any]]

# How each rule scores a candidate, for the sentence after its choice (our wording).
RULE_SCORES: dict[str, str] = {
    "most-fractional": "its score is the distance from the value to the nearest integer, "
                       "and the largest wins",
    "least-fractional": "its score is the distance from the value to the nearest integer, "
                        "and the smallest wins",
    "first-index": "it takes the fractional column with the lowest index (the score shown "
                   "is the distance to the nearest integer)",
    "random": "it picks one of the fractional columns at random from the search's seeded "
              "generator",
    "pseudocost": "its score multiplies the expected worsening of the down and the up "
                  "child, estimated from earlier branchings on the same variable",
    "strong": "its score multiplies how much the down and the up child's bounds worsen, "
              "measured by solving both children in advance",
    "reliability": "its score multiplies the expected worsening of the two children: "
                   "from earlier branchings where those are trusted, else measured by "
                   "solving both children in advance",
}
_LOOKAHEAD_MESSAGE = "closed by the branching rule"
# Product scores this large come from a look-ahead child that closes at once (the
# engine credits such a child a gain of 1e12, see search.branching.CLOSED_CHILD_GAIN).
HUGE_SCORE = 1e9
_END_WORDS = {
    "optimal": "the tree is exhausted, so the incumbent is optimal",
    "infeasible": "the tree is exhausted without an integer solution: the model is infeasible",
    "unbounded": "the relaxation is unbounded",
    "gap-reached": "the gap reached the requested tolerance",
    "node-limit": "the node limit was reached",
    "time-limit": "the time limit was reached",
    "cancelled": "the search was cancelled",
    "incomplete": "some relaxations failed, so the result is not proven",
}


def gap_text(gap: float | None) -> str:
    """A relative gap as a percentage with three significant digits."""
    if gap is None or not math.isfinite(gap):
        return "unknown"
    if gap == 0:
        return "0%"
    return f"{100 * gap:.3g}%"


def _f(v: Any) -> float | None:
    if v is None:
        return None
    v = float(v)
    return v if math.isfinite(v) else None


def _plural(n: int, one: str, many: str | None = None) -> str:
    return f"{n} {one if n == 1 else (many or one + 's')}"


@dataclass(eq=False)
class Walk:
    """The steps of one run. Build with a table and an ``event_of(row)`` callable."""

    table: RunTable
    event_of: EventOf
    finding_nodes: frozenset[int] = frozenset()  # node ids some finding refers to
    notes: list[dict[str, Any]] = field(default_factory=list)
    names: dict[int, str] = field(default_factory=dict)  # column names known beyond branches
    trace: NodeTrace = field(init=False)
    rows: np.ndarray = field(init=False)  # table row of each step
    rank: np.ndarray = field(init=False)  # step of each row (-1: never solved)

    def __post_init__(self) -> None:
        c = self.table.columns
        self.trace = node_trace(self.table)
        order = c["order"]
        solved = np.flatnonzero(order >= 0)
        self.rows = solved[np.argsort(order[solved], kind="stable")]
        self.rank = np.full(len(order), -1, dtype=np.int64)
        self.rank[self.rows] = np.arange(len(self.rows))
        parent = c["parent_row"]
        kids = np.flatnonzero(parent >= 0)
        # children grouped by parent row, down child first (then by row)
        kids = kids[np.lexsort((kids, c["branch_dir"][kids], parent[kids]))]
        self._kid_rows = kids
        self._kid_parent = parent[kids]
        self._names = {**self.names, **self.table.var_names}
        self._discard_step = self._discards()

    @classmethod
    def from_log(cls, path: str | os.PathLike[str], *,
                 notes: Iterable[dict[str, Any]] = (), lenient: bool = True) -> Walk:
        """A walk of a run log read from disk (small runs: every node event is kept)."""
        from ..runlog.reader import read_run

        table = RunTable.open(path, lenient=lenient, use_cache=False)
        nodes = read_run(path, lenient=lenient).nodes  # same reader: rows line up
        names: dict[int, str] = {}
        for ev in nodes:
            b = ev.get("branching") or {}
            for named in (b, b.get("runner_up") or {}):
                if named.get("name"):
                    names.setdefault(int(named["var"]), named["name"])
        return cls(table, nodes.__getitem__, notes=list(notes), names=names)

    def with_context(self, *, notes: Iterable[dict[str, Any]] = (),
                     finding_nodes: Iterable[int] = ()) -> Walk:
        """A copy sharing the precomputed arrays, with these notes and finding nodes."""
        walk = copy.copy(self)
        walk.notes = list(notes)
        walk.finding_nodes = frozenset(int(n) for n in finding_nodes)
        return walk

    # ---------------------------------------------------------------- sizes
    def __len__(self) -> int:
        return len(self.rows)

    def step_of_node(self, node_id: int) -> int | None:
        """The step at which ``node_id`` was solved, or None (never solved / unknown)."""
        try:
            k = int(self.rank[self.table.row_of(node_id)])
        except KeyError:
            return None
        return k if k >= 0 else None

    def step_of_order(self, order: int) -> int | None:
        """The step of a recorded processing order (equal to it unless the log has gaps)."""
        orders = self.table.columns["order"][self.rows]
        at = int(np.searchsorted(orders, order))
        return at if at < len(orders) and orders[at] == order else None

    def incumbent_steps(self) -> list[int]:
        """Steps that produced a new incumbent (an incumbent from a start solution has none)."""
        found = self.trace.found_at[self.table.incumbents.order >= 0] - 1
        return sorted({int(k) for k in found if 0 <= k < len(self)})

    def finding_steps(self) -> list[int]:
        steps = (self.step_of_node(n) for n in self.finding_nodes)
        return sorted({k for k in steps if k is not None})

    def note_steps(self) -> list[int]:
        return sorted({k for k in (self._note_step(n) for n in self.notes) if k is not None})

    def _note_step(self, note: dict[str, Any]) -> int | None:
        if note.get("order") is not None:
            return self.step_of_order(int(note["order"]))
        if note.get("node") is not None:
            return self.step_of_node(int(note["node"]))
        return None

    # ---------------------------------------------------------------- one step
    def steps(self, start: int = 0, count: int | None = None) -> list[dict[str, Any]]:
        stop = len(self) if count is None else min(len(self), start + count)
        return [self.step(k) for k in range(max(start, 0), stop)]

    def step(self, k: int) -> dict[str, Any]:
        """Step ``k`` narrated: the sentences, the figures after it and jump flags."""
        if not 0 <= k < len(self):
            raise IndexError(f"step {k} is outside 0 … {len(self) - 1}")
        t = self.table
        row = int(self.rows[k])
        event = self.event_of(row)
        status = event["status"]
        found = self._found_at_step(k)
        after = k + 1
        primal, dual, gap = (_f(self.trace.primal[after]), _f(self.trace.dual[after]),
                             _f(self.trace.gap[after]))
        notes = [n for n in self.notes if self._note_step(n) == k]
        sentences = self._sentences(k, row, event, found)  # notes travel by id, beside them
        return {
            "step": k,
            "order": int(t.columns["order"][row]),
            "node": int(t.columns["id"][row]),
            "parent": event.get("parent"),
            "depth": int(t.columns["depth"][row]),
            "status": status,
            "sentences": sentences,
            "incumbent": primal,
            "dual_bound": dual,
            "gap": gap,
            "open": int(self.trace.open[after]),
            "new_incumbent": bool(found),
            "prune": status == "pruned",
            "finding": int(t.columns["id"][row]) in self.finding_nodes,
            "notes": [n["id"] for n in notes],
        }

    # ---------------------------------------------------------------- the sentences
    def _sentences(self, k: int, row: int, ev: dict[str, Any],
                   found: list[dict[str, Any]]) -> list[str]:
        out = [self._opening(k, ev)]
        lp = ev.get("lp") or {}
        status = ev["status"]
        lookahead = (ev.get("message") or "").startswith(_LOOKAHEAD_MESSAGE)
        value = _f(lp.get("objective"))
        if lookahead:
            if status == "infeasible":
                what = "is infeasible, so no integer solution lies below it"
            else:
                best = self._best_incumbent(k + 1)
                what = (f"has bound {num(_f(ev.get('bound')))}, which cannot beat the "
                        f"incumbent {num(best['objective']) if best else 'found so far'}")
            out.append("It is not solved again: the branching rule's look-ahead at its parent "
                       f"already found that this child {what}.")
        elif lp.get("status") == "optimal" and value is not None:
            text = f"Its relaxation value is {num(value)}"
            pv = self._parent_value(row)
            if pv is not None:
                worse = self.trace.sign * (value - pv)
                if worse > 1e-9 * max(1.0, abs(pv)):
                    text += f", {num(worse)} worse than its parent's {num(pv)}"
                else:
                    text += f", no worse than its parent's {num(pv)}"
            out.append(text + ".")
        if status == "branched":  # (a pruned node's reason gives its fractional count)
            out.append(self._fractional(ev))
        if status == "branched":
            out.extend(self._choice(ev))
            out.extend(self._children(row, ev))
        elif not lookahead:
            reason = self._reason(k, row, ev, status, found)
            if reason:
                out.append(reason)
        for inc in found:
            if not (status == "integral" and inc["source"] == "integral"):
                how = {"rounding": "Rounding its relaxation solution to the nearest integers "
                                   "gave a feasible point"}.get(inc["source"],
                                                                 "A solution was found here")
                out.append(f"{how}: a new incumbent {num(inc['objective'])}.")
        dropped = self._discard_step.get(k, 0)
        if dropped:
            out.append(f"The new incumbent makes {_plural(dropped, 'waiting node')} useless: "
                       f"their inherited bounds cannot beat it, so they are discarded.")
        out.append(self._standing(k))
        if k == len(self) - 1 and self.table.end is not None:
            end = str(self.table.end.get("status"))
            out.append(f"This is the last step: {_END_WORDS.get(end, 'the search stopped')}"
                       f" ({end}).")
        return out

    def _opening(self, k: int, ev: dict[str, Any]) -> str:
        # (the step number is the UI's counter; the sentences stay free of it)
        head = f"Node {ev['id']} is solved"
        if (ev.get("message") or "").startswith(_LOOKAHEAD_MESSAGE):
            head = f"Node {ev['id']} is reported"
        branch = ev.get("branch")
        if ev.get("parent") is None:
            return f"{head}: the root, under the model's own bounds."
        change = ""
        if branch:
            sign = "≤" if branch["dir"] == "down" else "≥"
            change = f" by {self._name(branch['var'], branch.get('name'))} {sign} " \
                     f"{num(_f(branch['value']))}"
        return f"{head}: depth {ev['depth']}, made from node {ev['parent']}{change}."

    def _fractional(self, ev: dict[str, Any]) -> str:
        n = int(ev.get("fractional") or 0)
        cands = (ev.get("branching") or {}).get("candidates")
        if not cands:
            return f"{_plural(n, 'integer variable is', 'integer variables are')} fractional."
        shown = ", ".join(f"{self._name(int(j))} = {num(float(v))}" for j, v in cands)
        more = n - len(cands)
        tail = f", and {more} more" if more > 0 else ""
        if n == 1:
            return f"1 integer variable is fractional: {shown}."
        return f"{n} integer variables are fractional: {shown}{tail}."

    def _choice(self, ev: dict[str, Any]) -> list[str]:
        b = ev.get("branching")
        if not b:
            return ["The log does not say which variable the search branched on."]
        rule = b.get("rule") or "branching"
        name = self._name(b["var"], b.get("name"))
        text = f"The {rule} rule chooses {name} = {num(_f(b.get('value')))}"
        score = _f(b.get("score"))
        ru = b.get("runner_up")
        if ru:
            rs = _f(ru.get("score"))
            rname = self._name(ru["var"], ru.get("name"))
            if score is not None and rs is not None and math.isclose(score, rs, rel_tol=1e-9,
                                                                     abs_tol=1e-12):
                text += (f": its score {num(score)} ties with {rname}'s, and the tie goes to "
                         "the lower column index")
            else:
                text += f" with score {num(score)}, ahead of the runner-up {rname} " \
                        f"({num(rs)})"
                if score is not None and score >= HUGE_SCORE:
                    text += " (a child the look-ahead can close at once counts as a huge gain)"
        elif int(ev.get("fractional") or 0) == 1:
            text += ", the only candidate"
        elif score is not None:
            text += f" with score {num(score)}"
        out = [text + "."]
        how = RULE_SCORES.get(rule)
        if how:
            out.append(f"How it decides: {how}.")
        return out

    def _children(self, row: int, ev: dict[str, Any]) -> list[str]:
        b = ev.get("branching") or {}
        at = np.searchsorted(self._kid_parent, row)
        stop = np.searchsorted(self._kid_parent, row, side="right")
        kids = [int(r) for r in self._kid_rows[at:stop]]
        if not kids:
            return ["Its two children wait to be solved."]
        out = []
        seen = self._lookahead(b, kids)
        if seen:
            out.append(f"The rule's look-ahead already solved both children: {seen}.")
        out.append("Children: " + "; ".join(self._child(r) for r in kids) + ".")
        return out

    def _lookahead(self, b: dict[str, Any], kids: list[int]) -> str:
        """'down 7.5, up infeasible' from the recorded look-ahead bounds, or ''."""
        c = self.table.columns
        closed = {DIRECTIONS[int(c["branch_dir"][r])]: STATUSES[int(c["status"][r])]
                  for r in kids
                  if (self.event_of(r).get("message") or "").startswith(_LOOKAHEAD_MESSAGE)}
        down, up = _f(b.get("down_bound")), _f(b.get("up_bound"))
        if down is None and up is None and not closed:
            return ""  # the rule did not look ahead at this node
        parts = []
        for word, value in (("down", down), ("up", up)):
            if value is not None:
                parts.append(f"{word} {num(value)}")
            elif closed.get(word) == "infeasible" or (down is None) != (up is None):
                parts.append(f"{word} infeasible")  # null beside a number: closed as infeasible
            else:
                parts.append(f"{word} not measured")
        return ", ".join(parts)

    def _child(self, r: int) -> str:
        c = self.table.columns
        cid = int(c["id"][r])
        d = DIRECTIONS[int(c["branch_dir"][r])]
        sign = "≤" if d == "down" else "≥"
        var = int(c["branch_var"][r])
        label = f"node {cid} ({self._name(var)} {sign} {num(_f(c['branch_value'][r]))})"
        status = STATUSES[int(c["status"][r])]
        step = int(self.rank[r])
        bound = _f(c["lp_objective"][r])
        if bound is None:
            bound = _f(c["bound"][r])
        when = f"step {step + 1}" if step >= 0 else ""
        if status == "infeasible":
            return f"{label} turns out infeasible at {when}" if when else f"{label} is infeasible"
        if status == "discarded":
            return f"{label} is discarded before it is solved"
        if status == "open":
            return f"{label} is still waiting when the search stops"
        if status == "failed":
            return f"{label} fails to solve at {when}"
        verb = {"pruned": "and is pruned", "integral": "and is integral",
                "branched": "and branches again"}.get(status, "")
        return f"{label} has bound {num(bound)} at {when} {verb}".rstrip()

    def _reason(self, k: int, row: int, ev: dict[str, Any], status: str,
                found: list[dict[str, Any]]) -> str:
        # status_reason wants the incumbent known when the node was decided: for an
        # integral node the one before it, otherwise including what it found itself.
        limit = k if status == "integral" else k + 1
        best = self._best_incumbent(limit)
        here = next((f for f in found if f["source"] == "integral"), None) \
            if status == "integral" else (found[-1] if found else None)
        text = status_reason(status=status, node=ev, incumbent=best, found_here=here,
                             children=[], end_status=None)
        return text.replace("Its relaxation solution satisfies", "The relaxation solution "
                            "satisfies", 1)

    def _standing(self, k: int) -> str:
        after = k + 1
        primal, dual = _f(self.trace.primal[after]), _f(self.trace.dual[after])
        waiting = int(self.trace.open[after])
        left = _plural(waiting, "node waits", "nodes wait")
        if primal is None:
            return f"Now: no incumbent yet, dual bound {num(dual)}, {left}."
        return (f"Now: incumbent {num(primal)}, dual bound {num(dual)}, gap "
                f"{gap_text(_f(self.trace.gap[after]))}, {left}.")

    # ---------------------------------------------------------------- helpers
    def _name(self, var: int, given: str | None = None) -> str:
        if given:
            self._names.setdefault(var, given)
            return given
        return self._names.get(var) or f"column {var}"

    def _parent_value(self, row: int) -> float | None:
        p = int(self.table.columns["parent_row"][row])
        if p < 0:
            return None
        return _f(self.table.columns["lp_objective"][p])

    def _incumbent(self, i: int) -> dict[str, Any]:
        inc = self.table.incumbents
        node = int(inc.node[i])
        return {"objective": float(inc.objective[i]), "node": None if node < 0 else node,
                "source": SOURCES[int(inc.source[i])]}

    def _found_at_step(self, k: int) -> list[dict[str, Any]]:
        inc = self.table.incumbents
        hits = np.flatnonzero((self.trace.found_at == k + 1) & (inc.order >= 0))
        return [self._incumbent(int(i)) for i in hits]

    def _best_incumbent(self, limit: int) -> dict[str, Any] | None:
        """The best incumbent counted after ``limit`` processed nodes."""
        inc = self.table.incumbents
        idx = np.flatnonzero(self.trace.found_at <= limit)
        if not len(idx):
            return None
        values = self.trace.sign * inc.objective[idx]
        return self._incumbent(int(idx[int(np.argmin(values))]))

    def _discards(self) -> dict[int, int]:
        """Step → how many waiting nodes were discarded right after it."""
        c = self.table.columns
        rows = np.flatnonzero(c["status"] == STATUSES.index("discarded"))
        steps = self.trace.done_at[rows] - 1
        found, counts = np.unique(steps[steps >= 0], return_counts=True)
        return {int(s): int(n) for s, n in zip(found, counts, strict=True)}


def narrate_log(path: str | os.PathLike[str]) -> list[dict[str, Any]]:
    """Every step of a (small) run log, narrated."""
    return Walk.from_log(path).steps()
