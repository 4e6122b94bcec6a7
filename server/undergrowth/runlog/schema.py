"""Pydantic models of the run-log lines (event contract version 1) and its JSON Schema.

These models are the reference definition of a valid line. The reader's hot
path checks the same rules with plain Python (see `_fastcheck`) and falls back
to these models to explain a line it rejects, so an error names the field the
way pydantic's ``loc`` does. Unknown extra fields are kept (``extra="allow"``)
and ignored. Types are strict: an integer field does not take ``3.0`` or
``"3"``; a float field takes any JSON number.

Two documented relaxations of the contract draft: ``branching`` may be null for
a branched node (producers that did not record the decision, e.g. CSV imports),
and ``branching.score`` may be null (no score, or an infinite one written as
null). Incumbent ``source`` also allows ``external`` (a user's own heuristic).
"""

from __future__ import annotations

from typing import Annotated, Any, Literal

from pydantic import (
    BaseModel,
    ConfigDict,
    Field,
    TypeAdapter,
    ValidationError,
    ValidationInfo,
    field_validator,
)

from .codes import FORMAT, INT64_MAX, VERSION

__all__ = [
    "Branch",
    "Branching",
    "EndEvent",
    "Header",
    "IncumbentEvent",
    "LPResult",
    "ModelSummary",
    "NodeEvent",
    "NoteEvent",
    "ProgressEvent",
    "RunnerUp",
    "Settings",
    "explain",
    "json_schema",
]

Count = Annotated[int, Field(ge=0, le=INT64_MAX)]
NodeId = Annotated[int, Field(ge=0, le=INT64_MAX)]
Status = Literal["branched", "integral", "pruned", "infeasible", "discarded", "open", "failed"]


class _Line(BaseModel):
    model_config = ConfigDict(extra="allow", strict=True)


class ModelSummary(_Line):
    """Size and sense of the model that was searched."""

    name: str
    rows: Count
    columns: Count
    integers: Count
    binaries: Count
    nonzeros: Count
    sense: Literal["min", "max"] = Field(description="Objective sense of every value in the log.")
    quadratic: bool


class Settings(_Line):
    """Search settings; producers may add free-form extras."""

    branching: str
    select: str
    seed: int
    node_limit: Count | None
    time_limit: float | None
    gap: float


class Header(_Line):
    """First line of every run log."""

    kind: Literal["header"]
    format: Literal["undergrowth-run"]
    version: int = Field(ge=1, le=VERSION, description="Run-log major version.")
    model: ModelSummary
    settings: Settings
    started: str = Field(description="ISO 8601 start time, e.g. 2026-12-02T06:00:00Z.")
    producer: str


class Branch(_Line):
    """The bound change that created a node: down is x_var <= value, up is x_var >= value."""

    var: Count
    name: str
    dir: Literal["down", "up"]
    value: float


class LPResult(_Line):
    """The node's relaxation as solved."""

    status: Literal["optimal", "infeasible", "failed"]
    objective: float | None
    iterations: Count
    seconds: float


class RunnerUp(_Line):
    var: Count
    name: str
    score: float | None


class Branching(_Line):
    """The branching decision taken at a branched node."""

    var: Count
    name: str
    value: float = Field(description="The variable's fractional value in the relaxation.")
    score: float | None = Field(description="The rule's score; null if none or not finite.")
    rule: str
    down_bound: float | None = Field(description="Look-ahead bound of the down child, if any.")
    up_bound: float | None = Field(description="Look-ahead bound of the up child, if any.")
    runner_up: RunnerUp | None
    candidates: list[tuple[Count, float]] | None = Field(
        default=None,
        description="Optional: the first fractional integer columns as [column, value] "
        "pairs, lowest index first (the engine keeps up to 8; `fractional` has the count).",
    )


