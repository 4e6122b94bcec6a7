"""Read and write model files, choosing the format from the file name.

``.json`` is the JSON model format; everything else (``.mps``, ``.qps``,
``.mps.gz``, ``.qps.gz``, ``.gz`` or any other name) is MPS, whose reader
detects gzip by content.
"""

from __future__ import annotations

import os

from .problem import Problem


def _is_json(path: str) -> bool:
    return path.lower().endswith(".json")


def read_model(path: str | os.PathLike[str]) -> Problem:
    """Read a model file; the name comes from the file (NAME line or file stem)."""
    spath = os.fspath(path)
    if _is_json(spath):
        # imported lazily: the JSON format lives in its own module
        from .jsonmodel import read_json_model

        return read_json_model(spath)
    from .mps import read_mps

    return read_mps(spath)


def write_model(problem: Problem, path: str | os.PathLike[str]) -> None:
    """Write ``problem`` as JSON (``.json``) or free MPS (anything else; gzip if ``.gz``)."""
    spath = os.fspath(path)
    if _is_json(spath):
        from .jsonmodel import write_json_model

        write_json_model(problem, spath)
        return
    from .mps import write_mps

    write_mps(problem, spath)
