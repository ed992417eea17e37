"""Protection: the primary fuse and the reservoir bleeder.

Runs after the engine, because the fuse is checked against the simulated operating current and
the switch-on surge.
"""

from __future__ import annotations

import math

from .. import equations as eq
from .. import standards
from ..errors import InfeasibleDesign
from ..parts.eseries import preferred
from ..topology import topology
from ..trace import Ledger
from .context import Pick, SizingContext

WRITES = ("fuse.", "bleeder.", "engine.i_sec_nominal", "engine.surge_i2t")
TITLE = "Protection"
INTRO = ("A time-lag (T) fuse in the live lead, rated from the transformer's primary current "
         "with a margin, must carry the simulated operating current plus the transformer's "
         "magnetising current and survive every switch-on: the charging pulses until the "
         "reservoir is full plus the magnetising inrush, within a derated share of its melting "
         "I2t. Its voltage rating is compared with the nominal mains voltage. A bleeder "
         "resistor discharges the reservoir below a safe voltage within the time the governing "
         "standard sets.")

# Typical no-load current of small EI mains transformers as a fraction of the rated primary
# current, by VA (common practice, from memory; toroids lower). Interpolated on log(VA).
MAGNETISING = ((1.0, 0.60), (3.0, 0.50), (10.0, 0.30), (30.0, 0.20), (100.0, 0.12),
               (500.0, 0.06))
# IEC 60127-2 standard sheet 3 (time-lag, low breaking capacity, 5 x 20 mm): the pre-arcing time
# at 10 I_N is at least 10 ms (from memory). The melting I2t at that gate is therefore at least
# (10 I_N)^2 x 10 ms = I_N^2 x 1 s; used when no melting I2t is known from a part.
GATE_MULTIPLE = 10.0
GATE_T_MIN = 0.010


def typical_magnetising(va: float) -> float:
    """No-load current over rated primary current from the MAGNETISING table (clamped)."""
    pts = MAGNETISING
    if va <= pts[0][0]:
        return pts[0][1]
    if va >= pts[-1][0]:
        return pts[-1][1]
    for (s0, r0), (s1, r1) in zip(pts, pts[1:], strict=False):
        if s0 <= va <= s1:
            w = (math.log(va) - math.log(s0)) / (math.log(s1) - math.log(s0))
            return r0 + w * (r1 - r0)
    raise AssertionError("unreachable")


def size_protection(ctx: SizingContext, L: Ledger, i_sec_nominal: float, surge) -> None:
    """Fuse from the engine's operating current and switch-on transient, then the bleeder.

    ``surge``: the CornerResult (its ``surge_i2t`` etc.), or a bare float I2t (secondary, A2s).
    """
    spec = ctx.spec
    _rated(L, spec)
    L.measured("engine.i_sec_nominal", eq.ENGINE, r"I_{sec,rms}", i_sec_nominal, "A",
               "Winding RMS current at nominal mains, full load (engine)",
               ("transformer.v_nl", "transformer.r_w", "reservoir.c"), "nominal mains, full load")
    topo = topology(spec.rectifier.topology)
    L.given("fuse.k_w", r"k_w", topo.winding_factor, "", "Winding factor",
            source=f"{topo.name} rectifier")
    L.calc("fuse.i_pri_load", eq.TURNS_REFLECT, r"I_{pri,load}", "A",
           "Primary RMS current of the rectifier load (engine, referred)",
           {"k": "fuse.k_w", "i": "engine.i_sec_nominal", "s": "transformer.v_nl",
            "p": "mains.v_nom"}, lambda k, i, s, p: k * i * s / p)
    _operating(L, spec, "fuse.i_pri_load")
    _switch_on_common(L, spec)
    if _engine_surge(L, surge):
        _i2t_total(L, "fuse.i2t_cap")
    choose_fuse(ctx, L)
    _bleeder(ctx, L)


def size_split_fuse(ctx: SizingContext, L: Ledger) -> None:
    """The one fuse of a split supply, from both rails (their values already in ``L``, the
    negative rail's with the prefix "neg."): both rails charge in the same half-cycles through
    the shared primary, so their primary currents and switch-on pulses add in phase (the sums
    below are upper bounds, exact for identical rails); the magnetising current counts once."""
    spec = ctx.spec
    _rated(L, spec)
    L.calc("fuse.i_pri_load_both", eq.SUM_RMS_BOUND, r"I_{pri,load,\pm}", "A",
           "Primary RMS current of both rails' rectifier load (upper bound)",
           {"a": "fuse.i_pri_load", "b": "neg.fuse.i_pri_load"}, lambda a, b: a + b)
    _operating(L, spec, "fuse.i_pri_load_both")
    _switch_on_common(L, spec)
    if "fuse.i2t_cap" in L and "neg.fuse.i2t_cap" in L:
        L.calc("fuse.i2t_cap_both", eq.I2T_SUM_BOUND, r"I^2t_{pri,C,\pm}", "A2s",
               "Charging transient I2t in the primary, both rails (upper bound)",
               {"a": "fuse.i2t_cap", "b": "neg.fuse.i2t_cap"},
               lambda a, b: (math.sqrt(a) + math.sqrt(b)) ** 2)
        _i2t_total(L, "fuse.i2t_cap_both")
    choose_fuse(ctx, L)


