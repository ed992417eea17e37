"""Rectifier (bridge, center-tap or half-wave): reverse voltage, average, peak and surge current."""

from __future__ import annotations

import math

from .. import equations as eq
from .. import standards
from ..errors import InfeasibleDesign
from ..topology import topology
from ..trace import Ledger
from .context import Pick, SizingContext, require
from .diodes import record_diode

WRITES = ("rect.", "margins.diode_", "transformer.i_rms")
TITLE = "Rectifier"
INTRO = ("The blocking diode of a bridge sees the winding peak; in a center-tap or half-wave "
         "circuit it sees twice the path peak. Both are worst at high line and no load. The "
         "rectifier carries the DC current in short pulses whose height the ideal-source "
         "peak-rectifier formula bounds from above; the switch-on surge into the empty "
         "capacitor is limited by the winding resistance.")



def rectifier_ref(name: str) -> str:
    return topology(name).designator


def size_rectifier(ctx: SizingContext, L: Ledger) -> None:
    spec = ctx.spec
    m = spec.margins
    topo = topology(spec.rectifier.topology)
    ref = topo.designator
    k_piv = topo.piv_factor
    L.calc("rect.piv", topo.piv_equation, r"V_{R,max}", "V", "Peak reverse voltage per diode",
           {"v": "transformer.v_high_nl"}, lambda v: k_piv * math.sqrt(2) * v)
    if topo.half_wave:
        L.calc("rect.i_avg", eq.IDENT, r"I_{D,avg}", "A", "Average current of the diode",
               {"x": "regulator.i_in_max"}, lambda x: x)

        def peak(i, v, r):
            return i * (1 + 2 * math.pi * math.sqrt(2 * v / r))
    else:
        L.calc("rect.i_avg", eq.HALF, r"I_{D,avg}", "A", "Average current per diode (high line)",
               {"i": "regulator.i_in_max"}, lambda i: i / 2)

        def peak(i, v, r):
            return i * (1 + 2 * math.pi * math.sqrt(v / (2 * r)))
    peak_eq = topo.peak_equation
    L.calc("rect.i_peak_low", peak_eq, r"I_{D,pk,lo}", "A",
           "Repetitive peak diode current, initial estimate (low line, full load)",
           {"i": "regulator.i_trough", "v": "reservoir.v_pk_low", "r": "reservoir.ripple_low"},
           peak)
    # A shunt regulator draws its largest current at high line.
    L.calc("rect.i_peak_high", peak_eq, r"I_{D,pk,hi}", "A",
           "Repetitive peak diode current, initial estimate (high line)",
           {"i": "regulator.i_in_max", "v": "reservoir.v_pk_high", "r": "reservoir.ripple_high"},
           peak)
    L.calc("rect.i_peak", eq.MAX2, r"I_{D,pk}", "A",
           "Repetitive peak diode current, initial estimate (hand formula, the higher line)",
           {"a": "rect.i_peak_low", "b": "rect.i_peak_high"}, lambda a, b: max(a, b))
    L.calc("rect.conduction_angle", eq.CONDUCTION_ANGLE, r"\theta", "rad",
           "Conduction angle per pulse, initial estimate (low line, full load)",
           {"r": "reservoir.ripple_low", "v": "reservoir.v_pk_low"},
           lambda r, v: math.acos(1 - r / v))
    L.calc("rect.i_surge_est", eq.SURGE_ESTIMATE, r"I_{surge,est}", "A",
           "Switch-on surge, initial estimate", {"v": "reservoir.v_max", "r": "transformer.r_w"},
           lambda v, r: v / r)
    L.given("margins.diode_voltage", r"k_{D,V}", m.diode_voltage_derating, "%",
            "Diode reverse-voltage derating",
            defaulted="diode_voltage_derating" not in m.model_fields_set)
    L.given("margins.diode_current", r"k_{D,I}", m.diode_current_derating, "%",
            "Rectifier average-current derating",
            defaulted="diode_current_derating" not in m.model_fields_set)
    L.calc("rect.v_rrm_needed", eq.DERATED_NEED, r"V_{RRM,req}", "V",
           "Reverse-voltage rating needed", {"x": "rect.piv", "k": "margins.diode_voltage"},
           lambda x, k: x / k)
    L.calc("rect.i_f_needed", eq.DERATED_NEED, r"I_{F(AV),req}", "A",
           "Rectifier output-current rating needed",
           {"x": "regulator.i_in_max", "k": "margins.diode_current"}, lambda x, k: x / k)

    part = None
    if spec.rectifier.part:
        part = ctx.fixed_part("rectifier", spec.rectifier.part, "rectifier.part")
        ctx.picks[ref] = Pick(ref, part.kind, "fixed", part, f"{part.id} named in the file")
        if part.kind == "diode":  # one per arm, as a library pick of discrete diodes counts
            ctx.picks[ref].quantity = {"bridge": 4, "center-tap": 2}.get(topo.name, 1)
    elif ctx.library is not None:
        from ..parts.select import select_bridge_or_diodes

        sel = select_bridge_or_diodes(
            ctx.library.bridges, ctx.library.diodes, topology=topo.name,
            peak_reverse_voltage=L["rect.piv"],
            dc_current=max(L["regulator.i_in_max"],
                           ctx.floors.bridge_current * m.diode_current_derating),
            surge_current=L["rect.i_surge_est"], voltage_derating=m.diode_voltage_derating,
            current_derating=m.diode_current_derating)
        part = require(sel, "rectifier")
        ctx.picks[ref] = Pick(ref, part.kind, "library", part, sel.reason, sel.generic)
        ctx.picks[ref].quantity = sel.quantity
    if part is not None:
        src = f"library part {part.id}"
        # discrete diodes are rated per diode; a bridge by its output current
        # (full-wave: each diode of a pair carries every other pulse)
        scale = 1.0 if part.kind == "bridge" else float(topo.pulses_per_cycle)
        L.given("rect.v_rrm", r"V_{RRM}", part.v_rrm, "V", "Reverse-voltage rating", source=src)
        L.given("rect.i_f_rating", r"I_{F(AV)}", part.i_f_avg * scale, "A",
                "Average output-current rating" + (" (two diodes share the current)"
                                                   if scale > 1 else ""), source=src)
        L.given("rect.i_fsm", r"I_{FSM}", part.i_fsm, "A", "Surge-current rating", source=src)
    else:
        _standard_classes(ctx, L, ref)
    L.calc("rect.v_allowed", eq.SCALE, r"V_{R,allow}", "V", "Reverse voltage allowed (derated)",
           {"v": "rect.v_rrm", "k": "margins.diode_voltage"}, lambda v, k: v * k)
    L.calc("rect.i_allowed", eq.SCALE, r"I_{F,allow}", "A", "Output current allowed (derated)",
           {"v": "rect.i_f_rating", "k": "margins.diode_current"}, lambda v, k: v * k)
    L.calc("transformer.i_rms", eq.SEC_RMS_CURRENT, r"I_{sec,rms}", "A",
           "Winding RMS current (high line, table ratio)",
           {"k": "margins.secondary_rms_factor", "i": "regulator.i_in_max"}, lambda k, i: k * i)
    record_diode(ctx, L, part)


