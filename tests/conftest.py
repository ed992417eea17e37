"""Shared fixtures: paths to the demo and test specs, and one built demo document per session."""

from __future__ import annotations

import os
from pathlib import Path

import pytest
from hypothesis import settings

# Property tests draw the same examples on every run (CI passes or fails on the code, not on
# luck); HYPOTHESIS_PROFILE=explore draws new ones. The wide search is bench/robustness.py.
settings.register_profile("ci", derandomize=True, database=None, print_blob=True)
settings.register_profile("explore", derandomize=False)
settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "ci"))

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "specs" / "hydroponic-sensor-hub.toml"
DATA = ROOT / "tests" / "data"


def standalone(text: str) -> str:
    """A spec's text without its [parts] section, for copies written outside the repository
    (the library path is relative to the spec and would not resolve there)."""
    out, skip = [], False
    for line in text.splitlines():
        stripped = line.strip()
        if stripped.startswith("["):
            skip = stripped == "[parts]"
        if not skip:
            out.append(line)
    return "\n".join(out) + "\n"


DEMO_STANDALONE = standalone(DEMO.read_text())


@pytest.fixture(scope="session")
def demo_build(tmp_path_factory):
    """Build the demo spec once (HTML, PDF, results.json) for the end-to-end tests."""
    from docgen.jobs.build import build_one

    out = tmp_path_factory.mktemp("out")
    return build_one(DEMO, out, pdf=True)
