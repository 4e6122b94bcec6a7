"""A static picture of a search tree as inline SVG, small at any tree size.

Positions come from the tidy layout (`analysis.layout`): x is the node's place
among the leaves, y its depth. Level of detail works as on the web canvas
(web/js/lod.js), computed here once with numpy:

- a node is drawn on its own when its parent's subtree is at least
  `COLLAPSE_PX` pixels wide;
- a drawn node whose own subtree is narrower than that stands for the whole
  subtree: one thin bar from the node down to the subtree's deepest level, in
  the colour of the status that closed most of its nodes;
- nodes that found an incumbent (green rings), failed nodes and nodes with
  reviewers' notes are drawn wherever they are, so they stay visible;
- marks and edges that land on the same half pixel are drawn once.

So the number of SVG shapes grows with the picture's area, not with the tree:
a 100,000-node tree stays a few hundred kilobytes (benchmarks/report_size.py).
Marks of one status share one ``<path>`` (its ``<title>`` is the hover text).
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING
from xml.sax.saxutils import escape

import numpy as np

from ..runlog.codes import BRANCHED, SOURCES, STATUS_CODE, STATUSES
from .palette import EDGE_COLOUR, INCUMBENT_COLOUR, NOTE_COLOUR, STATUS_STYLE, shape_path

if TYPE_CHECKING:
    from ..analysis.layout import TreeLayout
    from ..analysis.table import RunTable

__all__ = ["COLLAPSE_PX", "TreeMark", "TreePicture", "draw_tree", "tree_picture"]

# A subtree narrower than this many pixels is drawn as one bar: below it single
# marks would only pile up on each other.
COLLAPSE_PX = 1.5
# The most room one leaf gets: a tree of five leaves should not spread over the page.
MAX_LEAF_PX = 36.0
ROW_PX = 24.0  # height of one depth level, when the picture has room for it
BACKGROUND = "#fbfbf8"  # the web canvas's background
# At most this many rings, failed nodes and note marks are drawn on top: each has a
# hover title of its own, and past a few hundred they would hide the tree.
MAX_SPECIAL = 400


@dataclass(frozen=True)
class TreeMark:
    """A node drawn on top of the tree whatever its subtree's width."""

    row: int
    label: str  # shown beside the node (a note's number); "" for none
    title: str  # hover text


@dataclass(frozen=True)
class TreePicture:
    svg: str
    nodes: int  # rows in the tree
    marks: int  # single node marks drawn
    bars: int  # subtrees drawn as one bar
    edges: int
    hidden: int  # nodes inside bars (not drawn one by one)
    bar_status: str | None = None  # the status most bars are coloured by


def _n(v: float) -> str:
    s = f"{v:.1f}"
    if s.endswith(".0"):
        s = s[:-2]
    return "0" if s == "-0" else s


def _nice_step(raw: float) -> int:
    """The smallest of 1, 2, 5, 10, 20, 50, ... that is at least ``raw``."""
    base = 1
    while True:
        for m in (1, 2, 5):
            if base * m >= raw:
                return base * m
        base *= 10


def _unique_rows(*cols: np.ndarray) -> np.ndarray:
    """Indices of the first occurrence of each distinct tuple of (integer) columns."""
    if not len(cols[0]):
        return np.zeros(0, dtype=np.int64)
    stacked = np.stack(cols, axis=1)
    _, first = np.unique(stacked, axis=0, return_index=True)
    return np.sort(first)


def _nearest_shown(shown: np.ndarray, parent: np.ndarray) -> np.ndarray:
    """For every row, the nearest ancestor-or-self that is shown (pointer jumping:
    about log2(depth) vectorised passes)."""
    anc = np.where(shown, np.arange(len(shown)), parent)
    while True:
        nxt = anc[anc]
        if np.array_equal(nxt, anc):
            return anc
        anc = nxt


