"""The published JSON Schema is current and says what the contract says."""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest

from test_runlog_roundtrip import header, sample_events
from undergrowth.cli import main
from undergrowth.commands.schema import render
from undergrowth.runlog.schema import json_schema

DOCS = Path(__file__).resolve().parents[1] / "docs"


def test_docs_schema_file_is_current():
    # Regenerate with: undergrowth schema -o docs/run-log.schema.json
    assert (DOCS / "run-log.schema.json").read_text(encoding="utf-8") == render()


def test_schema_command_prints_the_schema(capsys):
    assert main(["schema"]) == 0
    assert json.loads(capsys.readouterr().out) == json_schema()


def test_one_line_schema_told_apart_by_kind():
    schema = json_schema()
    assert schema["discriminator"]["propertyName"] == "kind"
    kinds = set(schema["discriminator"]["mapping"])
    assert kinds == {"header", "node", "incumbent", "progress", "end", "note"}
    node = schema["$defs"]["NodeEvent"]
    # the contract's node fields (docs/events-contract.md), all required
    assert set(node["required"]) == {
        "kind", "id", "parent", "depth", "order", "time", "branch", "lp", "bound",
        "fractional", "status", "branching", "message"}  # fmt: skip
    assert node["additionalProperties"] is True  # unknown fields are allowed
    statuses = node["properties"]["status"]["enum"]
    assert statuses == ["branched", "integral", "pruned", "infeasible", "discarded", "open",
                        "failed"]  # fmt: skip


def test_sample_lines_validate_against_the_schema():
    jsonschema = pytest.importorskip("jsonschema")
    full = {"kind": "header", "format": "undergrowth-run", "version": 1, **header()}
    for line in [full, *sample_events()]:
        jsonschema.validate(line, json_schema())


def test_writer_does_not_import_pydantic_or_numpy():
    # The engine imports only the writer: keep it on the standard library.
    code = (
        "import sys, undergrowth.runlog.writer, undergrowth.runlog;"
        "bad = [m for m in sys.modules if m.split('.')[0] in "
        "('pydantic', 'pydantic_core', 'numpy', 'fastapi', 'asyncio')];"
        "print(','.join(bad))"
    )
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == ""
