"""The web front end at ``/`` and plotly.js from the installed plotly package."""

from __future__ import annotations

import gzip
import threading
from importlib.util import find_spec
from pathlib import Path

import anyio
from fastapi import FastAPI, Request
from fastapi.openapi.docs import get_swagger_ui_html
from fastapi.responses import FileResponse, HTMLResponse, Response
from fastapi.staticfiles import StaticFiles

from .errors import NotFound

__all__ = ["mount_static", "plotly_path", "swagger_ui_dir"]

# The interactive API page's assets, served from the fastapi-offline package so that
# /docs works offline like the rest of the inspector (FastAPI's default loads a CDN).
SWAGGER_ASSETS = {"swagger-ui-bundle.js": "text/javascript", "swagger-ui.css": "text/css"}

_PLACEHOLDER = """<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>Undergrowth</title></head>
<body style="font-family: system-ui, sans-serif; max-width: 40em; margin: 3em auto">
<h1>Undergrowth</h1>
<p>The server is running, but the web front end is not installed here yet.</p>
<p>The API is all there: see <a href="/docs">/docs</a> (interactive) or
<a href="/api/runs">/api/runs</a>.</p>
</body></html>
"""


def plotly_path() -> Path | None:
    """``plotly/package_data/plotly.min.js`` of the installed plotly package."""
    spec = find_spec("plotly")
    if spec is None or spec.origin is None:
        return None
    path = Path(spec.origin).parent / "package_data" / "plotly.min.js"
    return path if path.is_file() else None


_gzipped: dict[tuple[str, int, int], bytes] = {}
_gzip_lock = threading.Lock()


def gzipped_file(path: Path) -> bytes:
    """The file gzip-compressed at the highest level, once per file version: plotly.min.js
    is 4.8 MB, and compressing it for every page load took about 0.1 s of server time."""
    st = path.stat()
    key = (str(path), st.st_size, st.st_mtime_ns)
    with _gzip_lock:
        body = _gzipped.get(key)
        if body is None:
            body = gzip.compress(path.read_bytes(), compresslevel=9, mtime=0)
            _gzipped.clear()
            _gzipped[key] = body
    return body


def swagger_ui_dir() -> Path | None:
    """The swagger-ui files shipped by the installed fastapi-offline package."""
    spec = find_spec("fastapi_offline")
    if spec is None or spec.origin is None:
        return None
    path = Path(spec.origin).parent / "static"
    return path if (path / "swagger-ui-bundle.js").is_file() else None


def mount_static(app: FastAPI, web_root: Path | None) -> None:
    """Routes for ``/``, ``/vendor/plotly.min.js`` and every file under ``web_root``.
    Call after the API routes: the file mount catches whatever they do not."""

    @app.get("/vendor/plotly.min.js", include_in_schema=False)
    async def plotly_js(request: Request) -> Response:
        path = plotly_path()
        if path is None:
            raise NotFound("plotly.min.js is not installed (pip install plotly)")
        headers = {"Cache-Control": "public, max-age=86400", "Vary": "Accept-Encoding"}
        if "gzip" in request.headers.get("accept-encoding", ""):
            body = await anyio.to_thread.run_sync(gzipped_file, path)
            return Response(body, media_type="text/javascript",
                            headers={**headers, "Content-Encoding": "gzip"})
        return FileResponse(path, media_type="text/javascript", headers=headers)

    @app.get("/docs", include_in_schema=False)
    async def api_page() -> Response:
        if swagger_ui_dir() is None:
            return HTMLResponse(_PLACEHOLDER.replace("see <a href=\"/docs\">/docs</a> "
                                                     "(interactive) or", "see"))
        return get_swagger_ui_html(openapi_url="/openapi.json", title="Undergrowth API",
                                   swagger_js_url="/vendor/swagger/swagger-ui-bundle.js",
                                   swagger_css_url="/vendor/swagger/swagger-ui.css",
                                   swagger_favicon_url="/icon.svg")

    @app.get("/vendor/swagger/{name}", include_in_schema=False)
    async def swagger_asset(name: str) -> Response:
        folder = swagger_ui_dir()
        if folder is None or name not in SWAGGER_ASSETS:
            raise NotFound(f"no such file: /vendor/swagger/{name}")
        return FileResponse(folder / name, media_type=SWAGGER_ASSETS[name],
                            headers={"Cache-Control": "public, max-age=86400"})

    @app.get("/", include_in_schema=False)
    async def index() -> Response:
        page = None if web_root is None else web_root / "index.html"
        if page is not None and page.is_file():
            return FileResponse(page, media_type="text/html",
                                headers={"Cache-Control": "no-cache"})
        return HTMLResponse(_PLACEHOLDER)

    if web_root is not None and web_root.is_dir():
        app.mount("/", StaticFiles(directory=web_root, html=True, check_dir=False), name="web")
