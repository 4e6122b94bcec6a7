"""The event stream: batches with resumable ids, file then live bus, resync, disconnect."""

from __future__ import annotations

import asyncio
import gzip
import json

import pytest

from test_api_support import (
    DEPOT,
    KNAPSACK,
    AsgiCall,
    assert_error_shape,
    client_for,
    parse_sse,
    run_async,
    sample_dir,
    settings_for,
    stream_events,
)
from undergrowth.api import create_app
from undergrowth.api.status import JobRecord
from undergrowth.runlog import read_run


@pytest.fixture(scope="module")
def knapsack_events():
    return read_run(sample_dir() / f"{KNAPSACK}.jsonl.gz").events


@pytest.fixture
def client(tmp_path):
    with client_for(tmp_path) as c:
        yield c


def test_a_finished_run_streams_every_event_then_end(client, knapsack_events):
    r = client.get(f"/api/runs/{KNAPSACK}/stream")
    assert r.status_code == 200
    assert r.headers["content-type"].startswith("text/event-stream")
    assert r.text.startswith("retry: ")
    messages = parse_sse(r.text)
    assert stream_events(messages) == knapsack_events
    # each batch's id is the index of its last event
    seen = 0
    for m in messages[:-1]:
        assert m["event"] == "batch"
        seen += len(m["data"])
        assert m["id"] == seen - 1
    assert len(messages) > 2  # more than one batch: resuming between batches is tested
    assert messages[-1] == {"event": "end", "id": None,
                            "data": {"status": "optimal", "last_id": len(knapsack_events) - 1}}


@pytest.mark.parametrize("last", [-1, 0, 1, 1998, 1999, 2000, 2345, "n-2", "n-1"])
def test_resume_with_last_event_id_gives_exactly_the_missing_events(client, knapsack_events,
                                                                    last):
    n = len(knapsack_events)
    k = {"n-2": n - 2, "n-1": n - 1}.get(last, last)
    r = client.get(f"/api/runs/{KNAPSACK}/stream", headers={"Last-Event-ID": str(k)})
    messages = parse_sse(r.text)
    assert stream_events(messages) == knapsack_events[k + 1:]
    ids = [m["id"] for m in messages if m["event"] == "batch"]
    assert all(i > k for i in ids)
    assert messages[-1]["event"] == "end"
    assert messages[-1]["data"] == {"status": "optimal", "last_id": n - 1}


def test_resume_point_as_a_query_parameter(client, knapsack_events):
    r = client.get(f"/api/runs/{KNAPSACK}/stream?last_id=3000")
    assert stream_events(parse_sse(r.text)) == knapsack_events[3001:]


def test_bad_resume_points_and_unknown_runs(client):
    assert_error_shape(client.get(f"/api/runs/{DEPOT}/stream",
                                  headers={"Last-Event-ID": "abc"}), 400, "bad-last-event-id")
    assert_error_shape(client.get(f"/api/runs/{DEPOT}/stream",
                                  headers={"Last-Event-ID": "-5"}), 400, "bad-last-event-id")
    assert_error_shape(client.get(f"/api/runs/{DEPOT}/stream?last_id=-7"), 422)
    assert_error_shape(client.get("/api/runs/nothing-here/stream"), 404, "not-found")


# ---------------------------------------------------------------- live bus, protocol level
def _lines(run_id: str) -> tuple[str, list[str]]:
    with gzip.open(sample_dir() / f"{run_id}.jsonl.gz", "rt") as f:
        text = f.read().splitlines()
    return text[0], text[1:]


def _fake_live_run(tmp_path, *, in_file: int, **settings):
    """An app with a 'running' job whose file holds ``in_file`` events; the test plays
    the worker by appending to the live bus."""
    app = create_app(settings_for(tmp_path, **settings))
    ctx = app.state.undergrowth
    header, lines = _lines(DEPOT)
    (ctx.runs_dir / "fake.jsonl").write_text("\n".join([header, *lines[:in_file]]) + "\n")
    ctx.jobs.records["fake"] = JobRecord(run_id="fake", model="depot-siting-loose",
                                         settings={}, state="running", file="fake.jsonl")
    return app, ctx, lines


def _batches(data: bytes):
    return parse_sse(data.decode())


def test_a_live_run_catches_up_from_the_file_then_follows_the_bus(tmp_path):
    async def scenario():
        app, ctx, lines = _fake_live_run(tmp_path, in_file=10, live_buffer_events=5)
        live = ctx.bus.open("fake")
        for first in (0, 5, 10):  # the bus keeps only the newest 5: events 10..14
            live.append(first, lines[first:first + 5])
        assert (live.start, live.end) == (10, 15)
        call = AsgiCall(app, "/api/runs/fake/stream")
        call.start()
        got = []
        while len(got) < 15:
            got += stream_events(_batches(await call.next_body()))
        live.append(15, lines[15:20])  # what the worker sends next
        while len(got) < 20:
            got += stream_events(_batches(await call.next_body()))
        ctx.bus.close("fake", "finished")
        tail = await call.read_until(b"event: end")
        assert got == [json.loads(x) for x in lines[:20]]
        assert _batches(tail)[-1]["data"] == {"status": "finished", "last_id": 19}
        await asyncio.wait_for(call.task, 5)

    run_async(scenario)


