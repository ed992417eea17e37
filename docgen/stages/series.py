"""Series regulators and the unregulated output: three-terminal (fixed or adjustable),
zener-referenced emitter follower, and none (the reservoir voltage is the output).

A series regulator draws about its load current plus a small bias at any input voltage, so the
reservoir ripple follows from a constant current; it needs its dropout at the ripple trough and
dissipates the input-output difference times the load current.
"""

from __future__ import annotations

from .. import equations as eq
from ..errors import InfeasibleDesign
from ..parts.eseries import preferred
from ..trace import Ledger
from .context import Pick, SizingContext, record_fields

TITLE = "Regulator"


def record_output(ctx: SizingContext, L: Ledger) -> None:
    """The output requirements every regulator kind reads."""
    spec = ctx.spec
    out = spec.output[0]
    env = spec.environment
    explicit = out.model_fields_set
    L.given("output.v_nom", r"V_{out}", out.voltage, "V", "Nominal output voltage")
    L.given("output.tolerance", r"t_{out}", out.tolerance, "%", "Output voltage tolerance",
            defaulted="tolerance" not in explicit)
    L.given("output.i_max", r"I_{L,max}", out.load_max, "A", "Maximum load current")
    L.given("output.i_min", r"I_{L,min}", out.load_min, "A", "Minimum load current (connected)",
            defaulted="load_min" not in explicit)
    L.given("output.i_min_worst", r"I_{L,least}",
            0.0 if out.load_can_disconnect else out.load_min, "A",
            "Least load current", source="load can be disconnected"
            if out.load_can_disconnect else "load_min")
    L.given("output.ripple_max", r"V_{r,out,max}", out.ripple_max, "V",
            "Output ripple limit (peak to peak)")
    L.given("env.t_max", r"T_{A,max}", env.ambient_max, "degC", "Highest ambient temperature",
            defaulted="ambient_max" not in env.model_fields_set)
    L.given("env.t_min", r"T_{A,min}", env.ambient_min, "degC", "Lowest ambient temperature",
            defaulted="ambient_min" not in env.model_fields_set)
    L.calc("output.v_upper_limit", eq.BOUND_HIGH, r"V_{out,hi,lim}", "V", "Output upper limit",
           {"x": "output.v_nom", "t": "output.tolerance"}, lambda x, t: x * (1 + t))
    L.calc("output.v_lower_limit", eq.BOUND_LOW, r"V_{out,lo,lim}", "V", "Output lower limit",
           {"x": "output.v_nom", "t": "output.tolerance"}, lambda x, t: x * (1 - t))


def _ic(ctx: SizingContext, L: Ledger):
    """Three-terminal regulator data: from the library part, or the file's typical figures."""
    spec = ctx.spec
    lin = spec.output[0].linear
    kind = spec.output[0].regulator
    part = None
    if lin.part:
        part = ctx.fixed_part("regulator", lin.part, "output[0].linear.part")
        ctx.picks["U1"] = Pick("U1", "regulator", "fixed", part, f"{part.id} named in the file")
    elif ctx.library is not None:
        from ..parts.select import select_regulator

        sel = select_regulator(
            ctx.library.regulators, output_voltage=spec.output[0].voltage,
            current=spec.output[0].load_max, input_voltage_max=0.0 + 1e-3,
            kind="fixed" if kind == "three-terminal" else "adjustable")
        if sel.part is not None:
            part = sel.part
            ctx.picks["U1"] = Pick("U1", "regulator", "library", part, sel.reason, sel.generic)
    src = f"library part {part.id}" if part is not None else ""
    explicit = lin.model_fields_set

    def given(vid, sym, attr, lib_value, unit, title):
        if part is not None and lib_value is not None:
            L.given(vid, sym, lib_value, unit, title, source=src)
        else:
            L.given(vid, sym, getattr(lin, attr), unit, title, defaulted=attr not in explicit)

    p = part
    given("reg.dropout", r"V_{DO}", "dropout", p.dropout if p else None, "V", "Dropout voltage")
    given("reg.tol", r"t_{reg}", "tolerance", p.tolerance if p else None, "%",
          "Output / reference tolerance")
    given("reg.rr", r"RR", "ripple_rejection", p.ripple_rejection_db if p else None, "dB",
          "Ripple rejection")
    given("reg.v_in_max", r"V_{in,max}", "v_in_max",
          (p.v_in_max if p and p.v_in_max else None), "V", "Highest input voltage")
    given("reg.t_j_max", r"T_{J,max}", "t_j_max", p.t_j_max_c if p else None, "degC",
          "Maker's junction limit")
    given("reg.theta_jc", r"\theta_{JC}", "theta_jc", p.r_theta_jc if p else None, "K/W",
          "Junction-to-case")
    given("reg.theta_ja", r"\theta_{JA}", "theta_ja", p.r_theta_ja if p else None, "K/W",
          "Junction-to-ambient (no heat sink)")
    L.given("reg.theta_cs", r"\theta_{CS}", lin.theta_cs, "K/W", "Case-to-sink",
            defaulted="theta_cs" not in explicit)
    if kind == "three-terminal":
        given("reg.i_q", r"I_Q", "quiescent_current", p.i_q if p and p.i_q is not None else None,
              "A", "Quiescent (ground) current")
    else:
        given("reg.v_ref", r"V_{ref}", "reference", p.reference_voltage if p else None, "V",
              "Reference voltage")
        given("reg.i_adj", r"I_{ADJ}", "adjust_current",
              p.adjust_current if p and p.adjust_current is not None else None, "A",
              "Adjust-pin current")
        given("reg.i_min_load", r"I_{min}", "min_load",
              p.min_load_current if p and p.min_load_current is not None else None, "A",
              "Least load the regulator needs")
    return part


