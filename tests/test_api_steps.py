"""GET /api/runs/{id}/steps: narrated steps, checked against the run log's own events."""

from __future__ import annotations

import pytest

from test_api_support import DEPOT, OVEN, assert_error_shape, client_for, sample_dir
from undergrowth.runlog import read_run


@pytest.fixture
def client(tmp_path):
    with client_for(tmp_path) as c:
        yield c


def log_of(run: str):
    return read_run(sample_dir() / f"{run}.jsonl.gz")


def all_steps(client, run: str) -> dict:
    body = client.get(f"/api/runs/{run}/steps?start=0&count=500").json()
    assert len(body["steps"]) == body["total"]
    return body


def test_steps_follow_the_processing_order_of_the_log(client):
    log = log_of(DEPOT)
    solved = sorted((n for n in log.nodes if n["order"] is not None), key=lambda n: n["order"])
    body = all_steps(client, DEPOT)
    assert body["total"] == len(solved) == log.end["nodes"]
    assert body["sense"] == log.header["model"]["sense"]
    assert body["end_status"] == log.end["status"]
    for step, node in zip(body["steps"], solved, strict=True):
        assert (step["order"], step["node"], step["status"]) == \
            (node["order"], node["id"], node["status"])
        assert step["parent"] == node["parent"] and step["depth"] == node["depth"]
        assert step["prune"] == (node["status"] == "pruned")
        said = " ".join(step["sentences"])
        if node["lp"]["status"] == "optimal" and "look-ahead" not in said:
            assert f"Its relaxation value is {node['lp']['objective']:.6g}" in said
        if node["status"] == "branched":
            b = node["branching"]
            assert f"rule chooses {b['name']} = {b['value']:.6g}" in said
            if b.get("candidates"):
                name_of = {b["var"]: b["name"]}
                j, v = b["candidates"][0]
                shown = f"= {v:.6g}"
                assert shown in said, (name_of, said)


def test_incumbent_after_each_step_is_the_best_found_so_far(client):
    log = log_of(DEPOT)
    sense = log.header["model"]["sense"]
    found = [e for e in log.events if e["kind"] == "incumbent"]
    assert len(found) >= 2  # the sample has two
    body = all_steps(client, DEPOT)
    for step in body["steps"]:
        so_far = [e["objective"] for e in found if e["order"] is not None
                  and e["order"] <= step["order"]]
        best = (min if sense == "min" else max)(so_far) if so_far else None
        assert step["incumbent"] == (pytest.approx(best) if best is not None else None)
        assert step["new_incumbent"] == any(e["order"] == step["order"] for e in found)
    assert body["incumbent_steps"] == sorted({e["order"] for e in found})
    last = body["steps"][-1]
    assert last["incumbent"] == pytest.approx(log.end["objective"])
    assert last["dual_bound"] == pytest.approx(log.end["dual_bound"])
    assert last["gap"] == pytest.approx(log.end["gap"], abs=1e-12)
    assert f"Now: incumbent {log.end['objective']:.6g}" in " ".join(last["sentences"])


def test_finding_steps_are_the_nodes_the_findings_name(client):
    findings = client.get(f"/api/runs/{DEPOT}/findings").json()["findings"]
    nodes = {n for f in findings for n in f["refs"].get("nodes", [])}
    orders = {n["id"]: n["order"] for n in log_of(DEPOT).nodes}
    expected = sorted({orders[n] for n in nodes if orders.get(n) is not None})
    body = all_steps(client, DEPOT)
    assert body["finding_steps"] == expected
    assert [s["step"] for s in body["steps"] if s["finding"]] == expected


def test_pages_cover_the_run_without_overlap(client):
    total = all_steps(client, DEPOT)["total"]
    seen = []
    start = 0
    while start < total:
        page = client.get(f"/api/runs/{DEPOT}/steps?start={start}&count=40").json()
        assert page["start"] == start and len(page["steps"]) == min(40, total - start)
        seen += [s["step"] for s in page["steps"]]
        start += 40
    assert seen == list(range(total))
    past = client.get(f"/api/runs/{DEPOT}/steps?start={total + 5}").json()
    assert past["steps"] == [] and past["total"] == total


def test_bad_paging_and_unknown_runs_get_the_one_error_shape(client):
    assert_error_shape(client.get(f"/api/runs/{OVEN}/steps?count=501"), 422, "invalid-request")
    assert_error_shape(client.get(f"/api/runs/{OVEN}/steps?start=-1"), 422, "invalid-request")
    assert_error_shape(client.get("/api/runs/no-such-run/steps"), 404, "not-found")
    assert_error_shape(client.get("/api/runs/..bad/steps"), 400, "invalid-id")


def test_a_note_shows_up_at_its_step(client):
    r = client.post(f"/api/runs/{OVEN}/notes", json={"text": "branch here", "node": 1})
    assert r.status_code == 201
    note = r.json()
    body = all_steps(client, OVEN)
    order_of_node_1 = next(n["order"] for n in log_of(OVEN).nodes if n["id"] == 1)
    assert body["note_steps"] == [order_of_node_1]
    assert body["steps"][order_of_node_1]["notes"] == [note["id"]]
