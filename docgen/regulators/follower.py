"""Zener-referenced emitter follower: R1 feeds a zener holding the base of an NPN pass
transistor; the output is the zener voltage less V_BE.

R1 must pass the minimum zener current plus the largest base current at the ripple trough; the
transistor dissipates the input-output difference times the load current. Follower relations
after R. Roscoe, 6.101 Introductory Analog Electronics Laboratory course notes, MIT
OpenCourseWare, Spring 2007, section 10.2.3, Eqs. 10.40-10.41.
"""

from __future__ import annotations

import math

import numpy as np

from .. import equations as eq
from .. import standards
from ..errors import InfeasibleDesign
from ..parts.eseries import preferred
from ..stages.context import Pick, SizingContext, record_fields
from ..trace import Caution, Ledger
from ..verify.checks import COMMON_CHECKS, OUTPUT_HIGH, OUTPUT_LOW, OUTPUT_RIPPLE, EngineCheck
from . import rules
from .base import Regulator, record_output, series_ripple
from .thermal import junction_limit_check, size_heat_budget, thermal_chain
from .zener import (
    RESISTOR_POWER,
    ZENER_CURRENT,
    ZENER_POWER,
    bias_floor,
    resistor_axis,
    zener_floors,
    zener_resistor_bom,
)

TITLE = "Emitter-follower regulator"
INTRO = ("A zener fed through R1 holds the base of an NPN pass transistor; the output is the "
         "zener voltage less V_BE. R1 must supply the minimum zener current plus the largest "
         "base current at the ripple trough; the transistor dissipates the input-output "
         "difference times the load current.")


def size_needs(ctx: SizingContext, L: Ledger) -> None:
    spec = ctx.spec
    out = spec.output[0]
    z = out.zener
    q = out.transistor
    record_output(ctx, L)
    record_fields(L, q, (
        ("q.v_be", r"V_{BE}", "v_be", "V", "Base-emitter voltage"),
        ("q.h_fe", r"\beta_{min}", "h_fe_min", "", "Least current gain"),
        ("q.t_j_max", r"T_{J,max}", "t_j_max", "degC", "Maker's junction limit"),
        ("q.theta_jc", r"\theta_{JC}", "theta_jc", "K/W", "Junction-to-case"),
        ("q.theta_ja", r"\theta_{JA}", "theta_ja", "K/W", "Junction-to-ambient"),
        ("q.theta_cs", r"\theta_{CS}", "theta_cs", "K/W", "Case-to-sink"),
    ))
    L.calc("zener.v_target", eq.SUM2, r"V_{Z,target}", "V", "Zener voltage wanted (output plus "
           "V_BE)", {"a": "output.v_nom", "b": "q.v_be"}, lambda a, b: a + b)
    if z.voltage is not None:
        L.given("zener.v_nom", r"V_Z", z.voltage, "V", "Zener voltage (nominal)")
    else:
        from .zener_part import standard_voltage

        standard_voltage(ctx, L, "zener.v_target", lambda v: v - q.v_be)
        L.calc("zener.v_nom", eq.IDENT, r"V_Z", "V", "Zener voltage (nominal, standard value)",
               {"x": "zener.v_std"}, lambda x: x)
    L.calc("output.v_set", eq.DIFF2, r"V_{out,set}", "V",
           "Output voltage as set by the standard zener (V_Z - V_BE)",
           {"a": "zener.v_nom", "b": "q.v_be"}, lambda a, b: a - b)
    record_fields(L, z, (
        ("zener.tol", r"t_Z", "tolerance", "%", "Zener voltage tolerance"),
        ("zener.tempco", r"\alpha_Z", "tempco", "%/degC", "Zener temperature coefficient"),
        ("zener.i_zk", r"I_{ZK}", "knee_current", "A", "Zener knee current"),
        ("zener.k_zk", r"k_{ZK}", "min_current_factor", "", "Minimum zener current factor"),
        ("zener.r_z", r"r_z", "dynamic_resistance", "ohm", "Zener dynamic resistance"),
    ))
    L.given("output.headroom", r"V_{hr}", out.headroom, "V", "Headroom across R1 at the trough",
            defaulted="headroom" not in out.model_fields_set)
    from .zener_part import voltage_window

    voltage_window(L)
    L.calc("zener.i_min", eq.ZENER_IZMIN, r"I_{Z,min}", "A", "Minimum zener current",
           {"k": "zener.k_zk", "i": "zener.i_zk"}, lambda k, i: k * i)
    L.calc("q.i_b_max", eq.BASE_CURRENT, r"I_{B,max}", "A", "Largest base current",
           {"i": "output.i_max", "b": "q.h_fe"}, lambda i, b: i / (b + 1))
    L.calc("regulator.v_in_min_needed", eq.SUM2, r"V_{in,min}", "V",
           "Input needed at the trough", {"a": "zener.v_max", "b": "output.headroom"},
           lambda a, b: a + b)
    L.calc("q.i_r1", eq.SUM2, r"I_{R1}", "A", "Current R1 must pass at the trough",
           {"a": "zener.i_min", "b": "q.i_b_max"}, lambda a, b: a + b)
    L.calc("regulator.i_in_design", eq.SUM2, r"I_{in}", "A", "Input current at full load",
           {"a": "output.i_max", "b": "q.i_r1"}, lambda a, b: a + b)
    L.calc("regulator.r_target", eq.OHM, r"R_{1,target}", "ohm", "R1 at the needed trough",
           {"v": "output.headroom", "i": "q.i_r1"}, lambda v, i: v / i)
    L.calc("regulator.ripple_in_allowed", eq.RIPPLE_THROUGH_DIVIDER, r"V_{r,in,out}", "V",
           "Input ripple the output ripple limit allows",
           {"o": "output.ripple_max", "R": "regulator.r_target", "z": "zener.r_z"},
           lambda o, R, z: o * (R + z) / z)


