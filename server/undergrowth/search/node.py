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


def transition(old: Node | None, new: Node, root_lower, root_upper
               ) -> dict[int, tuple[float, float]]:
    """The column bounds to load when moving from ``old``'s bounds to ``new``'s.

    Only the two paths below their deepest common ancestor can differ, so a
    dive costs one step and a jump costs the two path lengths, not the depth.
    """
    if old is None:
        return new.bound_changes()
    a, b = old, new
    old_side: set[int] = set()
    new_side: dict[int, tuple[float, float]] = {}
    while a is not b:
        if a.depth >= b.depth:
            if a.var >= 0:
                old_side.add(a.var)
            a = a.parent
        else:
            if b.var >= 0 and b.var not in new_side:
                new_side[b.var] = (b.lower, b.upper)
            b = b.parent
    need = old_side.difference(new_side)
    anc: Node | None = a
    while need and anc is not None and anc.var >= 0:
        if anc.var in need:
            new_side[anc.var] = (anc.lower, anc.upper)
            need.discard(anc.var)
        anc = anc.parent
    for j in need:
        new_side[j] = (float(root_lower[j]), float(root_upper[j]))
    return new_side
