"""Verify many candidates together: each is sized by the pipeline's own stages, then all of
their worst-case corners go through the waveform engine in one call (and their switch-on
transients in another), and the pipeline's checks are evaluated on each one's share.

The refine loop of docgen.pipeline runs here too, batch by batch: a candidate whose parts sized
with it (a series resistor, a heat sink) the engine finds short is sized again with the raised
floor, at most MAX_PASSES times; the searched parts themselves are fixed, so a shortfall of
theirs stays a failing check and the candidate is infeasible.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from ..design import Check
from ..engine import concat_circuits, simulate, switch_on
from ..errors import DocgenError, InfeasibleDesign
from ..pipeline import MAX_PASSES, size_pass
from ..stages.context import SizingContext
from ..trace import Ledger, TraceError
from ..verify.corners import (
    STEADY_FIGURES,
    SURGE_CYCLES,
    SURGE_STEPS,
    CornerResult,
    PointSet,
    corner_points,
    design_circuit,
    design_metrics,
    nominal_corner,
    surge_figures,
    surge_points,
)
from ..verify.evaluate import engine_checks, protection_checks
from ..verify.refine import raise_floors
from ..verify.worst import worst_corner
from .space import Candidate, count


@dataclass
class Verdict:
    """One verified candidate: feasible or not (and why), its cost and figures of merit."""

    cand: Candidate
    feasible: bool
    reason: str = ""  # first failing check, or why it could not be sized
    cost: float = math.nan  # sum of library prices of every part with a price
    dissipation: float = math.nan  # W, largest p_in - p_out over the corners (engine)
    cap_life: float = math.nan  # h, capacitor life (when the file asks for a life)
    hold_up: float = math.nan  # s, full load carried after the mains fails (hold_up below)
    parts: dict[str, str] = field(default_factory=dict)  # designator -> part id
    checks: list[Check] = field(default_factory=list)
    greedy: bool = False


@dataclass
class _State:
    cand: Candidate
    ctx: SizingContext
    L: Ledger | None = None
    cr: CornerResult | None = None
    verdict: Verdict | None = None


# The searched parts each sizing stage has read by its end (stages run in this order; a stage
# reads the spec's own fields and what earlier stages recorded: DEVELOPERS.md).
_READ_BY = {
    "margins": (), "mains": (),
    "regulator_needs": ("zener", "transistor", "regulator"),
    "transformer": ("zener", "transistor", "regulator", "transformer"),
    "reservoir": ("zener", "transistor", "regulator", "transformer", "capacitor"),
}


def _failure_key(cand: Candidate, stage: str) -> tuple | None:
    """What a first-pass sizing failure at ``stage`` depends on (None: do not reuse it)."""
    if stage not in _READ_BY:
        return None
    return (stage, tuple((a, p) for a, p in cand.choice if a in _READ_BY[stage]))


def verify(cands: list[Candidate], specs: list, library, spec_path: str, reg,
           topology: str, failures: dict | None = None) -> list[Verdict]:
    """Verdicts of ``cands`` (``specs``: each one's requirements with its parts written in).

    ``failures`` carries first-pass sizing failures between batches: a candidate that shares
    with a failed one every part the failing stage had read fails the same way, unsized."""
    failures = {} if failures is None else failures
    states = [_State(c, SizingContext(spec=s, spec_path=spec_path, library=library))
              for c, s in zip(cands, specs, strict=True)]
    pending = states
    for first in (True, *([False] * (MAX_PASSES - 1))):
        for st in pending:
            known = first and next((failures[k] for k in (
                _failure_key(st.cand, stage) for stage in _READ_BY) if k in failures), "")
            if known:
                st.verdict = Verdict(st.cand, False, known)
                continue
            try:
                st.L = size_pass(st.ctx, reg)
            except DocgenError as exc:
                st.verdict = Verdict(st.cand, False, f"not sizeable: {exc}")
                key = _failure_key(st.cand, getattr(exc, "stage", ""))
                if first and key is not None:
                    failures[key] = st.verdict.reason
        live = [st for st in pending if st.verdict is None]
        _steady(live, topology, reg)
        pending = [st for st in live if raise_floors(st.ctx, st.L, st.cr, reg)]
        if not pending:
            break
    for st in states:
        if st.verdict is None:
            why = _short_at_corners(st, reg)
            if why:
                st.verdict = Verdict(st.cand, False, why, parts=_parts(st.ctx))
    # Only the candidates the steady state leaves standing need their switch-on transient.
    live = [st for st in states if st.verdict is None]
    _surge(live, topology, reg)
    for st in live:
        st.verdict = _judge(st, reg, topology)
    return [st.verdict for st in states]




def _steady(live: list[_State], topology: str, reg) -> None:
    """Every live candidate's corners in one engine call; each gets its CornerResult."""
    if not live:
        return
    pts = [corner_points(st.L, reg) for st in live]
    circuits = [(design_circuit(st.L, p, topology, reg), len(p))
                for st, p in zip(live, pts, strict=True)]
    ss = simulate(concat_circuits([c for c, _ in circuits]))
    start = 0
    for st, p in zip(live, pts, strict=True):
        sl = slice(start, start + len(p))
        start += len(p)
        figures = {name: np.asarray(getattr(ss, name))[sl] for name in STEADY_FIGURES}
        st.cr = CornerResult(corners=p, samples=None,
                             metrics=design_metrics(st.L, p, figures, topology, reg),
                             converged=np.asarray(ss.converged)[sl], surge_peak=math.nan,
                             surge_i2t=math.nan, surge_converged=False,
                             nominal_index=nominal_corner(p))


class _Slice:
    """One candidate's share of a SwitchOn result."""

    def __init__(self, so: Any, sl: slice) -> None:
        for name in ("i_peak", "i2t", "first_i2t", "duration", "settled", "converged"):
            setattr(self, name, np.asarray(getattr(so, name))[sl])


def _surge(live: list[_State], topology: str, reg) -> None:
    """Every live candidate's switch-on transients in one engine call."""
    if not live:
        return
    subs: list[tuple[PointSet, np.ndarray]] = [
        surge_points(st.cr.corners, st.cr.corner_metric("i_d_peak")) for st in live]
    circuits = [(design_circuit(st.L, sub, topology, reg), len(sub))
                for st, (sub, _) in zip(live, subs, strict=True)]
    so = switch_on(concat_circuits([c for c, _ in circuits]), steps_per_period=SURGE_STEPS,
                   max_cycles=SURGE_CYCLES,
                   settle_peak=np.concatenate([ref for _, ref in subs]))
    start = 0
    for st, (sub, _) in zip(live, subs, strict=True):
        sl = slice(start, start + len(sub))
        start += len(sub)
        got = surge_figures(sub, _Slice(so, sl))
        cr = st.cr
        cr.surge_converged = got.get("ok", False)
        cr.surge_peak = got.get("peak", math.nan)
        cr.surge_i2t = got.get("i2t", math.nan)
        cr.surge_first_i2t = got.get("first_i2t", math.nan)
        cr.surge_cycles = got.get("cycles", math.nan)
        cr.surge_corner = got.get("corner", "")
        cr.surge_settled = got.get("settled", False)


def _short_at_corners(st: _State, reg) -> str:
    """The first engine check beyond its limit at some corner (the pipeline's own check would
    fail there), or an unsolved corner; empty when the steady state leaves it standing. Read
    only: the checks are written into the ledger later, by the pipeline's functions."""
    cr = st.cr
    if not bool(np.all(cr.converged)):
        return "Every corner solved by the engine fails"
    for chk in reg.engine_checks:
        if chk.limit_id not in st.L:
            continue
        value, k = worst_corner(cr, chk)
        limit = st.L[chk.limit_id]
        if k >= 0 and (value > limit if chk.sense == "max" else value < limit):
            return f"{chk.title} fails at {cr.corners.name[k]}"
    return ""


def _parts(ctx: SizingContext) -> dict[str, str]:
    return {ref: pick.part.id for ref, pick in ctx.picks.items() if pick.part is not None}


def _judge(st: _State, reg, topology: str) -> Verdict:
    """The pipeline's checks on this candidate's figures, and its cost and merits."""
    try:
        checks = engine_checks(st.ctx, st.L, st.cr, reg)
        checks += protection_checks(st.ctx, st.L, st.cr)
    except (InfeasibleDesign, TraceError, ArithmeticError, ValueError) as exc:
        return Verdict(st.cand, False, f"not verifiable: {exc}")
    failing = [c for c in checks if c.status == "fail"]
    p_loss = st.cr.corner_metric("p_in") - st.cr.corner_metric("p_out")
    return Verdict(
        st.cand, not failing,
        reason=(f"{failing[0].title} fails at {failing[0].corner}" if failing else ""),
        cost=cost_of(st.ctx, topology),
        dissipation=float(np.nanmax(p_loss)) if np.isfinite(p_loss).any() else math.nan,
        cap_life=st.L["reservoir.life"] if "reservoir.life" in st.L else math.nan,
        hold_up=hold_up(st.L, st.cr),
        parts=_parts(st.ctx),
        checks=checks)


def hold_up(L: Ledger, cr: CornerResult) -> float:
    """Time the reservoir carries the largest input current after the mains fails at the
    nominal trough, down to the least input the regulator is sized for: C_min dV / I
    (constant-current discharge, common practice); 0 when the trough is already below it."""
    if "regulator.v_in_min_needed" not in L or "regulator.i_in_max" not in L:
        return math.nan
    v = float(cr.corner_metric("v_c_min")[cr.nominal_index])
    c = L["reservoir.c"] * (1 - L["reservoir.tol"])
    return max(0.0, c * (v - L["regulator.v_in_min_needed"]) / L["regulator.i_in_max"])


def cost_of(ctx: SizingContext, topology: str) -> float:
    """Sum of the library prices of the design's parts (a part without a price counts 0)."""
    total = 0.0
    for pick in ctx.picks.values():
        part = pick.part
        if part is None or part.price is None:
            continue
        qty = count(topology, part) if part.kind == "diode" else pick.quantity
        total += part.price * qty
    return total
