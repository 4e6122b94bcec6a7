"""Runs: list, one run's summary, its tree, one node, bound series, upload, delete."""

from __future__ import annotations

import contextlib
import gzip
import math
import threading
import zlib
from datetime import UTC, datetime
from pathlib import Path
from typing import Annotated, Any, Literal

import anyio
from fastapi import APIRouter, File, Query, Request, UploadFile
from fastapi.responses import Response

from ...analysis.layout import layout_for_table, table_layout
from ...analysis.series import bound_series
from ...runlog.errors import RunLogError
from ..context import Ctx, ServerContext
from ..errors import Conflict, Invalid, NotFound, UnsupportedType
from ..groups import GroupStore
from ..ids import RUN_SUFFIXES, check_id, fresh_id, id_from_filename
from ..library import RunFile, read_header_line, summarise
from ..nodeinfo import node_detail
from ..schemas import Deleted, NodeDetail, RunDetail, RunItem, SeriesOut, UploadedRun
from ..status import ACTIVE_STATES, JobRecord
from ..treebin import encode_binary, encode_json, tree_columns, tree_meta
from ._common import errors, spool

router = APIRouter(prefix="/api/runs", tags=["runs"])


def _f(v: Any) -> float | None:
    if v is None:
        return None
    v = float(v)
    return v if math.isfinite(v) else None


def run_status(end: dict[str, Any] | None, job: JobRecord | None) -> str:
    if job is not None and job.state in ACTIVE_STATES:
        return job.state
    if end is not None:
        return str(end.get("status"))
    if job is not None:
        return job.state
    return "incomplete"


def _mtime_iso(path: Path) -> str | None:
    with contextlib.suppress(OSError):
        return datetime.fromtimestamp(path.stat().st_mtime, UTC).strftime("%Y-%m-%dT%H:%M:%SZ")
    return None


def _item(ctx: ServerContext, rf: RunFile) -> dict[str, Any]:
    job = ctx.jobs.get(rf.id) if rf.writable else None
    live = ctx.library.live(rf)
    size = rf.stamp()
    base: dict[str, Any] = {"id": rf.id, "source": rf.source, "live": live,
                            "bytes": size[0] if size else 0,
                            "job": job.state if job else None, "error": None}
    if live:  # a growing file: the job's own figures, not a full read
        header = read_header_line(rf.path) or {}
        model, settings = header.get("model") or {}, header.get("settings") or {}
        assert job is not None
        return base | _labels(rf.id, model.get("name") or job.model, settings, header) | {
            "nodes": job.nodes, "status": job.state, "gap": job.gap,
            "objective": job.objective, "dual_bound": job.dual_bound}
    try:
        table = ctx.library.open_table(rf)
    except Invalid as exc:
        return base | {"name": rf.id, "model": None, "branching": None, "select": None,
                       "nodes": 0, "status": "unreadable", "gap": None, "objective": None,
                       "dual_bound": None, "created": _mtime_iso(rf.path),
                       "error": exc.message}
    s = ctx.library.summary(rf)
    header = table.header
    out = base | _labels(rf.id, header["model"]["name"], header["settings"], header) | {
        "nodes": s["nodes"], "status": run_status(table.end, job), "gap": s["gap"],
        "objective": s["objective"], "dual_bound": s["dual_bound"]}
    if out["created"] is None:
        out["created"] = _mtime_iso(rf.path)
    return out


def _labels(run_id: str, model: str | None, settings: dict[str, Any],
            header: dict[str, Any]) -> dict[str, Any]:
    branching, select = settings.get("branching"), settings.get("select")
    name = header.get("name") if isinstance(header.get("name"), str) else None
    if name is None:
        name = f"{model} ({branching}, {select})" if model else run_id
    return {"name": name, "model": model, "branching": branching, "select": select,
            "created": header.get("started")}


