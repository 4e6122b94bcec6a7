"""Comparison groups started through the server: several solves of one model, under
different branching rules, node orders and seeds, that belong together.

A group is one small JSON file, ``<group id>.group.json``, in the writable runs
directory, written once when the group starts. It uses the comparison group format
of `compare_runner` (``kind``, ``format``, ``version``, models, rules, orders, seeds,
settings, runs), and each entry of ``runs`` also names its member's ``run_id``.
Every member is an ordinary solve: a job record with its status sidecar, a run log
in the library. The group's state is worked out from its members' job states each
time it is asked for, so the file never goes stale and a restart needs no repair.

Group states: ``running`` (a member is queued or running), ``done`` (every member
finished by itself), ``cancelled`` (none is active and one was cancelled),
``incomplete`` (none is active, none was cancelled, and one failed, was
interrupted, or its run is gone).
"""

from __future__ import annotations

import contextlib
import json
import os
import secrets
from pathlib import Path
from typing import Any

from ..compare_runner import GROUP_FORMAT, GROUP_VERSION
from .errors import NotFound
from .ids import check_id, split_name
from .jobs import JobManager
from .status import ACTIVE_STATES, now_iso

__all__ = ["GROUP_STATES", "GROUP_SUFFIX", "GroupStore", "group_state"]

GROUP_SUFFIX = ".group.json"
GROUP_STATES = ("running", "done", "cancelled", "incomplete")


def group_state(member_states: list[str]) -> str:
    """The group's state from its members' states (see the module docstring)."""
    if any(s in ACTIVE_STATES for s in member_states):
        return "running"
    if member_states and all(s == "finished" for s in member_states):
        return "done"
    if "cancelled" in member_states:
        return "cancelled"
    return "incomplete"


class GroupStore:
    """The group files of one runs directory. Stateless: every call reads the files
    (there are few, and each is small), so two requests never disagree."""

    def __init__(self, runs_dir: Path) -> None:
        self.runs_dir = runs_dir

    def path(self, group_id: str) -> Path:
        return self.runs_dir / f"{group_id}{GROUP_SUFFIX}"

    def ids(self) -> list[str]:
        try:
            names = os.listdir(self.runs_dir)
        except OSError:
            return []
        out = []
        for name in names:
            parts = split_name(name, (GROUP_SUFFIX,))
            if parts is not None:
                out.append(parts[0])
        return sorted(out)

    def read(self, group_id: str) -> dict[str, Any] | None:
        """The group file's content; None if missing or not a group file."""
        try:
            data = json.loads(self.path(group_id).read_text(encoding="utf-8"))
        except (OSError, ValueError):
            return None
        if not isinstance(data, dict) or data.get("format") != GROUP_FORMAT or not isinstance(
                data.get("runs"), list):
            return None
        data["id"] = group_id
        return data

    def require(self, group_id: str) -> dict[str, Any]:
        check_id(group_id, what="group")
        data = self.read(group_id)
        if data is None:
            raise NotFound(f"no group {group_id!r}", detail={"id": group_id})
        return data

    def all(self) -> list[dict[str, Any]]:
        groups = [g for g in (self.read(i) for i in self.ids()) if g is not None]
        groups.sort(key=lambda g: (str(g.get("created") or ""), g["id"]), reverse=True)
        return groups

    def membership(self) -> dict[str, str]:
        """run id → id of the group it belongs to."""
        out: dict[str, str] = {}
        for group in self.all():
            for run in group["runs"]:
                if isinstance(run, dict) and isinstance(run.get("run_id"), str):
                    out.setdefault(run["run_id"], group["id"])
        return out

    def delete(self, group_id: str) -> None:
        self.path(group_id).unlink(missing_ok=True)

    def write(self, group: dict[str, Any]) -> None:
        """Create the group's file (atomically: a reader never sees half of it)."""
        body = {k: v for k, v in group.items() if k != "id"}
        target = self.path(group["id"])
        tmp = target.with_name(f".{target.name}.{secrets.token_hex(4)}.tmp")
        try:
            tmp.write_text(json.dumps(body, indent=2) + "\n", encoding="utf-8")
            os.replace(tmp, target)
        finally:
            with contextlib.suppress(OSError):
                tmp.unlink()


def new_group(*, group_id: str, model: str, source: str, branching: list[str],
              select: list[str], seeds: list[int], settings: dict[str, Any],
              members: list[dict[str, Any]], label: str | None) -> dict[str, Any]:
    """A group record in the comparison group format (members: run_id, branching,
    select, seed, run_log)."""
    return {
        "kind": "comparison", "format": GROUP_FORMAT, "version": GROUP_VERSION,
        "id": group_id, "name": label or group_id, "created": now_iso(),
        "origin": "server",
        "models": [{"name": model, "source": source}],
        "branching": branching, "select": select, "seeds": seeds,
        "settings": {k: v for k, v in settings.items()
                     if k not in ("branching", "select", "seed")},
        "runs": [{"model": model, **m} for m in members],
    }


def describe(group: dict[str, Any], jobs: JobManager, has_run: Any) -> dict[str, Any]:
    """The group as the API shows it: its plan, each member's job figures and state,
    the derived group state and how many members have ended. ``has_run(run_id)``
    tells whether the library still holds a member's run log."""
    members = []
    for run in group["runs"]:
        run_id = str(run.get("run_id") or "")
        job = jobs.get(run_id) if run_id else None
        if job is not None:
            state = job.state
        else:  # the job record is gone (the run was deleted, or it came from elsewhere)
            state = "finished" if run_id and has_run(run_id) else "missing"
        members.append({
            "run_id": run_id, "branching": run.get("branching"), "select": run.get("select"),
            "seed": run.get("seed"), "state": state, "log": bool(run_id) and bool(has_run(run_id)),
            "end_status": None if job is None else job.end_status,
            "nodes": 0 if job is None else job.nodes,
            "objective": None if job is None else job.objective,
            "dual_bound": None if job is None else job.dual_bound,
            "gap": None if job is None else job.gap,
            "reason": None if job is None else job.reason,
        })
    states = [m["state"] for m in members]
    models = group.get("models") or [{}]
    return {
        "id": group["id"], "name": group.get("name") or group["id"],
        "created": group.get("created"), "model": models[0].get("name"),
        "branching": list(group.get("branching") or []),
        "select": list(group.get("select") or []),
        "seeds": list(group.get("seeds") or []),
        "settings": dict(group.get("settings") or {}),
        "state": group_state(states),
        "ended": sum(s not in ACTIVE_STATES for s in states),
        "total": len(members),
        "members": members,
    }
