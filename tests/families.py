"""Seeded generators of small mixed-integer models, for tests and benchmarks.

Every generator takes a ``seed`` first and returns a validated `Problem` whose
name records the family, the seed and the size, so a failing test names the
model it ran. The same seed always gives the same model. Default sizes are
chosen so the continuous relaxation is fractional and the search tree has a
few dozen nodes rather than one.
"""

from __future__ import annotations

import itertools

import numpy as np
from scipy.optimize import linprog

from undergrowth.model import Problem


def _rng(seed: int) -> np.random.Generator:
    return np.random.default_rng(seed)


def knapsack(seed: int, n: int = 14) -> Problem:
    """max v·x subject to w·x ≤ W, x binary; values correlated with weights,
    capacity about half the total weight (the hard middle for this family)."""
    rng = _rng(seed)
    w = rng.integers(10, 60, size=n).astype(float)
    v = w + rng.integers(-5, 12, size=n)
    v = np.maximum(v, 1.0)
    cap = float(np.floor(0.5 * w.sum()))
    return Problem.from_arrays(
        v, w.reshape(1, -1), row_upper=[cap], col_upper=np.ones(n),
        integrality=np.ones(n), sense="max",
        col_names=[f"take{j}" for j in range(n)], row_names=["capacity"],
        name=f"knapsack-s{seed}-n{n}",
    )


def hard_knapsack(seed: int, n: int = 100) -> Problem:
    """A strongly correlated knapsack (value = weight + 10% of the weight range),
    a long-known hard case for plain branch-and-bound (from memory: Martello &
    Toth, Knapsack Problems, 1990); for throughput measurements on long trees."""
    rng = _rng(seed)
    w = rng.integers(100, 1000, size=n).astype(float)
    v = w + 100.0
    cap = float(np.floor(0.5 * w.sum()))
    return Problem.from_arrays(
        v, w.reshape(1, -1), row_upper=[cap], col_upper=np.ones(n),
        integrality=np.ones(n), sense="max",
        col_names=[f"take{j}" for j in range(n)], row_names=["capacity"],
        name=f"hard-knapsack-s{seed}-n{n}",
    )


def multi_knapsack(seed: int, n: int = 12, m: int = 3) -> Problem:
    """max v·x subject to m weight rows W x ≤ cap, x binary."""
    rng = _rng(seed)
    W = rng.integers(5, 40, size=(m, n)).astype(float)
    v = np.round(W.mean(axis=0)) + rng.integers(0, 15, size=n)
    cap = np.floor(rng.uniform(0.35, 0.6, size=m) * W.sum(axis=1))
    return Problem.from_arrays(
        v, W, row_upper=cap, col_upper=np.ones(n), integrality=np.ones(n), sense="max",
        col_names=[f"item{j}" for j in range(n)], row_names=[f"dim{i}" for i in range(m)],
        name=f"multi-knapsack-s{seed}-n{n}-m{m}",
    )


def set_cover(seed: int, n: int = 15, m: int = 30, per_element: int = 3) -> Problem:
    """min c·x subject to every one of m elements covered by a chosen set, x
    binary. Each element lies in exactly ``per_element`` random sets (so the
    model is feasible and the relaxation likes thirds); costs are 1 to 3."""
    rng = _rng(seed)
    A = np.zeros((m, n))
    for i in range(m):
        A[i, rng.choice(n, size=per_element, replace=False)] = 1.0
    c = rng.integers(1, 4, size=n).astype(float)
    return Problem.from_arrays(
        c, A, row_lower=np.ones(m), col_upper=np.ones(n), integrality=np.ones(n),
        col_names=[f"set{j}" for j in range(n)], row_names=[f"elem{i}" for i in range(m)],
        name=f"set-cover-s{seed}-n{n}-m{m}",
    )


