"""What every route needs: settings, run and model libraries, jobs, the live bus."""

from __future__ import annotations

import contextlib
import threading
from collections import OrderedDict
from dataclasses import dataclass, field
from pathlib import Path
from typing import Annotated

from fastapi import Depends, Request

from .bus import LiveBus
from .jobs import JobManager
from .library import RunFile, RunLibrary
from .model_files import ModelLibrary
from .nodeinfo import NodeExtras, load_extras
from .settings import ApiSettings

__all__ = ["Ctx", "ServerContext", "get_context"]

EXTRAS_MEMO = 2


@dataclass(eq=False)
class ServerContext:
    settings: ApiSettings
    library: RunLibrary
    models: ModelLibrary
    jobs: JobManager
    bus: LiveBus
    _extras: OrderedDict[tuple[str, int, int], NodeExtras] = field(default_factory=OrderedDict)
    _lock: threading.Lock = field(default_factory=threading.Lock)

    @classmethod
    def build(cls, settings: ApiSettings) -> ServerContext:
        """``settings`` must be resolved (every directory filled in)."""
        assert settings.runs_dir is not None and settings.cache_dir is not None
        assert settings.models_dir is not None
        if not settings.read_only:
            for d in (settings.runs_dir, settings.models_dir):
                d.mkdir(parents=True, exist_ok=True)
        with contextlib.suppress(OSError):
            settings.cache_dir.mkdir(parents=True, exist_ok=True)
        bus = LiveBus(capacity=settings.live_buffer_events)
        jobs = JobManager(runs_dir=settings.runs_dir, bus=bus, max_running=settings.max_solves,
                          max_queued=settings.max_queued, start_method=settings.worker_start,
                          read_only=settings.read_only)
        library = RunLibrary(samples_dir=settings.samples_dir, runs_dir=settings.runs_dir,
                             cache_dir=settings.cache_dir, is_live=jobs.is_active)
        models = ModelLibrary(samples_dir=settings.samples_dir, models_dir=settings.models_dir)
        return cls(settings=settings, library=library, models=models, jobs=jobs, bus=bus)

    @property
    def runs_dir(self) -> Path:
        assert self.settings.runs_dir is not None
        return self.settings.runs_dir

    def extras(self, rf: RunFile) -> NodeExtras:
        """The node fields the table lacks (blocking; memoised per file version)."""
        if self.library.live(rf):
            return load_extras(str(rf.path), cache_file=None)
        stamp = rf.stamp() or (0, 0)
        key = (str(rf.path), *stamp)
        with self._lock:
            hit = self._extras.get(key)
        if hit is not None:
            return hit
        extras = load_extras(str(rf.path), cache_file=self.library.cache_file(rf, ".nodes.npz"))
        with self._lock:
            self._extras[key] = extras
            while len(self._extras) > EXTRAS_MEMO:
                self._extras.popitem(last=False)
        return extras


def get_context(request: Request) -> ServerContext:
    return request.app.state.undergrowth


Ctx = Annotated[ServerContext, Depends(get_context)]  # a route's parameter type
