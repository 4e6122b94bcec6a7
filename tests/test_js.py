"""The web front end's pure helpers, tested with Node's own test runner.

Run here so that the README's single test command covers them too.
"""

from __future__ import annotations

import shutil
import subprocess
from pathlib import Path

import pytest

JS_TESTS = Path(__file__).resolve().parent / "js"


@pytest.mark.skipif(shutil.which("node") is None, reason="node is not installed")
def test_node_test_suite_passes():
    files = sorted(str(p) for p in JS_TESTS.glob("*.test.mjs"))
    assert files, "no JavaScript tests found"
    proc = subprocess.run(["node", "--test", *files], capture_output=True, text=True,
                          timeout=300)
    assert proc.returncode == 0, proc.stdout[-4000:] + proc.stderr[-2000:]
    assert "# fail 0" in proc.stdout
