"""Reviewer notes: a versioned sidecar file beside a run log (the run log is never touched).

A run ``plant.jsonl.gz`` keeps its notes in ``plant.jsonl.gz.notes.json``::

    {"format": "undergrowth-notes", "version": 1,
     "run": {"file": "plant.jsonl.gz", "first_line_sha256": "..."},
     "notes": [{"kind": "note", "id": "3f9c0a1b", "node": 4, "order": 3,
                "author": "Ines", "text": "...", "created": "2026-...Z",
                "edited": "2026-...Z"}, ...]}

``run`` ties the sidecar to one run: the run file's name and a SHA-256 of its
first (decompressed) line, which never changes once written (so a run that is
still growing keeps its identity). A sidecar whose identity does not match its
run is refused rather than attached to the wrong nodes.

Runs whose folder must not be written (the bundled samples) keep their notes on
a *shelf*: a writable folder (the server uses ``notes`` beside its runs
directory; the default is ``notes`` beside `user_runs_dir()`), under the run's
file name plus a short hash of the run's folder, so two folders holding a run of
the same name never share notes. A shelf copy, once it exists, wins over a
sidecar shipped beside the run; the first edit copies the shipped notes over.

Writes are atomic (a temporary file, then `os.replace`) and serialised by a
lock (a thread lock, plus an advisory lock on the folder where the platform has one) so
two edits at once cannot lose each other's note. Standard library only.
"""

from __future__ import annotations

import contextlib
import gzip
import hashlib
import json
import os
import secrets
import tempfile
import threading
from collections.abc import Iterator
from datetime import UTC, datetime
from pathlib import Path
from typing import Any

try:  # advisory locks between processes (a CLI next to a server); POSIX only
    import fcntl
except ImportError:  # pragma: no cover - Windows
    fcntl = None  # type: ignore[assignment]

__all__ = [
    "MAX_AUTHOR", "MAX_TEXT", "NOTES_FORMAT", "NOTES_VERSION", "NoteNotFound", "NotesError",
    "add_note", "default_shelf", "delete_note", "edit_note", "find_notes", "notes_path",
    "read_notes", "run_identity", "shelf_path",
]

NOTES_FORMAT = "undergrowth-notes"
NOTES_VERSION = 1
SUFFIX = ".notes.json"
MAX_TEXT = 4000  # characters: a paragraph or two, not an essay
MAX_AUTHOR = 80
MAX_NOTES = 5000  # per run: beyond this a sidecar is more likely a mistake than a review
DEFAULT_AUTHOR = "reviewer"

_locks: dict[str, threading.Lock] = {}
_locks_guard = threading.Lock()


class NotesError(ValueError):
    """A sidecar (or a note given to it) cannot be used: ``path`` and ``field`` say where."""

    def __init__(self, message: str, *, path: str, field: str | None = None) -> None:
        self.path = path
        self.field = field
        self.reason = message
        where = path + (f", field {field!r}" if field else "")
        super().__init__(f"{where}: {message}")


class NoteNotFound(KeyError):
    """No note with that id in the run's sidecar."""

    def __init__(self, note_id: str) -> None:
        super().__init__(note_id)
        self.note_id = note_id


# ---------------------------------------------------------------- where notes live
def notes_path(run_path: Path) -> Path:
    """The sidecar beside the run: ``<run file name>.notes.json``."""
    run_path = Path(run_path)
    return run_path.with_name(run_path.name + SUFFIX)


def default_shelf() -> Path:
    """Where notes of runs in folders that must not be written go by default."""
    from ..paths import user_runs_dir  # late: keeps this module free of settings at import

    return user_runs_dir().parent / "notes"


def shelf_path(run_path: Path, shelf: Path) -> Path:
    """The shelf copy of a run's notes: the file name plus a hash of the run's folder."""
    run_path = Path(run_path)
    folder = str(run_path.resolve().parent).encode("utf-8")
    tag = hashlib.sha256(folder).hexdigest()[:10]
    return Path(shelf) / f"{run_path.name}.{tag}{SUFFIX}"


def find_notes(run_path: Path, *, shelf: Path | None = None) -> Path | None:
    """The sidecar that holds the run's notes now: the shelf copy if there is one
    (``shelf`` defaults to `default_shelf()`), else the one beside the run, else None."""
    shelved = shelf_path(run_path, shelf if shelf is not None else default_shelf())
    if shelved.is_file():
        return shelved
    beside = notes_path(run_path)
    return beside if beside.is_file() else None


