"""Solves in worker processes: finish, queue, caps, cancel, a killed worker, a restart."""

from __future__ import annotations

import functools
import gzip
import json
import os
import signal
import time

import pytest

from test_api_support import (
    DEPOT,
    assert_error_shape,
    client_for,
    parse_sse,
    sample_dir,
    stream_events,
)
from undergrowth.api.status import JobRecord, write_status
from undergrowth.runlog import read_run

LONG = {"model": "shift-cover", "branching": "reliability", "select": "hybrid"}  # ~3400 nodes
QUICK = {"model": "depot-siting-tight", "branching": "most-fractional", "select": "best-bound"}


def wait_job(client, run_id: str, timeout: float = 30.0) -> dict:
    jobs = client.app.state.undergrowth.jobs
    client.portal.call(functools.partial(jobs.wait, run_id, timeout=timeout))
    return client.get(f"/api/solves/{run_id}").json()


def wait_events(client, run_id: str, count: int) -> None:
    """Until the live bus of ``run_id`` has ``count`` events (the worker is busy)."""
    ctx = client.app.state.undergrowth

    async def until() -> None:
        live = ctx.bus.get(run_id)
        assert live is not None
        assert await live.wait(count - 1, timeout=30)

    client.portal.call(until)


def test_a_solve_runs_in_a_worker_process_and_is_listed(tmp_path):
    with client_for(tmp_path) as c:
        r = c.post("/api/solves", json=QUICK)
        assert r.status_code == 202, r.text
        accepted = r.json()
        run_id = accepted["run_id"]
        assert run_id.startswith("depot-siting-tight.most-fractional.best-bound.")
        assert accepted["state"] in ("queued", "running") and accepted["capped"] == []
        job = wait_job(c, run_id)
        assert job["state"] == "finished" and job["end_status"] == "optimal"
        assert job["pid"] not in (None, os.getpid()) and job["reason"] is None
        run = read_run(tmp_path / "runs" / job["file"])
        assert run.end["status"] == "optimal"
        items = {i["id"]: i for i in c.get("/api/runs").json()}
        assert items[run_id]["source"] == "user" and items[run_id]["live"] is False
        assert items[run_id]["status"] == "optimal" and items[run_id]["job"] == "finished"
        assert c.get(f"/api/runs/{run_id}").json()["job"]["state"] == "finished"
        assert [j["run_id"] for j in c.get("/api/solves").json()] == [run_id]
        status = json.loads((tmp_path / "runs" / f"{run_id}.status.json").read_text())
        assert status["state"] == "finished"


def test_cancel_stops_a_solve_within_a_second_and_leaves_a_valid_run(tmp_path):
    with client_for(tmp_path) as c:
        run_id = c.post("/api/solves", json=LONG).json()["run_id"]
        wait_events(c, run_id, 50)
        t0 = time.monotonic()
        r = c.post(f"/api/solves/{run_id}/cancel")
        assert r.status_code == 200 and r.json()["state"] == "running"  # stopping
        job = wait_job(c, run_id)
        elapsed = time.monotonic() - t0
        assert elapsed < 1.0, f"took {elapsed:.2f} s"
        assert job["state"] == "cancelled" and job["end_status"] == "cancelled"
        run = read_run(tmp_path / "runs" / job["file"])  # strict: every line valid
        assert run.end["status"] == "cancelled" and run.warnings == []
        assert any(n["status"] == "open" for n in run.nodes)
        assert_error_shape(c.post(f"/api/solves/{run_id}/cancel"), 409, "conflict")
        assert_error_shape(c.post("/api/solves/nobody/cancel"), 404, "not-found")


def test_a_worker_killed_with_sigkill_leaves_a_failed_run_that_still_opens(tmp_path):
    with client_for(tmp_path) as c:
        run_id = c.post("/api/solves", json=LONG).json()["run_id"]
        wait_events(c, run_id, 50)
        pid = c.get(f"/api/solves/{run_id}").json()["pid"]
        os.kill(pid, signal.SIGKILL)
        job = wait_job(c, run_id)
        assert job["state"] == "failed"
        assert "SIGKILL" in job["reason"] and "run log" in job["reason"]
        run = read_run(tmp_path / "runs" / job["file"])  # a valid prefix: no end event
        assert run.end is None and run.header["model"]["name"] == "shift-cover"
        assert any("no end event" in w for w in run.warnings)
        detail = c.get(f"/api/runs/{run_id}").json()
        assert detail["status"] == "failed" and detail["live"] is False
        messages = parse_sse(c.get(f"/api/runs/{run_id}/stream").text)
        assert stream_events(messages) == run.events
        assert messages[-1]["data"]["status"] == "failed"
        sidecar = json.loads((tmp_path / "runs" / f"{run_id}.status.json").read_text())
        assert sidecar["state"] == "failed" and "SIGKILL" in sidecar["reason"]