def output_window(ctx: SizingContext, L: Ledger) -> None:
    """V_BE's extremes (temperature and load) and the output window with the zener's
    self-heating; after the heat budget, whose junction target bounds the hot V_BE."""
    q = ctx.spec.output[0].transistor
    explicit = q.model_fields_set
    L.given("q.v_be_tc", r"|\mathrm{d}V_{BE}/\mathrm{d}T|", q.v_be_tempco, "V/K",
            "V_BE temperature coefficient (magnitude)", defaulted="v_be_tempco" not in explicit)
    L.given("q.v_be_dec", r"\Delta V_{BE,dec}", q.v_be_per_decade, "V",
            "V_BE change per decade of current", defaulted="v_be_per_decade" not in explicit)
    L.given("q.dec_max", r"n_{dec,max}", q.load_decades_max, "",
            "Largest number of current decades taken", defaulted="load_decades_max" not in explicit)
    L.calc("q.decades", rules.CURRENT_DECADES, r"n_{dec}", "",
           "Decades of emitter current from full to least load",
           {"a": "output.i_max", "b": "output.i_min_worst", "c": "q.dec_max"},
           lambda a, b, c: min(math.log10(a / max(b, a * 10 ** -c)), c))
    # at the least load the transistor barely dissipates (junction near ambient); at full load
    # the junction is hot but the current is the one V_BE is given at
    L.calc("q.v_be_min", rules.VBE_MIN, r"V_{BE,min}", "V",
           "Least V_BE (least load at the hottest ambient, or full load hot)",
           {"v": "q.v_be", "k": "q.v_be_tc", "a": "env.t_max", "t": "q.t_j_target",
            "m": "q.v_be_dec", "n": "q.decades"},
           lambda v, k, a, t, m, n: v - max(abs(k) * max(a - 25.0, 0.0) + m * n,
                                            abs(k) * max(t - 25.0, 0.0)))
    L.calc("q.v_be_max", rules.VBE_MAX, r"V_{BE,max}", "V", "Largest V_BE (cold, full load)",
           {"v": "q.v_be", "k": "q.v_be_tc", "t": "env.t_min"},
           lambda v, k, t: v + abs(k) * max(25.0 - t, 0.0))
    L.calc("output.v_max_est", eq.DIFF2, r"V_{out,max}", "V", "Highest output voltage",
           {"a": "zener.v_max_hot", "b": "q.v_be_min"}, lambda a, b: a - b)
    L.calc("output.v_min_est", eq.DIFF2, r"V_{out,min}", "V", "Lowest output voltage",
           {"a": "zener.v_min_hot", "b": "q.v_be_max"}, lambda a, b: a - b)



