"""Models: list, one model's report, upload with errors that name the line and token."""

from __future__ import annotations

import gzip
import json

import pytest

from test_api_support import assert_error_shape, client_for, sample_dir
from undergrowth import samples
from undergrowth.model import read_model

GOOD_MPS = ("NAME tiny\nROWS\n N obj\n L c1\nCOLUMNS\n"
            "    MARKER                 'MARKER'                 'INTORG'\n"
            " x obj -1 c1 1\n y obj -2 c1 1\n"
            "    MARKER                 'MARKER'                 'INTEND'\n"
            "RHS\n RHS c1 4\nBOUNDS\n UP BND x 3\n UP BND y 3\nENDATA\n")


@pytest.fixture
def client(tmp_path):
    with client_for(tmp_path) as c:
        yield c


def test_list_has_the_sample_models_with_their_sizes(client):
    items = {m["id"]: m for m in client.get("/api/models").json()}
    assert set(samples.all_models()) <= set(items)
    depot = items["depot-siting-loose"]
    p = read_model(str(sample_dir() / "models" / "depot-siting-loose.mps"))
    assert (depot["rows"], depot["columns"], depot["integers"]) == (
        p.num_rows, p.num_cols, p.num_integers)
    assert depot["source"] == "samples" and depot["error"] is None
    assert items["oven-batching"]["quadratic"] is True and items["oven-batching"]["convex"]


def test_one_model_report(client):
    body = client.get("/api/models/depot-siting-loose").json()
    assert body["file"] == "depot-siting-loose.mps"
    assert body["report"]["name"] == "depot-siting-loose"
    assert {"ranges", "warnings", "sense"} <= set(body["report"])
    assert_error_shape(client.get("/api/models/nope"), 404, "not-found")
    assert_error_shape(client.get("/api/models/.secret"), 400, "invalid-id")


@pytest.mark.parametrize("name,data", [
    ("tiny.mps", GOOD_MPS.encode()),
    ("tiny.mps.gz", gzip.compress(GOOD_MPS.encode())),
    ("tiny.json", json.dumps({"format": "undergrowth-model", "version": 1, "name": "tiny",
                              "objective": {"x": -1}, "variables": {"x": {"upper": 2,
                                                                        "integer": True}}})),
])
def test_upload_a_model_in_each_format(client, name, data):
    r = client.post("/api/models", files={"file": (name, data)})
    assert r.status_code == 201, r.text
    body = r.json()
    assert body["id"] == "tiny" and body["source"] == "user"
    assert body["report"]["integers"] >= 1
    assert "tiny" in {m["id"] for m in client.get("/api/models").json()}
    second = client.post("/api/models", files={"file": (name, data)}).json()
    assert second["id"] == "tiny-2"


def test_a_bad_model_names_the_line_and_token(client):
    bad = GOOD_MPS.replace(" y obj -2 c1 1", " y obj -2 c9 1")
    err = assert_error_shape(client.post("/api/models", files={"file": ("bad.mps", bad)}),
                             422, "invalid-model")
    assert err["detail"] == {"file": "bad.mps", "line": 8, "token": "c9"}
    assert err["message"].startswith("bad.mps, line 8, token 'c9':")
    err = assert_error_shape(client.post("/api/models", files={"file": ("bad.json", "{")}),
                             422, "invalid-model")
    assert err["detail"]["file"] == "bad.json"
    assert_error_shape(client.post("/api/models", files={"file": ("m.lp", "min: x;")}), 415,
                       "unsupported-type")
    assert not list(client.app.state.undergrowth.models.models_dir.glob(".upload*"))
