"""The JSON model format ``undergrowth-model``, version 1, for small hand-written models.

See ``docs/model-json.md`` for the format and ``docs/model.schema.json`` for its schema.
The reader validates the parsed object with plain Python once, here at the boundary,
and reports the JSON path of the first problem (``constraints.cap.terms.z``) plus the
line where that key appears.
"""

from __future__ import annotations

import json
import math
import re
from collections.abc import Iterable
from pathlib import Path
from typing import NoReturn

import numpy as np
import scipy.sparse as sp

from .errors import ModelFormatError, ProblemError
from .problem import INTEGER_BOUND_TOLERANCE, Problem

FORMAT = "undergrowth-model"
VERSION = 1  # newest version this reader understands

TOP_KEYS = ("format", "version", "name", "sense", "objective", "offset", "quadratic",
            "variables", "constraints")
VARIABLE_KEYS = ("lower", "upper", "integer", "binary")
CONSTRAINT_KEYS = ("terms", "lower", "upper", "equals")
QUADRATIC_KEYS = ("i", "j", "value")

_POS_INF = ("inf", "+inf")
_NEG_INF = ("-inf",)

Segment = str | int
JsonPath = tuple[Segment, ...]


# ------------------------------------------------------------------ reading
def read_json_model(path: str | Path) -> Problem:
    """Read a JSON model file; raise `ModelFormatError` naming where it is wrong."""
    label = str(path)
    try:
        text = Path(path).read_text(encoding="utf-8-sig")
    except UnicodeDecodeError as exc:
        raise ModelFormatError(f"not UTF-8 text ({exc.reason})", path=label) from None
    except OSError as exc:
        raise ModelFormatError(f"cannot read file: {exc.strerror or exc}", path=label) from None
    return parse_json_model(text, path=label)


def parse_json_model(text: str, *, path: str = "<string>") -> Problem:
    """Parse the text of a JSON model; ``path`` only labels error messages."""
    try:
        data = json.loads(text, object_pairs_hook=_JsonObject, parse_constant=_NonStandard)
    except json.JSONDecodeError as exc:
        snippet = text[exc.pos:exc.pos + 20].split("\n", 1)[0].strip() or None
        raise ModelFormatError(
            f"invalid JSON: {exc.msg} (column {exc.colno})",
            path=path, line=exc.lineno, token=snippet,
        ) from None
    return _Reader(text, path).read(data)


class _JsonObject(dict):
    """A JSON object that remembers keys written twice (plain json keeps the last)."""

    duplicates: list[str]

    def __init__(self, pairs: list[tuple[str, object]]) -> None:
        super().__init__()
        self.duplicates = []
        for key, value in pairs:
            if key in self:
                self.duplicates.append(key)
            self[key] = value


class _NonStandard:
    """Stands for ``NaN``/``Infinity``, which Python's json accepts but JSON does not."""

    def __init__(self, literal: str) -> None:
        self.literal = literal


