"""The walkthrough in headless Chromium: stepping, playing, jumps, links, narration and notes.

Every expected value comes from the API (the steps, the tree arrays, the run's
summary, the notes), never from the page itself.
"""

from __future__ import annotations

import json
from collections.abc import Iterator
from typing import Any

import httpx
import pytest
from browser_support import DEPOT, open_run
from conftest import LiveServer, free_port

from undergrowth.api import ApiSettings
from undergrowth.paths import SAMPLE_RUNS
from undergrowth.runlog import notes as sidecar

DEEP = "shift-cover.most-fractional.depth-first"  # 3431 steps: the narration spans many pages
STATE = "window.undergrowth.walkthrough.state()"


def all_steps(base: str, run: str) -> dict[str, Any]:
    """Every step of a run from the steps API (pages of 500)."""
    first = httpx.get(f"{base}/api/runs/{run}/steps", params={"start": 0, "count": 500}).json()
    steps = list(first["steps"])
    while len(steps) < first["total"]:
        more = httpx.get(f"{base}/api/runs/{run}/steps",
                         params={"start": len(steps), "count": 500}).json()
        steps.extend(more["steps"])
    return {**first, "steps": steps}


def solved_by(base: str, run: str, order: int) -> int:
    """Nodes of the tree arrays solved at or before processing order `order`."""
    return sum(statuses_solved_by(base, run, order).values())


def statuses_solved_by(base: str, run: str, order: int) -> dict[str, int]:
    """Nodes per status among those solved at or before processing order `order`."""
    tree = httpx.get(f"{base}/api/runs/{run}/tree", params={"format": "json"}).json()
    names = tree["statuses"]
    out: dict[str, int] = {}
    for o, code in zip(tree["columns"]["order"], tree["columns"]["status"], strict=True):
        if 0 <= o <= order:
            out[names[code]] = out.get(names[code], 0) + 1
    return out


def legend_counts(page: Any) -> dict[str, int]:
    """The legend's visible status buttons and their counts."""
    return page.evaluate("""() => Object.fromEntries(Array.from(
        document.querySelectorAll('#legend button[data-status]'))
        .filter((b) => !b.hidden && b.offsetParent !== null)
        .map((b) => [b.dataset.status,
                     Number(b.querySelector('.count').textContent.replace(/[^0-9]/g, ''))])
        .filter(([, n]) => n > 0))""")


def wait_for_step(page: Any, k: int) -> None:
    page.wait_for_function(f"() => {{ const w = window.undergrowth.walkthrough;"
                           f" return w && w.on && w.step === {k}; }}")
    page.wait_for_selector(f'#walk-narration[data-step="{k}"]')


def shown_sentences(page: Any) -> list[str]:
    return page.locator("#walk-sentences li").all_inner_texts()


def test_playing_the_run_to_its_end_at_50_steps_per_second(page, server):
    summary = httpx.get(f"{server.url}/api/runs/{DEPOT}").json()["summary"]
    steps = all_steps(server.url, DEPOT)
    assert steps["total"] == summary["nodes"] == 111
    asked: list[str] = []
    page.on("request", lambda r: asked.append(r.url) if "/steps" in r.url else None)
    open_run(page, server.url, DEPOT)
    page.click("#walk-toggle")
    wait_for_step(page, 0)
    assert page.inner_text("#walk-counter") == "Step 1 of 111"
    assert page.evaluate(STATE)["visible"] == 1
    page.select_option("#walk-speed", "50")
    page.click("#walk-play")
    page.wait_for_function("() => window.undergrowth.walkthrough.playing")
    page.wait_for_function("() => { const w = window.undergrowth.walkthrough;"
                           " return !w.playing && w.step === w.total - 1; }", timeout=30_000)
    page.wait_for_timeout(300)  # it stays stopped at the end
    state = page.evaluate(STATE)
    assert state["step"] == 110 and not state["playing"]
    assert page.inner_text("#walk-counter") == "Step 111 of 111"
    assert state["visible"] == summary["nodes"]  # every solved node is shown
    assert page.get_attribute("#walk-play", "aria-pressed") == "false"
    wait_for_step(page, 110)
    assert shown_sentences(page) == steps["steps"][110]["sentences"]
    # 111 steps fit in one page of 200: the narration was fetched once, not per step
    assert len(asked) == 1 and state["requests"] == 1, asked
    page.wait_for_function("() => location.hash.includes('step=110')")


