"""Live streaming under load: does watching a solve slow it down?

Starts `undergrowth serve` on 127.0.0.1 (a free port) with a private runs
directory, then runs the same solve

1. with nobody watching, and
2. with N viewers on its event stream plus one deliberately slow viewer (it
   reads a few KiB every few milliseconds, falls behind, is told to resync,
   and reconnects with Last-Event-ID as the protocol asks),

and prints the solve's nodes per second in both cases (the search's own
clock, from its end event), the server process's peak memory, each viewer's
lag behind the first viewer to receive the same event, and whether every
viewer, the slow one included, got every event exactly once.

    python benchmarks/stream_load.py [--viewers 20] [--repeat 2]
        [--model project-selection] [--branching first-index] [--select depth-first]
"""

from __future__ import annotations

import argparse
import bisect
import json
import os
import re
import shutil
import socket
import statistics
import subprocess
import sys
import tempfile
import threading
import time
import urllib.request
from dataclasses import dataclass, field
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "server"))


# ------------------------------------------------------------------ the server
def start_server(tmp: Path, *, viewer_buffer: int) -> tuple[subprocess.Popen, str]:
    cmd = [sys.executable, "-m", "undergrowth", "serve", "--port", "0",
           "--runs", str(tmp / "runs"), "--models", str(tmp / "models"),
           "--cache", str(tmp / "cache"), "--samples", "none",
           "--viewer-buffer", str(viewer_buffer)]
    proc = subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=subprocess.STDOUT, text=True)
    assert proc.stdout is not None
    line = proc.stdout.readline()
    match = re.search(r"http://([^/\s]+)/", line)
    if not match:
        proc.kill()
        raise SystemExit(f"the server did not start: {line}{proc.stdout.read()}")
    # keep draining its output so it never blocks on a full pipe
    threading.Thread(target=proc.stdout.read, daemon=True).start()
    base = f"http://{match.group(1)}"
    for _ in range(100):
        try:
            get_json(base, "/api/health")
            return proc, base
        except OSError:
            time.sleep(0.05)
    raise SystemExit("the server never answered /api/health")


def peak_rss_mb(pid: int) -> float:
    for line in Path(f"/proc/{pid}/status").read_text().splitlines():
        if line.startswith("VmHWM:"):
            return int(line.split()[1]) / 1024
    return float("nan")


def get_json(base: str, path: str) -> object:
    with urllib.request.urlopen(base + path, timeout=30) as r:
        return json.loads(r.read())


def post_json(base: str, path: str, body: dict) -> dict:
    req = urllib.request.Request(base + path, data=json.dumps(body).encode(),
                                 headers={"Content-Type": "application/json"}, method="POST")
    with urllib.request.urlopen(req, timeout=30) as r:
        return json.loads(r.read())


# ------------------------------------------------------------------ viewers
@dataclass
class Viewer:
    """One SSE client on a raw socket (HTTP/1.0: the body ends when the stream does)."""

    host: str
    port: int
    run_id: str
    chunk: int = 65536
    pause: float = 0.0  # seconds between reads: > 0 makes a slow viewer
    arrivals: list[tuple[float, int]] = field(default_factory=list)  # (time, last id)
    received: int = 0
    duplicates: int = 0
    resyncs: int = 0
    end_status: str | None = None
    error: str | None = None

    def run(self) -> None:
        last = -1
        try:
            while self.end_status is None:
                last = self._one_connection(last)
        except Exception as exc:  # noqa: BLE001 - reported in the figures
            self.error = repr(exc)

    def _one_connection(self, last: int) -> int:
        sock = socket.create_connection((self.host, self.port))
        if self.pause:  # a small window, so the kernel cannot soak up the whole stream
            sock.setsockopt(socket.SOL_SOCKET, socket.SO_RCVBUF, 65536)
        request = (f"GET /api/runs/{self.run_id}/stream HTTP/1.0\r\nHost: 127.0.0.1\r\n"
                   f"Last-Event-ID: {last}\r\n\r\n")
        sock.sendall(request.encode())
        buf = b""
        head_done = False
        try:
            while True:
                data = sock.recv(self.chunk)
                if not data:
                    return last
                buf += data
                if not head_done:
                    if b"\r\n\r\n" not in buf:
                        continue
                    head, buf = buf.split(b"\r\n\r\n", 1)
                    if b" 200 " not in head.split(b"\r\n", 1)[0]:
                        raise RuntimeError(head.decode(errors="replace"))
                    head_done = True
                *messages, buf = buf.split(b"\n\n")
                now = time.monotonic()
                for message in messages:
                    last = self._take(message, last, now)
                    if self.end_status is not None or message.startswith(b"event: resync"):
                        return last
                if self.pause:
                    time.sleep(self.pause)
        finally:
            sock.close()

    def _take(self, message: bytes, last: int, now: float) -> int:
        if message.startswith(b"id: "):
            first_line, _, rest = message.partition(b"\n")
            ident = int(first_line[4:])
            if rest.startswith(b"event: batch"):
                if ident <= last:
                    self.duplicates += 1
                self.received += ident - last
                self.arrivals.append((now, ident))
                return ident
        elif message.startswith(b"event: resync"):
            self.resyncs += 1
        elif message.startswith(b"event: end"):
            data = json.loads(message.split(b"data: ", 1)[1])
            self.end_status = data["status"]
        return last


