"""Comparison groups and tables over the API: start, follow, cancel, the table, the caps,
bad input and read-only servers; the branching-variable overlap by hand."""

from __future__ import annotations

import functools
import json

from test_api_support import KNAPSACK, assert_error_shape, client_for, sample_dir
from undergrowth.analysis.compare import ROW_KEYS, branching_overlap
from undergrowth.model import read_model
from undergrowth.runlog import notes, read_run
from undergrowth.search import Search, SearchSettings

DEPOT_MODEL = "depot-siting-loose"  # most-fractional / best-bound: 111 nodes (sample runs)
SMALL_GROUP = {"model": DEPOT_MODEL, "branching": ["most-fractional", "pseudocost"],
               "select": ["best-bound"]}
LONG_GROUP = {"model": "shift-cover", "branching": ["reliability", "pseudocost", "strong"],
              "select": ["hybrid"]}  # thousands of nodes each: still running when cancelled
RELIABILITY = "project-selection.reliability.hybrid"  # sample run beside KNAPSACK


def wait_group(client, group: dict, timeout: float = 60.0) -> dict:
    jobs = client.app.state.undergrowth.jobs
    for member in group["members"]:
        client.portal.call(functools.partial(jobs.wait, member["run_id"], timeout=timeout))
    return client.get(f"/api/groups/{group['id']}").json()


def direct_nodes(model: str, settings: dict) -> int:
    """The same search run in this process, without the server (the reference)."""
    problem = read_model(sample_dir() / "models" / f"{model}.mps")
    search = Search(problem, SearchSettings(**settings))
    return search.run().nodes


def test_a_group_runs_every_rule_and_its_table_matches_direct_searches(tmp_path):
    with client_for(tmp_path, max_solves=2) as c:
        r = c.post("/api/groups", json=SMALL_GROUP)
        assert r.status_code == 202, r.text
        group = r.json()
        assert group["total"] == 2 and group["model"] == DEPOT_MODEL
        assert [m["branching"] for m in group["members"]] == ["most-fractional", "pseudocost"]
        done = wait_group(c, group)
        assert done["state"] == "done" and done["ended"] == 2
        assert all(m["state"] == "finished" and m["end_status"] == "optimal"
                   for m in done["members"])

        table = c.get(f"/api/groups/{group['id']}/table").json()
        assert table["group"] == group["id"] and table["state"] == "done"
        assert table["pending"] == []
        ids = [m["run_id"] for m in group["members"]]
        assert table["runs"] == ids
        rows = {row["run_id"]: row for row in table["rows"]}
        assert set(table["rows"][0]) == {*ROW_KEYS, "run_id"}
        job_settings = c.get(f"/api/solves/{ids[0]}").json()["settings"]
        for member in group["members"]:
            row = rows[member["run_id"]]
            settings = {**job_settings, "branching": member["branching"],
                        "select": member["select"], "seed": member["seed"]}
            # reference: the engine run directly with the same settings (deterministic)
            assert row["nodes"] == direct_nodes(DEPOT_MODEL, settings)
            assert row["status"] == "optimal" and row["gap"] <= 1e-4
        # the most-fractional run of this model takes 111 nodes (the bundled sample run
        # depot-siting-loose.most-fractional.best-bound made with the same settings)
        assert rows[ids[0]]["nodes"] == 111
        # best marks: the row with fewer nodes is marked in the nodes column (by hand)
        fewest = min(table["rows"], key=lambda row: row["nodes"])["nodes"]
        for row, mark in zip(table["rows"], table["marks"], strict=True):
            assert mark["nodes"] is (row["nodes"] == fewest)
        assert table["problems"] == 1
        assert {m["branching"] for m in table["means"]} == {"most-fractional", "pseudocost"}

        # the library lists the members with their group, and the group itself
        items = {i["id"]: i for i in c.get("/api/runs").json()}
        assert all(items[i]["group"] == group["id"] for i in ids)
        assert items[KNAPSACK]["group"] is None
        listed = c.get("/api/groups").json()
        assert [g["id"] for g in listed] == [group["id"]] and listed[0]["state"] == "done"
        stored = json.loads((tmp_path / "runs" / f"{group['id']}.group.json").read_text())
        assert stored["format"] == "undergrowth-comparison"
        assert [run["run_id"] for run in stored["runs"]] == ids
        assert_error_shape(c.post(f"/api/groups/{group['id']}/cancel"), 409, "conflict")