def _pending_item(job: JobRecord) -> dict[str, Any]:
    """A queued (or just starting) solve whose run log does not exist yet."""
    s = job.settings
    return {"id": job.run_id, "name": f"{job.model} ({s.get('branching')}, {s.get('select')})",
            "model": job.model, "branching": s.get("branching"), "select": s.get("select"),
            "nodes": job.nodes, "status": job.state, "gap": None, "objective": None,
            "dual_bound": None, "created": job.created, "live": True, "source": "user",
            "bytes": 0, "job": job.state, "error": None}


def _list(ctx: ServerContext) -> list[dict[str, Any]]:
    files = ctx.library.scan()
    have = {rf.id for rf in files}
    items = [_item(ctx, rf) for rf in files]
    items += [_pending_item(j) for j in ctx.jobs.list()
              if j.state in ACTIVE_STATES and j.run_id not in have]
    groups = GroupStore(ctx.runs_dir).membership()  # comparison groups (routes/compare.py)
    for item in items:
        item["group"] = groups.get(item["id"])
    items.sort(key=lambda i: (i["created"] or "", i["id"]), reverse=True)
    return items


@router.get("", response_model=list[RunItem], responses=errors(),
            summary="every run in the samples and the writable runs directory")
async def list_runs(ctx: Ctx) -> list[dict[str, Any]]:
    return await anyio.to_thread.run_sync(_list, ctx)


def _find_or_pending(ctx: ServerContext, run_id: str) -> tuple[RunFile | None, JobRecord | None]:
    rf = ctx.library.find(run_id)
    job = ctx.jobs.get(run_id)
    if rf is None and (job is None or job.state not in ACTIVE_STATES):
        raise NotFound(f"no run {run_id!r}", detail={"id": run_id})
    if rf is not None and not rf.writable:
        job = None  # a sample is never a job, whatever the user directory holds
    return rf, job


def _detail(ctx: ServerContext, run_id: str) -> dict[str, Any]:
    rf, job = _find_or_pending(ctx, run_id)
    job_out = None if job is None else job.to_dict()
    if rf is None:
        assert job is not None
        return {"id": run_id, "source": "user", "live": True, "status": job.state,
                "job": job_out, "header": None, "summary": None, "end": None, "warnings": []}
    table = ctx.library.open_table(rf)
    summary = summarise(table) if ctx.library.live(rf) else ctx.library.summary(rf)
    return {"id": rf.id, "source": rf.source, "live": ctx.library.live(rf),
            "status": run_status(table.end, job), "job": job_out, "header": table.header,
            "summary": summary, "end": table.end, "warnings": table.warnings}


@router.get("/{run_id}", response_model=RunDetail, responses=errors(),
            summary="one run: header, summary figures, warnings")
async def get_run(run_id: str, ctx: Ctx) -> dict[str, Any]:
    check_id(run_id)
    return await anyio.to_thread.run_sync(_detail, ctx, run_id)


def _tree(ctx: ServerContext, rf: RunFile, fmt: str | None) -> tuple[bytes, str]:
    table = ctx.library.open_table(rf)
    live = ctx.library.live(rf)
    if live:
        layout = table_layout(table)
    else:
        layout = layout_for_table(table, cache_file=ctx.library.cache_file(rf, ".layout.npz"))
    if fmt is None:
        fmt = "json" if len(table) <= ctx.settings.tree_json_nodes else "bin"
    columns = tree_columns(table, layout)
    meta = tree_meta(table, layout, run_id=rf.id, live=live)
    if fmt == "bin":
        return encode_binary(columns, meta), "application/octet-stream"
    return encode_json(columns, meta), "application/json"


_TREE_CONTENT = {"application/json": {"schema": {"type": "object"}},
                 "application/octet-stream": {"schema": {"type": "string", "format": "binary"}}}


@router.get("/{run_id}/tree", response_class=Response, responses={
    200: {"description": "the tree's columns (docs/api.md: 'Tree layout')",
          "content": _TREE_CONTENT}, **errors()},
            summary="the tree as columns: JSON, or the compact binary layout")
