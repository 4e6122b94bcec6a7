"""Branching rules: each a small strategy object choosing one fractional variable.

Scores are "larger is better" except where a rule says otherwise. Product
score for look-ahead and pseudocost rules: max(Δ⁻, ε)·max(Δ⁺, ε)
(Achterberg, Koch & Martin, "Branching rules revisited", Operations Research
Letters 33(1), 2005).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from .pseudocost import Pseudocosts
from .relaxation import CUTOFF, INFEASIBLE, ITERATION_LIMIT, OPTIMAL, Relaxation

EPSILON = 1e-6
# Scores this close (relative) to the best count as tied; ties go to the lowest index.
TIE_TOLERANCE = 1e-9
# Gain credited to a child that is infeasible or cannot beat the incumbent: it
# is "as good as it gets", but kept finite so scores stay printable.
CLOSED_CHILD_GAIN = 1e12


@dataclass(slots=True)
class BranchContext:
    candidates: np.ndarray  # fractional integer columns, ascending
    values: np.ndarray  # their relaxation values
    bound: float  # node relaxation objective, minimisation form
    relaxation: Relaxation
    pseudocosts: Pseudocosts
    rng: np.random.Generator
    basis: object | None  # the node's basis, restored before each look-ahead solve
    cutoff: float | None  # incumbent in minimisation form (None: no incumbent)


@dataclass(slots=True)
class BranchDecision:
    var: int
    value: float
    score: float
    down_bound: float | None = None  # child bounds seen by a look-ahead (min form; inf = closed)
    up_bound: float | None = None
    runner_up: tuple[int, float] | None = None
    lookahead_iterations: int = 0
    lookahead_seconds: float = 0.0
    children_seen: dict[int, tuple[float, float]] = field(default_factory=dict)


def _closed(bound: float, cutoff: float | None) -> bool:
    return bound == math.inf or (cutoff is not None and bound >= cutoff)


def fractionality(values: np.ndarray) -> np.ndarray:
    f = values - np.floor(values)
    return np.minimum(f, 1.0 - f)


def _pick(candidates: np.ndarray, scores: np.ndarray, values: np.ndarray,
          *, largest: bool = True) -> BranchDecision:
    """Best score, ties to the lowest index (candidates are ascending); runner-up kept.
    Scores within TIE_TOLERANCE (relative) of the best tie: relaxation round-off
    (0.2500000000000004 against 0.25) must not decide."""
    if len(scores) <= _SMALL:
        return _pick_small(candidates, scores, values, largest)
    key = -scores if largest else scores
    top = float(key.min())  # a Python float: numpy scalar arithmetic costs microseconds
    best = int(np.argmax(key <= top + TIE_TOLERANCE * abs(top)))  # first index within ties
    runner = None
    if len(key) > 1:
        others = key.copy()
        others[best] = np.inf
        r = int(np.argmin(others))  # argmin keeps the first of equal keys
        runner = (int(candidates[r]), float(scores[r]))
    return BranchDecision(int(candidates[best]), float(values[best]), float(scores[best]),
                          runner_up=runner)


# Below this many candidates plain Python beats numpy's per-call cost (measured:
# about 3 µs against 10 µs a choice); the two paths choose identically.
_SMALL = 48


def _pick_small(candidates: np.ndarray, scores: np.ndarray, values: np.ndarray,
                largest: bool) -> BranchDecision:
    sc = scores.tolist()
    key = [-v for v in sc] if largest else sc
    top = min(key)
    limit = top + TIE_TOLERANCE * abs(top)
    best = next(i for i, k in enumerate(key) if k <= limit)
    runner = None
    if len(key) > 1:
        r = 1 if best == 0 else 0
        for i in range(r + 1, len(key)):
            if i != best and key[i] < key[r]:
                r = i
        runner = (int(candidates[r]), sc[r])
    return BranchDecision(int(candidates[best]), float(values[best]), sc[best],
                          runner_up=runner)


class BranchingRule:
    name = "rule"

    def choose(self, ctx: BranchContext) -> BranchDecision:
        raise NotImplementedError


class MostFractional(BranchingRule):
    """Fractional part closest to ½; score = min(f, 1 − f)."""
    name = "most-fractional"

    def choose(self, ctx: BranchContext) -> BranchDecision:
        return _pick(ctx.candidates, fractionality(ctx.values), ctx.values)


class LeastFractional(BranchingRule):
    """Fractional part closest to an integer; score = min(f, 1 − f), smallest wins."""
    name = "least-fractional"

    def choose(self, ctx: BranchContext) -> BranchDecision:
        return _pick(ctx.candidates, fractionality(ctx.values), ctx.values, largest=False)


class FirstIndex(BranchingRule):
    """The fractional column with the lowest index; score = min(f, 1 − f)."""
    name = "first-index"

    def choose(self, ctx: BranchContext) -> BranchDecision:
        fr = fractionality(ctx.values)
        runner = (int(ctx.candidates[1]), float(fr[1])) if len(fr) > 1 else None
        return BranchDecision(int(ctx.candidates[0]), float(ctx.values[0]), float(fr[0]),
                              runner_up=runner)


class RandomRule(BranchingRule):
    """A uniformly random fractional column from the search's seeded generator."""
    name = "random"

    def choose(self, ctx: BranchContext) -> BranchDecision:
        k = int(ctx.rng.integers(len(ctx.candidates)))
        fr = fractionality(ctx.values)
        return BranchDecision(int(ctx.candidates[k]), float(ctx.values[k]), float(fr[k]))


