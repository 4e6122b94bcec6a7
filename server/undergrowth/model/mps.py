"""MPS reader and writer (fixed and free format, plain or gzip-compressed).

The reader follows the conventions of HiGHS's own MPS reader wherever that
reader has one (see docs/mps.md); where HiGHS only warns about a doubtful file
(duplicates, unknown names) this reader refuses it with a `ModelFormatError`
that names the file, the line and the offending token.
"""

from __future__ import annotations

import gzip
import os
import warnings
from collections.abc import Callable
from typing import Any

import numpy as np
import scipy.sparse as sp

from ._mps_tokens import (
    DROPPED,
    INF,
    MPS_INFINITY,
    NEEDS_COLUMNS,
    OBJ,
    REFUSED,
    SECTIONS,
    SENSES,
    SETS_LOWER,
    SETS_UPPER,
    LineError,
    PlacedError,
    bound_lines,
    check_names,
    check_not_huge,
    file_stem,
    fixed_fields,
    format_number,
    hessian,
    load_lines,
    parse_bounds,
    parse_columns,
    parse_objsense,
    parse_pairs,
    parse_q,
    parse_rows,
    range_rhs,
    row_bounds,
)
from .errors import ModelFormatError, ProblemError
from .problem import Problem, Sense

__all__ = ["MpsWarning", "read_mps", "write_mps"]


class MpsWarning(UserWarning):
    """Something in an MPS file was ignored (extra N rows, their RHS entries)."""


def read_mps(path: str | os.PathLike[str]) -> Problem:
    """Read a fixed or free MPS file (gzip detected by magic bytes) into a `Problem`.

    Raises `ModelFormatError` for any malformed content; OSError when the file
    cannot be opened.
    """
    spath = os.fspath(path)
    try:
        lines, ascii_text = load_lines(spath)
    except PlacedError as exc:
        raise ModelFormatError(exc.message, path=spath, line=exc.line, token=exc.token) from None
    reader = _Reader(spath)
    problem = reader.run(lines, ascii_text)
    for message in reader.warnings:
        warnings.warn(f"{spath}: {message}", MpsWarning, stacklevel=2)
    return problem


