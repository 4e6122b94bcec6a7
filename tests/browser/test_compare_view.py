"""The comparison page: two sample runs side by side (trees at one scale, the overlaid
bounds chart, the table), picking runs in the library, and a group started from the
library's compare-rules form followed to its end."""

from __future__ import annotations

import httpx

KNAPSACK = "project-selection.most-fractional.best-bound"  # 3651 nodes, 7301 tree nodes
RELIABLE = "project-selection.reliability.hybrid"  # 2685 nodes, 2745 tree nodes

WAIT_DRAWN = """(n) => { const c = window.undergrowth && window.undergrowth.compare;
  return c && c.panes.length === n && c.panes.every((p) => p.tree.drawCount > 0)
    && c.table && document.querySelector('#compare-chart').data; }"""


def open_compare(page, base: str, ids: list[str]) -> None:
    page.goto(f"{base}/#compare={','.join(ids)}")
    page.wait_for_function(WAIT_DRAWN, arg=len(ids))


def test_two_runs_side_by_side_at_one_scale_with_one_chart_and_the_table(page, server):
    open_compare(page, server.url, [KNAPSACK, RELIABLE])
    runs = {i: httpx.get(f"{server.url}/api/runs/{i}").json()["summary"]
            for i in (KNAPSACK, RELIABLE)}
    panes = page.evaluate("""() => window.undergrowth.compare.panes.map((p) => ({
        id: p.id, nodes: p.tree.lastDraw.nodes, marks: p.tree.lastDraw.marks,
        kx: p.tree.renderer.width / (p.tree.view.x1 - p.tree.view.x0),
        ky: p.tree.renderer.height / (p.tree.view.y1 - p.tree.view.y0),
        head: p.title.closest('header').textContent }))""")
    assert [p["id"] for p in panes] == [KNAPSACK, RELIABLE]
    for p in panes:
        # both trees drawn: every node event of the run is in the pane's scene
        assert p["nodes"] == runs[p["id"]]["tree_nodes"] and p["marks"] > 100
    # one scale: the same pixels per leaf and per depth in both panes
    assert abs(panes[0]["kx"] - panes[1]["kx"]) <= 1e-9 * panes[0]["kx"]
    assert abs(panes[0]["ky"] - panes[1]["ky"]) <= 1e-9 * panes[0]["ky"]

    traces = page.evaluate("""() => document.querySelector('#compare-chart').data.map(
        (t) => ({run: t.meta.run, side: t.meta.side, colour: t.line.color, n: t.x.length}))""")
    # exactly one primal and one dual trace per run, in the run's colour
    assert sorted((t["run"], t["side"]) for t in traces) == sorted(
        (r, s) for r in (KNAPSACK, RELIABLE) for s in ("primal", "dual"))
    assert all(t["n"] > 1 for t in traces)
    colours = {t["run"]: {u["colour"] for u in traces if u["run"] == t["run"]} for t in traces}
    assert all(len(c) == 1 for c in colours.values()) and len(
        {next(iter(c)) for c in colours.values()}) == 2
    head_colours = page.evaluate("""() => window.undergrowth.compare.panes.map((p) =>
        getComputedStyle(p.title.closest('header')).getPropertyValue('--run').trim())""")
    assert [c.lower() for c in head_colours] == [
        next(iter(colours[KNAPSACK])).lower(), next(iter(colours[RELIABLE])).lower()]

    # the table: each run's node count as in its summary (3651 and 2685), best marked
    for run_id in (KNAPSACK, RELIABLE):
        row = page.locator(f'#compare-table tr[data-run="{run_id}"]')
        nodes = row.locator('td[data-key="nodes"]')
        assert nodes.inner_text().replace("(best)", "").strip() == f"{runs[run_id]['nodes']:,}"
    fewer = min((KNAPSACK, RELIABLE), key=lambda i: runs[i]["nodes"])
    best = page.locator('#compare-table td.best[data-key="nodes"]')
    assert best.count() == 1
    assert best.locator("xpath=..").get_attribute("data-run") == fewer

    # variables: a list per run; the overlap names what both runs favour
    assert page.locator("#compare-vars .cmp-vars").count() == 2
    assert "Jaccard" in page.inner_text("#compare-overlap")

    # x axis by time: still one primal and one dual per run, now over seconds
    page.click('[data-compare-axis="time"]')
    page.wait_for_function("""() => document.querySelector('#compare-chart').layout.xaxis
        .title.text.startsWith('seconds')""")
    # the axis title changes with the data: never a time axis over node-count traces
    assert page.evaluate("document.querySelector('#compare-chart').data.length") == 4
    assert "axis=time" in page.evaluate("location.hash")