def _pseudocost_scores(ctx: BranchContext) -> np.ndarray:
    down = ctx.values - np.floor(ctx.values)
    up = 1.0 - down
    psi_down, psi_up = ctx.pseudocosts.values(ctx.candidates)
    return np.maximum(psi_down * down, EPSILON) * np.maximum(psi_up * up, EPSILON)


class PseudocostRule(BranchingRule):
    """Product of predicted gains from pseudocosts (unseen variables use the average)."""
    name = "pseudocost"

    def choose(self, ctx: BranchContext) -> BranchDecision:
        return _pick(ctx.candidates, _pseudocost_scores(ctx), ctx.values)


class _Lookahead:
    """Solves both children of one candidate on the shared relaxation."""

    def __init__(self, ctx: BranchContext, iteration_limit: int | None) -> None:
        self.ctx = ctx
        self.iterations = 0
        self.seconds = 0.0
        self.seen: dict[int, tuple[float, float]] = {}
        ctx.relaxation.set_iteration_limit(iteration_limit)
        ctx.relaxation.set_cutoff(ctx.cutoff)

    def child_gain(self, j: int, lower: float, upper: float) -> tuple[float, float]:
        """(child bound, gain) with the column's bounds set to [lower, upper]."""
        relax = self.ctx.relaxation
        relax.set_basis(self.ctx.basis)
        relax.set_one_bound(j, lower, upper)
        res = relax.solve(want_x=False)
        relax.restore_one_bound(j)
        self.iterations += res.iterations
        self.seconds += res.seconds
        if res.status == INFEASIBLE:
            return math.inf, CLOSED_CHILD_GAIN
        if res.status == CUTOFF:  # passed the incumbent: its objective is still a valid bound
            return res.objective, CLOSED_CHILD_GAIN
        if res.status in (OPTIMAL, ITERATION_LIMIT):
            return res.objective, max(res.objective - self.ctx.bound, 0.0)
        return self.ctx.bound, 0.0  # no usable answer: assume no gain

    def evaluate(self, k: int) -> tuple[float, float, float]:
        """(score, down bound, up bound) for candidate position ``k``; pseudocosts updated."""
        ctx = self.ctx
        j = int(ctx.candidates[k])
        v = float(ctx.values[k])
        lo, up = float(ctx.relaxation.lower[j]), float(ctx.relaxation.upper[j])
        f = v - math.floor(v)
        down_bound, down_gain = self.child_gain(j, lo, math.floor(v))
        up_bound, up_gain = self.child_gain(j, math.ceil(v), up)
        if down_gain < CLOSED_CHILD_GAIN:
            ctx.pseudocosts.update(j, 0, down_gain, f)
        if up_gain < CLOSED_CHILD_GAIN:
            ctx.pseudocosts.update(j, 1, up_gain, 1.0 - f)
        self.seen[j] = (down_bound, up_bound)
        return max(down_gain, EPSILON) * max(up_gain, EPSILON), down_bound, up_bound

    def finish(self) -> None:
        relax = self.ctx.relaxation
        relax.set_iteration_limit(None)
        relax.set_cutoff(None)
        relax.set_basis(self.ctx.basis)