def needs_series(ctx: SizingContext, L: Ledger) -> None:
    spec = ctx.spec
    out = spec.output[0]
    kind = out.regulator
    record_output(ctx, L)
    if kind in ("three-terminal", "adjustable"):
        _ic(ctx, L)
        if kind == "adjustable":
            # divider: R1 from OUT to ADJ carries at least the minimum load current
            L.calc("reg.r1_max", eq.OHM, r"R_{1,max}", "ohm", "Largest R1 (OUT to ADJ)",
                   {"v": "reg.v_ref", "i": "reg.i_min_load"}, lambda v, i: v / i)
            L.calc("reg.r1", eq.PREFERRED_DOWN, r"R_1", "ohm", "R1 (E24, rounded down)",
                   {"x": "reg.r1_max"}, lambda x: preferred(x, "E24", "down"))
            L.calc("reg.r2_calc", eq.ADJ_R2, r"R_{2,calc}", "ohm", "R2 for the output voltage",
                   {"v": "output.v_nom", "r": "reg.v_ref", "a": "reg.r1", "i": "reg.i_adj"},
                   lambda v, r, a, i: (v - r) / (r / a + i))
            L.calc("reg.r2", eq.PREFERRED_E96, r"R_2", "ohm", "R2 (E96, nearest)",
                   {"x": "reg.r2_calc"}, lambda x: preferred(x, "E96", "nearest"))
            L.calc("reg.v_out", eq.ADJ_VOUT, r"V_{out,set}", "V", "Output voltage as set",
                   {"r": "reg.v_ref", "a": "reg.r1", "b": "reg.r2", "i": "reg.i_adj"},
                   lambda r, a, b, i: r * (1 + b / a) + i * b)
            L.calc("reg.i_q", eq.OHM, r"I_Q", "A", "Divider current drawn by the regulator",
                   {"v": "reg.v_ref", "i": "reg.r1"}, lambda v, i: v / i)
        else:
            L.calc("reg.v_out", eq.IDENT, r"V_{out,set}", "V", "Output voltage as set",
                   {"x": "output.v_nom"}, lambda x: x)
        L.calc("reg.v_out_max", eq.BOUND_HIGH, r"V_{out,max}", "V", "Highest output voltage",
               {"x": "reg.v_out", "t": "reg.tol"}, lambda x, t: x * (1 + t))
        L.calc("reg.v_out_min", eq.BOUND_LOW, r"V_{out,min}", "V", "Lowest output voltage",
               {"x": "reg.v_out", "t": "reg.tol"}, lambda x, t: x * (1 - t))
        L.calc("regulator.v_in_min_needed", eq.SUM2, r"V_{in,min}", "V",
               "Input needed at the trough (output plus dropout)",
               {"a": "reg.v_out_max", "b": "reg.dropout"}, lambda a, b: a + b)
        L.calc("regulator.i_in_design", eq.SUM2, r"I_{in}", "A",
               "Regulator input current at full load", {"a": "output.i_max", "b": "reg.i_q"},
               lambda a, b: a + b)
        L.calc("regulator.ripple_in_allowed", eq.RIPPLE_RR_ALLOWED, r"V_{r,in,out}", "V",
               "Input ripple the output ripple limit allows",
               {"o": "output.ripple_max", "r": "reg.rr"}, lambda o, r: o * 10 ** (r / 20))
    elif kind == "follower":
        _follower_needs(ctx, L)
    else:  # none
        L.calc("regulator.v_in_min_needed", eq.IDENT, r"V_{in,min}", "V",
               "Reservoir trough needed (lowest output allowed)", {"x": "output.v_lower_limit"},
               lambda x: x)
        L.calc("regulator.i_in_design", eq.IDENT, r"I_{in}", "A", "Load current at full load",
               {"x": "output.i_max"}, lambda x: x)
        L.calc("regulator.ripple_in_allowed", eq.IDENT, r"V_{r,in,out}", "V",
               "Ripple allowed at the output", {"x": "output.ripple_max"}, lambda x: x)