class _Reader:
    def __init__(self, text: str, path: str) -> None:
        self.text = text
        self.path = path

    # -- reporting
    def fail(self, message: str, where: JsonPath, *, nth: int = 1) -> NoReturn:
        raise ModelFormatError(
            message, path=self.path, line=line_of(self.text, where, nth=nth),
            token=format_path(where) or None,
        )

    # -- typed accessors
    def obj(self, value: object, where: JsonPath, allowed: Iterable[str] | None,
            what: str) -> dict[str, object]:
        if not isinstance(value, dict):
            self.fail(f"expected an object ({what}), got {_kind(value)}", where)
        if isinstance(value, _JsonObject) and value.duplicates:
            key = value.duplicates[0]
            self.fail(f"key {key!r} is written twice", (*where, key), nth=2)
        if allowed is not None:
            allowed = tuple(allowed)
            for key in value:
                if key not in allowed:
                    self.fail(f"unknown key {key!r} in {what}; expected one of "
                              f"{', '.join(allowed)}", (*where, key))
        return value

    def number(self, value: object, where: JsonPath) -> float:
        if isinstance(value, _NonStandard):
            self.fail(f"{value.literal} is not JSON; write a finite number", where)
        if isinstance(value, bool) or not isinstance(value, int | float):
            self.fail(f"expected a number, got {_kind(value)}", where)
        number = float(value)
        if not math.isfinite(number):
            self.fail(f"number {value!r} is out of range", where)
        return number

    def bound(self, value: object, where: JsonPath, *, upper: bool) -> float:
        """A bound: a finite number, ``null`` (infinite on its own side), or "inf"/"-inf"."""
        if value is None:
            return math.inf if upper else -math.inf
        if isinstance(value, str):
            if value in _POS_INF:
                if not upper:
                    self.fail("a lower bound cannot be +inf", where)
                return math.inf
            if value in _NEG_INF:
                if upper:
                    self.fail("an upper bound cannot be -inf", where)
                return -math.inf
            self.fail(f"expected a number, null, \"inf\" or \"-inf\", got {value!r}", where)
        return self.number(value, where)

    def name(self, key: str, where: JsonPath) -> str:
        if not key.strip():
            self.fail("a name must not be empty", where)
        return key

    def flag(self, value: object, where: JsonPath) -> bool:
        if not isinstance(value, bool):
            self.fail(f"expected true or false, got {_kind(value)}", where)
        return value

    def terms(self, value: object, where: JsonPath, columns: dict[str, int],
              what: str) -> list[tuple[int, float]]:
        terms = self.obj(value, where, None, what)
        out = []
        for key, coef in terms.items():
            if key not in columns:
                self.fail(f"unknown variable {key!r} (declare it under \"variables\")",
                          (*where, key))
            out.append((columns[key], self.number(coef, (*where, key))))
        return out

    # -- the document
    def read(self, data: object) -> Problem:
        if not isinstance(data, dict):
            self.fail(f"expected a JSON object at the top, got {_kind(data)}", ())
        if data.get("format") != FORMAT:
            if "format" not in data:
                self.fail(f"missing \"format\": \"{FORMAT}\" (is this a model file?)",
                          ("format",))
            self.fail(f"format is {data['format']!r}, expected {FORMAT!r}", ("format",))
        if "version" not in data:
            self.fail(f"missing \"version\" (this reader understands {VERSION})", ("version",))
        version = data["version"]
        if isinstance(version, bool) or not isinstance(version, int) or version < 1:
            self.fail(f"version must be a positive integer, got {version!r}", ("version",))
        if version > VERSION:
            # checked before unknown keys: a newer file may well use keys we do not know
            self.fail(f"version {version} is newer than this reader supports ({VERSION})",
                      ("version",))
        top = self.obj(data, (), TOP_KEYS, "the model")

        name = top.get("name", "model")
        if not isinstance(name, str):
            self.fail(f"expected a string, got {_kind(name)}", ("name",))
        sense = top.get("sense", "min")
        if sense not in ("min", "max"):
            self.fail(f"sense must be \"min\" or \"max\", got {sense!r}", ("sense",))
        offset = self.number(top.get("offset", 0), ("offset",))

        if "variables" not in top:
            self.fail("missing \"variables\" (an object: name -> bounds)", ("variables",))
        columns, lower, upper, integer = self.variables(top["variables"])
        n = len(columns)

        c = np.zeros(n)
        for j, coef in self.terms(top.get("objective", {}), ("objective",), columns,
                                  "the objective"):
            c[j] += coef
        Q = self.quadratic(top.get("quadratic", []), columns)
        A, row_lower, row_upper, row_names = self.constraints(top.get("constraints", {}),
                                                              columns)
        try:
            return Problem.from_arrays(
                c, A, row_lower=row_lower, row_upper=row_upper, col_lower=lower,
                col_upper=upper, integrality=integer, sense=sense, offset=offset, Q=Q,
                col_names=list(columns), row_names=row_names, name=name or "model",
            )
        except ProblemError as exc:  # checks above should leave nothing, but stay typed
            raise ModelFormatError(str(exc), path=self.path) from None

    def variables(self, value: object) -> tuple[dict[str, int], list[float], list[float],
                                                list[bool]]:
        where: JsonPath = ("variables",)
        spec = self.obj(value, where, None, "the variables")
        columns: dict[str, int] = {}
        lower: list[float] = []
        upper: list[float] = []
        integer: list[bool] = []
        for key, entry in spec.items():
            here = (*where, key)
            self.name(key, here)
            var = self.obj(entry, here, VARIABLE_KEYS, f"variable {key!r}")
            binary = self.flag(var["binary"], (*here, "binary")) if "binary" in var else False
            if binary:
                for other in ("lower", "upper", "integer"):
                    if other in var:
                        self.fail(f"\"binary\": true already means integer 0..1; "
                                  f"drop {other!r}", (*here, other))
                lo, hi, is_int = 0.0, 1.0, True
            else:
                lo = self.bound(var["lower"], (*here, "lower"), upper=False) \
                    if "lower" in var else 0.0
                hi = self.bound(var["upper"], (*here, "upper"), upper=True) \
                    if "upper" in var else math.inf
                is_int = self.flag(var["integer"], (*here, "integer")) \
                    if "integer" in var else False
            if lo > hi:
                self.fail(f"lower bound {lo:g} is above upper bound {hi:g}", here)
            tol = INTEGER_BOUND_TOLERANCE
            bounded = math.isfinite(lo) and math.isfinite(hi)
            if is_int and bounded and math.ceil(lo - tol) > math.floor(hi + tol):
                self.fail(f"integer variable has no integer value between {lo:g} and {hi:g}",
                          here)
            columns[key] = len(columns)
            lower.append(lo)
            upper.append(hi)
            integer.append(is_int)
        return columns, lower, upper, integer

    def quadratic(self, value: object, columns: dict[str, int]) -> sp.csr_matrix | None:
        where: JsonPath = ("quadratic",)
        if not isinstance(value, list):
            self.fail(f"expected a list of {{\"i\", \"j\", \"value\"}} objects, "
                      f"got {_kind(value)}", where)
        rows: list[int] = []
        cols: list[int] = []
        vals: list[float] = []
        seen: dict[tuple[int, int], int] = {}
        for k, entry in enumerate(value):
            here = (*where, k)
            term = self.obj(entry, here, QUADRATIC_KEYS, "a quadratic term")
            ends = []
            for key in ("i", "j"):
                if key not in term:
                    self.fail(f"quadratic term needs \"{key}\"", here)
                var = term[key]
                if not isinstance(var, str):
                    self.fail(f"expected a variable name, got {_kind(var)}", (*here, key))
                if var not in columns:
                    self.fail(f"unknown variable {var!r} (declare it under \"variables\")",
                              (*here, key))
                ends.append(columns[var])
            if "value" not in term:
                self.fail("quadratic term needs \"value\"", here)
            v = self.number(term["value"], (*here, "value"))
            i, j = min(ends), max(ends)
            if (i, j) in seen:
                # (x, y) and (y, x) are the same monomial; a second entry is almost
                # always a symmetric-matrix habit that would double the term
                self.fail(f"the pair ({term['i']}, {term['j']}) is already listed as "
                          f"quadratic[{seen[(i, j)]}]; list each pair once", here)
            seen[(i, j)] = k
            # entry value·x_i·x_j  ->  Q_ij = Q_ji = value (i != j), Q_ii = 2·value,
            # so that ½ xᵀQx reproduces the written monomials exactly
            if i == j:
                rows.append(i)
                cols.append(i)
                vals.append(2.0 * v)
            else:
                rows += [i, j]
                cols += [j, i]
                vals += [v, v]
        if not vals:
            return None
        n = len(columns)
        return sp.csr_matrix((vals, (rows, cols)), shape=(n, n))

    def constraints(self, value: object, columns: dict[str, int]
                    ) -> tuple[sp.csr_matrix, list[float], list[float], list[str]]:
        where: JsonPath = ("constraints",)
        spec = self.obj(value, where, None, "the constraints")
        rows: list[int] = []
        cols: list[int] = []
        vals: list[float] = []
        lower: list[float] = []
        upper: list[float] = []
        names: list[str] = []
        for key, entry in spec.items():
            here = (*where, key)
            self.name(key, here)
            con = self.obj(entry, here, CONSTRAINT_KEYS, f"constraint {key!r}")
            if "terms" not in con:
                self.fail("a constraint needs \"terms\" (an object: variable -> coefficient)",
                          here)
            i = len(names)
            for j, coef in self.terms(con["terms"], (*here, "terms"), columns,
                                      f"the terms of {key!r}"):
                rows.append(i)
                cols.append(j)
                vals.append(coef)
            if "equals" in con:
                for other in ("lower", "upper"):
                    if other in con:
                        self.fail("use either \"equals\" or lower/upper, not both",
                                  (*here, other))
                lo = hi = self.number(con["equals"], (*here, "equals"))
            else:
                lo = self.bound(con["lower"], (*here, "lower"), upper=False) \
                    if "lower" in con else -math.inf
                hi = self.bound(con["upper"], (*here, "upper"), upper=True) \
                    if "upper" in con else math.inf
            if lo > hi:
                self.fail(f"lower bound {lo:g} is above upper bound {hi:g}", here)
            names.append(key)
            lower.append(lo)
            upper.append(hi)
        A = sp.csr_matrix((vals, (rows, cols)), shape=(len(names), len(columns)))
        return A, lower, upper, names


