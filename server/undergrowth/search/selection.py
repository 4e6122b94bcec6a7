"""Node selection: which open node to solve next.

Every order is a priority on one heap with lazy deletion; a second heap keyed
by the node bound gives the global dual bound for any order.
"""

from __future__ import annotations

import heapq
import itertools
from collections.abc import Iterator

from .node import Node


class OpenList:
    """Open nodes under one node order. ``priority(node, push_seq)`` is minimised."""

    def __init__(self, order: str, *, down_first: bool = True) -> None:
        self.order = order
        self.down_first = down_first
        self._heap: list[tuple[tuple, int, Node]] = []
        self._bounds: list[tuple[float, int, Node]] = []
        self._seq = itertools.count()
        self._size = 0
        # best-bound and hybrid pop by bound already: the main heap gives the dual bound
        self._by_bound = order in ("best-bound", "hybrid")

    def __len__(self) -> int:
        return self._size

    def _priority(self, node: Node, seq: int) -> tuple:
        o = self.order
        if o == "depth-first":
            return (-seq,)  # last pushed, first out
        if o == "breadth-first":
            return (seq,)
        if o == "best-estimate":
            return (node.estimate, node.id)
        return (node.bound, node.id)  # best-bound and hybrid: ties to the older node

    def push_children(self, children: list[Node]) -> None:
        """Children arrive as [down, up]; depth-first pops the preferred one first."""
        if self.order == "depth-first" and self.down_first:
            children = children[::-1]
        for child in children:
            self.push(child)

    def push(self, node: Node) -> None:
        seq = next(self._seq)
        node.in_open = True
        heapq.heappush(self._heap, (self._priority(node, seq), node.id, node))
        if not self._by_bound:
            heapq.heappush(self._bounds, (node.bound, node.id, node))
        self._size += 1

    def pop(self) -> Node | None:
        heap = self._heap
        while heap:
            node = heapq.heappop(heap)[2]
            if node.in_open:
                node.in_open = False
                self._size -= 1
                return node
        return None

    def take(self, node: Node) -> Node:
        """Remove a particular open node (a plunge into a child)."""
        assert node.in_open
        node.in_open = False
        self._size -= 1
        return node

    def min_bound(self) -> float:
        if self._by_bound:
            h = self._heap
            while h and not h[0][2].in_open:
                heapq.heappop(h)
            return h[0][0][0] if h else float("inf")
        b = self._bounds
        while b and not b[0][2].in_open:
            heapq.heappop(b)
        return b[0][0] if b else float("inf")

    def sweep(self, threshold: float) -> list[Node]:
        """Remove and return every open node whose bound is at least ``threshold``."""
        gone = [n for _, _, n in self._heap if n.in_open and n.bound >= threshold]
        for n in gone:
            n.in_open = False
        self._size -= len(gone)
        if gone:
            self._heap = [e for e in self._heap if e[2].in_open]
            heapq.heapify(self._heap)
        return sorted(gone, key=lambda n: n.id)

    def drain(self) -> Iterator[Node]:
        """Every node still open, by id, removing them."""
        rest = sorted((n for _, _, n in self._heap if n.in_open), key=lambda n: n.id)
        for n in rest:
            n.in_open = False
        self._size = 0
        self._heap.clear()
        self._bounds.clear()
        yield from rest