def _follower_needs(ctx: SizingContext, L: Ledger) -> None:
    spec = ctx.spec
    out = spec.output[0]
    z = out.zener
    q = out.transistor
    record_fields(L, q, (
        ("q.v_be", r"V_{BE}", "v_be", "V", "Base-emitter voltage"),
        ("q.h_fe", r"\beta_{min}", "h_fe_min", "", "Least current gain"),
        ("q.t_j_max", r"T_{J,max}", "t_j_max", "degC", "Maker's junction limit"),
        ("q.theta_jc", r"\theta_{JC}", "theta_jc", "K/W", "Junction-to-case"),
        ("q.theta_ja", r"\theta_{JA}", "theta_ja", "K/W", "Junction-to-ambient"),
        ("q.theta_cs", r"\theta_{CS}", "theta_cs", "K/W", "Case-to-sink"),
    ))
    L.calc("zener.v_nom", eq.SUM2, r"V_Z", "V", "Zener voltage (output plus V_BE)",
           {"a": "output.v_nom", "b": "q.v_be"}, lambda a, b: a + b)
    record_fields(L, z, (
        ("zener.tol", r"t_Z", "tolerance", "%", "Zener voltage tolerance"),
        ("zener.i_zk", r"I_{ZK}", "knee_current", "A", "Zener knee current"),
        ("zener.k_zk", r"k_{ZK}", "min_current_factor", "", "Minimum zener current factor"),
        ("zener.r_z", r"r_z", "dynamic_resistance", "ohm", "Zener dynamic resistance"),
    ))
    L.given("output.headroom", r"V_{hr}", out.headroom, "V", "Headroom across R1 at the trough",
            defaulted="headroom" not in out.model_fields_set)
    L.calc("zener.v_max", eq.BOUND_HIGH, r"V_{Z,max}", "V", "Highest zener voltage",
           {"x": "zener.v_nom", "t": "zener.tol"}, lambda x, t: x * (1 + t))
    L.calc("zener.v_min", eq.BOUND_LOW, r"V_{Z,min}", "V", "Lowest zener voltage",
           {"x": "zener.v_nom", "t": "zener.tol"}, lambda x, t: x * (1 - t))
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
    L.calc("output.v_max_est", eq.DIFF2, r"V_{out,max}", "V", "Highest output voltage",
           {"a": "zener.v_max", "b": "q.v_be"}, lambda a, b: a - b)
    L.calc("output.v_min_est", eq.DIFF2, r"V_{out,min}", "V", "Lowest output voltage",
           {"a": "zener.v_min", "b": "q.v_be"}, lambda a, b: a - b)


def input_current_high(ctx: SizingContext, L: Ledger) -> None:
    """Largest regulator input current: constant for a series regulator or a plain output."""
    L.calc("regulator.i_in_high_est", eq.IDENT, r"I_{in,hi,est}", "A",
           "Regulator input current at high line (constant)", {"x": "regulator.i_in_design"},
           lambda x: x)


