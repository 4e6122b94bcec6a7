"""Documentation that must not drift from the code."""

from __future__ import annotations

from pathlib import Path

from undergrowth.search import settings_table

ROOT = Path(__file__).resolve().parent.parent


def test_every_search_setting_is_documented_with_its_default():
    text = (ROOT / "DEVELOPERS.md").read_text()
    for name, default, help_text in settings_table():
        assert f"| `{name}` | `{default}` | {help_text} |" in text, name


def test_readme_states_the_two_commands():
    text = (ROOT / "README.md").read_text()
    assert "undergrowth serve" in text
    assert "python -m pytest" in text
    ci = (ROOT / ".ci" / "run").read_text()
    assert "python -m pytest" in ci
