"""`undergrowth serve`: the inspector's web server (the API, the web page, live solves).

Every flag but ``--get`` comes from the server's settings table
(`undergrowth.api.settings`), so the help, the defaults and docs/api.md agree.
"""

from __future__ import annotations

import argparse
import dataclasses
import json
import socket
import sys
import threading
import time
import webbrowser
from pathlib import Path
from typing import Any


def _setting_type(f: dataclasses.Field) -> str:
    return str(f.type).replace(" ", "")


def register(sub: argparse._SubParsersAction) -> None:
    from ..api.settings import DEFAULT_PORT, setting_fields

    p = sub.add_parser(
        "serve", help="serve the inspector: runs, models, live solves (default: "
                      f"http://127.0.0.1:{DEFAULT_PORT}/)",
        description="Serve the Undergrowth inspector and its API. With no options: the bundled "
                    "sample runs (read-only) plus your writable runs directory, on "
                    f"http://127.0.0.1:{DEFAULT_PORT}/ (this machine only). API docs at /docs.")
    for f in setting_fields():
        meta = f.metadata
        kind = _setting_type(f)
        default = f.default
        help_text = meta["help"]
        if kind == "bool":
            p.add_argument(meta["flag"], dest=f.name, action="store_true", default=None,
                           help=help_text)
            continue
        if default is not None and kind not in ("Path|None",):
            help_text += f" (default: {default})"
        if kind.startswith("tuple"):
            p.add_argument(meta["flag"], dest=f.name, action="append", default=None,
                           metavar=meta["metavar"], help=help_text)
            continue
        convert = {"int": int, "float": float}.get(kind, str)
        p.add_argument(meta["flag"], dest=f.name, type=convert, default=None,
                       metavar=meta["metavar"], help=help_text)
    p.add_argument("--get", metavar="PATH", default=None,
                   help="answer one request (e.g. /api/health) in-process, print the response "
                        "and exit, without opening a port")
    p.set_defaults(run=run)


def settings_from_args(args: argparse.Namespace) -> Any:
    from ..api.settings import ApiSettings, setting_fields

    values: dict[str, Any] = {}
    for f in setting_fields():
        v = getattr(args, f.name, None)
        if v is None:
            continue
        kind = _setting_type(f)
        if kind == "Path|None":
            v = None if str(v).lower() == "none" else Path(v)
        elif kind.startswith("tuple"):
            v = tuple(v)
        values[f.name] = v
    return ApiSettings(**values)


def run(args: argparse.Namespace) -> int:
    try:
        settings = settings_from_args(args).resolved()
        warning = settings.check_exposure()
    except ValueError as exc:
        print(f"undergrowth serve: {exc}", file=sys.stderr)
        return 2
    if args.get is not None:
        return _answer_one(settings, args.get)
    if warning:
        print(warning, file=sys.stderr)
    return _serve(settings)


def _answer_one(settings: Any, target: str) -> int:
    from ..api.app import create_app
    from ..api.oneshot import call

    if not target.startswith("/"):
        print(f"undergrowth serve: --get takes a path starting with '/', not {target!r}",
              file=sys.stderr)
        return 2
    app = create_app(settings)
    headers = {"authorization": f"Bearer {settings.token}"} if settings.token else {}
    response = call(app, target, headers=headers)
    if "json" in response.content_type:
        print(json.dumps(json.loads(response.body), indent=2, ensure_ascii=False))
    elif response.content_type.startswith(("text/", "application/javascript")):
        sys.stdout.write(response.body.decode("utf-8", errors="replace"))
    else:
        print(f"{len(response.body)} bytes of {response.content_type or 'unknown type'}")
    return 0 if 200 <= response.status < 300 else 1


def _url_host(host: str) -> str:
    if host in ("0.0.0.0", "::", ""):
        return socket.gethostname()
    return f"[{host}]" if ":" in host else host


def _serve(settings: Any) -> int:
    import uvicorn

    from ..api.app import create_app

    family = socket.AF_INET6 if ":" in settings.host else socket.AF_INET
    sock = socket.socket(family, socket.SOCK_STREAM)
    sock.setsockopt(socket.SOL_SOCKET, socket.SO_REUSEADDR, 1)
    try:
        sock.bind((settings.host, settings.port))
    except OSError as exc:
        print(f"undergrowth serve: cannot listen on {settings.host}:{settings.port}: "
              f"{exc.strerror} (try --port)", file=sys.stderr)
        return 2
    port = sock.getsockname()[1]
    app = create_app(settings)
    url = f"http://{_url_host(settings.host)}:{port}/"
    ctx = app.state.undergrowth
    print(f"Undergrowth at {url}  (API docs: {url}docs)")
    for source, directory in ctx.library.dirs:
        mode = "read-only" if source == "samples" or settings.read_only else "writable"
        print(f"  runs ({source}, {mode}): {directory}")
    if settings.read_only:
        print("  read-only: uploads, solves and deletes are switched off")
    open_url = url
    if settings.token:
        open_url = f"{url}?token={settings.token}"
        print(f"  sign in once at: {open_url}")
    print("  stop with Ctrl-C", flush=True)
    config = uvicorn.Config(app, log_level="warning", timeout_graceful_shutdown=5)
    server = uvicorn.Server(config)
    if settings.open_browser:
        def open_when_up() -> None:
            for _ in range(200):
                if server.started:
                    webbrowser.open(open_url)
                    return
                time.sleep(0.05)

        threading.Thread(target=open_when_up, daemon=True).start()
    server.run(sockets=[sock])
    return 0
