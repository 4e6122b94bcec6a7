"""A crashed or damaged run log: the reader returns the valid prefix or a clear error."""

from __future__ import annotations

import gzip
import json
import random
import signal
import subprocess
import sys
import time
import zlib

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from test_runlog_roundtrip import header, write_run
from undergrowth.runlog.errors import RunLogError
from undergrowth.runlog.reader import read_run


def many_events(n: int = 120) -> list[dict]:
    """A valid depth-first chain of n nodes with progress events (shape by hand)."""
    events = []
    for i in range(n):
        last = i == n - 1
        events.append({
            "kind": "node", "id": i, "parent": i - 1 if i else None, "depth": i, "order": i,
            "time": 0.01 * i, "branch": None if i == 0 else
            {"var": i % 7, "name": f"y{i % 7}", "dir": "down", "value": 0.0},
            "lp": {"status": "optimal", "objective": 10.0 + i / 3, "iterations": i,
                   "seconds": 0.0001 * i},
            "bound": 10.0 + i / 3, "fractional": 0 if last else 1,
            "status": "integral" if last else "branched",
            "branching": None if last else {"var": (i + 1) % 7, "name": f"y{(i + 1) % 7}",
                                            "value": 0.5, "score": 1.0 / (i + 1),
                                            "rule": "first-index", "down_bound": None,
                                            "up_bound": None, "runner_up": None},
            "message": None})  # fmt: skip
        if i % 10 == 9:
            events.append({"kind": "progress", "time": 0.01 * i, "nodes": i + 1, "open": i + 1,
                           "dual_bound": 10.0, "primal_bound": None, "gap": None,
                           "tree_weight": 0.0})  # fmt: skip
    return events


def _cuts(size: int, count: int, seed: int) -> list[int]:
    return sorted(random.Random(seed).sample(range(1, size), count))


def _parses(line: bytes) -> bool:
    try:
        json.loads(line)
    except ValueError:
        return False
    return True


def _assert_prefix(run, events: list[dict]) -> None:
    assert run.events == events[: len(run.events)]


def test_plain_truncation_at_200_offsets(tmp_path):
    full = tmp_path / "full.jsonl"
    events = many_events()
    write_run(full, events, sense="min")
    data = full.read_bytes()
    header_end = data.index(b"\n") + 1
    cut_path = tmp_path / "cut.jsonl"
    for cut in _cuts(len(data), 200, seed=1):
        cut_path.write_bytes(data[:cut])
        if cut < header_end - 1:
            # the header line itself is cut: nothing to load
            with pytest.raises(RunLogError, match="header"):
                read_run(cut_path)
            continue
        run = read_run(cut_path)
        _assert_prefix(run, events)
        # a warning, unless only the final newline was lost (the last line is whole)
        assert run.warnings or run.events == events, cut
        complete_lines = data[:cut].count(b"\n")
        assert len(run.events) in (complete_lines - 1, complete_lines)


def test_gzip_truncation_at_200_offsets(tmp_path):
    full = tmp_path / "full.jsonl.gz"
    events = many_events()
    write_run(full, events, sense="min", flush_every=7)  # sync-flush points mid-file
    data = full.read_bytes()
    plain = gzip.decompress(data)
    header_line = plain[: plain.index(b"\n") + 1]
    cut_path = tmp_path / "cut.jsonl.gz"
    loaded = []
    for cut in _cuts(len(data), 200, seed=2):
        cut_path.write_bytes(data[:cut])
        decodable = zlib.decompressobj(wbits=31).decompress(data[:cut])
        if not decodable.startswith(header_line):
            with pytest.raises(RunLogError):
                read_run(cut_path)
            continue
        run = read_run(cut_path)
        _assert_prefix(run, events)
        assert any("gzip stream ends early" in w for w in run.warnings), cut
        # every line that decodes whole is loaded (header excluded)
        assert len(run.events) == sum(_parses(line) for line in decodable.split(b"\n")[1:])
        loaded.append(len(run.events))
    assert loaded == sorted(loaded) and loaded[-1] > 0