def size_series(ctx: SizingContext, L: Ledger) -> None:
    spec = ctx.spec
    kind = spec.output[0].regulator
    L.calc("regulator.i_trough", eq.IDENT, r"I_T", "A", "Input current at the trough",
           {"x": "regulator.i_in_design"}, lambda x: x)
    L.calc("regulator.i_in_max", eq.IDENT, r"I_{in,max}", "A", "Largest input current",
           {"x": "regulator.i_in_design"}, lambda x: x)
    for tag in ("low", "high"):
        L.calc(f"reservoir.ripple_{tag}", eq.RIPPLE, rf"V_{{r,{'lo' if tag == 'low' else 'hi'}}}",
               "V", f"Ripple at {tag} line", {"i": "regulator.i_in_design",
                                              "f": "mains.ripple_freq", "c": "reservoir.c_min"},
               lambda i, f, c: i / (f * c))
    L.calc("reservoir.valley_low", eq.VALLEY, r"V_{C,min}", "V",
           "Capacitor trough at low line, full load",
           {"p": "reservoir.v_pk_low", "r": "reservoir.ripple_low"}, lambda p, r: p - r)
    L.calc("reservoir.v_mean_high", eq.MEAN_FROM_PEAK, r"V_{C,mean,hi}", "V",
           "Mean capacitor voltage at high line",
           {"p": "reservoir.v_pk_high", "r": "reservoir.ripple_high"}, lambda p, r: p - r / 2)
    if L["reservoir.valley_low"] <= 0:
        raise InfeasibleDesign("the reservoir is emptied every cycle at low line: the ripple "
                               "exceeds the peak voltage; the capacitor is far too small")
    if kind in ("three-terminal", "adjustable"):
        L.calc("reg.p_hand", eq.REG_POWER, r"P_{reg}", "W",
               "Regulator dissipation at high line, full load (hand)",
               {"v": "reservoir.v_mean_high", "o": "reg.v_out_min", "i": "output.i_max",
                "q": "reg.i_q"}, lambda v, o, i, q: (v - o) * i + v * q)
        _thermal(ctx, L, "reg", "U1", "regulator")
        ctx.picks.setdefault("U1", Pick("U1", "regulator", "sized",
                                        reason="typical three-terminal regulator figures"))
    elif kind == "follower":
        _size_follower(ctx, L)


def _size_follower(ctx: SizingContext, L: Ledger) -> None:
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
    L.calc("zener.p", eq.POWER_VI, r"P_{Z,max}", "W", "Zener dissipation, worst case",
           {"v": "zener.v_max", "i": "zener.i_z_max"}, lambda v, i: v * i)
    L.calc("zener.r_p", eq.POWER_V2R, r"P_{R1,max}", "W", "R1 dissipation, worst case",
           {"a": "reservoir.v_mean_high", "b": "zener.v_min", "R": "zener.r"},
           lambda a, b, R: (a - b) ** 2 / R)
    from .. import standards

    m = ctx.spec.margins
    L.given("margins.zener_power", r"k_{Z,P}", m.zener_power_derating, "%",
            "Zener power derating", defaulted="zener_power_derating" not in m.model_fields_set)
    L.given("margins.resistor_power", r"k_{R,P}", m.resistor_power_derating, "%",
            "Resistor power derating",
            defaulted="resistor_power_derating" not in m.model_fields_set)
    for vid, need, steps, sym in (("zener.p_rating", "zener.p", standards.ZENER_POWERS,
                                   r"P_{Z,rated}"),
                                  ("zener.r_p_rating", "zener.r_p", standards.RESISTOR_POWERS,
                                   r"P_{R1,rated}")):
        k = "margins.zener_power" if vid.startswith("zener.p") else "margins.resistor_power"
        L.calc(vid + "_calc", eq.DERATED_NEED, sym.replace("rated", "calc"), "W",
               "Rating needed (hand formula)", {"x": need, "k": k}, lambda x, k: x / k)
        fname = "zener_power" if vid == "zener.p_rating" else "resistor_power"
        floor = ctx.floor(L, fname, vid + "_floor", sym.replace("rated", "floor"), "W",
                          "Rating floor")
        if floor:
            L.calc(vid + "_needed", eq.MAX2, sym.replace("rated", "req"), "W", "Rating needed",
                   {"a": vid + "_calc", "b": floor}, lambda a, b: max(a, b))
        else:
            L.calc(vid + "_needed", eq.IDENT, sym.replace("rated", "req"), "W", "Rating needed",
                   {"x": vid + "_calc"}, lambda x: x)
        L.calc(vid, eq.PICKED, sym, "W", "Rating (standard class)", {"x": vid + "_needed"},
               lambda x, s=steps: standards.next_at_or_above(x, s))
        L.calc(vid.replace("rating", "allowed"), eq.SCALE, sym.replace("rated", "allow"), "W",
               "Dissipation allowed (derated)", {"v": vid, "k": k}, lambda v, k: v * k)
    L.calc("q.v_ce_max", eq.DIFF2, r"V_{CE,max}", "V", "Largest collector-emitter voltage",
           {"a": "reservoir.v_max", "b": "output.v_min_est"}, lambda a, b: a - b)
    L.calc("q.v_ce_hand", eq.DIFF2, r"V_{CE,hi}", "V", "Collector-emitter voltage at high line",
           {"a": "reservoir.v_mean_high", "b": "output.v_min_est"}, lambda a, b: a - b)
    L.calc("q.p_hand", eq.POWER_VI, r"P_Q", "W", "Pass transistor dissipation (high line, hand)",
           {"v": "q.v_ce_hand", "i": "output.i_max"}, lambda v, i: v * i)
    _thermal(ctx, L, "q", "Q1", "pass transistor")
    ctx.picks["DZ1"] = Pick("DZ1", "zener", "sized", reason="standard power class")
    ctx.picks["R1"] = Pick("R1", "resistor", "sized", reason="E24 value at or below the largest")
    ctx.picks.setdefault("Q1", Pick("Q1", "transistor", "sized",
                                    reason="typical power-transistor figures"))


