"""Reviewer notes of a run: list, add, edit, delete (the sidecar lives in runlog.notes).

A user run keeps its notes beside its file. A bundled sample's folder is never
written, so its notes go to the shelf: ``notes`` beside the writable runs
directory. A read-only server lists notes; the access middleware refuses every
write under /api with 403 ``read-only`` before these routes run.
"""

from __future__ import annotations

import re
from pathlib import Path
from typing import Any

import anyio
from fastapi import APIRouter, Response
from pydantic import BaseModel, Field

from ...runlog import notes as sidecar
from ..context import Ctx, ServerContext
from ..errors import Invalid, NotFound
from ..ids import check_id
from ..library import RunFile
from ._common import errors

__all__ = ["notes_shelf", "router", "run_notes"]

router = APIRouter(prefix="/api/runs", tags=["notes"])
_NOTE_ID = r"^[A-Za-z0-9_-]{1,64}$"


class Note(BaseModel):
    kind: str = "note"
    id: str
    node: int | None
    order: int | None
    author: str
    text: str
    created: str
    edited: str | None = None


class NotesOut(BaseModel):
    run: str
    notes: list[Note]
    editable: bool  # False on a read-only server
    stored: str  # "beside" the run file, or on the server's "shelf" (bundled samples)


class NoteIn(BaseModel):
    text: str = Field(max_length=sidecar.MAX_TEXT + 100)
    node: int | None = Field(default=None, ge=0)
    order: int | None = Field(default=None, ge=0)
    author: str | None = Field(default=None, max_length=sidecar.MAX_AUTHOR + 20)


class NoteEdit(BaseModel):
    text: str | None = Field(default=None, max_length=sidecar.MAX_TEXT + 100)
    author: str | None = Field(default=None, max_length=sidecar.MAX_AUTHOR + 20)


def notes_shelf(ctx: ServerContext) -> Path:
    """Where this server keeps notes of runs whose folder it must not write."""
    return ctx.runs_dir.parent / "notes"


def _shelve(rf: RunFile) -> bool:
    return not rf.writable


def run_notes(ctx: ServerContext, rf: RunFile) -> list[dict[str, Any]]:
    """The run's notes as this server stores them (blocking). A bad sidecar → 422."""
    try:
        return sidecar.read_notes(rf.path, shelf=notes_shelf(ctx))
    except sidecar.NotesError as exc:
        raise _bad_sidecar(rf, exc) from None


def _bad_sidecar(rf: RunFile, exc: sidecar.NotesError) -> Invalid:
    name = Path(exc.path).name
    field = f", field {exc.field!r}" if exc.field else ""
    return Invalid(f"the notes of run {rf.id!r} cannot be read: {name}{field}: {exc.reason}",
                   code="bad-notes", detail={"id": rf.id, "file": name, "field": exc.field})


def _bad_note(exc: sidecar.NotesError) -> Invalid:
    return Invalid(f"{exc.field or 'note'}: {exc.reason}", code="invalid-note",
                   detail={"field": exc.field})


def _fill(ctx: ServerContext, rf: RunFile, node: int | None,
          order: int | None) -> tuple[int | None, int | None]:
    """A note names a node, a step (processing order), or both; fill in the other and
    check both exist in the run."""
    if node is None and order is None:
        raise Invalid("a note needs a node or an order (a step)", code="invalid-note",
                      detail={"field": "node"})
    table = ctx.library.open_table(rf)
    c = table.columns
    if node is not None:
        try:
            row = table.row_of(node)
        except KeyError:
            raise Invalid(f"run {rf.id!r} has no node {node}",
                          code="invalid-note", detail={"field": "node", "node": node}) from None
        solved = int(c["order"][row])
        if order is None:
            order = solved if solved >= 0 else None
        elif solved != order:
            raise Invalid(f"node {node} was solved at order {solved}, not {order}",
                          code="invalid-note",
                          detail={"field": "order", "node": node, "order": order})
    else:
        rows = (c["order"] == order).nonzero()[0]
        if not len(rows):
            raise Invalid(f"run {rf.id!r} has no step with order {order}",
                          code="invalid-note", detail={"field": "order", "order": order})
        node = int(c["id"][rows[0]])
    return node, order


def _stored(ctx: ServerContext, rf: RunFile) -> str:
    return "shelf" if _shelve(rf) else "beside"


@router.get("/{run_id}/notes", response_model=NotesOut, responses=errors(),
            summary="the reviewers' notes on a run, oldest first")
async def list_notes(run_id: str, ctx: Ctx) -> dict[str, Any]:
    check_id(run_id)
    rf = ctx.library.require(run_id)
    notes = await anyio.to_thread.run_sync(run_notes, ctx, rf)
    return {"run": rf.id, "notes": notes, "editable": not ctx.settings.read_only,
            "stored": _stored(ctx, rf)}


def _add(ctx: ServerContext, rf: RunFile, body: NoteIn) -> dict[str, Any]:
    node, order = _fill(ctx, rf, body.node, body.order)  # the text is the sidecar's to check
    try:
        return sidecar.add_note(rf.path, text=body.text, node=node, order=order,
                                author=body.author, shelve=_shelve(rf), shelf=notes_shelf(ctx))
    except sidecar.NotesError as exc:
        raise (_bad_note(exc) if exc.path == "note" else _bad_sidecar(rf, exc)) from None


@router.post("/{run_id}/notes", response_model=Note, status_code=201,
             responses=errors(403, 413),
             summary="add a note to a node or a step (the run log is not changed)")
async def post_note(run_id: str, body: NoteIn, ctx: Ctx) -> dict[str, Any]:
    check_id(run_id)
    rf = ctx.library.require(run_id)
    return await anyio.to_thread.run_sync(_add, ctx, rf, body)


def _edit(ctx: ServerContext, rf: RunFile, note_id: str, body: NoteEdit | None) -> Any:
    try:
        if body is None:
            sidecar.delete_note(rf.path, note_id, shelve=_shelve(rf), shelf=notes_shelf(ctx))
            return None
        return sidecar.edit_note(rf.path, note_id, text=body.text, author=body.author,
                                 shelve=_shelve(rf), shelf=notes_shelf(ctx))
    except sidecar.NoteNotFound:
        raise NotFound(f"run {rf.id!r} has no note {note_id!r}",
                       detail={"id": rf.id, "note": note_id}) from None
    except sidecar.NotesError as exc:
        raise (_bad_note(exc) if exc.path == "note" else _bad_sidecar(rf, exc)) from None


def _check_note_id(note_id: str) -> None:
    if not re.fullmatch(_NOTE_ID, note_id):
        raise NotFound(f"no note {note_id!r}", detail={"note": note_id})


@router.patch("/{run_id}/notes/{note_id}", response_model=Note, responses=errors(403),
              summary="change a note's text or author")
async def patch_note(run_id: str, note_id: str, body: NoteEdit, ctx: Ctx) -> dict[str, Any]:
    check_id(run_id)
    _check_note_id(note_id)
    rf = ctx.library.require(run_id)
    return await anyio.to_thread.run_sync(_edit, ctx, rf, note_id, body)


@router.delete("/{run_id}/notes/{note_id}", status_code=204, responses=errors(403),
               response_class=Response, summary="remove a note")
async def delete_note(run_id: str, note_id: str, ctx: Ctx) -> Response:
    check_id(run_id)
    _check_note_id(note_id)
    rf = ctx.library.require(run_id)
    await anyio.to_thread.run_sync(_edit, ctx, rf, note_id, None)
    return Response(status_code=204)
