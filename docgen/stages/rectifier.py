"""Bridge rectifier: reverse voltage, average, repetitive peak and surge current."""

from __future__ import annotations

import math

from .. import equations as eq
from .. import standards
from ..errors import InfeasibleDesign
from ..trace import Ledger
from .context import Pick, SizingContext, require

TITLE = "Bridge rectifier"
INTRO = ("Each blocking diode of a bridge sees the full winding peak, worst at high line and no "
         "load. A bridge is rated by its average output current, which it carries in short "
         "pulses whose height the ideal-source peak-rectifier formula bounds from above. The "
         "switch-on surge into the empty capacitor is limited by the winding resistance.")


def size_rectifier(ctx: SizingContext, L: Ledger) -> None:
    spec = ctx.spec
    m = spec.margins
    L.calc("bridge.piv", eq.PIV_BRIDGE, r"V_{R,max}", "V", "Peak reverse voltage per diode",
           {"v": "transformer.v_high_nl"}, lambda v: math.sqrt(2) * v)
    L.calc("bridge.i_avg", eq.HALF, r"I_{D,avg}", "A", "Average current per diode (high line)",
           {"i": "regulator.i_in_max"}, lambda i: i / 2)
    L.calc("bridge.i_peak_low", eq.PEAK_CURRENT_FW, r"I_{D,pk,lo}", "A",
           "Repetitive peak diode current (low line, full load)",
           {"i": "regulator.i_trough", "v": "reservoir.v_pk_low", "r": "reservoir.ripple_low"},
           lambda i, v, r: i * (1 + 2 * math.pi * math.sqrt(v / (2 * r))))
    # A shunt regulator draws its largest current at high line.
    L.calc("bridge.i_peak_high", eq.PEAK_CURRENT_FW, r"I_{D,pk,hi}", "A",
           "Repetitive peak diode current (high line)",
           {"i": "regulator.i_in_max", "v": "reservoir.v_pk_high", "r": "reservoir.ripple_high"},
           lambda i, v, r: i * (1 + 2 * math.pi * math.sqrt(v / (2 * r))))
    L.calc("bridge.i_peak", eq.MAX2, r"I_{D,pk}", "A",
           "Repetitive peak diode current (hand formula, worst line)",
           {"a": "bridge.i_peak_low", "b": "bridge.i_peak_high"}, lambda a, b: max(a, b))
    L.calc("bridge.conduction_angle", eq.CONDUCTION_ANGLE, r"\theta", "rad",
           "Conduction angle per pulse (low line, full load)",
           {"r": "reservoir.ripple_low", "v": "reservoir.v_pk_low"},
           lambda r, v: math.acos(1 - r / v))
    L.calc("bridge.i_surge_est", eq.SURGE_ESTIMATE, r"I_{surge,est}", "A",
           "Switch-on surge estimate", {"v": "reservoir.v_max", "r": "transformer.r_w"},
           lambda v, r: v / r)
    L.given("margins.diode_voltage", r"k_{D,V}", m.diode_voltage_derating, "%",
            "Diode reverse-voltage derating",
            defaulted="diode_voltage_derating" not in m.model_fields_set)
    L.given("margins.diode_current", r"k_{D,I}", m.diode_current_derating, "%",
            "Bridge average-current derating",
            defaulted="diode_current_derating" not in m.model_fields_set)
    L.calc("bridge.v_rrm_needed", eq.DERATED_NEED, r"V_{RRM,req}", "V",
           "Reverse-voltage rating needed", {"x": "bridge.piv", "k": "margins.diode_voltage"},
           lambda x, k: x / k)
    L.calc("bridge.i_f_needed", eq.DERATED_NEED, r"I_{F(AV),req}", "A",
           "Bridge output-current rating needed",
           {"x": "regulator.i_in_max", "k": "margins.diode_current"}, lambda x, k: x / k)

    part = None
    if spec.rectifier.part:
        part = ctx.fixed_part("rectifier", spec.rectifier.part, "rectifier.part")
        ctx.picks["BR1"] = Pick("BR1", part.kind, "fixed", part, f"{part.id} named in the file")
    elif ctx.library is not None:
        from ..parts.select import select_bridge_or_diodes

        sel = select_bridge_or_diodes(
            ctx.library.bridges, ctx.library.diodes, topology="bridge",
            peak_reverse_voltage=L["bridge.piv"],
            dc_current=max(L["regulator.i_in_max"],
                           ctx.floors.bridge_current * m.diode_current_derating),
            surge_current=L["bridge.i_surge_est"], voltage_derating=m.diode_voltage_derating,
            current_derating=m.diode_current_derating)
        part = require(sel, "bridge rectifier")
        ctx.picks["BR1"] = Pick("BR1", part.kind, "library", part, sel.reason, sel.generic)
    if part is not None:
        src = f"library part {part.id}"
        # four discrete diodes are compared per diode, a bridge by its output current
        scale = 2.0 if part.kind == "diode" else 1.0
        L.given("bridge.v_rrm", r"V_{RRM}", part.v_rrm, "V", "Reverse-voltage rating", source=src)
        L.given("bridge.i_f_rating", r"I_{F(AV)}", part.i_f_avg * scale, "A",
                "Average output-current rating" + (" (two diodes per half-cycle)"
                                                   if scale > 1 else ""), source=src)
        L.given("bridge.i_fsm", r"I_{FSM}", part.i_fsm, "A", "Surge-current rating", source=src)
    else:
        _standard_classes(ctx, L)
    L.calc("bridge.v_allowed", eq.SCALE, r"V_{R,allow}", "V", "Reverse voltage allowed (derated)",
           {"v": "bridge.v_rrm", "k": "margins.diode_voltage"}, lambda v, k: v * k)
    L.calc("bridge.i_allowed", eq.SCALE, r"I_{F,allow}", "A", "Output current allowed (derated)",
           {"v": "bridge.i_f_rating", "k": "margins.diode_current"}, lambda v, k: v * k)
    # Transformer current with the regulator as sized (table ratio; the engine gives the
    # simulated value in the corner analysis).
    L.calc("transformer.i_rms", eq.SEC_RMS_CURRENT, r"I_{sec,rms}", "A",
           "Secondary RMS current (high line, table ratio)",
           {"k": "margins.secondary_rms_factor", "i": "regulator.i_in_max"}, lambda k, i: k * i)


