"""Tidy layout of a search tree: leaves one unit apart, each parent over its children.

Leaves get x = 0, 1, 2, ... in depth-first order (siblings ordered by a key,
then by row: the down child left of the up child); each parent sits midway
between its first and last child. Per node we also give the leaf span of its
subtree (``x_min``, ``x_max``) and the number of nodes in it
(``subtree_size``), which a renderer uses to collapse subtrees narrower than a
pixel.

Everything is computed with numpy, one vectorised step per depth level (a
few hundred Python iterations at most), so a million nodes take about a
second. Rows whose parent is -1 are roots; several roots are laid out side by
side under an invisible common root.

`layout_for_table` caches the result beside the table cache as
``<file>.layout.npz``, keyed like the table.
"""

from __future__ import annotations

import contextlib
import json
import os
import secrets
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

if TYPE_CHECKING:
    from .table import RunTable

__all__ = ["LAYOUT_SUFFIX", "TreeLayout", "layout_for_table", "tidy_layout"]

LAYOUT_SUFFIX = ".layout.npz"
LAYOUT_FORMAT = 1  # bump when the arrays or their meaning change
# Above this many levels the per-level numpy steps cost more than one pass over rows.
DEEP_LEVELS = 4096


@dataclass(frozen=True)
class TreeLayout:
    """Per-row layout arrays (row order of the input)."""

    x: np.ndarray  # float64: horizontal position
    x_min: np.ndarray  # float64: leftmost leaf of the subtree
    x_max: np.ndarray  # float64: rightmost leaf of the subtree
    subtree_size: np.ndarray  # int64: nodes in the subtree, the node included
    leaves: int  # number of leaves (the layout's width is leaves - 1)

    def __len__(self) -> int:
        return len(self.x)


def _empty() -> TreeLayout:
    f = np.zeros(0, dtype=np.float64)
    return TreeLayout(x=f, x_min=f.copy(), x_max=f.copy(),
                      subtree_size=np.zeros(0, dtype=np.int64), leaves=0)