# Fuse values of one rail that a split supply's fuse reads; the rest it computes again.
SPLIT_INPUTS = ("fuse.k_w", "fuse.i_pri_load", "fuse.i2t_cap")


def _rated(L: Ledger, spec) -> None:
    pr = spec.protection
    L.given("fuse.k", r"k_F", pr.fuse_factor, "", "Fuse rating factor",
            defaulted="fuse_factor" not in pr.model_fields_set)
    L.calc("fuse.i_pri_rated", eq.PRIMARY_RATED, r"I_{pri,rated}", "A",
           "Rated primary current", {"s": "transformer.va", "v": "mains.v_nom"},
           lambda s, v: s / v)
    L.calc("fuse.need", eq.SCALE, r"I_{F,req}", "A", "Fuse rating needed",
           {"v": "fuse.i_pri_rated", "k": "fuse.k"}, lambda v, k: v * k)


def _operating(L: Ledger, spec, load_id: str) -> None:
    """Operating primary current: the rectifier load's plus the magnetising current."""
    tr = spec.transformer
    fixed_mag = tr.magnetising_current is not None
    L.given("fuse.k_mag", r"k_{mag}",
            tr.magnetising_current if fixed_mag else typical_magnetising(L["transformer.va"]),
            "%", "Magnetising current over rated primary current",
            defaulted=not fixed_mag,
            source="" if fixed_mag else "typical no-load current of a small EI transformer of "
            "this VA (common practice, from memory)")
    L.calc("fuse.i_mag", eq.SCALE, r"I_{mag}", "A", "Magnetising current (estimate)",
           {"v": "fuse.i_pri_rated", "k": "fuse.k_mag"}, lambda v, k: v * k)
    L.calc("fuse.i_pri", eq.SUM_RMS_BOUND, r"I_{pri,rms}", "A",
           "Primary RMS current in operation, magnetising current included (upper bound)",
           {"a": load_id, "b": "fuse.i_mag"}, lambda a, b: a + b)
    L.calc("fuse.i_pri_margin", eq.SCALE, r"I_{F,min}", "A",
           "Least fuse rating for the operating current", {"v": "fuse.i_pri", "k": "fuse.k"},
           lambda v, k: v * k)


def choose_fuse(ctx: SizingContext, L: Ledger) -> None:
    """The fixed part, else the library's smallest T fuse that meets every need, else the R10
    step (see rate_fuse)."""
    pr = ctx.spec.protection
    part = None
    if pr.fuse_part:
        part = ctx.fixed_part("fuse", pr.fuse_part, "protection.fuse_part")
        ctx.picks["F1"] = Pick("F1", "fuse", "fixed", part, f"{part.id} named in the file")
    elif ctx.library is not None:
        from ..parts.select import select_fuse

        sel = select_fuse(ctx.library.fuses, current=max(L["fuse.need"], L["fuse.i_pri_margin"]),
                          voltage=L["fuse.v_need"], characteristic="T",
                          i2t=L["fuse.i2t_need"] if "fuse.i2t_need" in L else None)
        if sel.part is not None:
            part = sel.part
            ctx.picks["F1"] = Pick("F1", "fuse", "library", part, sel.reason, sel.generic)
    rate_fuse(L, part)
    if part is None:
        ctx.picks["F1"] = Pick("F1", "fuse", "sized", reason=sized_reason(L))


def _switch_on_common(L: Ledger, spec) -> None:
    """Voltage need, pulse derating and the magnetising inrush estimate."""
    tr = spec.transformer
    L.given("fuse.v_need", r"V_{F,min}", L["mains.v_nom"], "V",
            "Voltage the fuse-link must be rated for",
            source="nominal mains voltage: a fuse-link's voltage rating is compared with the "
            "nominal system voltage (common practice; IEC 60127 ratings 125 V, 250 V)")
    L.given("fuse.k_pulse", r"k_{pulse}", spec.protection.pulse_derating, "%",
            "Share of the melting I2t allowed per switch-on",
            defaulted="pulse_derating" not in spec.protection.model_fields_set)
    L.given("fuse.k_inr", r"k_{inr}", tr.inrush_factor, "",
            "Magnetising inrush peak over rated primary current",
            defaulted="inrush_factor" not in tr.model_fields_set)
    L.calc("fuse.i2t_mag", eq.I2T_HALF_SINE, r"I^2t_{mag}", "A2s",
           "Magnetising inrush I2t, first half-cycle (estimate)",
           {"k": "fuse.k_inr", "i": "fuse.i_pri_rated", "f": "mains.freq"},
           lambda k, i, f: (k * i) ** 2 / (4.0 * f))