class _Reader:
    """One pass over the lines; COO triplets collected in lists, matrix built once."""

    def __init__(self, path: str) -> None:
        self.path = path
        self.warnings: list[str] = []
        self.name: str | None = None
        self.sense: Sense = "min"
        self.section: str | None = None
        self.seen: dict[str, int] = {}
        self.objsense_pending: int | None = None  # line of a value-less OBJSENSE header
        self.prefer_fixed = False
        # rows: name -> index into constraint rows, or OBJ / DROPPED
        self.row_index: dict[str, int] = {}
        self.row_line: dict[str, int] = {}
        self.row_types: list[str] = []
        self.row_names: list[str] = []
        self.obj_name: str | None = None
        self.dropped: list[str] = []
        self.dropped_rhs = False
        # columns
        self.col_index: dict[str, int] = {}
        self.col_line: list[int] = []
        self.col_names: list[str] = []
        self.cost: list[float] = []
        self.integer: list[bool] = []
        self.cur_col = -1
        self.cur_seen: dict[str, int] = {}
        self.marker_line: int | None = None
        self.coo_row: list[int] = []
        self.coo_col: list[int] = []
        self.coo_val: list[float] = []
        # RHS / RANGES: row index -> (value, line)
        self.rhs: dict[int, tuple[float, int]] = {}
        self.offset = 0.0
        self.offset_line: int | None = None
        self.ranges: dict[int, tuple[float, int]] = {}
        # bounds, created when COLUMNS ends
        self.lower: list[float] = []
        self.upper: list[float] = []
        self.lower_line: dict[int, int] = {}
        self.upper_line: dict[int, int] = {}
        # quadratic objective: (i, j) -> (value, line)
        self.q_kind: str | None = None
        self.q: dict[tuple[int, int], tuple[float, int]] = {}
        # Parsers only read the name tables, so a failed free-format attempt can
        # be retried as fixed format.
        rows, cols = self.row_index, self.col_index
        self._parse: dict[str, Callable[[list[str]], Any]] = {
            "OBJSENSE": self._parse_objsense,
            "ROWS": parse_rows,
            "COLUMNS": lambda t: parse_columns(t, rows),
            "RHS": lambda t: parse_pairs(t, rows, "RHS"),
            "RANGES": lambda t: parse_pairs(t, rows, "RANGES"),
            "BOUNDS": lambda t: parse_bounds(t, cols),
            "QUADOBJ": lambda t: parse_q(t, cols, "QUADOBJ"),
            "QMATRIX": lambda t: parse_q(t, cols, "QMATRIX"),
        }
        self._apply = {
            "OBJSENSE": self._apply_objsense, "ROWS": self._apply_rows,
            "COLUMNS": self._apply_columns, "RHS": self._apply_rhs,
            "RANGES": self._apply_ranges, "BOUNDS": self._apply_bounds,
            "QUADOBJ": self._apply_q, "QMATRIX": self._apply_q,
        }

    def fail(self, message: str, line: int | None, token: str | None = None) -> ModelFormatError:
        return ModelFormatError(message, path=self.path, line=line, token=token)

    # ------------------------------------------------------------ main loop
    def run(self, lines: list[str], ascii_text: bool = False) -> Problem:
        last = 0
        # Fast path for the bulk of a file: a free-format COLUMNS line with one
        # entry that continues the current column, names a known row and holds
        # a finite number is applied inline; anything else (new columns, two
        # entries, markers, errors) goes through _data, which checks it all.
        fast = False
        cur_name: str | None = None
        row_get = self.row_index.get
        add_row, add_col, add_val = self.coo_row.append, self.coo_col.append, \
            self.coo_val.append
        cost, col_index, col_names = self.cost, self.col_index, self.col_names
        seen: dict[str, int] = {}
        j = -1
        for lineno, raw in enumerate(lines, 1):
            if not raw or raw[0] == "*":
                continue
            if fast and raw[0] == " ":
                toks = raw.split()
                if len(toks) == 3:
                    cname, rname, vtok = toks
                    r = row_get(rname)
                    try:
                        v = float(vtok)
                    except ValueError:
                        r = None
                    if r is not None and v - v == 0.0 and "_" not in vtok and \
                            (ascii_text or vtok.isascii()) and (r >= 0 or abs(v) < MPS_INFINITY):
                        if cname != cur_name:
                            if cname in col_index:
                                r = None  # a repeated column block: _data reports it
                            else:
                                j = len(col_names)
                                col_index[cname] = j
                                col_names.append(cname)
                                self.col_line.append(lineno)
                                cost.append(0.0)
                                self.integer.append(self.marker_line is not None)
                                self.cur_col = j
                                cur_name = cname
                                seen = self.cur_seen = {}
                        if r is not None and rname not in seen:
                            last = lineno
                            seen[rname] = lineno
                            if r >= 0:
                                add_row(r)
                                add_col(j)
                                add_val(v)
                            elif r == OBJ:
                                cost[j] = v
                            continue
            line = raw.rstrip()
            if not line:
                continue
            last = lineno
            try:
                if not line[0].isspace():
                    if self._header(line, lineno):
                        return self._finish()
                else:
                    self._data(line, lineno)
            except LineError as exc:
                raise self.fail(exc.message, lineno, exc.token) from None
            fast = self.section == "COLUMNS" and not self.prefer_fixed
            if fast:
                j = self.cur_col
                cur_name = self.col_names[j] if j >= 0 else None
                seen = self.cur_seen
        if last == 0:
            raise self.fail("empty file: no MPS sections found", None)
        raise self.fail(
            f"file ends without ENDATA (last section: {self.section or 'none'})", last
        )

    def _header(self, line: str, lineno: int) -> bool:
        toks = line.split()
        key = toks[0].upper()
        if self.objsense_pending is not None and key in SENSES and len(toks) == 1:
            # HiGHS also accepts the OBJSENSE value unindented on the next line
            self._apply_objsense(self._parse_objsense(toks), lineno)
            return False
        if key not in SECTIONS:
            if key in REFUSED:
                raise LineError(REFUSED[key], toks[0])
            raise LineError(
                "unknown section (sections are NAME, OBJSENSE, ROWS, COLUMNS, RHS, RANGES, "
                "BOUNDS, QUADOBJ, QMATRIX, ENDATA; data lines must start with a space)",
                toks[0],
            )
        self._leave()
        if key in self.seen:
            raise LineError(f"section {key} appears twice (first on line {self.seen[key]})",
                            toks[0])
        self.seen[key] = lineno
        if key == "NAME":
            self.name = line[len(toks[0]):].strip()
            self.section = None
            return False
        if key == "OBJSENSE":
            if len(toks) > 2:
                raise LineError("OBJSENSE takes one value (MIN or MAX)", toks[2])
            self.section = "OBJSENSE"
            self.objsense_pending = lineno
            if len(toks) == 2:  # the one-line form
                self._apply_objsense(self._parse_objsense(toks[1:]), lineno)
            return False
        if len(toks) > 1:
            raise LineError(f"unexpected field after section name {key}", toks[1])
        if key == "COLUMNS" and "ROWS" not in self.seen:
            raise LineError("COLUMNS section before any ROWS section", toks[0])
        if key in NEEDS_COLUMNS and "COLUMNS" not in self.seen:
            raise LineError(f"{key} section before the COLUMNS section", toks[0])
        if key == "ROWS" and "COLUMNS" in self.seen:
            raise LineError("ROWS section after the COLUMNS section", toks[0])
        if key in ("QUADOBJ", "QMATRIX"):
            if self.q_kind is not None:
                raise LineError(f"both {self.q_kind} and {key} given; use one", toks[0])
            self.q_kind = key
        self.section = None if key == "ENDATA" else key
        if key == "ENDATA":
            for needed in ("ROWS", "COLUMNS"):
                if needed not in self.seen:
                    raise LineError(f"missing {needed} section", toks[0])
            return True
        return False

    def _leave(self) -> None:
        """Checks when a section ends (a new header follows)."""
        if self.objsense_pending is not None:
            raise self.fail("OBJSENSE section has no value (MIN or MAX)",
                            self.objsense_pending, "OBJSENSE")
        if self.section == "COLUMNS":
            if self.marker_line is not None:
                raise self.fail("integer block 'INTORG' is never closed with 'INTEND'",
                                self.marker_line, "'INTORG'")
            n = len(self.col_names)
            self.lower = [0.0] * n
            self.upper = [INF] * n
        if self.section == "ROWS" and self.dropped:
            self.warnings.append(
                f"ignoring {len(self.dropped)} further N row(s) after the objective row "
                f"{self.obj_name!r}: {', '.join(self.dropped[:5])}"
                + (" ..." if len(self.dropped) > 5 else "")
            )

    def _data(self, line: str, lineno: int) -> None:
        section = self.section
        if section is None:
            where = "before any section" if not self.seen else "outside a data section"
            raise LineError(f"data line {where}", line.split()[0])
        parse = self._parse[section]
        # Free format first; a line that fails there but is laid out in fixed
        # columns (names with spaces) is retried as fixed, and once that has
        # happened fixed is tried first for the rest of the file.
        if self.prefer_fixed and (fields := fixed_fields(line)) is not None:
            try:
                item = parse(fields)
            except LineError:
                item = parse(line.split())
        else:
            try:
                item = parse(line.split())
            except LineError as free_error:
                fields = fixed_fields(line)
                if fields is None:
                    raise
                try:
                    item = parse(fields)
                except LineError:
                    raise free_error from None
                self.prefer_fixed = True
        self._apply[section](item, lineno)

    def _parse_objsense(self, toks: list[str]) -> Sense:
        if self.objsense_pending is None:
            raise LineError("OBJSENSE already has a value", toks[0])
        return parse_objsense(toks)

    # ------------------------------------------------------------ applying
    def _apply_objsense(self, sense: Sense, lineno: int) -> None:
        self.sense = sense
        self.objsense_pending = None

    def _apply_rows(self, item: tuple[str, str], lineno: int) -> None:
        kind, name = item
        if name in self.row_line:
            raise LineError(f"duplicate row name (first on line {self.row_line[name]})", name)
        self.row_line[name] = lineno
        if kind == "N":
            if self.obj_name is None:
                self.obj_name = name
                self.row_index[name] = OBJ
            else:
                self.row_index[name] = DROPPED
                self.dropped.append(name)
            return
        self.row_index[name] = len(self.row_types)
        self.row_types.append(kind)
        self.row_names.append(name)

    def _apply_columns(self, item: tuple, lineno: int) -> None:
        if len(item) == 3:  # a marker line
            kind = item[1]
            if kind == "INTORG":
                if self.marker_line is not None:
                    raise LineError(
                        f"'INTORG' inside an integer block opened on line {self.marker_line}",
                        item[2])
                self.marker_line = lineno
            else:
                if self.marker_line is None:
                    raise LineError("'INTEND' without a matching 'INTORG'", item[2])
                self.marker_line = None
            self.cur_col = -1  # a column may not continue across a marker
            return
        name = item[0]
        j = self.cur_col
        if j < 0 or self.col_names[j] != name:
            if name in self.col_index:
                first = self.col_line[self.col_index[name]]
                raise LineError(
                    f"column appears again after other columns (its entries start on line "
                    f"{first}); a column's entries must be contiguous", name)
            j = len(self.col_names)
            self.col_index[name] = j
            self.col_names.append(name)
            self.col_line.append(lineno)
            self.cost.append(0.0)
            self.integer.append(self.marker_line is not None)
            self.cur_col = j
            self.cur_seen = {}
        seen = self.cur_seen
        for k in range(1, len(item), 3):
            rname, r, v = item[k], item[k + 1], item[k + 2]
            if rname in seen:
                raise LineError(
                    f"second entry for column {name!r} in this row (first on line "
                    f"{seen[rname]})", rname)
            seen[rname] = lineno
            if r >= 0:
                self.coo_row.append(r)
                self.coo_col.append(j)
                self.coo_val.append(v)
            elif r == OBJ:
                self.cost[j] = v

    def _apply_rhs(self, item: list[tuple[str, int, float]], lineno: int) -> None:
        for rname, idx, v in item:
            if idx == OBJ:
                if self.offset_line is not None:
                    raise LineError(
                        f"second RHS for the objective row (first on line {self.offset_line})",
                        rname)
                # RHS on the objective row is minus the objective constant (as in HiGHS)
                self.offset = -v
                self.offset_line = lineno
            elif idx == DROPPED:
                if not self.dropped_rhs:
                    self.dropped_rhs = True
                    self.warnings.append(
                        f"line {lineno}: ignoring RHS on the dropped N row {rname!r}")
            elif idx in self.rhs:
                raise LineError(f"second RHS for this row (first on line {self.rhs[idx][1]})",
                                rname)
            else:
                self.rhs[idx] = (v, lineno)

    def _apply_ranges(self, item: list[tuple[str, int, float]], lineno: int) -> None:
        for rname, idx, v in item:
            if idx in self.ranges:
                raise LineError(
                    f"second RANGES entry for this row (first on line {self.ranges[idx][1]})",
                    rname)
            self.ranges[idx] = (v, lineno)

    def _apply_bounds(self, item: tuple[str, int, float | None], lineno: int) -> None:
        kind, j, value = item
        v = 0.0 if value is None else value  # only FR/MI/PL/BV come without one
        name = self.col_names[j]
        if kind in SETS_LOWER and j in self.lower_line:
            raise LineError(
                f"{kind} sets the lower bound again (already set on line {self.lower_line[j]})",
                name)
        if kind in SETS_UPPER and j in self.upper_line:
            raise LineError(
                f"{kind} sets the upper bound again (already set on line {self.upper_line[j]})",
                name)
        if kind in SETS_LOWER:
            self.lower_line[j] = lineno
        if kind in SETS_UPPER:
            self.upper_line[j] = lineno
        if kind in ("UP", "UI"):
            self.upper[j] = v
        elif kind in ("LO", "LI"):
            self.lower[j] = v
        elif kind == "FX":
            self.lower[j] = self.upper[j] = v
        elif kind == "FR":
            self.lower[j], self.upper[j] = -INF, INF
        elif kind == "MI":
            self.lower[j] = -INF
        elif kind == "PL":
            self.upper[j] = INF
        else:  # BV
            self.lower[j], self.upper[j] = 0.0, 1.0
        if kind in ("BV", "LI", "UI"):
            self.integer[j] = True

    def _apply_q(self, item: tuple[int, int, float, str], lineno: int) -> None:
        i, j, v, tok = item
        # QUADOBJ gives each symmetric pair once (either order); QMATRIX every entry.
        key = (min(i, j), max(i, j)) if self.section == "QUADOBJ" else (i, j)
        if key in self.q:
            raise LineError(
                f"second {self.section} entry for ({self.col_names[i]}, {self.col_names[j]}) "
                f"(first on line {self.q[key][1]})", tok)
        self.q[key] = (v, lineno)

    # ------------------------------------------------------------ finishing
    def _finish(self) -> Problem:
        n = len(self.col_names)
        m = len(self.row_types)
        rl, ru = row_bounds(self.row_types, self.rhs, self.ranges)
        cl = np.array(self.lower, dtype=float)
        cu = np.array(self.upper, dtype=float)
        integ = np.array(self.integer, dtype=bool)
        # HiGHS: a marker-block integer column with no BOUNDS entry is binary
        binary = [j for j in range(n) if self.integer[j] and j not in self.lower_line
                  and j not in self.upper_line]
        cu[binary] = 1.0
        cl[cl <= -MPS_INFINITY] = -INF
        cu[cu >= MPS_INFINITY] = INF
        bad = np.flatnonzero(cl > cu)
        if bad.size:
            j = int(bad[0])
            line = max(self.lower_line.get(j, 0), self.upper_line.get(j, 0)) or None
            hint = ""
            if cl[j] == 0.0 and j not in self.lower_line:
                hint = (" (an UP bound below zero leaves the default lower bound 0 in place, "
                        "as HiGHS does; add an MI or LO bound)")
            raise self.fail(
                f"column {self.col_names[j]!r} has lower bound {format_number(cl[j])} above "
                f"its upper bound {format_number(cu[j])}{hint}", line, self.col_names[j])
        A = sp.csr_matrix(
            (np.array(self.coo_val, dtype=float),
             (np.array(self.coo_row, dtype=np.int64), np.array(self.coo_col, dtype=np.int64))),
            shape=(m, n),
        )
        try:
            Q = hessian(self.q, self.q_kind, self.col_names)
        except PlacedError as exc:
            raise self.fail(exc.message, exc.line, exc.token) from None
        try:
            return Problem.from_arrays(
                np.array(self.cost, dtype=float), A, row_lower=rl, row_upper=ru,
                col_lower=cl, col_upper=cu, integrality=integ, sense=self.sense,
                offset=self.offset, Q=Q, col_names=self.col_names, row_names=self.row_names,
                name=self.name or file_stem(self.path),
            )
        except ProblemError as exc:
            raise self.fail(f"the model read is not valid: {exc}", None) from None


