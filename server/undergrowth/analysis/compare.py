"""Comparing searches: one metrics row per run, shifted geometric means, performance
profiles and best-per-column marks. Every function returns plain JSON-ready data
(dicts, lists, floats, None) so the CLI, the server and the tests share them.

Conventions (also in docs/compare.md):

- A *problem* is one (model, seed) pair; a *solver* is one (branching rule, node
  order) pair. A run is one solver on one problem.
- A run is *finished* when its end status is conclusive: ``optimal``,
  ``infeasible``, ``unbounded`` or ``gap-reached`` (the requested gap was met).
  Limits, cancels, failed relaxations and a missing end event are not.
- Lower is better in every numeric column; status is a word and not ranked.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Mapping, Sequence
from typing import TYPE_CHECKING, Any

import numpy as np

from .measures import primal_integral

if TYPE_CHECKING:
    from .table import RunTable

__all__ = ["FINISHED_STATUSES", "METRIC_COLUMNS", "ROW_KEYS", "SGM_SHIFTS", "best_marks",
           "branched_variables", "branching_overlap", "finished", "performance_profile",
           "profile_rows", "rows_for_tables", "run_row", "shifted_geometric_mean",
           "solver_means", "summary"]

FINISHED_STATUSES = frozenset({"optimal", "infeasible", "unbounded", "gap-reached"})
# Status of a run whose log has no end event (the process died or is still running).
UNFINISHED = "unfinished"

ROW_KEYS = ("model", "branching", "select", "seed", "status", "nodes", "lp_iterations",
            "seconds", "first_incumbent_seconds", "gap", "primal_integral", "max_depth",
            "run_log")
# The ranked columns; lower is better in each of them.
METRIC_COLUMNS = ("nodes", "lp_iterations", "seconds", "first_incumbent_seconds", "gap",
                  "primal_integral", "max_depth")
# Effort columns: a run that stopped at a limit used less only because it gave up, so
# among the runs of one problem only finished runs compete (if any finished).
EFFORT_COLUMNS = frozenset({"nodes", "lp_iterations", "seconds", "max_depth"})

# Shifts: 10 s for time and 100 for nodes are common practice in MIP benchmarking (from
# memory: Achterberg, "Constraint Integer Programming", PhD thesis, TU Berlin, 2007);
# 1000 for LP iterations is our own choice, of the same order as a few nodes' work.
SGM_SHIFTS: dict[str, float] = {"nodes": 100.0, "seconds": 10.0, "lp_iterations": 1000.0}


def finished(status: str | None) -> bool:
    return status in FINISHED_STATUSES


def _finite(x: float | None) -> float | None:
    return float(x) if x is not None and math.isfinite(x) else None


# ------------------------------------------------------------------ rows
def run_row(table: RunTable, *, reference: float | None = None,
            run_log: str | None = None) -> dict[str, Any]:
    """The metrics row of one recorded run.

    ``reference`` is the objective value the primal integral measures against
    (Berthold, "Measuring the impact of primal heuristics", Operations Research
    Letters 41(6), 2013); comparisons pass the best value any run of the problem
    found, so all rows of a problem share it. Without it the run's own best is used.
    The integral is over seconds; a run without a solution integrates gap 1.
    """
    header = table.header
    settings = header.get("settings") or {}
    end = table.end or {}
    c = table.columns
    solved = c["order"] >= 0
    nodes = end.get("nodes")
    if nodes is None:
        nodes = int(solved.sum())
    seconds = end.get("time")
    if seconds is None:
        seconds = float(np.nanmax(c["time"])) if len(c["time"]) else 0.0
    inc_times = table.incumbents.time
    lp_iterations = end.get("lp_iterations")
    if lp_iterations is None:
        lp_iterations = int(np.clip(c["iterations"], 0, None).sum())
    return {
        "model": str((header.get("model") or {}).get("name") or ""),
        "branching": settings.get("branching"),
        "select": settings.get("select"),
        "seed": settings.get("seed"),
        "status": end.get("status") or UNFINISHED,
        "nodes": int(nodes),
        "lp_iterations": int(lp_iterations),
        "seconds": float(seconds),
        "first_incumbent_seconds": float(inc_times.min()) if len(inc_times) else None,
        "gap": _finite(end.get("gap")) if end else None,
        "primal_integral": _finite(primal_integral(table, reference=reference).value),
        "max_depth": int(c["depth"][solved].max()) if solved.any() else None,
        "run_log": run_log if run_log is not None else table.path,
    }


def best_objective(tables: Iterable[RunTable]) -> float | None:
    """The best incumbent value over runs of one model (all in the same sense)."""
    best: float | None = None
    for table in tables:
        obj = table.incumbents.objective
        if not len(obj):
            continue
        value = float(obj.min() if table.sense == "min" else obj.max())
        if best is None or (value < best if table.sense == "min" else value > best):
            best = value
    return best


def rows_for_tables(tables: Sequence[RunTable], *, run_logs: Sequence[str] | None = None,
                    models: Sequence[str] | None = None) -> list[dict[str, Any]]:
    """Rows for several runs; runs of the same model share the primal-integral reference
    (the best solution any of them found). ``models`` overrides the model label of each
    run (the header's model name otherwise), e.g. to keep two models of one name apart."""
    for arg, given in (("run_logs", run_logs), ("models", models)):
        if given is not None and len(given) != len(tables):
            raise ValueError(f"{arg}: expected {len(tables)} entries, got {len(given)}")
    labels = list(models) if models is not None else [
        str((t.header.get("model") or {}).get("name") or "") for t in tables]
    by_model: dict[str, list[RunTable]] = {}
    for label, t in zip(labels, tables, strict=True):
        by_model.setdefault(label, []).append(t)
    refs = {label: best_objective(group) for label, group in by_model.items()}
    rows = []
    for k, t in enumerate(tables):
        r = run_row(t, reference=refs[labels[k]],
                    run_log=None if run_logs is None else run_logs[k])
        r["model"] = labels[k]
        rows.append(r)
    return rows


# ------------------------------------------------------------------ best marks
def _problem(row: Mapping[str, Any]) -> tuple[str, Any]:
    return (str(row["model"]), row.get("seed"))


def best_marks(rows: Sequence[Mapping[str, Any]], *,
               columns: Sequence[str] = METRIC_COLUMNS) -> list[dict[str, bool]]:
    """For each row, which columns hold the best (lowest) value among the runs of the
    same problem (model and seed). Ties are all marked; missing values never are. In
    effort columns only finished runs compete, unless none of the problem finished."""
    groups: dict[tuple[str, Any], list[int]] = {}
    for i, row in enumerate(rows):
        groups.setdefault(_problem(row), []).append(i)
    marks: list[dict[str, bool]] = [dict.fromkeys(columns, False) for _ in rows]
    for members in groups.values():
        done = [i for i in members if finished(rows[i]["status"])]
        for col in columns:
            pool = done if (col in EFFORT_COLUMNS and done) else members
            values = [(rows[i][col], i) for i in pool if rows[i][col] is not None]
            if not values:
                continue
            low = min(v for v, _ in values)
            for v, i in values:
                if v == low:
                    marks[i][col] = True
    return marks


# ------------------------------------------------------------------ means
def shifted_geometric_mean(values: Iterable[float], *, shift: float) -> float:
    """(∏ (v_i + s))^(1/n) − s, the shifted geometric mean with shift ``s``.

    The shift keeps tiny values (a 0.01 s run) from dominating a ratio-based mean.
    Computed through logarithms so long products do not overflow."""
    v = np.asarray(list(values), dtype=np.float64)
    if v.size == 0:
        raise ValueError("values: need at least one value")
    if shift < 0 or not math.isfinite(shift):
        raise ValueError(f"shift: must be a finite non-negative number, got {shift}")
    if not np.all(np.isfinite(v)):
        raise ValueError("values: every value must be finite")
    if np.any(v + shift <= 0):
        raise ValueError(f"values: each value plus the shift ({shift}) must be positive")
    return float(np.exp(np.mean(np.log(v + shift))) - shift)


def solver_means(rows: Sequence[Mapping[str, Any]], *,
                 shifts: Mapping[str, float] | None = None) -> list[dict[str, Any]]:
    """Shifted geometric means per solver (branching, select) over its runs.

    A run that stopped at a limit enters with the effort it had spent when it stopped
    (a lower bound on the true cost; the ``finished`` count says how many did not)."""
    shifts = dict(SGM_SHIFTS if shifts is None else shifts)
    groups: dict[tuple[Any, Any], list[Mapping[str, Any]]] = {}
    for row in rows:
        groups.setdefault((row["branching"], row["select"]), []).append(row)
    out = []
    for (branching, select), members in groups.items():
        entry: dict[str, Any] = {"branching": branching, "select": select,
                                 "runs": len(members),
                                 "finished": sum(finished(r["status"]) for r in members)}
        for col, s in shifts.items():
            entry[col] = shifted_geometric_mean((float(r[col]) for r in members), shift=s)
            entry[f"{col}_shift"] = s
        out.append(entry)
    return out


# ------------------------------------------------------------------ profiles
# A measured value of 0 (a run too fast for the clock) is raised to this so ratios stay
# defined; only the seconds column can be 0 in practice.
PROFILE_FLOOR = 1e-9


def performance_profile(rows: Sequence[Mapping[str, Any]], *,
                        measure: str = "nodes") -> dict[str, Any]:
    """The performance profile of Dolan & Moré ("Benchmarking optimization software
    with performance profiles", Mathematical Programming 91, 2002) as data.

    For problem p and solver s, r_ps = t_ps / min_s' t_ps' with t the ``measure``;
    a run that did not finish has r_ps = ∞ (so it never counts as solved), and a
    problem no solver finished has r_ps = ∞ for all. ρ_s(τ) = |{p : r_ps ≤ τ}| / n_p.

    Returns ``solvers`` (labels "rule / order"), ``problems`` ("model#seed"),
    ``ratios`` (ratios[s][p], None for ∞), and per solver the step function as
    ``steps``: [[τ, ρ(τ)], …] at each τ where ρ rises, starting at τ = 1, with
    ``at_one`` (share of problems where the solver was best) and ``solved`` (ρ(∞)).
    ``tau_max`` is the largest finite ratio (at least 1). Each solver must have at
    most one run per problem; a solver without a run on a problem fails it.
    """
    if measure not in ("nodes", "seconds", "lp_iterations"):
        raise ValueError(f"measure: must be 'nodes', 'seconds' or 'lp_iterations', "
                         f"got {measure!r}")
    solvers: list[tuple[Any, Any]] = []
    problems: list[tuple[str, Any]] = []
    cell: dict[tuple[int, int], float] = {}
    for row in rows:
        s_key = (row["branching"], row["select"])
        p_key = _problem(row)
        if s_key not in solvers:
            solvers.append(s_key)
        if p_key not in problems:
            problems.append(p_key)
        at = (solvers.index(s_key), problems.index(p_key))
        if at in cell:
            raise ValueError(f"rows: two runs of {s_key[0]} / {s_key[1]} on "
                             f"{p_key[0]} (seed {p_key[1]})")
        value = row.get(measure)
        ok = finished(row["status"]) and value is not None and math.isfinite(float(value))
        cell[at] = max(float(value), PROFILE_FLOOR) if ok else math.inf
    t = np.full((len(solvers), len(problems)), math.inf)
    for (si, pi), v in cell.items():
        t[si, pi] = v
    best = t.min(axis=0) if len(solvers) else np.zeros(0)
    with np.errstate(invalid="ignore"):
        r = np.where(np.isfinite(t), t / best, math.inf)
    n_p = len(problems)
    finite = r[np.isfinite(r)]
    tau_max = float(finite.max()) if finite.size else 1.0
    curves = []
    for si in range(len(solvers)):
        ratios = np.sort(r[si][np.isfinite(r[si])])
        steps: list[list[float]] = []
        if n_p:
            taus, counts = np.unique(ratios, return_counts=True)
            reached = np.cumsum(counts)
            if not taus.size or taus[0] > 1.0:
                steps.append([1.0, 0.0])
            steps += [[float(tau), float(k) / n_p] for tau, k in zip(taus, reached, strict=True)]
        curves.append({
            "solver": _label(solvers[si]),
            "branching": solvers[si][0], "select": solvers[si][1],
            "steps": steps,
            "at_one": float(np.sum(r[si] <= 1.0)) / n_p if n_p else 0.0,
            "solved": float(np.sum(np.isfinite(r[si]))) / n_p if n_p else 0.0,
        })
    return {
        "measure": measure,
        "solvers": [_label(s) for s in solvers],
        "problems": [f"{m}#{seed}" for m, seed in problems],
        "ratios": [[None if not math.isfinite(x) else float(x) for x in r[si]]
                   for si in range(len(solvers))],
        "curves": curves,
        "tau_max": max(tau_max, 1.0),
    }


def profile_rows(profile: Mapping[str, Any]) -> list[dict[str, Any]]:
    """The profile's step points as flat rows (measure, solver, tau, share) for CSV."""
    return [{"measure": profile["measure"], "solver": c["solver"], "tau": tau, "share": share}
            for c in profile["curves"] for tau, share in c["steps"]]


def _label(solver: tuple[Any, Any]) -> str:
    return f"{solver[0]} / {solver[1]}"


# ------------------------------------------------------------------ branching variables
def branched_variables(table: RunTable, *, top: int = 10) -> dict[str, Any]:
    """How often the search branched on each variable: one count per branched node,
    read from its down child's bound change (every branching makes exactly one down
    child). ``top`` entries ``{var, name, count, share}``, most frequent first, ties
    by variable index; ``branchings`` is the total, ``variables`` how many distinct
    variables were branched on."""
    c = table.columns
    down = (c["parent_row"] >= 0) & (c["branch_var"] >= 0) & (c["branch_dir"] == 1)
    var = c["branch_var"][down].astype(np.int64)
    total = int(var.size)
    if not total:
        return {"branchings": 0, "variables": 0, "top": []}
    used, counts = np.unique(var, return_counts=True)
    order = np.lexsort((used, -counts))[:max(0, top)]
    names = table.var_names
    return {"branchings": total, "variables": int(used.size), "top": [
        {"var": int(used[k]), "name": names.get(int(used[k]), f"x{int(used[k])}"),
         "count": int(counts[k]), "share": float(counts[k]) / total} for k in order]}


def branching_overlap(tops: Sequence[Sequence[str]]) -> dict[str, Any]:
    """The overlap of several runs' most-branched variables (given by name, so runs of
    one model compare by variable): ``common`` (names in every list, in the first
    list's order), ``in_runs`` (name → in how many lists) and per pair of runs
    ``{a, b, shared, jaccard}`` with the Jaccard index |A ∩ B| / |A ∪ B| of the two
    sets (0 when both are empty)."""
    sets = [set(t) for t in tops]
    in_runs: dict[str, int] = {}
    for t in tops:
        for name in dict.fromkeys(t):
            in_runs[name] = in_runs.get(name, 0) + 1
    common = [n for n in dict.fromkeys(tops[0])
              if all(n in s for s in sets)] if tops else []
    pairs = []
    for i in range(len(sets)):
        for j in range(i + 1, len(sets)):
            union = sets[i] | sets[j]
            shared = [n for n in dict.fromkeys(tops[i]) if n in sets[j]]
            pairs.append({"a": i, "b": j, "shared": shared,
                          "jaccard": len(shared) / len(union) if union else 0.0})
    return {"common": common, "in_runs": in_runs, "pairs": pairs}


# ------------------------------------------------------------------ all at once
def summary(rows: Sequence[Mapping[str, Any]], *,
            shifts: Mapping[str, float] | None = None) -> dict[str, Any]:
    """Rows, their best marks, the per-solver shifted geometric means and the profiles
    by nodes and by seconds, in one JSON-ready dict (what a compare view needs)."""
    shifts = dict(SGM_SHIFTS if shifts is None else shifts)
    problems = {_problem(r) for r in rows}
    return {
        "rows": [dict(r) for r in rows],
        "marks": best_marks(rows),
        "lower_is_better": list(METRIC_COLUMNS),
        "problems": len(problems),
        "means": solver_means(rows, shifts=shifts) if rows else [],
        "shifts": shifts,
        "profiles": {m: performance_profile(rows, measure=m) for m in ("nodes", "seconds")},
    }
