"""A run's events as JSON text, by index, from a file that may still be growing.

Event *i* is the *i*-th non-blank line after the header (0-based): the same
numbering the live bus uses, because the worker writes every event it
publishes as exactly one line. The reader keeps its place, so a live viewer
reads on from where it stopped when the writer flushes more (the writer
flushes every second, gzip with a sync flush, so complete lines appear).

A last line without its newline is held back until more arrives; once the
file is known to be final it counts if it is complete JSON (some producers
omit the final newline). A CSV node table is converted to events on the fly.
"""

from __future__ import annotations

import json
import zlib
from collections import deque
from collections.abc import Iterator
from pathlib import Path
from typing import Any

__all__ = ["EventFile"]

_READ = 1 << 18
_GZIP_MAGIC = b"\x1f\x8b"


class EventFile:
    """Sequential reader of one run file's events (not thread-safe: one owner)."""

    def __init__(self, path: Path) -> None:
        self.path = Path(path)
        self.index = 0  # index of the next event `read` returns
        self.damaged: str | None = None  # zlib's complaint, if the gzip data is bad
        self._csv = self.path.name.lower().endswith((".csv", ".csv.gz"))
        self._csv_events: Iterator[dict[str, Any]] | None = None
        self._f: Any = None
        self._gzip: bool | None = None
        self._inflate: Any = None
        self._carry = b""
        self._lines: deque[bytes] = deque()
        self._header_seen = False
        self._eof = False

    # ---------------------------------------------------------------- public
    def read(self, max_events: int, *, final: bool = False, max_bytes: int = 1 << 20
             ) -> list[str]:
        """Up to ``max_events`` further events (fewer when the file has no more yet).
        ``final``: the file will not grow again."""
        if self._csv:
            return self._read_csv(max_events)
        out: list[str] = []
        size = 0
        while len(out) < max_events and size < max_bytes:
            if not self._lines and not self._fill(final=final):
                break
            while self._lines and len(out) < max_events and size < max_bytes:
                line = self._lines.popleft()
                text = line.decode("utf-8", errors="replace")
                out.append(text)
                size += len(line)
        self.index += len(out)
        return out

    def skip_to(self, index: int, *, final: bool = False) -> int:
        """Read and drop events until the next one is ``index`` (or the data ends);
        returns the index reached."""
        while self.index < index:
            if not self.read(min(index - self.index, 10_000), final=final):
                break
        return self.index

    def close(self) -> None:
        if self._f is not None:
            self._f.close()
            self._f = None

    def __enter__(self) -> EventFile:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()

    # ---------------------------------------------------------------- JSON lines
    def _fill(self, *, final: bool) -> bool:
        """Decode more complete lines into the queue; False when nothing more is there."""
        while not self._lines:
            if self._f is None:
                try:
                    self._f = open(self.path, "rb")  # noqa: SIM115 - closed in close()
                except FileNotFoundError:
                    return False
            chunk = self._f.read(_READ)
            if not chunk:
                if final and self._carry.strip():
                    self._take_unterminated()
                    return bool(self._lines)
                return False
            if self._gzip is None:
                if len(chunk) < 2 and not final:
                    # too short to tell gzip from text yet: come back later
                    self._f.seek(0)
                    return False
                self._gzip = chunk[:2] == _GZIP_MAGIC
                if self._gzip:
                    self._inflate = zlib.decompressobj(wbits=31)
            data = self._decompress(chunk) if self._gzip else chunk
            self._split(data)
        return True

    def _decompress(self, chunk: bytes) -> bytes:
        if self.damaged is not None:
            return b""
        out = []
        while chunk:
            try:
                out.append(self._inflate.decompress(chunk))
            except zlib.error as exc:
                self.damaged = str(exc)
                break
            if not self._inflate.eof:
                break
            # One gzip member ended: another may follow (or padding, which ends the data).
            chunk = self._inflate.unused_data
            if not chunk or not _GZIP_MAGIC.startswith(chunk[:2]):
                break
            self._inflate = zlib.decompressobj(wbits=31)
        return b"".join(out)

    def _split(self, data: bytes) -> None:
        if not data:
            return
        pieces = (self._carry + data).split(b"\n")
        self._carry = pieces.pop()
        for piece in pieces:
            self._take(piece)

    def _take(self, raw: bytes) -> None:
        line = raw.rstrip(b"\r")
        if not line.strip():
            return
        if not self._header_seen:
            self._header_seen = True  # the first line is the header, not an event
            return
        self._lines.append(line)

    def _take_unterminated(self) -> None:
        raw, self._carry = self._carry, b""
        try:
            json.loads(raw)
        except ValueError:
            return  # cut off mid-line by a crash: not an event
        self._take(raw)

    # ---------------------------------------------------------------- CSV
    def _read_csv(self, max_events: int) -> list[str]:
        from ..runlog.csvtable import iter_csv_events
        from ..runlog.writer import encode_event

        if self._csv_events is None:
            pairs = iter_csv_events(self.path, lenient=True)
            next(pairs, None)  # the header
            self._csv_events = (event for _, event in pairs)
        out = []
        for event in self._csv_events:
            out.append(encode_event(event))
            if len(out) >= max_events:
                break
        self.index += len(out)
        return out