def _thermal(ctx: SizingContext, L: Ledger, p: str, ref: str, what: str) -> None:
    """Junction temperature without a heat sink; the heat sink needed when that is too hot."""
    m = ctx.spec.margins
    L.given("margins.t_j_design", r"T_{J,design}", m.junction_max, "degC",
            "Highest junction temperature allowed by the design",
            defaulted="junction_max" not in m.model_fields_set)
    floor = ctx.floor(L, "heat_power", f"{p}.p_floor", r"P_{floor}", "W",
                      "Dissipation floor for the heat budget")
    if floor:
        L.calc(f"{p}.p_design", eq.MAX2, r"P_{design}", "W", "Dissipation the heat budget uses",
               {"a": f"{p}.p_hand", "b": floor}, lambda a, b: max(a, b))
    else:
        L.calc(f"{p}.p_design", eq.IDENT, r"P_{design}", "W", "Dissipation the heat budget uses",
               {"x": f"{p}.p_hand"}, lambda x: x)
    L.calc(f"{p}.t_j_bare", eq.JUNCTION_BARE, r"T_{J,bare}", "degC",
           f"Junction temperature of the {what} without a heat sink",
           {"t": "env.t_max", "p": f"{p}.p_design", "r": f"{p}.theta_ja"},
           lambda t, p, r: t + p * r)
    if L[f"{p}.t_j_bare"] <= L["margins.t_j_design"]:
        return
    L.calc(f"{p}.theta_sa_needed", eq.HEATSINK_NEEDED, r"\theta_{SA,req}", "K/W",
           f"Heat-sink thermal resistance needed for the {what}",
           {"j": "margins.t_j_design", "t": "env.t_max", "p": f"{p}.p_design",
            "c": f"{p}.theta_jc", "s": f"{p}.theta_cs"},
           lambda j, t, p, c, s: (j - t) / p - c - s)
    if L[f"{p}.theta_sa_needed"] <= 0.05:
        raise InfeasibleDesign(
            f"the {what} dissipates {L[f'{p}.p_design']:.1f} W: no heat sink keeps its junction "
            f"below {L['margins.t_j_design']:g} degC at {L['env.t_max']:g} degC ambient")
    sink = None
    if ctx.library is not None:
        from ..parts.select import select_heatsink

        sel = select_heatsink(ctx.library.heatsinks, r_theta_sa=L[f"{p}.theta_sa_needed"])
        sink = sel.part
        if sink is not None:
            ctx.picks["HS1" if ref == "U1" else "HS2"] = Pick(
                "HS1" if ref == "U1" else "HS2", "heatsink", "library", sink, sel.reason)
    if sink is not None:
        L.given(f"{p}.theta_sa", r"\theta_{SA}", sink.r_theta_sa, "K/W", "Heat sink",
                source=f"library part {sink.id}")
    else:
        L.calc(f"{p}.theta_sa", eq.IDENT, r"\theta_{SA}", "K/W",
               "Heat sink (generic: at most this thermal resistance)",
               {"x": f"{p}.theta_sa_needed"}, lambda x: x)
        ref_hs = "HS1" if ref == "U1" else "HS2"
        ctx.picks[ref_hs] = Pick(ref_hs, "heatsink", "sized",
                                 reason="thermal resistance from the junction budget")


def thermal_chain(L: Ledger, p: str) -> float:
    if f"{p}.theta_sa" in L:
        return L[f"{p}.theta_jc"] + L[f"{p}.theta_cs"] + L[f"{p}.theta_sa"]
    return L[f"{p}.theta_ja"]