def test_a_client_disconnect_stops_its_stream(tmp_path):
    async def scenario():
        app, ctx, lines = _fake_live_run(tmp_path, in_file=0)
        live = ctx.bus.open("fake")
        live.append(0, lines[:3])
        call = AsgiCall(app, "/api/runs/fake/stream")
        call.start()
        data = await call.read_until(b"event: batch")
        assert live.viewers == 1
        assert stream_events(_batches(data)) == [json.loads(x) for x in lines[:3]]
        call.disconnect()  # the stream is waiting on the bus for more: it must stop now
        await asyncio.wait_for(call.task, 5)
        assert call.task.done() and call.task.exception() is None
        assert live.viewers == 0
        assert not live.finished  # the run goes on without its viewer

    run_async(scenario)


def test_a_slow_viewer_is_told_to_resync_and_the_search_is_not_held_up(tmp_path):
    async def scenario():
        app, ctx, lines = _fake_live_run(tmp_path, in_file=0, viewer_buffer_events=5)
        live = ctx.bus.open("fake")
        live.append(0, lines[:2])
        call = AsgiCall(app, "/api/runs/fake/stream")
        call.start()
        await call.read_until(b"event: batch")  # caught up with the live run
        call.gate.clear()  # from now on the client does not read
        live.append(2, lines[2:3])
        await call.waiting_at_gate.wait()  # the server is stuck sending event 2 to this client
        for first in range(3, 30, 3):  # ... while the search goes on unhindered
            live.append(first, lines[first:first + 3])
        assert live.end == 30
        call.gate.set()
        tail = await call.read_until(b"event: resync")
        resync = [m for m in _batches(tail) if m["event"] == "resync"][0]
        assert resync["data"]["last_id"] == 2 and resync["data"]["behind"] == 27
        await asyncio.wait_for(call.task, 5)  # the stream ends after the resync
        assert live.viewers == 0
        # reconnecting with the id it had catches up from the file (here: the bus) in full
        call = AsgiCall(app, "/api/runs/fake/stream", headers={"Last-Event-ID": "2"})
        call.start()
        got = []
        while len(got) < 27:
            got += stream_events(_batches(await call.next_body()))
        assert got == [json.loads(x) for x in lines[3:30]]
        call.disconnect()
        await asyncio.wait_for(call.task, 5)

    run_async(scenario)


def test_a_viewer_slow_from_the_start_is_told_to_resync_too(tmp_path):
    async def scenario():
        app, ctx, lines = _fake_live_run(tmp_path, in_file=0, viewer_buffer_events=5)
        live = ctx.bus.open("fake")
        live.append(0, lines[:3])
        # messages: 0 the response start, 1 "retry", 2 the first batch: the client stalls there
        call = AsgiCall(app, "/api/runs/fake/stream", hold_from=2)
        call.start()
        await call.waiting_at_gate.wait()  # it never caught up: the backlog it started with...
        live.append(3, lines[3:30])  # ... grows by far more than 5
        call.gate.set()
        tail = await call.read_until(b"event: resync")
        resync = [m for m in _batches(tail) if m["event"] == "resync"][0]
        assert resync["data"] == {**resync["data"], "last_id": 2, "behind": 27}
        await asyncio.wait_for(call.task, 5)

    run_async(scenario)


def test_a_late_viewer_with_a_big_backlog_catches_up_without_resync(tmp_path):
    async def scenario():
        app, ctx, lines = _fake_live_run(tmp_path, in_file=20, viewer_buffer_events=5)
        live = ctx.bus.open("fake")
        live.append(0, lines[:40])
        call = AsgiCall(app, "/api/runs/fake/stream")
        call.start()
        got = []
        while len(got) < 40:
            got += stream_events(_batches(await call.next_body()))
        live.append(40, lines[40:43])
        while len(got) < 43:
            got += stream_events(_batches(await call.next_body()))
        assert got == [json.loads(x) for x in lines[:43]]
        call.disconnect()
        await asyncio.wait_for(call.task, 5)

    run_async(scenario)


def test_the_tree_of_a_live_run_says_where_the_stream_resumes(tmp_path):
    with client_for(tmp_path) as c:
        ctx = c.app.state.undergrowth
        header, lines = _lines(DEPOT)
        (ctx.runs_dir / "growing.jsonl").write_text("\n".join([header, *lines[:25]]) + "\n"
                                                    + lines[25][:17])  # a line half written
        ctx.jobs.records["growing"] = JobRecord(run_id="growing", model="m", settings={},
                                                state="running", file="growing.jsonl")
        meta = c.get("/api/runs/growing/tree?format=json").json()
        assert meta["live"] is True and meta["events"] == 25
        assert meta["count"] == sum(json.loads(x)["kind"] == "node" for x in lines[:25])
        assert c.get("/api/runs/growing").json()["live"] is True


def test_a_real_solve_streams_live_and_matches_its_file(tmp_path):
    with client_for(tmp_path, stream_interval=0.02) as c:
        r = c.post("/api/solves", json={"model": "depot-siting-loose",
                                        "branching": "most-fractional", "select": "best-bound"})
        run_id = r.json()["run_id"]
        # asked at once: the worker may not have written a line yet
        messages = parse_sse(c.get(f"/api/runs/{run_id}/stream").text)
        job = c.get(f"/api/solves/{run_id}").json()
        assert job["state"] == "finished"
        run = read_run(tmp_path / "runs" / job["file"])
        assert stream_events(messages) == run.events
        assert messages[-1]["data"] == {"status": "optimal", "last_id": len(run.events) - 1}