def test_members_respect_the_worker_cap_and_a_cancel_stops_them_all(tmp_path):
    with client_for(tmp_path, max_solves=1) as c:
        group = c.post("/api/groups", json=LONG_GROUP).json()
        # one worker process at a time: the first member runs, the others wait
        assert [m["state"] for m in group["members"]] == ["running", "queued", "queued"]
        health = c.get("/api/health").json()["solves"]
        assert health["running"] == 1 and health["queued"] == 2
        r = c.post(f"/api/groups/{group['id']}/cancel")
        assert r.status_code == 200, r.text
        ended = wait_group(c, group)
        assert ended["state"] == "cancelled"
        assert [m["state"] for m in ended["members"]] == ["cancelled"] * 3
        table = c.get(f"/api/groups/{group['id']}/table").json()
        first, *rest = [m["run_id"] for m in group["members"]]
        # the running member left a complete log ending 'cancelled'; the queued never began
        assert table["runs"] == [first] and table["pending"] == rest
        assert table["rows"][0]["status"] == "cancelled"
        assert_error_shape(c.post(f"/api/groups/{group['id']}/cancel"), 409, "conflict")


def test_deleting_a_group_removes_its_runs_and_refuses_while_one_runs(tmp_path):
    with client_for(tmp_path, max_solves=1) as c:
        running = c.post("/api/groups", json=LONG_GROUP).json()
        err = assert_error_shape(c.delete(f"/api/groups/{running['id']}"), 409, "conflict")
        assert len(err["detail"]["active"]) == 3  # one running, two queued
        c.post(f"/api/groups/{running['id']}/cancel")
        wait_group(c, running)
        ids = [m["run_id"] for m in running["members"]]
        # (cancelled before its root was solved: a note names node 0 in its sidecar)
        log = next((tmp_path / "runs").glob(f"{ids[0]}.jsonl*"))
        notes.add_note(log, node=0, text="goes with the run")
        r = c.delete(f"/api/groups/{running['id']}")
        assert r.status_code == 200, r.text
        # only the member that ran left a log; the queued ones had nothing to delete
        assert r.json() == {"id": running["id"], "deleted": True, "runs": ids[:1]}
        assert c.get(f"/api/groups/{running['id']}").status_code == 404
        assert all(c.get(f"/api/runs/{i}").status_code == 404 for i in ids)
        assert c.get("/api/groups").json() == []
        runs_dir = tmp_path / "runs"
        assert not [p.name for p in runs_dir.iterdir() if p.name.startswith(ids[0])]
        assert_error_shape(c.delete(f"/api/groups/{running['id']}"), 404, "not-found")


def test_a_group_that_does_not_fit_the_queue_is_refused_whole(tmp_path):
    with client_for(tmp_path, max_solves=1, max_queued=1) as c:
        body = {**SMALL_GROUP, "branching": ["most-fractional", "pseudocost", "reliability"]}
        err = assert_error_shape(c.post("/api/groups", json=body), 503, "queue-full")
        assert err["detail"] == {"runs": 3, "room": 2}
        assert c.get("/api/solves").json() == [] and c.get("/api/groups").json() == []


