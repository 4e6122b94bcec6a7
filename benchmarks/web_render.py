"""Web render benchmark: the inspector's tree and bounds chart in headless Chromium.

    python benchmarks/web_render.py                    # 10k, 100k and 1M nodes
    python benchmarks/web_render.py --sizes 10000 100000
    python benchmarks/web_render.py --dir /tmp/ugweb   # keep the generated runs

Synthetic runs (the seeded generator of benchmarks/runlog_scale.py, written
with the run-log writer) are served by the real app (`create_app` under
uvicorn on a free loopback port). For each size it prints:

- tree arrays: the server's response time for GET /api/runs/{id}/tree?format=bin
  with gzip (median of 3 after one warm-up request that builds the caches), and
  the bytes on the wire / uncompressed;
- first draw: from the page's tree request to the end of the first complete
  tree draw, in a new tab (warm server cache, warm browser cache; median of 3 tabs
  after one that fills the caches), and the page's own share of it (from the
  arrays' arrival: decoding, children lists, subtree counts, the first frame);
- redraw after zoom: median over 40 zoom steps (in and out about random
  points) of one full redraw, level-of-detail walk included, flushed to pixels.

Then the bounds chart: three curves of 1M points each (primal, dual, gap) handed
to the chart, time until plotly has drawn (median of 3).

Targets (this machine, software rendering): 1M nodes: arrays served <= 0.5 s,
first complete draw <= 1.5 s after the request, median redraw <= 50 ms; 100k
nodes: first draw <= 0.5 s; bounds chart with 1M points per curve <= 0.5 s.
"""

from __future__ import annotations

import argparse
import os
import shutil
import socket
import statistics
import sys
import tempfile
import threading
import time
from pathlib import Path

import httpx

sys.path.insert(0, str(Path(__file__).resolve().parent))
from runlog_scale import HEADER, synthetic_run  # noqa: E402

CHROMIUM = os.environ.get("UNDERGROWTH_CHROMIUM", "/usr/bin/chromium")
CHROMIUM_ARGS = ["--no-sandbox", "--disable-gpu", "--disable-background-networking",
                 "--disable-component-update", "--disable-sync", "--no-first-run"]
TARGETS = {  # size -> (arrays s, first draw s, redraw ms)
    1_000_000: (0.5, 1.5, 50.0),
    100_000: (None, 0.5, None),
}
CHART_TARGET_S = 0.5


def label(n: int) -> str:
    return f"{n // 1_000_000}m" if n % 1_000_000 == 0 else f"{n // 1000}k"


def write_run(directory: Path, nodes: int, seed: int = 7) -> str:
    from undergrowth.runlog.writer import RunLogWriter

    run_id = f"synthetic-{label(nodes)}"
    path = directory / f"{run_id}.jsonl"
    if not path.exists():
        tmp = directory / f".{run_id}.jsonl"
        with RunLogWriter(str(tmp), HEADER) as writer:
            for event in synthetic_run(nodes, seed):
                writer.write(event)
        os.replace(tmp, path)
    return run_id


def free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class Server:
    def __init__(self, runs: Path, work: Path) -> None:
        import uvicorn

        from undergrowth.api import ApiSettings, create_app

        self.port = free_port()
        settings = ApiSettings(samples_dir=None, runs_dir=runs, models_dir=work / "models",
                               cache_dir=work / "cache", port=self.port,
                               tree_json_nodes=0)
        config = uvicorn.Config(create_app(settings), host="127.0.0.1", port=self.port,
                                log_level="warning")
        self.server = uvicorn.Server(config)
        self.thread = threading.Thread(target=self.server.run, daemon=True)
        self.url = f"http://127.0.0.1:{self.port}"

    def __enter__(self) -> Server:
        self.thread.start()
        while not self.server.started:
            time.sleep(0.05)
        return self

    def __exit__(self, *exc: object) -> None:
        self.server.should_exit = True
        self.thread.join(timeout=30)


