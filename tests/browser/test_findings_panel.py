"""The findings panel and the live forecast in headless Chromium.

The numbers on the page are checked against GET /api/runs/{id}/findings; the
tightest big-M values themselves are checked by hand in tests/test_findings.py.
"""

from __future__ import annotations

import httpx
from browser_support import DEPOT, open_run, start_endless_solve

TIGHT = "depot-siting-tight.most-fractional.best-bound"


def findings_of(server, run: str) -> dict:
    return httpx.get(f"{server.url}/api/runs/{run}/findings", timeout=60).json()


def shown_codes(page) -> list[str]:
    return page.eval_on_selector_all("#findings-panel li.finding",
                                     "els => els.map(e => e.dataset.code)")


def open_findings(page, server, run: str) -> None:
    open_run(page, server.url, run)
    page.click("#tab-findings")
    page.wait_for_selector('#findings-panel .findings-main, #findings-panel .findings-empty')


def test_the_loose_depot_model_shows_weak_root_and_loose_big_m_with_the_api_numbers(page, server):
    body = findings_of(server, DEPOT)
    by_code = {f["code"]: f for f in body["findings"]}
    assert {"weak-root", "loose-big-m"} <= set(by_code)
    open_findings(page, server, DEPOT)
    codes = shown_codes(page)
    assert codes == [f["code"] for f in body["findings"]]  # same order: most severe first
    assert page.inner_text("#findings-count") == f"({len(body['findings'])})"

    weak = page.locator('li.finding[data-code="weak-root"]')
    assert by_code["weak-root"]["title"] in weak.inner_text()
    root_gap = 100 * by_code["weak-root"]["evidence"]["root_gap"]  # 64.7% for this run
    assert f"{root_gap:.3g}%" in weak.inner_text()

    big_m = by_code["loose-big-m"]
    card = page.locator('li.finding[data-code="loose-big-m"]')
    assert big_m["title"] in card.inner_text()
    first_row = big_m["refs"]["rows"][0]
    detail = next(d for d in big_m["details"] if d["row"] == first_row)
    card.locator(f'button.ref-chip.rows[data-ref="{first_row}"]').click()
    shown = card.locator(".row-detail").inner_text()
    assert first_row in shown and detail["variable"] in shown
    assert f"tightest valid value is {detail['tightest']:g}" in shown
    assert f"coefficient {detail['coefficient']:g}" in shown.replace("\u2212", "-")


def test_a_node_chip_selects_that_node_in_the_tree(page, server):
    body = findings_of(server, DEPOT)
    with_node = next(f for f in body["findings"] if f["refs"]["nodes"])
    node = with_node["refs"]["nodes"][0]
    open_findings(page, server, DEPOT)
    card = page.locator(f'li.finding[data-code="{with_node["code"]}"]')
    if not card.locator("details").evaluate("d => d.open"):
        card.locator("summary").click()
    card.locator(f'button.ref-chip.nodes[data-ref="{node}"]').click()
    page.wait_for_function(f"() => location.hash.includes('node={node}')")
    selected = page.evaluate("(() => { const i = window.undergrowth.inspector;"
                             " return i.store.id[i.tree.selected]; })()")
    assert selected == node
    page.wait_for_selector(f'#node-panel[data-node="{node}"]')
    assert f"Node {node} selected in the tree." in page.inner_text("#findings-panel")


def test_the_tight_depot_model_shows_neither_finding(page, server):
    codes = {f["code"] for f in findings_of(server, TIGHT)["findings"]}
    assert not codes & {"weak-root", "loose-big-m"}
    open_findings(page, server, TIGHT)
    shown = shown_codes(page)
    assert "weak-root" not in shown and "loose-big-m" not in shown
    assert set(shown) == codes


def test_the_forecast_is_shown_live_and_updates_while_a_solve_runs(page, server):
    start_endless_solve(page, server, "parity-forecast", "depth-first")
    page.wait_for_selector("#live-forecast:not([hidden])", timeout=60_000)
    page.wait_for_function("() => /remaining|left|nodes/i.test("
                           "document.querySelector('#live-forecast').textContent)", timeout=60_000)
    first = page.evaluate("window.undergrowth.inspector.findings.updates")
    page.wait_for_function(f"() => window.undergrowth.inspector.findings.updates > {first}",
                           timeout=60_000)
    text = page.inner_text("#live-forecast")
    run_id = page.evaluate("window.undergrowth.inspector.runId")
    forecast = findings_of(server, run_id)["forecast"]
    assert forecast is not None and not forecast["finished"]
    assert any(ch.isdigit() for ch in text)
    page.click("#live-cancel")
    page.wait_for_selector('#live-bar[data-state="ended"]', timeout=60_000)
