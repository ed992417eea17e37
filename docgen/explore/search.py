"""The search: greedy design first, then every candidate that passes the hand bounds, verified
in batches in order of its least possible cost, and ranked by the objective.

With the cost objective the search stops where the least possible cost of the next candidate
(the price of its searched parts alone) is above the best verified cost: no candidate left can
be cheaper (branch and bound). ``exhaustive`` turns that off, for a full trade-off view.
"""

from __future__ import annotations

import math
from collections import Counter
from dataclasses import dataclass, field, replace

from ..errors import DocgenError, InfeasibleDesign, SpecError, SpecIssue
from ..parts.location import library_for
from ..pipeline import run
from ..progress import stage
from ..regulators import regulator
from ..spec import LoadedSpec
from . import DEFAULT_BUDGET, space
from .batch import Verdict, verify
from .bounds import lower_cost, prune
from .objectives import OBJECTIVES, rank_key

# candidates per engine call (the switch-on run costs about the same for 2 or 128 points)
BATCH = 64


@dataclass
class SearchResult:
    spec_path: str
    objective: str
    axes: list[tuple[str, int]]  # (block, parts in the library for it)
    space_size: int  # every combination of the library's parts
    bound_parts: Counter  # parts removed by a single-part bound, by reason
    bound_combos: Counter  # combinations removed by a pair bound, by reason
    candidates: int  # combinations left after the bounds (and the greedy design)
    verdicts: list[Verdict]  # every candidate verified, greedy first
    bounded_out: int = 0  # combinations the hand bounds ruled out
    skipped_by_cost: int = 0  # left unverified: cannot be cheaper than the best found
    budget: int = DEFAULT_BUDGET
    budget_reached: bool = False
    greedy_status: str = ""  # of `docgen build`'s own design ("infeasible" when none)
    greedy_reason: str = ""
    notes: list[str] = field(default_factory=list)

    @property
    def feasible(self) -> list[Verdict]:
        return sorted((v for v in self.verdicts if v.feasible),
                      key=lambda v: rank_key(v, self.objective))

    @property
    def best(self) -> Verdict | None:
        f = self.feasible
        return f[0] if f else None

    @property
    def greedy(self) -> Verdict | None:
        return next((v for v in self.verdicts if v.greedy), None)


def _library(loaded: LoadedSpec):
    spec = loaded.requirements
    if spec.rectifier.topology == "split":
        raise SpecError(str(loaded.path), [SpecIssue(
            "rectifier.topology", "the design-space search handles single-rail supplies; "
            "expected \"bridge\", \"center-tap\" or \"half-wave\", got \"split\"")])
    library = library_for(loaded)
    if library is None:
        raise SpecError(str(loaded.path), [SpecIssue(
            "parts.library", "the design-space search needs an approved-parts library; "
            "expected a file name here")])
    return library


def greedy_candidate(loaded: LoadedSpec, free: list[space.Axis]) -> tuple:
    """The parts `docgen build` picks, as a candidate; (candidate or None, status, reason)."""
    try:
        design = run(loaded, samples=0)
    except InfeasibleDesign as exc:
        return None, "infeasible", str(exc)
    by_ref = {p.ref: p.part_id for p in design.parts}
    choice = []
    for axis in free:
        ref = axis.ref
        if ref == "RECT":
            ref = next((r for r in ("BR1", "D1") if r in by_ref), "")
        if not by_ref.get(ref):
            return None, design.status, f"{axis.name} is not a library part in the greedy design"
        choice.append((axis.name, by_ref[ref]))
    return space.Candidate(tuple(choice)), design.status, ""


def search(loaded: LoadedSpec, *, objective: str = "cost", budget: int = DEFAULT_BUDGET,
           exhaustive: bool = False, batch: int = BATCH, greedy: bool = True) -> SearchResult:
    """Search the parts library for the best design of ``loaded`` by ``objective``.

    ``greedy`` also builds `docgen build`'s own design and verifies it first (its cost then
    bounds the search from the start); the sensitivity runs leave it out."""
    if objective not in OBJECTIVES:
        raise ValueError(f"objective must be one of {', '.join(OBJECTIVES)}")
    library = _library(loaded)
    spec = loaded.requirements
    topo = spec.rectifier.topology
    reg = regulator(spec.output[0].regulator)
    free = space.axes(spec, library)
    size = math.prod(len(a.parts) for a in free)
    parts_out: Counter = Counter()
    combos_out: Counter = Counter()
    want_greedy = greedy
    greedy, g_status, g_reason = None, "not run", ""
    if want_greedy:
        with stage("greedy design (docgen build's own sizing)"):
            greedy, g_status, g_reason = greedy_candidate(loaded, free)
    with stage("hand bounds"):
        survivors = prune(spec, free, parts_out, combos_out)
    cands = sorted(survivors, key=lambda c: (lower_cost(c, library, topo), c.choice))
    if greedy is not None:
        cands = [greedy] + [c for c in cands if c != greedy]
    result = SearchResult(str(loaded.path), objective, [(a.name, len(a.parts)) for a in free],
                          size, parts_out, combos_out, len(cands), [], budget=budget,
                          greedy_status=g_status, greedy_reason=g_reason,
                          bounded_out=size - len(survivors))
    best_cost = math.inf
    failures: dict = {}  # first-pass sizing failures, reused across batches
    done = 0
    while done < len(cands):
        if done >= budget:
            result.budget_reached = True
            break
        if objective == "cost" and not exhaustive and \
                lower_cost(cands[done], library, topo) > best_cost:
            result.skipped_by_cost = len(cands) - done
            break
        chunk = cands[done:min(done + batch, len(cands), budget)]
        if objective == "cost" and not exhaustive:
            chunk = [c for c in chunk if lower_cost(c, library, topo) <= best_cost]
        with stage(f"verifying candidates {done + 1}-{done + len(chunk)} of {len(cands)} "
                   f"({sum(v.feasible for v in result.verdicts)} feasible so far)"):
            verdicts = verify(chunk, [space.apply(spec, c, free) for c in chunk], library,
                              str(loaded.path), reg, topo, failures)
        for c, v in zip(chunk, verdicts, strict=True):
            v.greedy = c == greedy
            if v.feasible:
                best_cost = min(best_cost, v.cost)
        result.verdicts += verdicts
        done += len(chunk)
    return result


def best_loaded(loaded: LoadedSpec, result: SearchResult) -> LoadedSpec:
    """The requirements of the search's best design (its parts written in as fixed parts)."""
    best = result.best
    if best is None:
        raise InfeasibleDesign("the design-space search found no feasible combination of "
                               "library parts")
    free = space.axes(loaded.requirements, _library(loaded))
    return replace(loaded, requirements=space.apply(loaded.requirements, best.cand, free))


__all__ = ["BATCH", "DEFAULT_BUDGET", "DocgenError", "SearchResult", "best_loaded", "search"]