def run_identity(run_path: Path) -> dict[str, str]:
    """What ties a sidecar to its run: the file name and a hash of its first line."""
    run_path = Path(run_path)
    with open(run_path, "rb") as f:
        magic = f.read(2)
    opener: Any = gzip.open if magic == b"\x1f\x8b" else open
    try:
        with opener(run_path, "rb") as f:
            first = f.readline(1 << 20)
    except (OSError, EOFError) as exc:
        raise NotesError(f"the run file cannot be read ({exc})", path=str(run_path)) from None
    return {"file": run_path.name,
            "first_line_sha256": hashlib.sha256(first.rstrip(b"\r\n")).hexdigest()}


# ---------------------------------------------------------------- reading
def read_notes(run_path: Path, *, shelf: Path | None = None) -> list[dict[str, Any]]:
    """The run's notes, oldest first; [] when it has none. A bad sidecar raises
    `NotesError` naming the file and the field."""
    path = find_notes(run_path, shelf=shelf)
    if path is None:
        return []
    return _load(path, run_path)["notes"]


def _load(path: Path, run_path: Path) -> dict[str, Any]:
    where = str(path)
    try:
        raw = path.read_bytes()
    except OSError as exc:
        raise NotesError(f"cannot be read ({exc.strerror})", path=where) from None
    try:
        doc = json.loads(raw)
    except (UnicodeDecodeError, json.JSONDecodeError) as exc:
        raise NotesError(f"is not valid JSON ({exc})", path=where) from None
    if not isinstance(doc, dict):
        raise NotesError("must hold a JSON object", path=where)
    if doc.get("format") != NOTES_FORMAT:
        raise NotesError(f"format must be {NOTES_FORMAT!r}, not {doc.get('format')!r}",
                         path=where, field="format")
    if doc.get("version") != NOTES_VERSION:
        raise NotesError(f"version {doc.get('version')!r} is not supported (this reader "
                         f"knows version {NOTES_VERSION})", path=where, field="version")
    run = doc.get("run")
    if not isinstance(run, dict) or not isinstance(run.get("first_line_sha256"), str):
        raise NotesError("must say which run it belongs to ({file, first_line_sha256})",
                         path=where, field="run")
    if run.get("first_line_sha256") != run_identity(run_path)["first_line_sha256"]:
        raise NotesError(f"belongs to another run (recorded for {run.get('file')!r}; the run "
                         f"{Path(run_path).name!r} has a different first line)",
                         path=where, field="run")
    notes = doc.get("notes")
    if not isinstance(notes, list):
        raise NotesError("must be a list", path=where, field="notes")
    seen: set[str] = set()
    for k, note in enumerate(notes):
        _check_note(note, where, f"notes[{k}]")
        if note["id"] in seen:
            raise NotesError(f"id {note['id']!r} appears twice", path=where,
                             field=f"notes[{k}].id")
        seen.add(note["id"])
    return doc


def _check_note(note: Any, where: str, at: str) -> None:
    if not isinstance(note, dict):
        raise NotesError("must be an object", path=where, field=at)
    if note.get("kind") != "note":
        raise NotesError("kind must be 'note'", path=where, field=f"{at}.kind")
    for key in ("id", "author", "text", "created"):
        if not isinstance(note.get(key), str):
            raise NotesError("must be a string", path=where, field=f"{at}.{key}")
    for key in ("node", "order"):
        value = note.get(key)
        if value is not None and (not isinstance(value, int) or isinstance(value, bool)
                                  or value < 0):
            raise NotesError("must be a non-negative integer or null", path=where,
                             field=f"{at}.{key}")
    if note.get("node") is None and note.get("order") is None:
        raise NotesError("a note names a node or a step (order)", path=where, field=at)
    if "edited" in note and not isinstance(note["edited"], str):
        raise NotesError("must be a string", path=where, field=f"{at}.edited")


# ---------------------------------------------------------------- writing
def add_note(run_path: Path, *, text: str, node: int | None = None, order: int | None = None,
             author: str | None = None, shelve: bool = False,
             shelf: Path | None = None) -> dict[str, Any]:
    """Attach a note to a node and/or a step; returns the stored note.

    ``shelve``: keep the notes on the shelf (the run's folder must not be written)."""
    note = {"kind": "note", "id": "", "node": node, "order": order,
            "author": _clean_author(author), "text": _clean_text(text), "created": _now()}
    _check_note({**note, "id": "x"}, "note", "note")
    with _editing(run_path, shelve=shelve, shelf=shelf) as doc:
        if len(doc["notes"]) >= MAX_NOTES:
            raise NotesError(f"already holds {MAX_NOTES} notes, the most one run keeps",
                             path=str(run_path), field="notes")
        taken = {n["id"] for n in doc["notes"]}
        note["id"] = _fresh_id(taken)
        doc["notes"].append(note)
    return note


