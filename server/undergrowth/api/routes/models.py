"""Models: list, one model's report, upload."""

from __future__ import annotations

import contextlib
from typing import Annotated, Any

import anyio
from fastapi import APIRouter, File, UploadFile

from ..context import Ctx, ServerContext
from ..errors import Conflict, Invalid, UnsupportedType
from ..ids import MODEL_SUFFIXES, check_id, fresh_id, id_from_filename
from ..model_files import ModelFile, validate_model_file
from ..schemas import ModelDetail, ModelItem
from ._common import errors, spool

router = APIRouter(prefix="/api/models", tags=["models"])

_SUMMARY = ("name", "rows", "columns", "integers", "binaries", "nonzeros", "sense",
            "quadratic", "convex")


def _item(ctx: ServerContext, mf: ModelFile) -> dict[str, Any]:
    size = mf.stamp()
    out: dict[str, Any] = {"id": mf.id, "source": mf.source, "file": mf.path.name,
                           "bytes": size[0] if size else 0, "error": None}
    try:
        report = ctx.models.report(mf)
    except Invalid as exc:
        return out | dict.fromkeys(_SUMMARY) | {"warnings": None, "error": exc.message}
    return out | {k: report.get(k) for k in _SUMMARY} | {"warnings": len(report["warnings"])}


@router.get("", response_model=list[ModelItem], responses=errors(),
            summary="every model: the samples' models and the writable models directory")
async def list_models(ctx: Ctx) -> list[dict[str, Any]]:
    def work() -> list[dict[str, Any]]:
        return [_item(ctx, mf) for mf in ctx.models.scan()]

    return await anyio.to_thread.run_sync(work)


def _detail(ctx: ServerContext, mf: ModelFile, report: dict[str, Any]) -> dict[str, Any]:
    size = mf.stamp()
    return {"id": mf.id, "source": mf.source, "file": mf.path.name,
            "bytes": size[0] if size else 0, "report": report}


@router.get("/{model_id}", response_model=ModelDetail, responses=errors(),
            summary="one model's size, coefficient ranges and formulation warnings")
async def get_model(model_id: str, ctx: Ctx) -> dict[str, Any]:
    check_id(model_id, what="model")
    mf = ctx.models.require(model_id)
    report = await anyio.to_thread.run_sync(ctx.models.report, mf)
    return _detail(ctx, mf, report)


@router.post("", status_code=201, response_model=ModelDetail,
             responses=errors(409, 413, 415),
             summary="upload a model (.mps, .qps, .mps.gz, .qps.gz, .json), validated")
async def upload_model(file: Annotated[UploadFile, File(description="the model file")],
                       ctx: Ctx) -> dict[str, Any]:
    name = file.filename or ""
    parts = id_from_filename(name, MODEL_SUFFIXES)
    if parts is None:
        raise UnsupportedType(
            f"{name or 'the file'}: a model must be one of {', '.join(MODEL_SUFFIXES)}",
            detail={"file": name, "accepted": list(MODEL_SUFFIXES)})
    base, suffix = parts
    tmp = await spool(file, ctx.models.models_dir, suffix)
    try:
        report = await anyio.to_thread.run_sync(
            lambda: validate_model_file(tmp, shown_as=name))
        for _ in range(10):  # another upload may take the same name at the same moment
            model_id = fresh_id(base, {m.id for m in ctx.models.scan()})
            with contextlib.suppress(FileExistsError):
                mf = ctx.models.place(tmp, model_id, suffix)
                break
        else:
            raise Conflict(f"no free id for {name!r}; try again", detail={"file": name})
    finally:
        tmp.unlink(missing_ok=True)
    report["file"] = mf.path.name
    return _detail(ctx, mf, report)
