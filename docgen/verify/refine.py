"""The refine loop's rules: where the engine finds a sized part short at some corner (or inside
the warning band), raise a floor for that part with the reason, so the next sizing pass
chooses a larger one. Fixed parts are never changed; their shortfall stays a failing check.

The rules that concern the transformer, the capacitor and the rectifier live here; each
regulator kind raises its own floors (``Regulator.raise_bias_floor`` and
``raise_part_floors``).
"""

from __future__ import annotations

import math

import numpy as np

from .. import standards
from ..stages.context import SizingContext
from ..trace import Ledger
from ..units import format_quantity as fq
from .corners import CornerResult
from .worst import worst_corner

# Above this regulation a headroom shortfall is met with a larger transformer, not a higher
# secondary (common practice: small transformers lose their headroom in winding resistance).
STIFF_REGULATION = 0.15


class PassVerdict:
    """The engine's worst figures of one pass, for the floor rules."""

    def __init__(self, cr: CornerResult, L: Ledger, checks: tuple, band: float):
        self.cr = cr
        self.L = L
        self.checks = {c.id: c for c in checks}
        self.band = band

    def has(self, check_id: str) -> bool:
        return check_id in self.checks

    def has_metric(self, metric: str) -> bool:
        return metric in self.cr.metrics

    def corner_max(self, metric: str) -> float:
        return float(np.nanmax(self.cr.corner_metric(metric)))

    def worst(self, check_id: str) -> tuple[float, str]:
        value, k = worst_corner(self.cr, self.checks[check_id])
        return value, self.cr.corners.name[k] if k >= 0 else ""

    def short(self, check_id: str, limit_id: str, sense: str) -> bool:
        if limit_id not in self.L or check_id not in self.checks:
            return False
        value, _ = self.worst(check_id)
        limit = self.L[limit_id]
        if sense == "max":
            return math.isfinite(value) and value > limit * (1 - self.band)
        return math.isfinite(value) and value < limit * (1 + self.band)


def raise_floors(ctx: SizingContext, L: Ledger, cr: CornerResult, reg) -> bool:
    """Raise floors for sized parts that the engine found short; True if anything changed."""
    spec = ctx.spec
    fixed_t = bool(spec.transformer.part) or spec.transformer.secondary is not None
    band = spec.margins.warn_band
    v = PassVerdict(cr, L, reg.engine_checks, band)
    changed = False

    if not fixed_t and v.short("check.transformer_current", "transformer.i_allowed", "max"):
        i, where = v.worst("check.transformer_current")
        # the floor is the VA needed at the highest ambient (derated); sizing divides by the
        # derating of the part it picks
        need = i * L["transformer.v_rated"] / (1 - band)
        derated = ("" if L["transformer.k_amb"] >= 1 else
                   f" ({fq(L['transformer.i_allowed'], 'A')} at the highest ambient)")
        changed |= ctx.floors.raise_to(
            "va", need, f"the engine found {fq(i, 'A')} RMS in the secondary at {where}, above "
            f"the {fq(L['transformer.i_rated'], 'A')} rating{derated} of a "
            f"{fq(L['transformer.va'], 'VA')} transformer")
    trough_short = not fixed_t and reg.trough_short(v)
    if trough_short:
        changed |= _raise_transformer_for_trough(ctx, L)
    else:
        changed |= reg.raise_bias_floor(ctx, L, v)
    if spec.reservoir.capacitance is None and not spec.reservoir.part and v.short(
            "check.output_ripple", "output.ripple_max", "max"):
        ripple, where = v.worst("check.output_ripple")
        need = L["reservoir.c_required"] * ripple / L["output.ripple_max"] * 1.05
        changed |= ctx.floors.raise_to(
            "capacitance", need, f"the engine found {fq(ripple, 'V')} output ripple at {where}")
    if (ctx.library is not None and spec.reservoir.capacitance is None
            and not spec.reservoir.part
            and v.short("check.cap_ripple_current", "reservoir.i_ripple_rating", "max")):
        # a library capacitor whose ripple rating the engine finds short is chosen again
        # against the engine's figure (with the warning band), not left failing
        i, where = v.worst("check.cap_ripple_current")
        changed |= ctx.floors.raise_to(
            "ripple_current", i / (1 - band),
            f"the engine found {fq(i, 'A')} RMS ripple current in C1 at {where}, above "
            f"{fq(L['reservoir.i_ripple_rating'] * (1 - band), 'A')} (the "
            f"{fq(L['reservoir.i_ripple_rating'], 'A')} rating at "
            f"{fq(L['mains.ripple_freq'], 'Hz')} less the warning band)")
    if not trough_short:  # a higher trough lengthens the hold-up: see it first
        changed |= _raise_capacitance_for_holdup(ctx, L, v, reg)
    changed |= reg.raise_part_floors(ctx, L, v)
    if not spec.rectifier.part and v.short("check.bridge_current", "rect.i_allowed", "max"):
        i, where = v.worst("check.bridge_current")
        changed |= ctx.floors.raise_to(
            "bridge_current", i / spec.margins.diode_current_derating / (1 - band),
            f"the engine found {fq(i, 'A')} average output current at {where}")
    return changed