async def get_tree(
    run_id: str,
    ctx: Ctx,
    request: Request,
    format: Annotated[Literal["json", "bin"] | None, Query(
        description="json or bin; default json up to tree_json_nodes nodes, else bin")] = None,
) -> Response:
    check_id(run_id)
    rf = ctx.library.require(run_id)
    gzip_ok = "gzip" in request.headers.get("accept-encoding", "").lower()
    body, media, encoded = await anyio.to_thread.run_sync(_tree_body, ctx, rf, format, gzip_ok)
    headers = {"Content-Encoding": "gzip", "Vary": "Accept-Encoding"} if encoded else None
    return Response(body, media_type=media, headers=headers)


# Compressed tree bodies per (run, file version, format): the arrays of a large
# finished run are sent many times (each viewer, each reload) and gzip is most of
# the cost, so it is done once, off the event loop, at a fast level.
_GZIP_LEVEL = 1
_GZIP_KEEP = 8  # bodies kept (a handful of large runs)
_gzip_lock = threading.Lock()


def _gzip_memo(ctx: ServerContext) -> dict[tuple[str, str, object, str], tuple[bytes, str]]:
    """This app's memo (one per server context, so apps never share bodies)."""
    memo = getattr(ctx, "_tree_gzip", None)
    if memo is None:
        memo = {}
        object.__setattr__(ctx, "_tree_gzip", memo)
    return memo


def _tree_body(ctx: ServerContext, rf: RunFile, fmt: str | None, gzip_ok: bool
               ) -> tuple[bytes, str, bool]:
    """(body, media type, gzip-encoded?) for the tree route."""
    live = ctx.library.live(rf)
    key = (rf.source, rf.id, rf.stamp(), str(fmt))
    if gzip_ok and not live:
        with _gzip_lock:
            hit = _gzip_memo(ctx).get(key)
        if hit is not None:
            return hit[0], hit[1], True
    body, media = _tree(ctx, rf, fmt)
    if not gzip_ok or len(body) < 1024:
        return body, media, False
    packed = gzip.compress(body, compresslevel=_GZIP_LEVEL)
    if not live:
        with _gzip_lock:
            memo = _gzip_memo(ctx)
            if len(memo) >= _GZIP_KEEP:
                memo.pop(next(iter(memo)))
            memo[key] = (packed, media)
    return packed, media, True


def _node(ctx: ServerContext, rf: RunFile, node_id: int) -> dict[str, Any]:
    table = ctx.library.open_table(rf)
    try:
        row = table.row_of(node_id)
    except KeyError:
        raise NotFound(f"run {rf.id!r} has no node {node_id}",
                       detail={"id": rf.id, "node": node_id}) from None
    extras = ctx.extras(rf)
    return {"run": rf.id, **node_detail(table, extras, row)}


@router.get("/{run_id}/nodes/{node_id}", response_model=NodeDetail, responses=errors(),
            summary="one node: its event, the path from the root, children, and why")
async def get_node(run_id: str, node_id: int,
                   ctx: Ctx) -> dict[str, Any]:
    check_id(run_id)
    rf = ctx.library.require(run_id)
    return await anyio.to_thread.run_sync(_node, ctx, rf, node_id)


def _series(ctx: ServerContext, rf: RunFile, axis: str, points: int) -> dict[str, Any]:
    table = ctx.library.open_table(rf)
    s = bound_series(table, axis=axis, points=points)

    def line(series: Any) -> dict[str, list[float]]:
        return {"x": series.x.tolist(), "y": series.y.tolist()}

    inc = s.incumbents
    marks = [{"order": None if int(inc.order[i]) < 0 else int(inc.order[i]),
              "time": float(inc.time[i]), "objective": float(inc.objective[i]),
              "source": inc.source[i], "node": None if int(inc.node[i]) < 0 else int(inc.node[i])}
             for i in range(len(inc.time))]
    return {"run": rf.id, "axis": axis, "points": points, "sense": table.sense,
            "primal": line(s.primal), "dual": line(s.dual), "gap": line(s.gap),
            "incumbents": marks}


