"""One error shape everywhere; the settings table documented everywhere; `serve --get`."""

from __future__ import annotations

import io
import json
import re
from contextlib import redirect_stdout
from pathlib import Path

import pytest

from test_api_support import (
    DEPOT,
    TestClient,
    assert_error_shape,
    client_for,
    sample_dir,
    settings_for,
)
from undergrowth.api import create_app
from undergrowth.api.settings import settings_table
from undergrowth.cli import build_parser, main

DOCS = Path(__file__).resolve().parent.parent / "docs" / "api.md"

# (method, path, keyword arguments, status, code): at least one failure for every route.
ERROR_CASES = [
    ("GET", "/api/nothing", {}, 404, "not-found"),
    ("PUT", "/api/health", {}, 405, "method-not-allowed"),
    ("GET", "/api/runs/x%20y", {}, 400, "invalid-id"),
    ("GET", "/api/runs/missing", {}, 404, "not-found"),
    ("DELETE", f"/api/runs/{DEPOT}", {}, 403, "sample-run"),
    ("DELETE", "/api/runs/missing", {}, 404, "not-found"),
    ("POST", "/api/runs", {}, 422, "invalid-request"),
    ("POST", "/api/runs", {"files": {"file": ("a.txt", b"x")}}, 415, "unsupported-type"),
    ("POST", "/api/runs", {"files": {"file": ("a.jsonl", b"[]\n")}}, 422, "invalid-run"),
    ("GET", f"/api/runs/{DEPOT}/tree?format=svg", {}, 422, "invalid-request"),
    ("GET", "/api/runs/missing/tree", {}, 404, "not-found"),
    ("GET", f"/api/runs/{DEPOT}/nodes/-3", {}, 404, "not-found"),
    ("GET", f"/api/runs/{DEPOT}/nodes/x", {}, 422, "invalid-request"),
    ("GET", "/api/runs/missing/nodes/0", {}, 404, "not-found"),
    ("GET", f"/api/runs/{DEPOT}/series?points=0", {}, 422, "invalid-request"),
    ("GET", "/api/runs/missing/series", {}, 404, "not-found"),
    ("GET", f"/api/runs/{DEPOT}/stream", {"headers": {"Last-Event-ID": "x"}}, 400,
     "bad-last-event-id"),
    ("GET", "/api/runs/missing/stream", {}, 404, "not-found"),
    ("GET", "/api/models/missing", {}, 404, "not-found"),
    ("GET", "/api/models/.x", {}, 400, "invalid-id"),
    ("POST", "/api/models", {"files": {"file": ("m.mps", b"ROWS\n N\n")}}, 422,
     "invalid-model"),
    ("POST", "/api/models", {"files": {"file": ("m.lp", b"x")}}, 415, "unsupported-type"),
    ("POST", "/api/solves", {"json": {}}, 422, "invalid-request"),
    ("POST", "/api/solves", {"json": {"model": "missing"}}, 404, "not-found"),
    ("GET", "/api/solves/missing", {}, 404, "not-found"),
    ("POST", "/api/solves/missing/cancel", {}, 404, "not-found"),
    ("GET", "/api/health", {"headers": {"Host": "elsewhere.example"}}, 403, "host-refused"),
    ("GET", "/vendor/nothing.js", {}, 404, "not-found"),
    ("GET", "/api/report?run=missing", {}, 404, "not-found"),
    ("GET", f"/api/runs/{DEPOT}/steps?count=0", {}, 422, "invalid-request"),
    ("GET", "/api/runs/missing/steps", {}, 404, "not-found"),
    ("GET", "/api/runs/missing/notes", {}, 404, "not-found"),
    ("POST", f"/api/runs/{DEPOT}/notes", {"json": {"text": "x"}}, 422, "invalid-note"),
    ("POST", f"/api/runs/{DEPOT}/notes", {"json": {"text": "x", "node": 10**6}}, 422,
     "invalid-note"),
    ("PATCH", f"/api/runs/{DEPOT}/notes/nothere", {"json": {"text": "x"}}, 404, "not-found"),
    ("DELETE", f"/api/runs/{DEPOT}/notes/nothere", {}, 404, "not-found"),
    ("DELETE", "/api/groups/missing", {}, 404, "not-found"),
]


@pytest.fixture(scope="module")
def client(tmp_path_factory):
    with client_for(tmp_path_factory.mktemp("errors")) as c:
        yield c


