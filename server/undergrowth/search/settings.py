"""Search settings: one table (name, default, help) feeds the dataclass, the CLI and docs."""

from __future__ import annotations

from dataclasses import dataclass, field, fields

BRANCHING_RULES = (
    "most-fractional", "least-fractional", "first-index", "random",
    "pseudocost", "strong", "reliability",
)
NODE_ORDERS = ("depth-first", "best-bound", "best-estimate", "breadth-first", "hybrid")


@dataclass(frozen=True, kw_only=True)
class SearchSettings:
    """How a search runs. Defaults are documented in DEVELOPERS.md ("Tolerances")."""

    branching: str = field(default="reliability", metadata={"help": "branching rule"})
    select: str = field(default="hybrid", metadata={"help": "node order"})
    seed: int = field(default=0, metadata={"help": "seed for the random rule and ties"})
    node_limit: int | None = field(
        default=None, metadata={"help": "stop after this many nodes"})
    time_limit: float | None = field(
        default=None, metadata={"help": "stop after this many seconds"})
    gap: float = field(
        default=1e-4, metadata={"help": "stop when the relative gap is at most this"})
    absolute_gap: float = field(
        default=1e-6, metadata={"help": "stop when primal - dual is at most this"})
    integrality_tolerance: float = field(
        default=1e-6, metadata={"help": "a value this close to an integer counts as integral"})
    feasibility_tolerance: float = field(
        default=1e-6, metadata={"help": "row and bound violation accepted for a rounded point"})
    prune_tolerance: float = field(
        default=1e-9, metadata={"help": "relative slack: a node whose bound is within this of the "
                                        "incumbent cannot beat it and is pruned"})
    rounding: bool = field(default=True, metadata={"help": "try simple rounding at every node"})
    down_first: bool = field(
        default=True, metadata={"help": "depth-first plunges take the down child first"})
    strong_candidates: int | None = field(
        default=None, metadata={"help": "strong branching: evaluate at most this many candidates"})
    strong_iterations: int | None = field(
        default=None, metadata={"help": "strong branching: simplex iteration limit per child"})
    reliability_threshold: int = field(
        default=8, metadata={"help": "reliability: observations per direction before "
                                     "trusting pseudocosts"})
    reliability_lookahead: int = field(
        default=4, metadata={"help": "reliability: stop strong branching after this many "
                                     "non-improving candidates"})
    reliability_max_candidates: int = field(
        default=100, metadata={"help": "reliability: strong-branch at most this many candidates"})
    plunge_drift: float = field(
        default=0.5, metadata={"help": "hybrid: leave a plunge when the child's bound is beyond "
                                       "this share of the gap from the best bound"})
    progress_every: int = field(
        default=200, metadata={"help": "progress event every N nodes (and every second)"})

    def __post_init__(self) -> None:
        if self.branching not in BRANCHING_RULES:
            raise ValueError(
                f"branching: unknown rule {self.branching!r}; "
                f"choose one of {', '.join(BRANCHING_RULES)}")
        if self.select not in NODE_ORDERS:
            raise ValueError(
                f"select: unknown node order {self.select!r}; "
                f"choose one of {', '.join(NODE_ORDERS)}")
        if self.node_limit is not None and self.node_limit < 1:
            raise ValueError(f"node_limit: must be at least 1, got {self.node_limit}")
        if self.time_limit is not None and self.time_limit <= 0:
            raise ValueError(f"time_limit: must be positive, got {self.time_limit}")
        for name in ("gap", "absolute_gap", "integrality_tolerance", "feasibility_tolerance",
                     "prune_tolerance"):
            if getattr(self, name) < 0:
                raise ValueError(f"{name}: must be non-negative, got {getattr(self, name)}")
        if not 0 < self.plunge_drift <= 1:
            raise ValueError(f"plunge_drift: must be in (0, 1], got {self.plunge_drift}")

    def to_dict(self) -> dict[str, object]:
        return {f.name: getattr(self, f.name) for f in fields(self)}


def settings_table() -> list[tuple[str, object, str]]:
    """(name, default, help) for every setting, in declaration order."""
    return [(f.name, f.default, f.metadata.get("help", "")) for f in fields(SearchSettings)]