def _engine_surge(L: Ledger, surge) -> bool:
    """Record the engine's switch-on transient and refer it to the primary; False when the
    engine gave none (the fuse check then fails visibly, see evaluate.fuse_surge_check)."""
    i2t = getattr(surge, "surge_i2t", surge)
    if surge is None or not math.isfinite(i2t):
        return False
    where = "switch-on at the crest, high line, C +tol"
    first = getattr(surge, "surge_first_i2t", float("nan"))
    cycles = getattr(surge, "surge_cycles", float("nan"))
    if getattr(surge, "surge_corner", ""):
        where = f"switch-on at the crest, {surge.surge_corner}"
    if math.isfinite(cycles):
        where += (f"; charged after {cycles:.1f} mains periods"
                  if getattr(surge, "surge_settled", False) else
                  f"; stopped at the limit of {cycles:.1f} mains periods before the pulses "
                  "fell to 1.1 x the steady peak")
    inputs = ("transformer.v_nl", "transformer.r_w", "transformer.l_s", "reservoir.c")
    if math.isfinite(first):
        L.measured("engine.surge_i2t_first", eq.ENGINE_SWITCH_ON, r"I^2t_{sec,1}", first, "A2s",
                   "Switch-on I2t of the first pulse alone (engine)", inputs, where)
    L.measured("engine.surge_i2t", eq.ENGINE_SWITCH_ON, r"I^2t_{sec}", i2t, "A2s",
               "Switch-on I2t of the charging transient (engine)", inputs, where)
    L.calc("fuse.i2t_cap", eq.I2T_REFLECT, r"I^2t_{pri,C}", "A2s",
           "Charging transient I2t in the primary", {"i": "engine.surge_i2t",
                                                    "s": "transformer.v_nl", "p": "mains.v_nom"},
           lambda i, s, p: i * (s / p) ** 2)
    return True


def _i2t_total(L: Ledger, cap_id: str) -> None:
    """Charging and magnetising inrush added as coincident pulses (an upper bound), and the
    melting I2t that the pulse derating asks for."""
    L.calc("fuse.i2t_surge", eq.I2T_SUM_BOUND, r"I^2t_{pri}", "A2s",
           "Switch-on I2t in the primary, charging and magnetising inrush (upper bound)",
           {"a": cap_id, "b": "fuse.i2t_mag"},
           lambda a, b: (math.sqrt(a) + math.sqrt(b)) ** 2)
    L.calc("fuse.i2t_need", eq.I2T_NEED, r"I^2t_{F,req}", "A2s",
           "Melting I2t needed for repeated switch-on",
           {"x": "fuse.i2t_surge", "k": "fuse.k_pulse"}, lambda x, k: x / k)


def sized_reason(L: Ledger) -> str:
    """Which need set the sized fuse rating (said in the parts list)."""
    needs = {"k_F x rated primary current": L["fuse.need"],
             "k_F x operating primary current with the magnetising current":
                 L["fuse.i_pri_margin"],
             "the switch-on I2t (pulse-derated, least melting I2t of the IEC 60127-2 gate)":
                 L["fuse.need_i2t"]}
    top = max(needs, key=needs.get)
    return f"R10 step at or above {top}"


