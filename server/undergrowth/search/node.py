"""A node of the search tree as the engine holds it."""

from __future__ import annotations


class Node:
    """One node; it stores only the bound change that created it and walks up
    to its ancestors for the rest, so open nodes stay small."""

    __slots__ = ("id", "parent", "depth", "var", "direction", "lower", "upper", "bound",
                 "estimate", "basis", "in_open", "parent_objective", "parent_value", "name")

    def __init__(self, id: int, parent: Node | None, depth: int, bound: float) -> None:
        self.id = id
        self.parent = parent
        self.depth = depth
        self.var = -1  # branching variable that created this node
        self.direction = 0  # 0 root, 1 down (x <= value), 2 up (x >= value)
        self.lower = 0.0  # the new column bounds for ``var``
        self.upper = 0.0
        self.bound = bound  # inherited bound (minimisation form) until solved
        self.estimate = bound
        self.basis: object | None = None  # the parent's final basis, for a warm start
        self.in_open = False
        self.parent_objective = bound  # parent's relaxation value (pseudocost updates)
        self.parent_value = 0.0  # parent's value of ``var``
        self.name = ""

    def bound_changes(self) -> dict[int, tuple[float, float]]:
        """Column bounds that differ from the root's, from this node's path."""
        out: dict[int, tuple[float, float]] = {}
        node: Node | None = self
        while node is not None and node.var >= 0:
            if node.var not in out:  # the deepest change is the tightest
                out[node.var] = (node.lower, node.upper)
            node = node.parent
        return out
