"""The self-contained review report: `undergrowth report`, its pictures, `GET /api/report`."""

from __future__ import annotations

import gzip
import re
import shutil
from pathlib import Path

import numpy as np
import pytest

from test_api_support import DEPOT, KNAPSACK, assert_error_shape, client_for, sample_dir
from undergrowth.analysis.compare import best_marks, rows_for_tables
from undergrowth.analysis.findings import diagnose
from undergrowth.analysis.layout import tidy_layout
from undergrowth.analysis.table import RunTable
from undergrowth.cli import main
from undergrowth.model import read_model
from undergrowth.report.bounds_svg import nice_ticks
from undergrowth.report.page import format_gap, format_value
from undergrowth.report.palette import STATUS_STYLE
from undergrowth.report.tree_svg import draw_tree
from undergrowth.runlog import notes
from undergrowth.runlog.codes import STATUSES

ROOT = Path(__file__).resolve().parent.parent
RELIABLE = "project-selection.reliability.hybrid"  # 2685 nodes (sample_runs/README.md)
# Anything that would make the page load something: an attribute naming a URL or a CSS url().
EXTERNAL = re.compile(r"""(?:src|href|xlink:href|action|poster|data)\s*=\s*["']?\s*(?!#)"""
                      r"""[a-z][a-z0-9+.-]*:|url\(\s*["']?(?!#)|@import""", re.I)


def _copy_run(run_id: str, into: Path, *, model: bool = True) -> Path:
    """A sample run (and its model, in models/ beside it) copied where notes may be written."""
    src = sample_dir() / f"{run_id}.jsonl.gz"
    dst = into / src.name
    shutil.copyfile(src, dst)
    if model:
        name = RunTable.open(dst, use_cache=False).header["model"]["name"]
        (into / "models").mkdir(exist_ok=True)
        shutil.copyfile(sample_dir() / "models" / f"{name}.mps", into / "models" / f"{name}.mps")
    return dst


def _report(tmp: Path, *runs: Path, extra: tuple[str, ...] = ()) -> str:
    out = tmp / "report.html"
    assert main(["report", *map(str, runs), "-o", str(out), *extra]) == 0
    return out.read_text(encoding="utf-8")


def _field(html: str, name: str, section: int = 1) -> str:
    """The text of a summary figure (``data-field``) of the given run section."""
    part = html.split(f'id="run-{section}"', 1)[1]
    return re.search(rf'data-field="{name}">([^<]*)<', part).group(1)


# ------------------------------------------------------------------ CLI, one run
@pytest.fixture(scope="module")
def depot_report(tmp_path_factory):
    d = tmp_path_factory.mktemp("depot")
    run = _copy_run(DEPOT, d)
    return run, _report(d, run)


def test_one_run_shows_its_figures_findings_and_pictures(depot_report):
    run, html = depot_report
    table = RunTable.open(run)
    end = table.end
    # node count and objective as the run's end event records them (sample_runs/README.md:
    # 111 nodes, optimum 2030)
    assert end["nodes"] == 111 and end["objective"] == 2030
    assert _field(html, "nodes") == "111"
    assert _field(html, "objective") == "2030"
    assert _field(html, "tree-nodes") == f"{len(table):,}"
    assert _field(html, "status") == "optimal"
    # findings: the same codes `diagnose` gives with the model beside the run, in order
    problem = read_model(str(run.parent / "models" / "depot-siting-loose.mps"))
    codes = [f.code for f in diagnose(table, problem)]
    assert codes[:2] == ["weak-root", "loose-big-m"]  # as in tests/test_cli_diagnose.py
    assert re.findall(r'<article class="finding[^"]*" data-code="([^"]+)"', html) == codes
    assert "found beside the run" in html
    # the loose big-M table lists the tightest valid coefficient, 24 (by hand: test_findings)
    assert re.search(r"<td>24</td>", html)
    # pictures: a tree and a bounds chart, each a non-empty inline SVG
    assert html.count('<svg class="tree-picture"') == 1
    assert html.count('<svg class="bounds-chart"') == 1
    # one star per incumbent on the chart, one ring per incumbent node on the tree
    assert html.count('class="star"') == len(table.incumbents) == 2
    assert html.count('class="incumbent-ring"') == 2
    # a finished run gets the back-test at 10, 25 and 50% of its nodes
    assert re.search(r'<table class="plain backtest"', html)
    for share in ("10%", "25%", "50%"):
        assert f"<td>{share} (" in html


