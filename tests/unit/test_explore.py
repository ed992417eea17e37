"""The design-space search against an exhaustive enumeration done here, one full pipeline run
per combination of the small invented library in tests/data/explore (DEMO DATA).

The reference is independent of the search's bounds, batching and branch and bound: every
combination of the library's parts is written into the requirements as fixed parts and built
by ``docgen.pipeline.run`` on its own; a design is feasible when no check fails, and its cost
is the sum of its parts' library prices (a bridge of discrete diodes counts four diodes:
common practice, one per arm).
"""

from __future__ import annotations

import itertools
from dataclasses import replace
from pathlib import Path

import pytest

from docgen.errors import InfeasibleDesign
from docgen.explore.search import best_loaded, search
from docgen.parts.library import load_library
from docgen.pipeline import run
from docgen.spec import load_requirements

DATA = Path(__file__).resolve().parents[1] / "data" / "explore"
SPEC = DATA / "explore-demo.toml"


def _with_parts(spec, transformer, rectifier, capacitor, reg):
    return spec.model_copy(update={
        "transformer": spec.transformer.model_copy(update={"part": transformer}),
        "rectifier": spec.rectifier.model_copy(update={"part": rectifier}),
        "reservoir": spec.reservoir.model_copy(update={"part": capacitor}),
        "output": [spec.output[0].model_copy(update={
            "linear": spec.output[0].linear.model_copy(update={"part": reg})})],
    })


def _cost(design, library) -> float:
    total = 0.0
    for line in design.parts:
        if not line.part_id:
            continue
        part = library.get(line.part_id)
        qty = 4 if part.kind == "diode" else 1  # a bridge topology: four diodes
        total += (part.price or 0.0) * qty
    return total


@pytest.fixture(scope="module")
def exhaustive():
    """(cost, combination) of every feasible combination, built one by one."""
    loaded = load_requirements(SPEC)
    lib = load_library(DATA / "explore-parts.toml")
    out = []
    for combo in itertools.product([p.id for p in lib.transformers],
                                   [p.id for p in lib.bridges + lib.diodes],
                                   [p.id for p in lib.capacitors],
                                   [p.id for p in lib.regulators]):
        spec = _with_parts(loaded.requirements, *combo)
        try:
            design = run(replace(loaded, requirements=spec), samples=0)
        except InfeasibleDesign:
            continue
        if design.status != "fail":
            out.append((round(_cost(design, lib), 6), combo))
    return sorted(out)


@pytest.fixture(scope="module")
def result():
    return search(load_requirements(SPEC), exhaustive=True)


def test_exhaustive_reference_is_not_trivial(exhaustive):
    # the cheapest part of every kind together is not a working design here, so the search
    # has to find the best combination, not just take the cheapest parts
    assert exhaustive, "the test library must hold a feasible design"
    lib = load_library(DATA / "explore-parts.toml")
    cheapest = tuple(min(ps, key=lambda p: p.price).id for ps in (
        lib.transformers, lib.bridges + lib.diodes, lib.capacitors, lib.regulators))
    assert cheapest not in [c for _, c in exhaustive]


def test_search_finds_the_exhaustive_best(exhaustive, result):
    best_cost, _ = exhaustive[0]
    assert result.best is not None
    assert result.best.cost == pytest.approx(best_cost, abs=1e-9)
    best_combos = {c for cost, c in exhaustive if abs(cost - best_cost) < 1e-9}
    chosen = tuple(result.best.cand.part_id(a) for a in
                   ("transformer", "rectifier", "capacitor", "regulator"))
    assert chosen in best_combos


def test_search_feasible_set_matches_exhaustive(exhaustive, result):
    # with the cost bound off every combination that passes the hand bounds is verified; the
    # ones the hand bounds removed (the 16 V capacitor) must all be infeasible when built
    assert result.bounded_out == 6
    found = {tuple(v.cand.part_id(a) for a in ("transformer", "rectifier", "capacitor",
                                               "regulator")) for v in result.feasible}
    assert found == {c for _, c in exhaustive}