def draw_tree(parent: np.ndarray, depth: np.ndarray, status: np.ndarray, layout: TreeLayout,
              *, special: Sequence[tuple[str, TreeMark]] = (), id_prefix: str = "tree",
              title: str = "Search tree", width: int = 1160, max_height: int = 560
              ) -> TreePicture:
    """The SVG (a string) of the tree given by ``parent`` rows (-1 for a root), depths,
    status codes (`runlog.codes.STATUSES`) and its tidy ``layout``.

    ``special`` lists nodes drawn on top whatever their subtree's width, each as
    (kind, mark) with kind ``"incumbent"`` (a ring), ``"failed"`` (its status marker,
    outlined) or ``"note"`` (a numbered flag)."""
    parent = np.asarray(parent, dtype=np.int64)
    depth = np.asarray(depth, dtype=np.int64)
    status = np.asarray(status, dtype=np.int64)
    n = len(parent)
    left, right, top, bottom = 58, 18, 14, 14
    pw = width - left - right
    max_depth = int(depth.max()) if n else 0
    rows = max_depth + 1
    rh = min(ROW_PX, (max_height - top - bottom) / rows)
    height = int(round(top + rows * rh + bottom))
    span = max(layout.leaves - 1, 0)
    sx = min(pw / span, MAX_LEAF_PX) if span else 0.0
    x0 = left + (pw - span * sx) / 2.0

    out = [f'<svg class="tree-picture" viewBox="0 0 {width} {height}" width="{width}" '
           f'height="{height}" role="img" aria-labelledby="{id_prefix}-title {id_prefix}-desc">',
           f'<title id="{id_prefix}-title">{escape(title)}</title>']
    if n == 0:
        out.append(f'<desc id="{id_prefix}-desc">The run has no nodes.</desc></svg>')
        return TreePicture("\n".join(out), 0, 0, 0, 0, 0)

    px = x0 + layout.x * sx
    py = top + rh * (depth + 0.5)
    wpx = (layout.x_max - layout.x_min) * sx
    is_root = parent < 0
    if span == 0:  # a single leaf: a chain (or one node); every node has room
        shown = np.ones(n, dtype=bool)
    else:
        parent_w = np.where(is_root, np.inf, wpx[np.where(is_root, 0, parent)])
        shown = parent_w >= COLLAPSE_PX
    bar_top = shown & (layout.subtree_size > 1) & (wpx < COLLAPSE_PX) & (span > 0)
    hidden = ~shown

    # Bars: each hidden node belongs to its nearest shown ancestor, a bar top.
    bars_d = ""
    bar_count = 0
    bar_status = None
    if hidden.any():
        owner = _nearest_shown(shown, np.where(is_root, 0, parent))
        h = np.flatnonzero(hidden)
        own = owner[h]
        deepest = depth.copy()
        np.maximum.at(deepest, own, depth[h])
        # the closing status most frequent in the subtree (branched only if nothing else)
        members = np.r_[own, np.flatnonzero(bar_top)]
        codes = np.r_[status[h], status[bar_top]]
        keys, counts = np.unique(members * 8 + codes, return_counts=True)
        k_top, k_status = keys // 8, keys % 8
        weight = np.where(k_status == BRANCHED, counts - n - 1, counts)
        order = np.lexsort((-k_status, weight, k_top))  # ties: the lower status code
        last = np.r_[k_top[order][1:] != k_top[order][:-1], True]
        tops, dominant = k_top[order][last], k_status[order][last]
        by_status: dict[int, list[str]] = {}
        keep = _unique_rows(np.round(px[tops] * 2).astype(np.int64),
                            np.round(py[tops] * 2).astype(np.int64),
                            np.round(top + rh * (deepest[tops] + 0.5)).astype(np.int64),
                            dominant)
        for t, s in zip(tops[keep].tolist(), dominant[keep].tolist(), strict=True):
            y1 = py[t]
            y2 = max(top + rh * (deepest[t] + 0.5), y1 + 2.0)
            by_status.setdefault(s, []).append(f"M{round(px[t])} {round(y1)}V{round(y2)}")
        bar_count = int(len(keep))
        if bar_count:
            bar_status = STATUSES[int(np.bincount(dominant[keep]).argmax())]
        parts = []
        for s in sorted(by_status):
            parts.append(f'<path class="bars" data-status="{STATUSES[s]}" fill="none" '
                         f'stroke="{STATUS_STYLE[s].colour}" stroke-width="1.5" '
                         f'd="{"".join(by_status[s])}"><title>subtrees drawn as one bar, '
                         f"mostly {STATUSES[s]}</title></path>")
        bars_d = "\n".join(parts)

    # Edges from each shown node to its parent, in one path at whole pixels (a thin
    # grey line is none the worse for it, and edges are most of the picture's bytes);
    # siblings share their parent's point: first child, parent, second child.
    child = np.flatnonzero(shown & ~is_root)
    ix = np.round(px).astype(np.int64).tolist()
    iy = np.round(py).astype(np.int64).tolist()
    par = parent[child]
    ekeep = _unique_rows(np.asarray(ix)[par], np.asarray(iy)[par], np.asarray(ix)[child],
                         np.asarray(iy)[child])
    ec, ep = child[ekeep], par[ekeep]
    order = np.argsort(ep, kind="stable")
    ec, ep = ec[order].tolist(), ep[order].tolist()
    edge_parts = []
    for k, (c, p) in enumerate(zip(ec, ep, strict=True)):
        if k == 0 or p != ep[k - 1]:
            edge_parts.append(f"M{ix[c]} {iy[c]}L{ix[p]} {iy[p]}")
        elif k >= 2 and ep[k - 2] == p:  # a third child: back to the parent first
            edge_parts.append(f"M{ix[p]} {iy[p]}L{ix[c]} {iy[c]}")
        else:
            edge_parts.append(f"L{ix[c]} {iy[c]}")
    edge_d = "".join(edge_parts)

    # Single marks of the shown nodes that are not bar tops.
    single = np.flatnonzero(shown & ~bar_top)
    mkeep = single[_unique_rows(np.round(px[single] * 2).astype(np.int64),
                                np.round(py[single] * 2).astype(np.int64), status[single])]
    # Mark size: from the row height, smaller where leaves are close or marks many.
    r = float(np.clip(rh * 0.3, 1.6, 4.5))
    if sx:
        r = min(r, max(1.6, 0.6 * sx))
    if len(mkeep) > 3000:
        r = min(r, 2.0)

    # Depth axis: a label every few levels, at least 16 px apart.
    step = _nice_step(16.0 / rh)
    grid = []
    for d in range(0, max_depth + 1, step):
        y = top + rh * (d + 0.5)
        grid.append(f'<text x="{left - 8}" y="{_n(y + 3.5)}" text-anchor="end">{d}</text>')
    out.append(f'<desc id="{id_prefix}-desc">{n:,} nodes, depth 0 to {max_depth}: '
               f"{len(mkeep):,} drawn one by one and {bar_count:,} subtrees narrower than "
               f"{COLLAPSE_PX} pixels drawn as one bar each. Down children are left of up "
               "children.</desc>")
    out.append(f'<rect x="0" y="0" width="{width}" height="{height}" fill="{BACKGROUND}"/>')
    out.append('<g class="depth-axis" font-size="10" fill="#5b6169">' + "".join(grid)
               + f'<text x="12" y="{_n(top + rows * rh / 2)}" text-anchor="middle" '
               f'transform="rotate(-90 12 {_n(top + rows * rh / 2)})">depth</text></g>')
    if edge_d:
        out.append(f'<path class="edges" fill="none" stroke="{EDGE_COLOUR}" '
                   f'stroke-opacity="0.45" stroke-width="{1 if len(ec) < 20000 else 0.5}" '
                   f'd="{edge_d}"/>')
    if bars_d:
        out.append(bars_d)
    counts_by = np.bincount(status[mkeep], minlength=len(STATUSES))
    for s in np.argsort(-counts_by, kind="stable").tolist():  # the rarest on top
        rows_s = mkeep[status[mkeep] == s]
        if not len(rows_s):
            continue
        style = STATUS_STYLE[s]
        xy = zip(px[rows_s].tolist(), py[rows_s].tolist(), strict=True)
        if r < 2.4:
            # Small marks are squares (as on the web canvas): a zero-length stroke with
            # square caps is one, in a third of the bytes of a filled square.
            d = "".join(f"M{_n(x)} {_n(y)}h0" for x, y in xy)
            paint = (f'fill="none" stroke="{style.colour}" stroke-width="{_n(2 * r)}" '
                     'stroke-linecap="square"')
        else:
            d = "".join(shape_path(style.shape, x, y, r) for x, y in xy)
            paint = f'fill="{style.colour}" fill-rule="evenodd"' + (
                ' stroke="#ffffff" stroke-width="0.75"' if r >= 4 else "")
        out.append(f'<path class="marks" data-status="{STATUSES[s]}" {paint} d="{d}"><title>'
                   f"{STATUSES[s]}: {int(counts_by[s]):,} drawn ({escape(style.hint)})"
                   "</title></path>")
    out += _specials(special, px, py, status, r)
    out.append("</svg>")
    return TreePicture("\n".join(out), n, int(len(mkeep)), bar_count, len(ec),
                       int(hidden.sum()), bar_status)


