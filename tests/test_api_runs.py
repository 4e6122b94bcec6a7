"""Runs: list, detail, tree (JSON and binary), node details, series, upload, delete."""

from __future__ import annotations

import gzip
import io
import json

import numpy as np
import pytest

from test_api_support import (
    DEPOT,
    KNAPSACK,
    OVEN,
    TIGHT,
    assert_error_shape,
    client_for,
    sample_dir,
)
from undergrowth.analysis.table import RunTable
from undergrowth.api.treebin import decode_binary
from undergrowth.runlog import read_run


@pytest.fixture
def client(tmp_path):
    with client_for(tmp_path) as c:
        yield c


def test_health_says_version_mode_and_directories(client):
    body = client.get("/api/health").json()
    assert body["status"] == "ok" and body["read_only"] is False
    assert [d["source"] for d in body["runs_dirs"]] == ["samples", "user"]
    assert body["runs_dirs"][1]["writable"] and not body["runs_dirs"][0]["writable"]


def test_list_has_every_sample_with_its_figures(client):
    items = {i["id"]: i for i in client.get("/api/runs").json()}
    depot = items[DEPOT]
    end = read_run(sample_dir() / f"{DEPOT}.jsonl.gz").end
    assert depot["source"] == "samples" and depot["live"] is False
    assert depot["model"] == "depot-siting-loose"
    assert (depot["branching"], depot["select"]) == ("most-fractional", "best-bound")
    assert depot["status"] == end["status"] == "optimal"
    assert depot["nodes"] == end["nodes"]
    assert depot["objective"] == pytest.approx(end["objective"])
    assert depot["bytes"] == (sample_dir() / f"{DEPOT}.jsonl.gz").stat().st_size


def test_detail_summarises_the_run(client):
    body = client.get(f"/api/runs/{DEPOT}").json()
    run = read_run(sample_dir() / f"{DEPOT}.jsonl.gz")
    s = body["summary"]
    nodes = run.nodes
    assert s["tree_nodes"] == len(nodes)
    assert sum(s["nodes_by_status"].values()) == len(nodes)
    assert s["nodes_by_status"]["pruned"] == sum(n["status"] == "pruned" for n in nodes)
    assert s["max_depth"] == max(n["depth"] for n in nodes)
    assert s["incumbents"] == sum(e["kind"] == "incumbent" for e in run.events)
    assert s["end_status"] == "optimal" and s["gap"] == pytest.approx(0.0)
    assert body["header"]["model"]["name"] == "depot-siting-loose"
    assert body["live"] is False and body["warnings"] == []


def test_missing_run_is_404_and_bad_id_400(client):
    assert_error_shape(client.get("/api/runs/no-such-run"), 404, "not-found")
    assert_error_shape(client.get("/api/runs/.hidden"), 400, "invalid-id")


# ---------------------------------------------------------------- tree
def test_tree_json_columns_match_the_log(client):
    body = client.get(f"/api/runs/{DEPOT}/tree?format=json").json()
    nodes = read_run(sample_dir() / f"{DEPOT}.jsonl.gz").nodes
    cols = body["columns"]
    assert body["count"] == len(nodes) == len(cols["id"])
    assert cols["id"] == [n["id"] for n in nodes]
    row_of = {n["id"]: r for r, n in enumerate(nodes)}
    assert cols["parent"] == [-1 if n["parent"] is None else row_of[n["parent"]] for n in nodes]
    assert [body["statuses"][s] for s in cols["status"]] == [n["status"] for n in nodes]
    assert cols["bound"][0] == pytest.approx(nodes[0]["bound"])
    # layout: leaves one apart, parents centred over their children
    x, parent = np.array(cols["x"]), np.array(cols["parent"])
    leaves = np.setdiff1d(np.arange(len(x)), parent)
    assert sorted(x[leaves]) == list(range(len(leaves))) == list(range(body["leaves"]))
    for r in set(parent[parent >= 0].tolist()):
        kids = x[parent == r]
        assert x[r] == pytest.approx((kids.min() + kids.max()) / 2)
    assert cols["subtree_size"][0] == len(nodes)


