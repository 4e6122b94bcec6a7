"""Findings about the search: what the tree and its bounds say about why it is slow.

Each check reads the per-node trace (`measures.node_trace`) and the node table;
all are vectorised, so a million-node run takes a second or two. Thresholds are
module constants; docs/findings.md gives the reasons for each.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from ..model.checks import short_number
from .findings import Finding
from .measures import (
    BRANCHED,
    FAILED,
    INFEASIBLE,
    NodeTrace,
    gap_closed,
    node_trace,
    primal_integral,
    root_gap,
)

if TYPE_CHECKING:
    from ..model import Problem
    from .table import RunTable

__all__ = ["search_findings"]

# weak-root: a root gap of 10% or more is large by common practice (a tight
# formulation typically closes all but a few percent at the root)...
WEAK_ROOT_GAP = 0.10
WEAK_ROOT_HIGH_GAP = 0.30
# ...and it is "closed slowly" when the search needed at least this many nodes (or has
# not finished): below that the tree closed it almost at once.
WEAK_ROOT_MIN_NODES = 50

# dual-stall: the dual bound moves by less than this share of the root gap...
DUAL_STALL_TOLERANCE = 0.01
# ...over at least this share of the processed nodes, and at least this many nodes.
DUAL_STALL_SHARE = 0.5
DUAL_STALL_MIN_NODES = 100
# The open list "grew" when its peak during the stretch is at least this many times
# its size at the start, and at least DUAL_STALL_GROWTH_NODES more.
DUAL_STALL_GROWTH = 2.0
DUAL_STALL_GROWTH_NODES = 10

# late-incumbent: the first incumbent came after this share of the processed nodes,
# in a run of at least LATE_MIN_NODES nodes.
LATE_SHARE = 0.5
LATE_MIN_NODES = 50

# infeasible-heavy: at least this share of the solved leaves were infeasible (more
# than the pruned and integral ones together), and at least INFEASIBLE_MIN of them.
INFEASIBLE_SHARE = 0.5
INFEASIBLE_HIGH_SHARE = 0.8
INFEASIBLE_MIN = 20

# branching-hotspot: the fewest variables that take HOTSPOT_BRANCH_SHARE of the
# branchings are at most HOTSPOT_VAR_SHARE of the integer columns, and the median
# bound gain of their solved children is at most HOTSPOT_GAIN of the root gap.
HOTSPOT_BRANCH_SHARE = 0.8
HOTSPOT_VAR_SHARE = 0.10
HOTSPOT_GAIN = 0.01
HOTSPOT_MIN_BRANCHINGS = 50
# How many variables a per-item table lists.
DETAILS_SHOWN = 20


def search_findings(table: RunTable, problem: Problem | None = None) -> list[Finding]:
    trace = node_trace(table)
    if trace.processed == 0:
        return []
    checks = (_failed_nodes(table, trace), *_incumbent(table, trace),
              _weak_root(table, trace), _dual_stall(table, trace),
              _branching_hotspot(table, trace, problem),
              _infeasible_heavy(table, trace, problem))
    return [f for f in checks if f is not None]


# ------------------------------------------------------------------ helpers
def _pct(share: float | None) -> str:
    if share is None or not np.isfinite(share):
        return "-"
    return f"{100 * share:.3g}%"


def _num(x: float) -> str:
    return f"{x:.6g}"


def _ids(table: RunTable, rows: np.ndarray) -> list[int]:
    return [int(x) for x in table.columns["id"][rows]]


def _var_name(table: RunTable, problem: Problem | None, j: int) -> str:
    if problem is not None and 0 <= j < problem.num_cols:
        return problem.col_names[j]
    return table.var_names.get(j, f"x{j}")


def _gap_scale(table: RunTable) -> float | None:
    """|best known − root bound|: the yardstick for 'the bound barely moved'."""
    rg = root_gap(table)
    if rg is None:
        return None
    span = abs(rg.reference - rg.root_bound)
    return span if span > 0 else None


def _order_word(table: RunTable) -> str:
    return str((table.header.get("settings") or {}).get("select", ""))


# ------------------------------------------------------------------ failed-nodes
def _failed_nodes(table: RunTable, trace: NodeTrace) -> Finding | None:
    c = table.columns
    rows = np.flatnonzero(c["status"] == FAILED)
    if not rows.size:
        return None
    first = int(c["order"][rows].min())
    return Finding(
        code="failed-nodes", severity="high",
        title=f"{rows.size} relaxation(s) gave no usable answer; the result is not proven",
        evidence={"failed": int(rows.size), "share": rows.size / trace.processed,
                  "first_order": first, "processed": trace.processed},
        explanation=(
            "The LP solver returned no usable answer at these nodes (numerical trouble, "
            "an iteration limit, or an unbounded relaxation). Their regions were never "
            "explored, so the search cannot prove optimality: their inherited bounds stay "
            "in the dual bound."),
        advice=(
            "Look for numerical causes first: badly scaled rows or columns (bad-scaling), "
            "huge big-M coefficients, nearly parallel rows. Rescaling units or tightening "
            "coefficients usually cures it; as a check, solve one failed node's bounds "
            "with a tighter feasibility tolerance."),
        refs={"nodes": _ids(table, rows)},
    )


# ------------------------------------------------------------------ incumbent
def _incumbent(table: RunTable, trace: NodeTrace) -> list[Finding | None]:
    n = trace.processed
    inc = table.incumbents
    end = table.end or {}
    if not len(inc):
        if end.get("status") == "infeasible":
            return [Finding(
                code="no-incumbent", severity="info",
                title=f"No integer solution exists: the search proved it in {n} nodes",
                evidence={"processed": n, "tree_nodes": len(table)},
                explanation=(
                    "The tree was exhausted without an integer-feasible point, so the model "
                    "is infeasible (as the search is set up). Every leaf closed because its "
                    "relaxation was infeasible or its bound showed nothing there."),
                advice=(
                    "If the model should be feasible, look for contradictory rows: relax "
                    "groups of rows, or bounds, until it becomes feasible; a row whose "
                    "coefficients share a divisor that does not divide its right-hand side "
                    "can never hold with integers."),
            )]
        waiting = int(trace.open[-1])
        return [Finding(
            code="no-incumbent", severity="high",
            title=f"No incumbent after {n} nodes",
            evidence={"processed": n, "open": waiting, "seconds": trace.end_time,
                      "end_status": end.get("status")},
            explanation=(
                "The search has not found a single integer-feasible solution, so nothing "
                "can be pruned by bound: every node must be branched until it is integral "
                "or infeasible, and the gap is unknown."),
            advice=(
                "Supply a start solution (even a poor one), use a node order that dives "
                "(depth-first or hybrid) to reach leaves early, and check that the model is "
                "feasible at all, e.g. by solving it with the objective set to zero."),
        )]
    first = int(trace.found_at.min())
    if n < LATE_MIN_NODES or first <= LATE_SHARE * n:
        return [None]
    at = int(np.argmin(trace.found_at))
    node = int(inc.node[at])
    t_first = float(inc.time[at])
    pi = primal_integral(table)
    return [Finding(
        code="late-incumbent", severity="medium",
        title=f"The first incumbent came only after {_pct(first / n)} of the nodes",
        evidence={"first_at": first, "processed": n, "share": first / n,
                  "seconds": t_first, "time_share": t_first / trace.end_time
                  if trace.end_time > 0 else None,
                  "primal_integral": pi.value, "primal_integral_average": pi.average,
                  "node_order": _order_word(table)},
        explanation=(
            f"For the first {first} of {n} nodes there was no incumbent, so no node could "
            "be pruned by bound and nodes piled up. The primal integral (Berthold 2013) "
            f"averages {short_number(pi.average)} over the run, where 0 would mean the "
            "best solution was known from the start."),
        advice=(
            "Find a solution early: supply a start solution, use a diving order (hybrid "
            "or depth-first) instead of pure best-bound, or add a problem-specific "
            "heuristic (e.g. round and repair) through your own recorder."),
        refs={"nodes": [node] if node >= 0 else []},
    )]


# ------------------------------------------------------------------ weak-root
def _weak_root(table: RunTable, trace: NodeTrace) -> Finding | None:
    rg = root_gap(table)
    if rg is None or rg.gap < WEAK_ROOT_GAP:
        return None
    n = trace.processed
    finished = int(trace.open[-1]) == 0
    if finished and n < WEAK_ROOT_MIN_NODES:
        return None
    closed = gap_closed(table)
    half = np.flatnonzero(closed >= 0.5)
    tenth = max(1, n // 10)
    final_gap = float(trace.gap[-1]) if np.isfinite(trace.gap[-1]) else None
    title = (f"The root relaxation leaves a {_pct(rg.gap)} gap; closing it took {n} nodes"
             if finished else
             f"The root relaxation leaves a {_pct(rg.gap)} gap; {n} nodes closed "
             f"{_pct(closed[-1])} of it")
    return Finding(
        code="weak-root", severity="high" if rg.gap >= WEAK_ROOT_HIGH_GAP else "medium",
        title=title,
        evidence={"root_gap": rg.gap, "root_bound": rg.root_bound, "reference": rg.reference,
                  "reference_kind": rg.reference_kind, "processed": n,
                  "nodes_to_close_half": int(half[0]) if half.size else None,
                  "closed_after_10pct": float(closed[tenth]),
                  "closed_after_half": float(closed[max(1, n // 2)]),
                  "final_gap": final_gap},
        explanation=(
            f"The root relaxation's bound {_num(rg.root_bound)} is {_pct(rg.gap)} "
            f"away from the best known value {_num(rg.reference)} "
            f"({rg.reference_kind}). Branching closes such a gap only a little per node: "
            f"after a tenth of the nodes the dual bound had closed {_pct(closed[tenth])} of "
            "it. A stronger formulation moves the root bound itself."),
        advice=(
            "Tighten the formulation: smaller big-M coefficients (see loose-big-m when the "
            "model is given), one linking row per pair instead of aggregated ones, tighter "
            "variable bounds, or valid inequalities for the structure. Compare the root "
            "bound after each change; every point of gap closed there saves nodes."),
        refs={"nodes": [rg.root]},
    )


# ------------------------------------------------------------------ dual-stall
def _dual_stall(table: RunTable, trace: NodeTrace) -> Finding | None:
    n = trace.processed
    scale = _gap_scale(table)
    if n < DUAL_STALL_MIN_NODES or scale is None:
        return None
    d = trace.dual_min[1:]  # after 1 … n nodes; never falls
    ok = np.isfinite(d)
    if not ok.any():
        return None
    first = int(np.argmax(ok))
    d = d[first:]
    tol = DUAL_STALL_TOLERANCE * scale
    # For each start, the last node at which the bound is still within tol of it.
    reach = np.searchsorted(d, d + tol, side="right") - 1
    lengths = reach - np.arange(len(d)) + 1
    s = int(np.argmax(lengths))
    length = int(lengths[s])
    if length < DUAL_STALL_SHARE * n or length < DUAL_STALL_MIN_NODES:
        return None
    k0, k1 = first + s + 1, first + int(reach[s]) + 1  # processed-node counts
    open_start = int(trace.open[k0])
    open_peak = int(trace.open[k0:k1 + 1].max())
    peak_at = k0 + int(np.argmax(trace.open[k0:k1 + 1]))
    order = _order_word(table)
    # A depth-first open list grows with the depth of the dive, not with the tree's
    # width, so its growth is no sign of trouble there.
    grew = (order != "depth-first"
            and open_peak >= DUAL_STALL_GROWTH * max(open_start, 1)
            and open_peak - open_start >= DUAL_STALL_GROWTH_NODES)
    moved = float(d[reach[s]] - d[s])
    # The waiting nodes that held the bound down when the open list was longest.
    level = trace.dual_min[peak_at] + tol
    holding = np.flatnonzero((trace.born_at <= peak_at) & (trace.open_until >= peak_at)
                             & (trace.waiting_bound_min <= level))
    holding = holding[np.argsort(trace.waiting_bound_min[holding], kind="stable")]
    note = (" With a depth-first order shallow nodes wait a long time, so a flat dual "
            "bound is partly the order's doing; a best-bound run shows whether the bound "
            "can move at all." if order == "depth-first" else "")
    grow_text = (f" while the open list grew from {open_start} to {open_peak} nodes"
                 if open_peak > open_start and order != "depth-first" else "")
    return Finding(
        code="dual-stall", severity="high" if grew else "medium",
        title=f"The dual bound stayed flat for {_pct(length / n)} of the nodes{grow_text}",
        evidence={"from_node": k0, "to_node": k1, "nodes": length, "share": length / n,
                  "open_peak_at": peak_at,
                  "dual_bound": float(trace.dual[k0]), "moved": moved,
                  "moved_share_of_root_gap": moved / scale, "open_at_start": open_start,
                  "open_peak": open_peak, "open_at_end": int(trace.open[k1]),
                  "node_order": order},
        explanation=(
            f"From node {k0} to node {k1} the dual bound moved by {_num(moved)}, "
            f"{_pct(moved / scale)} of the root gap. The nodes processed there each "
            "closed their own piece of the tree without lifting the weakest bound: the "
            "search is proving that many equivalent or similar subtrees hold nothing "
            "better, which is what symmetry or a weak relaxation look like." + note),
        advice=(
            "Look at what the nodes in refs have in common (their branching variables, "
            "see branching-hotspot): break symmetry between interchangeable variables, "
            "strengthen the relaxation (cuts, tighter links), or try a branching rule "
            "that looks ahead (strong or reliability)."),
        refs={"nodes": _ids(table, holding)},
    )


# ------------------------------------------------------------------ hotspot
def _branching_hotspot(table: RunTable, trace: NodeTrace, problem: Problem | None
                       ) -> Finding | None:
    c = table.columns
    child = np.flatnonzero((c["parent_row"] >= 0) & (c["branch_var"] >= 0))
    down = child[c["branch_dir"][child] == 1]
    if len(down) < HOTSPOT_MIN_BRANCHINGS:
        return None
    counts = np.bincount(c["branch_var"][down])
    used = np.flatnonzero(counts)
    used = used[np.argsort(-counts[used], kind="stable")]
    share = np.cumsum(counts[used]) / len(down)
    k = int(np.searchsorted(share, HOTSPOT_BRANCH_SHARE - 1e-12) + 1)
    declared = int((table.header.get("model") or {}).get("integers") or 0)
    integers = problem.num_integers if problem is not None else max(declared, len(used))
    if k > HOTSPOT_VAR_SHARE * integers:
        return None
    hot = used[:k]
    scale = _gap_scale(table)
    if scale is None:
        return None
    sign = trace.sign
    kids = child[np.isin(c["branch_var"][child], hot) & (c["order"][child] >= 0)
                 & (c["status"][child] != INFEASIBLE)]
    gains = sign * (c["bound"][kids] - c["bound"][c["parent_row"][kids]])
    gains = gains[np.isfinite(gains)]
    if not gains.size:
        return None
    median_gain = float(np.median(np.maximum(gains, 0.0))) / scale
    if median_gain > HOTSPOT_GAIN:
        return None
    zero = float(np.mean(gains <= 1e-9 * max(1.0, scale)))
    names = [_var_name(table, problem, int(j)) for j in hot]
    interchangeable = _interchangeable(problem, hot) if problem is not None else None
    sym = (f" {interchangeable} of them have identical columns (same cost, same "
           "coefficients, same bounds): swapping their values gives another solution of "
           "equal cost, which is symmetry." if interchangeable else
           " Such flat branchings are typical of symmetry: interchangeable variables "
           "whose values can be swapped without changing the cost.")
    return Finding(
        code="branching-hotspot", severity="medium",
        title=f"{k} of {integers} integer variables take {_pct(share[k - 1])} of the "
              f"branchings, with a median bound gain of {_pct(median_gain)} of the root gap",
        evidence={"branchings": len(down), "hot_variables": k, "integer_columns": integers,
                  "hot_share": float(share[k - 1]), "median_gain_share": median_gain,
                  "zero_gain_share": zero, "interchangeable": interchangeable},
        explanation=(
            f"The search keeps branching on the same few variables and the children's "
            f"bounds barely move: {_pct(zero)} of the solved, feasible children had the "
            "same bound as their parent." + sym),
        advice=(
            "Break the symmetry: order interchangeable variables (e.g. x₁ ≥ x₂ ≥ …), "
            "replace identical items by one integer count, or fix a representative. If "
            "the variables are not interchangeable, try a branching rule that measures "
            "gains (pseudocost, strong, reliability) and tighter formulations of the rows "
            "they appear in."),
        refs={"variables": names},
        details=[{"variable": name, "branchings": int(counts[j])}
                 for name, j in zip(names[:DETAILS_SHOWN], hot[:DETAILS_SHOWN], strict=False)],
    )


def _interchangeable(problem: Problem, columns: np.ndarray) -> int:
    """How many of ``columns`` share their column signature (cost, bounds, type and
    sorted coefficients) with another of them: candidates for swapping."""
    A = problem.A.tocsc()
    seen: dict[tuple, int] = {}
    for j in columns:
        j = int(j)
        if not 0 <= j < problem.num_cols:
            continue
        vals = np.sort(A.data[A.indptr[j]:A.indptr[j + 1]])
        key = (float(problem.c[j]), float(problem.col_lower[j]), float(problem.col_upper[j]),
               bool(problem.integrality[j]), tuple(np.round(vals, 12).tolist()))
        seen[key] = seen.get(key, 0) + 1
    return sum(v for v in seen.values() if v > 1)


# ------------------------------------------------------------------ infeasible
def _infeasible_heavy(table: RunTable, trace: NodeTrace, problem: Problem | None
                      ) -> Finding | None:
    c = table.columns
    status = c["status"]
    solved = c["order"] >= 0
    leaves = solved & (status != BRANCHED) & (status != FAILED)
    rows = np.flatnonzero(status == INFEASIBLE)
    n_leaves = int(leaves.sum())
    if rows.size < INFEASIBLE_MIN or rows.size < INFEASIBLE_SHARE * n_leaves:
        return None
    share = rows.size / n_leaves
    var = c["branch_var"][rows]
    var = var[var >= 0]
    counts = np.bincount(var) if var.size else np.zeros(0, dtype=np.int64)
    top = np.argsort(-counts, kind="stable")[:DETAILS_SHOWN]
    top = top[counts[top] > 0]
    names = [_var_name(table, problem, int(j)) for j in top]
    parity = []
    if problem is not None:
        from .findings_model import parity_rows

        parity = parity_rows(problem)
    parity_text = ""
    if parity:
        p = parity[0]
        parity_text = (f" The model shows why: in {p.row_name} every coefficient is a "
                       f"multiple of {p.divisor} but the right-hand side {_num(p.rhs)} "
                       "is not, so no integer point satisfies it; relaxations cannot see "
                       "that until almost every variable is fixed.")
    return Finding(
        code="infeasible-heavy",
        severity="high" if share >= INFEASIBLE_HIGH_SHARE else "medium",
        title=f"{_pct(share)} of the solved leaves were infeasible ({rows.size} nodes)",
        evidence={"infeasible": int(rows.size), "solved_leaves": n_leaves, "share": share,
                  "processed": trace.processed, "parity_rows": len(parity)},
        explanation=(
            "Most leaves closed because their relaxation had no solution at all, not "
            "because of their bound: the branching decisions above them had already made "
            "the rows impossible, and the search found out one LP at a time." + parity_text),
        advice=(
            "Let propagation find these contradictions before the LP does: tighten "
            "variable bounds from the rows (bound tightening), add the implied "
            "constraints among the branching variables listed, or reformulate rows that "
            "only integers can violate (divisibility, parity)."),
        refs={"nodes": _ids(table, rows), "variables": names,
              "rows": [p.row_name for p in parity]},
        details=[{"variable": name, "infeasible_children": int(counts[j])}
                 for name, j in zip(names, top, strict=False)],
    )
