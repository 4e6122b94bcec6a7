"""The front end's static files: plotly.js from the installed package, pre-compressed."""

from __future__ import annotations

import re
from pathlib import Path

from test_api_support import client_for
from undergrowth.api.static import plotly_path


def test_plotly_is_sent_compressed_once_and_equal_to_the_package_file(tmp_path: Path) -> None:
    client = client_for(tmp_path)
    path = plotly_path()
    assert path is not None  # plotly is a dependency
    original = path.read_bytes()

    zipped = client.get("/vendor/plotly.min.js", headers={"Accept-Encoding": "gzip"})
    assert zipped.status_code == 200
    assert zipped.headers["content-encoding"] == "gzip"
    assert zipped.headers["content-type"].startswith("text/javascript")
    assert "Accept-Encoding" in zipped.headers["vary"]
    assert zipped.content == original  # httpx undoes the gzip: the bytes are the package's
    wire = int(zipped.headers["content-length"])
    assert wire < len(original) / 3  # 4.8 MB -> 1.47 MB at level 9 (measured with plotly 6)

    again = client.get("/vendor/plotly.min.js", headers={"Accept-Encoding": "gzip"})
    assert int(again.headers["content-length"]) == wire  # the same memoised body

    plain = client.get("/vendor/plotly.min.js", headers={"Accept-Encoding": "identity"})
    assert plain.status_code == 200
    assert "content-encoding" not in plain.headers
    assert plain.content == original


def test_the_interactive_api_page_loads_nothing_from_outside(tmp_path: Path) -> None:
    client = client_for(tmp_path)
    page = client.get("/docs")
    assert page.status_code == 200
    assert "http://" not in page.text and "https://" not in page.text
    links = re.findall(r'(?:src|href)="([^"]+)"', page.text)
    assert sorted(links) == ["/icon.svg", "/vendor/swagger/swagger-ui-bundle.js",
                             "/vendor/swagger/swagger-ui.css"]
    for link in links:
        assert client.get(link).status_code == 200, link
    assert "/openapi.json" in page.text
    assert client.get("/vendor/swagger/../../secret").status_code == 404
