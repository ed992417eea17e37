"""Every demo and test spec still gives its pinned results (tests/golden/data, see snapshot.py)."""

from __future__ import annotations

import json

import pytest

from .snapshot import GOLDEN, SPECS, differences, snapshot


@pytest.mark.parametrize("spec", SPECS, ids=[s.stem for s in SPECS])
def test_results_match_the_pinned_snapshot(spec):
    expected = json.loads((GOLDEN / f"{spec.stem}.json").read_text(encoding="utf-8"))
    diffs = differences(expected, json.loads(json.dumps(snapshot(spec))))
    assert not diffs, f"{len(diffs)} differences, first ones:\n" + "\n".join(diffs[:40])


def test_every_spec_has_a_snapshot():
    assert {p.stem for p in GOLDEN.glob("*.json")} == {s.stem for s in SPECS}
