"""Low-level helpers for the MPS reader and writer: loading bytes, fixed-format
fields, numbers, and turning one data line's fields into a parsed item.

Kept apart from `mps.py` so the section logic there stays readable. The line
parsers only read the row and column tables, never change them, so the reader
can retry a line in fixed format after a free-format attempt failed.
"""

from __future__ import annotations

import codecs
import gzip
import math
import os
import zlib
from pathlib import Path

import numpy as np
import scipy.sparse as sp

from .errors import ProblemError
from .problem import Sense

GZIP_MAGIC = b"\x1f\x8b"

# Magnitudes at or beyond this are infinite in MPS files (HiGHS uses the same
# threshold, its default ``infinite_bound``).
MPS_INFINITY = 1e20

INF = math.inf

OBJ = -1  # row index of the objective row
DROPPED = -2  # row index of further N rows, which are ignored

SENSES: dict[str, Sense] = {
    "MIN": "min", "MINIMIZE": "min", "MINIMISE": "min",
    "MAX": "max", "MAXIMIZE": "max", "MAXIMISE": "max",
}
VALUED_BOUNDS = frozenset(("UP", "LO", "FX", "LI", "UI"))
BARE_BOUNDS = frozenset(("FR", "MI", "PL", "BV"))
SECTIONS = ("NAME", "OBJSENSE", "ROWS", "COLUMNS", "RHS", "RANGES", "BOUNDS", "QUADOBJ",
             "QMATRIX", "ENDATA")
NEEDS_COLUMNS = ("RHS", "RANGES", "BOUNDS", "QUADOBJ", "QMATRIX")
REFUSED = {
    "QSECTION": "QSECTION is not supported; write the Hessian as QUADOBJ or QMATRIX",
    "QCMATRIX": "quadratic constraints (QCMATRIX) are not supported",
    "SOS": "special ordered sets (SOS) are not supported",
    "CSECTION": "conic constraints (CSECTION) are not supported",
    "INDICATORS": "indicator constraints are not supported",
    "OBJNAME": "OBJNAME is not supported; the first N row is the objective",
}
SETS_LOWER = frozenset(("LO", "LI", "MI", "FX", "FR", "BV"))
SETS_UPPER = frozenset(("UP", "UI", "PL", "FX", "FR", "BV"))


class LineError(Exception):
    """A problem with one data line; the reader adds the path and line number."""

    def __init__(self, message: str, token: str | None = None) -> None:
        super().__init__(message)
        self.message = message
        self.token = token


class PlacedError(Exception):
    """An error whose line (or None for the whole file) and token are already known."""

    def __init__(self, message: str, line: int | None = None, token: str | None = None) -> None:
        super().__init__(message)
        self.message = message
        self.line = line
        self.token = token


def load_lines(path: str | os.PathLike[str]) -> tuple[list[str], bool]:
    """The file's text split on newlines, and whether it is all ASCII.

    gzip is detected by its magic bytes, not the name. OSError from opening the
    file (missing, unreadable) is left to the caller.
    """
    with open(path, "rb") as fh:
        data = fh.read()
    if data[:2] == GZIP_MAGIC:
        try:
            data = gzip.decompress(data)
        except (EOFError, zlib.error, OSError, ValueError) as exc:  # BadGzipFile is an OSError
            detail = exc or type(exc).__name__
            raise PlacedError(f"truncated or corrupt gzip data ({detail})") from None
    if not data.strip():
        raise PlacedError("empty file: no MPS sections found")
    if data.startswith(codecs.BOM_UTF8):
        data = data[len(codecs.BOM_UTF8):]
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = data.count(b"\n", 0, exc.start) + 1
        bad = data[exc.start : exc.end]
        raise PlacedError(
            "bytes that are not valid UTF-8 text", line=line, token="0x" + bad.hex()
        ) from None
    # Split on "\n" only: str.splitlines would also break on form feeds and other
    # separators and so disagree with the line numbers an editor shows.
    return text.split("\n"), text.isascii()


