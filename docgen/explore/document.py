"""The design a search chose, as a Design for the document: built by the pipeline with the
chosen parts written in, then stating that it was searched, over how many candidates and why
this one (``assume.search``), and naming the search as the reason for each searched part."""

from __future__ import annotations

import math
from dataclasses import replace

from ..design import Design
from ..pipeline import run
from ..spec import LoadedSpec
from ..trace import Assumption
from .objectives import value
from .search import SearchResult, best_loaded, search
from .text import front_points, space_sentence, why_sentence

SEARCHED_REFS = {"T1", "BR1", "D1", "C1", "DZ1", "Q1", "U1"}


def searched_design(loaded: LoadedSpec, result: SearchResult) -> Design:
    """The full design (Monte Carlo and all) of the search's best candidate, annotated."""
    design = run(best_loaded(loaded, result))
    lib = design.library
    currency = currency_of(loaded)
    summary = space_sentence(result) + " " + why_sentence(result, currency)
    design.assumptions.append(Assumption(
        "assume.search",
        "The parts of this design were chosen by a search of the approved-parts library, not "
        "by stage-by-stage sizing. " + summary,
        "docgen design-space search" + (f" over {lib[0]}" if lib else "")))
    design.search_tradeoff = tradeoff_data(result, currency)
    chosen = {pid for _, pid in result.best.cand.choice}
    design.parts = [
        replace(p, origin="library",
                reason=f"chosen by the design-space search ({result.objective} objective): "
                       "part of the best combination that passes every check")
        if p.ref in SEARCHED_REFS and p.part_id in chosen else p
        for p in design.parts]
    return design


def currency_of(loaded: LoadedSpec) -> str:
    from ..parts.location import library_for

    lib = library_for(loaded)
    return getattr(lib.info, "currency", "") if lib is not None else ""


def best_design(loaded: LoadedSpec) -> Design:
    """Search with the cost objective, then build the best: `docgen build --design best`."""
    return searched_design(loaded, search(loaded))


def tradeoff_data(result: SearchResult, currency: str, versus: str = "dissipation") -> dict:
    """The points of the trade-off figure (cost against ``versus``): every feasible candidate,
    the Pareto front, the greedy and the chosen design, and the candidates that failed a check;
    numbers only (render/explore_plot.py draws them)."""
    pts, front = front_points(result, "cost", versus)

    def xy(v):
        return (value(v, "cost"), value(v, versus))

    greedy = result.greedy
    return {"points": pts, "front": front,
            "greedy": xy(greedy) if greedy is not None and greedy.feasible else None,
            "chosen": xy(result.best) if result.best is not None else None,
            "infeasible": [xy(v) for v in result.verdicts
                           if not v.feasible and all(math.isfinite(t) for t in xy(v))],
            "y": versus, "currency": currency}