def q_spec(ctx: SizingContext):
    return ctx.spec.output[0].transistor


def size_follower(ctx: SizingContext, L: Ledger) -> None:
    L.calc("q.r1_calc", eq.FOLLOWER_R1, r"R_{1,calc}", "ohm", "Largest base resistor (hand)",
           {"v": "reservoir.valley_low", "z": "zener.v_max", "i": "q.i_r1"},
           lambda v, z, i: (v - z) / i)
    ceiling = ctx.floor(L, "resistor_ceiling", "zener.r_ceiling", r"R_{ceil}", "ohm",
                        "Base-resistor ceiling")
    if ceiling:
        L.calc("q.r1_max", eq.MIN2, r"R_{1,max}", "ohm", "Largest base resistor",
               {"a": "q.r1_calc", "b": ceiling}, lambda a, b: min(a, b))
    else:
        L.calc("q.r1_max", eq.IDENT, r"R_{1,max}", "ohm", "Largest base resistor",
               {"x": "q.r1_calc"}, lambda x: x)
    if L["q.r1_max"] <= 0:
        raise InfeasibleDesign("the capacitor trough is below the zener voltage of the "
                               "follower: a larger secondary is needed")
    L.calc("zener.r", eq.PREFERRED_DOWN, r"R_1", "ohm", "Base resistor R1 (E24, rounded down)",
           {"x": "q.r1_max"}, lambda x: preferred(x, "E24", "down"))
    out = ctx.spec.output[0]
    L.given("zener.r_tol", r"t_R", out.resistor_tolerance, "%", "R1 tolerance",
            defaulted="resistor_tolerance" not in out.model_fields_set)
    L.calc("zener.i_z_max", eq.INPUT_CURRENT, r"I_{Z,max}", "A",
           "Zener current with no base current (high line, no load)",
           {"v": "reservoir.v_mean_high", "z": "zener.v_min", "R": "zener.r"},
           lambda v, z, R: (v - z) / R)
    L.calc("zener.p", eq.POWER_VI, r"P_{Z,max}", "W",
           "Zener dissipation, initial estimate (hand formula)",
           {"v": "zener.v_max", "i": "zener.i_z_max"}, lambda v, i: v * i)
    L.calc("zener.r_p", eq.POWER_V2R, r"P_{R1,max}", "W",
           "R1 dissipation, initial estimate (hand formula)",
           {"a": "reservoir.v_mean_high", "b": "zener.v_min", "R": "zener.r"},
           lambda a, b, R: (a - b) ** 2 / R)
    from .zener_part import record_power_deratings, self_heating, zener_rating

    record_power_deratings(ctx, L)

    L.calc("zener.p_rating_needed", eq.DERATED_NEED, r"P_{Z,rated,req}", "W",
           "Zener power rating needed", {"x": "zener.p", "k": "margins.zener_power"},
           lambda x, k: x / k)
    zener_rating(ctx, L, "zener.p_rating_needed")
    L.calc("zener.p_allowed", eq.SCALE, r"P_{Z,allow}", "W", "Zener dissipation allowed (derated)",
           {"v": "zener.p_rating_amb", "k": "margins.zener_power"}, lambda v, k: v * k)
    self_heating(L)
    vid, need, k, sym = "zener.r_p_rating", "zener.r_p", "margins.resistor_power", r"P_{R1,rated}"
    L.calc(vid + "_calc", eq.DERATED_NEED, sym.replace("rated", "calc"), "W",
           "Rating needed (hand formula)", {"x": need, "k": k}, lambda x, k: x / k)
    floor = ctx.floor(L, "resistor_power", vid + "_floor", sym.replace("rated", "floor"), "W",
                      "Rating floor")
    if floor:
        L.calc(vid + "_needed", eq.MAX2, sym.replace("rated", "req"), "W", "Rating needed",
               {"a": vid + "_calc", "b": floor}, lambda a, b: max(a, b))
    else:
        L.calc(vid + "_needed", eq.IDENT, sym.replace("rated", "req"), "W", "Rating needed",
               {"x": vid + "_calc"}, lambda x: x)
    L.calc(vid, eq.PICKED, sym, "W", "Rating (standard class)", {"x": vid + "_needed"},
           lambda x: standards.next_at_or_above(x, standards.RESISTOR_POWERS))
    L.calc("zener.r_p_allowed", eq.SCALE, r"P_{R1,allow}", "W",
           "Dissipation allowed (derated)", {"v": vid, "k": k}, lambda v, k: v * k)
    # the heat budget first: its junction target bounds the hot V_BE of the output window
    L.calc("q.v_ce_hand", eq.DIFF2, r"V_{CE,hi}", "V", "Collector-emitter voltage at high line",
           {"a": "reservoir.v_mean_high", "b": "output.v_set"}, lambda a, b: a - b)
    L.calc("q.p_hand", eq.POWER_VI, r"P_Q", "W",
           "Pass transistor dissipation at high line, initial estimate (hand formula)",
           {"v": "q.v_ce_hand", "i": "output.i_max"}, lambda v, i: v * i)
    size_heat_budget(ctx, L, "q", "Q1", "pass transistor")
    output_window(ctx, L)
    L.calc("q.v_ce_max", eq.DIFF2, r"V_{CE,max}", "V",
           "Largest collector-emitter voltage (high line, no load)",
           {"a": "reservoir.v_max", "b": "output.v_min_est"}, lambda a, b: a - b)
    if q_spec(ctx).v_ceo is not None:
        L.given("q.v_ceo", r"V_{CEO}", q_spec(ctx).v_ceo, "V", "Transistor V_CEO rating")
    # output shorted, no current limit: the base drive sets the current
    L.calc("q.i_sc", rules.SHORT_CURRENT, r"I_{sc}", "A",
           "Collector current with the output shorted (at least)",
           {"b": "q.h_fe", "v": "reservoir.v_mean_high", "e": "q.v_be", "r": "zener.r"},
           lambda b, v, e, r: (b + 1) * (v - e) / r)
    L.calc("q.p_sc", rules.SHORT_POWER, r"P_{sc}", "W",
           "Pass-transistor dissipation with the output shorted (at least)",
           {"v": "reservoir.v_mean_high", "i": "q.i_sc"}, lambda v, i: v * i)
    ctx.picks.setdefault("DZ1", Pick("DZ1", "zener", "sized", reason="standard power class"))
    ctx.picks["R1"] = Pick("R1", "resistor", "sized", reason="E24 value at or below the largest")
    ctx.picks.setdefault("Q1", Pick("Q1", "transistor", "sized",
                                    reason="typical power-transistor figures"))