@router.get("/{run_id}/series", response_model=SeriesOut, responses=errors(),
            summary="primal, dual and gap over nodes or time, at most N points each")
async def get_series(
    run_id: str,
    ctx: Ctx,
    x: Annotated[Literal["nodes", "time"], Query(description="the x axis")] = "nodes",
    points: Annotated[int, Query(ge=2, le=100_000, description="most points per line")] = 1000,
) -> dict[str, Any]:
    check_id(run_id)
    rf = ctx.library.require(run_id)
    return await anyio.to_thread.run_sync(_series, ctx, rf, x, points)


# ------------------------------------------------------------------------ writes
def _validate_run(tmp: Path, suffix: str, shown_as: str) -> tuple[Path, str, int, list[str]]:
    """Strict validation of an uploaded run; a CSV node table becomes a .jsonl.gz run log."""
    from ...runlog.csvtable import import_csv
    from ...runlog.reader import RunLogReader

    source = tmp
    try:
        if suffix == ".csv":
            tmp = source.with_name(source.name[: -len(".csv")] + ".jsonl.gz")
            try:
                import_csv(source, tmp)
            finally:
                source.unlink(missing_ok=True)
            suffix = ".jsonl.gz"
        reader = RunLogReader(tmp)
        nodes = sum(1 for ev in reader if ev.get("kind") == "node")
    except RunLogError as exc:
        tmp.unlink(missing_ok=True)
        where = shown_as + (f", line {exc.line}" if exc.line is not None else "") + (
            f", field {exc.field!r}" if exc.field else "")
        raise Invalid(f"{where}: {exc.reason}", code="invalid-run",
                      detail={"file": shown_as, "line": exc.line, "field": exc.field}) from None
    except (ValueError, OSError, EOFError, zlib.error) as exc:  # not text, damaged gzip...
        tmp.unlink(missing_ok=True)
        raise Invalid(f"{shown_as}: cannot be read as a run ({exc})", code="invalid-run",
                      detail={"file": shown_as, "line": None, "field": None}) from None
    return tmp, suffix, nodes, reader.warnings


@router.post("", status_code=201, response_model=UploadedRun, responses=errors(409, 413, 415),
             summary="upload a run log (.jsonl, .jsonl.gz) or CSV node table (.csv)")
async def upload_run(file: Annotated[UploadFile, File(description="the run file")],
                     ctx: Ctx) -> dict[str, Any]:
    name = file.filename or ""
    parts = id_from_filename(name, RUN_SUFFIXES)
    if parts is None:
        raise UnsupportedType(f"{name or 'the file'}: a run must be .jsonl, .jsonl.gz or .csv",
                              detail={"file": name, "accepted": list(RUN_SUFFIXES)})
    base, suffix = parts
    tmp = await spool(file, ctx.runs_dir, suffix)
    try:
        tmp, suffix, nodes, warnings = await anyio.to_thread.run_sync(
            _validate_run, tmp, suffix, name)
        for _ in range(10):  # another upload may take the same name at the same moment
            run_id = fresh_id(base, ctx.library.taken_ids() | set(ctx.jobs.records))
            with contextlib.suppress(FileExistsError):
                rf = ctx.library.place(tmp, run_id, suffix)
                break
        else:
            raise Conflict(f"no free id for {name!r}; try again", detail={"file": name})
    finally:
        tmp.unlink(missing_ok=True)
    size = rf.stamp()
    return {"id": rf.id, "source": "user", "bytes": size[0] if size else 0, "nodes": nodes,
            "warnings": warnings}


@router.delete("/{run_id}", response_model=Deleted, responses=errors(409),
               summary="delete a run from the writable directory (samples: 403)")
async def delete_run(run_id: str, ctx: Ctx) -> dict[str, Any]:
    check_id(run_id)
    rf = ctx.library.require(run_id)
    ctx.library.delete(rf)
    ctx.jobs.forget(run_id)
    return {"id": run_id, "deleted": True}
