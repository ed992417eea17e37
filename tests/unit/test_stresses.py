"""The verified figure of a stress: the worst over the corners and the Monte Carlo samples, and
the initial estimate shown beside it with the difference (closed forms in the test)."""

from __future__ import annotations

import math
from types import SimpleNamespace

import numpy as np

from docgen.trace import Ledger
from docgen.verify.evaluate import worse_sample
from docgen.verify.stresses import pairs


def _cr(corners, samples, converged=None):
    metrics = {"p": np.array(corners + samples, dtype=float)}
    n = len(corners)
    return SimpleNamespace(
        samples=object() if samples else None, metrics=metrics, n_corners=n,
        converged=np.array(converged if converged is not None
                           else [True] * (n + len(samples))),
        sample_metric=lambda name: metrics[name][n:])


def test_a_sample_worse_than_every_corner_is_the_verified_figure():
    cr = _cr([1.0, 2.0], [1.5, 2.5, math.nan])
    assert worse_sample(cr, "p", "max", 2.0, "hot") == (2.5, "Monte Carlo sample 2 of 3")
    assert worse_sample(cr, "p", "min", 1.0, "cold") == (1.0, "cold")


def test_an_unconverged_sample_is_never_the_verified_figure():
    cr = _cr([1.0, 2.0], [9.0, 1.5], converged=[True, True, False, True])
    assert worse_sample(cr, "p", "max", 2.0, "hot") == (2.0, "hot")


def test_without_samples_the_worst_corner_stands():
    assert worse_sample(_cr([1.0], []), "p", "max", 1.0, "c") == (1.0, "c")


def test_initial_estimate_paired_with_its_verified_figure_and_difference():
    L = Ledger()
    L.given("zener.p", "P", 0.8, "W", "Zener dissipation, initial estimate")
    L.given("engine.zener_power", "P", 1.0, "W", "Zener dissipation (engine)")
    L.given("neg.zener.p", "P", 0.5, "W", "Zener dissipation, initial estimate")
    L.given("neg.engine.zener_power", "P", 0.4, "W", "Zener dissipation (engine)")
    L.given("zener.r_p", "P", 1.0, "W", "Resistor dissipation, no engine figure")
    got = pairs(L.values)
    assert set(got) == {"zener.p", "neg.zener.p"}
    assert got["zener.p"]["verified_id"] == "engine.zener_power"
    assert math.isclose(got["zener.p"]["difference"], (1.0 - 0.8) / 0.8)
    assert got["neg.zener.p"]["verified_id"] == "neg.engine.zener_power"
    assert math.isclose(got["neg.zener.p"]["difference"], (0.4 - 0.5) / 0.5)