def test_every_node_of_a_small_tree_is_drawn_in_its_status_colour(depot_report):
    run, html = depot_report
    table = RunTable.open(run)
    tree = re.search(r'<svg class="tree-picture".*?</svg>', html, re.S).group(0)
    counts = table.count_by_status()
    for code, status in enumerate(STATUSES):
        group = re.search(rf'<path class="marks" data-status="{status}" [^>]*?'
                          rf'(?:fill|stroke)="(#[0-9A-Fa-f]{{6}})"[^>]*><title>{status}: '
                          rf'([\d,]+) drawn', tree)
        if counts[status]:
            # 149 nodes over 75 leaves: every leaf has 14 px (by hand), nothing is collapsed
            assert group is not None, status
            assert group.group(1) == STATUS_STYLE[code].colour
            assert int(group.group(2).replace(",", "")) == counts[status]
        else:
            assert group is None
    assert 'class="bars"' not in tree


def test_the_page_refers_to_nothing_outside_itself(depot_report):
    _, html = depot_report
    assert EXTERNAL.search(html) is None, EXTERNAL.search(html).group(0)
    assert not re.search(r"https?://", html)
    assert "<script" not in html  # readable as it stands: nothing to run
    hrefs = re.findall(r'href="([^"]*)"', html)
    assert hrefs and all(h.startswith("#") for h in hrefs)
    ids = set(re.findall(r'id="([^"]+)"', html))
    assert {h[1:] for h in hrefs} <= ids  # every in-page link has its target
    assert "@media print" in html


def test_notes_are_listed_and_marked_on_their_nodes(tmp_path):
    run = _copy_run(DEPOT, tmp_path)
    # through the real sidecar beside the run (runlog.notes), as a reviewer leaves them
    notes.add_note(run, node=5, text="Here the bound <stalls> & the rule\nkeeps diving.",
                   author="Ines")
    notes.add_note(run, order=0, text="Tighten the depot rows first.", author="Tom")
    html = _report(tmp_path, run)
    items = re.findall(r'<li class="note" id="run-1-note-(\d)">(.*?)</li>', html, re.S)
    assert [k for k, _ in items] == ["1", "2"]
    # the sidecar keeps what the note names: a node here, a step (order 0) below
    assert "node 5 \u00b7 Ines" in items[0][1]
    assert "step 1 \u00b7 Tom" in items[1][1]
    assert "Here the bound &lt;stalls&gt; &amp; the rule\nkeeps diving." in items[0][1]
    assert "Tom" in items[1][1] and "Tighten the depot rows first." in items[1][1]
    # each note is a numbered flag on its node in the tree picture (the second is the root's)
    tree = re.search(r'<svg class="tree-picture".*?</svg>', html, re.S).group(0)
    flags = re.findall(r'<g class="note-mark"><title>note (\d) on node (\d+):', tree)
    assert flags == [("1", "5"), ("2", "0")]


def test_the_api_report_has_the_notes_this_server_keeps_for_a_sample(tmp_path):
    # a sample's folder is never written: its notes live on the server's shelf
    with client_for(tmp_path) as c:
        assert c.post(f"/api/runs/{DEPOT}/notes",
                      json={"node": 5, "text": "kept on the shelf"}).status_code == 201
        html = c.get(f"/api/report?run={DEPOT}").text
    assert "kept on the shelf" in html


# ------------------------------------------------------------------ CLI, two runs
def test_two_runs_get_a_comparison_table_with_both_rows(tmp_path):
    a = _copy_run(KNAPSACK, tmp_path)
    b = _copy_run(RELIABLE, tmp_path)
    html = _report(tmp_path, a, b)
    tables = [RunTable.open(a), RunTable.open(b)]
    rows = re.findall(r'<tr data-run="([^"]+)">(.*?)</tr>', html, re.S)
    assert [r[0] for r in rows] == [a.name, b.name]
    # node counts from sample_runs/README.md: 3651 (most-fractional), 2685 (reliability)
    nodes = [re.search(r'data-col="nodes">(?:<strong>)?([\d,]+)', r[1]).group(1) for r in rows]
    assert nodes == ["3,651", "2,685"]
    # the best marks are compare.best_marks' (both runs finished: fewer nodes is best)
    marks = best_marks(rows_for_tables(tables))
    for (_, cells), mark in zip(rows, marks, strict=True):
        for col, best in mark.items():
            cell = re.search(rf'<td class="num( best)?" data-col="{col}">', cells)
            assert bool(cell.group(1)) == best, col
    assert 'class="num best" data-col="nodes"' in rows[1][1]
    assert 'class="num best" data-col="nodes"' not in rows[0][1]
    # each run keeps its own section, linked from the table and the contents
    assert html.count('<section class="run"') == 2
    assert '<a href="#run-2">2</a>' in html and 'href="#comparison"' in html
    assert _field(html, "nodes", 2) == "2,685"