def _specials(special: Sequence[tuple[str, TreeMark]], px: np.ndarray, py: np.ndarray,
              status: np.ndarray, r: float) -> list[str]:
    out: list[str] = []
    kinds = {"failed": [], "incumbent": [], "note": []}  # drawn in this order
    for kind, mark in special:
        if kind not in kinds:
            raise ValueError(f"special: unknown kind {kind!r}")
        if 0 <= mark.row < len(px) and len(kinds[kind]) < MAX_SPECIAL:
            kinds[kind].append(mark)
    for mark in kinds["failed"]:
        x, y = float(px[mark.row]), float(py[mark.row])
        style = STATUS_STYLE[STATUS_CODE["failed"]]
        out.append(f'<path class="rare" fill="{style.colour}" stroke="#ffffff" stroke-width="1" '
                   f'd="{shape_path(style.shape, x, y, max(r, 3.5))}">'
                   f"<title>{escape(mark.title)}</title></path>")
    ring = max(r + 2.5, 4.5)
    for mark in kinds["incumbent"]:
        x, y = float(px[mark.row]), float(py[mark.row])
        out.append(f'<circle class="incumbent-ring" cx="{_n(x)}" cy="{_n(y)}" r="{_n(ring)}" '
                   f'fill="none" stroke="{INCUMBENT_COLOUR}" stroke-width="2">'
                   f"<title>{escape(mark.title)}</title></circle>")
    for mark in kinds["note"]:
        x, y = float(px[mark.row]), float(py[mark.row])
        out.append(f'<g class="note-mark"><title>{escape(mark.title)}</title>'
                   f'<path d="M{_n(x)} {_n(y)}L{_n(x + 7)} {_n(y - 9)}" stroke="{NOTE_COLOUR}" '
                   f'stroke-width="1.5"/><rect x="{_n(x + 6)}" y="{_n(y - 21)}" '
                   f'width="{8 + 7 * len(mark.label)}" height="13" rx="3" fill="{NOTE_COLOUR}"/>'
                   f'<text x="{_n(x + 10)}" y="{_n(y - 11)}" font-size="10" fill="#ffffff">'
                   f"{escape(mark.label)}</text></g>")
    return out


