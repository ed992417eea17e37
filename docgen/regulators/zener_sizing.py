"""Sizing of the zener shunt regulator: what it needs from the reservoir, then the series
resistor, the zener current and the dissipations at the hand-formula worst cases. The zener
itself (choice, rating, self-heating) is in zener_part.py, shared with the follower.

Design equations after A. S. Sedra, K. C. Smith, Microelectronic Circuits (zener shunt
regulator section; from memory): R <= (V_in,min - V_Z,max) / (I_L,max + I_Z,min); the zener's
worst case is high line with the least load.
"""

from __future__ import annotations

import math

from .. import equations as eq
from .. import standards
from ..errors import InfeasibleDesign
from ..parts.eseries import is_preferred, preferred
from ..stages.context import Pick, SizingContext, record_fields, require
from ..trace import Ledger
from .base import record_output
from .zener_part import (
    choose_zener,
    note_conflicts,
    pick_power_class,
    record_power_deratings,
    self_heating,
    standard_voltage,
    voltage_window,
    with_floor,
    zener_rating,
)

TITLE = "Zener shunt regulator"
INTRO = ("The series resistor is the largest value that still keeps the minimum zener current "
         "at the ripple trough with low line, full load and the lowest capacitance; it is "
         "rounded down to the E24 series. The zener's worst case is high line with the load "
         "at its minimum (or disconnected): the whole input current then flows in the zener. A shunt "
         "regulator draws about the same current at any load, so the transformer is taken at "
         "its rated load for these currents; the no-load voltage is kept for voltage ratings.")


NEEDS_TITLE = "Regulator requirements"
NEEDS_INTRO = ("The zener shunt regulator needs a minimum input voltage at the ripple trough: the "
         "highest zener voltage plus the headroom across the series resistor. Everything "
         "upstream is sized backwards from this voltage.")


