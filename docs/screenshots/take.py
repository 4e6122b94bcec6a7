"""Retake the screenshots in this folder from a running inspector.

    undergrowth serve --port 8765 &            # the bundled sample runs
    python docs/screenshots/take.py [--url http://127.0.0.1:8765]

Uses Debian's chromium through Playwright's Python package (never its own
browser download), at the viewport the docs were written for. Look at the
pictures after taking them: this script only checks that the page logged no
errors. The walkthrough picture is taken only when asked for (--only), since it
should show notes the server holds for the run; none are added here.
"""

from __future__ import annotations

import argparse
from pathlib import Path

from playwright.sync_api import sync_playwright

HERE = Path(__file__).resolve().parent
DEPOT = "depot-siting-loose.most-fractional.best-bound"
COMPARE = "project-selection.most-fractional.best-bound,project-selection.reliability.hybrid"

# (file, hash or path, what to click after loading, wait in ms)
SHOTS = [
    ("library.png", "/", [], 1500),
    ("inspector-depth.png", f"/#run={DEPOT}&node=5", [], 2500),
    ("inspector-bound.png", f"/#run={DEPOT}&layout=bound", [], 2500),
    ("compare.png", f"/#compare={COMPARE}", [], 3500),
    # walkthrough.png shows two notes; add them on the server first (POST
    # /api/runs/{id}/notes) and take it with: --only walkthrough.png
    ("walkthrough.png", f"/#run={DEPOT}&step=65", [], 3000),
]


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--url", default="http://127.0.0.1:8765")
    ap.add_argument("--chromium", default="/usr/bin/chromium")
    ap.add_argument("--only", action="append", help="take just this file (repeatable)")
    args = ap.parse_args()
    wanted = [s for s in SHOTS if not args.only or s[0] in args.only]
    if not args.only:
        wanted = [s for s in wanted if s[0] != "walkthrough.png"]
    errors: list[str] = []
    with sync_playwright() as p:
        browser = p.chromium.launch(executable_path=args.chromium,
                                    args=["--no-sandbox", "--disable-gpu"])
        for name, where, clicks, wait in wanted:
            page = browser.new_page(viewport={"width": 1280, "height": 800})
            page.on("console", lambda m, n=name: errors.append(f"{n}: {m.text}")
                    if m.type == "error" else None)
            page.goto(args.url + where)
            page.wait_for_timeout(wait)
            for selector in clicks:
                page.click(selector)
                page.wait_for_timeout(800)
            page.screenshot(path=str(HERE / name))
            page.close()
            print(f"wrote {HERE / name}")
        browser.close()
    if errors:
        raise SystemExit("the page logged errors:\n" + "\n".join(errors))


if __name__ == "__main__":
    main()