def test_bad_group_requests_are_refused_with_the_field_named(tmp_path):
    with client_for(tmp_path) as c:
        err = assert_error_shape(c.post("/api/groups", json={**SMALL_GROUP,
                                                             "branching": ["fastest"]}),
                                 422, "invalid-request")
        assert err["detail"]["errors"][0]["loc"][:2] == ["body", "branching"]
        one = {**SMALL_GROUP, "branching": ["pseudocost"]}
        err = assert_error_shape(c.post("/api/groups", json=one), 422, "invalid-group")
        assert err["detail"]["runs"] == 1
        big = {**SMALL_GROUP, "branching": ["most-fractional", "pseudocost", "reliability"],
               "select": ["best-bound", "hybrid"], "seeds": 3}  # 18 runs
        assert assert_error_shape(c.post("/api/groups", json=big), 422,
                                  "invalid-group")["detail"]["runs"] == 18
        assert_error_shape(c.post("/api/groups", json={**SMALL_GROUP, "seeds": 0}), 422,
                           "invalid-request")
        assert_error_shape(c.post("/api/groups", json={**SMALL_GROUP, "colour": "red"}), 422,
                           "invalid-request")
        assert_error_shape(c.post("/api/groups", json={**SMALL_GROUP, "model": "nowhere"}),
                           404, "not-found")
        assert_error_shape(c.get("/api/groups/nowhere"), 404, "not-found")
        assert_error_shape(c.get("/api/groups/nowhere/table"), 404, "not-found")
        assert_error_shape(c.get("/api/groups/bad%20id"), 400, "invalid-id")
        assert c.get("/api/solves").json() == []


def test_a_read_only_server_refuses_to_start_a_group(tmp_path):
    with client_for(tmp_path, read_only=True) as c:
        assert_error_shape(c.post("/api/groups", json=SMALL_GROUP), 403, "read-only")
        assert c.get("/api/groups").json() == []


def test_the_table_of_two_library_runs_matches_their_summaries(tmp_path):
    with client_for(tmp_path) as c:
        r = c.get(f"/api/compare?run={KNAPSACK}&run={RELIABILITY}")
        assert r.status_code == 200, r.text
        table = r.json()
        assert table["group"] is None and table["runs"] == [KNAPSACK, RELIABILITY]
        for row in table["rows"]:
            assert row["nodes"] == c.get(f"/api/runs/{row['run_id']}").json()["summary"]["nodes"]
        # most-branched variables: counted here from the node events' own branching
        # decisions (the server counts down children instead)
        for entry in table["branched"]:
            run = read_run(sample_dir() / f"{entry['run_id']}.jsonl.gz")
            counts: dict[str, int] = {}
            for node in run.nodes:
                if node["status"] == "branched":
                    name = node["branching"]["name"]
                    counts[name] = counts.get(name, 0) + 1
            assert entry["branchings"] == sum(counts.values())
            assert entry["variables"] == len(counts)
            for var in entry["top"]:
                assert var["count"] == counts[var["name"]]
            assert [v["count"] for v in entry["top"]] == sorted(counts.values(),
                                                                reverse=True)[:10]
        tops = [{v["name"] for v in b["top"]} for b in table["branched"]]
        assert set(table["overlap"]["common"]) == tops[0] & tops[1]
        assert table["overlap"]["pairs"][0]["jaccard"] == len(tops[0] & tops[1]) / len(
            tops[0] | tops[1])
        assert_error_shape(c.get(f"/api/compare?run={KNAPSACK}&run={KNAPSACK}"), 400,
                           "too-few-runs")
        nine = "&".join(f"run=r{k}" for k in range(9))
        assert_error_shape(c.get(f"/api/compare?{nine}"), 400, "too-many-runs")
        assert_error_shape(c.get(f"/api/compare?run={KNAPSACK}&run=nowhere"), 404, "not-found")
        assert_error_shape(c.get("/api/compare"), 422, "invalid-request")


def test_branching_overlap_by_hand():
    tops = [["a", "b", "c", "d"], ["c", "a", "e"], ["a", "f", "c"]]
    out = branching_overlap(tops)
    assert out["common"] == ["a", "c"]  # in every list, in the first list's order
    assert out["in_runs"] == {"a": 3, "b": 1, "c": 3, "d": 1, "e": 1, "f": 1}
    first = out["pairs"][0]
    # {a,b,c,d} and {a,c,e}: 2 shared of 5 distinct (by hand)
    assert (first["a"], first["b"], first["shared"], first["jaccard"]) == (0, 1, ["a", "c"],
                                                                          0.4)
    assert [p["jaccard"] for p in out["pairs"][1:]] == [0.4, 0.5]  # {a,c}/5 and {a,c}/4
    assert branching_overlap([[], []])["pairs"][0]["jaccard"] == 0.0