def rate_fuse(L: Ledger, part) -> None:
    """The fuse's rating and melting I2t: from the part, else the R10 step that meets every need
    (the rating, the operating current, the switch-on I2t at the IEC 60127-2 gate). Without a
    part's melting I2t the check uses the least value the standard's gate allows."""
    if part is not None:
        src = f"library part {part.id}"
        L.given("fuse.rating", r"I_N", part.current, "A", "Fuse rated current", source=src)
        L.given("fuse.i2t", r"I^2t_F", part.i2t, "A2s", "Fuse melting I2t", source=src)
        L.given("fuse.v_rating", r"V_F", part.voltage, "V", "Fuse voltage rating", source=src)
    else:
        L.given("fuse.t_gate", r"t_{10,min}", GATE_T_MIN, "s",
                "Least pre-arcing time at 10 I_N (time-lag T, 5 x 20 mm)",
                source="IEC 60127-2 standard sheet 3 (from memory)")
        if "fuse.i2t_need" in L:
            L.calc("fuse.need_i2t", eq.FUSE_RATING_FOR_I2T, r"I_{F,I^2t}", "A",
                   "Least rating whose gate I2t covers the switch-on need",
                   {"x": "fuse.i2t_need", "t": "fuse.t_gate"},
                   lambda x, t: math.sqrt(x / t) / GATE_MULTIPLE)
        else:
            L.given("fuse.need_i2t", r"I_{F,I^2t}", 0.0, "A", "Least rating for the switch-on "
                    "I2t (not known: the engine's switch-on transient did not converge)",
                    source="not covered")
        L.calc("fuse.rating_need", eq.LARGEST3, r"I_{F,req,max}", "A", "Largest of the needs",
               {"a": "fuse.need", "b": "fuse.i_pri_margin", "c": "fuse.need_i2t"},
               lambda a, b, c: max(a, b, c))
        if L["fuse.rating_need"] > standards.FUSE_RATINGS[-1]:
            raise InfeasibleDesign(
                f"the primary fuse needs {L['fuse.rating_need']:.3g} A (operating current or "
                f"switch-on I2t), above the largest miniature fuse rating "
                f"{standards.FUSE_RATINGS[-1]:g} A; use a soft-start or a larger fuse type")
        L.calc("fuse.rating", eq.PICKED, r"I_N", "A", "Fuse rated current (R10 step, T type)",
               {"x": "fuse.rating_need"},
               lambda x: standards.next_at_or_above(x, standards.FUSE_RATINGS))
        L.calc("fuse.i2t", eq.FUSE_I2T_GATE, r"I^2t_F", "A2s",
               "Fuse melting I2t (least the IEC 60127-2 gate allows)",
               {"i": "fuse.rating", "t": "fuse.t_gate"},
               lambda i, t: (GATE_MULTIPLE * i) ** 2 * t)
    L.calc("fuse.i2t_allowed", eq.PULSE_DERATED, r"I^2t_{F,pulse}", "A2s",
           "Switch-on I2t the fuse may see at each switch-on",
           {"k": "fuse.k_pulse", "x": "fuse.i2t"}, lambda k, x: k * x)


def _bleeder(ctx: SizingContext, L: Ledger) -> None:
    spec = ctx.spec
    pr = spec.protection
    ex = pr.model_fields_set
    wanted = pr.bleeder if pr.bleeder is not None else L["reservoir.v_max"] > pr.safe_voltage
    if not wanted:
        return
    L.given("bleeder.t", "t", pr.discharge_time, "s", "Discharge time allowed",
            defaulted="discharge_time" not in ex)
    target = pr.safe_voltage if L["reservoir.v_max"] > pr.safe_voltage else \
        0.1 * L["reservoir.v_max"]
    L.given("bleeder.v_safe", r"V_{safe}", target, "V", "Voltage to reach",
            defaulted="safe_voltage" not in ex,
            source="" if target == pr.safe_voltage else "10 % of the highest reservoir voltage "
            "(service safety; common practice)")
    L.calc("bleeder.c_max", eq.BOUND_HIGH, r"C_{max}", "F", "Largest capacitance",
           {"x": "reservoir.c", "t": "reservoir.tol"}, lambda x, t: x * (1 + t))
    L.calc("bleeder.r_max", eq.BLEEDER_R, r"R_{B,max}", "ohm", "Largest bleeder resistance",
           {"t": "bleeder.t", "c": "bleeder.c_max", "v": "reservoir.v_max",
            "s": "bleeder.v_safe"}, lambda t, c, v, s: t / (c * math.log(v / s)))
    L.calc("bleeder.r", eq.PREFERRED_DOWN, r"R_B", "ohm", "Bleeder resistor (E24, rounded down)",
           {"x": "bleeder.r_max"}, lambda x: preferred(x, "E24", "down"))
    L.calc("bleeder.time", eq.BLEEDER_T, r"t_B", "s", "Discharge time with the chosen resistor",
           {"r": "bleeder.r", "c": "bleeder.c_max", "v": "reservoir.v_max",
            "s": "bleeder.v_safe"}, lambda r, c, v, s: r * c * math.log(v / s))
    L.calc("bleeder.p", eq.POWER_V2, r"P_B", "W", "Bleeder dissipation (continuous)",
           {"v": "reservoir.v_max", "R": "bleeder.r"}, lambda v, R: v * v / R)
    L.given("bleeder.k", r"k_{R,P}", spec.margins.resistor_power_derating, "%",
            "Resistor power derating",
            defaulted="resistor_power_derating" not in spec.margins.model_fields_set)
    L.calc("bleeder.p_need", eq.DERATED_NEED, r"P_{B,req}", "W", "Bleeder rating needed",
           {"x": "bleeder.p", "k": "bleeder.k"}, lambda x, k: x / k)
    L.calc("bleeder.p_rating", eq.PICKED, r"P_{B,rated}", "W", "Bleeder power rating (class)",
           {"x": "bleeder.p_need"},
           lambda x: standards.next_at_or_above(x, standards.RESISTOR_POWERS))
    ctx.picks["R9"] = Pick("R9", "resistor", "sized",
                           reason="E24 value at or below the largest for the discharge time")