@pytest.mark.parametrize("method,path,kwargs,status,code", ERROR_CASES,
                         ids=[f"{m} {p} {s}" for m, p, _, s, _ in ERROR_CASES])
def test_every_error_has_the_one_shape(client, method, path, kwargs, status, code):
    assert_error_shape(client.request(method, path, **kwargs), status, code)


def _template(path: str) -> str:
    return re.sub(r"\{[^}]+\}", "{}", path)


def test_the_error_cases_cover_every_api_route(client):
    routes = {(m, _template(r.path)) for r in client.app.routes
              if getattr(r, "path", "").startswith("/api/") for m in getattr(r, "methods", ())}
    covered = set()
    for method, path, *_ in ERROR_CASES:
        bare = path.split("?")[0]
        for m, template in routes:
            pattern = "^" + re.escape(template).replace(r"\{\}", "[^/]+") + "$"
            if m == method and re.match(pattern, bare):
                covered.add((m, template))
    missing = routes - covered - {("GET", "/api/runs"), ("GET", "/api/models"),
                                  ("GET", "/api/solves"), ("GET", "/api/health")}
    assert not missing, f"add failure cases for {sorted(missing)}"


def test_errors_are_documented_with_the_shape_in_openapi(client):
    spec = client.get("/openapi.json").json()
    for path, item in spec["paths"].items():
        for method, op in item.items():
            for status in ("400", "404", "422"):
                ref = op["responses"][status]["content"]["application/json"]["schema"]["$ref"]
                assert ref.endswith("/ErrorBody"), (method, path, status)


def test_an_unexpected_failure_is_a_500_in_the_same_shape(tmp_path):
    app = create_app(settings_for(tmp_path))

    def broken():
        raise RuntimeError("disk on fire")

    app.state.undergrowth.library.scan = broken
    with TestClient(app, base_url="http://127.0.0.1", raise_server_exceptions=False) as c:
        err = assert_error_shape(c.get("/api/runs"), 500, "internal-error")
        assert "disk on fire" not in err["message"]  # no internals leak to the client


# ---------------------------------------------------------------- the settings table
def _serve_help() -> str:
    parser = build_parser()
    sub = next(a for a in parser._actions if a.__class__.__name__ == "_SubParsersAction")
    return sub.choices["serve"].format_help()


def test_every_setting_is_in_serve_help_and_in_the_api_docs():
    help_text = _serve_help()
    docs = DOCS.read_text(encoding="utf-8")
    for name, default, help_line, flag in settings_table():
        assert flag in help_text, f"{flag} missing from `undergrowth serve --help`"
        assert help_line.split()[0] in help_text
        assert f"`{flag}`" in docs, f"{flag} missing from docs/api.md"
        assert f"`{name}`" in docs, f"setting {name} missing from docs/api.md"
        if isinstance(default, int | float) and not isinstance(default, bool):
            assert f"default: {default}" in " ".join(help_text.split()), name


def test_every_route_is_in_the_api_docs(client):
    docs = DOCS.read_text(encoding="utf-8")
    for path, item in client.get("/openapi.json").json()["paths"].items():
        for method in item:
            assert f"{method.upper()} {path}" in docs, f"{method.upper()} {path} undocumented"


# ---------------------------------------------------------------- serve --get
def _serve_get(tmp_path, target: str, *extra: str) -> tuple[int, str]:
    out = io.StringIO()
    with redirect_stdout(out):
        code = main(["serve", "--runs", str(tmp_path / "runs"), "--samples", str(sample_dir()),
                     "--get", target, *extra])
    return code, out.getvalue()


def test_serve_get_answers_one_request_without_a_port(tmp_path):
    code, text = _serve_get(tmp_path, "/api/health")
    assert code == 0 and json.loads(text)["status"] == "ok"
    code, text = _serve_get(tmp_path, f"/api/runs/{DEPOT}/stream")
    assert code == 0 and "event: end" in text
    code, text = _serve_get(tmp_path, "/api/runs/missing")
    assert code == 1 and json.loads(text)["error"]["code"] == "not-found"
    code, text = _serve_get(tmp_path, "/api/health", "--token", "a-long-enough-token")
    assert code == 0 and json.loads(text)["token_required"] is True


def test_serve_refuses_an_exposed_host_without_a_token(tmp_path, capsys):
    assert main(["serve", "--host", "0.0.0.0", "--runs", str(tmp_path), "--get", "/"]) == 2
    assert "--token" in capsys.readouterr().err