def test_branch_and_bound_gives_the_same_best(exhaustive):
    bounded = search(load_requirements(SPEC))
    assert bounded.best.cost == pytest.approx(exhaustive[0][0], abs=1e-9)
    assert len(bounded.verdicts) <= bounded.candidates


def test_search_succeeds_where_greedy_sizing_does_not(result):
    # at 200 mA the stage-by-stage sizing asks for more capacitance than the library holds,
    # while a combination with a stiffer transformer works
    assert result.greedy is None
    assert result.greedy_status == "infeasible"
    assert result.best is not None and result.best.feasible


def test_greedy_never_better_than_search():
    loaded = load_requirements(SPEC)
    out = loaded.requirements.output[0].model_copy(update={"load_max": 0.15})
    loaded = replace(loaded, requirements=loaded.requirements.model_copy(update={
        "output": [out]}))
    res = search(loaded)
    greedy = res.greedy
    assert greedy is not None and greedy.greedy
    assert res.greedy_status in ("pass", "warn") and greedy.feasible
    assert res.best.cost <= greedy.cost + 1e-12
    assert res.verdicts[0] is greedy  # verified first, so the bound starts from it
    # Batched verification gives the pipeline's own figures: the greedy design built alone
    # (its own engine calls) has the same checks with the same values and verdicts.
    alone = {c.id: c for c in run(loaded, samples=0).checks}
    batched = {c.id: c for c in greedy.checks}
    assert set(alone) == set(batched)
    for cid, c in alone.items():
        assert batched[cid].value == pytest.approx(c.value, rel=1e-6, abs=1e-12), cid
        assert batched[cid].status == c.status, cid


def test_sensitivity_moves_the_best_cost_the_right_way():
    from docgen.explore.sensitivity import sensitivity

    steps = {(s.what, s.step): s for s in sensitivity(load_requirements(SPEC), budget=200)}
    assert len(steps) == 6
    base = search(load_requirements(SPEC)).best.cost
    # relaxing a requirement never makes the best design dearer; tightening never cheaper
    # (every design that meets the tighter requirement meets the looser one)
    for relaxed in (("ripple limit", "+20 %"), ("hottest ambient", "-10 K"),
                    ("load current", "-10 %")):
        assert steps[relaxed].best_cost <= base + 1e-9
    for tightened in (("ripple limit", "-20 %"), ("hottest ambient", "+10 K"),
                      ("load current", "+10 %")):
        cost = steps[tightened].best_cost
        assert cost != cost or cost >= base - 1e-9  # nan: nothing passes


def test_budget_stops_with_a_note():
    small = search(load_requirements(SPEC), exhaustive=True, budget=3, batch=2)
    assert small.budget_reached
    assert len(small.verdicts) == 3


def test_best_design_monte_carlo_yield_reported(result):
    design = run(best_loaded(load_requirements(SPEC), result))
    assert design.status in ("pass", "warn")
    mc = design.monte_carlo
    assert mc["samples"] == 200
    assert 0.0 <= mc["yield"] <= 1.0


def test_pareto_front_is_the_non_dominated_set():
    # reference: a point is on the front when no other point is at least as good on both
    # objectives and better on one (the definition, checked pairwise here)
    import random
    from types import SimpleNamespace

    from docgen.explore.objectives import pareto

    rng = random.Random(3)
    pts = [SimpleNamespace(cost=rng.randint(1, 12), dissipation=rng.randint(1, 12),
                           cap_life=float("nan"), hold_up=rng.random(), cand=None)
           for _ in range(60)]

    def dominated(p, by):
        return (by.cost <= p.cost and by.dissipation <= p.dissipation
                and (by.cost < p.cost or by.dissipation < p.dissipation))

    expected = {id(p) for p in pts if not any(dominated(p, q) for q in pts)}
    front = pareto(pts)
    # equal points keep one representative each
    assert {(p.cost, p.dissipation) for p in front} == {
        (p.cost, p.dissipation) for p in pts if id(p) in expected}
    assert [p.cost for p in front] == sorted(p.cost for p in front)
