"""Access and safety: token (header, cookie), host guard, cross-site writes, read-only,
path traversal, exposure rules, body limits."""

from __future__ import annotations

import gzip

import pytest

from test_api_support import (
    DEPOT,
    TIGHT,
    AsgiCall,
    assert_error_shape,
    client_for,
    run_async,
    sample_dir,
    settings_for,
)
from undergrowth.api import ApiSettings, create_app

TOKEN = "s3cret-token-for-tests"


def test_a_token_protected_server_refuses_requests_without_it(tmp_path):
    with client_for(tmp_path, token=TOKEN) as c:
        for path in ("/api/health", "/api/runs", f"/api/runs/{DEPOT}/tree", "/", "/docs",
                     "/openapi.json"):
            r = c.get(path)
            assert_error_shape(r, 401, "unauthorized")
            assert r.headers["www-authenticate"].startswith("Bearer")
        assert_error_shape(c.get("/api/health", headers={"Authorization": "Bearer wrong-one"}),
                           401)
        assert_error_shape(c.get("/api/health", headers={"Cookie": "undergrowth_token=nope"}),
                           401)


def test_the_token_is_accepted_as_a_bearer_header(tmp_path):
    with client_for(tmp_path, token=TOKEN) as c:
        r = c.get("/api/runs", headers={"Authorization": f"Bearer {TOKEN}"})
        assert r.status_code == 200 and r.json()


def test_the_sign_in_link_sets_an_http_only_cookie_that_is_accepted(tmp_path):
    with client_for(tmp_path, token=TOKEN) as c:
        r = c.get(f"/?token={TOKEN}", follow_redirects=False)
        assert r.status_code == 303 and r.headers["location"] == "/"
        cookie = r.headers["set-cookie"]
        assert cookie.startswith(f"undergrowth_token={TOKEN}")
        assert "HttpOnly" in cookie and "SameSite=Strict" in cookie
        assert c.cookies.get("undergrowth_token") == TOKEN
        assert c.get("/api/runs").status_code == 200  # the client now sends the cookie
        assert c.get("/").status_code == 200
        c.cookies.clear()
        assert_error_shape(c.get("/?token=guess", follow_redirects=False), 401)


def test_the_host_guard_answers_only_localhost_names(tmp_path):
    with client_for(tmp_path) as c:
        for host in ("localhost:8765", "127.0.0.1:8765", "[::1]:8765", "localhost"):
            assert c.get("/api/health", headers={"Host": host}).status_code == 200
        assert_error_shape(c.get("/api/health", headers={"Host": "attacker.example"}), 403,
                           "host-refused")
    with client_for(tmp_path, allowed_hosts=("inspector.lan",)) as c:
        assert c.get("/api/health", headers={"Host": "inspector.lan:8765"}).status_code == 200
        assert_error_shape(c.get("/api/health"), 403, "host-refused")


def test_writes_from_another_site_are_refused(tmp_path):
    with client_for(tmp_path) as c:
        r = c.delete("/api/runs/whatever", headers={"Origin": "http://attacker.example"})
        assert_error_shape(r, 403, "cross-origin")
        same = c.delete("/api/runs/whatever", headers={"Origin": "http://127.0.0.1"})
        assert_error_shape(same, 404)  # passed the check, then found no run


def test_read_only_refuses_every_write_with_403(tmp_path):
    with client_for(tmp_path, read_only=True) as c:
        data = gzip.decompress((sample_dir() / f"{TIGHT}.jsonl.gz").read_bytes())
        writes = [
            c.post("/api/runs", files={"file": ("r.jsonl", data)}),
            c.delete(f"/api/runs/{DEPOT}"),
            c.post("/api/models", files={"file": ("m.mps", b"NAME m\n")}),
            c.post("/api/solves", json={"model": "depot-siting-tight"}),
            c.post("/api/solves/anything/cancel"),
        ]
        for r in writes:
            assert_error_shape(r, 403, "read-only")
        assert c.get("/api/runs").status_code == 200
        assert c.get(f"/api/runs/{DEPOT}/stream").status_code == 200
        assert c.get("/api/health").json()["read_only"] is True
    assert not (tmp_path / "runs").exists()  # read-only creates nothing


@pytest.mark.parametrize("path,status", [
    ("/api/runs/..%2F..%2Fetc%2Fpasswd", 404),
    ("/api/runs/%2e%2e%2f%2e%2e%2fsecret", 404),
    ("/api/runs/%2e%2e", 400),
    ("/api/runs/..", 404),  # the client itself normalises this to /api
    ("/api/runs/%2Fetc%2Fpasswd", 404),
    ("/api/runs/%2e%2e%2fsecret/tree", 404),
    ("/api/runs/..%5Csecret", 400),
    ("/api/runs/.%2e/stream", 400),
    ("/api/models/..%2F..%2Fsecret", 404),
    ("/api/models/%2e%2e", 400),
    ("/api/solves/%2e%2e/cancel", 400),
    ("/..%2F..%2Fsecret.jsonl", 404),
])
def test_path_traversal_attempts_get_404_or_400(tmp_path, path, status):
    secret = tmp_path / "secret.jsonl"
    secret.write_bytes(gzip.decompress((sample_dir() / f"{TIGHT}.jsonl.gz").read_bytes()))
    with client_for(tmp_path) as c:
        method = c.post if path.endswith("/cancel") else c.get
        assert_error_shape(method(path), status)


@pytest.mark.parametrize("raw", ["/api/runs/../../secret", "/api/runs/../secret/tree",
                                 "/api/runs//etc/passwd", "/../secret.jsonl"])
def test_raw_dot_dot_paths_at_the_protocol_level(tmp_path, raw):
    """Clients normalise '../' away; a hand-made request may not."""
    async def scenario():
        (tmp_path / "secret.jsonl").write_text("{}\n")
        call = AsgiCall(create_app(settings_for(tmp_path)), raw)
        call.start()
        start = await call.sent.get()
        body = await call.next_body()
        assert start["status"] in (400, 404) and b'"error"' in body

    run_async(scenario)


def test_exposing_the_server_needs_a_token_or_an_explicit_no_token(tmp_path):
    with pytest.raises(ValueError, match="--token"):
        create_app(settings_for(tmp_path, host="0.0.0.0"))
    s = settings_for(tmp_path, host="0.0.0.0", no_token=True)
    assert "warning" in s.check_exposure()
    create_app(s)
    assert settings_for(tmp_path, host="192.168.1.5", token=TOKEN).check_exposure() is None
    assert ApiSettings(host="::1").check_exposure() is None
    with pytest.raises(ValueError, match="token"):
        ApiSettings(token="short")


def test_a_body_without_a_length_is_cut_off_at_the_limit(tmp_path):
    def chunks():
        yield b"--b\r\nContent-Disposition: form-data; name=\"file\"; filename=\"r.jsonl\"\r\n\r\n"
        for _ in range(100):
            yield b"x" * 1000

    with client_for(tmp_path, upload_limit_mb=0.01) as c:
        r = c.post("/api/runs", content=chunks(),
                   headers={"Content-Type": "multipart/form-data; boundary=b"})
        assert_error_shape(r, 413, "too-large")
