"""Record your own branch-and-bound search: ``from undergrowth.record import Recorder``."""

from .runlog.recorder import Recorder

__all__ = ["Recorder"]
