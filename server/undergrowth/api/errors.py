"""One exception hierarchy, one JSON error shape, one place that turns errors into responses.

Every error the server sends, whatever raised it (our routes, FastAPI's request
validation, Starlette's router, an unexpected exception), has this body::

    {"error": {"code": "not-found", "message": "no run 'x'", "detail": {...}}}

``code`` is a short stable word for programs, ``message`` a sentence for
people, ``detail`` extra facts (``line``, ``field``, ``token``, ``errors``...).
"""

from __future__ import annotations

import logging
from typing import Any

from fastapi import FastAPI, Request
from fastapi.exceptions import HTTPException, RequestValidationError
from fastapi.responses import JSONResponse
from starlette.exceptions import HTTPException as StarletteHTTPException

__all__ = [
    "ApiError", "BadRequest", "Busy", "Conflict", "Forbidden", "Invalid", "NotFound",
    "PayloadTooLarge", "ReadOnly", "Unauthorized", "UnsupportedType", "error_body",
    "install_error_handlers",
]

log = logging.getLogger("undergrowth.api")


class ApiError(HTTPException):
    """An error with an HTTP status, a code and a message. A subclass of FastAPI's
    HTTPException so that FastAPI passes it through untouched even when it is
    raised while a request body is being read."""

    status = 500
    code = "internal-error"

    def __init__(self, message: str, *, detail: dict[str, Any] | None = None,
                 headers: dict[str, str] | None = None, code: str | None = None) -> None:
        super().__init__(status_code=self.status, detail=message, headers=headers)
        self.message = message
        self.extra = detail or {}
        if code is not None:
            self.code = code


class BadRequest(ApiError):
    status, code = 400, "bad-request"


class Unauthorized(ApiError):
    status, code = 401, "unauthorized"

    def __init__(self, message: str, **kwargs: Any) -> None:
        kwargs.setdefault("headers", {"WWW-Authenticate": 'Bearer realm="undergrowth"'})
        super().__init__(message, **kwargs)


class Forbidden(ApiError):
    status, code = 403, "forbidden"


class ReadOnly(Forbidden):
    code = "read-only"


class NotFound(ApiError):
    status, code = 404, "not-found"


class Conflict(ApiError):
    status, code = 409, "conflict"


class PayloadTooLarge(ApiError):
    status, code = 413, "too-large"


class UnsupportedType(ApiError):
    status, code = 415, "unsupported-type"


class Invalid(ApiError):
    """The request was understood but its content is wrong (a bad run or model file,
    bad solve settings): ``detail`` says where."""

    status, code = 422, "invalid"


class Busy(ApiError):
    status, code = 503, "busy"


_CODE_OF_STATUS = {400: "bad-request", 401: "unauthorized", 403: "forbidden",
                   404: "not-found", 405: "method-not-allowed", 406: "not-acceptable",
                   409: "conflict", 413: "too-large", 415: "unsupported-type",
                   422: "invalid", 500: "internal-error", 503: "busy"}


def error_body(code: str, message: str, detail: dict[str, Any] | None = None) -> dict[str, Any]:
    return {"error": {"code": code, "message": message, "detail": detail or {}}}


def error_response(status: int, code: str, message: str, detail: dict[str, Any] | None = None,
                   headers: dict[str, str] | None = None) -> JSONResponse:
    return JSONResponse(error_body(code, message, detail), status_code=status, headers=headers)


def to_response(request: Request, exc: Exception) -> JSONResponse:
    """The one handler: every exception the app lets out becomes the one error shape."""
    if isinstance(exc, ApiError):
        return error_response(exc.status_code, exc.code, exc.message, exc.extra, exc.headers)
    if isinstance(exc, RequestValidationError):
        errors = [{"loc": [str(p) for p in e.get("loc", ())], "message": str(e.get("msg", ""))}
                  for e in exc.errors()]
        first = errors[0] if errors else {"loc": [], "message": "invalid request"}
        where = ".".join(first["loc"][1:] if len(first["loc"]) > 1 else first["loc"])
        message = f"{where}: {first['message']}" if where else first["message"]
        return error_response(422, "invalid-request", message, {"errors": errors})
    if isinstance(exc, StarletteHTTPException):  # the router's 404 and 405, static files
        status = exc.status_code
        if status == 404:
            message = f"nothing at {request.url.path}"
        elif status == 405:
            message = f"{request.method} is not allowed on {request.url.path}"
        else:
            message = str(exc.detail)
        return error_response(status, _CODE_OF_STATUS.get(status, f"http-{status}"), message,
                              None, getattr(exc, "headers", None))
    log.error("unexpected error on %s %s", request.method, request.url.path, exc_info=exc)
    return error_response(500, "internal-error",
                          "the server failed to answer this request; the server log says why")


def install_error_handlers(app: FastAPI) -> None:
    for kind in (ApiError, RequestValidationError, StarletteHTTPException, Exception):
        app.add_exception_handler(kind, to_response)
