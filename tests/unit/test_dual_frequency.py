"""A product that must run from two mains frequencies is verified at both.

The parts are sized at the lower frequency (the larger ripple, [SEDRA-SMITH] V_r = I / (f_r C));
the corners then cover both frequencies, because a transformer's leakage reactance
2 pi f L_s grows with frequency (common practice), so some figures are worse at the higher one.
The demo spec specs/meter-backup-halfwave.toml (50 Hz and 60 Hz, invented scenario) is one: its
lowest zener current and headroom come from 60 Hz corners, which a 50 Hz-only run never sees.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pytest

from docgen.pipeline import run
from docgen.regulators import regulator
from docgen.spec import load_requirements
from docgen.verify.corners import sample_points

from .test_corners_cautions import corner_ledger

ROOT = Path(__file__).resolve().parents[2]


@pytest.fixture(scope="module")
def design():
    return run(load_requirements(ROOT / "specs" / "meter-backup-halfwave.toml"), samples=0)


def test_corner_set_holds_both_frequencies(design):
    spec = design.requirements.mains
    assert {spec.frequency, spec.also_frequency} == {50.0, 60.0}
    freqs = [row["freq"] for row in design.corners]
    assert set(freqs) == {50.0, 60.0} and freqs.count(50.0) == freqs.count(60.0)
    names = {row["name"] for row in design.corners}
    for row in design.corners:
        assert row["name"].endswith(f", {row['freq']:g} Hz")
        twin = row["name"][: -len("60 Hz")] + ("60 Hz" if row["freq"] == 50.0 else "50 Hz")
        assert twin in names


def test_worst_figure_taken_from_the_frequency_where_it_is_worst(design):
    rows = design.corners
    # the lowest zener current: a "min" check, worst at 60 Hz in this design
    check = next(c for c in design.checks if c.id == "check.zener_current")
    at = {f: min(r["i_z_min"] for r in rows if r["freq"] == f) for f in (50.0, 60.0)}
    assert at[60.0] < at[50.0]
    assert check.corner.endswith("60 Hz")
    assert check.value == pytest.approx(at[60.0], rel=1e-12)
    # and a figure worst at the lower frequency is taken from there: the largest ripple
    ripple = {f: max(r["ripple_pp"] for r in rows if r["freq"] == f) for f in (50.0, 60.0)}
    assert ripple[50.0] > ripple[60.0]


def test_document_says_both_frequencies_are_verified(design):
    text = next(a.text for a in design.assumptions if a.id == "assume.dual_frequency")
    assert "50 Hz and 60 Hz" in text and "sized at 50 Hz" in text
    assert "simulated at both frequencies" in text


def test_single_frequency_designs_say_nothing_of_a_second_one():
    d = run(load_requirements(ROOT / "specs" / "us-controller-5v-120v.toml"), samples=0)
    assert {row["freq"] for row in d.corners} == {d.requirements.mains.frequency}
    assert not any(a.id == "assume.dual_frequency" for a in d.assumptions)
    assert not any(row["name"].endswith(" Hz") for row in d.corners)


def test_monte_carlo_samples_draw_both_frequencies():
    L = corner_ledger()
    L.given("mains.freq_given", "", 50.0, "Hz", "")
    L.given("mains.freq_also", "", 60.0, "Hz", "")
    pts = sample_points(L, 400, seed=3, t_min=0.0, t_max=40.0, reg=regulator("zener"))
    assert set(np.unique(pts.freq)) == {50.0, 60.0}
    # the rectifier junction sits at each sample's ambient
    assert pts.t_d.min() >= 0.0 and pts.t_d.max() <= 40.0 and np.ptp(pts.t_d) > 30.0
