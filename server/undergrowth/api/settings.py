"""Server settings: one table (name, default, help, flag) feeds the dataclass,
`undergrowth serve --help` and docs/api.md (a test checks all three agree).

Paths left at None are derived from the writable runs directory when the app
starts (`ApiSettings.resolved`), so the defaults follow ``$UNDERGROWTH_RUNS``.
"""

from __future__ import annotations

import ipaddress
import re
from dataclasses import dataclass, field, fields, replace
from pathlib import Path
from typing import Any

from ..paths import SAMPLE_RUNS, user_runs_dir

__all__ = ["DEFAULT_PORT", "ApiSettings", "is_loopback", "settings_table"]

# 8765: unassigned by IANA, easy to remember, clear of the usual 8000/8080 dev ports.
DEFAULT_PORT = 8765
WORKER_STARTS = ("forkserver", "spawn")
_TOKEN = re.compile(r"[A-Za-z0-9._~+/=-]{8,512}")


def _s(flag: str, help: str, *, metavar: str | None = None) -> dict[str, Any]:
    return {"flag": flag, "help": help, "metavar": metavar}


@dataclass(frozen=True, kw_only=True)
class ApiSettings:
    """How the server runs. Build with keywords; `resolved` fills in derived paths."""

    host: str = field(default="127.0.0.1", metadata=_s(
        "--host", "address to bind; anything but loopback needs --token or --no-token",
        metavar="HOST"))
    port: int = field(default=DEFAULT_PORT, metadata=_s(
        "--port", "port to listen on", metavar="PORT"))
    runs_dir: Path | None = field(default=None, metadata=_s(
        "--runs", "writable runs directory: uploads and solves go here (default: "
        "$UNDERGROWTH_RUNS, else ~/.local/share/undergrowth/runs)", metavar="DIR"))
    samples_dir: Path | None = field(default=SAMPLE_RUNS, metadata=_s(
        "--samples", "read-only runs directory served beside the writable one (default: the "
        "bundled sample_runs/; 'none' leaves it out)", metavar="DIR"))
    models_dir: Path | None = field(default=None, metadata=_s(
        "--models", "writable models directory (default: 'models' beside the runs directory)",
        metavar="DIR"))
    cache_dir: Path | None = field(default=None, metadata=_s(
        "--cache", "where table and layout caches go (default: 'cache' beside the runs "
        "directory)", metavar="DIR"))
    read_only: bool = field(default=False, metadata=_s(
        "--read-only", "serve runs but refuse uploads, solves, cancels and deletes (403)"))
    token: str | None = field(default=None, metadata=_s(
        "--token", "access token: required as 'Authorization: Bearer TOKEN' or the cookie "
        "set by the sign-in link printed at start", metavar="TOKEN"))
    no_token: bool = field(default=False, metadata=_s(
        "--no-token", "allow binding to a non-loopback address without a token (prints a "
        "warning)"))
    open_browser: bool = field(default=False, metadata=_s(
        "--open", "open the inspector in a web browser once the server is up"))
    allowed_hosts: tuple[str, ...] | None = field(default=None, metadata=_s(
        "--allowed-host", "Host header value to accept (repeatable); default: localhost "
        "names when bound to loopback without a token (a DNS-rebinding guard), else any",
        metavar="NAME"))
    max_solves: int = field(default=1, metadata=_s(
        "--max-solves", "solves running at once; the rest wait in a queue", metavar="K"))
    max_queued: int = field(default=16, metadata=_s(
        "--max-queued", "solves waiting at most; more are refused (503)", metavar="N"))
    node_limit_cap: int = field(default=1_000_000, metadata=_s(
        "--node-limit-cap", "largest node limit a solve may ask for (also the limit when it "
        "asks for none)", metavar="N"))
    time_limit_cap: float = field(default=3600.0, metadata=_s(
        "--time-limit-cap", "largest time limit in seconds a solve may ask for (also the "
        "limit when it asks for none)", metavar="SECONDS"))
    upload_limit_mb: float = field(default=256.0, metadata=_s(
        "--upload-limit-mb", "largest request body accepted, in MiB (uploads above it get 413)",
        metavar="MB"))
    stream_interval: float = field(default=0.1, metadata=_s(
        "--stream-interval", "seconds between live batches sent to one viewer",
        metavar="SECONDS"))
    live_buffer_events: int = field(default=50_000, metadata=_s(
        "--live-buffer", "recent events of each live run kept in memory for viewers that "
        "join late (older ones are read from the file)", metavar="N"))
    viewer_buffer_events: int = field(default=10_000, metadata=_s(
        "--viewer-buffer", "events a live viewer may fall behind before it is told to "
        "resync", metavar="N"))
    tree_json_nodes: int = field(default=50_000, metadata=_s(
        "--tree-json-nodes", "trees up to this many nodes come as JSON when no format is "
        "asked for; larger ones in the binary layout", metavar="N"))
    worker_start: str = field(default="forkserver", metadata=_s(
        "--worker-start", "how solve worker processes start: forkserver or spawn",
        metavar="METHOD"))

    def __post_init__(self) -> None:
        checks = (
            ("port", 0 <= self.port <= 65535, "must be in 0..65535"),
            ("max_solves", self.max_solves >= 1, "must be at least 1"),
            ("max_queued", self.max_queued >= 0, "must be non-negative"),
            ("node_limit_cap", self.node_limit_cap >= 1, "must be at least 1"),
            ("time_limit_cap", self.time_limit_cap > 0, "must be positive"),
            ("upload_limit_mb", self.upload_limit_mb > 0, "must be positive"),
            ("stream_interval", self.stream_interval >= 0, "must be non-negative"),
            ("live_buffer_events", self.live_buffer_events >= 1, "must be at least 1"),
            ("viewer_buffer_events", self.viewer_buffer_events >= 1, "must be at least 1"),
            ("tree_json_nodes", self.tree_json_nodes >= 0, "must be non-negative"),
            ("worker_start", self.worker_start in WORKER_STARTS,
             f"must be one of {', '.join(WORKER_STARTS)}"),
        )
        for name, ok, message in checks:
            if not ok:
                raise ValueError(f"{name}: {message}, got {getattr(self, name)!r}")
        if self.token is not None and not _TOKEN.fullmatch(self.token):
            raise ValueError("token: use 8 or more letters, digits or -._~+/= characters "
                             "(it travels in a header and a cookie)")

    # ------------------------------------------------------------ derived
    @property
    def upload_limit_bytes(self) -> int:
        return int(self.upload_limit_mb * 1024 * 1024)

    def resolved(self) -> ApiSettings:
        """A copy with every directory filled in (absolute)."""
        runs = Path(self.runs_dir or user_runs_dir()).expanduser().resolve()
        return replace(
            self,
            runs_dir=runs,
            samples_dir=None if self.samples_dir is None
            else Path(self.samples_dir).expanduser().resolve(),
            models_dir=Path(self.models_dir or runs.parent / "models").expanduser().resolve(),
            cache_dir=Path(self.cache_dir or runs.parent / "cache").expanduser().resolve(),
        )

    def host_allowed(self, host_header: str) -> bool:
        """Is a request's Host header acceptable (the DNS-rebinding guard)?"""
        name = _host_name(host_header)
        if self.allowed_hosts is not None:
            return "*" in self.allowed_hosts or name in {h.lower() for h in self.allowed_hosts}
        if self.token is not None or not is_loopback(self.host):
            return True
        return name in ("localhost", "127.0.0.1", "::1") or name.endswith(".localhost")

    def check_exposure(self) -> str | None:
        """Refuse a non-loopback bind without a token; returns a warning for --no-token."""
        if is_loopback(self.host) or self.token is not None:
            return None
        if not self.no_token:
            raise ValueError(
                f"host: binding to {self.host} exposes the server beyond this machine; "
                "give --token TOKEN (or --no-token to accept the risk)")
        return (f"warning: serving on {self.host} without an access token: anyone who can "
                "reach this address can read runs and start solves")


def _host_name(host_header: str) -> str:
    h = host_header.strip().lower()
    if h.startswith("["):  # [::1]:8765
        return h[1:].split("]", 1)[0]
    return h.rsplit(":", 1)[0] if h.count(":") == 1 else h


def is_loopback(host: str) -> bool:
    if host.lower() == "localhost":
        return True
    try:
        return ipaddress.ip_address(host.strip("[]")).is_loopback
    except ValueError:
        return False


def settings_table() -> list[tuple[str, object, str, str]]:
    """(name, default, help, flag) for every setting, in declaration order."""
    return [(f.name, f.default, f.metadata["help"], f.metadata["flag"])
            for f in fields(ApiSettings)]


def setting_fields() -> list[Any]:
    """The dataclass fields themselves (the serve command builds its flags from them)."""
    return list(fields(ApiSettings))
