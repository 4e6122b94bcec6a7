"""The reader's plain-Python checks accept exactly what the pydantic models accept."""

from __future__ import annotations

import copy

from hypothesis import given, settings
from hypothesis import strategies as st

from test_runlog_roundtrip import sample_events
from undergrowth.runlog._fastcheck import incumbent_ok, node_ok, progress_ok
from undergrowth.runlog.schema import explain

CHECKS = {"node": node_ok, "incumbent": incumbent_ok, "progress": progress_ok}
SAMPLES = [e for e in sample_events() if e["kind"] in CHECKS]
VALUES = st.sampled_from(
    [None, 0, 3, -1, 2**63 - 1, 2**63, 1.5, float("nan"), float("inf"), True, False, "x",
     "down", "up", "optimal", "failed", "branched", "open", "rounding", "external", [], {},
     {"var": 1}]
)  # fmt: skip


def _paths(event: dict, prefix: tuple = ()) -> list[tuple]:
    out = []
    for key, value in event.items():
        if key == "kind":
            continue
        out.append(prefix + (key,))
        if isinstance(value, dict):
            out += _paths(value, prefix + (key,))
    return out


@st.composite
def mutated(draw):
    event = copy.deepcopy(draw(st.sampled_from(SAMPLES)))
    for _ in range(draw(st.integers(1, 3))):
        paths = _paths(event)
        if not paths:
            break
        path = draw(st.sampled_from(paths))
        holder = event
        for key in path[:-1]:
            holder = holder[key]
        if draw(st.booleans()) and draw(st.booleans()):
            del holder[path[-1]]
        else:
            holder[path[-1]] = copy.deepcopy(draw(VALUES))
    return event


def test_samples_are_valid_for_both():
    for event in SAMPLES:
        assert CHECKS[event["kind"]](event) and explain(event) is None


@settings(max_examples=600, deadline=None)
@given(mutated())
def test_fast_checks_agree_with_the_models(event):
    fast = CHECKS[event["kind"]](event)
    assert fast == (explain(event) is None), explain(event)
