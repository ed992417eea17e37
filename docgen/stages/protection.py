"""Protection: the primary fuse and the reservoir bleeder.

Runs after the engine, because the fuse is checked against the simulated operating current and
the switch-on surge.
"""

from __future__ import annotations

import math

from .. import equations as eq
from .. import standards
from ..parts.eseries import preferred
from ..topology import topology
from ..trace import Ledger
from .context import Pick, SizingContext

WRITES = ("fuse.", "bleeder.", "engine.i_sec_nominal", "engine.surge_i2t")
TITLE = "Protection"
INTRO = ("A time-lag (T) fuse in the live lead, rated from the transformer's primary current "
         "with a margin, must carry the simulated operating current and survive the switch-on "
         "surge. A bleeder resistor discharges the reservoir below a safe voltage within the "
         "time the governing standard sets.")


def size_protection(ctx: SizingContext, L: Ledger, i_sec_nominal: float, i2t_sec: float) -> None:
    spec = ctx.spec
    pr = spec.protection
    ex = pr.model_fields_set
    L.given("fuse.k", r"k_F", pr.fuse_factor, "", "Fuse rating factor",
            defaulted="fuse_factor" not in ex)
    L.calc("fuse.i_pri_rated", eq.PRIMARY_RATED, r"I_{pri,rated}", "A",
           "Rated primary current", {"s": "transformer.va", "v": "mains.v_nom"},
           lambda s, v: s / v)
    L.calc("fuse.need", eq.SCALE, r"I_{F,req}", "A", "Fuse rating needed",
           {"v": "fuse.i_pri_rated", "k": "fuse.k"}, lambda v, k: v * k)
    L.measured("engine.i_sec_nominal", eq.ENGINE, r"I_{sec,rms}", i_sec_nominal, "A",
               "Winding RMS current at nominal mains, full load (engine)",
               ("transformer.v_nl", "transformer.r_w", "reservoir.c"), "nominal mains, full load")
    topo = topology(spec.rectifier.topology)
    L.given("fuse.k_w", r"k_w", topo.winding_factor, "", "Winding factor",
            source=f"{topo.name} rectifier")
    L.calc("fuse.i_pri", eq.TURNS_REFLECT, r"I_{pri,rms}", "A",
           "Primary RMS current in operation (engine, referred)",
           {"k": "fuse.k_w", "i": "engine.i_sec_nominal", "s": "transformer.v_nl",
            "p": "mains.v_nom"}, lambda k, i, s, p: k * i * s / p)
    L.calc("fuse.i_pri_margin", eq.SCALE, r"I_{F,min}", "A",
           "Least fuse rating for the operating current", {"v": "fuse.i_pri", "k": "fuse.k"},
           lambda v, k: v * k)
    part = None
    if pr.fuse_part:
        part = ctx.fixed_part("fuse", pr.fuse_part, "protection.fuse_part")
        ctx.picks["F1"] = Pick("F1", "fuse", "fixed", part, f"{part.id} named in the file")
    elif ctx.library is not None:
        from ..parts.select import select_fuse

        sel = select_fuse(ctx.library.fuses, current=L["fuse.need"],
                          voltage=L["mains.v_high"], characteristic="T")
        if sel.part is not None:
            part = sel.part
            ctx.picks["F1"] = Pick("F1", "fuse", "library", part, sel.reason, sel.generic)
    if part is not None:
        src = f"library part {part.id}"
        L.given("fuse.rating", r"I_N", part.current, "A", "Fuse rated current", source=src)
        L.given("fuse.i2t", r"I^2t_F", part.i2t, "A2s", "Fuse melting I2t", source=src)
    else:
        L.calc("fuse.rating", eq.PICKED, r"I_N", "A", "Fuse rated current (R10 step, T type)",
               {"x": "fuse.need"},
               lambda x: standards.next_at_or_above(x, standards.FUSE_RATINGS))
        ctx.picks["F1"] = Pick("F1", "fuse", "sized",
                               reason="R10 step at or above the rated primary current x k_F")
    if math.isfinite(i2t_sec):
        L.measured("engine.surge_i2t", eq.ENGINE_SWITCH_ON, r"I^2t_{sec}", i2t_sec, "A2s",
                   "Switch-on I2t of the first pulse (engine)",
                   ("transformer.v_nl", "transformer.r_w", "reservoir.c"),
                   "switch-on at the crest, high line")
        L.calc("fuse.i2t_surge", eq.I2T_REFLECT, r"I^2t_{pri}", "A2s",
               "Switch-on I2t in the primary", {"i": "engine.surge_i2t", "s": "transformer.v_nl",
                                                "p": "mains.v_nom"},
               lambda i, s, p: i * (s / p) ** 2)
    _bleeder(ctx, L)


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