def _kind(value: object) -> str:
    if value is None:
        return "null"
    if isinstance(value, bool):
        return "a boolean"
    if isinstance(value, int | float):
        return "a number"
    if isinstance(value, str):
        return f"the string {value!r}"
    if isinstance(value, list):
        return "a list"
    if isinstance(value, dict):
        return "an object"
    if isinstance(value, _NonStandard):
        return value.literal
    return type(value).__name__


# ------------------------------------------------------------- locations
_SIMPLE_NAME = re.compile(r"[A-Za-z_][A-Za-z0-9_\-]*\Z")


def format_path(where: JsonPath) -> str:
    """``("constraints", "cap", "terms", "z")`` -> ``constraints.cap.terms.z``;
    list indices as ``[k]`` and awkward names as ``["a.b"]``."""
    out = ""
    for seg in where:
        if isinstance(seg, int):
            out += f"[{seg}]"
        elif _SIMPLE_NAME.match(seg):
            out += f".{seg}" if out else seg
        else:
            out += f"[{json.dumps(seg, ensure_ascii=False)}]"
    return out


def line_of(text: str, where: JsonPath, *, nth: int = 1) -> int | None:
    """1-based line of the key at ``where``, found by searching forward for each key in
    turn (and counting list elements). Cheap and usually right; the line of the deepest
    key found, or None, when the text is written in some unusual way. ``nth`` picks a
    later occurrence of the last key (for keys written twice)."""
    pos = 0
    found: int | None = None
    for depth, seg in enumerate(where):
        if isinstance(seg, int):
            at = _element_start(text, pos, seg)
        else:
            repeat = nth if depth == len(where) - 1 else 1
            at = _key_start(text, pos, seg, repeat)
        if at is None:
            break
        pos = found = at
    return None if found is None else text.count("\n", 0, found) + 1


