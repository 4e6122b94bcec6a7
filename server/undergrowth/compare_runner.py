"""Run a comparison: every model × branching rule × node order × seed, each combination
solved by one worker process that writes its own run log.

Workers come from a `concurrent.futures.ProcessPoolExecutor` with the 'forkserver'
start method where the platform has it, else 'spawn' (never 'fork': the parent may
hold threads, such as the server's event loop or a run-log flusher). Each worker
runs HiGHS single-threaded (see `search.relaxation`), so J workers use about J
cores. ``jobs=1`` solves in this process, one run after another: the reference
for "parallel gives the same trees" and the easy path for a debugger.

The runs of one comparison share a directory with a ``group.json`` describing them
(written when the comparison starts and rewritten when it ends), so the server can
list them as one group. Everything returned is plain data.
"""

from __future__ import annotations

import concurrent.futures as cf
import json
import multiprocessing
import os
import signal
import threading
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field
from datetime import UTC, datetime
from pathlib import Path
from typing import Any

from .model import Problem, read_model
from .paths import slug, user_runs_dir
from .search import BRANCHING_RULES, NODE_ORDERS, Search, SearchSettings

__all__ = ["Comparison", "RunDone", "RunSpec", "default_jobs", "new_group_dir",
           "run_comparison"]

GROUP_FILE = "group.json"
GROUP_FORMAT = "undergrowth-comparison"
GROUP_VERSION = 1
_POLL_SECONDS = 0.2


@dataclass(frozen=True, kw_only=True, slots=True)
class RunSpec:
    """One combination to solve; pickled to a worker."""

    index: int
    problem: Problem
    label: str  # the model's name in rows; made unique when two models share a name
    source: str | None  # the model file, if the model came from one
    branching: str
    select: str
    seed: int
    settings: dict[str, Any]  # SearchSettings keywords other than rule, order and seed
    run_log: str


@dataclass(frozen=True, kw_only=True, slots=True)
class RunDone:
    """What a worker reports when its run ends."""

    index: int
    model: str
    branching: str
    select: str
    seed: int
    status: str
    nodes: int
    seconds: float
    run_log: str


@dataclass(kw_only=True)
class Comparison:
    """The outcome: rows (see `analysis.compare.ROW_KEYS`) in the order the runs were
    planned, the directory and group file, and whether it was cancelled."""

    name: str
    directory: Path
    group_file: Path
    rows: list[dict[str, Any]]
    planned: int
    cancelled: bool = False
    models: list[str] = field(default_factory=list)


def default_jobs() -> int:
    """The number of cores this process may use."""
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except AttributeError:  # not on every platform
        return max(1, os.cpu_count() or 1)


def new_group_dir(base: Path | None = None) -> Path:
    """A fresh ``compare-<UTC stamp>`` directory name under ``base`` (default: the user
    runs directory); not created."""
    base = user_runs_dir() if base is None else base
    stamp = datetime.now(UTC).strftime("%Y%m%dT%H%M%SZ")
    path = base / f"compare-{stamp}"
    k = 2
    while path.exists():
        path = base / f"compare-{stamp}-{k}"
        k += 1
    return path


# ------------------------------------------------------------------ worker side
_STOP: Any = None  # the shared stop event, set in each worker by _init_worker


def _init_worker(stop: Any) -> None:
    global _STOP
    _STOP = stop
    # Ctrl-C reaches the whole process group; the parent turns it into a clean stop.
    signal.signal(signal.SIGINT, signal.SIG_IGN)


def solve_one(spec: RunSpec, stop: Any = None) -> RunDone | None:
    """Solve one combination and write its run log (also builds the table cache, so the
    parent's `RunTable.open` is a cheap load). None, and no file, if the comparison was
    stopped before this run began (the pool hands out a job or two ahead)."""
    from .analysis.table import RunTable
    from .runlog.writer import RunLogWriter

    stop = stop if stop is not None else _STOP
    if stop is not None and stop.is_set():
        return None
    settings = SearchSettings(branching=spec.branching, select=spec.select, seed=spec.seed,
                              **spec.settings)
    search = Search(spec.problem, settings,
                    should_stop=None if stop is None else stop.is_set)
    with RunLogWriter(spec.run_log, search.header()) as writer:
        for ev in search.events():
            writer.write(ev)
    result = search.result
    assert result is not None
    RunTable.open(spec.run_log)
    return RunDone(index=spec.index, model=spec.label, branching=spec.branching,
                   select=spec.select, seed=spec.seed, status=result.status,
                   nodes=result.nodes, seconds=result.seconds, run_log=spec.run_log)


