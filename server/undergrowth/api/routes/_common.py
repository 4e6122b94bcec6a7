"""Pieces the route modules share: documented error responses, upload spooling."""

from __future__ import annotations

import secrets
import shutil
from pathlib import Path
from typing import Any

import anyio
from fastapi import UploadFile

from ..schemas import ErrorBody

_WHY = {400: "bad id or parameter", 401: "access token missing or wrong",
        403: "read-only server, a sample run, another site or another host",
        404: "no such run, node, model or solve", 409: "conflicts with a solve's state",
        413: "body over the upload limit", 415: "file type not accepted",
        422: "invalid content: the detail names the line, field or token",
        500: "server failure", 503: "solve queue full or shutting down"}
BASE = (400, 401, 403, 404, 422, 500)


def errors(*extra: int) -> dict[int | str, dict[str, Any]]:
    """OpenAPI ``responses`` for the error statuses a route can send (all one shape)."""
    return {s: {"model": ErrorBody, "description": _WHY[s]} for s in sorted({*BASE, *extra})}


async def spool(upload: UploadFile, directory: Path, suffix: str) -> Path:
    """Copy an upload into a hidden temporary file in ``directory`` (ending in ``suffix``,
    which the readers use to tell formats apart)."""
    directory.mkdir(parents=True, exist_ok=True)
    tmp = directory / f".upload-{secrets.token_hex(8)}{suffix}"

    def copy() -> None:
        upload.file.seek(0)
        with open(tmp, "xb") as out:
            shutil.copyfileobj(upload.file, out, 1 << 20)

    await anyio.to_thread.run_sync(copy)
    return tmp
