"""Colours and marker shapes of the node statuses, for pictures drawn in Python.

The same mapping as the web legend (web/js/statuses.js and shapes.js): Okabe–Ito
colours, which stay apart under the common colour-vision deficiencies, and a
marker shape of its own per status, so colour is never the only cue. A test
(tests/test_report.py) reads statuses.js and fails when the two drift apart.
"""

from __future__ import annotations

import math
from typing import NamedTuple

from ..runlog.codes import STATUSES

__all__ = ["DUAL_COLOUR", "EDGE_COLOUR", "GAP_COLOUR", "INCUMBENT_COLOUR", "NOTE_COLOUR",
           "STATUS_STYLE", "StatusStyle", "shape_path"]


class StatusStyle(NamedTuple):
    colour: str
    shape: str
    hint: str


# In STATUSES order (the uint8 codes of RunTable.status).
STATUS_STYLE: tuple[StatusStyle, ...] = (
    StatusStyle("#0072B2", "dot", "split into two children"),
    StatusStyle("#009E73", "diamond", "integer solution found here"),
    StatusStyle("#E69F00", "triangle-down", "bound no better than the incumbent"),
    StatusStyle("#D55E00", "cross", "relaxation has no solution"),
    StatusStyle("#CC79A7", "square", "dropped unsolved after a better incumbent"),
    StatusStyle("#56B4E9", "triangle-up", "still waiting when the search stopped"),
    StatusStyle("#000000", "plus", "relaxation solver gave no answer"),
)
assert len(STATUS_STYLE) == len(STATUSES)

INCUMBENT_COLOUR = "#009E73"  # the primal line and the rings of incumbent nodes
DUAL_COLOUR = "#0072B2"
GAP_COLOUR = "#7a7f87"
EDGE_COLOUR = "#3c4048"  # drawn at 45% opacity, as on the web canvas
NOTE_COLOUR = "#5a2d82"  # a colour no status uses

_SQRT3 = math.sqrt(3.0)


def _n(v: float) -> str:
    """A coordinate with at most one decimal and no trailing zeros (small files)."""
    s = f"{v:.1f}"
    if s.endswith(".0"):
        s = s[:-2]
    return "0" if s == "-0" else s


def _poly(points: list[tuple[float, float]]) -> str:
    head, *rest = points
    return f"M{_n(head[0])} {_n(head[1])}" + "".join(f"L{_n(x)} {_n(y)}" for x, y in rest) + "Z"


def shape_path(shape: str, x: float, y: float, r: float) -> str:
    """An SVG path ``d`` for one marker of ``shape`` centred at (x, y) with radius r.
    Below r = 2.4 every shape is a square, as on the web canvas: at that size the
    shapes cannot be told apart and squares cost fewer bytes."""
    if r < 2.4 or shape == "square":
        s = r if r < 2.4 else r * 0.86
        return f"M{_n(x - s)} {_n(y - s)}h{_n(2 * s)}v{_n(2 * s)}h{_n(-2 * s)}Z"
    if shape == "dot":
        return (f"M{_n(x - r)} {_n(y)}a{_n(r)} {_n(r)} 0 1 0 {_n(2 * r)} 0"
                f"a{_n(r)} {_n(r)} 0 1 0 {_n(-2 * r)} 0Z")
    if shape == "diamond":
        s = r * 1.2
        return _poly([(x, y - s), (x + s, y), (x, y + s), (x - s, y)])
    if shape in ("triangle-down", "triangle-up"):
        s = r * 1.15
        flip = 1.0 if shape == "triangle-down" else -1.0
        return _poly([(x - s, y - flip * s * 0.6), (x + s, y - flip * s * 0.6),
                      (x, y + flip * s * (_SQRT3 - 0.6))])
    if shape == "cross":  # an X of two bars
        a, w = r * 1.1, r * 0.42
        return _poly([(x - a, y - a + w), (x - a + w, y - a), (x, y - w), (x + a - w, y - a),
                      (x + a, y - a + w), (x + w, y), (x + a, y + a - w), (x + a - w, y + a),
                      (x, y + w), (x - a + w, y + a), (x - a, y + a - w), (x - w, y)])
    if shape == "plus":
        a, w = r * 1.15, r * 0.38
        return _poly([(x - w, y - a), (x + w, y - a), (x + w, y - w), (x + a, y - w),
                      (x + a, y + w), (x + w, y + w), (x + w, y + a), (x - w, y + a),
                      (x - w, y + w), (x - a, y + w), (x - a, y - w), (x - w, y - w)])
    raise ValueError(f"shape: unknown marker shape {shape!r}")