# ------------------------------------------------------------------ parent side
def _context() -> multiprocessing.context.BaseContext:
    methods = multiprocessing.get_all_start_methods()
    return multiprocessing.get_context("forkserver" if "forkserver" in methods else "spawn")


def _names(list_: Sequence[str], allowed: Sequence[str], what: str) -> list[str]:
    if not list_:
        raise ValueError(f"{what}: give at least one")
    out: list[str] = []
    for name in list_:
        if name not in allowed:
            raise ValueError(f"{what}: unknown {name!r}; choose from {', '.join(allowed)}")
        if name not in out:
            out.append(name)
    return out


def _load(models: Sequence[Problem | str | os.PathLike[str]]
          ) -> list[tuple[Problem, str | None]]:
    if not models:
        raise ValueError("models: give at least one model")
    out = []
    for m in models:
        if isinstance(m, Problem):
            out.append((m, None))
        else:
            out.append((read_model(m), os.fspath(m)))
    return out


def plan(models: Sequence[tuple[Problem, str | None]], *, branching: Sequence[str],
         select: Sequence[str], seeds: Sequence[int], settings: Mapping[str, Any],
         directory: Path) -> list[RunSpec]:
    """Every combination, model-major, with a distinct run-log path for each."""
    specs: list[RunSpec] = []
    stems: dict[str, int] = {}
    for problem, source in models:
        stem, label = slug(problem.name), problem.name
        stems[stem] = stems.get(stem, 0) + 1
        if stems[stem] > 1:  # two models with one name: keep their files and rows apart
            stem, label = f"{stem}-{stems[stem]}", f"{label} ({stems[stem]})"
        for rule in branching:
            for order in select:
                for seed in seeds:
                    path = directory / f"{stem}.{rule}.{order}.s{seed}.jsonl.gz"
                    specs.append(RunSpec(index=len(specs), problem=problem, label=label,
                                         source=source,
                                         branching=rule, select=order, seed=seed,
                                         settings=dict(settings), run_log=str(path)))
    return specs