def tidy_layout(
    parent: np.ndarray, depth: np.ndarray, *, sibling_key: np.ndarray | None = None
) -> TreeLayout:
    """Lay out the tree given by ``parent`` (row of each node's parent, -1 for a root)
    and ``depth`` (root 0, child = parent + 1). Siblings are ordered by
    ``sibling_key`` (smaller first), ties by row."""
    parent = np.asarray(parent, dtype=np.int64)
    depth = np.asarray(depth, dtype=np.int64)
    n = len(parent)
    if len(depth) != n:
        raise ValueError(f"depth: expected {n} values, got {len(depth)}")
    if n == 0:
        return _empty()
    key = (np.zeros(n, dtype=np.int64) if sibling_key is None
           else np.asarray(sibling_key, dtype=np.int64))
    if len(key) != n:
        raise ValueError(f"sibling_key: expected {n} values, got {len(key)}")

    # A virtual root (index n) above every real root keeps one code path for forests.
    top = n
    par = np.where(parent < 0, top, parent)
    dep = depth + 1
    if np.any(dep[parent >= 0] != dep[par[parent >= 0]] + 1):
        raise ValueError("depth: a child's depth must be its parent's depth plus one")

    # Every real node is somebody's child: sort children by (level, parent, key, row).
    # lexsort is stable, so the row order breaks the remaining ties.
    child = np.lexsort((key, par, dep))
    child_parent = par[child]
    child_level = dep[child]

    # Sibling groups: runs of equal parent in the sorted order (a parent has one level,
    # so groups never straddle levels).
    starts = np.flatnonzero(np.r_[True, child_parent[1:] != child_parent[:-1]])
    ends = np.r_[starts[1:], n]
    group_parent = child_parent[starts]
    group_level = child_level[starts]
    nodes = n + 1
    first_child = np.full(nodes, -1, dtype=np.int64)
    last_child = np.full(nodes, -1, dtype=np.int64)
    first_child[group_parent] = child[starts]
    last_child[group_parent] = child[ends - 1]

    levels = int(dep.max())
    if levels > DEEP_LEVELS and bool(np.all(parent < np.arange(n))):
        # Very deep trees (long dives): one pass over rows beats thousands of tiny levels.
        pre, size, x = _by_rows(child, child_parent, starts, ends, group_parent,
                                first_child, last_child, nodes)
        return _finish(pre, size, x, first_child, n)
    # Slices of `child` and of the group arrays for each child level 1..levels.
    level_bounds = np.searchsorted(child_level, np.arange(1, levels + 2))
    group_bounds = np.searchsorted(group_level, np.arange(1, levels + 2))

    # Subtree sizes, deepest level first: a parent adds its children's sums.
    size = np.ones(nodes, dtype=np.int64)
    for lv in range(levels, 0, -1):
        a, b = level_bounds[lv - 1], level_bounds[lv]
        ga, gb = group_bounds[lv - 1], group_bounds[lv]
        if a == b:
            continue
        sums = np.add.reduceat(size[child[a:b]], starts[ga:gb] - a)
        size[group_parent[ga:gb]] += sums

    # Pre-order positions, top level first: a child follows its parent and the
    # whole subtrees of its earlier siblings.
    pre = np.zeros(nodes, dtype=np.int64)
    for lv in range(1, levels + 1):
        a, b = level_bounds[lv - 1], level_bounds[lv]
        ga, gb = group_bounds[lv - 1], group_bounds[lv]
        if a == b:
            continue
        kids = child[a:b]
        s = size[kids]
        before = np.cumsum(s) - s  # sizes of earlier nodes in this level slice
        local = starts[ga:gb] - a
        base = np.repeat(before[local], ends[ga:gb] - starts[ga:gb])
        pre[kids] = pre[child_parent[a:b]] + 1 + before - base

    x_min, x_max = _leaf_spans(pre, size, first_child < 0)

    # Parents centred over their first and last child, deepest level first.
    x = np.where(first_child < 0, x_min, 0.0)
    for lv in range(levels, 0, -1):
        ga, gb = group_bounds[lv - 1], group_bounds[lv]
        if ga == gb:
            continue
        p = group_parent[ga:gb]
        x[p] = 0.5 * (x[first_child[p]] + x[last_child[p]])
    return _finish(pre, size, x, first_child, n)


def _leaf_spans(pre: np.ndarray, size: np.ndarray, leaf: np.ndarray
                ) -> tuple[np.ndarray, np.ndarray]:
    """Leaves numbered in pre-order; a subtree's leaves are a contiguous run of them."""
    leaf_at = np.zeros(len(pre), dtype=np.int64)
    leaf_at[pre[leaf]] = 1
    upto = np.cumsum(leaf_at)  # leaves at pre-order positions <= p
    x_min = (upto - leaf_at)[pre].astype(np.float64)
    x_max = (upto[pre + size - 1] - 1).astype(np.float64)
    return x_min, x_max


def _finish(pre: np.ndarray, size: np.ndarray, x: np.ndarray, first_child: np.ndarray,
            n: int) -> TreeLayout:
    leaf = first_child < 0
    x_min, x_max = _leaf_spans(pre, size, leaf)
    return TreeLayout(x=x[:n], x_min=x_min[:n], x_max=x_max[:n],
                      subtree_size=size[:n], leaves=int(leaf[:n].sum()))


