"""The bundled demo scenario and its recorded runs.

Scenario (invented): *Fernhollow Provisions*, a made-up co-operative that bakes
and distributes food to the villages of an imaginary valley. Each model shows
one lesson about slow searches:

- ``depot-siting-loose`` / ``depot-siting-tight``: choose which depots to open
  and which depot serves each village. The loose version links a depot's
  assignments to its opening switch with one aggregated row and a generous
  round coefficient (100); the tight one uses one row per depot and village.
  Same optimum, very different root gaps and trees.
- ``project-selection``: pick improvement projects under budget, staff-hour,
  workshop-space and van-time limits (a multidimensional knapsack) — the
  branching rule matters here.
- ``shift-cover``: cover the bakery's shifts with interchangeable staff; any
  permutation of staff gives the same cost, so the tree explodes.
- ``oven-batching``: how many batches of each loaf to bake (general integers)
  with a convex quadratic penalty for missing the day's targets.

`rebuild(directory)` regenerates the model files and runs deterministically;
`undergrowth samples --rebuild` calls it.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

import numpy as np
import scipy.sparse as sp

from .model import Problem

VILLAGES = ("Ashby Wold", "Brackenmere", "Coldharbour Edge", "Dunmoss", "Eelbrook",
            "Fennick Cross", "Gorsedale", "Hollins Tarn", "Inkpen Vale", "Juniper Lees",
            "Kestle Moor", "Larkspur Ford", "Mossgrave", "Nettlecombe", "Orrin Falls",
            "Pennyfold", "Quillsby", "Rookham", "Sallowmere", "Thistlegate",
            "Umberlow", "Vetch Hollow", "Wrenfield", "Yarrowby")
DEPOTS = ("North Barn", "Millrace Yard", "Old Creamery", "Quarry Shed", "Riverside Store",
          "Tithe Hall", "Kiln Lane", "Upper Granary")


def _names(prefix: str, labels: tuple[str, ...] | list[str]) -> list[str]:
    return [f"{prefix}[{label.replace(' ', '_')}]" for label in labels]


def depot_siting(*, tight: bool, seed: int = 11) -> Problem:
    """Uncapacitated depot siting: open depots (binary), assign villages (continuous
    shares that sum to one), minimise opening plus delivery cost."""
    rng = np.random.default_rng(seed)
    nd, nv = len(DEPOTS), len(VILLAGES)
    dpos = rng.uniform(0, 100, (nd, 2))
    vpos = rng.uniform(0, 100, (nv, 2))
    demand = rng.integers(5, 30, nv)
    dist = np.linalg.norm(dpos[:, None, :] - vpos[None, :, :], axis=2)
    delivery = np.round(dist * demand[None, :] / 10.0, 1)  # cost of serving v wholly from d
    opening = rng.integers(300, 600, nd).astype(float)
    # columns: open[d] (nd), then share[d, v] (nd * nv), depot-major
    n = nd + nd * nv
    c = np.concatenate([opening, delivery.ravel()])
    rows, cols, vals, rl, ru, rnames = [], [], [], [], [], []

    def add_row(entries: list[tuple[int, float]], lo: float, up: float, name: str) -> None:
        r = len(rl)
        for j, a in entries:
            rows.append(r)
            cols.append(j)
            vals.append(a)
        rl.append(lo)
        ru.append(up)
        rnames.append(name)

    share = lambda d, v: nd + d * nv + v  # noqa: E731
    vlabels = [x.replace(" ", "_") for x in VILLAGES]
    dlabels = [x.replace(" ", "_") for x in DEPOTS]
    for v in range(nv):
        add_row([(share(d, v), 1.0) for d in range(nd)], 1.0, 1.0, f"served[{vlabels[v]}]")
    big_m = 100.0  # a "safe" round number, far above the 24 villages a depot can serve
    for d in range(nd):
        if tight:
            for v in range(nv):
                add_row([(share(d, v), 1.0), (d, -1.0)], -np.inf, 0.0,
                        f"link[{dlabels[d]},{vlabels[v]}]")
        else:
            add_row([(share(d, v), 1.0) for v in range(nv)] + [(d, -big_m)], -np.inf, 0.0,
                    f"link[{dlabels[d]}]")
    A = sp.csr_matrix((vals, (rows, cols)), shape=(len(rl), n))
    integrality = np.zeros(n, dtype=bool)
    integrality[:nd] = True
    names = _names("open", DEPOTS) + [f"share[{dl},{vl}]" for dl in dlabels for vl in vlabels]
    return Problem.from_arrays(
        c, A, row_lower=rl, row_upper=ru, col_lower=np.zeros(n), col_upper=np.ones(n),
        integrality=integrality, col_names=names, row_names=rnames,
        name=f"depot-siting-{'tight' if tight else 'loose'}")


PROJECTS = ("solar_roof", "second_oven", "cold_room", "van_racks", "flour_silo", "drain_fix",
            "loading_ramp", "proofing_cabinet", "stone_mill", "heat_pump", "shop_awning",
            "till_upgrade", "rainwater_tank", "bike_trailers", "night_lights", "dough_mixer",
            "packing_bench", "walk_in_freezer", "roof_insulation", "scale_calibration",
            "sourdough_vats", "delivery_app", "yard_paving", "sign_repaint", "boiler_swap",
            "flour_sifter", "crate_washer", "staff_room", "fire_doors", "garden_beds")
RESOURCES = ("budget", "staff_hours", "workshop_space", "van_time", "electrician_days")


def project_selection(seed: int = 23) -> Problem:
    """Multidimensional knapsack: maximise the value of the chosen projects."""
    rng = np.random.default_rng(seed)
    n, m = len(PROJECTS), len(RESOURCES)
    use = rng.integers(10, 100, (m, n)).astype(float)
    # value correlated with total use makes the relaxation fractional in many places
    value = np.round(use.sum(axis=0) / m + rng.integers(0, 20, n), 0)
    cap = np.floor(use.sum(axis=1) * 0.35)
    return Problem.from_arrays(
        value, use, row_upper=cap, col_upper=np.ones(n), integrality=np.ones(n, dtype=bool),
        sense="max", col_names=[f"do[{p}]" for p in PROJECTS],
        row_names=[f"limit[{r}]" for r in RESOURCES], name="project-selection")


SHIFTS = ("mon_early", "mon_late", "tue_early", "tue_late", "wed_early", "wed_late",
          "thu_early", "thu_late", "fri_early", "fri_late", "sat_early", "sat_late")


def shift_cover(*, staff: int = 12, seed: int = 7) -> Problem:
    """Cover each shift's head-count with interchangeable bakers; each hired
    baker works at most five shifts. Minimise wages plus a small per-shift fee."""
    rng = np.random.default_rng(seed)
    T = len(SHIFTS)
    need = rng.integers(1, 4, T).astype(float)
    S = staff
    # columns: hire[s] (S), work[s, t] (S * T)
    n = S + S * T
    c = np.concatenate([np.full(S, 10.0), np.full(S * T, 1.0)])
    rows, cols, vals, rl, ru, rnames = [], [], [], [], [], []
    r = 0
    work = lambda s, t: S + s * T + t  # noqa: E731
    for t in range(T):
        for s in range(S):
            rows.append(r)
            cols.append(work(s, t))
            vals.append(1.0)
        rl.append(need[t])
        ru.append(np.inf)
        rnames.append(f"cover[{SHIFTS[t]}]")
        r += 1
    for s in range(S):
        for t in range(T):
            rows.append(r)
            cols.append(work(s, t))
            vals.append(1.0)
        rows.append(r)
        cols.append(s)
        vals.append(-5.0)
        rl.append(-np.inf)
        ru.append(0.0)
        rnames.append(f"max_shifts[baker{s + 1}]")
        r += 1
    A = sp.csr_matrix((vals, (rows, cols)), shape=(r, n))
    names = [f"hire[baker{s + 1}]" for s in range(S)] + [
        f"work[baker{s + 1},{t}]" for s in range(S) for t in SHIFTS]
    return Problem.from_arrays(
        c, A, row_lower=rl, row_upper=ru, col_upper=np.ones(n),
        integrality=np.ones(n, dtype=bool), col_names=names, row_names=rnames,
        name="shift-cover")


LOAVES = ("rye", "spelt", "seeded", "brioche", "sourdough", "barley")


def oven_batching(seed: int = 3) -> Problem:
    """Batches per loaf (integers 0..8) to meet targets: minimise the setup cost
    plus a convex quadratic penalty on the shortfall or surplus of each loaf,
    with a shared oven-hours limit and a shared dough-mixer limit."""
    rng = np.random.default_rng(seed)
    k = len(LOAVES)
    per_batch = rng.integers(20, 50, k).astype(float)  # loaves per batch
    target = rng.integers(80, 250, k).astype(float)
    weight = rng.uniform(0.02, 0.08, k)
    oven = rng.uniform(0.8, 1.6, k)
    mixer = rng.uniform(0.5, 1.2, k)
    # ½ xᵀQx + cᵀx + const = Σ w (p x − t)² + setup·x
    Q = sp.diags(2.0 * weight * per_batch**2)
    setup = rng.uniform(2, 6, k)
    c = -2.0 * weight * per_batch * target + setup
    offset = float(np.sum(weight * target**2))
    A = np.vstack([oven, mixer])
    batches_wanted = target / per_batch
    ru = np.array([np.floor(oven @ batches_wanted * 0.9), np.floor(mixer @ batches_wanted)])
    return Problem.from_arrays(
        c, A, row_upper=ru, col_upper=np.full(k, 8.0), integrality=np.ones(k, dtype=bool),
        Q=Q, offset=offset, col_names=[f"batches[{x}]" for x in LOAVES],
        row_names=["oven_hours", "mixer_hours"], name="oven-batching")


def all_models() -> dict[str, Problem]:
    models = [depot_siting(tight=False), depot_siting(tight=True), project_selection(),
              shift_cover(), oven_batching()]
    return {p.name: p for p in models}


@dataclass(frozen=True)
class SampleRun:
    model: str
    branching: str
    select: str
    node_limit: int | None = None

    @property
    def file_name(self) -> str:
        return f"{self.model}.{self.branching}.{self.select}.jsonl.gz"


PLAN = (
    SampleRun("depot-siting-loose", "most-fractional", "best-bound"),
    SampleRun("depot-siting-loose", "reliability", "hybrid"),
    SampleRun("depot-siting-tight", "most-fractional", "best-bound"),
    SampleRun("depot-siting-tight", "reliability", "hybrid"),
    SampleRun("project-selection", "least-fractional", "best-bound"),
    SampleRun("project-selection", "most-fractional", "best-bound"),
    SampleRun("project-selection", "pseudocost", "best-bound"),
    SampleRun("project-selection", "reliability", "hybrid"),
    SampleRun("shift-cover", "most-fractional", "depth-first"),
    SampleRun("shift-cover", "reliability", "hybrid"),
    SampleRun("oven-batching", "most-fractional", "best-bound"),
    SampleRun("oven-batching", "pseudocost", "best-estimate"),
)


def rebuild(directory: Path, *, progress=print) -> list[dict[str, object]]:
    """Write every model (MPS) and every planned run into ``directory``; returns
    one summary per run (model, rule, order, status, objective, nodes)."""
    from .model import write_model
    from .runlog.writer import RunLogWriter
    from .search import Search, SearchSettings

    directory = Path(directory)
    (directory / "models").mkdir(parents=True, exist_ok=True)
    models = all_models()
    for name, problem in models.items():
        write_model(problem, str(directory / "models" / f"{name}.mps"))
    out = []
    for plan in PLAN:
        problem = models[plan.model]
        settings = SearchSettings(branching=plan.branching, select=plan.select,
                                  node_limit=plan.node_limit, gap=0.0, absolute_gap=1e-9)
        search = Search(problem, settings)
        path = directory / plan.file_name
        with RunLogWriter(path, search.header()) as writer:
            for ev in search.events():
                writer.write(ev)
        r = search.result
        assert r is not None
        row = {"model": plan.model, "branching": plan.branching, "select": plan.select,
               "status": r.status, "objective": r.objective, "nodes": r.nodes,
               "run_log": plan.file_name}
        progress(f"{plan.file_name}: {r.status}, {r.nodes} nodes, objective {r.objective}")
        out.append(row)
    return out
