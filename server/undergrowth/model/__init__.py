"""Models: the `Problem`, its file readers and writers, and formulation checks."""

from .errors import ModelFormatError, ProblemError
from .problem import Problem

__all__ = ["ModelFormatError", "Problem", "ProblemError", "read_model", "write_model"]


def read_model(path: str) -> Problem:
    """Read a model file: MPS or quadratic MPS (``.mps``, ``.qps``, ``.mps.gz``, …)
    or the JSON model format (``.json``)."""
    from .io import read_model as _read

    return _read(path)


def write_model(problem: Problem, path: str) -> None:
    """Write ``problem`` as free MPS (or JSON when ``path`` ends in ``.json``)."""
    from .io import write_model as _write

    _write(problem, path)
