"""Raw lines of a plain or gzip-compressed file, tolerant of a cut-off end.

Gzip is recognised by its magic bytes, not by the file name. The gzip stream is
decoded with zlib directly (not `gzip.GzipFile`) so that a stream cut short
still yields every byte that was flushed before the cut, and so that a cut
(`truncated`) can be told apart from damage (`corrupt`).
"""

from __future__ import annotations

import zlib
from collections.abc import Iterator
from typing import Any

GZIP_MAGIC = b"\x1f\x8b"
_READ_BYTES = 1 << 20
_INFLATE_BYTES = 1 << 16  # compressed bytes fed to zlib at a time


def is_gzip(path: str) -> bool:
    with open(path, "rb") as f:
        return f.read(2) == GZIP_MAGIC


class LineSource:
    """Iterate ``(line_number, line_bytes, terminated)`` over a file's lines.

    ``terminated`` is False only for a last line without a newline. After the
    iteration, ``truncated`` says a gzip stream ended before its end marker and
    ``corrupt`` holds zlib's complaint if the compressed data is damaged (the
    iteration stops there, without the damaged partial line).
    """

    def __init__(self, path: str, *, salvage: bool = True) -> None:
        self.path = path
        self.salvage = salvage  # recover the output decoded just before damage
        self.compressed = is_gzip(path)
        self.truncated = False
        self.corrupt: str | None = None

    def __iter__(self) -> Iterator[tuple[int, bytes, bool]]:
        if not self.compressed:
            with open(self.path, "rb", buffering=_READ_BYTES) as f:
                for lineno, raw in enumerate(f, 1):
                    yield lineno, raw, raw.endswith(b"\n")
            return
        lineno = 0
        carry = b""
        # Inflating on a second thread was measured slower: the GIL hand-over between
        # the zlib thread and the parsing loop costs more than the overlap gains.
        for chunk in self._inflate():
            pieces = chunk.split(b"\n")
            pieces[0] = carry + pieces[0]
            carry = pieces.pop()
            for piece in pieces:
                lineno += 1
                yield lineno, piece, True
        if carry and self.corrupt is None:
            yield lineno + 1, carry, False

    def _inflate(self) -> Iterator[bytes]:
        with open(self.path, "rb") as f:
            d = zlib.decompressobj(wbits=31)
            member_open = False  # bytes of the current gzip member have been fed in
            buf = b""
            while True:
                if not buf:
                    buf = f.read(_INFLATE_BYTES)
                    if not buf:
                        break
                member_open = True
                backup = d.copy()
                try:
                    out = d.decompress(buf)
                except zlib.error as exc:
                    if self.salvage:
                        yield b"".join(_salvage(backup, buf))
                    self.corrupt = str(exc)
                    return
                if out:
                    yield out
                if not d.eof:
                    buf = b""
                    continue
                # One member finished: what follows is another member, zero padding or junk.
                member_open = False
                buf = d.unused_data or f.read(_INFLATE_BYTES)
                if not buf:
                    return
                if buf[:1] == b"\0":
                    rest = buf + f.read()
                    if rest.strip(b"\0"):
                        self.corrupt = "unexpected bytes after the end of the gzip stream"
                    return
                if not GZIP_MAGIC.startswith(buf[:2]):
                    self.corrupt = "unexpected bytes after the end of the gzip stream"
                    return
                d = zlib.decompressobj(wbits=31)
            if member_open:
                tail = d.flush()
                if tail:
                    yield tail
                self.truncated = True


def _salvage(d: Any, data: bytes) -> Iterator[bytes]:
    """Output of ``data`` fed to decompressor ``d`` up to the byte where zlib fails."""
    for at in range(0, len(data), 512):
        step = data[at : at + 512]
        backup = d.copy()
        try:
            out = d.decompress(step)
        except zlib.error:
            d = backup
            for i in range(len(step)):  # narrow it down to the byte
                try:
                    out = d.decompress(step[i : i + 1])
                except zlib.error:
                    return
                if out:
                    yield out
            return
        if out:
            yield out


def gzip_problem(path: str) -> str | None:
    """zlib's complaint about a gzip file, "truncated", or None if it decodes cleanly."""
    source = LineSource(path, salvage=False)
    for _ in source._inflate():
        pass
    if source.corrupt is not None:
        return source.corrupt
    return "truncated" if source.truncated else None
