"""The API against its own OpenAPI schema (schemathesis): no 500, and every response
(status, content type, body) is what the schema says."""

from __future__ import annotations

import atexit
import shutil
import tempfile
from pathlib import Path

import schemathesis
from hypothesis import HealthCheck, settings
from schemathesis import checks

from test_api_support import settings_for
from undergrowth.api import create_app

_TMP = Path(tempfile.mkdtemp(prefix="undergrowth-schema-"))
atexit.register(shutil.rmtree, _TMP, ignore_errors=True)
# Small caps: should the generator ever name a real model, its solve ends at once.
app = create_app(settings_for(_TMP, allowed_hosts=("testserver", "localhost"),
                              node_limit_cap=20, time_limit_cap=5))
schema = schemathesis.openapi.from_asgi("/openapi.json", app)

CHECKS = [checks.not_a_server_error, checks.status_code_conformance,
          checks.content_type_conformance, checks.response_schema_conformance]


@schema.parametrize()
@settings(max_examples=6, deadline=None, derandomize=True,
          suppress_health_check=list(HealthCheck))
def test_every_operation_conforms_to_the_schema(case):
    case.call_and_validate(checks=CHECKS)
