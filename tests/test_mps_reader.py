"""MPS reader and writer checked against highspy's own MPS reader.

Every model below is read twice: by `read_mps` and by a fresh
``highspy.Highs().readModel`` (the reference), and all arrays must agree.
"""

from __future__ import annotations

import gzip
import sys
import types
from pathlib import Path

import highspy
import numpy as np
import pytest
import scipy.sparse as sp

from undergrowth.model import ModelFormatError, Problem, ProblemError, read_model, write_model
from undergrowth.model.mps import MpsWarning, read_mps, write_mps

INF = np.inf


# ------------------------------------------------------------------ helpers
def highs_read(path):
    """The reference reading: highspy's own MPS reader (Highs.readModel)."""
    path = Path(path)
    if not path.name.endswith((".mps", ".mps.gz")):
        # highspy chooses its reader by extension and does not know .qps
        alias = path.with_name(path.name + ".as.mps")
        alias.write_bytes(path.read_bytes())
        path = alias
    h = highspy.Highs()
    h.setOptionValue("output_flag", False)
    status = h.readModel(str(path))
    assert status in (highspy.HighsStatus.kOk, highspy.HighsStatus.kWarning), status
    return h.getLp(), h.getModel().hessian_


def highs_q(hess, n):
    """Full symmetric Q from HiGHS's lower-triangular Hessian (objective ½xᵀQx)."""
    if hess.dim_ == 0:
        return sp.csr_matrix((n, n))
    low = sp.csc_matrix((hess.value_, hess.index_, hess.start_), shape=(n, n))
    full = sp.csr_matrix(low + low.T - sp.diags(low.diagonal()))
    full.eliminate_zeros()
    return full


def assert_matches_highs(p: Problem, path) -> None:
    # reference: highspy's own MPS reader (Highs.readModel) on the same file
    lp, hess = highs_read(path)
    n, m = lp.num_col_, lp.num_row_
    assert (p.num_cols, p.num_rows) == (n, m)
    np.testing.assert_array_equal(p.c, np.asarray(lp.col_cost_))
    assert p.offset == lp.offset_
    assert p.sense == ("max" if lp.sense_ == highspy.ObjSense.kMaximize else "min")
    ref_a = sp.csr_matrix(
        sp.csc_matrix((lp.a_matrix_.value_, lp.a_matrix_.index_, lp.a_matrix_.start_),
                      shape=(m, n)))
    ref_a.eliminate_zeros()
    assert (ref_a != p.A).nnz == 0
    np.testing.assert_array_equal(p.row_lower, np.asarray(lp.row_lower_))
    np.testing.assert_array_equal(p.row_upper, np.asarray(lp.row_upper_))
    np.testing.assert_array_equal(p.col_lower, np.asarray(lp.col_lower_))
    np.testing.assert_array_equal(p.col_upper, np.asarray(lp.col_upper_))
    ref_int = np.array([int(v) == 1 for v in lp.integrality_], dtype=bool)
    if ref_int.size == 0:
        ref_int = np.zeros(n, dtype=bool)
    np.testing.assert_array_equal(p.integrality, ref_int)
    q = p.Q if p.Q is not None else sp.csr_matrix((n, n))
    assert (q != highs_q(hess, n)).nnz == 0
    assert list(p.col_names) == list(lp.col_names_)
    assert list(p.row_names) == list(lp.row_names_)


def assert_same_problem(a: Problem, b: Problem) -> None:
    """Exact equality of every array (a write/read round trip)."""
    for field in ("c", "row_lower", "row_upper", "col_lower", "col_upper", "integrality"):
        np.testing.assert_array_equal(getattr(a, field), getattr(b, field), err_msg=field)
    assert a.A.shape == b.A.shape and (a.A != b.A).nnz == 0
    if a.Q is None or b.Q is None:
        assert a.Q is None and b.Q is None
    else:
        assert (a.Q != b.Q).nnz == 0
    assert (a.sense, a.offset, a.name) == (b.sense, b.offset, b.name)
    assert a.col_names == b.col_names and a.row_names == b.row_names