def test_tree_binary_has_the_documented_layout(client):
    r = client.get(f"/api/runs/{KNAPSACK}/tree?format=bin")
    assert r.headers["content-type"] == "application/octet-stream"
    data = r.content
    assert data[:4] == b"UGT1"
    meta, arrays = decode_binary(data)
    table = RunTable.open(sample_dir() / f"{KNAPSACK}.jsonl.gz", use_cache=False)
    assert meta["count"] == len(table)
    for f in meta["fields"]:
        assert f["offset"] % 8 == 0 and f["offset"] >= 8 + int.from_bytes(data[4:8], "little")
    assert np.array_equal(arrays["id"], table.id)
    assert np.array_equal(arrays["parent"], table.parent_row)
    assert np.array_equal(arrays["status"], table.status)
    assert np.array_equal(arrays["bound"], table.bound, equal_nan=True)
    json_cols = client.get(f"/api/runs/{KNAPSACK}/tree?format=json").json()["columns"]
    assert arrays["x"].tolist() == json_cols["x"]


def test_tree_default_format_depends_on_size(tmp_path):
    with client_for(tmp_path, tree_json_nodes=200) as c:
        assert c.get(f"/api/runs/{DEPOT}/tree").headers["content-type"] == "application/json"
        assert c.get(f"/api/runs/{KNAPSACK}/tree").headers["content-type"] == \
            "application/octet-stream"


def test_tree_is_gzipped_for_clients_that_accept_it(client):
    r = client.get(f"/api/runs/{KNAPSACK}/tree?format=bin", headers={"Accept-Encoding": "gzip"})
    assert r.headers.get("content-encoding") == "gzip"
    small = client.get("/api/health", headers={"Accept-Encoding": "gzip"})
    assert "content-encoding" not in small.headers  # under 1 KiB: not worth it


def test_tree_caches_go_to_the_cache_dir_not_the_samples(tmp_path):
    before = sorted(p.name for p in sample_dir().iterdir())
    with client_for(tmp_path) as c:
        assert c.get(f"/api/runs/{DEPOT}/tree").status_code == 200
    assert sorted(p.name for p in sample_dir().iterdir()) == before
    cached = sorted(p.name for p in (tmp_path / "cache" / "samples").iterdir())
    assert cached == [f"{DEPOT}.jsonl.gz.layout.npz", f"{DEPOT}.jsonl.gz.table.npz"]


def test_bad_tree_format_is_422(client):
    assert_error_shape(client.get(f"/api/runs/{DEPOT}/tree?format=xml"), 422, "invalid-request")


# ---------------------------------------------------------------- nodes
def test_node_detail_has_the_event_path_and_children(client):
    nodes = read_run(sample_dir() / f"{DEPOT}.jsonl.gz").nodes
    by_id = {n["id"]: n for n in nodes}
    deep = max(nodes, key=lambda n: n["depth"])
    body = client.get(f"/api/runs/{DEPOT}/nodes/{deep['id']}").json()
    event = {k: v for k, v in deep.items() if k != "branching" or v is not None}
    got = {k: v for k, v in body["node"].items() if k in event}
    assert got["branch"] == deep["branch"] and got["status"] == deep["status"]
    assert got["lp"]["iterations"] == deep["lp"]["iterations"]
    assert body["node"]["bound"] == pytest.approx(deep["bound"])
    # path: root first, each step the parent of the next
    ids = [s["id"] for s in body["path"]]
    assert ids[0] == 0 and ids[-1] == deep["id"] and len(ids) == deep["depth"] + 1
    for a, b in zip(ids, ids[1:], strict=False):
        assert by_id[b]["parent"] == a
    assert [c["node"] for c in body["bound_changes"]] == ids[1:]
    assert body["bound_changes"][-1]["var"] == deep["branch"]["var"]
    parent_step = body["path"][-2]
    assert parent_step["branching"]["var"] == deep["branch"]["var"]
    assert parent_step["branching"]["score"] == pytest.approx(
        by_id[ids[-2]]["branching"]["score"])
    root = client.get(f"/api/runs/{DEPOT}/nodes/0").json()
    assert root["children"] == [n["id"] for n in nodes if n["parent"] == 0]
    assert root["node"]["branching"]["rule"] == "most-fractional"