def number(tok: str) -> float:
    """A numeric field; NaN and Python-only spellings (``1_000``) are refused."""
    try:
        value = float(tok)
    except ValueError:
        raise LineError("not a number", tok) from None
    if value != value or "_" in tok or not tok.isascii():
        raise LineError("not a number", tok)
    return value


def finite(tok: str, what: str) -> float:
    """A numeric field that must not be infinite (matrix and Hessian entries)."""
    value = number(tok)
    if value == INF or value == -INF:
        raise LineError(f"{what} is infinite", tok)
    return value


# Fixed MPS puts fields in columns 2-3, 5-12, 15-22, 25-36, 40-47 and 50-61;
# everything between them must be blank.
_FIXED_SLICES = ((1, 3), (4, 12), (14, 22), (24, 36), (39, 47), (49, 61))
_FIXED_GAPS = (0, 3, 12, 13, 22, 23, 36, 37, 38, 47, 48)


def fixed_fields(line: str) -> list[str] | None:
    """The non-blank fixed-format fields of ``line``, or None if it is not laid
    out in fixed columns. Fields may contain spaces (``MY COL``)."""
    n = len(line)
    if n > 61 and line[61:].strip():
        return None
    for pos in _FIXED_GAPS:
        if pos < n and line[pos] != " ":
            return None
    out = []
    for start, stop in _FIXED_SLICES:
        field = line[start:stop].strip()
        if field:
            out.append(field)
    return out


def format_number(value: float) -> str:
    """Shortest text that reads back as exactly the same double."""
    text = repr(float(value))
    return text[:-2] if text.endswith(".0") else text


def has_space(name: str) -> bool:
    """True if ``name`` is empty or holds whitespace (not writable in free MPS)."""
    return not name or len(name.split()) != 1 or name != name.strip()


# ------------------------------------------------------------ assembling
def row_bounds(kinds: list[str], rhs: dict[int, tuple[float, int]],
               ranges: dict[int, tuple[float, int]]) -> tuple[np.ndarray, np.ndarray]:
    """Row bounds from row types, RHS values and RANGES values (each with its line)."""
    b = np.zeros(len(kinds))
    for idx, (v, _) in rhs.items():
        b[idx] = v
    types = np.array(kinds, dtype="<U1")
    rl = np.where((types == "L"), -INF, b)
    ru = np.where((types == "G"), INF, b)
    for idx, (r, _) in ranges.items():
        kind, bi, size = kinds[idx], float(b[idx]), abs(r)
        # Standard MPS range rules: E rows grow up (R > 0) or down (R < 0)
        if kind == "L" or (kind == "E" and r < 0):
            rl[idx] = bi - size
        else:
            ru[idx] = bi + size
    rl[rl <= -MPS_INFINITY] = -INF
    ru[ru >= MPS_INFINITY] = INF
    return rl, ru


def hessian(q: dict[tuple[int, int], tuple[float, int]], kind: str | None,
            names: list[str]) -> sp.csr_matrix | None:
    """The full symmetric Q from QUADOBJ pairs or QMATRIX entries (value, line)."""
    if not q:
        return None
    n = len(names)
    rows, cols, vals = [], [], []
    for (i, j), (v, lineno) in q.items():
        if kind == "QMATRIX" and i != j:
            mirror = q.get((j, i))
            if mirror is None:
                raise PlacedError(
                    f"QMATRIX lists the full matrix, but ({names[i]}, "
                    f"{names[j]}) has no mirror entry ({names[j]}, "
                    f"{names[i]})", lineno, names[j])
            if mirror[0] != v:
                raise PlacedError(
                    f"QMATRIX is not symmetric: ({names[i]}, {names[j]})"
                    f" = {format_number(v)} but the mirror entry is "
                    f"{format_number(mirror[0])}", max(lineno, mirror[1]),
                    names[j])
        rows.append(i)
        cols.append(j)
        vals.append(v)
        if kind == "QUADOBJ" and i != j:
            rows.append(j)
            cols.append(i)
            vals.append(v)
    return sp.csr_matrix((vals, (rows, cols)), shape=(n, n))


