"""The app factory: `create_app(settings)` wires settings, routes, middleware, static files."""

from __future__ import annotations

import contextlib
from collections.abc import AsyncIterator

from fastapi import FastAPI
from starlette.middleware.gzip import GZipMiddleware
from starlette.types import ASGIApp, Receive, Scope, Send

from .. import __version__
from ..paths import WEB_ROOT
from .access import AccessMiddleware
from .context import ServerContext
from .errors import install_error_handlers
from .routes import compare, findings, health, models, notes, report, runs, solves, steps, stream
from .settings import ApiSettings
from .static import mount_static

__all__ = ["create_app"]

DESCRIPTION = """The Undergrowth API: recorded and live branch-and-bound runs, their trees,
nodes and bound series; model and run uploads; solves in worker processes; a resumable
event stream. Every error has one shape: `{"error": {"code", "message", "detail"}}`.
docs/api.md in the repository describes the binary tree layout and the stream protocol."""


class _Compress:
    """gzip (for clients that accept it, bodies of 1 KiB and more), but never for an
    event stream: compression would hold batches back until a buffer fills."""

    def __init__(self, app: ASGIApp) -> None:
        self.app = app
        self.gzip = GZipMiddleware(app, minimum_size=1024, compresslevel=5)

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        if scope["type"] == "http" and not scope["path"].endswith("/stream"):
            await self.gzip(scope, receive, send)
        else:
            await self.app(scope, receive, send)


def create_app(settings: ApiSettings | None = None) -> FastAPI:
    """A ready app. Raises ValueError when the settings would expose the server unsafely
    (a non-loopback host without --token or --no-token)."""
    settings = (settings or ApiSettings()).resolved()
    settings.check_exposure()
    ctx = ServerContext.build(settings)

    @contextlib.asynccontextmanager
    async def lifespan(app: FastAPI) -> AsyncIterator[None]:
        if not settings.read_only:
            ctx.jobs.warm_up()
        yield
        await ctx.jobs.close()

    app = FastAPI(title="Undergrowth", version=__version__, description=DESCRIPTION,
                  lifespan=lifespan, docs_url=None, redoc_url=None,  # /docs: static.py
                  openapi_url="/openapi.json")
    app.state.undergrowth = ctx
    install_error_handlers(app)
    for module in (health, runs, findings, stream, models, solves, report, compare, steps,
                   notes):
        app.include_router(module.router)
    mount_static(app, WEB_ROOT)
    app.add_middleware(_Compress)
    app.add_middleware(AccessMiddleware, settings=settings)
    return app