def test_narration_and_visible_nodes_at_chosen_steps(page, server):
    data = all_steps(server.url, DEPOT)
    steps = data["steps"]
    branched = next(s["step"] for s in steps if s["status"] == "branched" and s["depth"] >= 3)
    first_prune = next(s["step"] for s in steps if s["prune"])
    assert steps[first_prune]["status"] == "pruned"
    open_run(page, server.url, DEPOT)
    page.keyboard.press("w")  # the walkthrough key
    wait_for_step(page, 0)

    def check(k: int) -> None:
        wait_for_step(page, k)
        st = steps[k]
        assert shown_sentences(page) == st["sentences"], k
        state = page.evaluate(STATE)
        assert state["visible"] == solved_by(server.url, DEPOT, st["order"]), k
        assert state["node"] == st["node"]
        assert page.evaluate("() => { const t = window.undergrowth.inspector.tree;"
                             " return t.store.id[t.selected]; }") == st["node"]
        assert page.inner_text('#walk-narration [data-field="open"]') == f"{st['open']:,}"
        assert page.inner_text("#walk-counter") == f"Step {k + 1} of 111"
        # the legend counts what the tree shows at this step, by status
        assert legend_counts(page) == statuses_solved_by(server.url, DEPOT, st["order"]), k

    check(0)
    # a branched step through the timeline slider's keys: one step right at a time
    page.focus("#walk-timeline")
    for _ in range(branched):
        page.keyboard.press("ArrowRight")
    check(branched)
    # the first pruned step through the jump button (pages read as needed)
    page.click('#walk-bar [data-jump="prune"][data-dir="1"]')
    check(first_prune)
    # the next new incumbent, by key, from the start
    page.keyboard.press("Home")
    check(0)
    page.keyboard.press("n")
    check(data["incumbent_steps"][0])
    assert steps[data["incumbent_steps"][0]]["new_incumbent"]
    # and back again with Shift+N: there is none before the first
    page.keyboard.press("N")
    page.wait_for_function("() => document.querySelector('#walk-message').textContent"
                           ".includes('No earlier new incumbent')")


def test_a_step_link_opens_the_walkthrough_at_that_step(page, server):
    steps = all_steps(server.url, DEPOT)["steps"]
    page.goto(f"{server.url}/#run={DEPOT}&layout=bound&step=30")
    wait_for_step(page, 30)
    assert page.inner_text("#walk-counter") == "Step 31 of 111"
    assert shown_sentences(page) == steps[30]["sentences"]
    # the other keys of the link still work
    assert page.evaluate("window.undergrowth.inspector.tree.layout") == "bound"
    assert page.evaluate(STATE)["visible"] == solved_by(server.url, DEPOT, steps[30]["order"])
    # the bounds chart's cursor sits at nodes processed after the step
    page.wait_for_function("() => { const d = document.querySelector('#bounds-chart');"
                           " return d.layout && d.layout.shapes && d.layout.shapes.length === 1; }")
    assert page.evaluate("document.querySelector('#bounds-chart').layout.shapes[0].x0") == 31
    # the tree draws only what was solved: fewer marks than in the whole tree
    drawn = page.evaluate("() => { const l = window.undergrowth.inspector.tree.list;"
                          " return new Set(l.markRow.subarray(0, l.markCount)).size; }")
    assert 0 < drawn <= 31
    # leaving the walkthrough shows the whole tree and drops step from the link
    page.click("#walk-toggle")
    page.wait_for_function("() => !location.hash.includes('step=')")
    assert page.evaluate(STATE)["visible"] == 149
    page.wait_for_selector('#node-panel[data-node]')
    # and the legend counts the whole run again (the run's summary)
    by_status = httpx.get(f"{server.url}/api/runs/{DEPOT}").json()["summary"]["nodes_by_status"]
    assert legend_counts(page) == {k: v for k, v in by_status.items() if v}


@pytest.fixture
def clean_notes(server) -> Iterator[str]:
    def wipe() -> None:
        for n in httpx.get(f"{server.url}/api/runs/{DEEP}/notes").json()["notes"]:
            httpx.delete(f"{server.url}/api/runs/{DEEP}/notes/{n['id']}")

    wipe()
    yield DEEP
    wipe()


def test_a_note_added_at_a_step_is_listed_after_a_reload_and_marks_its_node(page, server,
                                                                            clean_notes):
    steps = all_steps(server.url, DEEP)["steps"]
    k = 250  # on the second page of narration
    node = steps[k]["node"]
    page.goto(f"{server.url}/#run={DEEP}&step={k}")
    wait_for_step(page, k)
    assert shown_sentences(page) == steps[k]["sentences"]
    page.wait_for_selector("#note-add summary")
    assert page.inner_text("#note-add summary") == f"Add a note to node {node} (step {k + 1})"
    page.click("#note-add summary")
    page.fill("#note-text", "Depth-first dives here; the bound barely moves.")
    page.fill("#note-author", "Ines")
    page.click("#note-form button[type=submit]")
    page.wait_for_selector("#notes-panel li.note")
    stored = httpx.get(f"{server.url}/api/runs/{DEEP}/notes").json()["notes"]
    assert [(n["node"], n["order"], n["author"], n["text"]) for n in stored] == [
        (node, steps[k]["order"], "Ines", "Depth-first dives here; the bound barely moves.")]

    page.reload()
    wait_for_step(page, k)
    page.wait_for_selector("#notes-panel li.note")
    item = page.locator("#notes-panel li.note").first
    assert "Depth-first dives here" in item.inner_text()
    assert "Ines" in item.inner_text()
    page.wait_for_function(f"() => {STATE}.noteNodes.includes({node})")
    assert page.evaluate(STATE)["noteSteps"] == [k]
    assert page.locator("#walk-ticks .walk-tick.tick-note").count() == 1
    assert "Depth-first dives here" in page.inner_text("#walk-step-notes")
    # the steps API agrees the note sits at that step
    assert httpx.get(f"{server.url}/api/runs/{DEEP}/steps",
                     params={"start": 0, "count": 1}).json()["note_steps"] == [k]

    # the note's link jumps back to its step from elsewhere
    page.keyboard.press("Home")
    wait_for_step(page, 0)
    assert node not in page.evaluate(STATE)["noteNodes"]  # not solved yet at step 0: no mark
    item.locator(".note-jump").click()
    wait_for_step(page, k)

    # its author can edit it, then delete it
    item.get_by_role("button", name="Edit").click()
    page.fill("#notes-panel .note-edit-text", "Depth-first dives here.")
    item.get_by_role("button", name="Save").click()
    page.wait_for_function("() => document.querySelector('#notes-panel .note-text')?.textContent"
                           " === 'Depth-first dives here.'")
    edited = httpx.get(f"{server.url}/api/runs/{DEEP}/notes").json()["notes"][0]
    assert edited["text"] == "Depth-first dives here." and edited.get("edited")
    page.locator("#notes-panel li.note").get_by_role("button", name="Delete").click()
    page.locator("#notes-panel li.note").get_by_role("button", name="Delete it").click()
    page.wait_for_selector("#notes-panel .notes-empty")
    assert httpx.get(f"{server.url}/api/runs/{DEEP}/notes").json()["notes"] == []
    page.wait_for_function("() => window.undergrowth.walkthrough.state().noteNodes.length === 0")