def write_with_highs(path, c, A, rl, ru, cl, cu, integer=None, *, sense="min", offset=0.0,
                     Q=None, col_names=None, row_names=None):
    """Pass a model to highspy and let it write the MPS file."""
    A = sp.csc_matrix(A, dtype=float)
    m, n = A.shape
    lp = highspy.HighsLp()
    lp.num_col_, lp.num_row_ = n, m
    lp.col_cost_ = np.asarray(c, dtype=float)
    lp.col_lower_, lp.col_upper_ = np.asarray(cl, float), np.asarray(cu, float)
    lp.row_lower_, lp.row_upper_ = np.asarray(rl, float), np.asarray(ru, float)
    lp.a_matrix_.format_ = highspy.MatrixFormat.kColwise
    lp.a_matrix_.start_, lp.a_matrix_.index_ = A.indptr, A.indices
    lp.a_matrix_.value_ = A.data
    if integer is not None:
        lp.integrality_ = [highspy.HighsVarType.kInteger if v else
                           highspy.HighsVarType.kContinuous for v in integer]
    lp.sense_ = highspy.ObjSense.kMaximize if sense == "max" else highspy.ObjSense.kMinimize
    lp.offset_ = offset
    lp.col_names_ = col_names or [f"x{j}" for j in range(n)]
    lp.row_names_ = row_names or [f"r{i}" for i in range(m)]
    h = highspy.Highs()
    h.setOptionValue("output_flag", False)
    assert h.passModel(lp) == highspy.HighsStatus.kOk
    if Q is not None:
        low = sp.csc_matrix(sp.tril(Q))
        hess = highspy.HighsHessian()
        hess.dim_ = n
        hess.format_ = highspy.HessianFormat.kTriangular
        hess.start_, hess.index_, hess.value_ = low.indptr, low.indices, low.data
        assert h.passHessian(hess) == highspy.HighsStatus.kOk
    assert h.writeModel(str(path)) == highspy.HighsStatus.kOk
    return path


