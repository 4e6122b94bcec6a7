"""Narration of the textbook models of ../shared/CHECK_VALUES.md, solved by our engine.

Each test solves a model, writes the run log, narrates it with `Walk.from_log`
and checks that the sentences name the right variable, values and reason. The
models and their published values come from `test_search_textbook` (textbook
locations from memory); values derived from them are worked out by hand beside
each check.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from test_api_support import OVEN, sample_dir
from test_search_textbook import conventions, hillier_lieberman, taha, wolsey
from undergrowth.analysis.narration import Walk, gap_text
from undergrowth.runlog.reader import read_run
from undergrowth.runlog.writer import RunLogWriter
from undergrowth.search import Search, SearchSettings


def walk_of(problem, settings, tmp_path: Path, *, strip_candidates: bool = False) -> Walk:
    """Engine → RunLogWriter → Walk, the path every recorded run takes."""
    search = Search(problem, settings)
    path = tmp_path / f"{problem.name}.jsonl"
    with RunLogWriter(path, search.header()) as writer:
        for ev in search.events():
            if strip_candidates and ev["kind"] == "node" and ev["branching"]:
                ev = {**ev, "branching": {k: v for k, v in ev["branching"].items()
                                          if k != "candidates"}}
            writer.write(ev)
    return Walk.from_log(path)


def text(step: dict) -> str:
    return " ".join(step["sentences"])


def by_node(walk: Walk) -> dict[int, dict]:
    return {s["node"]: s for s in walk.steps()}


# ---------------------------------------------------------------- Wolsey
def test_wolsey_root_names_the_fractional_x1_and_both_children(tmp_path):
    walk = walk_of(wolsey(), conventions("best-bound"), tmp_path)
    # CHECK_VALUES 1 / Wolsey (1998), from memory: 5 relaxations under these conventions
    assert len(walk) == 5
    root = walk.step(0)
    assert root["node"] == 0 and root["status"] == "branched"
    s = root["sentences"]
    # LP optimum x = (20/7, 3), z_LP = 59/7 = 8.42857 (CHECK_VALUES 1)
    assert "Its relaxation value is 8.42857." in s
    assert "1 integer variable is fractional: x1 = 2.85714." in s  # 20/7; x2 = 3 is integral
    assert any(x.startswith("The most-fractional rule chooses x1 = 2.85714, the only "
                            "candidate") for x in s)
    # x1 <= 2 gives z = 7.5; x1 >= 3 is infeasible (CHECK_VALUES 1)
    kids = next(x for x in s if x.startswith("Children: "))
    assert "node 1 (x1 ≤ 2) has bound 7.5 at step 2" in kids
    assert "node 2 (x1 ≥ 3) turns out infeasible at step 3" in kids
    assert s[-1] == "Now: no incumbent yet, dual bound 8.42857, 2 nodes wait."
    assert root["incumbent"] is None and root["dual_bound"] == pytest.approx(59 / 7)


def test_wolsey_infeasible_child_names_its_bound_change(tmp_path):
    step = by_node(walk_of(wolsey(), conventions("best-bound"), tmp_path))[2]
    assert step["status"] == "infeasible"
    assert step["sentences"][0] == "Node 2 is solved: depth 1, made from node 0 by x1 ≥ 3."
    assert "no feasible point" in text(step) and "(the last change: x1 ≥ 3)" in text(step)


def test_wolsey_incumbent_step_discards_the_waiting_nodes_and_closes_the_gap(tmp_path):
    walk = walk_of(wolsey(), conventions("best-bound"), tmp_path)
    last = walk.step(len(walk) - 1)
    # by hand: x1 <= 2 gives (2, 1/2), z = 7.5; x2 >= 1 then gives (2, 1), z = 7, the
    # optimum (CHECK_VALUES 1); its sibling x2 <= 0 (z = 6) branched on x1 = 1.5 and
    # both its children inherit 6 < 7, so they are discarded when 7 is found.
    assert last["status"] == "integral" and last["new_incumbent"]
    assert "became the new incumbent 7." in text(last)
    assert "makes 2 waiting nodes useless" in text(last)
    assert "Now: incumbent 7, dual bound 7, gap 0%, 0 nodes wait." in last["sentences"]
    assert last["sentences"][-1].startswith("This is the last step: the tree is exhausted")
    assert walk.incumbent_steps() == [len(walk) - 1]


def test_wolsey_lookahead_bounds_are_reported_with_the_choice(tmp_path):
    settings = SearchSettings(branching="strong", select="best-bound", gap=0.0,
                              absolute_gap=0.0, rounding=False)
    walk = walk_of(wolsey(), settings, tmp_path)
    root = walk.step(0)
    # strong branching solves both children of x1 = 20/7 first: 7.5 and infeasible
    # (CHECK_VALUES 1)
    assert "The rule's look-ahead already solved both children: down 7.5, up infeasible." \
        in root["sentences"]
    closed = next(s for s in walk.steps() if s["node"] == 2)
    assert closed["sentences"][0].startswith("Node 2 is reported")
    assert "look-ahead at its parent already found that this child is infeasible" in \
        text(closed)


# ---------------------------------------------------------------- Taha
def test_taha_tie_goes_to_the_lower_index_and_the_runner_up_is_named(tmp_path):
    root = walk_of(taha(), conventions("best-bound"), tmp_path).step(0)
    # LP optimum (3.75, 1.25), z = 23.75 (CHECK_VALUES 2); both are 0.25 from an
    # integer (by hand), so most-fractional ties and takes x1, the lower index.
    assert "Its relaxation value is 23.75." in root["sentences"]
    assert "2 integer variables are fractional: x1 = 3.75, x2 = 1.25." in root["sentences"]
    assert ("The most-fractional rule chooses x1 = 3.75: its score 0.25 ties with x2's, "
            "and the tie goes to the lower column index.") in root["sentences"]


def test_taha_pruned_node_says_which_incumbent_it_cannot_beat(tmp_path):
    steps = by_node(walk_of(taha(), conventions("best-bound"), tmp_path))
    # by hand: x1 <= 3 gives (3, 2), z = 23 = z* (CHECK_VALUES 2), found at node 1;
    # x1 >= 4 gives (4, 5/6), z = 23.3333; then x2 <= 0 gives (4.5, 0), z = 22.5 < 23.
    assert steps[1]["status"] == "integral" and "new incumbent 23." in text(steps[1])
    assert "Its relaxation value is 23.3333" in text(steps[2])
    assert "1 integer variable is fractional: x2 = 0.833333." in steps[2]["sentences"]
    pruned = steps[3]
    assert pruned["status"] == "pruned" and pruned["prune"]
    assert "Its bound 22.5 cannot beat the incumbent 23 found at node 1" in text(pruned)
    assert "0.833333 worse than its parent's 23.3333" in text(pruned)  # 23.3333 − 22.5
    # gap after the incumbent: |23 − 23.75| / 23.75 = 3.16% (by hand)
    assert "gap 3.16%" in steps[1]["sentences"][-1]


# ---------------------------------------------------------------- Hillier & Lieberman
def test_hillier_lieberman_root_chooses_x2_over_the_runner_up_x1(tmp_path):
    root = walk_of(hillier_lieberman(), conventions("best-bound"), tmp_path).step(0)
    # LP optimum (5/4, 3/2, 7/4, 0), z = 14.25 (CHECK_VALUES 3). Distances to the
    # nearest integer (by hand): x1 0.25, x2 0.5, x3 0.25: x2 wins; the runner-up is
    # the first of the tied 0.25s, x1. x4 is continuous and never listed.
    assert "3 integer variables are fractional: x1 = 1.25, x2 = 1.5, x3 = 1.75." \
        in root["sentences"]
    assert ("The most-fractional rule chooses x2 = 1.5 with score 0.5, ahead of the "
            "runner-up x1 (0.25).") in root["sentences"]
    assert "x4" not in text(root)


def test_hillier_lieberman_ends_at_the_published_optimum(tmp_path):
    walk = walk_of(hillier_lieberman(), conventions("best-bound"), tmp_path)
    found = [walk.step(k) for k in walk.incumbent_steps()]
    # MIP optimum z* = 13.5 (CHECK_VALUES 3)
    assert found[-1]["incumbent"] == pytest.approx(13.5)
    assert "became the new incumbent 13.5." in text(found[-1])
    last = walk.step(len(walk) - 1)
    assert last["gap"] == 0.0 and "gap 0%" in text(last)


def test_older_logs_without_candidates_give_only_the_count(tmp_path):
    root = walk_of(hillier_lieberman(), conventions("best-bound"), tmp_path,
                   strip_candidates=True).step(0)
    assert "3 integer variables are fractional." in root["sentences"]
    assert "x1 = 1.25" not in text(root)
    assert "chooses x2 = 1.5" in text(root)  # the choice itself is still recorded


# ---------------------------------------------------------------- rounding, notes, flags
def test_rounding_incumbent_is_narrated_at_its_step():
    # The textbook models never round to an incumbent, so a bundled sample run does;
    # the check values are that run's own incumbent events.
    path = sample_dir() / f"{OVEN}.jsonl.gz"
    walk = Walk.from_log(path)
    rounded = [e for e in read_run(path).events
               if e["kind"] == "incumbent" and e["source"] == "rounding"]
    assert rounded  # the test needs at least one
    for inc in rounded:
        step = walk.step(walk.step_of_order(inc["order"]))
        assert step["new_incumbent"] and step["node"] == inc["node"]
        assert f"Rounding its relaxation solution to the nearest integers gave a feasible " \
               f"point: a new incumbent {inc['objective']:.6g}." in step["sentences"]


def test_notes_and_findings_are_attached_to_their_steps(tmp_path):
    base = walk_of(taha(), conventions("best-bound"), tmp_path)
    notes = [{"id": "a", "node": 3, "order": None, "text": "pruned by 23"},
             {"id": "b", "node": None, "order": 0, "text": "the root"}]
    walk = base.with_context(notes=notes, finding_nodes=[2])
    assert walk.note_steps() == [0, 3]  # node 3 was solved fourth (order 3)
    assert walk.step(3)["notes"] == ["a"] and walk.step(0)["notes"] == ["b"]
    assert walk.finding_steps() == [2] and walk.step(2)["finding"]
    assert base.step(3)["notes"] == []  # the base walk is untouched


def test_gap_text_is_a_percentage_with_three_digits():
    # by hand: 0.123037 = 12.3037% → 12.3%
    assert gap_text(0.123037) == "12.3%" and gap_text(0.0) == "0%" and gap_text(None) == \
        "unknown"


def test_step_out_of_range_says_the_range(tmp_path):
    walk = walk_of(wolsey(), conventions("best-bound"), tmp_path)
    with pytest.raises(IndexError, match="outside 0 … 4"):
        walk.step(5)
    assert [s["step"] for s in walk.steps(3, 10)] == [3, 4]
