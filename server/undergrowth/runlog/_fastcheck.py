"""Plain-Python checks of the hot event kinds, equivalent to the pydantic models.

Validating a million node lines through pydantic models one by one is several
times slower than these straight-line type checks. Each function answers only
"valid or not"; the reader asks `schema.explain` why when the answer is no, so
error messages still come from the models. `tests/test_runlog_fastcheck.py`
checks that both agree on mutated events.
"""

from __future__ import annotations

from typing import Any

from .codes import INT64_MAX, LP_STATUSES, SOURCES, STATUSES

_NUMBER = (float, int)  # JSON numbers arrive as exactly these types (bool is neither)
_MAX = INT64_MAX  # counts and ids must fit the table's int64 columns
_STATUS = frozenset(STATUSES)
_LP_STATUS = frozenset(LP_STATUSES)
_SOURCE = frozenset(SOURCES)


def _count(v: Any) -> bool:
    return type(v) is int and 0 <= v <= _MAX


def _opt_count(v: Any) -> bool:
    return v is None or (type(v) is int and 0 <= v <= _MAX)


def _opt_number(v: Any) -> bool:
    return v is None or type(v) in _NUMBER


def node_ok(d: dict[str, Any]) -> bool:
    """True if ``d`` is a valid node event (``d["kind"] == "node"`` is taken as given)."""
    # Written out without helper calls: this runs once per node of a million-node run.
    int_, float_, none, top = int, float, None, _MAX
    try:
        v = d["id"]
        if type(v) is not int_ or not 0 <= v <= top:
            return False
        v = d["parent"]
        if v is not none and (type(v) is not int_ or not 0 <= v <= top):
            return False
        v = d["depth"]
        if type(v) is not int_ or not 0 <= v <= top:
            return False
        v = d["order"]
        if v is not none and (type(v) is not int_ or not 0 <= v <= top):
            return False
        v = d["time"]
        if type(v) is not float_ and type(v) is not int_:
            return False
        v = d["bound"]
        if v is not none and type(v) is not float_ and type(v) is not int_:
            return False
        v = d["fractional"]
        if type(v) is not int_ or not 0 <= v <= top:
            return False
        status = d["status"]
        if status not in _STATUS:
            return False
        v = d["message"]
        if v is not none and type(v) is not str:
            return False
        b = d["branch"]
        if b is not none and not (
            type(b) is dict
            and _count(b["var"])
            and type(b["name"]) is str
            and b["dir"] in ("down", "up")
            and type(b["value"]) in _NUMBER
        ):
            return False
        lp = d["lp"]
        if lp is not none:
            if type(lp) is not dict or lp["status"] not in _LP_STATUS:
                return False
            v = lp["objective"]
            if v is not none and type(v) is not float_ and type(v) is not int_:
                return False
            v = lp["iterations"]
            if type(v) is not int_ or not 0 <= v <= top:
                return False
            v = lp["seconds"]
            if type(v) is not float_ and type(v) is not int_:
                return False
        g = d["branching"]
        if g is none:
            return True
        if not (
            type(g) is dict
            and status == "branched"
            and _count(g["var"])
            and type(g["name"]) is str
            and type(g["value"]) in _NUMBER
            and _opt_number(g["score"])
            and type(g["rule"]) is str
            and _opt_number(g["down_bound"])
            and _opt_number(g["up_bound"])
        ):
            return False
        r = g["runner_up"]
        if not (r is none or (
            type(r) is dict
            and _count(r["var"])
            and type(r["name"]) is str
            and _opt_number(r["score"])
        )):
            return False
        c = g.get("candidates")
        return c is none or (type(c) is list and all(
            type(p) is list and len(p) == 2 and _count(p[0]) and type(p[1]) in _NUMBER
            for p in c))
    except (KeyError, TypeError):  # a missing field, or a field of the wrong shape
        return False


def incumbent_ok(d: dict[str, Any]) -> bool:
    """True if ``d`` is a valid incumbent event."""
    try:
        return (
            type(d["time"]) in _NUMBER
            and _opt_count(d["node"])
            and _opt_count(d["order"])
            and type(d["objective"]) in _NUMBER
            and d["source"] in _SOURCE
        )
    except (KeyError, TypeError):
        return False


def progress_ok(d: dict[str, Any]) -> bool:
    """True if ``d`` is a valid progress event."""
    try:
        return (
            type(d["time"]) in _NUMBER
            and _count(d["nodes"])
            and _count(d["open"])
            and _opt_number(d["dual_bound"])
            and _opt_number(d["primal_bound"])
            and _opt_number(d["gap"])
            and type(d["tree_weight"]) in _NUMBER
        )
    except (KeyError, TypeError):
        return False