def test_flipped_bytes_in_gzip_give_a_clear_error(tmp_path):
    full = tmp_path / "full.jsonl.gz"
    write_run(full, many_events(), sense="min")
    data = full.read_bytes()
    rng = random.Random(3)
    damaged = tmp_path / "damaged.jsonl.gz"
    # Bytes 4-9 of a gzip header (mtime, flags, OS) carry no checksum (RFC 1952), so
    # only the compressed body and the trailer are flipped.
    for _ in range(40):
        at = rng.randrange(10, len(data))
        flipped = bytearray(data)
        flipped[at] ^= 1 << rng.randrange(8)
        damaged.write_bytes(bytes(flipped))
        with pytest.raises(RunLogError) as info:
            read_run(damaged)
        message = str(info.value)
        assert str(damaged) in message
        assert "damaged" in message or "line" in message, message


def test_lenient_read_of_damaged_gzip_keeps_what_came_before(tmp_path):
    full = tmp_path / "full.jsonl.gz"
    events = many_events()
    write_run(full, events, sense="min")
    data = bytearray(full.read_bytes())
    data[-6] ^= 0xFF  # inside the CRC/size trailer: every event decodes, the check fails
    damaged = tmp_path / "damaged.jsonl.gz"
    damaged.write_bytes(bytes(data))
    with pytest.raises(RunLogError, match="damaged"):
        read_run(damaged)
    run = read_run(damaged, lenient=True)
    assert run.events == events
    assert any("damaged" in w for w in run.warnings)


_KILLED_WRITER = """
import os, sys, time
from undergrowth.runlog.writer import RunLogWriter
w = RunLogWriter(sys.argv[1], {"model": {"name": "m", "rows": 0, "columns": 0, "integers": 0,
    "binaries": 0, "nonzeros": 0, "sense": "min", "quadratic": False},
    "settings": {"branching": "b", "select": "s", "seed": 0, "node_limit": None,
    "time_limit": None, "gap": 0.0}, "started": "2026-12-02T06:00:00Z", "producer": "t"},
    flush_interval=0.05)
for i in range(50):
    w.write({"kind": "progress", "time": i * 0.1, "nodes": i, "open": 1, "dual_bound": 1.0,
             "primal_bound": None, "gap": None, "tree_weight": 0.0})
print("written", flush=True)
time.sleep(30)
"""


@pytest.mark.parametrize("name", ["killed.jsonl", "killed.jsonl.gz"])
def test_killed_writer_leaves_a_readable_prefix(tmp_path, name):
    path = tmp_path / name
    proc = subprocess.Popen(
        [sys.executable, "-c", _KILLED_WRITER, str(path)], stdout=subprocess.PIPE, text=True
    )
    try:
        assert proc.stdout.readline().strip() == "written"
        # The writer is now idle; its background flush must get the lines to disk.
        deadline = time.monotonic() + 10
        while len(read_run(path).events) < 50 and time.monotonic() < deadline:
            time.sleep(0.02)
    finally:
        proc.send_signal(signal.SIGKILL)
        proc.wait()
    run = read_run(path)  # never closed, no gzip trailer: the flushed prefix still reads
    assert len(run.events) == 50 and run.events[-1]["nodes"] == 49
    assert any("no end event" in w for w in run.warnings)


@settings(max_examples=150, deadline=None)
@given(st.lists(st.one_of(st.binary(max_size=60), st.sampled_from(
    [b"[]", b"5", b"null", b'{"kind": 5}', b'{"kind": "node"}', b'{"kind": "end"}',
     b'{"kind":"node","id":1,"parent":0}', b"\xff\xfe", b'{"a":1e999}', b"{}"])), max_size=6))
def test_garbage_after_the_header_only_raises_the_readers_error(tmp_path_factory, garbage):
    # Any line soup after a valid header: a RunLogError or a load, never another exception.
    path = tmp_path_factory.mktemp("soup") / "soup.jsonl"
    head = json.dumps({"kind": "header", "format": "undergrowth-run", "version": 1,
                       **header()}).encode()  # fmt: skip
    path.write_bytes(b"\n".join([head, *garbage]))
    for lenient in (False, True):
        try:
            run = read_run(path, lenient=lenient)
        except RunLogError:
            continue
        assert isinstance(run.events, list)