def test_a_single_run_has_no_comparison(depot_report):
    assert 'id="comparison"' not in depot_report[1]


# ------------------------------------------------------------------ CLI errors
def test_a_bad_run_log_names_the_file_and_line(tmp_path, capsys):
    with gzip.open(sample_dir() / f"{DEPOT}.jsonl.gz", "rt") as f:
        good = f.read().splitlines()
    bad = tmp_path / "broken.jsonl"
    bad.write_text("\n".join([good[0], '{"kind": "node", "id": "seven"}', *good[2:]]) + "\n")
    out = tmp_path / "r.html"
    assert main(["report", str(bad), "-o", str(out)]) == 2
    err = capsys.readouterr().err
    assert err.startswith("undergrowth report: ")
    assert str(bad) in err and "line 2" in err
    assert not out.exists()


def test_a_missing_run_or_a_foreign_model_is_refused(tmp_path, capsys):
    assert main(["report", str(tmp_path / "nothing.jsonl"), "-o", str(tmp_path / "r.html")]) == 2
    assert "nothing.jsonl" in capsys.readouterr().err
    run = _copy_run(DEPOT, tmp_path, model=False)
    other = sample_dir() / "models" / "project-selection.mps"
    assert main(["report", str(run), "-o", str(tmp_path / "r.html"), "--model", str(other)]) == 2
    err = capsys.readouterr().err
    assert str(other) in err and "not their model" in err


def test_an_explicit_model_and_a_title(tmp_path):
    run = _copy_run(DEPOT, tmp_path, model=False)
    model = sample_dir() / "models" / "depot-siting-loose.mps"
    html = _report(tmp_path, run, extra=("--model", str(model), "--title", "Depot <review>"))
    assert "<title>Depot &lt;review&gt;</title>" in html
    assert f"model checks from {model}" in html
    assert 'data-code="loose-big-m"' in html
    # without any model the model checks are skipped, and the page says so
    html = _report(tmp_path, run)
    assert 'data-code="loose-big-m"' not in html and "model checks skipped" in html


def test_a_torn_run_is_reported_with_its_warnings_and_a_forecast(tmp_path):
    # a crashed search: the log stops mid-line, with no end event
    with gzip.open(sample_dir() / f"{KNAPSACK}.jsonl.gz", "rt") as f:
        lines = f.read().splitlines()
    half = len(lines) // 2
    torn = tmp_path / "torn.jsonl"
    torn.write_text("\n".join(lines[:half]) + "\n" + lines[half][:25])
    html = _report(tmp_path, torn)
    assert '<div class="warning" role="note">' in html
    assert f"line {half + 1} is cut off" in html and "no end event" in html
    assert _field(html, "status") == "unfinished"
    table = RunTable.open(torn)
    assert _field(html, "nodes") == f"{int((table.order >= 0).sum()):,}"
    # unfinished: a forecast of what is left, no back-test (the true size is unknown)
    assert "Tree size: forecast</h3>" in html and "backtest" not in html
    assert re.search(r"<td>backtrack</td>", html)


