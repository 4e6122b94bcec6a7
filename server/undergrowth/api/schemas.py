"""The shapes the API sends and accepts (pydantic models: they also make /openapi.json)."""

from __future__ import annotations

from typing import Any, Literal

from pydantic import BaseModel, ConfigDict, Field

from ..search import BRANCHING_RULES, NODE_ORDERS

Source = Literal["samples", "user"]
JobState = Literal["queued", "running", "finished", "failed", "cancelled", "interrupted"]
Branching = Literal[BRANCHING_RULES]  # type: ignore[valid-type]
NodeOrder = Literal[NODE_ORDERS]  # type: ignore[valid-type]


class ErrorInfo(BaseModel):
    code: str = Field(description="short stable word, e.g. not-found, invalid-run, read-only")
    message: str = Field(description="a sentence for people")
    detail: dict[str, Any] = Field(description="extra facts: line, field, token, errors, ...")


class ErrorBody(BaseModel):
    error: ErrorInfo


class Directory(BaseModel):
    source: Source
    path: str
    writable: bool


class SolveSlots(BaseModel):
    running: int
    queued: int
    max_running: int
    max_queued: int


class Health(BaseModel):
    status: Literal["ok"]
    version: str
    read_only: bool
    token_required: bool
    runs_dirs: list[Directory]
    models_dirs: list[Directory]
    solves: SolveSlots
    limits: dict[str, float]


class Job(BaseModel):
    run_id: str
    model: str
    settings: dict[str, Any]
    state: JobState
    reason: str | None
    file: str | None
    created: str
    started: str | None
    finished: str | None
    pid: int | None
    nodes: int
    end_status: str | None
    objective: float | None
    dual_bound: float | None
    gap: float | None
    capped: list[str]


class RunItem(BaseModel):
    id: str
    name: str
    model: str | None
    branching: str | None
    select: str | None
    nodes: int
    status: str = Field(description="the end status, or the job state while there is no end")
    gap: float | None
    objective: float | None
    dual_bound: float | None
    created: str | None
    live: bool
    source: Source
    bytes: int
    job: JobState | None
    error: str | None = Field(description="why the run cannot be read, if it cannot")
    group: str | None = Field(default=None,
                              description="the comparison group it belongs to, if any")


class RunSummary(BaseModel):
    nodes: int = Field(description="nodes processed (solved)")
    tree_nodes: int = Field(description="node events: processed, discarded and open")
    nodes_by_status: dict[str, int]
    max_depth: int
    end_status: str | None
    complete: bool | None
    objective: float | None
    dual_bound: float | None
    gap: float | None
    seconds: float | None
    incumbents: int
    lp_iterations: int
    sense: Literal["min", "max"]


class RunDetail(BaseModel):
    id: str
    source: Source
    live: bool
    status: str
    job: Job | None
    header: dict[str, Any] | None
    summary: RunSummary | None
    end: dict[str, Any] | None
    warnings: list[str]


class UploadedRun(BaseModel):
    id: str
    source: Source
    bytes: int
    nodes: int
    warnings: list[str]


class Deleted(BaseModel):
    id: str
    deleted: bool


class BoundChange(BaseModel):
    var: int
    name: str
    dir: str
    value: float | None
    node: int
    depth: int


class PathStep(BaseModel):
    id: int
    depth: int
    status: str
    branch: dict[str, Any] | None = Field(description="the bound change that created it")
    bound: float | None
    lp_objective: float | None
    iterations: int
    fractional: int
    branching: dict[str, Any] | None = Field(
        description="the decision taken at it: var, name, value, score, rule, down_bound, "
                    "up_bound (child bounds the rule saw), runner_up")


class IncumbentRef(BaseModel):
    objective: float
    node: int | None
    order: int | None
    time: float
    source: str


class NodeDetail(BaseModel):
    run: str
    node: dict[str, Any] = Field(description="the node event, as in the run log")
    row: int
    path: list[PathStep]
    bound_changes: list[BoundChange]
    children: list[int]
    status: str
    reason: str
    incumbent: IncumbentRef | None = Field(description="the incumbent when it was decided")
    found_incumbent: IncumbentRef | None = Field(description="the incumbent it produced")


class Line(BaseModel):
    x: list[float]
    y: list[float]


class SeriesOut(BaseModel):
    run: str
    axis: Literal["nodes", "time"]
    points: int
    sense: Literal["min", "max"]
    primal: Line
    dual: Line
    gap: Line
    incumbents: list[IncumbentRef]


class ModelItem(BaseModel):
    id: str
    source: Source
    file: str
    bytes: int
    name: str | None
    rows: int | None
    columns: int | None
    integers: int | None
    binaries: int | None
    nonzeros: int | None
    sense: str | None
    quadratic: bool | None
    convex: bool | None
    warnings: int | None
    error: str | None


class ModelDetail(BaseModel):
    id: str
    source: Source
    file: str
    bytes: int
    report: dict[str, Any] = Field(description="what `undergrowth model --json` prints")


class SolveRequest(BaseModel):
    model_config = ConfigDict(extra="forbid")

    model: str = Field(description="a model id from GET /api/models")
    branching: Branching = "reliability"
    select: NodeOrder = "hybrid"
    node_limit: int | None = Field(default=None, ge=1, description="capped by the server")
    time_limit: float | None = Field(default=None, gt=0, description="seconds; capped")
    gap: float = Field(default=1e-4, ge=0, le=1e6)
    seed: int = Field(default=0, ge=0, le=2**32 - 1)
    rounding: bool = True


class SolveAccepted(BaseModel):
    run_id: str
    state: JobState
    node_limit: int
    time_limit: float
    capped: list[str]
    job: Job
