"""The model library: model files in the samples' ``models/`` folder (read-only) and
the writable models directory, each summarised once per file version."""

from __future__ import annotations

import os
import threading
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from ..model import ProblemError, read_model
from .errors import Invalid, NotFound
from .ids import MODEL_SUFFIXES, check_id, split_name

__all__ = ["ModelFile", "ModelLibrary", "validate_model_file"]


@dataclass(frozen=True)
class ModelFile:
    id: str
    source: str  # "samples" or "user"
    path: Path
    suffix: str

    def stamp(self) -> tuple[int, int] | None:
        try:
            st = self.path.stat()
        except OSError:
            return None
        return st.st_size, st.st_mtime_ns


def validate_model_file(path: Path, *, shown_as: str) -> dict[str, Any]:
    """Read and check a model file; its report (the `undergrowth model --json` figures).
    A bad file raises 422 naming the line and token; ``shown_as`` replaces the path."""
    from ..commands.model import model_report
    from ..model.errors import ModelFormatError

    try:
        problem = read_model(str(path))
    except ModelFormatError as exc:
        where = f"{shown_as}" + (f", line {exc.line}" if exc.line is not None else "") + (
            f", token {exc.token!r}" if exc.token is not None else "")
        raise Invalid(f"{where}: {exc.reason}", code="invalid-model",
                      detail={"file": shown_as, "line": exc.line, "token": exc.token}) from None
    except ProblemError as exc:
        message = str(exc).replace(str(path), shown_as)
        raise Invalid(f"{shown_as}: {message}", code="invalid-model",
                      detail={"file": shown_as, "line": None, "token": None}) from None
    except (OSError, UnicodeDecodeError, EOFError) as exc:
        raise Invalid(f"{shown_as}: cannot be read as a model ({exc})", code="invalid-model",
                      detail={"file": shown_as, "line": None, "token": None}) from None
    return model_report(problem, file=shown_as)


class ModelLibrary:
    def __init__(self, *, samples_dir: Path | None, models_dir: Path) -> None:
        self.dirs: list[tuple[str, Path]] = []
        if samples_dir is not None:
            self.dirs.append(("samples", samples_dir / "models"))
        self.dirs.append(("user", models_dir))
        self.models_dir = models_dir
        self._reports: dict[str, tuple[tuple[int, int], dict[str, Any]]] = {}
        self._lock = threading.Lock()

    def scan(self) -> list[ModelFile]:
        seen: dict[str, ModelFile] = {}
        for source, directory in self.dirs:
            try:
                names = sorted(os.listdir(directory))
            except OSError:
                continue
            for name in names:
                parts = split_name(name, MODEL_SUFFIXES)
                if parts is not None and (directory / name).is_file():
                    seen.setdefault(parts[0], ModelFile(parts[0], source, directory / name,
                                                        parts[1]))
        return list(seen.values())

    def find(self, model_id: str) -> ModelFile | None:
        check_id(model_id, what="model")
        for source, directory in self.dirs:
            for suffix in MODEL_SUFFIXES:
                path = directory / f"{model_id}{suffix}"
                if path.is_file():
                    return ModelFile(model_id, source, path, suffix)
        return None

    def require(self, model_id: str) -> ModelFile:
        mf = self.find(model_id)
        if mf is None:
            raise NotFound(f"no model {model_id!r}", detail={"id": model_id})
        return mf

    def report(self, mf: ModelFile) -> dict[str, Any]:
        """The model's report (blocking; memoised per file version). 422 if unreadable."""
        stamp = mf.stamp()
        with self._lock:
            memo = self._reports.get(str(mf.path))
        if memo is not None and memo[0] == stamp:
            return memo[1]
        report = validate_model_file(mf.path, shown_as=mf.path.name)
        if stamp is not None:
            with self._lock:
                self._reports[str(mf.path)] = (stamp, report)
        return report

    def place(self, tmp: Path, model_id: str, suffix: str) -> ModelFile:
        target = self.models_dir / f"{model_id}{suffix}"
        fd = os.open(target, os.O_CREAT | os.O_EXCL | os.O_WRONLY, 0o644)  # reserve the name
        os.close(fd)
        os.replace(tmp, target)
        return ModelFile(model_id, "user", target, suffix)