# ------------------------------------------------------------------ pictures
def _random_tree(n_target: int, seed: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """A seeded random binary tree of about ``n_target`` nodes in creation order (parents
    first, as in a run table): each step branches a random waiting node."""
    rng = np.random.default_rng(seed)
    parent, depth = [-1], [0]
    waiting = [0]
    branched = set()
    while len(parent) + 2 <= n_target and waiting:
        k = int(rng.integers(len(waiting)))
        node = waiting[k]
        waiting[k] = waiting[-1]
        waiting.pop()
        branched.add(node)
        for _ in range(2):
            parent.append(node)
            depth.append(depth[node] + 1)
            waiting.append(len(parent) - 1)
    status = np.where(np.isin(np.arange(len(parent)), list(branched)), 0,
                      rng.choice([1, 2, 3, 4], size=len(parent), p=[0.05, 0.6, 0.15, 0.2]))
    return np.array(parent), np.array(depth), status


def test_level_of_detail_keeps_a_100k_node_tree_small():
    parent, depth, status = _random_tree(100_000, seed=3)
    layout = tidy_layout(parent, depth)
    pic = draw_tree(parent, depth, status, layout)
    assert pic.nodes == len(parent) >= 99_999
    # every node is accounted for: drawn alone, a bar standing for its subtree, or inside one
    assert pic.hidden > 50_000 and pic.bars > 0
    assert pic.marks + pic.bars <= pic.nodes - pic.hidden
    # our own budget (docs/report.md): the picture's size follows its area, not the tree
    assert len(pic.svg.encode()) < 600_000


def test_a_chain_and_a_single_node_are_drawn():
    # a dive with one child per level (one leaf: the layout has zero width)
    pic = draw_tree(np.array([-1, 0, 1, 2]), np.array([0, 1, 2, 3]), np.array([0, 0, 0, 2]),
                    tidy_layout(np.array([-1, 0, 1, 2]), np.array([0, 1, 2, 3])))
    assert pic.marks == 4 and pic.bars == 0 and pic.edges == 3
    one = draw_tree(np.array([-1]), np.array([0]), np.array([1]),
                    tidy_layout(np.array([-1]), np.array([0])))
    assert one.marks == 1 and one.edges == 0


def test_chart_ticks_are_round_and_nodes_whole():
    # by hand: steps of 1, 2 or 5 times a power of ten
    assert nice_ticks(0, 111, 8, min_step=1) == [0, 20, 40, 60, 80, 100]
    assert nice_ticks(0, 3, 8, min_step=1) == [0, 1, 2, 3]  # never 0.5 of a node
    assert nice_ticks(34130.2, 34650.0, 6) == [34200, 34400, 34600]  # 104 per tick -> 200
    assert nice_ticks(-0.3, 0.3, 4) == pytest.approx([-0.2, 0.0, 0.2])


def test_palette_matches_the_web_legend():
    text = (ROOT / "web" / "js" / "statuses.js").read_text(encoding="utf-8")
    web = re.findall(r"\{ colour: '(#[0-9A-Fa-f]{6})', shape: '([a-z-]+)', label: '([a-z]+)'",
                     text)
    assert [label for _, _, label in web] == list(STATUSES)
    assert [(c, s) for c, s, _ in web] == [(st.colour, st.shape) for st in STATUS_STYLE]


def test_numbers_are_formatted_as_on_the_web_page():
    # the same rules as web/js/format.js formatValue / formatGap (by hand)
    assert format_value(716.68) == "716.68"
    assert format_value(1234567.891) == "1234568"  # whole numbers keep every digit
    assert format_value(-2.5) == "\u22122.5"
    assert format_value(1.234e-5) == "1.234e\u22125"
    assert format_value(None) == "\u2014"
    assert format_gap(0.6468) == "64.7%" and format_gap(0.0263) == "2.63%"
    assert format_gap(0.0) == "0%" and format_gap(0.00005) == "<0.01%"


# ------------------------------------------------------------------ API
@pytest.fixture(scope="module")
def client(tmp_path_factory):
    with client_for(tmp_path_factory.mktemp("report-api")) as c:
        yield c


def test_the_api_sends_the_same_page_as_a_download(client, tmp_path):
    response = client.get(f"/api/report?run={DEPOT}")
    assert response.status_code == 200
    assert response.headers["content-type"].startswith("text/html")
    assert response.headers["content-disposition"] == (
        f'attachment; filename="report-{DEPOT}.html"')
    page = response.text
    cli = _report(tmp_path, sample_dir() / f"{DEPOT}.jsonl.gz")
    # same structure: the same figures, findings, sections and pictures' shapes
    for name in ("nodes", "tree-nodes", "objective", "dual", "gap", "status", "lp-iterations"):
        assert _field(page, name) == _field(cli, name), name
    code = r'data-code="([^"]+)"'
    assert re.findall(code, page) == re.findall(code, cli)
    assert re.findall(r'<h3 id="([^"]+)"', page) == re.findall(r'<h3 id="([^"]+)"', cli)
    tree = r'<svg class="tree-picture".*?</svg>'
    assert re.search(tree, page, re.S).group(0) == re.search(tree, cli, re.S).group(0)
    assert EXTERNAL.search(page) is None


def test_the_api_report_of_two_runs_compares_them(client):
    response = client.get(f"/api/report?run={KNAPSACK}&run={RELIABLE}&run={KNAPSACK}")
    assert response.status_code == 200
    assert response.headers["content-disposition"] == (
        f'attachment; filename="report-{KNAPSACK}-and-1-more.html"')
    rows = re.findall(r'<tr data-run="([^"]+)">', response.text)
    assert rows == [KNAPSACK, RELIABLE]  # the repeated id is shown once


def test_api_report_errors_have_the_one_shape(client):
    assert_error_shape(client.get("/api/report?run=missing"), 404, "not-found")
    assert_error_shape(client.get("/api/report"), 422, "invalid-request")
    assert_error_shape(client.get("/api/report?run=..x"), 400, "invalid-id")
    many = "&".join(f"run=r{i}" for i in range(13))
    err = assert_error_shape(client.get(f"/api/report?{many}"), 400, "too-many-runs")
    assert "at most 12" in err["message"]