def _key_start(text: str, pos: int, key: str, repeat: int) -> int | None:
    pattern = re.compile(re.escape(json.dumps(key, ensure_ascii=False)) + r"\s*:")
    match = None
    for _ in range(repeat):
        match = pattern.search(text, pos)
        if match is None:
            return None
        pos = match.end()
    return match.start() if match else None


def _element_start(text: str, pos: int, index: int) -> int | None:
    at = text.find("[", pos)
    if at < 0:
        return None
    i, depth, current, n = at + 1, 0, 0, len(text)
    while i < n:
        ch = text[i]
        if depth == 0 and current == index and not ch.isspace():
            return None if ch == "]" else i
        if ch == '"':
            i = _skip_string(text, i)
            continue
        if ch in "[{":
            depth += 1
        elif ch in "]}":
            if depth == 0:
                return None
            depth -= 1
        elif ch == "," and depth == 0:
            current += 1
        i += 1
    return None


def _skip_string(text: str, i: int) -> int:
    j = i + 1
    while j < len(text):
        if text[j] == "\\":
            j += 2
        elif text[j] == '"':
            return j + 1
        else:
            j += 1
    return j


# ------------------------------------------------------------------ writing
def write_json_model(problem: Problem, path: str | Path) -> None:
    """Write ``problem`` in the JSON model format (defaults left out, one entry a line)."""
    Path(path).write_text(json_model_text(problem), encoding="utf-8")


