"""Reservoir capacitor: capacitance for the allowed ripple, voltage at high line and no load."""

from __future__ import annotations

import math

from .. import equations as eq
from .. import standards
from ..errors import InfeasibleDesign
from ..parts.eseries import preferred
from ..spec.models import Requirements
from ..trace import Ledger

TITLE = "Reservoir capacitor"
INTRO = ("The capacitor carries the load between charging pulses. Its capacitance follows from "
         "the ripple allowed at the regulator input with the constant-current approximation "
         "(conservative by some 15-25 % at 10 % ripple) at the largest input current, which a "
         "shunt regulator draws at high line; its low tolerance is used for sizing. "
         "Its voltage rating covers the no-load peak at high line, with the diode drop neglected.")

MAX_CAPACITANCE = 1.0  # F; beyond this no practical reservoir exists for a small supply


def size_reservoir(spec: Requirements, L: Ledger) -> None:
    r = spec.reservoir
    m = spec.margins
    L.given("reservoir.tol", r"t_C", r.tolerance, "%", "Capacitance tolerance",
            defaulted="tolerance" not in r.model_fields_set)
    L.calc("reservoir.v_pk_low", eq.CAP_PEAK_LOW, r"V_{C,pk,lo}", "V",
           "Capacitor peak at low line, full load",
           {"v": "transformer.v_low_fl", "d": "rect.v_f"}, lambda v, d: math.sqrt(2) * v - 2 * d)
    L.calc("reservoir.v_pk_high", eq.CAP_PEAK_LOW, r"V_{C,pk,hi}", "V",
           "Capacitor peak at high line, transformer at rated load",
           {"v": "transformer.v_high_fl", "d": "rect.v_f"}, lambda v, d: math.sqrt(2) * v - 2 * d)
    L.calc("reservoir.v_max", eq.SINE_PEAK, r"V_{C,max}", "V",
           "Capacitor peak at high line, no load (no diode drop: conservative)",
           {"v": "transformer.v_high_nl"}, lambda v: math.sqrt(2) * v)
    L.calc("regulator.i_in_high_est", eq.INPUT_CURRENT, r"I_{in,hi,est}", "A",
           "Regulator input current at high line (estimate with R_target)",
           {"v": "reservoir.v_pk_high", "z": "zener.v_min", "R": "regulator.r_target"},
           lambda v, z, R: (v - z) / R)
    L.calc("reservoir.c_required", eq.CAP_FOR_RIPPLE, r"C_{req}", "F",
           "Capacitance for the allowed ripple at the largest input current",
           {"i": "regulator.i_in_high_est", "f": "mains.ripple_freq", "v": "reservoir.ripple_allowed"},
           lambda i, f, v: i / (f * v))
    if L["reservoir.c_required"] > MAX_CAPACITANCE:
        raise InfeasibleDesign(
            f"the output ripple limit allows only {L['reservoir.ripple_allowed'] * 1e3:.2f} mV "
            f"of ripple at the regulator input, which needs "
            f"{L['reservoir.c_required']:.2f} F of reservoir capacitance; relax ripple_max or "
            "use a regulator with more ripple rejection"
        )
    L.calc("reservoir.c_nominal_needed", eq.CAP_NOMINAL_NEEDED, r"C_{nom,req}", "F",
           "Nominal capacitance covering the tolerance",
           {"c": "reservoir.c_required", "t": "reservoir.tol"}, lambda c, t: c / (1 - t))
    L.given("margins.cap_voltage", r"k_{C,V}", m.capacitor_voltage_derating, "%",
            "Capacitor voltage derating",
            defaulted="capacitor_voltage_derating" not in m.model_fields_set)
    L.calc("reservoir.v_rating_needed", eq.DERATED_NEED, r"V_{C,rated,req}", "V",
           "Capacitor voltage rating needed", {"x": "reservoir.v_max", "k": "margins.cap_voltage"},
           lambda x, k: x / k)
    if r.capacitance is not None:
        L.given("reservoir.c", "C", r.capacitance, "F", "Reservoir capacitance (fixed part)")
    else:
        L.calc("reservoir.c", eq.PREFERRED_UP, "C", "F", "Reservoir capacitance (E6 value)",
               {"x": "reservoir.c_nominal_needed"}, lambda x: preferred(x, "E6", "up"))
    if r.voltage_rating is not None:
        L.given("reservoir.v_rating", r"V_{C,rated}", r.voltage_rating, "V",
                "Capacitor voltage rating (fixed part)")
    else:
        need = L["reservoir.v_rating_needed"]
        try:
            standards.next_at_or_above(need, standards.CAPACITOR_VOLTAGES)
        except standards.NoStandardValue:
            raise InfeasibleDesign(
                f"the reservoir needs a {need:.0f} V rating, above the largest standard "
                "electrolytic voltage"
            ) from None
        L.calc("reservoir.v_rating", eq.PICKED, r"V_{C,rated}", "V",
               "Capacitor voltage rating (standard step)", {"x": "reservoir.v_rating_needed"},
               lambda x: standards.next_at_or_above(x, standards.CAPACITOR_VOLTAGES))
    L.calc("reservoir.c_min", eq.BOUND_LOW, r"C_{min}", "F", "Lowest capacitance (tolerance)",
           {"x": "reservoir.c", "t": "reservoir.tol"}, lambda x, t: x * (1 - t))