def facility_location(seed: int, depots: int = 4, customers: int = 4) -> Problem:
    """Capacitated facility location: binary ``open_i``, continuous flows
    ``ship_i_j ≥ 0``. Minimise fixed opening costs plus transport costs;
    every customer's demand is met exactly and a depot ships at most its
    capacity, and only when open. Total capacity exceeds total demand."""
    rng = _rng(seed)
    demand = rng.integers(5, 20, size=customers).astype(float)
    total = demand.sum()
    cap = np.floor(rng.uniform(0.45, 0.8, size=depots) * total)
    while cap.sum() < 1.2 * total:
        cap += 1.0
    fixed = rng.integers(20, 60, size=depots).astype(float)
    depot_xy = rng.random((depots, 2))
    cust_xy = rng.random((customers, 2))
    dist = np.linalg.norm(depot_xy[:, None, :] - cust_xy[None, :, :], axis=2)
    unit = np.round(1.0 + 4.0 * dist, 2)

    n = depots + depots * customers
    col = lambda i, j: depots + i * customers + j  # noqa: E731
    c = np.zeros(n)
    c[:depots] = fixed
    names = [f"open{i}" for i in range(depots)]
    for i in range(depots):
        for j in range(customers):
            c[col(i, j)] = unit[i, j]
            names.append(f"ship{i}_{j}")
    rows, lo, hi, row_names = [], [], [], []
    for j in range(customers):  # demand met exactly
        r = np.zeros(n)
        for i in range(depots):
            r[col(i, j)] = 1.0
        rows.append(r)
        lo.append(demand[j])
        hi.append(demand[j])
        row_names.append(f"demand{j}")
    for i in range(depots):  # Σ_j ship_i_j − cap_i · open_i ≤ 0
        r = np.zeros(n)
        r[i] = -cap[i]
        for j in range(customers):
            r[col(i, j)] = 1.0
        rows.append(r)
        lo.append(-np.inf)
        hi.append(0.0)
        row_names.append(f"capacity{i}")
    upper = np.full(n, np.inf)
    upper[:depots] = 1.0
    integ = np.zeros(n)
    integ[:depots] = 1.0
    return Problem.from_arrays(
        c, np.array(rows), row_lower=lo, row_upper=hi, col_upper=upper, integrality=integ,
        col_names=names, row_names=row_names,
        name=f"facility-s{seed}-d{depots}-c{customers}",
    )


def integer_cover(seed: int, n: int = 8, m: int = 4) -> Problem:
    """min c·x subject to A x ≥ b with non-negative integer A, and general
    integers 0 ≤ x_j ≤ u_j (u_j between 2 and 5). Feasible: b is at most half
    of what all columns at their upper bounds provide."""
    rng = _rng(seed)
    A = rng.integers(0, 6, size=(m, n)).astype(float)
    A[rng.random((m, n)) < 0.35] = 0.0
    for i in range(m):
        if A[i].sum() == 0:
            A[i, rng.integers(n)] = float(rng.integers(1, 6))
    u = rng.integers(2, 6, size=n).astype(float)
    b = np.floor(rng.uniform(0.2, 0.5, size=m) * (A @ u)) + 0.5
    b = np.maximum(b, 1.0)
    c = rng.integers(2, 12, size=n).astype(float)
    return Problem.from_arrays(
        c, A, row_lower=b, col_upper=u, integrality=np.ones(n),
        col_names=[f"qty{j}" for j in range(n)], row_names=[f"need{i}" for i in range(m)],
        name=f"integer-cover-s{seed}-n{n}-m{m}",
    )


def assignment(seed: int, k: int = 4) -> Problem:
    """k workers to k jobs, binary ``assign_i_j``, each worker and job used
    exactly once, minimum cost; plus a budget row on a second weight that the
    cheapest assignment breaks. Instances are redrawn until the relaxation
    optimum is fractional, so the search has to branch. Some assignment meets
    the budget (it is set from one that does)."""
    rng = _rng(seed)
    perms = list(itertools.permutations(range(k)))
    n = k * k
    A = np.zeros((2 * k + 1, n))
    for i in range(k):
        A[i, i * k:(i + 1) * k] = 1.0  # worker i does one job
        A[k + i, i::k] = 1.0  # job i gets one worker
    for _ in range(1000):
        cost = rng.integers(1, 20, size=(k, k)).astype(float)
        weight = rng.integers(1, 20, size=(k, k)).astype(float)
        pcost = np.array([sum(cost[i, p[i]] for i in range(k)) for p in perms])
        pweight = np.array([sum(weight[i, p[i]] for i in range(k)) for p in perms])
        cheapest = pweight[pcost == pcost.min()].min()
        if pweight.min() >= cheapest:
            continue
        # A budget between the lightest assignment and the cheapest one's weight.
        budget = max(float(np.floor((pweight.min() + cheapest) / 2.0)), float(pweight.min()))
        A[2 * k] = weight.ravel()
        lp = linprog(cost.ravel(), A_ub=A[2 * k:], b_ub=[budget], A_eq=A[:2 * k],
                     b_eq=np.ones(2 * k), bounds=(0, 1), method="highs")
        if lp.status == 0 and np.abs(lp.x - np.round(lp.x)).max() > 1e-6:
            break
    else:  # pragma: no cover - never hit for k ≥ 3
        raise RuntimeError("assignment: could not draw an instance with a fractional relaxation")
    lo = np.r_[np.ones(2 * k), -np.inf]
    hi = np.r_[np.ones(2 * k), budget]
    return Problem.from_arrays(
        cost.ravel(), A, row_lower=lo, row_upper=hi, col_upper=np.ones(n),
        integrality=np.ones(n),
        col_names=[f"assign{i}_{j}" for i in range(k) for j in range(k)],
        row_names=[f"worker{i}" for i in range(k)] + [f"job{j}" for j in range(k)] + ["budget"],
        name=f"assignment-s{seed}-k{k}",
    )