def _by_rows(child: np.ndarray, child_parent: np.ndarray, starts: np.ndarray,
             ends: np.ndarray, group_parent: np.ndarray, first_child: np.ndarray,
             last_child: np.ndarray, nodes: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """The same layout in plain loops over rows, for trees whose parents precede
    their children (true of every run table). Cost is linear in the node count
    whatever the depth."""
    n = nodes - 1
    top = n
    par = np.empty(nodes, dtype=np.int64)
    par[child] = child_parent
    par[top] = -1
    par_l = par.tolist()
    size_l = [1] * nodes
    for r in range(n - 1, -1, -1):  # children before parents: rows descending
        size_l[par_l[r]] += size_l[r]
    # Groups by ascending parent row: a parent's position is set before its children's.
    order = np.argsort(group_parent[group_parent != top], kind="stable")
    real = np.flatnonzero(group_parent != top)
    group_seq = np.r_[np.flatnonzero(group_parent == top), real[order]].tolist()
    pre_l = [0] * nodes
    child_l, starts_l, ends_l, gp_l = (child.tolist(), starts.tolist(), ends.tolist(),
                                       group_parent.tolist())
    for g in group_seq:
        slot = pre_l[gp_l[g]] + 1
        for i in range(starts_l[g], ends_l[g]):
            c = child_l[i]
            pre_l[c] = slot
            slot += size_l[c]
    pre = np.array(pre_l, dtype=np.int64)
    size = np.array(size_l, dtype=np.int64)
    leaf = first_child < 0
    x_min, _ = _leaf_spans(pre, size, leaf)
    x_l = np.where(leaf, x_min, 0.0).tolist()
    fc_l, lc_l = first_child.tolist(), last_child.tolist()
    for g in reversed(group_seq):  # deeper parents (larger rows) first
        p = gp_l[g]
        x_l[p] = 0.5 * (x_l[fc_l[p]] + x_l[lc_l[p]])
    return pre, size, np.array(x_l, dtype=np.float64)


def table_layout(table: RunTable) -> TreeLayout:
    """The layout of a run: down children left of up children, then in log order."""
    c = table.columns
    return tidy_layout(c["parent_row"], c["depth"], sibling_key=c["branch_dir"])


# ------------------------------------------------------------------------ cache
def layout_cache_path(table_cache_file: str) -> str:
    """``<file>.layout.npz`` beside ``<file>.table.npz``."""
    base = table_cache_file
    if base.endswith(".table.npz"):
        base = base[: -len(".table.npz")]
    return base + LAYOUT_SUFFIX


def layout_for_table(table: RunTable, *, cache_file: str | None = None) -> TreeLayout:
    """The run's layout, read from ``cache_file`` when it matches the run file,
    else computed and written there (an unwritable place just means no cache).
    ``cache_file`` defaults to ``<run file>.layout.npz``. For a file that is still
    growing (a live run) call `table_layout` instead: there is nothing to keep."""
    from .table import _cache_key  # the table's own freshness key, reused on purpose

    target = cache_file or (table.path + LAYOUT_SUFFIX)
    key = _cache_key(table.path)
    if key is not None:
        key = {**key, "layout_format": LAYOUT_FORMAT, "nodes": len(table)}
        cached = _load(target, key, len(table))
        if cached is not None:
            return cached
    layout = table_layout(table)
    if key is not None:
        _save(target, key, layout)
    return layout


def _load(target: str, key: dict, n: int) -> TreeLayout | None:
    try:
        with np.load(target, allow_pickle=False) as npz:
            meta = json.loads(bytes(npz["meta"]).decode("utf-8"))
            if meta.get("key") != key:
                return None
            arrays = {k: npz[k] for k in ("x", "x_min", "x_max", "subtree_size")}
    except Exception:  # noqa: BLE001 - an unreadable cache is simply recomputed
        return None
    if any(len(a) != n for a in arrays.values()):
        return None
    return TreeLayout(**arrays, leaves=int(meta["leaves"]))


def _save(target: str, key: dict, layout: TreeLayout) -> None:
    meta = json.dumps({"key": key, "leaves": layout.leaves}).encode("utf-8")
    tmp = f"{target}.{os.getpid()}.{secrets.token_hex(4)}.tmp"
    try:
        with open(tmp, "xb") as f:
            np.savez(f, meta=np.frombuffer(meta, dtype=np.uint8), x=layout.x,
                     x_min=layout.x_min, x_max=layout.x_max,
                     subtree_size=layout.subtree_size)
        os.replace(tmp, target)  # readers never see half a file
    except OSError:
        with contextlib.suppress(OSError):
            os.unlink(tmp)
