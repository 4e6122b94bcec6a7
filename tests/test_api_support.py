"""Shared helpers for the API tests (imported by the test_api_* modules; no tests here).

Real runs come from the bundled samples (`paths.SAMPLE_RUNS`). When the checkout has
not got them yet, a few planned sample runs are generated once per test session
into a temporary directory with `undergrowth.samples.rebuild`.
"""

from __future__ import annotations

import asyncio
import atexit
import functools
import json
import shutil
import tempfile
import threading
import warnings
from pathlib import Path
from typing import Any

import pytest

from undergrowth import samples
from undergrowth.api import ApiSettings, create_app
from undergrowth.paths import SAMPLE_RUNS

with warnings.catch_warnings():
    # Newer Starlette prefers httpx2 for its TestClient; httpx works the same here.
    warnings.simplefilter("ignore")
    from fastapi.testclient import TestClient

# Sample runs the API tests use (all in `samples.PLAN`).
DEPOT = "depot-siting-loose.most-fractional.best-bound"  # 111 nodes, two incumbents
TIGHT = "depot-siting-tight.most-fractional.best-bound"  # one node
KNAPSACK = "project-selection.most-fractional.best-bound"  # 3651 nodes, several batches
OVEN = "oven-batching.most-fractional.best-bound"  # quadratic, 13 nodes
USED = (DEPOT, TIGHT, KNAPSACK, OVEN)


@functools.cache
def sample_dir() -> Path:
    """The bundled sample runs, or a session-wide generated copy of the ones used here."""
    if all((SAMPLE_RUNS / f"{run}.jsonl.gz").exists() for run in USED) and (
            SAMPLE_RUNS / "models").is_dir():
        return SAMPLE_RUNS
    out = Path(tempfile.mkdtemp(prefix="undergrowth-samples-"))
    atexit.register(shutil.rmtree, out, ignore_errors=True)
    plan = [p for p in samples.PLAN if p.file_name[: -len(".jsonl.gz")] in USED]
    with pytest.MonkeyPatch.context() as mp:
        mp.setattr(samples, "PLAN", tuple(plan))
        samples.rebuild(out, progress=lambda *_: None)
    return out


def settings_for(tmp: Path, **changes: Any) -> ApiSettings:
    """Settings with the samples and a private writable area under ``tmp``."""
    base: dict[str, Any] = {"samples_dir": sample_dir(), "runs_dir": tmp / "runs",
                            "models_dir": tmp / "models", "cache_dir": tmp / "cache",
                            "stream_interval": 0.0}
    base.update(changes)
    return ApiSettings(**base)


def client_for(tmp: Path, **changes: Any) -> TestClient:
    """A TestClient (use it as a context manager) addressed to 127.0.0.1."""
    return TestClient(create_app(settings_for(tmp, **changes)), base_url="http://127.0.0.1")


def run_async(scenario: Any) -> Any:
    """Run the coroutine function ``scenario`` in a fresh event loop on its own thread
    (so that no other loop in this thread, a browser test's for one, gets in the way)."""
    result: dict[str, Any] = {}

    def target() -> None:
        try:
            result["value"] = asyncio.run(scenario())
        except BaseException as exc:  # noqa: BLE001 - re-raised in the test's thread
            result["error"] = exc

    thread = threading.Thread(target=target, name="asgi-test")
    thread.start()
    thread.join()
    if "error" in result:
        raise result["error"]
    return result.get("value")


def parse_sse(text: str) -> list[dict[str, Any]]:
    """SSE messages as dicts: {"event", "id" (int or None), "data" (parsed JSON)}."""
    out = []
    for block in text.split("\n\n"):
        fields: dict[str, str] = {}
        for line in block.splitlines():
            if line.startswith(":") or ":" not in line:
                continue
            name, _, value = line.partition(":")
            fields[name] = value[1:] if value.startswith(" ") else value
        if "event" in fields:
            out.append({"event": fields["event"],
                        "id": int(fields["id"]) if "id" in fields else None,
                        "data": json.loads(fields["data"])})
    return out


def stream_events(messages: list[dict[str, Any]]) -> list[dict[str, Any]]:
    return [ev for m in messages if m["event"] == "batch" for ev in m["data"]]


def assert_error_shape(response: Any, status: int, code: str | None = None) -> dict[str, Any]:
    assert response.status_code == status, response.text
    body = response.json()
    assert set(body) == {"error"}, body
    err = body["error"]
    assert set(err) == {"code", "message", "detail"}, err
    assert isinstance(err["code"], str) and err["code"]
    assert isinstance(err["message"], str) and err["message"]
    assert isinstance(err["detail"], dict)
    if code is not None:
        assert err["code"] == code, err
    return err


class AsgiCall:
    """One request driven at the ASGI protocol level: the test sees every message the
    app sends, can hold ``send`` closed (a slow client) and can disconnect."""

    def __init__(self, app: Any, path: str, *, headers: dict[str, str] | None = None,
                 hold_from: int | None = None) -> None:
        raw = [(b"host", b"127.0.0.1")] + [
            (k.lower().encode(), v.encode()) for k, v in (headers or {}).items()]
        path_part, _, query = path.partition("?")
        self.scope = {"type": "http", "asgi": {"version": "3.0", "spec_version": "2.3"},
                      "http_version": "1.1", "method": "GET", "scheme": "http",
                      "path": path_part, "raw_path": path_part.encode(),
                      "query_string": query.encode(), "root_path": "", "headers": raw,
                      "client": ("127.0.0.1", 1), "server": ("127.0.0.1", 80)}
        self.app = app
        self.sent: asyncio.Queue[dict[str, Any]] = asyncio.Queue()
        self.gate = asyncio.Event()
        self.gate.set()
        self.hold_from = hold_from  # close the gate before this message (0 = the start)
        self._count = 0
        self.waiting_at_gate = asyncio.Event()
        self._left = asyncio.Event()
        self._asked = False
        self.task: asyncio.Task[None] | None = None

    async def _receive(self) -> dict[str, Any]:
        if not self._asked:
            self._asked = True
            return {"type": "http.request", "body": b"", "more_body": False}
        await self._left.wait()
        return {"type": "http.disconnect"}

    async def _send(self, message: dict[str, Any]) -> None:
        if self._count == self.hold_from:
            self.gate.clear()
        self._count += 1
        if not self.gate.is_set():
            self.waiting_at_gate.set()
            await self.gate.wait()
        await self.sent.put(message)

    def start(self) -> None:
        self.task = asyncio.ensure_future(self.app(self.scope, self._receive, self._send))

    async def next_body(self) -> bytes:
        """The next body chunk (skipping the response start)."""
        while True:
            message = await asyncio.wait_for(self.sent.get(), 10)
            if message["type"] == "http.response.body":
                return message.get("body", b"")

    async def read_until(self, marker: bytes) -> bytes:
        data = b""
        while marker not in data:
            data += await self.next_body()
        return data

    def disconnect(self) -> None:
        self._left.set()