def small_miqp(seed: int, n: int = 8, box: int = 2) -> Problem:
    """Convex integer quadratic program: min ½xᵀQx + c·x with Q = BᵀB + δI
    (positive definite), every column integer in [−box, box], and one row
    Σ x ≤ 1. All columns are integer, so the optimum can be checked by
    enumerating the (2·box + 1)^n points of the box."""
    rng = _rng(seed)
    B = rng.normal(size=(n, n))
    delta = 0.1
    Q = B.T @ B + delta * np.eye(n)
    Q = 0.5 * (Q + Q.T)
    c = rng.normal(scale=3.0, size=n)
    return Problem.from_arrays(
        np.round(c, 3), np.ones((1, n)), row_upper=[1.0],
        col_lower=np.full(n, -float(box)), col_upper=np.full(n, float(box)),
        integrality=np.ones(n), Q=Q,
        col_names=[f"z{j}" for j in range(n)], row_names=["total"],
        name=f"miqp-s{seed}-n{n}-b{box}",
    )


def infeasible_model() -> Problem:
    """2x + 2y = 3 with integer 0 ≤ x, y ≤ 3: the relaxation is feasible, no
    integer point is (the left side is even), so the search must exhaust the tree."""
    return Problem.from_arrays(
        [1.0, 1.0], [[2.0, 2.0]], row_lower=[3.0], row_upper=[3.0],
        col_upper=[3.0, 3.0], integrality=[1, 1], col_names=["x", "y"],
        row_names=["odd"], name="infeasible-parity",
    )


def unbounded_model() -> Problem:
    """max x + y subject to x − y ≤ 1, integer x, y ≥ 0 with no upper bounds:
    (k, k) is feasible for every k, so the objective is unbounded."""
    return Problem.from_arrays(
        [1.0, 1.0], [[1.0, -1.0]], row_upper=[1.0], integrality=[1, 1], sense="max",
        col_names=["x", "y"], row_names=["spread"], name="unbounded-ray",
    )


def parity_knapsack(n: int = 31) -> Problem:
    """max Σ x_j subject to Σ 2·x_j ≤ n, x binary, n odd: a variant of Jeroslow's
    parity example (from memory: Jeroslow, Mathematical Programming, 1974). The
    optimum is (n − 1)/2 but the relaxation is worth n/2 at every node where the
    free columns can still make up the half, so branch-and-bound without cuts
    needs exponentially many nodes: a search that will not finish on its own,
    for limit and cancel tests."""
    if n % 2 == 0:
        raise ValueError(f"parity_knapsack: n must be odd, got {n}")
    return Problem.from_arrays(
        np.ones(n), np.full((1, n), 2.0), row_upper=[float(n)], col_upper=np.ones(n),
        integrality=np.ones(n), sense="max", col_names=[f"pick{j}" for j in range(n)],
        row_names=["even"], name=f"parity-knapsack-n{n}",
    )


# Every seeded family with the default size used by the oracle tests.
FAMILIES = {
    "knapsack": knapsack,
    "multi_knapsack": multi_knapsack,
    "set_cover": set_cover,
    "facility_location": facility_location,
    "integer_cover": integer_cover,
    "assignment": assignment,
}
