"""Browser tests: the real app (`create_app`) served by uvicorn on a free loopback
port, the bundled sample runs plus a temporary writable directory, driven in
headless Chromium (Debian's /usr/bin/chromium) through Playwright's Python package.

Skipped, with the reason, when Playwright or Chromium is not installed. Every
test fails if the page logs a console error or throws, except the errors a
test declares it expects (`console.allow(...)`, e.g. the 422 of a bad upload).
"""

from __future__ import annotations

import os
import re
import shutil
import socket
import threading
import time
from collections.abc import Iterator
from pathlib import Path

import pytest

CHROMIUM = os.environ.get("UNDERGROWTH_CHROMIUM", "/usr/bin/chromium")
try:
    import playwright.sync_api as playwright_api
except ImportError:  # pragma: no cover - depends on the machine
    playwright_api = None

if playwright_api is None:
    MISSING = ("the browser tests need Playwright's Python package (pip install playwright; "
               "no browser download: Debian's chromium is used)")
elif not (Path(CHROMIUM).is_file() or shutil.which(CHROMIUM)):
    MISSING = (f"the browser tests need Chromium at {CHROMIUM} (apt-get install chromium, "
               "or set UNDERGROWTH_CHROMIUM)")
else:
    MISSING = None


def pytest_collection_modifyitems(config: pytest.Config, items: list[pytest.Item]) -> None:
    if MISSING is None:
        return
    here = Path(__file__).parent
    for item in items:
        if here in Path(item.fspath).parents:
            item.add_marker(pytest.mark.skip(reason=MISSING))


import uvicorn  # noqa: E402

from undergrowth.api import ApiSettings, create_app  # noqa: E402
from undergrowth.paths import SAMPLE_RUNS  # noqa: E402

CHROMIUM_ARGS = ["--no-sandbox", "--disable-gpu", "--disable-background-networking",
                 "--disable-component-update", "--disable-sync", "--no-first-run"]
VIEWPORT = {"width": 1280, "height": 800}


def free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class LiveServer:
    """uvicorn in a background thread; `url` once it accepts connections."""

    def __init__(self, settings: ApiSettings) -> None:
        self.port = settings.port
        config = uvicorn.Config(create_app(settings), host="127.0.0.1", port=self.port,
                                log_level="warning", lifespan="on")
        self.server = uvicorn.Server(config)
        self.thread = threading.Thread(target=self.server.run, daemon=True)
        self.url = f"http://127.0.0.1:{self.port}"

    def __enter__(self) -> LiveServer:
        self.thread.start()
        deadline = time.monotonic() + 30
        while not self.server.started:
            if time.monotonic() > deadline or not self.thread.is_alive():
                raise RuntimeError("the test server did not start")
            time.sleep(0.05)
        return self

    def __exit__(self, *exc: object) -> None:
        self.server.should_exit = True
        self.thread.join(timeout=30)


@pytest.fixture(scope="session")
def server(tmp_path_factory: pytest.TempPathFactory) -> Iterator[LiveServer]:
    tmp = tmp_path_factory.mktemp("browser-server")
    settings = ApiSettings(samples_dir=SAMPLE_RUNS, runs_dir=tmp / "runs",
                           models_dir=tmp / "models", cache_dir=tmp / "cache",
                           port=free_port(), stream_interval=0.05)
    with LiveServer(settings) as live:
        live.settings = settings
        yield live


@pytest.fixture(scope="session")
def browser() -> Iterator[object]:
    with playwright_api.sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, args=CHROMIUM_ARGS)
        yield b
        b.close()


class ConsoleWatch:
    """Console errors and uncaught exceptions of one page."""

    def __init__(self) -> None:
        self.errors: list[str] = []
        self.allowed: list[re.Pattern[str]] = []

    def allow(self, pattern: str) -> None:
        self.allowed.append(re.compile(pattern))

    def on_console(self, message: object) -> None:
        if message.type == "error":  # type: ignore[attr-defined]
            # A failed fetch's text does not say which URL; its location does.
            url = (message.location or {}).get("url", "")  # type: ignore[attr-defined]
            self.errors.append(f"console: {message.text} [{url}]")  # type: ignore[attr-defined]

    def on_error(self, error: object) -> None:
        self.errors.append(f"uncaught: {error}")

    def unexpected(self) -> list[str]:
        return [e for e in self.errors if not any(p.search(e) for p in self.allowed)]


@pytest.fixture
def console() -> ConsoleWatch:
    return ConsoleWatch()


@pytest.fixture
def page(browser: object, server: LiveServer, console: ConsoleWatch) -> Iterator[object]:
    context = browser.new_context(viewport=VIEWPORT)  # type: ignore[attr-defined]
    pg = context.new_page()
    pg.on("console", console.on_console)
    pg.on("pageerror", console.on_error)
    pg.set_default_timeout(30_000)
    yield pg
    context.close()
    assert console.unexpected() == [], "the page logged errors"