def test_panning_one_tree_moves_the_other_at_the_same_scale(page, server):
    open_compare(page, server.url, [KNAPSACK, RELIABLE])
    box = page.locator('#compare-panes canvas').first.bounding_box()
    page.mouse.move(box["x"] + box["width"] / 2, box["y"] + box["height"] / 2)
    page.mouse.wheel(0, -400)  # zoom in on the first pane
    page.wait_for_function("() => window.undergrowth.compare.userMoved")
    spans = page.evaluate("""() => window.undergrowth.compare.panes.map((p) => [
        p.tree.renderer.width / (p.tree.view.x1 - p.tree.view.x0),
        p.tree.renderer.height / (p.tree.view.y1 - p.tree.view.y0)])""")
    assert abs(spans[0][0] - spans[1][0]) <= 1e-9 * spans[0][0]
    page.click("#compare-fit")
    assert page.evaluate("window.undergrowth.compare.userMoved") is False


def test_runs_picked_in_the_library_open_side_by_side(page, server):
    page.goto(server.url + "/")
    page.wait_for_selector(f'#runs-body tr[data-run="{KNAPSACK}"]')
    assert page.is_disabled("#compare-picked")
    page.check(f'#runs-body tr[data-run="{KNAPSACK}"] input[type="checkbox"]')
    assert page.is_disabled("#compare-picked")  # one run is not a comparison
    page.check(f'#runs-body tr[data-run="{RELIABLE}"] input[type="checkbox"]')
    assert "run=" not in page.evaluate("location.hash")  # ticking does not open the run
    page.click("#compare-picked")
    page.wait_for_function(WAIT_DRAWN, arg=2)
    assert page.evaluate("location.hash") == f"#compare={KNAPSACK},{RELIABLE}"


def test_a_comparison_started_in_the_library_is_followed_to_its_end(page, server):
    page.goto(server.url + "/")
    page.wait_for_selector('#group-model option[value="depot-siting-loose"]', state="attached")
    page.select_option("#group-model", "depot-siting-loose")
    page.uncheck('input[name="group-rule"][value="reliability"]')  # most-fractional, pseudocost
    assert page.inner_text("#group-count").startswith("2 runs")
    page.click("text=Start comparison")
    page.wait_for_function("() => location.hash.startsWith('#group=')")
    group_id = page.evaluate("location.hash").split("=", 1)[1]
    page.wait_for_function("""() => { const c = window.undergrowth.compare;
        return c && c.group && c.group.state === 'done' && c.table && c.table.rows.length === 2
          && c.panes.every((p) => p.store && p.tree.drawCount > 0); }""", timeout=120_000)
    group = httpx.get(f"{server.url}/api/groups/{group_id}").json()
    assert sorted(m["branching"] for m in group["members"]) == ["most-fractional", "pseudocost"]
    for member in group["members"]:
        cell = page.locator(f'#compare-table tr[data-run="{member["run_id"]}"] '
                            'td[data-key="nodes"]')
        assert cell.inner_text().replace("(best)", "").strip() == f"{member['nodes']:,}"
    assert page.is_hidden("#compare-cancel")
    page.goto(server.url + "/")
    page.wait_for_selector(f'#groups-list li[data-group="{group_id}"]')
    # a finished comparison can be deleted from the list, with its runs (two clicks)
    item = page.locator(f'#groups-list li[data-group="{group_id}"]')
    item.locator("button.group-delete").click()
    assert "its 2 runs?" in item.locator("button.group-delete").inner_text()
    item.locator("button.group-delete").click()
    page.wait_for_selector(f'#groups-list li[data-group="{group_id}"]', state="detached")
    assert httpx.get(f"{server.url}/api/groups/{group_id}").status_code == 404
    for member in group["members"]:
        assert httpx.get(f"{server.url}/api/runs/{member['run_id']}").status_code == 404
        page.wait_for_selector(f'#runs-body tr[data-run="{member["run_id"]}"]',
                               state="detached")