class Follower(Regulator):
    kind = "follower"
    title = TITLE
    intro = INTRO
    load_model = ("the follower as its load current plus R1's design current while the "
                  "input stays above the zener voltage")
    not_covered = (
        "The pass transistor's safe operating area, including secondary breakdown at high "
        "collector-emitter voltage, is not checked: compare the operating points (highest "
        "V_CE at full load, and the short circuit) with the maker's SOA curve.",
        "Survival of an output short circuit is not checked (the follower has no current "
        "limit); see the caution.",
        "The transistor's current gain is taken at its least value; its fall at high current "
        "and low V_CE is not modelled.",
    )
    drawing = "follower"
    refs = ("R1", "DZ1", "Q1")
    writes = (*Regulator.writes, "zener.", "q.", "margins.zener_power",
              "margins.resistor_power", "margins.t_j_design")
    heat_sink = ("q", "HS2")
    corner_axis_names = ("zener voltage", "base resistor")
    engine_checks = (
        ZENER_CURRENT, ZENER_POWER, RESISTOR_POWER,
        EngineCheck("check.transistor_junction", "Pass-transistor junction <= junction limit",
                    "t_j", "max", "q.t_j_limit", r"T_J", "degC", "Q1",
                    "margins.junction_max"),
        OUTPUT_RIPPLE, OUTPUT_HIGH, OUTPUT_LOW, *COMMON_CHECKS)

    def needs(self, ctx, L):
        size_needs(ctx, L)

    def size(self, ctx, L):
        series_ripple(ctx, L)
        size_follower(ctx, L)

    def zener_axis(self, L):
        return [("V_Z low", L["zener.v_min_hot"]), ("V_Z high", L["zener.v_max_hot"])]

    def resistor_axis(self, L):
        return resistor_axis(L)

    def sample_axes(self, L, rng, n, temp):
        vz_nom, tz = L["zener.v_nom"], L["zener.tol"]
        alpha = L["zener.tempco"] if "zener.tempco" in L else 0.0
        rise = L["zener.p"] * L["zener.theta_ja"]  # self-heating at the initial estimate
        v_z = vz_nom * rng.uniform(1 - tz, 1 + tz, n) + alpha * vz_nom * (temp + rise - 25.0)
        r = L["zener.r"] * rng.uniform(1 - L["zener.r_tol"], 1 + L["zener.r_tol"], n)
        return v_z, r

    def circuit(self, L, pts, common):
        from .base import regulator_load

        # R1's current is taken at its design value (a small part of the input current).
        return regulator_load(L, common, pts, L["q.i_r1"], L["zener.v_min"])

    def output_wave(self, L, wave, load, v_z, r):
        # the zener node passes r_z / (R1 + r_z) of the input ripple; the base cannot rise
        # above the input
        v_c = wave["v_c"]
        k = L["zener.r_z"] / (r + L["zener.r_z"])
        return np.minimum(v_z + (v_c - v_c.mean()) * k, v_c) - L["q.v_be"]

    holdup_stop = ("the capacitor voltage where the output, following the input once the zener "
                   "has stopped conducting, reaches its lower limit (V_BE at its largest, the "
                   "base current drawn through R1)")
    regulation_note = ("The follower's output is modelled as the zener voltage of each corner "
                       "less a fixed V_BE, so these figures show only a loss of regulation at "
                       "the trough; the change of V_BE with load and of the zener voltage with "
                       "its current (r_z) are not in them.")

    def holdup_floor(self, L, pts):
        # R1 is sized so the zener just keeps its minimum current at the trough, so the
        # regulation itself ends almost at once; the output then follows the input
        return L["output.v_lower_limit"] + L["q.v_be_max"] + pts.r * pts.load / (L["q.h_fe"] + 1)

    def derived_metrics(self, L, pts, m):
        beta = L["q.h_fe"]
        i_b = pts.load / (beta + 1)
        out = {}
        i_r1 = (m["v_c_min"] - pts.v_z) / pts.r
        out["i_z_min"] = i_r1 - i_b
        i_r1_mean = (m["v_c_mean"] - pts.v_z) / pts.r
        out["p_zener"] = pts.v_z * np.maximum(i_r1_mean - i_b, 0.0)
        out["p_r_series"] = (m["v_c_mean"] - pts.v_z) ** 2 / pts.r
        v_out = pts.v_z - L["q.v_be"]
        # The base cannot rise above the input: a starved follower's output follows the trough.
        # The corners' zener voltages include self-heating; V_BE's spread (hot and light load /
        # cold and full load) widens the window as in the hand estimate.
        out["v_out_min"] = np.minimum(pts.v_z, m["v_c_min"]) - L["q.v_be_max"]
        out["v_out_max"] = np.minimum(pts.v_z, m["v_c_max"]) - L["q.v_be_min"]
        out["v_out_mean"] = np.minimum(pts.v_z, m["v_c_mean"]) - L["q.v_be"]
        out["p_q"] = (m["v_c_mean"] - v_out) * pts.load
        out["t_j"] = L["env.t_max"] + out["p_q"] * thermal_chain(L, "q")
        out["v_out_pp"] = m["ripple_pp"] * L["zener.r_z"] / (pts.r + L["zener.r_z"])
        out["p_out"] = v_out * pts.load
        return out

    def hand_checks(self, ctx, L, w):
        from ..verify.checks import make_check

        # the output window is checked at every corner (engine checks output_high/low)
        out = [
            junction_limit_check(L, "q", "Q1", "transistor", w),
        ]
        if "q.v_ceo" in L:
            out.append(make_check(L, "check.transistor_vce", "Collector-emitter voltage <= "
                                  "V_CEO", "q.v_ce_max", "q.v_ceo", "max", "high line, no load",
                                  w, ref="Q1", requirement="output[0].transistor.v_ceo"))
        return out

    def cautions(self, L):
        from ..units import format_quantity as fq

        budget = (L["q.t_j_limit"] - L["env.t_max"]) / thermal_chain(L, "q")
        return [Caution(
            "caution.follower_short", "No short-circuit protection on the follower",
            f"The emitter follower has no current limit. With the output shorted at high line "
            f"the base resistor drives at least {fq(L['q.i_sc'], 'A')} through Q1 "
            f"(least gain {L['q.h_fe']:g}), so Q1 dissipates at least "
            f"{fq(L['q.p_sc'], 'W')} at {fq(L['reservoir.v_mean_high'], 'V')} across it, "
            f"against the {fq(budget, 'W')} its heat budget carries at "
            f"{L['env.t_max']:g} degC, and it also sits far outside a typical safe operating "
            "area. docgen does not check survival of a short circuit: add a current limit "
            "(a sense resistor and a second transistor) or a fuse in the output, or accept "
            "that a short destroys Q1.",
            "power P = V_CE I_C with the emitter at ground; base drive after R. Roscoe, "
            "MIT OCW 6.101 (2007) sec. 10.2.3", triggered_by="q.p_sc")]

    def trough_short(self, v):
        # a zener starved of current at some corner: the trough is below what R1 needs
        return v.has("check.zener_current") and v.worst("check.zener_current")[0] < 0

    def raise_bias_floor(self, ctx, L, v):
        return bias_floor(ctx, L, v, "q.i_b_max")

    def raise_part_floors(self, ctx, L, v):
        from .three_terminal import junction_floor

        changed = zener_floors(ctx, L, v)
        return junction_floor(ctx, L, v, "check.transistor_junction", "p_q",
                              "q.t_j_limit") or changed

    def bom_lines(self, ctx, L, line, v):
        return zener_resistor_bom(L, line, v) + [
            line("Q1", "transistor", f"NPN {v('q.v_ce_max')}",
                 f"NPN power transistor, V_CEO at least {v('q.v_ce_max')}, I_C at least "
                 f"{v('output.i_max')}, h_FE at least {v('q.h_fe')}, SOA covering "
                 f"{v('q.v_ce_hand')} at {v('output.i_max')} (initial estimate at high line)"
                 + (f", dissipation {v('engine.transistor_power')} (verified)"
                    if "engine.transistor_power" in L else ""), ("q.v_ce_max",))]


KIND = Follower()