def time_arrays(url: str, run_id: str) -> tuple[float, int, int]:
    """Median seconds to receive the whole gzip body; bytes on the wire and unpacked."""
    target = f"{url}/api/runs/{run_id}/tree?format=bin"
    headers = {"Accept-Encoding": "gzip"}
    with httpx.Client(timeout=600) as client:
        unpacked = len(client.get(target, headers=headers).content)  # warm-up: builds caches
        times, wire = [], 0
        for _ in range(3):
            t = time.perf_counter()
            with client.stream("GET", target, headers=headers) as response:
                wire = sum(len(chunk) for chunk in response.iter_raw())
            times.append(time.perf_counter() - t)
    return statistics.median(times), wire, unpacked


FIRST_DRAW = """() => { const i = window.undergrowth && window.undergrowth.inspector;
  return i && i.timings.firstDraw > 0 && i.tree.list.markCount > 0; }"""

ZOOM_REDRAWS = """(steps) => {
  const t = window.undergrowth.inspector.tree;
  const w = t.renderer.width, h = t.renderer.height;
  const ctx = t.renderer.ctx;
  let seed = 12345;
  const rand = () => (seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648;
  const times = [];
  for (let k = 0; k < steps; k++) {
    const f = k < steps / 2 ? 1.6 : 1 / 1.6;
    t.zoom(f, 1, rand() * w, rand() * h);
    const t0 = performance.now();
    t.paint();
    ctx.getImageData(0, 0, 1, 1); // wait for the pixels
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return { median: times[Math.floor(times.length / 2)], max: times[times.length - 1],
           marks: t.list.markCount, visited: t.list.visited };
}"""

CHART_MILLION = """async (n) => {
  const { BoundSeries, Curve } = await import('/js/series.js');
  const chart = window.undergrowth.inspector.bounds;
  await window.undergrowth.inspector.plotly;
  const x = new Float64Array(n), p = new Float64Array(n), d = new Float64Array(n),
    g = new Float64Array(n);
  let dual = 100, primal = 200;
  for (let i = 0; i < n; i++) {
    x[i] = i + 1;
    dual += Math.random() * 1e-4;
    if (i % 50000 === 0) primal -= Math.random();
    d[i] = dual + Math.sin(i / 3000);
    p[i] = primal;
    g[i] = Math.abs(primal - d[i]) / Math.max(Math.abs(primal), Math.abs(d[i]));
  }
  const times = [];
  for (let k = 0; k < 3; k++) {
    const s = new BoundSeries();
    const axis = s.axes.nodes;
    axis.primal = Curve.wrap(x, p); axis.dual = Curve.wrap(x, d); axis.gap = Curve.wrap(x, g);
    axis.loaded = true;
    chart.range = null;
    const t0 = performance.now();
    chart.setSeries(s, 'nodes', 'min');
    await chart.render();
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  return { median: times[1], points: chart.lastPoints };
}"""


def browser_figures(url: str, run_id: str, pw: object) -> dict[str, float]:
    browser = pw.chromium.launch(executable_path=CHROMIUM, args=CHROMIUM_ARGS)
    try:
        # One browser profile, as a user has: the first tab fills its cache (plotly.js is
        # sent with max-age), the next three are timed.
        context = browser.new_context(viewport={"width": 1280, "height": 800})
        firsts, clients = [], []
        redraw = None
        for k in range(4):
            page = context.new_page()
            page.goto(f"{url}/#run={run_id}")
            page.wait_for_function(FIRST_DRAW, timeout=300_000)
            page.wait_for_function("() => window.undergrowth.inspector.timings.plotlyLoaded > 0",
                                   timeout=300_000)
            t = page.evaluate("window.undergrowth.inspector.timings")
            if k:
                firsts.append((t["firstDraw"] - t["treeRequest"]) / 1000)
                clients.append((t["firstDraw"] - t["treeArrived"]) / 1000)
            if k == 3:
                redraw = page.evaluate(ZOOM_REDRAWS, 40)
            page.close()
        return {"first": statistics.median(firsts), "client": statistics.median(clients),
                "redraw": redraw["median"],
                "redraw_max": redraw["max"], "marks": redraw["marks"]}
    finally:
        browser.close()