@pytest.mark.parametrize("status", ["branched", "pruned", "integral", "discarded"])
def test_every_status_gets_a_plain_reason(client, status):
    nodes = read_run(sample_dir() / f"{DEPOT}.jsonl.gz").nodes
    node = next(n for n in nodes if n["status"] == status)
    body = client.get(f"/api/runs/{DEPOT}/nodes/{node['id']}").json()
    reason = body["reason"]
    assert body["status"] == status and len(reason) > 30
    if status == "pruned":
        inc = body["incumbent"]
        assert f"{node['bound']:.6g}" in reason and f"{inc['objective']:.6g}" in reason
        assert f"node {inc['node']}" in reason
    if status == "branched":
        assert node["branching"]["name"] in reason


def test_incumbent_node_says_it_became_the_incumbent(client):
    run = read_run(sample_dir() / f"{DEPOT}.jsonl.gz")
    found = next(e for e in run.events if e["kind"] == "incumbent" and e["node"] is not None)
    body = client.get(f"/api/runs/{DEPOT}/nodes/{found['node']}").json()
    assert body["found_incumbent"]["objective"] == pytest.approx(found["objective"])
    assert "incumbent" in body["reason"]


def test_unknown_node_is_404_and_non_integer_422(client):
    assert_error_shape(client.get(f"/api/runs/{DEPOT}/nodes/999999"), 404, "not-found")
    assert_error_shape(client.get(f"/api/runs/{DEPOT}/nodes/abc"), 422, "invalid-request")


# ---------------------------------------------------------------- series
@pytest.mark.parametrize("axis", ["nodes", "time"])
def test_series_over_nodes_and_time(client, axis):
    body = client.get(f"/api/runs/{KNAPSACK}/series?x={axis}&points=50").json()
    run = read_run(sample_dir() / f"{KNAPSACK}.jsonl.gz")
    assert body["axis"] == axis and body["sense"] == "max"
    for name in ("primal", "dual", "gap"):
        assert 0 < len(body[name]["x"]) <= 50 and len(body[name]["x"]) == len(body[name]["y"])
    objectives = [e["objective"] for e in run.events if e["kind"] == "incumbent"]
    assert max(body["primal"]["y"]) == pytest.approx(max(objectives))
    assert [m["objective"] for m in body["incumbents"]] == pytest.approx(objectives)
    assert body["dual"]["y"][-1] == pytest.approx(run.end["dual_bound"])


def test_series_points_are_bounded(client):
    assert_error_shape(client.get(f"/api/runs/{DEPOT}/series?points=1"), 422)
    assert_error_shape(client.get(f"/api/runs/{DEPOT}/series?x=depth"), 422)


# ---------------------------------------------------------------- upload, delete
def _jsonl(path) -> bytes:
    with gzip.open(path, "rb") as f:
        return f.read()


def test_upload_a_run_log_then_read_it_back_and_delete_it(client):
    data = _jsonl(sample_dir() / f"{TIGHT}.jsonl.gz")
    r = client.post("/api/runs", files={"file": ("my run.jsonl", data)})
    assert r.status_code == 201, r.text
    body = r.json()
    assert body["id"] == "my-run" and body["source"] == "user" and body["nodes"] == 1
    again = client.post("/api/runs", files={"file": ("my run.jsonl", data)}).json()
    assert again["id"] == "my-run-2"  # never overwrites
    assert client.get("/api/runs/my-run").json()["summary"]["end_status"] == "optimal"
    r = client.delete("/api/runs/my-run")
    assert r.status_code == 200 and r.json() == {"id": "my-run", "deleted": True}
    assert_error_shape(client.get("/api/runs/my-run"), 404)
    assert_error_shape(client.delete("/api/runs/my-run"), 404)


