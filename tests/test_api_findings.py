"""GET /api/runs/{id}/findings: the analysis package's findings and forecast over HTTP."""

from __future__ import annotations

import pytest

from test_api_support import DEPOT, TIGHT, client_for


@pytest.fixture
def client(tmp_path):
    with client_for(tmp_path) as c:
        yield c


def test_loose_depot_run_gets_weak_root_and_loose_big_m_with_the_model(client):
    r = client.get(f"/api/runs/{DEPOT}/findings")
    assert r.status_code == 200
    body = r.json()
    assert body["model"] == "depot-siting-loose"  # found in the samples' models/ folder
    codes = [f["code"] for f in body["findings"]]
    assert "weak-root" in codes and "loose-big-m" in codes
    big_m = next(f for f in body["findings"] if f["code"] == "loose-big-m")
    # by hand (Savelsbergh's activity-bound rule): 24 shares of at most 1 each, rhs 0
    assert big_m["evidence"]["example_tightest"] == 24
    assert len(big_m["refs"]["rows"]) == 8
    # a finished run: the forecast saw everything and the back-test has three points
    assert body["forecast"]["finished"] is True
    assert [p["fraction"] for p in body["backtest"]] == [0.1, 0.25, 0.5]


def test_tight_depot_run_gets_neither(client):
    body = client.get(f"/api/runs/{TIGHT}/findings").json()
    codes = {f["code"] for f in body["findings"]}
    assert not codes & {"weak-root", "loose-big-m"}


def test_unknown_run_is_404_in_the_error_shape(client):
    r = client.get("/api/runs/no-such-run/findings")
    assert r.status_code == 404
    assert set(r.json()["error"]) >= {"code", "message"}
