"""Bridge rectifier: reverse voltage, average and repetitive peak current per diode."""

from __future__ import annotations

import math

from .. import equations as eq
from .. import standards
from ..errors import InfeasibleDesign
from ..spec.models import Requirements
from ..trace import Ledger

TITLE = "Bridge rectifier"
INTRO = ("Each blocking diode of a bridge sees the full winding peak, worst at high line and no "
         "load. Each diode pair carries half the DC current on average, in short pulses whose "
         "height the ideal-source peak-rectifier formula bounds from above.")


def size_rectifier(spec: Requirements, L: Ledger) -> None:
    m = spec.margins
    L.calc("bridge.piv", eq.PIV_BRIDGE, r"V_{R,max}", "V", "Peak reverse voltage per diode",
           {"v": "transformer.v_high_nl"}, lambda v: math.sqrt(2) * v)
    L.calc("bridge.i_avg", eq.HALF, r"I_{D,avg}", "A", "Average current per diode (high line)",
           {"i": "regulator.i_in_max"}, lambda i: i / 2)
    L.calc("bridge.i_peak", eq.PEAK_CURRENT_FW, r"I_{D,pk}", "A",
           "Repetitive peak diode current (low line, full load)",
           {"i": "regulator.i_trough", "v": "reservoir.v_pk_low", "r": "reservoir.ripple_low"},
           lambda i, v, r: i * (1 + 2 * math.pi * math.sqrt(v / (2 * r))))
    L.calc("bridge.conduction_angle", eq.CONDUCTION_ANGLE, r"\theta", "rad",
           "Conduction angle per pulse (low line, full load)",
           {"r": "reservoir.ripple_low", "v": "reservoir.v_pk_low"},
           lambda r, v: math.acos(1 - r / v))
    L.given("margins.diode_voltage", r"k_{D,V}", m.diode_voltage_derating, "%",
            "Diode reverse-voltage derating",
            defaulted="diode_voltage_derating" not in m.model_fields_set)
    L.given("margins.diode_current", r"k_{D,I}", m.diode_current_derating, "%",
            "Diode average-current derating",
            defaulted="diode_current_derating" not in m.model_fields_set)
    L.calc("bridge.v_rrm_needed", eq.DERATED_NEED, r"V_{RRM,req}", "V",
           "Reverse-voltage rating needed", {"x": "bridge.piv", "k": "margins.diode_voltage"},
           lambda x, k: x / k)
    L.calc("bridge.i_f_needed", eq.DERATED_NEED, r"I_{F(AV),req}", "A",
           "Average-current rating needed", {"x": "bridge.i_avg", "k": "margins.diode_current"},
           lambda x, k: x / k)
    try:
        standards.next_at_or_above(L["bridge.v_rrm_needed"], standards.DIODE_VRRM)
    except standards.NoStandardValue:
        raise InfeasibleDesign("the bridge needs a reverse-voltage rating above 1000 V") from None
    L.calc("bridge.v_rrm", eq.PICKED, r"V_{RRM}", "V", "Bridge reverse-voltage rating (class)",
           {"x": "bridge.v_rrm_needed"},
           lambda x: standards.next_at_or_above(x, standards.DIODE_VRRM))
    classes = tuple(c for c, _ in standards.BRIDGE_CURRENT_CLASSES)
    try:
        standards.next_at_or_above(L["bridge.i_f_needed"], classes)
    except standards.NoStandardValue:
        raise InfeasibleDesign("the bridge needs an average-current rating above 10 A") from None
    L.calc("bridge.i_f_rating", eq.PICKED, r"I_{F(AV)}", "A", "Bridge current rating (class)",
           {"x": "bridge.i_f_needed"}, lambda x: standards.next_at_or_above(x, classes))
    L.calc("bridge.v_allowed", eq.SCALE, r"V_{R,allow}", "V", "Reverse voltage allowed (derated)",
           {"v": "bridge.v_rrm", "k": "margins.diode_voltage"}, lambda v, k: v * k)
    L.calc("bridge.i_allowed", eq.SCALE, r"I_{D,allow}", "A", "Average current allowed (derated)",
           {"v": "bridge.i_f_rating", "k": "margins.diode_current"}, lambda v, k: v * k)
    # Transformer current with the regulator as sized (table ratio until the engine replaces it).
    L.calc("transformer.i_rms", eq.SEC_RMS_CURRENT, r"I_{sec,rms}", "A",
           "Secondary RMS current (high line, table ratio)",
           {"k": "margins.secondary_rms_factor", "i": "regulator.i_in_max"}, lambda k, i: k * i)
