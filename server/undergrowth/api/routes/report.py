"""The review report of one or more runs as a downloadable HTML file (the page that
`undergrowth report` writes, built by the same function)."""

from __future__ import annotations

from typing import Annotated

import anyio
from fastapi import APIRouter, Query
from fastapi.responses import Response

from ...analysis.layout import layout_for_table, table_layout
from ...report import ReportRun, build_report
from ..context import Ctx, ServerContext
from ..errors import BadRequest
from ..ids import check_id
from ..library import RunFile
from ._common import errors
from .findings import _problem_for  # the model library lookup the findings use
from .notes import run_notes  # where this server keeps notes (its shelf for samples)

router = APIRouter(prefix="/api", tags=["report"])

# A report of more runs than this is a comparison study: `undergrowth compare` is
# the tool for it, and each run adds its tree picture to the page.
MAX_RUNS = 12


def _run(ctx: ServerContext, rf: RunFile) -> ReportRun:
    table = ctx.library.open_table(rf)
    live = ctx.library.live(rf)
    layout = (table_layout(table) if live else
              layout_for_table(table, cache_file=ctx.library.cache_file(rf, ".layout.npz")))
    name = str((table.header.get("model") or {}).get("name") or "")
    model_id, problem = _problem_for(ctx, name) if name else (None, None)
    columns = int((table.header.get("model") or {}).get("columns") or 0)
    if problem is not None and columns and problem.num_cols != columns:
        model_id, problem = None, None  # same name, different model: skip its checks
    note = (f"model checks from the model library's {model_id!r}" if problem is not None
            else "model checks skipped: the model library holds no model of this name and size")
    return ReportRun(table=table, label=rf.id, problem=problem, model_note=note,
                     notes=run_notes(ctx, rf), layout=layout)


def _build(ctx: ServerContext, files: list[RunFile]) -> bytes:
    return build_report([_run(ctx, rf) for rf in files]).encode("utf-8")


_HTML = {"text/html": {"schema": {"type": "string"}}}


@router.get("/report", response_class=Response, responses={
    200: {"description": "the report page, as an attachment (docs/report.md)",
          "content": _HTML}, **errors()},
            summary="one self-contained HTML review of one or more runs")
async def get_report(
    ctx: Ctx,
    run: Annotated[list[str], Query(
        description=f"run id; repeat for several runs (at most {MAX_RUNS}), in page order")],
) -> Response:
    ids = list(dict.fromkeys(run))  # the same run twice is shown once
    for run_id in ids:
        check_id(run_id)
    if len(ids) > MAX_RUNS:
        raise BadRequest(f"run: at most {MAX_RUNS} runs in one report, got {len(ids)}",
                         code="too-many-runs", detail={"field": "run", "limit": MAX_RUNS})
    files = [ctx.library.require(run_id) for run_id in ids]
    body = await anyio.to_thread.run_sync(_build, ctx, files)
    stem = ids[0] if len(ids) == 1 else f"{ids[0]}-and-{len(ids) - 1}-more"
    return Response(body, media_type="text/html; charset=utf-8", headers={
        "Content-Disposition": f'attachment; filename="report-{stem}.html"'})
