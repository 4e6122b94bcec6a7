"""The tree of a run as columns: JSON for small runs, a compact binary layout for big ones.

Binary layout (``application/octet-stream``), all little-endian::

    bytes 0-3   magic "UGT1"
    bytes 4-7   uint32: length M of the meta JSON
    bytes 8-    meta JSON (UTF-8), M bytes
    then        each array at the byte offset the meta gives (a multiple of 8),
                zero padding between

meta: ``{"format": "UGT1", "count": n, "fields": [{"name", "dtype", "offset",
"length"}...], ...}`` plus the run facts the JSON form carries (statuses,
directions, var_names, leaves, sense, live, events). ``dtype`` is one of
int32, uint8, float32, float64, so a browser wraps each array as a typed
array over the same buffer without copying. Unknown values: -1 in integer
fields, NaN in float fields (null in JSON).
"""

from __future__ import annotations

import json
import math
import struct
from typing import Any

import numpy as np

from ..analysis.layout import TreeLayout
from ..analysis.table import RunTable
from ..runlog.codes import DIRECTIONS, STATUSES

__all__ = ["MAGIC", "TREE_FIELDS", "decode_binary", "encode_binary", "encode_json",
           "tree_columns", "tree_meta"]

MAGIC = b"UGT1"
INT32_MAX = 2**31 - 1

# name -> (dtype, meaning); docs/api.md repeats this table.
TREE_FIELDS: dict[str, tuple[str, str]] = {
    "id": ("int32", "node id (float64 when an id exceeds 2^31 - 1)"),
    "parent": ("int32", "row of the parent, -1 for the root"),
    "depth": ("int32", "depth, root 0"),
    "order": ("int32", "processing order, -1 if never solved"),
    "status": ("uint8", "status code: index into meta.statuses"),
    "bound": ("float64", "the node's bound (NaN unknown)"),
    "var": ("int32", "variable of the bound change that created the node, -1 at the root"),
    "dir": ("uint8", "direction of that change: index into meta.directions"),
    "value": ("float64", "value of that change (x <= value down, x >= value up)"),
    "time": ("float32", "seconds since the search started"),
    "incumbent": ("float64", "best incumbent when the node's event was written (NaN none)"),
    "x": ("float32", "layout: horizontal position (leaves 1 apart, parents centred)"),
    "x_min": ("float32", "layout: leftmost leaf position of the subtree"),
    "x_max": ("float32", "layout: rightmost leaf position of the subtree"),
    "subtree_size": ("int32", "nodes in the subtree, the node included"),
}


def _int_column(a: np.ndarray) -> np.ndarray:
    if len(a) and (a.max() > INT32_MAX or a.min() < -INT32_MAX):
        return a.astype("<f8")  # exact up to 2^53
    return a.astype("<i4")


def tree_columns(table: RunTable, layout: TreeLayout) -> dict[str, np.ndarray]:
    c = table.columns
    return {
        "id": _int_column(c["id"]),
        "parent": c["parent_row"].astype("<i4"),
        "depth": c["depth"].astype("<i4"),
        "order": _int_column(c["order"]),
        "status": c["status"].astype("u1"),
        "bound": c["bound"].astype("<f8"),
        "var": c["branch_var"].astype("<i4"),
        "dir": c["branch_dir"].astype("u1"),
        "value": c["branch_value"].astype("<f8"),
        "time": c["time"].astype("<f4"),
        "incumbent": c["incumbent"].astype("<f8"),
        "x": layout.x.astype("<f4"),
        "x_min": layout.x_min.astype("<f4"),
        "x_max": layout.x_max.astype("<f4"),
        "subtree_size": layout.subtree_size.astype("<i4"),
    }


def tree_meta(table: RunTable, layout: TreeLayout, *, run_id: str, live: bool) -> dict[str, Any]:
    """Facts sent with the arrays. ``events``: node, incumbent, progress and end events
    the arrays cover; a live viewer resumes the stream after them (Last-Event-ID = events - 1)."""
    events = len(table) + len(table.incumbents) + len(table.progress) + (table.end is not None)
    return {"run": run_id, "count": len(table), "leaves": layout.leaves,
            "statuses": list(STATUSES), "directions": list(DIRECTIONS),
            "var_names": {str(k): v for k, v in sorted(table.var_names.items())},
            "sense": table.sense, "live": live, "events": int(events)}


def _dtype_name(a: np.ndarray) -> str:
    return {"i4": "int32", "u1": "uint8", "f4": "float32", "f8": "float64"}[a.dtype.str[1:]]


def encode_json(columns: dict[str, np.ndarray], meta: dict[str, Any]) -> bytes:
    out = {**meta, "fields": [{"name": k, "dtype": _dtype_name(a)} for k, a in columns.items()],
           "columns": {}}
    for name, a in columns.items():
        values = a.tolist()
        if a.dtype.kind == "f":
            values = [None if not math.isfinite(v) else v for v in values]
        out["columns"][name] = values
    return json.dumps(out, separators=(",", ":"), allow_nan=False).encode("utf-8")


def _align(n: int) -> int:
    return (n + 7) & ~7


def encode_binary(columns: dict[str, np.ndarray], meta: dict[str, Any]) -> bytes:
    # The offsets are written inside the meta, whose length moves the data: guess where
    # the data starts, and move the start further out until the meta fits before it.
    start = _align(8 + len(json.dumps(meta)) + 96 * len(columns))
    while True:
        fields, offset = [], start
        for name, a in columns.items():
            fields.append({"name": name, "dtype": _dtype_name(a), "offset": offset,
                           "length": int(len(a))})
            offset = _align(offset + a.nbytes)
        text = json.dumps({**meta, "format": "UGT1", "fields": fields},
                          separators=(",", ":"), allow_nan=False).encode("utf-8")
        if 8 + len(text) <= start:
            break
        start = _align(8 + len(text) + 64)
    buf = bytearray(offset)
    buf[0:4] = MAGIC
    buf[4:8] = struct.pack("<I", len(text))
    buf[8: 8 + len(text)] = text
    for f, a in zip(fields, columns.values(), strict=True):
        buf[f["offset"]: f["offset"] + a.nbytes] = a.tobytes()
    return bytes(buf)


def decode_binary(data: bytes) -> tuple[dict[str, Any], dict[str, np.ndarray]]:
    """The reverse of `encode_binary` (for tests and Python clients)."""
    if data[:4] != MAGIC:
        raise ValueError("not a UGT1 tree")
    (size,) = struct.unpack("<I", data[4:8])
    meta = json.loads(data[8: 8 + size])
    dtypes = {"int32": "<i4", "uint8": "u1", "float32": "<f4", "float64": "<f8"}
    arrays = {f["name"]: np.frombuffer(data, dtype=dtypes[f["dtype"]], count=f["length"],
                                       offset=f["offset"]) for f in meta["fields"]}
    return meta, arrays