def _raise_capacitance_for_holdup(ctx: SizingContext, L: Ledger, v: PassVerdict, reg) -> bool:
    """Too short a hold-up: the capacitance that carries the largest input current from the
    trough to the kind's floor for the time required (charge balance, C dV = I dt). Where the
    trough lies close to (or below) the floor, a larger capacitor also raises the trough towards
    the crest, so half the crest-to-floor span is taken instead; the next pass re-checks."""
    spec = ctx.spec
    if spec.reservoir.capacitance is not None or spec.reservoir.part:
        return False
    if not v.short("check.holdup", "output.hold_up", "min"):
        return False
    t, k = worst_corner(v.cr, v.checks["check.holdup"])
    crest = float(v.cr.corner_metric("v_c_max")[k])
    trough = float(v.cr.corner_metric("v_c_min")[k])
    floor = float(reg.holdup_floor(L, v.cr.corners)[k])
    if not crest > floor:
        return False  # no capacitance can hold it up: the trough rules raise the voltage
    span = max(trough - floor, 0.5 * (crest - floor))
    c_low = L["regulator.i_in_max"] * L["output.hold_up"] / span
    need = c_low * L["reservoir.c"] / float(v.cr.corners.c[k]) * (1 + v.band)
    return ctx.floors.raise_to(
        "capacitance", need, f"the engine found a hold-up of {fq(t, 's')} at "
        f"{v.cr.corners.name[k]}, short of the {fq(L['output.hold_up'], 's')} required")


def _raise_transformer_for_trough(ctx: SizingContext, L: Ledger) -> bool:
    """Too little voltage at the trough: a stiffer transformer, or a higher secondary."""
    v = L["transformer.v_rated"]
    va = L["transformer.va"]
    stiffer = next((s for s in standards.TRANSFORMER_VA if s > va * (1 + 1e-9)), None)
    if L["transformer.regulation"] > STIFF_REGULATION and stiffer is not None:
        # A small transformer's winding resistance eats the headroom: a larger core with
        # better regulation helps without the extra heat of a higher secondary.
        # floors hold the VA needed at the highest ambient: the next step, derated
        return ctx.floors.raise_to(
            "va", stiffer * L["transformer.k_amb"],
            f"at the trough the engine found too little headroom with a "
            f"{fq(va, 'VA')} transformer whose regulation is "
            f"{fq(L['transformer.regulation'], '%')} (winding resistance)")
    nxt = next((s for s in standards.SECONDARY_VOLTAGES if s > v * (1 + 1e-9)), v * 1.25)
    return ctx.floors.raise_to(
        "secondary", nxt, f"at the trough the engine found less than the required "
        f"headroom with a {fq(v, 'V')} secondary (winding resistance and diode drops)")
