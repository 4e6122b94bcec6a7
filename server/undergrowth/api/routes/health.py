"""Health: version, mode and directories (what `serve --get /api/health` prints)."""

from __future__ import annotations

from typing import Any

from fastapi import APIRouter

from ... import __version__
from ..context import Ctx
from ..schemas import Health
from ._common import errors

router = APIRouter(prefix="/api", tags=["health"])


@router.get("/health", response_model=Health, responses=errors(),
            summary="is the server up, and how is it set up")
async def health(ctx: Ctx) -> dict[str, Any]:
    s = ctx.settings
    writable = not s.read_only
    runs = [{"source": src, "path": str(d), "writable": src == "user" and writable}
            for src, d in ctx.library.dirs]
    models = [{"source": src, "path": str(d), "writable": src == "user" and writable}
              for src, d in ctx.models.dirs]
    jobs = ctx.jobs.list()
    return {"status": "ok", "version": __version__, "read_only": s.read_only,
            "token_required": s.token is not None, "runs_dirs": runs, "models_dirs": models,
            "solves": {"running": sum(j.state == "running" for j in jobs),
                       "queued": sum(j.state == "queued" for j in jobs),
                       "max_running": s.max_solves, "max_queued": s.max_queued},
            "limits": {"node_limit_cap": s.node_limit_cap, "time_limit_cap": s.time_limit_cap,
                       "upload_limit_mb": s.upload_limit_mb}}