def test_solves_beyond_the_slots_wait_in_the_queue(tmp_path):
    with client_for(tmp_path, max_solves=1, max_queued=1) as c:
        first = c.post("/api/solves", json=LONG).json()["run_id"]
        second = c.post("/api/solves", json=QUICK).json()
        assert second["state"] == "queued"
        assert_error_shape(c.post("/api/solves", json=QUICK), 503, "queue-full")
        queued = {i["id"]: i for i in c.get("/api/runs").json()}[second["run_id"]]
        assert queued["status"] == "queued" and queued["live"] and queued["bytes"] == 0
        detail = c.get(f"/api/runs/{second['run_id']}").json()
        assert detail["header"] is None and detail["status"] == "queued"
        c.post(f"/api/solves/{first}/cancel")
        assert wait_job(c, first)["state"] == "cancelled"
        assert wait_job(c, second["run_id"])["state"] == "finished"


def test_a_queued_solve_can_be_cancelled_before_it_starts(tmp_path):
    with client_for(tmp_path, max_solves=1) as c:
        first = c.post("/api/solves", json=LONG).json()["run_id"]
        second = c.post("/api/solves", json=QUICK).json()["run_id"]
        job = c.post(f"/api/solves/{second}/cancel").json()
        assert job["state"] == "cancelled" and "before it started" in job["reason"]
        assert not (tmp_path / "runs" / f"{second}.jsonl.gz").exists()
        assert_error_shape(c.get(f"/api/runs/{second}"), 404)
        c.post(f"/api/solves/{first}/cancel")
        wait_job(c, first)


def test_limits_are_capped_by_the_server(tmp_path):
    with client_for(tmp_path, node_limit_cap=5, time_limit_cap=30) as c:
        r = c.post("/api/solves", json={**LONG, "node_limit": 1000, "time_limit": 10}).json()
        assert r["node_limit"] == 5 and r["time_limit"] == 10 and r["capped"] == ["node_limit"]
        job = wait_job(c, r["run_id"])
        assert job["end_status"] == "node-limit" and job["nodes"] == 5
        r = c.post("/api/solves", json=QUICK).json()
        assert (r["node_limit"], r["time_limit"], r["capped"]) == (5, 30, [])
        wait_job(c, r["run_id"])


def test_solve_requests_are_validated(tmp_path):
    nonconvex = {"format": "undergrowth-model", "version": 1, "name": "bowl-upside-down",
                 "quadratic": [{"i": "x", "j": "x", "value": -1}],
                 "variables": {"x": {"upper": 3, "integer": True}}}
    with client_for(tmp_path) as c:
        assert_error_shape(c.post("/api/solves", json={**QUICK, "model": "nope"}), 404)
        assert_error_shape(c.post("/api/solves", json={**QUICK, "model": "../x"}), 400,
                           "invalid-id")
        for bad in ({"branching": "alphabetical"}, {"node_limit": 0}, {"gap": -1},
                    {"colour": "green"}, {"time_limit": "soon"}):
            assert_error_shape(c.post("/api/solves", json={**QUICK, **bad}), 422,
                               "invalid-request")
        assert_error_shape(c.post("/api/solves", content=b"{not json",
                                  headers={"content-type": "application/json"}), 422)
        up = c.post("/api/models", files={"file": ("bowl.json", json.dumps(nonconvex))})
        assert up.status_code == 201, up.text
        err = assert_error_shape(c.post("/api/solves", json={**QUICK, "model": "bowl"}), 422,
                                 "not-convex")
        assert "not convex" in err["message"]
        assert c.get("/api/solves").json() == []
        assert_error_shape(c.get("/api/solves/nobody"), 404)
        assert_error_shape(c.get("/api/solves/..%2F..%2Fetc"), 404)


def test_solves_interrupted_by_a_restart_are_marked_so(tmp_path):
    runs = tmp_path / "runs"
    runs.mkdir()
    with gzip.open(sample_dir() / f"{DEPOT}.jsonl.gz", "rt") as f:
        lines = f.read().splitlines()[:40]  # a log cut off while the search ran
    (runs / "halfway.jsonl").write_text("\n".join(lines) + "\n")
    write_status(runs / "halfway.status.json", JobRecord(
        run_id="halfway", model="depot-siting-loose", settings={}, state="running",
        file="halfway.jsonl", pid=999999))
    write_status(runs / "waiting.status.json", JobRecord(
        run_id="waiting", model="depot-siting-loose", settings={}, state="queued"))
    with client_for(tmp_path) as c:
        jobs = {j["run_id"]: j for j in c.get("/api/solves").json()}
        assert jobs["halfway"]["state"] == jobs["waiting"]["state"] == "interrupted"
        assert "server stopped" in jobs["halfway"]["reason"]
        detail = c.get("/api/runs/halfway").json()
        assert detail["status"] == "interrupted" and detail["live"] is False
        assert detail["summary"]["tree_nodes"] > 0
        messages = parse_sse(c.get("/api/runs/halfway/stream").text)
        assert len(stream_events(messages)) == 39
        assert messages[-1]["data"] == {"status": "interrupted", "last_id": 38}
    on_disk = json.loads((runs / "halfway.status.json").read_text())
    assert on_disk["state"] == "interrupted"


@pytest.mark.parametrize("method", ["spawn"])
def test_the_spawn_start_method_works_too(tmp_path, method):
    with client_for(tmp_path, worker_start=method) as c:
        run_id = c.post("/api/solves", json=QUICK).json()["run_id"]
        assert wait_job(c, run_id, timeout=60)["state"] == "finished"
