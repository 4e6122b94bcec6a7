"""Tidy tree layout: checked against a plain recursive layout on small trees, and
for speed on a million nodes (the web front end asks for that size)."""

from __future__ import annotations

import time

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from undergrowth.analysis import layout as layout_module
from undergrowth.analysis.layout import layout_for_table, tidy_layout
from undergrowth.analysis.table import RunTable


def reference_layout(parent, key):
    """The textbook definition, written as a recursion over children lists (common practice)."""
    n = len(parent)
    kids = {i: [] for i in range(n)}
    roots = []
    for r, p in enumerate(parent):
        (roots if p < 0 else kids[p]).append(r)
    for v in kids:
        kids[v].sort(key=lambda c: (key[c], c))
    roots.sort(key=lambda c: (key[c], c))
    x, lo, hi, size = [0.0] * n, [0.0] * n, [0.0] * n, [0] * n
    next_leaf = [0]

    def visit(v):
        if not kids[v]:
            x[v] = lo[v] = hi[v] = float(next_leaf[0])
            next_leaf[0] += 1
            size[v] = 1
            return
        for c in kids[v]:
            visit(c)
        first, last = kids[v][0], kids[v][-1]
        x[v] = (x[first] + x[last]) / 2
        lo[v], hi[v] = lo[first], hi[last]
        size[v] = 1 + sum(size[c] for c in kids[v])

    for r in roots:
        visit(r)
    return x, lo, hi, size


@st.composite
def trees(draw):
    n = draw(st.integers(1, 60))
    parent, depth = [-1], [0]
    for r in range(1, n):
        p = draw(st.integers(-1, r - 1)) if draw(st.booleans()) else draw(st.integers(0, r - 1))
        parent.append(p)
        depth.append(0 if p < 0 else depth[p] + 1)
    key = draw(st.lists(st.integers(0, 2), min_size=n, max_size=n))
    return np.array(parent), np.array(depth), np.array(key)


@settings(max_examples=150, deadline=None)
@given(trees(), st.booleans())
def test_layout_matches_the_recursive_definition(tree, deep_path):
    parent, depth, key = tree
    old = layout_module.DEEP_LEVELS
    layout_module.DEEP_LEVELS = 0 if deep_path else 10**9  # exercise both code paths
    try:
        got = tidy_layout(parent, depth, sibling_key=key)
    finally:
        layout_module.DEEP_LEVELS = old
    x, lo, hi, size = reference_layout(parent.tolist(), key.tolist())
    assert got.x.tolist() == x
    assert got.x_min.tolist() == lo
    assert got.x_max.tolist() == hi
    assert got.subtree_size.tolist() == size
    assert got.leaves == sum(1 for v in range(len(parent)) if v not in set(parent.tolist()))


def test_a_small_tree_by_hand():
    #        0
    #      /   \
    #     1     2        (1 is the down child, 2 the up child)
    #    / \
    #   3   4
    parent = np.array([-1, 0, 0, 1, 1])
    depth = np.array([0, 1, 1, 2, 2])
    got = tidy_layout(parent, depth, sibling_key=np.array([0, 1, 2, 1, 2]))
    assert got.x.tolist() == [1.25, 0.5, 2.0, 0.0, 1.0]
    assert got.x_min.tolist() == [0, 0, 2, 0, 1]
    assert got.x_max.tolist() == [2, 1, 2, 0, 1]
    assert got.subtree_size.tolist() == [5, 3, 1, 1, 1]
    assert got.leaves == 3


def test_sibling_key_puts_the_down_child_left_whatever_the_log_order():
    parent = np.array([-1, 0, 0])
    got = tidy_layout(parent, np.array([0, 1, 1]), sibling_key=np.array([0, 2, 1]))
    assert got.x[2] < got.x[1]  # row 2 is the down child (key 1)


def test_empty_tree_and_bad_depths():
    assert len(tidy_layout(np.array([], dtype=int), np.array([], dtype=int))) == 0
    with pytest.raises(ValueError, match="depth"):
        tidy_layout(np.array([-1, 0]), np.array([0, 2]))


def _bushy_tree(n: int, seed: int = 0):
    """A random binary tree grown level by level: about half the nodes branch."""
    rng = np.random.default_rng(seed)
    parents, depths, level, total, d = [np.array([-1])], [np.array([0])], np.array([0]), 1, 0
    while total < n:
        chosen = level[rng.random(len(level)) < 0.52]
        if len(chosen) == 0:
            chosen = level[:1]
        kids_parent = np.repeat(chosen, 2)
        d += 1
        parents.append(kids_parent)
        depths.append(np.full(len(kids_parent), d))
        level = np.arange(total, total + len(kids_parent))
        total += len(kids_parent)
    return np.concatenate(parents), np.concatenate(depths)


def _long_dive(n: int):
    """Each level: two children, the first one branches again (depth n / 2)."""
    parent = np.empty(n, dtype=np.int64)
    level = (np.arange(1, n) + 1) // 2
    parent[0] = -1
    parent[1:] = np.where(level == 1, 0, 2 * (level - 1) - 1)
    return parent, np.r_[0, level]


@pytest.mark.parametrize("shape", ["bushy", "dive"])
def test_a_million_nodes_in_a_couple_of_seconds(shape):
    parent, depth = _bushy_tree(1_000_000) if shape == "bushy" else _long_dive(1_000_000)
    t0 = time.perf_counter()
    got = tidy_layout(parent, depth)
    seconds = time.perf_counter() - t0
    assert len(got) == len(parent)
    assert got.x_max.max() == got.leaves - 1
    # Target 1-2 s on a small laptop; the bound leaves room for a busy CI machine.
    assert seconds < 6.0, f"{shape}: {seconds:.2f} s"


def test_layout_is_cached_beside_the_table_and_refreshed(tmp_path):
    from undergrowth.runlog.writer import RunLogWriter
    from undergrowth.samples import oven_batching
    from undergrowth.search import Search, SearchSettings

    search = Search(oven_batching(), SearchSettings(branching="most-fractional",
                                                    select="best-bound"))
    path = tmp_path / "oven.jsonl"
    with RunLogWriter(path, search.header()) as writer:
        for ev in search.events():
            writer.write(ev)
    table = RunTable.open(path)
    cache = str(tmp_path / "oven.layout.npz")
    first = layout_for_table(table, cache_file=cache)
    assert (tmp_path / "oven.layout.npz").exists()
    again = layout_for_table(table, cache_file=cache)
    assert np.array_equal(first.x, again.x) and first.leaves == again.leaves
    (tmp_path / "oven.layout.npz").write_bytes(b"damaged")
    assert np.array_equal(layout_for_table(table, cache_file=cache).x, first.x)