def run_comparison(
    models: Sequence[Problem | str | os.PathLike[str]],
    *,
    branching: Sequence[str],
    select: Sequence[str],
    seeds: int = 1,
    node_limit: int | None = None,
    time_limit: float | None = None,
    gap: float = 1e-4,
    settings: Mapping[str, Any] | None = None,
    jobs: int | None = None,
    out_dir: str | os.PathLike[str] | None = None,
    on_done: Callable[[RunDone, int, int], None] | None = None,
    should_stop: Callable[[], bool] | None = None,
) -> Comparison:
    """Solve every combination and return the comparison's rows.

    ``models`` are model files or `Problem` objects; ``seeds`` runs seeds 0 … seeds−1;
    ``settings`` holds further `SearchSettings` keywords (such as ``absolute_gap``).
    ``on_done(run, k, n)`` is called in this process as each run ends (k of n).
    ``should_stop`` is polled; once it returns True the running searches stop after
    their current node (status ``cancelled``) and runs not yet started are skipped.
    Raises ValueError (message naming the argument) before any run starts.
    """
    from .analysis.compare import rows_for_tables
    from .analysis.table import RunTable

    branching = _names(list(branching), BRANCHING_RULES, "branching")
    select = _names(list(select), NODE_ORDERS, "select")
    if seeds < 1:
        raise ValueError(f"seeds: must be at least 1, got {seeds}")
    jobs = default_jobs() if jobs is None else jobs
    if jobs < 1:
        raise ValueError(f"jobs: must be at least 1, got {jobs}")
    extra = dict(settings or {})
    for key in ("branching", "select", "seed"):
        if key in extra:
            raise ValueError(f"settings: {key!r} is set by the comparison itself")
    extra.update(node_limit=node_limit, time_limit=time_limit, gap=gap)
    SearchSettings(**extra)  # ValueError naming the setting, before anything runs
    loaded = _load(models)
    for problem, _ in loaded:
        Search(problem, SearchSettings(**extra))  # refuses a non-convex objective now
    directory = Path(out_dir) if out_dir is not None else new_group_dir()
    directory.mkdir(parents=True, exist_ok=True)
    specs = plan(loaded, branching=branching, select=select, seeds=list(range(seeds)),
                 settings=extra, directory=directory)
    group = {
        "kind": "comparison", "format": GROUP_FORMAT, "version": GROUP_VERSION,
        "name": directory.name,
        "created": datetime.now(UTC).strftime("%Y-%m-%dT%H:%M:%SZ"),
        "state": "running",
        "models": [{"name": p.name, "source": src} for p, src in loaded],
        "branching": branching, "select": select, "seeds": list(range(seeds)),
        "settings": extra, "jobs": jobs,
        "runs": [{"model": s.label, "branching": s.branching, "select": s.select,
                  "seed": s.seed, "run_log": Path(s.run_log).name, "status": None}
                 for s in specs],
    }
    group_file = directory / GROUP_FILE
    _write_json(group_file, group)

    done: dict[int, RunDone] = {}

    def finish(run: RunDone) -> None:
        done[run.index] = run
        group["runs"][run.index].update(status=run.status, nodes=run.nodes,
                                        seconds=run.seconds)
        if on_done is not None:
            on_done(run, len(done), len(specs))

    if jobs == 1 or len(specs) == 1:
        polled = _Polled(threading.Event(), should_stop)
        for spec in specs:
            run = solve_one(spec, polled)  # None once a stop was asked for
            if run is None:
                break
            finish(run)
        cancelled = polled.event.is_set()
    else:
        cancelled = _run_pool(specs, jobs, finish, should_stop)

    rows: list[dict[str, Any]] = []
    finished_specs = [s for s in specs if s.index in done]
    if finished_specs:
        tables = [RunTable.open(s.run_log) for s in finished_specs]
        rows = rows_for_tables(tables, run_logs=[s.run_log for s in finished_specs],
                               models=[s.label for s in finished_specs])
    group["state"] = "cancelled" if cancelled else "done"
    _write_json(group_file, group)
    return Comparison(name=directory.name, directory=directory, group_file=group_file,
                      rows=rows, planned=len(specs), cancelled=cancelled,
                      models=[p.name for p, _ in loaded])


class _Polled:
    """A stop flag for in-process runs: our event, or the caller's ``should_stop``."""

    def __init__(self, event: threading.Event, poll: Callable[[], bool] | None) -> None:
        self.event = event
        self.poll = poll

    def is_set(self) -> bool:
        if not self.event.is_set() and self.poll is not None and self.poll():
            self.event.set()
        return self.event.is_set()


def _run_pool(specs: list[RunSpec], jobs: int, finish: Callable[[RunDone], None],
              should_stop: Callable[[], bool] | None) -> bool:
    """Solve ``specs`` in ``jobs`` worker processes; True if stopped early."""
    ctx = _context()
    stop = ctx.Event()
    cancelled = False
    with cf.ProcessPoolExecutor(max_workers=min(jobs, len(specs)), mp_context=ctx,
                                initializer=_init_worker, initargs=(stop,)) as pool:
        pending = {pool.submit(solve_one, spec) for spec in specs}
        try:
            while pending:
                if not cancelled and should_stop is not None and should_stop():
                    cancelled = True
                    stop.set()
                    for fut in pending:
                        fut.cancel()  # not started yet: skipped
                ready, pending = cf.wait(pending, timeout=_POLL_SECONDS,
                                         return_when=cf.FIRST_COMPLETED)
                for fut in ready:
                    run = None if fut.cancelled() else fut.result()
                    if run is not None:
                        finish(run)
        except BaseException:
            stop.set()
            for fut in pending:
                fut.cancel()
            raise
    return cancelled


def _write_json(path: Path, data: Mapping[str, Any]) -> None:
    # Replace atomically: the server may read the group file while it is rewritten.
    tmp = path.with_name(f".{path.name}.{os.getpid()}.tmp")
    tmp.write_text(json.dumps(data, indent=2) + "\n", encoding="utf-8")
    os.replace(tmp, path)
