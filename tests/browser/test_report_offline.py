"""The review report in headless Chromium: opened from a file with the network off, and
downloaded from the inspector's export button."""

from __future__ import annotations

import re
import shutil
from pathlib import Path

from browser_support import DEPOT, KNAPSACK, open_run
from conftest import VIEWPORT, ConsoleWatch

from undergrowth.cli import main
from undergrowth.paths import SAMPLE_RUNS


def _write(tmp: Path, *run_ids: str) -> Path:
    """`undergrowth report` on copies of sample runs (their models beside them)."""
    (tmp / "models").mkdir(exist_ok=True)
    for model in (SAMPLE_RUNS / "models").iterdir():
        shutil.copyfile(model, tmp / "models" / model.name)
    runs = []
    for run_id in run_ids:
        runs.append(tmp / f"{run_id}.jsonl.gz")
        shutil.copyfile(SAMPLE_RUNS / f"{run_id}.jsonl.gz", runs[-1])
    out = tmp / "report.html"
    assert main(["report", *map(str, runs), "-o", str(out)]) == 0
    return out


def _open_offline(browser, path: Path, console: ConsoleWatch):
    """A page in a context with the network off; every request that is not for the file
    itself is aborted and recorded."""
    context = browser.new_context(viewport=VIEWPORT, offline=True)
    outside: list[str] = []

    def guard(route) -> None:
        url = route.request.url
        if url.startswith("file://"):
            route.continue_()
        else:
            outside.append(url)
            route.abort()

    context.route("**/*", guard)
    page = context.new_page()
    page.on("console", console.on_console)
    page.on("pageerror", console.on_error)
    page.on("request", lambda r: None if r.url.startswith("file://") else outside.append(r.url))
    page.goto(path.as_uri())
    page.wait_for_load_state("load")
    return context, page, outside


def _box(page, selector: str) -> dict[str, float]:
    return page.evaluate("(s) => { const b = document.querySelector(s).getBoundingClientRect();"
                         " return {w: b.width, h: b.height}; }", selector)


def test_the_report_opens_offline_with_its_pictures(browser, tmp_path):
    report = _write(tmp_path, KNAPSACK, "project-selection.reliability.hybrid")
    console = ConsoleWatch()
    context, page, outside = _open_offline(browser, report, console)
    try:
        assert outside == []  # not a single request left the file
        assert console.errors == []
        assert page.title() == "Search review: project-selection"
        # two runs: the comparison table has both, then one section each
        assert page.locator("table.compare tbody tr").count() == 2
        assert page.locator("section.run").count() == 2
        # the tree pictures: drawn, wide, with marks (3651 and 2685 nodes, sample_runs/README)
        for k in (1, 2):
            tree = f"#run-{k} svg.tree-picture"
            box = _box(page, tree)
            assert box["w"] > 1000 and box["h"] > 200
            drawn = page.evaluate(
                "(s) => Array.from(document.querySelectorAll(s + ' path.marks'))"
                ".reduce((n, p) => n + p.getBBox().width * p.getBBox().height, 0)", tree)
            assert drawn > 10_000  # the marks cover a real area, not a blank picture
            assert page.locator(f"{tree} circle.incumbent-ring").count() >= 1
            # the bounds chart: both lines span most of its width
            chart = f"#run-{k} svg.bounds-chart"
            for line in ("primal", "dual"):
                width = page.evaluate("(s) => document.querySelector(s).getBBox().width",
                                      f"{chart} path.line.{line}")
                assert width > 900, (k, line)
        assert "3,651" in page.inner_text("#run-1 [data-field=nodes]")
        page.screenshot(path=str(tmp_path / "report.png"), full_page=True)
    finally:
        context.close()


def test_the_export_button_downloads_the_same_report(page, server, tmp_path):
    open_run(page, server.url, DEPOT)
    button = page.locator("#export-report")
    assert button.is_enabled() and button.inner_text() == "Export report"
    with page.expect_download() as info:
        button.click()
    download = info.value
    assert download.suggested_filename == f"report-{DEPOT}.html"
    got = tmp_path / "exported.html"
    download.save_as(got)
    page.wait_for_function("() => document.querySelector('#export-status').textContent"
                           ".startsWith('Report saved')")
    exported = got.read_text(encoding="utf-8")
    (tmp_path / "cli").mkdir()
    written = _write(tmp_path / "cli", DEPOT).read_text(encoding="utf-8")
    # equal in structure: the same sections, figures, findings and pictures
    for pattern in (r'<h3 id="([^"]+)"', r'data-field="([^"]+)">([^<]*)<',
                    r'data-code="([^"]+)"', r'<(svg|path|circle) class="([^"]+)"'):
        assert re.findall(pattern, exported) == re.findall(pattern, written), pattern
    tree = r'<svg class="tree-picture".*?</svg>'
    assert re.search(tree, exported, re.S).group(0) == re.search(tree, written, re.S).group(0)


def test_a_refused_export_says_why_beside_the_button(page, server, console):
    console.allow(r"Failed to load resource")  # the 422 below, as Chromium logs it
    open_run(page, server.url, DEPOT)
    body = ('{"error": {"code": "unreadable-run", "message": "run \'x\' cannot be read: '
            'line 7: bad", "detail": {}}}')
    page.route("**/api/report?*", lambda route: route.fulfill(
        status=422, content_type="application/json", body=body))
    page.click("#export-report")
    status = page.locator("#export-status")
    page.wait_for_function("() => document.querySelector('#export-status').textContent"
                           ".startsWith('No report')")
    assert "cannot be read: line 7" in status.inner_text()
    assert "error" in (status.get_attribute("class") or "")
    assert page.locator("#export-report").is_enabled()  # it can be tried again