# ------------------------------------------------------------ writer checks
def check_names(kind: str, names: tuple[str, ...]) -> None:
    seen: set[str] = set()
    for k, name in enumerate(map(str, names)):
        if has_space(name):
            raise ProblemError(
                f"{kind} {k} ({name!r}): names with spaces cannot be written in free MPS")
        if name in seen:
            raise ProblemError(f"{kind} {k} ({name!r}): duplicate name cannot be written in MPS")
        seen.add(name)


def check_not_huge(kind: str, names: tuple[str, ...], values: np.ndarray, what: str) -> None:
    big = np.isfinite(values) & (np.abs(values) >= MPS_INFINITY)
    if big.any():
        k = int(np.flatnonzero(big)[0])
        raise ProblemError(
            f"{kind} {k} ({names[k]}): {what} {format_number(values[k])} would read back as "
            f"infinite (MPS treats |value| >= 1e20 as infinity)")


def range_rhs(lo: float, hi: float) -> tuple[str, float, float, bool]:
    """Row type, RHS and RANGES value for [lo, hi], and whether they read back exactly.

    The reader rebuilds the far bound as ``b + R`` (G) or ``b - R`` (L), so b
    must be one of the bounds. Rounding can make a few pairs unreachable (the
    sum lands on a tie and rounds to even); then the closest pair is returned.
    """
    best: tuple[float, str, float, float] | None = None
    for kind, b, target in (("G", lo, hi), ("L", hi, lo)):
        r = abs(target - b)
        cands = [r]
        up = down = r
        for _ in range(4):
            up, down = math.nextafter(up, INF), math.nextafter(down, 0.0)
            cands += [up, down]
        for r in cands:
            got = b + r if kind == "G" else b - r
            if got == target and r > 0.0:
                return kind, b, r, True
            err = abs(got - target) / math.ulp(target)
            if r > 0.0 and (best is None or err < best[0]):
                best = (err, kind, b, r)
    assert best is not None  # r = |hi - lo| > 0 always qualifies
    return best[1], best[2], best[3], False


def bound_lines(names: tuple[str, ...], lower: list[float], upper: list[float],
                integ: list[bool]) -> list[str]:
    """BOUNDS lines for columns whose bounds differ from the defaults."""
    fmt = format_number
    out = []
    for j, name in enumerate(names):
        lo, hi = lower[j], upper[j]
        if lo == hi:
            out.append(f" FX BND  {name}  {fmt(lo)}")
        elif lo == -INF and hi == INF:
            out.append(f" FR BND  {name}")
        elif integ[j] and lo == 0.0 and hi == 1.0:
            out.append(f" BV BND  {name}")
        else:
            if lo == -INF:
                out.append(f" MI BND  {name}")
            elif lo != 0.0:
                out.append(f" LO BND  {name}  {fmt(lo)}")
            if hi != INF:
                out.append(f" UP BND  {name}  {fmt(hi)}")
            elif integ[j] and lo == 0.0:
                # integer columns with no bound entry would read back as binary
                out.append(f" PL BND  {name}")
    return out


def file_stem(path: str) -> str:
    """The model name used when a file has no NAME: its name without extensions."""
    name = Path(path).name
    if name.lower().endswith(".gz"):
        name = name[:-3]
    return Path(name).stem or "model"


# ------------------------------------------------------------ line parsers
def parse_objsense(toks: list[str]) -> Sense:
    if len(toks) != 1:
        raise LineError("OBJSENSE takes one value (MIN or MAX)", toks[-1])
    sense = SENSES.get(toks[0].upper())
    if sense is None:
        raise LineError("OBJSENSE value must be MIN, MAX, MINIMIZE or MAXIMIZE", toks[0])
    return sense


def parse_rows(toks: list[str]) -> tuple[str, str]:
    if len(toks) != 2:
        raise LineError(
            f"ROWS lines have 2 fields (type, name), found {len(toks)}",
            toks[2] if len(toks) > 2 else toks[0],
        )
    kind = toks[0].upper()
    if kind not in ("N", "L", "G", "E"):
        raise LineError("unknown row type (expected N, L, G or E)", toks[0])
    return kind, toks[1]