def test_upload_gzip_and_csv(client, tmp_path):
    raw = (sample_dir() / f"{OVEN}.jsonl.gz").read_bytes()
    r = client.post("/api/runs", files={"file": ("oven.jsonl.gz", raw)})
    assert r.status_code == 201 and r.json()["id"] == "oven"
    csv = ("id,parent,bound,status,variable,direction,value\n"
           "0,,10.5,branched,,,\n1,0,11,integral,3,down,0\n2,0,12,pruned,3,up,1\n")
    r = client.post("/api/runs", files={"file": ("table.csv", csv.encode())})
    assert r.status_code == 201, r.text
    detail = client.get(f"/api/runs/{r.json()['id']}").json()
    assert detail["summary"]["tree_nodes"] == 3
    assert detail["summary"]["nodes_by_status"]["integral"] == 1


def test_upload_errors_name_the_line(client):
    lines = _jsonl(sample_dir() / f"{DEPOT}.jsonl.gz").decode().splitlines()
    bad = json.loads(lines[3])
    bad["status"] = "sideways"
    lines[3] = json.dumps(bad)
    r = client.post("/api/runs", files={"file": ("bad.jsonl", "\n".join(lines).encode())})
    err = assert_error_shape(r, 422, "invalid-run")
    assert err["detail"]["line"] == 4 and err["detail"]["field"] == "status"
    assert "bad.jsonl, line 4" in err["message"]
    csv = "id,parent,bound,status\n0,,1.0,branched\n1,0,x,open\n"
    err = assert_error_shape(client.post("/api/runs", files={"file": ("t.csv", csv.encode())}),
                             422, "invalid-run")
    assert err["detail"]["line"] == 3 and err["detail"]["field"] == "bound"
    err = assert_error_shape(client.post("/api/runs", files={"file": ("x.jsonl", b"not json\n")}),
                             422, "invalid-run")
    assert err["detail"]["line"] == 1
    assert not [p for p in (client.app.state.undergrowth.runs_dir).iterdir()
                if p.name.startswith(".upload")]  # nothing left behind


def test_upload_type_and_size_are_checked(tmp_path):
    with client_for(tmp_path, upload_limit_mb=0.01) as c:
        assert_error_shape(c.post("/api/runs", files={"file": ("run.txt", b"{}")}), 415,
                           "unsupported-type")
        big = io.BytesIO(b"x" * 20_000)
        assert_error_shape(c.post("/api/runs", files={"file": ("run.jsonl", big)}), 413,
                           "too-large")
        assert_error_shape(c.post("/api/runs"), 422, "invalid-request")  # no file at all


def test_upload_file_name_cannot_escape_the_runs_dir(client, tmp_path):
    data = _jsonl(sample_dir() / f"{TIGHT}.jsonl.gz")
    r = client.post("/api/runs", files={"file": ("../../escape.jsonl", data)})
    assert r.status_code == 201 and r.json()["id"] == "escape"
    assert (tmp_path / "runs" / "escape.jsonl").exists()
    assert not (tmp_path / "escape.jsonl").exists()


def test_samples_cannot_be_deleted(client):
    assert_error_shape(client.delete(f"/api/runs/{DEPOT}"), 403, "sample-run")
    assert client.get(f"/api/runs/{DEPOT}").status_code == 200


def test_an_unreadable_run_is_listed_with_its_error(client, tmp_path):
    (tmp_path / "runs" / "junk.jsonl").write_text("this is not a run log\n")
    items = {i["id"]: i for i in client.get("/api/runs").json()}
    assert items["junk"]["status"] == "unreadable" and "header" in items["junk"]["error"]
    err = assert_error_shape(client.get("/api/runs/junk"), 422, "unreadable-run")
    assert err["detail"]["line"] == 1