# ---------------------------------------------------------- random models
def knapsack(rng, path):
    n = 30
    w = rng.integers(1, 50, n)
    v = rng.integers(1, 80, n).astype(float)
    return write_with_highs(path, v, w[None, :], [-INF], [w.sum() // 3], np.zeros(n),
                            np.ones(n), [1] * n, sense="max",
                            col_names=[f"item{j}" for j in range(n)], row_names=["capacity"])


def set_covering(rng, path):
    m, n = 25, 40
    A = (rng.random((m, n)) < 0.15).astype(float)
    A[np.arange(m), rng.integers(0, n, m)] = 1.0  # every element coverable
    cost = rng.integers(1, 20, n).astype(float)
    return write_with_highs(path, cost, A, np.ones(m), np.full(m, INF), np.zeros(n),
                            np.ones(n), [1] * n)


def facility_location(rng, path):
    nf, nc = 5, 12
    n = nf + nf * nc
    demand = rng.uniform(1, 10, nc)
    cap = rng.uniform(15, 40, nf)
    rows, cols, vals = [], [], []
    for c in range(nc):  # demand rows: sum_f x_fc = d_c
        for f in range(nf):
            rows.append(c)
            cols.append(nf + f * nc + c)
            vals.append(1.0)
    for f in range(nf):  # capacity rows: sum_c x_fc - cap_f y_f <= 0
        rows.append(nc + f)
        cols.append(f)
        vals.append(-cap[f])
        for c in range(nc):
            rows.append(nc + f)
            cols.append(nf + f * nc + c)
            vals.append(1.0)
    A = sp.coo_matrix((vals, (rows, cols)), shape=(nc + nf, n))
    cost = np.concatenate([rng.uniform(20, 60, nf), rng.uniform(0.5, 9, nf * nc)])
    names = [f"open_{f}" for f in range(nf)] + [
        f"flow_{f}_{c}" for f in range(nf) for c in range(nc)]
    return write_with_highs(
        path, cost, A, np.concatenate([demand, np.full(nf, -INF)]),
        np.concatenate([demand, np.zeros(nf)]), np.zeros(n),
        np.concatenate([np.ones(nf), np.full(nf * nc, INF)]), [1] * nf + [0] * (nf * nc),
        col_names=names)


def general_integers(rng, path):
    choices = [(-5, 7), (-INF, 3), (-INF, INF), (2, INF), (0, INF), (-10, -2), (0, 0), (0, 1)]
    n, m = 24, 10
    picks = [choices[k % len(choices)] for k in range(n)]
    cl = np.array([a for a, _ in picks], dtype=float)
    cu = np.array([b for _, b in picks], dtype=float)
    A = sp.random(m, n, density=0.3, random_state=np.random.RandomState(1),
                  data_rvs=lambda k: rng.integers(-9, 10, k).astype(float))
    rl = np.where(rng.random(m) < 0.5, -INF, -20.0)
    ru = np.where(rl == -INF, 30.0, INF)
    integer = [1 if j % 3 else 0 for j in range(n)]
    return write_with_highs(path, rng.integers(-5, 6, n), A, rl, ru, cl, cu, integer)


def ranged_and_equality(rng, path):
    m, n = 12, 15
    A = sp.random(m, n, density=0.4, random_state=np.random.RandomState(2),
                  data_rvs=lambda k: rng.normal(size=k))
    lo = rng.normal(size=m) * 10
    hi = lo + rng.uniform(0.1, 5, m)
    hi[::3] = lo[::3]  # equality rows
    return write_with_highs(path, rng.normal(size=n), A, lo, hi, np.full(n, -1.5),
                            rng.uniform(1, 4, n))


def with_free_rows(rng, path):
    m, n = 8, 6
    A = rng.integers(-3, 4, (m, n)).astype(float)
    rl = np.full(m, -INF)
    ru = np.full(m, INF)
    rl[:4], ru[4:6] = -1.0, 7.0  # rows 6 and 7 are free
    return write_with_highs(path, rng.integers(1, 5, n), A, rl, ru, np.zeros(n),
                            np.full(n, 10.0), [0, 1] * 3)


def quadratic(rng, path):
    n, m = 8, 4
    M = rng.normal(size=(n, n))
    Q = M.T @ M
    Q[np.abs(Q) < 1.0] = 0.0
    np.fill_diagonal(Q, np.abs(np.diag(Q)) + 1.0)
    A = rng.normal(size=(m, n))
    return write_with_highs(path, rng.normal(size=n), A, np.full(m, -INF), np.ones(m),
                            np.full(n, -2.0), np.full(n, 2.0), [0, 0, 1, 0, 0, 1, 0, 0], Q=Q)


def maximisation(rng, path):
    m, n = 6, 9
    A = rng.uniform(0, 5, (m, n))
    return write_with_highs(path, rng.uniform(1, 3, n), A, np.full(m, -INF),
                            rng.uniform(10, 20, m), np.zeros(n), np.full(n, 4.0),
                            [1, 0, 0] * 3, sense="max", offset=2.75)


MODELS = [knapsack, set_covering, facility_location, general_integers, ranged_and_equality,
          with_free_rows, quadratic, maximisation]


# HiGHS writes free rows as N rows, which the reader drops with a warning
IGNORE_DROPPED_ROWS = pytest.mark.filterwarnings("ignore::undergrowth.model.mps.MpsWarning")


@IGNORE_DROPPED_ROWS
@pytest.mark.parametrize("make", MODELS, ids=lambda f: f.__name__)
@pytest.mark.parametrize("seed", [0, 1])
def test_random_model_matches_highs(make, seed, tmp_path):
    path = make(np.random.default_rng(seed), tmp_path / f"{make.__name__}.mps")
    p = read_mps(path)
    assert_matches_highs(p, path)


@IGNORE_DROPPED_ROWS
@pytest.mark.parametrize("make", MODELS, ids=lambda f: f.__name__)
def test_round_trip_through_write_mps(make, tmp_path):
    src = make(np.random.default_rng(7), tmp_path / "src.mps")
    p = read_mps(src)
    for target in ("rt.mps", "rt.mps.gz"):
        write_mps(p, tmp_path / target)
        back = read_mps(tmp_path / target)
        assert_same_problem(p, _renamed(back, p.name))  # reference: the Problem written
    # the reference reader sees the same model in what we wrote
    assert_matches_highs(p, tmp_path / "rt.mps")


def _renamed(p: Problem, name: str) -> Problem:
    # copies: Problem freezes its sparse arrays and re-validates a new instance
    return Problem(c=p.c, A=p.A.copy(), row_lower=p.row_lower, row_upper=p.row_upper,
                   col_lower=p.col_lower, col_upper=p.col_upper, integrality=p.integrality,
                   sense=p.sense, offset=p.offset, Q=None if p.Q is None else p.Q.copy(),
                   col_names=p.col_names, row_names=p.row_names, name=name)


def test_free_rows_written_by_highs_are_dropped_with_a_warning(tmp_path):
    path = with_free_rows(np.random.default_rng(3), tmp_path / "free.mps")
    with pytest.warns(MpsWarning, match="further N row"):
        p = read_mps(path)
    # reference: highspy's own MPS reader also drops the N rows it wrote for free rows
    assert p.num_rows == 6
    assert_matches_highs(p, path)


def test_gzip_by_name_and_by_magic(tmp_path):
    plain = quadratic(np.random.default_rng(4), tmp_path / "q.mps")
    data = plain.read_bytes()
    for name in ("q.mps.gz", "q_disguised.mps", "q.qps.gz"):
        (tmp_path / name).write_bytes(gzip.compress(data))
        p = read_mps(tmp_path / name)
        assert_matches_highs(p, tmp_path / name)  # highspy detects gzip by content too
    plain_named_gz = tmp_path / "notzipped.mps.gz"
    plain_named_gz.write_bytes(data)
    assert read_mps(plain_named_gz).num_cols == 8


# -------------------------------------------------------- hand-written files
FIXED = """\
NAME          HANDFIX
* a comment line
OBJSENSE
    MAXIMIZE
ROWS
 N  PROFIT
 L  LIM1
 G  LIM2
 E  BAL1
 E  BAL2
 E  BAL3
COLUMNS
    MARKER                 'MARKER'                 'INTORG'
    XA        PROFIT         3.5   LIM1           1.0
    XA        LIM2           2.0
    XB        PROFIT         1.0   BAL1           1.0
    XC        PROFIT         2.0   BAL2           1.0
    MARKER                 'MARKER'                 'INTEND'
    YA        PROFIT        -1.0   LIM1           4.0
    YA        BAL3           1.0
    YB        LIM2           1.0   BAL1          -1.0
    YC        PROFIT         0.5   LIM1           1.0
    YD        BAL2           2.0
    YE        LIM2           1.0
    YF        LIM1           1.0
    YG        BAL3           1.0
    YH        LIM2           1.0
    YI        PROFIT         1.0
RHS
    RHS       PROFIT        -7.5   LIM1          10.0
    RHS       LIM2           1.0   BAL1           2.0
    RHS       BAL2           3.0   BAL3           4.0
RANGES
    RNG       LIM1           4.0   LIM2          -3.0
    RNG       BAL1           2.5   BAL2          -1.5
    RNG       BAL3           0.0
BOUNDS
 UP BND       XA             4.0
 MI BND       XB
 BV BND       YA
 LO BND       YB            -2.0
 UP BND       YB             6.0
 FX BND       YC             1.5
 FR BND       YD
 MI BND       YE
 UP BND       YE            -1.0
 PL BND       YF
 LI BND       YG            -3.0
 UI BND       YH             8.0
ENDATA
"""


def _free_version(text: str) -> str:
    out = []
    for line in text.splitlines():
        if line.startswith("OBJSENSE"):
            out.append("OBJSENSE MAX")  # the one-line form
        elif line.strip() == "MAXIMIZE":
            continue
        elif line[:1].isspace():
            out.append(" " + " ".join(line.split()))
        else:
            out.append(line)
    return "\n".join(out) + "\n"


@pytest.mark.parametrize("form", ["fixed", "free"])
def test_hand_written_file_matches_highs(form, tmp_path):
    path = tmp_path / f"hand_{form}.mps"
    path.write_text(FIXED if form == "fixed" else _free_version(FIXED))
    p = read_mps(path)
    assert_matches_highs(p, path)
    assert p.name == "HANDFIX" and p.sense == "max"
    # RHS on the objective row is minus the constant.
    # reference: highspy's own MPS reader (Highs.readModel) reads offset 7.5 here
    assert p.offset == 7.5
    # reference: standard MPS range rules (HiGHS agrees, see assert_matches_highs):
    # L: [b-|R|, b], G: [b, b+|R|], E: R>0 -> [b, b+R], R<0 -> [b+R, b], R=0 -> [b, b]
    assert p.row_lower.tolist() == [6.0, 1.0, 2.0, 1.5, 4.0]
    assert p.row_upper.tolist() == [10.0, 4.0, 4.5, 3.0, 4.0]
    # reference: highspy's own MPS reader (Highs.readModel): XC is a marker-block
    # integer without bounds -> [0, 1]; MI on integer XB leaves the upper bound infinite
    j = {name: k for k, name in enumerate(p.col_names)}
    assert (p.col_lower[j["XC"]], p.col_upper[j["XC"]]) == (0.0, 1.0)
    assert (p.col_lower[j["XB"]], p.col_upper[j["XB"]]) == (-INF, INF)
    assert p.integrality[[j["YA"], j["YG"], j["YH"]]].all()  # BV, LI, UI make integers
    assert (p.col_lower[j["YE"]], p.col_upper[j["YE"]]) == (-INF, -1.0)


def _fixed_line(*fields: str) -> str:
    line = [" "] * 61
    for start, value in zip((1, 4, 14, 24, 39, 49), fields, strict=False):
        line[start:start + len(value)] = value
    return "".join(line).rstrip()


def test_fixed_format_names_with_spaces_match_highs(tmp_path):
    f = _fixed_line
    text = "\n".join([
        "NAME          SPACED", "ROWS", " N  COST", " L  LIM 1", " G  LIM2", "COLUMNS",
        f("", "MARKER", "'MARKER'", "", "'INTORG'"),
        f("", "MY X", "COST", "1.0", "LIM 1", "1.0"), f("", "MY X", "LIM2", "1.0"),
        f("", "MARKER", "'MARKER'", "", "'INTEND'"),
        f("", "Y", "COST", "2.0", "LIM 1", "1.0"),
        "RHS", f("", "RHS", "LIM 1", "4.0", "LIM2", "1.0"), f("", "RHS", "COST", "-1.5"),
        "RANGES", f("", "RNG", "LIM2", "2.0"),
        "BOUNDS", f("UP", "BND", "MY X", "3.0"), f("MI", "BND", "Y"), "ENDATA", ""])
    path = tmp_path / "spaced.mps"
    path.write_text(text)
    p = read_mps(path)
    # reference: highspy's own MPS reader (it switches to fixed format for these names)
    assert_matches_highs(p, path)
    assert p.col_names == ("MY X", "Y") and p.row_names == ("LIM 1", "LIM2")
    with pytest.raises(ProblemError, match="MY X"):
        write_mps(p, tmp_path / "out.mps")


def test_fixed_format_blank_set_names_match_highs(tmp_path):
    f = _fixed_line
    text = "\n".join([
        "NAME", "ROWS", " N  COST", " L  LIM1", "COLUMNS", f("", "X", "COST", "1.0", "LIM1", "1.0"),
        "RHS", f("", "", "LIM1", "4.0", "COST", "2.0"), "BOUNDS", f("UP", "", "X", "3.0"),
        "ENDATA", ""])
    path = tmp_path / "blank_sets.mps"
    path.write_text(text)
    p = read_mps(path)
    assert_matches_highs(p, path)  # reference: highspy's own MPS reader
    assert p.offset == -2.0 and p.name == "blank_sets"


OBJSENSE_FORMS = [
    ("OBJSENSE MAX\n", "max", True),
    ("OBJSENSE    MAX\n", "max", True),
    ("OBJSENSE max\n", "max", True),
    ("OBJSENSE MIN\n", "min", True),
    ("OBJSENSE\n    MAX\n", "max", True),
    ("OBJSENSE\n    MAXIMIZE\n", "max", True),
    ("OBJSENSE\n  MINIMIZE\n", "min", True),
    ("OBJSENSE\nMAX\n", "max", True),
    # HiGHS 1.16 silently ignores the one-line MAXIMIZE form; we read it as max
    ("OBJSENSE MAXIMIZE\n", "max", False),
    ("", "min", True),
]


@pytest.mark.parametrize(("header", "sense", "same_as_highs"), OBJSENSE_FORMS)
def test_objsense_forms(header, sense, same_as_highs, tmp_path):
    path = tmp_path / "sense.mps"
    path.write_text(f"NAME T\n{header}ROWS\n N obj\n L c1\nCOLUMNS\n x obj 1 c1 1\n"
                    "RHS\n RHS c1 1\nENDATA\n")
    p = read_mps(path)
    assert p.sense == sense  # reference: the OBJSENSE values MIN/MAX/MINIMIZE/MAXIMIZE
    if same_as_highs:
        assert_matches_highs(p, path)


BOUND_CASES = [
    # (bounds lines, integer marker?, expected (lower, upper, integer))
    # reference for every row: highspy's own MPS reader (Highs.readModel), checked below
    (" UP BND x 4", False, (0.0, 4.0, False)),
    (" LO BND x -2", False, (-2.0, INF, False)),
    (" FX BND x 3.25", False, (3.25, 3.25, False)),
    (" FR BND x", False, (-INF, INF, False)),
    (" MI BND x", False, (-INF, INF, False)),
    (" PL BND x", False, (0.0, INF, False)),
    (" BV BND x", False, (0.0, 1.0, True)),
    (" LI BND x -4", False, (-4.0, INF, True)),
    (" UI BND x 7", False, (0.0, 7.0, True)),
    ("", True, (0.0, 1.0, True)),
    (" UP BND x 5", True, (0.0, 5.0, True)),
    (" LO BND x 2", True, (2.0, INF, True)),
    (" PL BND x", True, (0.0, INF, True)),
    (" MI BND x", True, (-INF, INF, True)),
    (" MI BND x\n UP BND x -3", False, (-INF, -3.0, False)),
    (" UP BND x -1\n LO BND x -5", False, (-5.0, -1.0, False)),
    (" UP x 4", False, (0.0, 4.0, False)),
    (" BV x", False, (0.0, 1.0, True)),
    (" MI BND x 0", False, (-INF, INF, False)),
    (" BV x 1", False, (0.0, 1.0, True)),
    (" UP BND x 1e30", False, (0.0, INF, False)),
    (" LO BND x -1e21", False, (-INF, INF, False)),
]


@pytest.mark.parametrize(("bounds", "marker", "expected"), BOUND_CASES)
def test_each_bound_type(bounds, marker, expected, tmp_path):
    col = " x obj 1 c1 1\n"
    if marker:
        col = " M1 'MARKER' 'INTORG'\n" + col + " M2 'MARKER' 'INTEND'\n"
    path = tmp_path / "bnd.mps"
    path.write_text(f"NAME B\nROWS\n N obj\n L c1\nCOLUMNS\n{col} y obj 1 c1 1\n"
                    f"RHS\n RHS c1 10\nBOUNDS\n{bounds}\nENDATA\n")
    p = read_mps(path)
    assert (p.col_lower[0], p.col_upper[0], bool(p.integrality[0])) == expected
    assert_matches_highs(p, path)


def test_negative_upper_bound_with_default_lower_is_refused(tmp_path):
    # HiGHS keeps the lower bound 0, leaving the empty domain [0, -3]; a Problem
    # cannot hold that, so the reader names the line instead
    path = tmp_path / "neg.mps"
    path.write_text("NAME N\nROWS\n N obj\nCOLUMNS\n x obj 1\nBOUNDS\n UP BND x -3\nENDATA\n")
    with pytest.raises(ModelFormatError, match="MI or LO") as info:
        read_mps(path)
    assert (info.value.line, info.value.token) == (7, "x")


def test_extra_n_rows_and_their_rhs_are_ignored(tmp_path):
    path = tmp_path / "nrows.mps"
    path.write_text("NAME T\nROWS\n N obj\n L c1\n N other\nCOLUMNS\n x obj 1 c1 1\n"
                    " x other 5\n y obj 2 c1 1\nRHS\n RHS c1 4 obj 1.5\nENDATA\n")
    with pytest.warns(MpsWarning, match="other"):
        p = read_mps(path)
    assert p.row_names == ("c1",) and p.offset == -1.5
    assert_matches_highs(p, path)  # reference: highspy's own MPS reader


QUAD_TEXT = "NAME Q\nROWS\n N obj\n L c1\nCOLUMNS\n x obj 1 c1 1\n y obj 1 c1 1\n" \
            " z obj 1 c1 1\nRHS\n RHS c1 4\n"


@pytest.mark.parametrize("section", [
    "QUADOBJ\n x x 2\n y x 0.5\n z z 3\n x z 1\n",  # lower triangle (either order)
    "QMATRIX\n x x 2\n x y 0.5\n y x 0.5\n z z 3\n x z 1\n z x 1\n",  # full matrix
])
def test_quadratic_sections_match_highs(section, tmp_path):
    path = tmp_path / "q.mps"
    path.write_text(QUAD_TEXT + section + "ENDATA\n")
    p = read_mps(path)
    assert_matches_highs(p, path)  # reference: highspy's own MPS reader (hessian_)
    # reference: the QUADOBJ/QMATRIX definition, objective ½xᵀQx with Q symmetric
    np.testing.assert_array_equal(p.Q.toarray(), [[2, 0.5, 1], [0.5, 0, 0], [1, 0, 3]])


def test_zero_entries_keep_columns(tmp_path):
    path = tmp_path / "zeros.mps"
    path.write_text("NAME Z\nROWS\n N obj\n L c1\nCOLUMNS\n x obj 1 c1 1\n y obj 0\n"
                    " z c1 0\nRHS\n RHS c1 4\nENDATA\n")
    p = read_mps(path)
    assert p.col_names == ("x", "y", "z") and p.nnz == 1
    assert_matches_highs(p, path)  # reference: highspy's own MPS reader


def test_crlf_tabs_and_comments(tmp_path):
    path = tmp_path / "crlf.mps"
    path.write_bytes(b"* header comment\r\nNAME\tT\r\nROWS\r\n N\tobj\r\n G\tc1\r\nCOLUMNS\r\n"
                     b"\tx\tobj\t1\tc1\t2\r\nRHS\r\n\tRHS\tc1\t3\r\nENDATA\r\n")
    p = read_mps(path)
    # reference: the hand-computed model of this file (x with cost 1, 2x >= 3)
    assert p.name == "T" and p.A.toarray().tolist() == [[2.0]] and p.row_lower[0] == 3.0
    assert_matches_highs(p, path)  # reference: highspy's own MPS reader


def test_name_from_file_stem_when_missing(tmp_path):
    path = tmp_path / "stemmed.mps.gz"
    path.write_bytes(gzip.compress(b"ROWS\n N obj\nCOLUMNS\n x obj 1\nENDATA\n"))
    assert read_mps(path).name == "stemmed"  # reference: the file stem rule in docs/mps.md


# ------------------------------------------------------------- the writer
def _awkward_problem() -> Problem:
    rng = np.random.default_rng(11)
    n, m = 12, 10
    A = sp.random(m, n, density=0.5, random_state=np.random.RandomState(5),
                  data_rvs=lambda k: rng.normal(size=k) * 10.0 ** rng.integers(-8, 8, k))
    lo = rng.normal(size=m) * 10.0 ** rng.integers(-6, 12, m)
    hi = lo + np.abs(rng.normal(size=m)) * 10.0 ** rng.integers(-12, 12, m)
    lo[0], hi[0] = -INF, INF  # a free row
    lo[1], hi[1] = 0.1, 0.3  # a range that needs care to read back exactly
    hi[2] = lo[2]
    lo[3] = -INF
    hi[4] = INF
    M = rng.normal(size=(n, n))
    return Problem.from_arrays(
        rng.normal(size=n) / 3.0, A, row_lower=lo, row_upper=hi,
        col_lower=[0, -INF, -INF, -3.5, 0, -7, 0, 0, -2, 0, 1, 0],
        col_upper=[INF, INF, -2.5, 9.1, 0, 3, 1, INF, 2, 5, 1, INF],
        integrality=[0, 1, 0, 0, 1, 1, 1, 1, 0, 1, 0, 0],
        sense="max", offset=-1.0 / 3.0, Q=M @ M.T, name="awkward",
    )


@pytest.mark.parametrize("target", ["aw.mps", "aw.mps.gz", "aw.qps"])
def test_write_read_round_trip_is_exact(target, tmp_path):
    p = _awkward_problem()
    write_mps(p, tmp_path / target)
    back = read_mps(tmp_path / target)
    assert_same_problem(p, back)  # reference: the Problem that was written
    assert_matches_highs(back, tmp_path / target)  # reference: highspy reads our file alike


def test_range_at_a_rounding_tie_reads_back_within_one_ulp(tmp_path):
    # b + R rounds to even at a tie here, so neither RHS/RANGES form hits both
    # bounds bit for bit; the writer warns and takes the closest form
    lo, hi = -615.367974034709, 3080.8068788131764
    p = Problem.from_arrays([1.0], [[1.0]], row_lower=[lo], row_upper=[hi])
    with pytest.warns(MpsWarning, match="unit in the last place"):
        write_mps(p, tmp_path / "tie.mps")
    back = read_mps(tmp_path / "tie.mps")
    got = (back.row_lower[0], back.row_upper[0])
    assert lo in got or hi in got
    assert abs(got[0] - lo) <= np.spacing(abs(lo)) and abs(got[1] - hi) <= np.spacing(hi)
    assert_matches_highs(back, tmp_path / "tie.mps")  # reference: highspy reads it alike


def test_write_empty_and_unnamed_problems(tmp_path):
    for p in (Problem.from_arrays(np.zeros(0)),
              Problem.from_arrays([1.0, 0.0], [[0.0, 0.0]], row_lower=[-1], name="")):
        write_mps(p, tmp_path / "e.mps")
        back = read_mps(tmp_path / "e.mps")
        assert_same_problem(p, _renamed(back, p.name))


def test_writer_refuses_unwritable_names(tmp_path):
    p = Problem.from_arrays([1.0, 2.0], col_names=["ok", "has space"])
    with pytest.raises(ProblemError, match="column 1 .'has space'."):
        write_mps(p, tmp_path / "bad.mps")
    p = Problem.from_arrays([1.0, 2.0], col_names=["dup", "dup"])
    with pytest.raises(ProblemError, match="duplicate"):
        write_mps(p, tmp_path / "bad.mps")
    p = Problem.from_arrays([1.0], col_upper=[1e25])
    with pytest.raises(ProblemError, match="infinite"):
        write_mps(p, tmp_path / "bad.mps")


def test_objective_row_name_avoids_row_names(tmp_path):
    p = Problem.from_arrays([1.0], [[1.0]], row_upper=[3.0], row_names=["obj"], offset=2.0)
    write_mps(p, tmp_path / "o.mps")
    assert_same_problem(p, _renamed(read_mps(tmp_path / "o.mps"), p.name))


# --------------------------------------------------------------- io dispatch
def test_read_model_and_write_model_dispatch_to_mps(tmp_path):
    p = _awkward_problem()
    for name in ("m.mps", "m.qps", "m.mps.gz", "m.qps.gz", "m.gz", "m.txt"):
        write_model(p, tmp_path / name)
        assert_same_problem(p, read_model(str(tmp_path / name)))
    assert gzip.decompress((tmp_path / "m.gz").read_bytes()).startswith(b"NAME awkward")


def test_json_paths_go_to_jsonmodel(tmp_path, monkeypatch):
    calls = []
    fake = types.ModuleType("undergrowth.model.jsonmodel")
    fake.read_json_model = lambda path: calls.append(("read", path)) or "problem"
    fake.write_json_model = lambda problem, path: calls.append(("write", path))
    monkeypatch.setitem(sys.modules, "undergrowth.model.jsonmodel", fake)
    path = str(tmp_path / "m.JSON")
    assert read_model(path) == "problem"
    write_model(Problem.from_arrays([1.0]), path)
    assert calls == [("read", path), ("write", path)]