# ---------------------------------------------------------------- writing
def write_mps(problem: Problem, path: str | os.PathLike[str]) -> None:
    """Write ``problem`` as free MPS (gzip-compressed when ``path`` ends in .gz).

    Every array reads back exactly with `read_mps`. Raises `ProblemError` if a
    name cannot be written in free MPS (empty, contains whitespace, duplicated)
    or a finite value would read back as infinite (|value| >= 1e20).
    """
    spath = os.fspath(path)
    text = "\n".join(_mps_lines(problem)) + "\n"
    data = text.encode("utf-8")
    if spath.lower().endswith(".gz"):
        data = gzip.compress(data, mtime=0)
    with open(spath, "wb") as fh:
        fh.write(data)


def _mps_lines(p: Problem) -> list[str]:
    check_names("column", p.col_names)
    check_names("row", p.row_names)
    # NAME takes the rest of its line; collapse whitespace so the name stays on it
    name_line = ("NAME " + " ".join(str(p.name).split())).rstrip()
    rows = set(p.row_names)
    obj = "obj"
    k = 0
    while obj in rows:
        k += 1
        obj = f"obj_{k}"
    rl, ru = p.row_lower, p.row_upper
    check_not_huge("row", p.row_names, rl, "lower bound")
    check_not_huge("row", p.row_names, ru, "upper bound")
    check_not_huge("column", p.col_names, p.col_lower, "lower bound")
    check_not_huge("column", p.col_names, p.col_upper, "upper bound")
    check_not_huge("column", p.col_names, p.c, "objective coefficient")
    fmt = format_number
    out = [name_line]
    if p.sense == "max":
        out += ["OBJSENSE", "    MAX"]
    out += ["ROWS", f" N  {obj}"]
    rhs: list[str] = []
    ranges: list[str] = []
    inexact: list[str] = []
    if p.offset != 0.0:
        rhs.append(f"    RHS  {obj}  {fmt(-p.offset)}")
    for i, rname in enumerate(p.row_names):
        lo, hi = float(rl[i]), float(ru[i])
        if lo == hi:
            kind, b = "E", lo
        elif lo == -INF and hi == INF:
            kind, b = "L", 1e30  # a free row; an N row would be dropped on reading
        elif lo == -INF:
            kind, b = "L", hi
        elif hi == INF:
            kind, b = "G", lo
        else:
            kind, b, r, exact = range_rhs(lo, hi)
            if not exact:
                inexact.append(rname)
            ranges.append(f"    RNG  {rname}  {fmt(r)}")
        out.append(f" {kind}  {rname}")
        if b != 0.0:
            rhs.append(f"    RHS  {rname}  {fmt(b)}")
    out.append("COLUMNS")
    A = sp.csc_matrix(p.A)
    indptr, indices, data = A.indptr.tolist(), A.indices.tolist(), A.data.tolist()
    cost = p.c.tolist()
    integ = p.integrality.tolist()
    row_names = p.row_names
    in_block = False
    for j, cname in enumerate(p.col_names):
        if integ[j] != in_block:
            out.append("    MARKER  'MARKER'  " + ("'INTORG'" if integ[j] else "'INTEND'"))
            in_block = integ[j]
        start, stop = indptr[j], indptr[j + 1]
        if cost[j] != 0.0 or start == stop:
            out.append(f"    {cname}  {obj}  {fmt(cost[j])}")
        for k in range(start, stop):
            out.append(f"    {cname}  {row_names[indices[k]]}  {fmt(data[k])}")
    if in_block:
        out.append("    MARKER  'MARKER'  'INTEND'")
    out.append("RHS")
    out += rhs
    if ranges:
        out.append("RANGES")
        out += ranges
    bounds = bound_lines(p.col_names, p.col_lower.tolist(), p.col_upper.tolist(),
                         p.integrality.tolist())
    if bounds:
        out.append("BOUNDS")
        out += bounds
    if p.Q is not None:
        out.append("QUADOBJ")
        lower = sp.csc_matrix(sp.tril(p.Q))
        lower.sort_indices()
        qp, qi, qv = lower.indptr.tolist(), lower.indices.tolist(), lower.data.tolist()
        names = p.col_names
        for j in range(p.num_cols):
            for k in range(qp[j], qp[j + 1]):
                out.append(f"    {names[j]}  {names[qi[k]]}  {fmt(qv[k])}")
    out.append("ENDATA")
    if inexact:
        warnings.warn(
            f"{len(inexact)} ranged row(s) cannot be written so that both bounds read back "
            f"bit for bit; the far bound is off by one unit in the last place: "
            f"{', '.join(inexact[:5])}", MpsWarning, stacklevel=3)
    return out
