"""Plain-language sentences: why a node has the status it has.

Each function takes the facts as plain values and returns one short paragraph.
Numbers are shown with up to six significant digits.
"""

from __future__ import annotations

from typing import Any

__all__ = ["status_reason"]


def num(v: float | None) -> str:
    if v is None:
        return "unknown"
    return f"{v:.6g}"


def _change(branch: dict[str, Any] | None) -> str:
    if not branch:
        return ""
    sign = "≤" if branch["dir"] == "down" else "≥"
    return f"{branch['name'] or 'x' + str(branch['var'])} {sign} {num(branch['value'])}"


def _incumbent(inc: dict[str, Any] | None) -> str:
    if inc is None:
        return "the best known solution"
    where = f" found at node {inc['node']}" if inc.get("node") is not None else (
        " given as a start solution" if inc.get("source") == "start" else "")
    return f"the incumbent {num(inc['objective'])}{where}"


def status_reason(*, status: str, node: dict[str, Any], incumbent: dict[str, Any] | None,
                  found_here: dict[str, Any] | None, children: list[int],
                  end_status: str | None) -> str:
    """Why ``node`` (its event fields) ended as ``status``.

    ``incumbent``: the best solution known when the node was decided (None if none);
    ``found_here``: the incumbent this node produced, if any; ``children``: child ids;
    ``end_status``: how the search ended (None if the log has no end)."""
    bound = node.get("bound")
    lp = node.get("lp") or {}
    lookahead = (node.get("message") or "").startswith("closed by the branching rule")
    if status == "branched":
        b = node.get("branching")
        rival = ("there was no incumbent yet" if incumbent is None else
                 "the bound could still beat " + _incumbent(incumbent))
        text = (f"Its relaxation value {num(lp.get('objective', bound))} left "
                f"{node.get('fractional', 0)} integer variable(s) fractional and {rival}, so "
                "the search branched")
        if b:
            text += (f": the {b.get('rule') or 'branching'} rule chose {b['name']} = "
                     f"{num(b['value'])}")
            if b.get("score") is not None:
                text += f" (score {num(b['score'])})"
            ru = b.get("runner_up")
            if ru:
                text += f", ahead of {ru['name']} (score {num(ru.get('score'))})"
        text += "."
        if children:
            text += f" Its children are node{'s' if len(children) > 1 else ''} " + \
                ", ".join(str(c) for c in children) + "."
        if b and (b.get("down_bound") is not None or b.get("up_bound") is not None):
            text += (f" The look-ahead saw child bounds {num(b.get('down_bound'))} (down) and "
                     f"{num(b.get('up_bound'))} (up).")
        return text
    if status == "integral":
        text = (f"Its relaxation solution satisfies every integrality requirement, with value "
                f"{num(lp.get('objective', bound))}")
        if found_here is not None:
            return text + f", and it became the new incumbent {num(found_here['objective'])}."
        return (text + ", but it does not improve on " + _incumbent(incumbent) +
                ", so the node closes without a new solution.")
    if status == "pruned":
        text = (f"Its bound {num(bound)} cannot beat " + _incumbent(incumbent) +
                ", so nothing below it can be better and it was not branched on")
        if found_here is not None:
            text += (" (the incumbent came from rounding this very node's relaxation "
                     "solution)")
        text += "."
        if lookahead:
            text += " It was closed by the branching rule's look-ahead solve at its parent."
        elif node.get("fractional"):
            text += (f" Its relaxation still had {node['fractional']} fractional integer "
                     "variable(s).")
        return text
    if status == "infeasible":
        change = _change(node.get("branch"))
        text = ("Its relaxation has no feasible point with the bounds on its path"
                + (f" (the last change: {change})" if change else "")
                + ", so no integer solution lies below it.")
        if lookahead:
            text += " The branching rule's look-ahead solve at its parent found this."
        return text
    if status == "discarded":
        return ("It was never solved: when the search found " + _incumbent(incumbent) +
                f", this node's inherited bound {num(bound)} could no longer beat it, so it was "
                "dropped from the list of open nodes.")
    if status == "open":
        how = f"stopped ({end_status})" if end_status else "log ends"
        return (f"It was still waiting to be solved when the {how}; its inherited bound is "
                f"{num(bound)}. The search below it was never explored.")
    if status == "failed":
        message = node.get("message") or "no reason given"
        return (f"The relaxation solver gave no usable answer ({message}). The region below "
                "this node is unexplored, so the search cannot prove its result.")
    return f"Its status is {status}."