def _standard_classes(ctx: SizingContext, L: Ledger) -> None:
    try:
        standards.next_at_or_above(L["bridge.v_rrm_needed"], standards.DIODE_VRRM)
    except standards.NoStandardValue:
        raise InfeasibleDesign("the bridge needs a reverse-voltage rating above 1000 V") from None
    L.calc("bridge.v_rrm", eq.PICKED, r"V_{RRM}", "V", "Bridge reverse-voltage rating (class)",
           {"x": "bridge.v_rrm_needed"},
           lambda x: standards.next_at_or_above(x, standards.DIODE_VRRM))
    floor = ctx.floor(L, "bridge_current", "bridge.i_floor", r"I_{F,floor}", "A",
                      "Bridge current-rating floor")
    need = "bridge.i_f_needed"
    if floor:
        L.calc("bridge.i_f_needed_floored", eq.MAX2, r"I_{F,need}", "A",
               "Bridge current rating needed (floor applied)", {"a": need, "b": floor},
               lambda a, b: max(a, b))
        need = "bridge.i_f_needed_floored"
    classes = tuple(c for c, _ in standards.BRIDGE_CURRENT_CLASSES)
    try:
        standards.next_at_or_above(L[need], classes)
    except standards.NoStandardValue:
        raise InfeasibleDesign("the bridge needs an average-current rating above 10 A") from None
    L.calc("bridge.i_f_rating", eq.PICKED, r"I_{F(AV)}", "A", "Bridge current rating (class)",
           {"x": need}, lambda x: standards.next_at_or_above(x, classes))
    surge = dict(standards.BRIDGE_CURRENT_CLASSES)[L["bridge.i_f_rating"]]
    L.given("bridge.i_fsm", r"I_{FSM}", surge, "A", "Typical surge rating of the class",
            source="common practice: typical 8.3 ms half-sine rating of the current class")
    ctx.picks["BR1"] = Pick("BR1", "bridge", "sized",
                            reason="standard rating classes at or above the derated need")
