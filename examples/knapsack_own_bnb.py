"""A branch-and-bound written from scratch, recorded with `undergrowth.record.Recorder`.

Scenario (invented): a bicycle courier has a cargo bag that holds 18 kg and a
list of parcels waiting at the depot, each with a delivery fee and a weight.
Which parcels should she take to earn the most? That is a 0-1 knapsack:

    max  sum fee_j x_j   s.t.  sum weight_j x_j <= 18,   x_j in {0, 1}

The relaxation (0 <= x_j <= 1) is solved by the greedy fractional rule: take
parcels in order of fee per kilogram until the bag is full, and a fraction of
the first one that does not fit. That parcel is the only fractional variable,
so it is the one we branch on. Nodes are explored depth-first, "take it"
(x_j >= 1) before "leave it" (x_j <= 0).

    python examples/knapsack_own_bnb.py [OUT]      # default: courier.jsonl.gz
    undergrowth check courier.jsonl.gz
"""

from __future__ import annotations

import sys
from dataclasses import dataclass

from undergrowth.record import Recorder

CAPACITY = 18.0
# (parcel, fee in euros, weight in kg): invented for this example.
PARCELS: list[tuple[str, float, float]] = [
    ("pharmacy", 14.0, 2.5),
    ("bakery", 9.0, 4.0),
    ("law_office", 22.0, 6.5),
    ("florist", 11.0, 3.5),
    ("bike_parts", 16.0, 7.0),
    ("architect", 19.0, 5.0),
    ("record_shop", 8.0, 3.0),
    ("tailor", 12.0, 4.5),
    ("gallery", 25.0, 9.0),
    ("dentist", 10.0, 2.0),
    ("bookshop", 13.0, 5.5),
    ("print_shop", 7.0, 3.5),
]
# Greedy order: best fee per kilogram first (ties by index, for a reproducible tree).
BY_RATIO = sorted(range(len(PARCELS)), key=lambda j: (-PARCELS[j][1] / PARCELS[j][2], j))


@dataclass
class Relaxation:
    feasible: bool
    value: float
    x: list[float]
    fractional: int | None  # the parcel taken in part, if any
    scanned: int  # parcels looked at: our stand-in for LP iterations


def solve_relaxation(fixed: dict[int, int]) -> Relaxation:
    """Greedy fractional solution with some parcels fixed to 0 or 1."""
    x = [0.0] * len(PARCELS)
    room = CAPACITY
    value = 0.0
    for j, v in fixed.items():
        if v == 1:
            x[j] = 1.0
            room -= PARCELS[j][2]
            value += PARCELS[j][1]
    if room < -1e-9:
        return Relaxation(False, float("nan"), x, None, len(fixed))
    scanned = 0
    for j in BY_RATIO:
        if j in fixed:
            continue
        scanned += 1
        _, fee, weight = PARCELS[j]
        if weight <= room + 1e-9:
            x[j] = 1.0
            room -= weight
            value += fee
        else:
            x[j] = room / weight
            value += fee * x[j]
            return Relaxation(True, value, x, j if x[j] > 1e-9 else None, scanned)
    return Relaxation(True, value, x, None, scanned)


def rounding(relax: Relaxation) -> float:
    """Drop the fractional parcel: always fits, so it is a valid solution."""
    return sum(PARCELS[j][1] for j, xj in enumerate(relax.x) if xj == 1.0)


def search(out: str) -> tuple[float, list[str], int]:
    """Run the search, recording every node; returns (best fee, parcels taken, nodes)."""
    model = {
        "name": "courier_bag",
        "rows": 1,
        "columns": len(PARCELS),
        "integers": len(PARCELS),
        "binaries": len(PARCELS),
        "nonzeros": len(PARCELS),
        "sense": "max",
    }
    settings = {"branching": "critical-item", "select": "depth-first", "capacity_kg": CAPACITY}
    best, best_x = float("-inf"), [0.0] * len(PARCELS)
    with Recorder(out, model=model, settings=settings) as rec:
        # (node id, parent id, fixings, bound change that created it)
        stack: list[tuple[int, int | None, dict[int, int], dict | None]] = [(0, None, {}, None)]
        next_id = 1
        while stack:
            nid, parent, fixed, branch = stack.pop()
            relax = solve_relaxation(fixed)
            common = {"branch": branch, "iterations": relax.scanned}
            if not relax.feasible:
                rec.node(nid, parent, "infeasible", None, **common)
                continue
            frac = relax.fractional
            if relax.value <= best + 1e-9:
                # Fees are whole euros, but we keep the textbook test: bound cannot beat best.
                rec.node(nid, parent, "pruned", relax.value, fractional=int(frac is not None),
                         **common)  # fmt: skip
                continue
            if frac is None:
                rec.node(nid, parent, "integral", relax.value, **common)
                best, best_x = relax.value, relax.x
                rec.incumbent(best, node=nid)
                continue
            if nid == 0 and rounding(relax) > best:
                best, best_x = rounding(relax), [1.0 if xj == 1.0 else 0.0 for xj in relax.x]
                rec.incumbent(best, source="rounding")
            name = PARCELS[frac][0]
            rec.node(
                nid, parent, "branched", relax.value, fractional=1,
                branching={"var": frac, "name": name, "value": relax.x[frac],
                           "score": min(relax.x[frac], 1 - relax.x[frac])},
                **common,
            )  # fmt: skip
            down = (next_id, nid, {**fixed, frac: 0}, {"var": frac, "name": name, "dir": "down",
                                                         "value": 0.0})  # fmt: skip
            up = (next_id + 1, nid, {**fixed, frac: 1}, {"var": frac, "name": name, "dir": "up",
                                                          "value": 1.0})  # fmt: skip
            next_id += 2
            stack += [down, up]  # the up child ("take it") is explored first
        taken = [PARCELS[j][0] for j, xj in enumerate(best_x) if xj > 0.5]
        rec.finish(solution={PARCELS[j][0]: 1.0 for j, xj in enumerate(best_x) if xj > 0.5})
    return best, taken, next_id


def main(argv: list[str] | None = None) -> int:
    args = sys.argv[1:] if argv is None else argv
    out = args[0] if args else "courier.jsonl.gz"
    best, taken, nodes = search(out)
    print(f"best fee {best:.2f} EUR with {', '.join(taken)}")
    print(f"{nodes} nodes recorded in {out}; inspect with: undergrowth check {out}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