def _decision_from(ctx: BranchContext, scores: np.ndarray, bounds: dict[int, tuple[float, float]],
                   look: _Lookahead) -> BranchDecision:
    d = _pick(ctx.candidates, scores, ctx.values)
    if d.var in bounds:
        d.down_bound, d.up_bound = bounds[d.var]
    d.lookahead_iterations = look.iterations
    d.lookahead_seconds = look.seconds
    d.children_seen = look.seen
    return d


class StrongRule(BranchingRule):
    """Full strong branching: solve both children of every candidate (or of the
    ``candidates`` most fractional ones), with an optional iteration limit."""
    name = "strong"

    def __init__(self, *, candidates: int | None = None, iterations: int | None = None) -> None:
        self.max_candidates = candidates
        self.iteration_limit = iterations

    def choose(self, ctx: BranchContext) -> BranchDecision:
        k_all = np.arange(len(ctx.candidates))
        if self.max_candidates is not None and len(k_all) > self.max_candidates:
            order = np.argsort(-fractionality(ctx.values), kind="stable")
            k_all = np.sort(order[: self.max_candidates])
        scores = np.full(len(ctx.candidates), -1.0)
        look = _Lookahead(ctx, self.iteration_limit)
        bounds: dict[int, tuple[float, float]] = {}
        try:
            for k in k_all:
                s, lo_b, up_b = look.evaluate(int(k))
                scores[k] = s
                bounds[int(ctx.candidates[k])] = (lo_b, up_b)
                if _closed(lo_b, ctx.cutoff) and _closed(up_b, ctx.cutoff):
                    break  # both children closed: this node is done whichever we pick
        finally:
            look.finish()
        return _decision_from(ctx, scores, bounds, look)


class ReliabilityRule(BranchingRule):
    """Reliability branching (Achterberg, Koch & Martin 2005): pseudocost scores,
    with strong branching on candidates whose pseudocosts rest on fewer than η
    observations in either direction; strong branching stops after λ
    candidates in a row that do not improve the best score."""
    name = "reliability"

    def __init__(self, *, threshold: int = 8, lookahead: int = 4, max_candidates: int = 100,
                 iterations: int | None = None) -> None:
        self.threshold = threshold
        self.lookahead = lookahead
        self.max_candidates = max_candidates
        self.iteration_limit = iterations

    def choose(self, ctx: BranchContext) -> BranchDecision:
        scores = _pseudocost_scores(ctx)
        reliable = ctx.pseudocosts.reliable(ctx.candidates, self.threshold)
        if reliable.all():
            return _pick(ctx.candidates, scores, ctx.values)
        order = np.argsort(-scores, kind="stable")
        look = _Lookahead(ctx, self.iteration_limit)
        bounds: dict[int, tuple[float, float]] = {}
        best = -math.inf
        since_improved = 0
        evaluated = 0
        try:
            for k in order:
                k = int(k)
                if reliable[k]:
                    if scores[k] > best:
                        best = float(scores[k])
                    continue
                if evaluated >= self.max_candidates or since_improved >= self.lookahead:
                    continue  # keep its pseudocost score
                s, lo_b, up_b = look.evaluate(k)
                evaluated += 1
                scores[k] = s
                bounds[int(ctx.candidates[k])] = (lo_b, up_b)
                if s > best:
                    best = s
                    since_improved = 0
                else:
                    since_improved += 1
                if _closed(lo_b, ctx.cutoff) and _closed(up_b, ctx.cutoff):
                    break
        finally:
            look.finish()
        return _decision_from(ctx, scores, bounds, look)


def make_rule(name: str, settings: object) -> BranchingRule:
    """The rule called ``name`` configured from ``SearchSettings``."""
    s = settings
    if name == "most-fractional":
        return MostFractional()
    if name == "least-fractional":
        return LeastFractional()
    if name == "first-index":
        return FirstIndex()
    if name == "random":
        return RandomRule()
    if name == "pseudocost":
        return PseudocostRule()
    if name == "strong":
        return StrongRule(candidates=s.strong_candidates, iterations=s.strong_iterations)
    if name == "reliability":
        return ReliabilityRule(threshold=s.reliability_threshold,
                               lookahead=s.reliability_lookahead,
                               max_candidates=s.reliability_max_candidates,
                               iterations=s.strong_iterations)
    raise ValueError(f"unknown branching rule {name!r}")