@pytest.fixture
def read_only_server(tmp_path) -> Iterator[LiveServer]:
    settings = ApiSettings(samples_dir=SAMPLE_RUNS, runs_dir=tmp_path / "runs",
                           models_dir=tmp_path / "models", cache_dir=tmp_path / "cache",
                           port=free_port(), read_only=True)
    # a note already on this server's shelf (where it keeps the samples' notes)
    sidecar.add_note(SAMPLE_RUNS / f"{DEPOT}.jsonl.gz", text="Second incumbent found here.",
                     node=69, order=89, author="Ines", shelve=True, shelf=tmp_path / "notes")
    with LiveServer(settings) as live:
        yield live


def test_a_read_only_server_shows_notes_but_no_form(page, read_only_server, console):
    base = read_only_server.url
    listed = httpx.get(f"{base}/api/runs/{DEPOT}/notes").json()
    assert listed["editable"] is False and len(listed["notes"]) == 1
    writes: list[str] = []
    page.on("request", lambda r: writes.append(r.url) if r.method != "GET" else None)
    page.goto(f"{base}/#run={DEPOT}&step=89")
    wait_for_step(page, 89)
    page.wait_for_selector("#notes-panel li.note")
    assert "Second incumbent found here." in page.inner_text("#notes-panel")
    assert "Second incumbent found here." in page.inner_text("#walk-step-notes")
    assert page.locator("#note-form").count() == 0
    assert "read-only" in page.inner_text("#notes-panel .notes-readonly")
    assert page.locator("#notes-panel li.note button", has_text="Edit").count() == 0
    assert 69 in page.evaluate(STATE)["noteNodes"]
    assert writes == []  # the page tried no write
    # a write sent anyway is refused by the server
    console.allow(r"status of 403")
    answer = page.evaluate("""async (url) => {
        const r = await fetch(url, {method: 'POST', headers: {'Content-Type': 'application/json'},
                                    body: JSON.stringify({text: 'sneaky', node: 0})});
        return {status: r.status, body: await r.json()};
    }""", f"{base}/api/runs/{DEPOT}/notes")
    assert answer["status"] == 403 and answer["body"]["error"]["code"] == "read-only"
    assert len(httpx.get(f"{base}/api/runs/{DEPOT}/notes").json()["notes"]) == 1


def test_a_refused_write_shows_the_servers_message_in_the_panel(page, read_only_server, console):
    """The page believes the server is writable (its answer is altered in flight); the
    read-only server's real 403 then lands in the panel, not as an uncaught error."""
    base = read_only_server.url

    def claim_editable(route: Any) -> None:
        if route.request.method != "GET":
            route.continue_()
            return
        body = route.fetch().json()
        route.fulfill(status=200, content_type="application/json",
                      body=json.dumps({**body, "editable": True}))

    page.route(f"{base}/api/runs/{DEPOT}/notes", claim_editable)
    console.allow(r"status of 403")
    page.goto(f"{base}/#run={DEPOT}&step=3")
    wait_for_step(page, 3)
    page.click("#note-add summary")
    page.fill("#note-text", "This will be refused.")
    page.click("#note-form button[type=submit]")
    page.wait_for_selector("#notes-panel .notes-message.error")
    message = page.inner_text("#notes-panel .notes-message")
    assert "refused" in message and "read-only" in message
    page.wait_for_selector("#notes-panel .notes-readonly")  # and it stops offering the form
    assert page.locator("#note-form").count() == 0
    assert len(httpx.get(f"{base}/api/runs/{DEPOT}/notes").json()["notes"]) == 1