def json_model_text(problem: Problem) -> str:
    """The JSON model text for ``problem``. Names must be distinct to serve as keys."""
    for label, names in (("column", problem.col_names), ("row", problem.row_names)):
        seen: set[str] = set()
        for name in names:
            if name in seen:
                raise ProblemError(f"cannot write JSON: {label} name {name!r} is used twice")
            seen.add(name)
    cols = problem.col_names
    lines = ["{", f'  "format": "{FORMAT}",', f'  "version": {VERSION},',
             f'  "name": {_dump(problem.name)},', f'  "sense": "{problem.sense}",']
    objective = {cols[j]: _num(problem.c[j]) for j in np.flatnonzero(problem.c)}
    lines.append(f'  "objective": {_dump(objective)},')
    if problem.offset:
        lines.append(f'  "offset": {_dump(_num(problem.offset))},')
    if problem.Q is not None:
        upper = sp.triu(problem.Q).tocoo()
        order = np.lexsort((upper.col, upper.row))
        entries = []
        for k in order:
            i, j, q = int(upper.row[k]), int(upper.col[k]), float(upper.data[k])
            value = q / 2.0 if i == j else q  # back to the monomial coefficient
            entries.append({"i": cols[i], "j": cols[j], "value": _num(value)})
        lines += _block("quadratic", [_dump(e) for e in entries], "[]")

    variables = []
    for j, name in enumerate(cols):
        lo, hi = float(problem.col_lower[j]), float(problem.col_upper[j])
        spec: dict[str, object] = {}
        if problem.integrality[j] and lo == 0 and hi == 1:
            spec["binary"] = True
        else:
            if lo != 0:
                spec["lower"] = _bound(lo)
            if hi != math.inf:
                spec["upper"] = _bound(hi)
            if problem.integrality[j]:
                spec["integer"] = True
        variables.append(f"{_dump(name)}: {_dump(spec)}")
    lines += _block("variables", variables, "{}")

    A = problem.A.tocsr()
    constraints = []
    for i, name in enumerate(problem.row_names):
        lo, hi = float(problem.row_lower[i]), float(problem.row_upper[i])
        start, end = A.indptr[i], A.indptr[i + 1]
        terms = {cols[j]: _num(v) for j, v in zip(A.indices[start:end], A.data[start:end],
                                                    strict=True)}
        spec = {"terms": terms}
        if lo == hi:
            spec["equals"] = _num(lo)
        else:
            if lo != -math.inf:
                spec["lower"] = _bound(lo)
            if hi != math.inf:
                spec["upper"] = _bound(hi)
        constraints.append(f"{_dump(name)}: {_dump(spec)}")
    lines += _block("constraints", constraints, "{}")
    lines[-1] = lines[-1].rstrip(",")
    lines.append("}")
    return "\n".join(lines) + "\n"


def _block(key: str, items: list[str], brackets: str) -> list[str]:
    open_, close = brackets
    if not items:
        return [f'  "{key}": {open_}{close},']
    body = [f"    {item}," for item in items]
    body[-1] = body[-1].rstrip(",")
    return [f'  "{key}": {open_}', *body, f"  {close},"]


def _dump(value: object) -> str:
    return json.dumps(value, ensure_ascii=False, separators=(", ", ": "))


def _num(x: float) -> int | float:
    """Integral values as JSON integers (``4`` rather than ``4.0``); others exactly."""
    x = float(x)
    return int(x) if x.is_integer() and abs(x) < 2**53 else x


def _bound(x: float) -> int | float | str:
    if x == math.inf:
        return "inf"
    if x == -math.inf:
        return "-inf"
    return _num(x)
