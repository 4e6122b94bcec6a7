"""The bundled demo scenario: models, committed runs, and their lessons."""

from __future__ import annotations

import itertools

import numpy as np
import pytest
from scipy.optimize import Bounds, LinearConstraint, milp

from undergrowth import samples
from undergrowth.cli import main
from undergrowth.model import read_model
from undergrowth.paths import SAMPLE_RUNS
from undergrowth.runlog import read_run
from undergrowth.search import Search, SearchSettings

MODELS = samples.all_models()


def _milp_optimum(p) -> float:
    sign = 1.0 if p.sense == "min" else -1.0
    res = milp(sign * p.c, constraints=LinearConstraint(p.A, p.row_lower, p.row_upper),
               integrality=p.integrality.astype(int), bounds=Bounds(p.col_lower, p.col_upper))
    assert res.success
    return sign * res.fun + p.offset


def _enumerated_optimum(p) -> float:
    """Every point of the integer box (all columns are integer in oven-batching)."""
    assert p.integrality.all()
    ranges = [range(int(lo), int(up) + 1) for lo, up in zip(p.col_lower, p.col_upper, strict=True)]
    pts = np.array(list(itertools.product(*ranges)), dtype=float)
    act = pts @ p.A.T.toarray()
    ok = np.all((act >= p.row_lower - 1e-9) & (act <= p.row_upper + 1e-9), axis=1)
    pts = pts[ok]
    vals = pts @ p.c + 0.5 * np.einsum("ij,jk,ik->i", pts, p.Q.toarray(), pts) + p.offset
    return float(vals.min() if p.sense == "min" else vals.max())


@pytest.mark.parametrize("name", sorted(MODELS))
def test_sample_optimum_matches_reference(name):
    p = MODELS[name]
    search = Search(p, SearchSettings(branching="pseudocost", select="best-bound", gap=0,
                                      absolute_gap=1e-9))
    result = search.run()
    if p.Q is None:
        ref = _milp_optimum(p)  # reference: scipy.optimize.milp (HiGHS MIP)
    else:
        ref = _enumerated_optimum(p)  # reference: exhaustive enumeration of the integer box
    assert result.status == "optimal"
    assert result.objective == pytest.approx(ref, rel=1e-6)


def test_loose_and_tight_depot_models_agree_but_root_gaps_differ():
    loose, tight = MODELS["depot-siting-loose"], MODELS["depot-siting-tight"]
    gaps = {}
    for p in (loose, tight):
        events = list(Search(p, SearchSettings(branching="most-fractional",
                                               select="best-bound", gap=0)).events())
        root = next(e for e in events if e["kind"] == "node" and e["parent"] is None)
        end = events[-1]
        gaps[p.name] = abs(end["objective"] - root["bound"]) / abs(end["objective"])
    # same optimum (reference: scipy.optimize.milp), figures stated in sample_runs/README.md
    assert _milp_optimum(loose) == pytest.approx(_milp_optimum(tight))
    assert gaps["depot-siting-loose"] > 0.5
    assert gaps["depot-siting-tight"] < 1e-6


@pytest.mark.parametrize("plan", samples.PLAN, ids=lambda r: r.file_name)
def test_committed_run_matches_what_the_script_produces(plan, tmp_path):
    path = SAMPLE_RUNS / plan.file_name
    assert path.exists(), "run `undergrowth samples --rebuild`"
    assert main(["check", str(path)]) == 0
    run = read_run(str(path))
    end = run.end
    committed = read_model(str(SAMPLE_RUNS / "models" / f"{plan.model}.mps"))
    fresh = MODELS[plan.model]
    assert committed.num_cols == fresh.num_cols and committed.nnz == fresh.nnz
    assert np.array_equal(committed.c, fresh.c)
    settings = SearchSettings(branching=plan.branching, select=plan.select,
                              node_limit=plan.node_limit, gap=0.0, absolute_gap=1e-9)
    result = Search(committed, settings).run()
    assert end["status"] == result.status
    assert end["nodes"] == result.nodes
    assert end["objective"] == pytest.approx(result.objective, rel=1e-9)


def test_rebuild_writes_models_and_runs(tmp_path, monkeypatch):
    monkeypatch.setattr(samples, "PLAN", samples.PLAN[2:4])  # the two quick tight-depot runs
    rows = samples.rebuild(tmp_path, progress=lambda *_: None)
    assert [r["nodes"] for r in rows] == [1, 1]
    assert sorted(p.name for p in (tmp_path / "models").iterdir()) == sorted(
        f"{n}.mps" for n in MODELS)
