"""Answer one request in-process, without opening a port (``serve --get /path``).

A minimal ASGI client: one request with an empty body; the response's status,
headers and body are collected. Streams end when the response ends (a finished
run's event stream does).
"""

from __future__ import annotations

import asyncio
import threading
from dataclasses import dataclass
from typing import Any
from urllib.parse import urlsplit

from starlette.types import ASGIApp, Message

__all__ = ["OneShotResponse", "call"]


@dataclass
class OneShotResponse:
    status: int
    headers: dict[str, str]
    body: bytes

    @property
    def content_type(self) -> str:
        return self.headers.get("content-type", "")


async def _call(app: ASGIApp, method: str, target: str,
                headers: dict[str, str]) -> OneShotResponse:
    parts = urlsplit(target)
    raw = [(k.lower().encode("latin-1"), v.encode("latin-1")) for k, v in
           {"host": "127.0.0.1", **headers}.items()]
    scope: dict[str, Any] = {
        "type": "http", "asgi": {"version": "3.0", "spec_version": "2.3"},
        "http_version": "1.1", "method": method.upper(), "scheme": "http",
        "path": parts.path or "/", "raw_path": (parts.path or "/").encode(),
        "query_string": parts.query.encode(), "root_path": "", "headers": raw,
        "client": ("127.0.0.1", 0), "server": ("127.0.0.1", 0), "state": {},
    }
    sent = False
    done = asyncio.Event()
    status, out_headers, body = 500, {}, bytearray()

    async def receive() -> Message:
        nonlocal sent
        if not sent:
            sent = True
            return {"type": "http.request", "body": b"", "more_body": False}
        await done.wait()  # the client never leaves before the response is complete
        return {"type": "http.disconnect"}

    async def send(message: Message) -> None:
        nonlocal status
        if message["type"] == "http.response.start":
            status = message["status"]
            for k, v in message.get("headers", []):
                out_headers[k.decode("latin-1").lower()] = v.decode("latin-1")
        elif message["type"] == "http.response.body":
            body.extend(message.get("body", b""))
            if not message.get("more_body", False):
                done.set()

    await app(scope, receive, send)
    return OneShotResponse(status, out_headers, bytes(body))


def call(app: ASGIApp, target: str, *, method: str = "GET",
         headers: dict[str, str] | None = None) -> OneShotResponse:
    """One request to ``app``; returns once the response is complete. Works with or
    without an event loop already running in this thread (a notebook has one)."""

    def run() -> OneShotResponse:
        return asyncio.run(_call(app, method, target, headers or {}))

    try:
        asyncio.get_running_loop()
    except RuntimeError:
        return run()
    result: list[OneShotResponse] = []
    errors: list[BaseException] = []

    def in_thread() -> None:
        try:
            result.append(run())
        except BaseException as exc:  # noqa: BLE001 - re-raised below
            errors.append(exc)

    worker = threading.Thread(target=in_thread, name="oneshot")
    worker.start()
    worker.join()
    if errors:
        raise errors[0]
    return result[0]