def size_needs(ctx: SizingContext, L: Ledger) -> None:
    spec = ctx.spec
    out = spec.output[0]
    z = out.zener
    explicit_out = out.model_fields_set
    explicit_z = z.model_fields_set
    record_output(ctx, L)
    L.given("output.headroom", r"V_{hr}", out.headroom, "V",
            "Headroom across the series resistor at the trough",
            defaulted="headroom" not in explicit_out)
    if z.voltage is None and not z.part:
        standard_voltage(ctx, L, "output.v_nom", lambda v: v)
        vz = L["zener.v_std"]
    else:
        vz = z.voltage if z.voltage is not None else out.voltage
    part = choose_zener(ctx, L, vz)
    if part is not None:
        note_conflicts(ctx, z, part)
        src = f"library part {part.id}"
        L.given("zener.v_nom", r"V_Z", part.voltage, "V", "Zener voltage (nominal)", source=src)
        L.given("zener.tol", r"t_Z", part.tolerance, "%", "Zener voltage tolerance", source=src)
        L.given("zener.tempco", r"\alpha_Z", part.tempco, "%/degC",
                "Zener temperature coefficient", source=src)
        L.given("zener.i_zk", r"I_{ZK}", part.knee_current, "A", "Zener knee current",
                source=src)
        L.given("zener.r_z", r"r_z", part.dynamic_resistance, "ohm", "Zener dynamic resistance",
                source=src)
        L.given("zener.i_zt", r"I_{ZT}", part.test_current, "A", "Zener test current",
                source=src)
    else:
        if z.voltage is None:
            L.calc("zener.v_nom", eq.IDENT, r"V_Z", "V",
                   "Zener voltage (nominal, standard value)", {"x": "zener.v_std"}, lambda x: x)
        else:
            L.given("zener.v_nom", r"V_Z", vz, "V", "Zener voltage (nominal)",
                    source="" if is_preferred(vz, "E24") else
                    "as written in the file; not an E24 value, check that it can be bought")
        record_fields(L, z, (
            ("zener.tol", r"t_Z", "tolerance", "%", "Zener voltage tolerance"),
            ("zener.tempco", r"\alpha_Z", "tempco", "%/degC", "Zener temperature coefficient"),
            ("zener.i_zk", r"I_{ZK}", "knee_current", "A", "Zener knee current"),
            ("zener.r_z", r"r_z", "dynamic_resistance", "ohm", "Zener dynamic resistance"),
            ("zener.i_zt", r"I_{ZT}", "test_current", "A", "Zener test current"),
        ))
    L.given("zener.k_zk", r"k_{ZK}", z.min_current_factor, "",
            "Minimum zener current as a multiple of I_ZK",
            defaulted="min_current_factor" not in explicit_z)

    voltage_window(L)
    L.calc("zener.v_knee_max", eq.ZENER_KNEE, r"V_{Z0,max}", "V",
           "Knee voltage of the zener model, upper extreme",
           {"v": "zener.v_max", "r": "zener.r_z", "i": "zener.i_zt"}, lambda v, r, i: v - r * i)
    L.calc("zener.v_knee_min", eq.ZENER_KNEE, r"V_{Z0,min}", "V",
           "Knee voltage of the zener model, lower extreme",
           {"v": "zener.v_min", "r": "zener.r_z", "i": "zener.i_zt"}, lambda v, r, i: v - r * i)
    if L["zener.v_knee_min"] <= 0:
        raise InfeasibleDesign(
            f"the zener's dynamic resistance ({L['zener.r_z']:g} ohm) times its test current "
            f"({L['zener.i_zt'] * 1e3:g} mA) exceeds its lowest voltage "
            f"({L['zener.v_min']:.2f} V): no such zener exists; check dynamic_resistance")
    L.calc("zener.i_min", eq.ZENER_IZMIN, r"I_{Z,min}", "A", "Minimum zener current",
           {"k": "zener.k_zk", "i": "zener.i_zk"}, lambda k, i: k * i)
    L.calc("regulator.v_in_min_needed", eq.SUM2, r"V_{in,min}", "V",
           "Input voltage needed at the trough", {"a": "zener.v_max", "b": "output.headroom"},
           lambda a, b: a + b)
    L.calc("regulator.i_in_design", eq.SUM2, r"I_{in}", "A",
           "Regulator input current at full load (design)",
           {"a": "output.i_max", "b": "zener.i_min"}, lambda a, b: a + b)
    L.calc("regulator.r_target", eq.ZENER_R, r"R_{target}", "ohm",
           "Series resistor if the trough sat exactly at the needed input voltage",
           {"v": "regulator.v_in_min_needed", "z": "zener.v_max", "l": "output.i_max",
            "i": "zener.i_min"},
           lambda v, z, l, i: (v - z) / (l + i))
    L.calc("regulator.ripple_in_allowed", eq.RIPPLE_THROUGH_DIVIDER, r"V_{r,in,out}", "V",
           "Input ripple the output ripple limit allows",
           {"o": "output.ripple_max", "R": "regulator.r_target", "z": "zener.r_z"},
           lambda o, R, z: o * (R + z) / z)


def _r_max(a: float, b: float, i: float, f: float, c: float) -> float:
    disc = b * b - 2 * i * f * c * a
    if a <= 0 or disc < 0 or b <= 0:
        return float("nan")
    return (b + math.sqrt(disc)) / (2 * i * f * c)