def tree_picture(table: RunTable, layout: TreeLayout, *, notes: Sequence[dict] = (),
                 id_prefix: str = "tree", title: str = "Search tree",
                 value: Callable[[float], str] = str) -> TreePicture:
    """The picture of a run's tree, with its incumbent nodes, failed nodes and noted
    nodes (``notes`` as read from the notes sidecar, numbered from 1) on top.
    ``value`` formats objective values for the hover titles."""
    c = table.columns
    special: list[tuple[str, TreeMark]] = []
    failed = np.flatnonzero(c["status"] == STATUS_CODE["failed"])
    for row in failed[:MAX_SPECIAL].tolist():
        special.append(("failed", TreeMark(row, "", f"node {int(c['id'][row])}: failed — the "
                                                    "relaxation solver gave no answer")))
    inc = table.incumbents
    for node, obj, src in zip(inc.node.tolist(), inc.objective.tolist(), inc.source.tolist(),
                              strict=True):
        row = _row(table, node)
        if row is not None:
            special.append(("incumbent", TreeMark(
                row, "", f"node {node}: new incumbent {value(obj)} (from {SOURCES[src]})")))
    for k, note in enumerate(notes, start=1):
        row = _row(table, note.get("node"))
        if row is None:
            row = _row_of_step(table, note.get("order"))  # a note on a step: its node
        if row is not None:
            text = str(note.get("text") or "")
            short = text if len(text) <= 140 else text[:139] + "…"
            node = int(c["id"][row])
            special.append(("note", TreeMark(row, str(k), f"note {k} on node {node}: "
                                                          f"{short}")))
    return draw_tree(c["parent_row"], c["depth"], c["status"], layout, special=special,
                     id_prefix=id_prefix, title=title)


def _row_of_step(table: RunTable, order: object) -> int | None:
    """The row solved at processing order ``order``, if the run has one."""
    if order is None or isinstance(order, bool) or not isinstance(order, int):
        return None
    rows = np.flatnonzero(table.columns["order"] == order)
    return int(rows[0]) if len(rows) else None


def _row(table: RunTable, node: object) -> int | None:
    if node is None or isinstance(node, bool):
        return None
    try:
        node_id = int(node)  # type: ignore[call-overload]
    except (TypeError, ValueError):
        return None
    if node_id < 0:
        return None
    try:
        return table.row_of(node_id)
    except KeyError:
        return None
