"""Run and model ids: a strict pattern, so an id can only ever name a file inside
its directory (no slash, no leading dot, nothing to decode)."""

from __future__ import annotations

import os
import re
from pathlib import Path

from ..paths import slug
from .errors import BadRequest

__all__ = ["ID_PATTERN", "MODEL_SUFFIXES", "RUN_SUFFIXES", "check_id", "fresh_id", "split_name"]

ID_PATTERN = r"[A-Za-z0-9][A-Za-z0-9._-]{0,150}"
_ID = re.compile(ID_PATTERN)
MAX_ID = 151

# Longest suffix first, so "x.jsonl.gz" is never read as "x.jsonl" + ".gz".
RUN_SUFFIXES = (".jsonl.gz", ".jsonl", ".csv")
MODEL_SUFFIXES = (".mps.gz", ".qps.gz", ".mps", ".qps", ".json")


def check_id(value: str, *, what: str = "run") -> str:
    """``value`` if it is a valid id, else 400 naming the rule."""
    if not isinstance(value, str) or _ID.fullmatch(value) is None:
        raise BadRequest(
            f"{what} id {value!r} is not valid: ids are 1 to {MAX_ID} letters, digits, dots, "
            "dashes or underscores, starting with a letter or digit",
            code="invalid-id", detail={"id": str(value), "pattern": ID_PATTERN})
    return value


def split_name(name: str, suffixes: tuple[str, ...]) -> tuple[str, str] | None:
    """(id, suffix) of a file name whose suffix is one of ``suffixes`` (case-insensitive)
    and whose stem is a valid id; None otherwise."""
    low = name.lower()
    for suffix in suffixes:
        if low.endswith(suffix):
            stem = name[: -len(suffix)]
            if _ID.fullmatch(stem):
                return stem, suffix
            return None
    return None


def id_from_filename(filename: str, suffixes: tuple[str, ...]) -> tuple[str, str] | None:
    """A clean (id, suffix) from an uploaded file's name: only its last path part counts,
    odd characters become dashes; None if the suffix is not one of ``suffixes``."""
    base = os.path.basename(filename.replace("\\", "/")).strip()
    low = base.lower()
    for suffix in suffixes:
        if low.endswith(suffix):
            stem = slug(base[: -len(suffix)])[: MAX_ID - 10].strip("-.") or "upload"
            if not stem[0].isalnum():
                stem = "x" + stem
            return stem, suffix
    return None


def fresh_id(base: str, taken: set[str]) -> str:
    """``base``, or ``base-2``, ``base-3``... whichever is free."""
    base = base[: MAX_ID - 8]
    candidate, k = base, 2
    while candidate in taken:
        candidate = f"{base}-{k}"
        k += 1
    return candidate


def inside(directory: Path, name: str) -> Path:
    """``directory / name``, checked to stay inside ``directory`` (belt and braces)."""
    path = (directory / name).resolve()
    if path.parent != directory.resolve():
        raise BadRequest(f"{name!r} does not name a file in its directory", code="invalid-id")
    return path
