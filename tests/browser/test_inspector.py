"""The inspector in headless Chromium against the real app and the bundled sample runs."""

from __future__ import annotations

import math
import re

import httpx
from browser_support import DEPOT, KNAPSACK, colour_pixels, inked_pixels, mark_of, open_run


def test_a_sample_run_opens_and_the_tree_canvas_is_not_blank(page, server):
    open_run(page, server.url, DEPOT)
    assert inked_pixels(page) > 2000
    # every status the run has appears in the legend with its count (from the API)
    counts = httpx.get(f"{server.url}/api/runs/{DEPOT}").json()["summary"]["nodes_by_status"]
    for status, n in counts.items():
        button = page.locator(f'#legend button[data-status="{status}"]')
        if n:
            assert button.is_visible()
            assert f"{n:,}" in button.inner_text()
    assert "depot-siting-loose" in page.inner_text("#run-title")


def test_clicking_a_node_fills_the_panel_with_its_id_and_bound(page, server):
    open_run(page, server.url, DEPOT)
    # a node well inside the tree: node 5 (depth 2), drawn as a single mark at this zoom
    mark = mark_of(page, 5)
    assert mark is not None
    page.mouse.click(mark["x"], mark["y"])
    page.wait_for_selector('#node-panel[data-node="5"] .reason')
    panel = page.inner_text("#node-panel")
    assert "Node 5" in panel
    truth = httpx.get(f"{server.url}/api/runs/{DEPOT}/nodes/5").json()["node"]
    shown = page.inner_text('#node-panel [data-field="bound"]')
    assert math.isclose(float(shown.replace("\u2212", "-")), truth["bound"], rel_tol=1e-5)
    assert "PATH FROM THE ROOT" in panel.upper() and "BRANCHING DECISION" in panel.upper()
    assert "node=5" in page.evaluate("location.hash")
    # the path to the root is drawn over the tree: selection ring in the path colour
    assert colour_pixels(page, (27, 31, 36), 24) > 50


def test_both_layouts_render(page, server):
    open_run(page, server.url, KNAPSACK)
    depth_ink = inked_pixels(page)
    assert depth_ink > 2000
    page.click('[data-layout="bound"]')
    page.wait_for_function("() => window.undergrowth.inspector.tree.layout === 'bound'")
    page.wait_for_function("() => location.hash.includes('layout=bound')")
    page.wait_for_timeout(200)
    assert inked_pixels(page) > 2000
    # the incumbent line (dashed, Okabe-Ito bluish green) runs across the canvas
    assert colour_pixels(page, (0, 158, 115), 40) > 200
    page.keyboard.press("l")
    page.wait_for_function("() => window.undergrowth.inspector.tree.layout === 'depth'")
    assert inked_pixels(page) > 2000


def test_the_bounds_chart_has_primal_and_dual_traces(page, server):
    open_run(page, server.url, KNAPSACK)
    page.wait_for_function("() => { const d = document.querySelector('#bounds-chart'); return"
                           " d.data && d.querySelectorAll('.scatterlayer .trace').length >= 3; }")
    names = page.evaluate("document.querySelector('#bounds-chart').data.map(t => t.name)")
    assert "dual bound" in names and "primal bound (incumbent)" in names
    drawn = page.evaluate("""() => Array.from(document.querySelectorAll(
        '#bounds-chart .scatterlayer .trace path.js-line'))
        .map(p => (p.getAttribute('d') || '').length)""")
    assert sum(1 for d in drawn if d > 20) >= 2, drawn
    # x axis: seconds instead of nodes
    page.click('[data-axis="time"]')
    page.wait_for_function("() => document.querySelector('#bounds-chart').layout.xaxis.title.text"
                           ".startsWith('seconds')")
    assert "axis=time" in page.evaluate("location.hash")


def test_clicking_the_bounds_chart_selects_the_node_processed_then(page, server):
    open_run(page, server.url, KNAPSACK)
    page.wait_for_function("() => document.querySelector('#bounds-chart').data")
    page.wait_for_timeout(300)
    box = page.locator("#bounds-chart .nsewdrag").first.bounding_box()
    page.mouse.click(box["x"] + box["width"] * 0.5, box["y"] + box["height"] * 0.5)
    page.wait_for_selector("#node-panel[data-node] .reason")
    order = page.evaluate("window.undergrowth.inspector.store.order[window.undergrowth"
                          ".inspector.tree.selected]")
    assert 1000 < order < 2600  # about half way through the 3651 processed nodes


def test_pruning_breakdown_and_branching_table(page, server):
    open_run(page, server.url, KNAPSACK)
    page.keyboard.press("2")
    page.wait_for_function("() => document.querySelector('#status-chart').data &&"
                           " document.querySelector('#depth-chart').data")
    bars = page.evaluate("document.querySelector('#status-chart').data[0].x")
    assert sum(bars) == page.evaluate("window.undergrowth.inspector.store.n")
    stacked = page.evaluate("document.querySelector('#depth-chart').layout.barmode")
    assert stacked == "stack"
    page.keyboard.press("3")
    rows = page.locator("#branch-table tbody tr")
    rows.first.wait_for()
    assert rows.count() >= 5
    first_before = rows.first.inner_text()
    page.click('#branch-table th button:has-text("Variable")')
    assert page.get_attribute('#branch-table th:first-child', "aria-sort") == "ascending"
    assert rows.first.inner_text() != first_before
    rows.first.click()
    page.wait_for_selector("#node-panel[data-node]")
    assert "tab=branching" in page.evaluate("location.hash")