def chart_figures(url: str, run_id: str, pw: object, points: int) -> dict[str, float]:
    browser = pw.chromium.launch(executable_path=CHROMIUM, args=CHROMIUM_ARGS)
    try:
        page = browser.new_page(viewport={"width": 1280, "height": 800})
        page.goto(f"{url}/#run={run_id}")
        page.wait_for_function(FIRST_DRAW, timeout=300_000)
        return page.evaluate(CHART_MILLION, points)
    finally:
        browser.close()


def verdict(value: float, target: float | None) -> str:
    if target is None:
        return ""
    return " ok" if value <= target else " OVER"


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--sizes", type=int, nargs="+", default=[10_000, 100_000, 1_000_000])
    parser.add_argument("--chart-points", type=int, default=1_000_000)
    parser.add_argument("--dir", help="keep the generated runs here (default: a temp dir)")
    args = parser.parse_args(argv)
    if not (Path(CHROMIUM).is_file() or shutil.which(CHROMIUM)):
        print(f"web_render: no Chromium at {CHROMIUM} (set UNDERGROWTH_CHROMIUM)", file=sys.stderr)
        return 2
    from playwright.sync_api import sync_playwright

    work = Path(args.dir or tempfile.mkdtemp(prefix="undergrowth-web-"))
    runs = work / "runs"
    runs.mkdir(parents=True, exist_ok=True)
    ids = {}
    for n in args.sizes:
        t = time.perf_counter()
        ids[n] = write_run(runs, n)
        print(f"run {ids[n]}: ready in {time.perf_counter() - t:.1f} s", file=sys.stderr)

    rows = []
    with Server(runs, work) as server, sync_playwright() as pw:
        for n in args.sizes:
            served, wire, unpacked = time_arrays(server.url, ids[n])
            figures = browser_figures(server.url, ids[n], pw)
            rows.append((n, served, wire, unpacked, figures))
            print(f"measured {ids[n]}", file=sys.stderr)
        chart = chart_figures(server.url, ids[args.sizes[0]], pw, args.chart_points)

    print(f"web render benchmark (headless Chromium, 1280x800, software rendering); runs in {work}")
    head = ("nodes", "arrays s", "wire MB", "raw MB", "first draw s", "of it page s",
            "redraw ms", "marks")
    print(f"{head[0]:>10}" + "".join(f"{h:>14}" for h in head[1:]))
    for n, served, wire, unpacked, f in rows:
        target = TARGETS.get(n, (None, None, None))
        cells = [f"{served:.3f}{verdict(served, target[0])}", f"{wire / 1e6:.1f}",
                 f"{unpacked / 1e6:.1f}", f"{f['first']:.3f}{verdict(f['first'], target[1])}",
                 f"{f['client']:.3f}", f"{f['redraw']:.1f}{verdict(f['redraw'], target[2])}",
                 f"{f['marks']:,}"]
        print(f"{n:>10,}" + "".join(f"{c:>14}" for c in cells))
    seconds = chart["median"] / 1000
    print(f"bounds chart, {args.chart_points:,} points per curve x 3 curves: drawn in "
          f"{seconds:.3f} s{verdict(seconds, CHART_TARGET_S)} ({chart['points']:,} points "
          "reach plotly after the min/max reduction)")
    print("targets: 1M arrays <= 0.5 s, 1M first draw <= 1.5 s, 1M redraw <= 50 ms, "
          "100k first draw <= 0.5 s, chart <= 0.5 s")
    return 0


if __name__ == "__main__":
    sys.exit(main())