class NodeEvent(_Line):
    """One node, when processed, or when discarded or left open."""

    kind: Literal["node"]
    id: NodeId
    parent: NodeId | None = Field(description="Parent node id; null at the root.")
    depth: Count
    order: Count | None = Field(description="Processing order 0, 1, 2, ...; null if never solved.")
    time: float = Field(description="Seconds since the search started.")
    branch: Branch | None
    lp: LPResult | None = Field(description="Null if the relaxation was never solved.")
    bound: float | None = Field(
        description="Relaxation value, or the inherited parent bound for discarded/open nodes."
    )
    fractional: Count
    status: Status
    branching: Branching | None = Field(
        description="Only for branched nodes (null if the producer did not record it)."
    )
    message: str | None

    @field_validator("branching")
    @classmethod
    def _only_when_branched(cls, value: Branching | None, info: ValidationInfo) -> Branching | None:
        status = info.data.get("status")
        if value is not None and status not in (None, "branched"):
            raise ValueError(f"must be null unless status is 'branched' (status is {status!r})")
        return value


class IncumbentEvent(_Line):
    """An improving solution."""

    kind: Literal["incumbent"]
    time: float
    node: NodeId | None
    order: Count | None
    objective: float
    source: Literal["integral", "rounding", "start", "external"]


class ProgressEvent(_Line):
    """A global snapshot of the search."""

    kind: Literal["progress"]
    time: float
    nodes: Count
    open: Count
    dual_bound: float | None
    primal_bound: float | None
    gap: float | None
    tree_weight: float = Field(description="Sum of 2^-depth over closed leaves (1.0: all closed).")


class EndEvent(_Line):
    """Last line of a finished search."""

    kind: Literal["end"]
    time: float
    status: Literal[
        "optimal",
        "infeasible",
        "unbounded",
        "gap-reached",
        "node-limit",
        "time-limit",
        "cancelled",
        "incomplete",
    ]
    objective: float | None
    dual_bound: float | None
    gap: float | None
    nodes: Count
    lp_iterations: Count
    lp_seconds: float
    other_seconds: float
    complete: bool
    message: str | None
    solution: dict[str, float] | None = Field(description="Non-zero entries by column name.")


class NoteEvent(_Line):
    """A reviewer's note on a node (kept in a sidecar file)."""

    kind: Literal["note"]
    id: str
    node: NodeId | None
    order: Count | None
    author: str
    text: str
    created: str


MODELS: dict[str, type[_Line]] = {
    "header": Header,
    "node": NodeEvent,
    "incumbent": IncumbentEvent,
    "progress": ProgressEvent,
    "end": EndEvent,
    "note": NoteEvent,
}

Line = Annotated[
    Header | NodeEvent | IncumbentEvent | ProgressEvent | EndEvent | NoteEvent,
    Field(discriminator="kind"),
]


def explain(data: Any) -> tuple[str, str] | None:
    """Why ``data`` is not a valid line, as (dotted field, message); None if it is valid."""
    if not isinstance(data, dict):
        return "", f"a line must be a JSON object, not {type(data).__name__}"
    kind = data.get("kind")
    model = MODELS.get(kind) if isinstance(kind, str) else None
    if model is None:
        return "kind", f"unknown event kind {kind!r} (expected one of {', '.join(MODELS)})"
    try:
        model.model_validate(data)
    except ValidationError as exc:
        first = exc.errors(include_url=False)[0]
        field = ".".join(str(part) for part in first["loc"])
        message = first["msg"].removeprefix("Value error, ")
        if "input" in first and first["type"] not in ("missing", "value_error"):
            message += f" (got {first['input']!r})"
        return field, message
    return None


def json_schema() -> dict[str, Any]:
    """One JSON Schema document for a run-log line: header or event, told apart by ``kind``."""
    schema = TypeAdapter(Line).json_schema()
    return {
        "$schema": "https://json-schema.org/draft/2020-12/schema",
        "title": "Undergrowth run-log line",
        "description": (
            f"A run log ({FORMAT!r}, version {VERSION}) is JSON Lines: a header line, then "
            "node, incumbent, progress and end events in the order they happened. Each "
            "line matches this schema; fields not listed are allowed and ignored."
        ),
        **schema,
    }
