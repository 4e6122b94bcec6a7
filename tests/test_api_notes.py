"""Reviewer notes through the API and in their sidecar: add, list, edit, delete, where
they are stored, and what a read-only server or a foreign sidecar does."""

from __future__ import annotations

import hashlib
import json
import shutil
import threading

import pytest

from test_api_support import DEPOT, OVEN, client_for, sample_dir
from undergrowth.runlog import notes as sidecar
from undergrowth.runlog import read_run


def digest(path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


@pytest.fixture
def user_run(tmp_path):
    """A copy of a sample run in the writable runs directory, under a user id."""
    runs = tmp_path / "runs"
    runs.mkdir()
    target = runs / "depot-review.jsonl.gz"
    shutil.copy(sample_dir() / f"{DEPOT}.jsonl.gz", target)
    return target


def test_a_note_is_added_listed_edited_and_deleted_beside_the_run(tmp_path, user_run):
    before = digest(user_run)
    log = read_run(user_run)
    node = next(n for n in log.nodes if n["status"] == "pruned")
    with client_for(tmp_path) as c:
        assert c.get("/api/runs/depot-review/notes").json()["notes"] == []
        r = c.post("/api/runs/depot-review/notes",
                   json={"node": node["id"], "text": "  Closed by the bound.  ", "author": "Ines"})
        assert r.status_code == 201, r.text
        note = r.json()
        # the step is filled in from the node: the order it was solved at
        assert (note["node"], note["order"], note["text"], note["author"]) == \
            (node["id"], node["order"], "Closed by the bound.", "Ines")
        by_step = c.post("/api/runs/depot-review/notes", json={"order": 0, "text": "root"}).json()
        assert by_step["node"] == log.nodes[0]["id"] and by_step["author"] == "reviewer"
        listed = c.get("/api/runs/depot-review/notes").json()
        assert [n["id"] for n in listed["notes"]] == [note["id"], by_step["id"]]
        assert listed["editable"] and listed["stored"] == "beside"

        edited = c.patch(f"/api/runs/depot-review/notes/{note['id']}",
                         json={"text": "Pruned: bound above the incumbent."}).json()
        assert edited["text"] == "Pruned: bound above the incumbent." and edited["edited"]
        assert c.delete(f"/api/runs/depot-review/notes/{by_step['id']}").status_code == 204
        assert [n["id"] for n in c.get("/api/runs/depot-review/notes").json()["notes"]] == \
            [note["id"]]

    side = sidecar.notes_path(user_run)
    doc = json.loads(side.read_text())
    assert (doc["format"], doc["version"]) == ("undergrowth-notes", 1)
    assert doc["run"]["file"] == user_run.name
    assert doc["notes"][0]["text"] == "Pruned: bound above the incumbent."
    assert digest(user_run) == before  # the run log itself is never modified
    assert not list(side.parent.glob("*.tmp"))  # atomic writes leave nothing behind


def test_a_note_must_name_a_node_and_step_that_agree(tmp_path, user_run):
    log = read_run(user_run)
    node = next(n for n in log.nodes if n["order"] not in (None, 0))
    with client_for(tmp_path) as c:
        r = c.post("/api/runs/depot-review/notes",
                   json={"node": node["id"], "order": 0, "text": "mismatch"})
        assert r.status_code == 422 and r.json()["error"]["detail"]["field"] == "order"
        r = c.post("/api/runs/depot-review/notes", json={"node": 0, "text": "   "})
        assert r.status_code == 422 and r.json()["error"]["detail"]["field"] == "text"


def test_a_sample_runs_notes_go_to_the_shelf_not_into_the_samples(tmp_path):
    sample = sample_dir() / f"{DEPOT}.jsonl.gz"
    with client_for(tmp_path) as c:
        r = c.post(f"/api/runs/{DEPOT}/notes", json={"node": 0, "text": "the root"})
        assert r.status_code == 201
        listed = c.get(f"/api/runs/{DEPOT}/notes").json()
        assert listed["stored"] == "shelf" and [n["text"] for n in listed["notes"]] == ["the root"]
    assert not sidecar.notes_path(sample).exists()
    shelved = list((tmp_path / "notes").glob("*.notes.json"))
    assert len(shelved) == 1 and shelved[0].name.startswith(sample.name)


def test_a_read_only_server_lists_notes_but_refuses_edits(tmp_path, user_run):
    sidecar.add_note(user_run, node=0, text="kept from the review")
    with client_for(tmp_path, read_only=True) as c:
        listed = c.get("/api/runs/depot-review/notes").json()
        assert [n["text"] for n in listed["notes"]] == ["kept from the review"]
        assert listed["editable"] is False
        r = c.post("/api/runs/depot-review/notes", json={"node": 0, "text": "more"})
        assert r.status_code == 403 and r.json()["error"]["code"] == "read-only"
        note_id = listed["notes"][0]["id"]
        assert c.delete(f"/api/runs/depot-review/notes/{note_id}").status_code == 403
    assert len(sidecar.read_notes(user_run)) == 1


def test_a_sidecar_of_another_run_is_refused_naming_the_field(tmp_path, user_run):
    other = tmp_path / "other.jsonl.gz"
    shutil.copy(sample_dir() / f"{OVEN}.jsonl.gz", other)
    sidecar.add_note(other, node=0, text="about the oven")
    shutil.copy(sidecar.notes_path(other), sidecar.notes_path(user_run))
    with client_for(tmp_path) as c:
        r = c.get("/api/runs/depot-review/notes")
        assert r.status_code == 422
        err = r.json()["error"]
        assert err["code"] == "bad-notes" and err["detail"]["field"] == "run"
    with pytest.raises(sidecar.NotesError, match="belongs to another run"):
        sidecar.read_notes(user_run)


def test_notes_added_at_once_from_many_threads_are_all_kept(user_run):
    def add(k: int) -> None:
        for j in range(5):
            sidecar.add_note(user_run, node=0, text=f"writer {k} note {j}")

    threads = [threading.Thread(target=add, args=(k,)) for k in range(8)]
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    texts = {n["text"] for n in sidecar.read_notes(user_run)}
    assert len(texts) == 40