def size_zener(ctx: SizingContext, L: Ledger) -> None:
    spec = ctx.spec
    out = spec.output[0]
    L.calc("regulator.i_trough", eq.SUM2, r"I_T", "A", "Input current at the trough, full load",
           {"a": "output.i_max", "b": "zener.i_min"}, lambda a, b: a + b)
    if out.series_resistor is not None:
        L.given("zener.r", "R", out.series_resistor, "ohm", "Series resistor (fixed part)")
    else:
        L.calc("zener.a", eq.DIFF2, "a", "V", "Peak above the highest zener voltage (low line)",
               {"a": "reservoir.v_pk_low", "b": "zener.v_max"}, lambda a, b: a - b)
        L.calc("zener.b", eq.ZENER_B, "b", "A", "Auxiliary term b of the resistor quadratic",
               {"a": "zener.a", "f": "mains.ripple_freq", "c": "reservoir.c_min",
                "i": "regulator.i_trough"}, lambda a, f, c, i: a * f * c - i / 2)
        r_max = _r_max(L["zener.a"], L["zener.b"], L["regulator.i_trough"],
                       L["mains.ripple_freq"], L["reservoir.c_min"])
        if not math.isfinite(r_max) or r_max <= 0:
            raise InfeasibleDesign(
                f"at low line and full load the capacitor peaks at "
                f"{L['reservoir.v_pk_low']:.2f} V, too little to hold the zener "
                f"({L['zener.v_max']:.2f} V at its upper extreme) in regulation while it "
                f"supplies {L['regulator.i_trough'] * 1e3:.1f} mA; a larger secondary voltage "
                "is needed"
            )
        L.calc("zener.r_max_calc", eq.ZENER_R_EXACT, r"R_{max,calc}", "ohm",
               "Largest series resistor keeping I_Z,min at the trough (hand formula)",
               {"a": "zener.a", "b": "zener.b", "i": "regulator.i_trough",
                "f": "mains.ripple_freq", "c": "reservoir.c_min"}, _r_max)
        ceiling = ctx.floor(L, "resistor_ceiling", "zener.r_ceiling", r"R_{ceil}", "ohm",
                            "Series-resistor ceiling")
        if ceiling:
            L.calc("zener.r_max", eq.MIN2, r"R_{max}", "ohm", "Largest series resistor",
                   {"a": "zener.r_max_calc", "b": ceiling}, lambda a, b: min(a, b))
        else:
            L.calc("zener.r_max", eq.IDENT, r"R_{max}", "ohm", "Largest series resistor",
                   {"x": "zener.r_max_calc"}, lambda x: x)
        resistor = _library_resistor(ctx, L) if ctx.library is not None else None
        if resistor is not None:
            L.given("zener.r", "R", resistor.resistance, "ohm", "Series resistor",
                    source=f"library part {resistor.id}")
        else:
            L.calc("zener.r", eq.PREFERRED_DOWN, "R", "ohm",
                   "Series resistor (E24, rounded down)",
                   {"x": "zener.r_max"}, lambda x: preferred(x, "E24", "down"))

    # Low line, full load, lowest capacitance: the trough.
    L.calc("reservoir.ripple_low", eq.RIPPLE_WITH_R, r"V_{r,lo}", "V",
           "Ripple at low line, full load",
           {"v": "reservoir.v_pk_low", "z": "zener.v_max", "f": "mains.ripple_freq",
            "c": "reservoir.c_min", "R": "zener.r"},
           lambda v, z, f, c, R: (v - z) / (f * c * R + 0.5))
    L.calc("reservoir.valley_low", eq.VALLEY, r"V_{C,min}", "V",
           "Capacitor trough at low line, full load",
           {"p": "reservoir.v_pk_low", "r": "reservoir.ripple_low"}, lambda p, r: p - r)
    L.calc("regulator.headroom_low", eq.DIFF2, r"V_{R,min}", "V",
           "Drop across R at the trough (headroom)",
           {"a": "reservoir.valley_low", "b": "zener.v_max"}, lambda a, b: a - b)
    L.calc("zener.i_z_trough", eq.ZENER_CURRENT_AT, r"I_{Z,trough}", "A",
           "Zener current at the trough, low line, full load",
           {"v": "reservoir.valley_low", "z": "zener.v_max", "R": "zener.r", "l": "output.i_max"},
           lambda v, z, R, l: (v - z) / R - l)

    # High line, no load: the zener's worst case.
    L.calc("reservoir.ripple_high", eq.RIPPLE_WITH_R, r"V_{r,hi}", "V",
           "Ripple at high line (largest input current)",
           {"v": "reservoir.v_pk_high", "z": "zener.v_min", "f": "mains.ripple_freq",
            "c": "reservoir.c_min", "R": "zener.r"},
           lambda v, z, f, c, R: (v - z) / (f * c * R + 0.5))
    L.calc("reservoir.v_mean_high", eq.MEAN_FROM_PEAK, r"V_{C,mean,hi}", "V",
           "Mean capacitor voltage at high line",
           {"p": "reservoir.v_pk_high", "r": "reservoir.ripple_high"}, lambda p, r: p - r / 2)
    L.calc("regulator.i_in_max", eq.INPUT_CURRENT, r"I_{in,max}", "A",
           "Regulator input current at high line",
           {"v": "reservoir.v_mean_high", "z": "zener.v_min", "R": "zener.r"},
           lambda v, z, R: (v - z) / R)
    L.calc("zener.i_z_max", eq.DIFF2, r"I_{Z,max}", "A",
           "Zener current at high line, least load",
           {"a": "regulator.i_in_max", "b": "output.i_min_worst"}, lambda a, b: a - b)
    L.calc("zener.p", eq.POWER_VI, r"P_{Z,max}", "W",
           "Zener dissipation, initial estimate (hand formula)",
           {"v": "zener.v_max", "i": "zener.i_z_max"}, lambda v, i: v * i)
    L.calc("zener.r_p", eq.POWER_V2R, r"P_{R,max}", "W",
           "Series-resistor dissipation, initial estimate (hand formula)",
           {"a": "reservoir.v_mean_high", "b": "zener.v_min", "R": "zener.r"},
           lambda a, b, R: (a - b) ** 2 / R)
    L.calc("output.ripple", eq.DIVIDER, r"V_{r,out}", "V",
           "Output ripple at high line, initial estimate",
           {"v": "reservoir.ripple_high", "z": "zener.r_z", "R": "zener.r"},
           lambda v, z, R: v * z / (R + z))

    # Ratings: fixed parts are taken, others rounded to the next standard class.
    record_power_deratings(ctx, L)
    L.calc("zener.p_rating_needed", eq.DERATED_NEED, r"P_{Z,rated,req}", "W",
           "Zener power rating needed", {"x": "zener.p", "k": "margins.zener_power"},
           lambda x, k: x / k)
    L.calc("zener.r_p_rating_needed", eq.DERATED_NEED, r"P_{R,rated,req}", "W",
           "Resistor power rating needed", {"x": "zener.r_p", "k": "margins.resistor_power"},
           lambda x, k: x / k)
    zener_rating(ctx, L, "zener.p_rating_needed")
    rpick = ctx.picks.get("R1")
    if rpick is not None and rpick.part is not None:
        L.given("zener.r_p_rating", r"P_{R,rated}", rpick.part.power, "W",
                "Resistor power rating", source=f"library part {rpick.part.id}")
    elif out.resistor_power is not None:
        L.given("zener.r_p_rating", r"P_{R,rated}", out.resistor_power, "W",
                "Resistor power rating (fixed)")
        ctx.picks["R1"] = Pick("R1", "resistor", "fixed", reason="given in the file")
    else:
        pick_power_class(L, "zener.r_p_rating", r"P_{R,rated}", "Resistor power rating (standard class)",
              with_floor(ctx, L, "resistor_power", "zener.r_p_rating_needed",
                          "zener.r_p_floor", r"P_{R,floor}", "Resistor rating floor"),
              standards.RESISTOR_POWERS, "series resistor")
        ctx.picks["R1"] = Pick("R1", "resistor", "fixed" if out.series_resistor else "sized",
                               reason="E24 value at or below the largest allowed; "
                               "standard power class")
    L.calc("zener.p_allowed", eq.SCALE, r"P_{Z,allow}", "W", "Zener dissipation allowed (derated)",
           {"v": "zener.p_rating_amb", "k": "margins.zener_power"}, lambda v, k: v * k)
    self_heating(L)
    L.calc("zener.r_p_allowed", eq.SCALE, r"P_{R,allow}", "W",
           "Resistor dissipation allowed (derated)",
           {"v": "zener.r_p_rating", "k": "margins.resistor_power"}, lambda v, k: v * k)

    rp = ctx.picks.get("R1")
    if rp is not None and rp.part is not None:
        L.given("zener.r_tol", r"t_R", rp.part.tolerance, "%", "Series-resistor tolerance",
                source=f"library part {rp.part.id}")
    else:
        L.given("zener.r_tol", r"t_R", out.resistor_tolerance, "%", "Series-resistor tolerance",
                defaulted="resistor_tolerance" not in out.model_fields_set)


def _library_resistor(ctx: SizingContext, L: Ledger):
    """Series resistor from the library: E-series value at or below R_max, power from the
    estimate at high line (raised by the verification floor when one is set)."""
    from ..parts.select import select_resistor

    spec = ctx.spec
    est = (L["reservoir.v_pk_high"] - L["zener.v_min"]) ** 2 / L["zener.r_max"]
    power = max(est, ctx.floors.resistor_power * spec.margins.resistor_power_derating)
    sel = select_resistor(ctx.library.resistors, resistance=L["zener.r_max"], mode="down",
                          power=power, power_derating=spec.margins.resistor_power_derating)
    part = require(sel, "series resistor")
    ctx.picks["R1"] = Pick("R1", "resistor", "library", part, sel.reason, sel.generic)
    return part