def lags(viewers: list[Viewer]) -> list[float]:
    """Each viewer's worst delay behind the first viewer that received the same event."""
    first: dict[int, float] = {}
    for v in viewers:
        for t, ident in v.arrivals:
            first[ident] = min(first.get(ident, t), t)
    idents = sorted(first)
    # earliest time any viewer had received event k or a later one
    earliest = [first[i] for i in idents]
    for i in range(len(earliest) - 2, -1, -1):
        earliest[i] = min(earliest[i], earliest[i + 1])
    out = []
    for v in viewers:
        worst = 0.0
        for t, ident in v.arrivals:
            k = bisect.bisect_left(idents, ident)
            worst = max(worst, t - earliest[k])
        out.append(worst)
    return out


# ------------------------------------------------------------------ one solve
def solve(base: str, request: dict, *, viewers: int, slow: bool) -> dict:
    host, port = base[len("http://"):].rsplit(":", 1)
    run_id = post_json(base, "/api/solves", request)["run_id"]
    crowd = [Viewer(host, int(port), run_id) for _ in range(viewers)]
    if slow:
        crowd.append(Viewer(host, int(port), run_id, chunk=8192, pause=0.03))
    threads = [threading.Thread(target=v.run, daemon=True) for v in crowd]
    for t in threads:
        t.start()
    while True:
        job = get_json(base, f"/api/solves/{run_id}")
        if job["state"] not in ("queued", "running"):
            break
        time.sleep(0.05)
    for t in threads:
        t.join(timeout=300)
    detail = get_json(base, f"/api/runs/{run_id}")
    s = detail["summary"]
    return {"run_id": run_id, "nodes": s["nodes"], "seconds": s["seconds"],
            "rate": s["nodes"] / s["seconds"], "viewers": crowd, "state": job["state"]}


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--viewers", type=int, default=20)
    ap.add_argument("--repeat", type=int, default=2)
    ap.add_argument("--model", default="project-selection")
    ap.add_argument("--branching", default="first-index")
    ap.add_argument("--select", default="depth-first")
    ap.add_argument("--viewer-buffer", type=int, default=2000,
                    help="server's --viewer-buffer (small, so the slow viewer must resync)")
    args = ap.parse_args()

    from undergrowth import samples
    from undergrowth.model import write_model
    from undergrowth.runlog import read_run

    tmp = Path(tempfile.mkdtemp(prefix="undergrowth-stream-load-"))
    (tmp / "models").mkdir()
    write_model(samples.all_models()[args.model], str(tmp / "models" / f"{args.model}.mps"))
    load = os.getloadavg()
    proc, base = start_server(tmp, viewer_buffer=args.viewer_buffer)
    request = {"model": args.model, "branching": args.branching, "select": args.select}
    try:
        quiet, loud = [], []
        for _ in range(args.repeat):  # interleaved, so drift on a shared machine hits both
            quiet.append(solve(base, request, viewers=0, slow=False))
            loud.append(solve(base, request, viewers=args.viewers, slow=True))
        peak = peak_rss_mb(proc.pid)
        for result in loud:  # every viewer got every event exactly once?
            events = len(read_run(tmp / "runs" / f"{result['run_id']}.jsonl.gz").events)
            result["events"] = events
    finally:
        proc.terminate()
        proc.wait(timeout=20)
        shutil.rmtree(tmp, ignore_errors=True)

    q = statistics.median(r["rate"] for r in quiet)
    lo = statistics.median(r["rate"] for r in loud)
    print(f"solve: {args.model} ({args.branching}, {args.select}), "
          f"{quiet[0]['nodes']} nodes; {os.cpu_count()} CPU(s); median of {args.repeat}")
    def rates(results: list[dict]) -> str:
        return ", ".join(f"{r['rate']:.0f}" for r in results)

    print(f"  nodes/s, nobody watching    {q:10.0f}   ({rates(quiet)})")
    print(f"  nodes/s, {args.viewers} viewers + 1 slow {lo:8.0f}   ({rates(loud)})")
    pairs = ", ".join(f"{b['rate'] / a['rate']:.2f}" for a, b in zip(quiet, loud, strict=True))
    print(f"  ratio                       {lo / q:10.2f}   (target >= 0.8; run by run: {pairs})")
    print(f"  machine load average        {load[0]:.1f} before, {os.getloadavg()[0]:.1f} after "
          "(other work on the machine moves these figures)")
    print(f"  (server run with --viewer-buffer {args.viewer_buffer}; the slow viewer reads "
          "8 KiB every 30 ms through a 64 KiB socket buffer)")
    print(f"  server peak memory (VmHWM)  {peak:8.1f} MB")
    for i, r in enumerate(loud):
        crowd = r["viewers"]
        slow_v = crowd[-1]
        lag = lags(crowd)
        complete = all(v.received == r["events"] and v.duplicates == 0 and v.error is None
                       for v in crowd)
        print(f"  loaded run {i + 1}: {r['events']} events; fast viewers' worst lag "
              f"{max(lag[:-1]):.2f} s (median {statistics.median(lag[:-1]):.2f} s); slow viewer "
              f"lag {lag[-1]:.2f} s after {slow_v.resyncs} resync(s); every viewer got every "
              f"event exactly once: {complete}")
        for v in crowd:
            if v.error:
                print(f"    viewer error: {v.error}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
