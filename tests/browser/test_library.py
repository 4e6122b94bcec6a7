"""The library page: runs with their figures, uploads, and a live solve to the end."""

from __future__ import annotations

import json
import time

import httpx
from browser_support import inked_pixels, start_endless_solve

from undergrowth.paths import SAMPLE_RUNS


def test_the_library_lists_the_sample_runs_with_their_figures(page, server):
    page.goto(server.url + "/")
    page.wait_for_selector("#runs-body tr")
    runs = httpx.get(f"{server.url}/api/runs").json()
    assert page.locator("#runs-body tr").count() == len(runs)
    row = page.locator('#runs-body tr[data-run="project-selection.least-fractional.best-bound"]')
    text = row.inner_text()
    assert "8,877" in text and "694" in text and "optimal" in text
    row.locator("a").click()
    page.wait_for_function("() => window.undergrowth.inspector && "
                           "window.undergrowth.inspector.timings.firstDraw > 0")
    assert "run=project-selection.least-fractional.best-bound" in page.evaluate("location.hash")


def test_a_bad_run_upload_shows_the_line_it_names(page, server, console, tmp_path):
    console.allow(r"status of 422")  # the browser's own note of the refused upload
    good = httpx.get(f"{server.url}/api/runs/oven-batching.most-fractional.best-bound").json()
    bad = tmp_path / "broken-run.jsonl"
    lines = [json.dumps(good["header"]), '{"kind": "progress", "time": 0.0, "nodes": 0,'
             ' "open": 1, "dual_bound": null, "primal_bound": null, "gap": null,'
             ' "tree_weight": 0.0}', '{"kind": "node", "id": 0, "parent":']
    bad.write_text("\n".join(lines) + "\n")
    page.goto(server.url + "/")
    page.set_input_files("#upload-file", str(bad))
    page.click('#upload-form button[type="submit"]')
    ref = page.locator("#upload-result .line-ref")
    ref.wait_for()
    assert ref.get_attribute("data-line") == "3"
    assert "line 3" in ref.inner_text()
    assert "broken-run.jsonl" in page.inner_text("#upload-result")


def test_a_bad_model_upload_shows_the_line_and_token(page, server, console, tmp_path):
    console.allow(r"status of 422")
    bad = tmp_path / "broken.mps"
    bad.write_text("NAME x\nROWS\n N obj\n L c1\nCOLUMNS\n x obj 1 c1 2 c9 1\nRHS\n"
                   " rhs c1 4\nENDATA\n")
    page.goto(server.url + "/")
    page.check('input[name="upload-kind"][value="model"]')
    page.set_input_files("#upload-file", str(bad))
    page.click('#upload-form button[type="submit"]')
    ref = page.locator("#upload-result .line-ref")
    ref.wait_for()
    assert ref.get_attribute("data-line") == "6"


def test_a_good_run_upload_is_listed_and_opens(page, server, tmp_path):
    src = SAMPLE_RUNS / "oven-batching.pseudocost.best-estimate.jsonl.gz"
    page.goto(server.url + "/")
    page.set_input_files("#upload-file", str(src))
    page.click('#upload-form button[type="submit"]')
    page.wait_for_selector("#upload-result .ok a")
    page.click("#upload-result .ok a")
    page.wait_for_function("() => window.undergrowth.inspector && "
                           "window.undergrowth.inspector.timings.firstDraw > 0")
    assert inked_pixels(page) > 500


def test_a_solve_started_from_the_library_streams_to_the_end(page, server):
    page.goto(server.url + "/")
    page.wait_for_selector('#solve-model option[value="project-selection"]', state="attached")
    page.select_option("#solve-model", "project-selection")
    page.select_option("#solve-rule", "pseudocost")
    page.select_option("#solve-order", "best-bound")
    page.click("text=Start and watch live")
    page.wait_for_selector("#live-bar:not([hidden])")
    page.wait_for_selector('#live-bar[data-state="ended"]', timeout=120_000)
    run_id = page.evaluate("window.undergrowth.inspector.runId")
    detail = httpx.get(f"{server.url}/api/runs/{run_id}").json()
    store_n = page.evaluate("window.undergrowth.inspector.store.n")
    assert store_n == detail["summary"]["tree_nodes"] > 100
    assert page.evaluate("window.undergrowth.inspector.feed.batches") >= 1
    assert "Finished" in page.inner_text("#live-text")
    page.wait_for_timeout(200)
    assert inked_pixels(page) > 2000
    # the streamed tree is laid out exactly as the server lays out the finished run
    tree = httpx.get(f"{server.url}/api/runs/{run_id}/tree?format=json").json()
    xs = page.evaluate("Array.from(window.undergrowth.inspector.store.x.subarray(0, 200))")
    server_x = tree["columns"]["x"][:200]  # float32 on the server
    assert all(abs(a - b) <= 1e-3 * max(1.0, abs(b)) for a, b in zip(xs, server_x, strict=True))
    # the bounds chart followed the stream
    names = page.evaluate("document.querySelector('#bounds-chart').data.map(t => t.name)")
    assert "dual bound" in names


def test_a_running_solve_opened_from_a_link_loads_the_tree_so_far_then_follows(page, server):
    body = {"model": "project-selection", "branching": "least-fractional", "select": "best-bound"}
    run_id = httpx.post(f"{server.url}/api/solves", json=body).json()["run_id"]
    deadline = time.monotonic() + 60
    while time.monotonic() < deadline:  # wait until the run log holds some nodes
        d = httpx.get(f"{server.url}/api/runs/{run_id}").json()
        if d["status"] != "running" or (d.get("summary") or {}).get("tree_nodes", 0) > 300:
            break
        time.sleep(0.1)
    page.goto(f"{server.url}/#run={run_id}")
    page.wait_for_function("() => { const i = window.undergrowth.inspector; return i && i.store"
                           " && i.store.n > 0; }")
    resumed = page.evaluate("(() => { const f = window.undergrowth.inspector.feed;"
                            " return f ? f.startId : null; })()")
    if resumed is not None:  # still running when the page opened: snapshot, then stream
        assert resumed >= 0
        page.wait_for_selector('#live-bar[data-state="ended"]', timeout=120_000)
    final = httpx.get(f"{server.url}/api/runs/{run_id}").json()["summary"]["tree_nodes"]
    page.wait_for_function(f"() => window.undergrowth.inspector.store.n === {final}")
    ids = page.evaluate("(() => { const s = window.undergrowth.inspector.store;"
                        " return new Set(Array.from(s.id.subarray(0, s.n))).size; })()")
    assert ids == final  # no node twice, none missing


def test_a_live_solve_can_be_cancelled_from_the_page(page, server):
    start_endless_solve(page, server, "parity-41", "breadth-first")
    page.wait_for_function("() => { const i = window.undergrowth.inspector;"
                           " return i && i.store && i.store.n > 20; }", timeout=60_000)
    page.click("#live-cancel")
    page.wait_for_selector('#live-bar[data-state="ended"]', timeout=60_000)
    text = page.inner_text("#live-text")
    run_id = page.evaluate("window.undergrowth.inspector.runId")
    status = httpx.get(f"{server.url}/api/runs/{run_id}").json()["status"]
    assert status == "cancelled" and "cancelled" in text
    # the nodes left open arrive with the end; the legend counts them a moment later
    page.wait_for_selector('#legend button[data-status="open"]', state="visible",
                           timeout=15_000)
