"""Mutated MPS files must give a valid Problem or a ModelFormatError, nothing else."""

from __future__ import annotations

import gzip
import warnings

import numpy as np
import pytest
import scipy.sparse as sp
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from undergrowth.model import ModelFormatError, Problem
from undergrowth.model.mps import read_mps, write_mps

HAND = b"""\
NAME          FUZZ
OBJSENSE
    MAX
ROWS
 N  PROFIT
 L  LIM1
 G  LIM2
 E  BAL
 N  SPARE
COLUMNS
    MARKER                 'MARKER'                 'INTORG'
    XA        PROFIT         3.5   LIM1           1.0
    XA        LIM2           2.0   SPARE          1.0
    XB        PROFIT         1.0   BAL            1.0
    MARKER                 'MARKER'                 'INTEND'
    YA        PROFIT        -1.0   LIM1           4.0
    YB        LIM2           1.0   BAL           -1.0
    YC        PROFIT         0.5
RHS
    RHS       PROFIT        -7.5   LIM1          10.0
    RHS       LIM2           1.0   BAL            2.0
RANGES
    RNG       LIM1           4.0   BAL           -1.5
BOUNDS
 UP BND       XA             4.0
 MI BND       XB
 BV BND       YA
 LO BND       YB            -2.0
 UP BND       YB             6.0
 FR BND       YC
QUADOBJ
    YA        YA             2.0
    YB        YA             0.5
ENDATA
"""

JUNK = ["1e400", "-1e30", "nan", "inf", "0", "-", "'MARKER'", "'INTORG'", "'INTEND'", "UP",
        "SC", "MI", "RHS", "RANGES", "BOUNDS", "ENDATA", "OBJSENSE", "MAX", "N", "x", "YA",
        "LIM1", "\t", "\xe9", "1e30", "1_0", "*"]


def _make_bases(tmp_dir) -> list[bytes]:
    rng = np.random.default_rng(0)
    p = Problem.from_arrays(
        rng.normal(size=5), sp.random(4, 5, density=0.6, random_state=1),
        row_lower=[-np.inf, 0.5, 1.0, -2.0], row_upper=[3.0, np.inf, 1.0, 2.5],
        col_lower=[0, -np.inf, -1, 0, 0], col_upper=[1, 4, np.inf, np.inf, 2],
        integrality=[1, 1, 0, 0, 1], Q=np.eye(5), offset=1.5, name="written",
    )
    path = tmp_dir / "written.mps"
    write_mps(p, path)
    return [HAND, path.read_bytes()]


def _mutate(data: bytes, ops: list[tuple[int, int, int, int]]) -> bytes:
    for kind, a, b, c in ops:
        lines = data.split(b"\n")
        i, j = a % len(lines), b % len(lines)
        if kind == 0:
            del lines[i]
        elif kind == 1:
            lines.insert(i, lines[i])
        elif kind == 2:
            lines[i], lines[j] = lines[j], lines[i]
        elif kind == 3 and data:
            buf = bytearray(data)
            buf[a % len(buf)] ^= (c % 255) + 1
            data = bytes(buf)
            continue
        elif kind == 4:
            data = data[: a % (len(data) + 1)]
            continue
        elif kind == 5:
            toks = lines[i].split(b" ")
            toks.insert(j % (len(toks) + 1), JUNK[c % len(JUNK)].encode())
            lines[i] = b" ".join(toks)
        else:
            toks = lines[i].split()
            if toks:
                toks[j % len(toks)] = JUNK[c % len(JUNK)].encode()
                lines[i] = b" " + b" ".join(toks)
        data = b"\n".join(lines)
    return data


OPS = st.lists(
    st.tuples(st.integers(0, 6), st.integers(0, 10_000), st.integers(0, 10_000),
              st.integers(0, 10_000)),
    min_size=1, max_size=4,
)


@pytest.fixture(scope="module")
def workdir(tmp_path_factory):
    return tmp_path_factory.mktemp("fuzz")


@pytest.fixture(scope="module")
def bases(workdir):
    return _make_bases(workdir)


@settings(max_examples=200, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(base=st.integers(0, 1), ops=OPS, zipped=st.integers(0, 2))
def test_mutated_files_fail_cleanly(workdir, bases, base, ops, zipped):
    data = _mutate(bases[base], ops)
    if zipped == 1:  # mutate the text, then compress it
        data = gzip.compress(data)
    elif zipped == 2:  # compress, then damage the compressed bytes
        data = _mutate(gzip.compress(bases[base]), [op for op in ops if op[0] >= 3])
    path = workdir / "mutant.mps"
    path.write_bytes(data)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        try:
            result = read_mps(path)
        except ModelFormatError as exc:
            assert exc.path == str(path)
            assert exc.line is None or 1 <= exc.line <= data.count(b"\n") + 1 or zipped
            return
    assert isinstance(result, Problem)


def test_bases_are_valid(workdir, bases):
    for k, data in enumerate(bases):
        path = workdir / f"base{k}.mps"
        path.write_bytes(data)
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            assert isinstance(read_mps(path), Problem)
