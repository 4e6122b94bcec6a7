"""Access control, in one plain ASGI middleware (it must not buffer streams):

1. Host guard: with no token on a loopback address, only localhost Host
   headers are served (a page elsewhere cannot rebind its name to us).
2. Sign-in link: ``/?token=T`` with the right token sets an HttpOnly cookie
   and redirects to ``/``, so the token leaves the address bar.
3. Token: with ``--token``, every request needs ``Authorization: Bearer T``
   or the cookie.
4. Cross-site writes: a POST/DELETE whose ``Origin`` is not this server is
   refused (a form on another site cannot start solves or delete runs).
5. Read-only: every write under ``/api`` is refused.
6. Body size: a body larger than the upload limit is refused with 413, from
   its Content-Length or as soon as the bytes received pass the limit.
"""

from __future__ import annotations

import hmac
from http.cookies import SimpleCookie
from urllib.parse import parse_qs, urlsplit

from starlette.datastructures import Headers
from starlette.types import ASGIApp, Message, Receive, Scope, Send

from .errors import PayloadTooLarge, error_response
from .settings import ApiSettings

__all__ = ["COOKIE", "AccessMiddleware"]

COOKIE = "undergrowth_token"
SAFE_METHODS = frozenset({"GET", "HEAD", "OPTIONS"})


class AccessMiddleware:
    def __init__(self, app: ASGIApp, *, settings: ApiSettings) -> None:
        self.app = app
        self.settings = settings
        self.token = settings.token
        self.limit = settings.upload_limit_bytes

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        if scope["type"] != "http":
            await self.app(scope, receive, send)
            return
        headers = Headers(scope=scope)
        method = scope["method"]
        path = scope["path"]
        refuse = None
        if not self.settings.host_allowed(headers.get("host", "")):
            refuse = (403, "host-refused", "this server only answers requests addressed to "
                      "localhost; use http://127.0.0.1 or start it with --allowed-host", {})
        elif self.token is not None:
            query = parse_qs(scope.get("query_string", b"").decode("latin-1"))
            offered = query.get("token", [None])[0]
            if path == "/" and offered is not None and method in SAFE_METHODS:
                await self._sign_in(offered, scope, receive, send)
                return
            if not self._authorised(headers):
                refuse = (401, "unauthorized", "this server needs its access token: send "
                          "'Authorization: Bearer TOKEN' or open the sign-in link printed at "
                          "start", {})
        if refuse is None and method not in SAFE_METHODS:
            origin = headers.get("origin")
            if origin and not _same_origin(origin, headers.get("host", "")):
                refuse = (403, "cross-origin", f"writes from {origin} are not accepted", {})
            elif self.settings.read_only and path.startswith("/api/"):
                refuse = (403, "read-only", "this server is read-only: uploads, solves, "
                          "cancels and deletes are switched off", {})
        if refuse is None:
            length = headers.get("content-length")
            if length is not None and length.isdigit() and int(length) > self.limit:
                refuse = (413, "too-large", _too_large(self.limit), {"limit": self.limit})
        if refuse is not None:
            status, code, message, detail = refuse
            extra = {"WWW-Authenticate": 'Bearer realm="undergrowth"'} if status == 401 else None
            await error_response(status, code, message, detail, extra)(scope, receive, send)
            return
        if method in SAFE_METHODS:
            await self.app(scope, receive, send)
        else:
            await self.app(scope, _counting(receive, self.limit), send)

    def _authorised(self, headers: Headers) -> bool:
        assert self.token is not None
        auth = headers.get("authorization", "")
        if auth[:7].lower() == "bearer " and _equal(auth[7:].strip(), self.token):
            return True
        cookie = SimpleCookie()
        try:
            cookie.load(headers.get("cookie", ""))
        except Exception:  # noqa: BLE001 - a malformed cookie header counts as none
            return False
        morsel = cookie.get(COOKIE)
        return morsel is not None and _equal(morsel.value, self.token)

    async def _sign_in(self, offered: str, scope: Scope, receive: Receive, send: Send) -> None:
        assert self.token is not None
        if not _equal(offered, self.token):
            await error_response(401, "unauthorized", "that sign-in link is not valid")(
                scope, receive, send)
            return
        secure = "; Secure" if scope.get("scheme") == "https" else ""
        cookie = f"{COOKIE}={self.token}; HttpOnly; SameSite=Strict; Path=/{secure}"
        await send({"type": "http.response.start", "status": 303,
                    "headers": [(b"location", b"/"), (b"set-cookie", cookie.encode()),
                                (b"content-length", b"0"), (b"cache-control", b"no-store")]})
        await send({"type": "http.response.body", "body": b""})


def _equal(a: str, b: str) -> bool:
    return hmac.compare_digest(a.encode("utf-8"), b.encode("utf-8"))


def _same_origin(origin: str, host: str) -> bool:
    try:
        netloc = urlsplit(origin).netloc
    except ValueError:
        return False
    return netloc.lower() == host.lower()


def _too_large(limit: int) -> str:
    return f"the request body is larger than this server accepts ({limit / 2**20:g} MiB)"


def _counting(receive: Receive, limit: int) -> Receive:
    """``receive`` that raises 413 once more than ``limit`` body bytes have arrived."""
    seen = 0

    async def wrapped() -> Message:
        nonlocal seen
        message = await receive()
        if message["type"] == "http.request":
            seen += len(message.get("body", b""))
            if seen > limit:
                raise PayloadTooLarge(_too_large(limit), detail={"limit": limit})
        return message

    return wrapped