def _row(name: str, rows: dict[str, int]) -> int:
    idx = rows.get(name)
    if idx is None:
        hint = " (integer markers are written 'MARKER' with quotes)" if name.upper() in (
            "MARKER", "'MARKER'") else ""
        raise LineError("unknown row (not declared in ROWS)" + hint, name)
    return idx


def _col(name: str, cols: dict[str, int]) -> int:
    j = cols.get(name)
    if j is None:
        raise LineError("unknown column (not in COLUMNS)", name)
    return j


def parse_columns(toks: list[str], rows: dict[str, int]) -> tuple:
    """An entry (column, row, index, value[, row, index, value]) or a marker."""
    n = len(toks)
    if n == 3 and toks[1] == "'MARKER'" and "'MARKER'" not in rows:
        kind = toks[2].upper().strip("'")
        if kind not in ("INTORG", "INTEND"):
            raise LineError("unknown marker (expected 'INTORG' or 'INTEND')", toks[2])
        return ("marker", kind, toks[2])
    if n != 3 and n != 5:
        raise LineError(
            f"COLUMNS lines have 3 or 5 fields (column, row, value[, row, value]), "
            f"found {n}", toks[-1])
    r1 = _row(toks[1], rows)
    v1 = _coefficient(toks[2], r1)
    if n == 3:
        return (toks[0], toks[1], r1, v1)
    r2 = _row(toks[3], rows)
    v2 = _coefficient(toks[4], r2)
    return (toks[0], toks[1], r1, v1, toks[3], r2, v2)


def _coefficient(tok: str, row: int) -> float:
    v = finite(tok, "coefficient")
    if row == OBJ and abs(v) >= MPS_INFINITY:
        # HiGHS would make this cost infinite; a Problem needs finite costs
        raise LineError("objective coefficient is infinite (|value| >= 1e20)", tok)
    return v


def parse_pairs(
    toks: list[str], rows: dict[str, int], section: str
) -> list[tuple[str, int, float]]:
    """RHS and RANGES: [set] row value [row value]; the set name is ignored."""
    n = len(toks)
    if n < 2 or n > 5:
        raise LineError(
            f"{section} lines have 2 to 5 fields ([set,] row, value[, row, value]), "
            f"found {n}", toks[-1])
    start = n % 2  # an odd count means a leading set name
    out = []
    for k in range(start, n, 2):
        idx = _row(toks[k], rows)
        if section == "RANGES" and idx < 0:
            raise LineError("RANGES entry on an N row", toks[k])
        out.append((toks[k], idx, number(toks[k + 1])))
    return out


def parse_bounds(toks: list[str], cols: dict[str, int]) -> tuple[str, int, float | None]:
    n = len(toks)
    kind = toks[0].upper()
    if kind in ("SC", "SI"):
        raise LineError(
            "semi-continuous and semi-integer bounds (SC, SI) are not supported", toks[0])
    if kind not in VALUED_BOUNDS and kind not in BARE_BOUNDS:
        raise LineError("unknown bound type (expected UP, LO, FX, FR, MI, PL, BV, LI or UI)",
                        toks[0])
    if n < 2 or n > 4:
        raise LineError(
            f"BOUNDS lines have 2 to 4 fields (type, [set,] column[, value]), found {n}",
            toks[-1])
    if kind in VALUED_BOUNDS:
        if n == 2:
            raise LineError(f"{kind} bound needs a value", toks[1])
        j = _col(toks[n - 2], cols)
        return kind, j, number(toks[n - 1])
    # FR/MI/PL/BV take no value, but some writers add one; three fields are
    # "type set column" unless only the middle one names a column.
    if n == 3 and toks[2] not in cols and toks[1] in cols:
        number(toks[2])
        return kind, cols[toks[1]], None
    if n == 4:
        number(toks[3])
    return kind, _col(toks[1] if n == 2 else toks[2], cols), None


def parse_q(toks: list[str], cols: dict[str, int], section: str) -> tuple[int, int, float, str]:
    if len(toks) != 3:
        raise LineError(
            f"{section} lines have 3 fields (column, column, value), found {len(toks)}",
            toks[-1])
    return _col(toks[0], cols), _col(toks[1], cols), finite(toks[2], "Hessian entry"), toks[1]