def _standard_classes(ctx: SizingContext, L: Ledger, ref: str) -> None:
    topo = topology(ctx.spec.rectifier.topology)
    try:
        standards.next_at_or_above(L["rect.v_rrm_needed"], standards.DIODE_VRRM)
    except standards.NoStandardValue:
        raise InfeasibleDesign("the rectifier needs a reverse-voltage rating above 1000 V") from None
    L.calc("rect.v_rrm", eq.PICKED, r"V_{RRM}", "V", "Reverse-voltage rating (class)",
           {"x": "rect.v_rrm_needed"},
           lambda x: standards.next_at_or_above(x, standards.DIODE_VRRM))
    floor = ctx.floor(L, "bridge_current", "rect.i_floor", r"I_{F,floor}", "A",
                      "Rectifier current-rating floor")
    need = "rect.i_f_needed"
    if floor:
        L.calc("rect.i_f_needed_floored", eq.MAX2, r"I_{F,need}", "A",
               "Rectifier current rating needed (floor applied)", {"a": need, "b": floor},
               lambda a, b: max(a, b))
        need = "rect.i_f_needed_floored"
    per = topo.output_per_rating
    classes = tuple(c for c, _ in standards.BRIDGE_CURRENT_CLASSES)
    try:
        standards.next_at_or_above(L[need] / per, classes)
    except standards.NoStandardValue:
        raise InfeasibleDesign("the rectifier needs a current rating above 10 A") from None
    L.calc("rect.i_f_rating", eq.PICKED, r"I_{F(AV)}", "A",
           "Output-current rating (class" + (", two diodes)" if per > 1 else ")"),
           {"x": need}, lambda x: per * standards.next_at_or_above(x / per, classes))
    surge = dict(standards.BRIDGE_CURRENT_CLASSES)[L["rect.i_f_rating"] / per]
    L.given("rect.i_fsm", r"I_{FSM}", surge, "A", "Typical surge rating of the class",
            source="common practice: typical 8.3 ms half-sine rating of the current class")
    ctx.picks[ref] = Pick(ref, topo.part_kind, "sized",
                          reason="standard rating classes at or above the derated need")