def test_find_filter_fold_and_keyboard(page, server):
    open_run(page, server.url, DEPOT)
    page.fill("#find-input", "69")
    page.press("#find-input", "Enter")
    page.wait_for_selector('#node-panel[data-node="69"]')
    page.fill("#find-input", "99999")
    page.press("#find-input", "Enter")
    assert "No node 99999" in page.inner_text("#find-message")
    # parent / root moves from the keyboard
    page.locator("#tree-canvas").focus()
    page.keyboard.press("p")
    page.wait_for_function("() => window.undergrowth.inspector.tree.selected >= 0 &&"
                           " window.undergrowth.inspector.store.id[window.undergrowth.inspector"
                           ".tree.selected] !== 69")
    page.keyboard.press("r")
    page.wait_for_selector('#node-panel[data-node="0"]')
    # hide pruned nodes: no pruned mark is drawn any more
    page.click('#legend button[data-status="pruned"]')
    assert page.get_attribute('#legend button[data-status="pruned"]', "aria-pressed") == "false"
    page.wait_for_timeout(100)
    statuses = page.evaluate("() => { const l = window.undergrowth.inspector.tree.list;"
                             " return Array.from(l.markStatus.subarray(0, l.markCount)); }")
    assert 2 not in statuses
    # depth filter
    page.fill("#depth-max", "3")
    page.wait_for_timeout(100)
    depths = page.evaluate("() => { const t = window.undergrowth.inspector.tree; const l = t.list;"
                           " return Array.from(l.markRow.subarray(0, l.markCount)).map(r =>"
                           " t.store.depth[r]); }")
    assert max(depths) <= 3
    page.fill("#depth-max", "")
    page.locator("#tree-canvas").focus()
    # fold the root's down subtree: one folded mark
    page.keyboard.press("d")
    page.keyboard.press("c")
    page.wait_for_timeout(100)
    kinds = page.evaluate("() => { const l = window.undergrowth.inspector.tree.list;"
                          " return Array.from(l.markKind.subarray(0, l.markCount)); }")
    assert kinds.count(2) == 1
    assert page.locator("#unfold-all").is_visible()
    # help overlay lists the shortcuts
    page.keyboard.press("?")
    assert page.locator("#help-overlay").is_visible()
    assert "Fit the whole tree" in page.inner_text("#help-keys")
    page.keyboard.press("Escape")
    assert not page.locator("#help-overlay").is_visible()


def test_the_url_holds_the_state(page, server):
    view = "-5,40,700,2100"  # bound layout: y in objective units
    open_run(page, server.url, DEPOT, f"&node=69&layout=bound&view={view}&tab=closed")
    page.wait_for_selector('#node-panel[data-node="69"]')
    inspector = "window.undergrowth.inspector"
    assert page.evaluate(f"{inspector}.tree.layout") == "bound"
    assert page.evaluate(f"{inspector}.tab") == "closed"
    shown = page.evaluate(f"[{inspector}.tree.view.x0, {inspector}.tree.view.x1]")
    assert shown == [-5, 40]
    assert page.locator("#panel-closed").is_visible()
    # zooming writes the view back into the URL
    page.mouse.move(400, 350)
    page.mouse.wheel(0, -400)
    page.wait_for_function(f"() => !location.hash.includes('view={view}')")
    assert re.search(r"view=[-\d.e]+,[-\d.e]+,[-\d.e]+,[-\d.e]+", page.evaluate("location.hash"))


def test_hover_card_describes_the_node_under_the_pointer(page, server):
    open_run(page, server.url, DEPOT)
    mark = mark_of(page, 2)
    page.mouse.move(mark["x"], mark["y"])
    page.wait_for_selector("#hover-card:not([hidden])")
    text = page.inner_text("#hover-card")
    assert "Node 2" in text and "bound" in text


def test_every_control_has_an_accessible_name(page, server):
    open_run(page, server.url, DEPOT)
    nameless = page.evaluate("""() => {
        const out = [];
        const controls = 'button, input, select, a[href], [role=tab], canvas';
        for (const el of document.querySelectorAll(controls)) {
          const labelled = el.getAttribute('aria-label') || (el.labels && el.labels.length) ||
            el.getAttribute('aria-labelledby') || (el.textContent || '').trim() ||
            el.getAttribute('title');
          if (!labelled) out.push(el.outerHTML.slice(0, 80));
        }
        return out;
    }""")
    assert nameless == []


def test_large_screen_layout(browser, server, console):
    context = browser.new_context(viewport={"width": 2400, "height": 1350})
    pg = context.new_page()
    pg.on("console", console.on_console)
    pg.on("pageerror", console.on_error)
    open_run(pg, server.url, KNAPSACK)
    size = pg.evaluate("[document.querySelector('#tree-canvas').clientWidth,"
                       " document.querySelector('#tree-canvas').clientHeight]")
    assert size[0] > 1700 and size[1] > 600
    assert inked_pixels(pg) > 5000
    context.close()
    assert console.unexpected() == []


def test_a_run_that_does_not_exist_says_so(page, server, console):
    console.allow(r"status of 404")
    page.goto(f"{server.url}/#run=no-such-run")
    page.wait_for_function("() => document.querySelector('#tree-status').textContent"
                           ".includes('cannot be opened')")