def edit_note(run_path: Path, note_id: str, *, text: str | None = None,
              author: str | None = None, shelve: bool = False,
              shelf: Path | None = None) -> dict[str, Any]:
    """Change a note's text and/or author; stamps ``edited``. `NoteNotFound` if absent."""
    new_text = None if text is None else _clean_text(text)
    new_author = None if author is None else _clean_author(author)
    with _editing(run_path, shelve=shelve, shelf=shelf) as doc:
        for note in doc["notes"]:
            if note["id"] == note_id:
                if new_text is not None:
                    note["text"] = new_text
                if new_author is not None:
                    note["author"] = new_author
                note["edited"] = _now()
                return dict(note)
        raise NoteNotFound(note_id)


def delete_note(run_path: Path, note_id: str, *, shelve: bool = False,
                shelf: Path | None = None) -> None:
    """Remove a note. `NoteNotFound` if absent."""
    with _editing(run_path, shelve=shelve, shelf=shelf) as doc:
        kept = [n for n in doc["notes"] if n["id"] != note_id]
        if len(kept) == len(doc["notes"]):
            raise NoteNotFound(note_id)
        doc["notes"] = kept


@contextlib.contextmanager
def _editing(run_path: Path, *, shelve: bool, shelf: Path | None) -> Iterator[dict[str, Any]]:
    """Lock the run's sidecar, yield its document, write it back atomically (only when
    the block ends without an exception)."""
    run_path = Path(run_path)
    if not run_path.is_file():
        raise NotesError("no such run file", path=str(run_path))
    shelf = shelf if shelf is not None else default_shelf()
    target = shelf_path(run_path, shelf) if shelve else notes_path(run_path)
    target.parent.mkdir(parents=True, exist_ok=True)
    with _lock(target):
        current = find_notes(run_path, shelf=shelf) if shelve else (
            target if target.is_file() else None)
        if current is not None:
            doc = _load(current, run_path)
        else:
            doc = {"format": NOTES_FORMAT, "version": NOTES_VERSION,
                   "run": run_identity(run_path), "notes": []}
        yield doc
        _write(target, doc)


@contextlib.contextmanager
def _lock(target: Path) -> Iterator[None]:
    key = str(target.resolve())
    with _locks_guard:
        lock = _locks.setdefault(key, threading.Lock())
    with lock:
        if fcntl is None:
            yield
            return
        # Lock the folder itself: no lock file is left lying beside the run.
        fd = os.open(target.parent, os.O_RDONLY)
        try:
            fcntl.flock(fd, fcntl.LOCK_EX)
            yield
        finally:
            os.close(fd)  # closing releases the lock


def _write(target: Path, doc: dict[str, Any]) -> None:
    data = json.dumps(doc, ensure_ascii=False, indent=1).encode("utf-8") + b"\n"
    fd, tmp = tempfile.mkstemp(prefix=target.name + ".", suffix=".tmp", dir=target.parent)
    try:
        with os.fdopen(fd, "wb") as f:
            f.write(data)
            f.flush()
            os.fsync(f.fileno())
        os.replace(tmp, target)
    except BaseException:
        with contextlib.suppress(OSError):
            os.unlink(tmp)
        raise


def _clean_text(text: Any) -> str:
    if not isinstance(text, str) or not text.strip():
        raise NotesError("a note needs some text", path="note", field="text")
    text = text.strip()
    if len(text) > MAX_TEXT:
        raise NotesError(f"is {len(text)} characters long; at most {MAX_TEXT} are kept",
                         path="note", field="text")
    return text


def _clean_author(author: Any) -> str:
    if author is None or (isinstance(author, str) and not author.strip()):
        return DEFAULT_AUTHOR
    if not isinstance(author, str):
        raise NotesError("must be a string", path="note", field="author")
    author = " ".join(author.split())
    if len(author) > MAX_AUTHOR:
        raise NotesError(f"is {len(author)} characters long; at most {MAX_AUTHOR} are kept",
                         path="note", field="author")
    return author


def _fresh_id(taken: set[str]) -> str:
    while True:
        candidate = secrets.token_hex(4)
        if candidate not in taken:
            return candidate


def _now() -> str:
    return datetime.now(UTC).strftime("%Y-%m-%dT%H:%M:%SZ")
