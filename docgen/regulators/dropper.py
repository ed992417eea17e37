"""Dropping resistor: no regulator, a series resistor between the reservoir and the output.

For a load whose current hardly changes (a relay coil, an indicator string, a fan), a resistor
that drops a chosen voltage at full load is the cheapest way to bring the reservoir down to the
output. The output is V_C - I_L R (Ohm's law), so it moves with the mains, the ripple and the
load: the output window checks hold it to the requirements at every corner.

Sizing: R = V_drop / I_L,max rounded down to E24 (the drop never exceeds the one asked for), the
reservoir trough must cover the lowest output plus that drop, and the resistor's power class
covers I_L,max^2 R at its upper tolerance with the resistor derating (common practice).
"""

from __future__ import annotations

from .. import equations as eq
from .. import standards
from ..parts.eseries import preferred
from ..stages.context import Pick
from ..units import format_quantity as fq
from ..verify.checks import COMMON_CHECKS, OUTPUT_HIGH, OUTPUT_LOW, OUTPUT_RIPPLE, EngineCheck
from .base import Regulator, record_output, series_ripple

TITLE = "Dropping resistor"
INTRO = ("A series resistor drops the reservoir voltage to the output at full load. The output "
         "follows the reservoir (mains, ripple) and the load current through the resistor, so "
         "this suits loads whose current hardly changes.")

POWER_AT_TOLERANCE = eq.define(
    "dropper.power", "Power in a resistor at its upper tolerance",
    r"$i^2 \cdot $R \cdot (1 + $t)", {"i": "I", "R": "R", "t": r"t_R"}, "Joule's law")
RESISTOR_POWER = EngineCheck("check.resistor_power", "Dropping-resistor dissipation <= derated "
                             "rating", "p_r_series", "max", "dropper.p_allowed", r"P_R", "W",
                             "R1", "margins.resistor_power_derating")


class Dropper(Regulator):
    kind = "dropper"
    title = TITLE
    intro = INTRO
    needs_title = "Output requirements"
    needs_intro = ("The reservoir trough must cover the lowest output allowed plus the drop "
                   "across the resistor at full load.")
    load_model = "the load as a constant current through the dropping resistor"
    drawing = "series"
    refs = ("R1",)
    writes = (*Regulator.writes, "dropper.", "margins.resistor_power")
    corner_axis_names = ("dropping resistor",)
    engine_checks = (OUTPUT_RIPPLE, OUTPUT_HIGH, OUTPUT_LOW, RESISTOR_POWER, *COMMON_CHECKS)

    def needs(self, ctx, L):
        out = ctx.spec.output[0]
        record_output(ctx, L)
        L.given("output.headroom", r"V_{drop}", out.headroom, "V",
                "Drop across the resistor at full load",
                defaulted="headroom" not in out.model_fields_set)
        L.calc("regulator.v_in_min_needed", eq.SUM2, r"V_{in,min}", "V",
               "Reservoir trough needed (lowest output plus the drop)",
               {"a": "output.v_lower_limit", "b": "output.headroom"}, lambda a, b: a + b)
        L.calc("regulator.i_in_design", eq.IDENT, r"I_{in}", "A", "Load current at full load",
               {"x": "output.i_max"}, lambda x: x)
        L.calc("regulator.ripple_in_allowed", eq.IDENT, r"V_{r,in,out}", "V",
               "Ripple allowed at the output (the resistor does not filter)",
               {"x": "output.ripple_max"}, lambda x: x)

    def size(self, ctx, L):
        spec = ctx.spec
        out = spec.output[0]
        series_ripple(ctx, L)
        if out.series_resistor is not None:
            L.given("dropper.r", "R", out.series_resistor, "ohm", "Dropping resistor (fixed part)")
        else:
            L.calc("dropper.r_max", eq.OHM, r"R_{max}", "ohm", "Largest dropping resistor",
                   {"v": "output.headroom", "i": "output.i_max"}, lambda v, i: v / i)
            L.calc("dropper.r", eq.PREFERRED_DOWN, "R", "ohm",
                   "Dropping resistor (E24, rounded down)", {"x": "dropper.r_max"},
                   lambda x: preferred(x, "E24", "down"))
        L.given("dropper.r_tol", r"t_R", out.resistor_tolerance, "%", "Resistor tolerance",
                defaulted="resistor_tolerance" not in out.model_fields_set)
        L.calc("dropper.p", POWER_AT_TOLERANCE, r"P_{R,max}", "W",
               "Resistor dissipation at full load, upper tolerance",
               {"i": "output.i_max", "R": "dropper.r", "t": "dropper.r_tol"},
               lambda i, R, t: i * i * R * (1 + t))
        L.given("margins.resistor_power", r"k_{R,P}", spec.margins.resistor_power_derating, "%",
                "Resistor power derating",
                defaulted="resistor_power_derating" not in spec.margins.model_fields_set)
        L.calc("dropper.p_needed", eq.DERATED_NEED, r"P_{R,rated,req}", "W",
               "Resistor power rating needed", {"x": "dropper.p", "k": "margins.resistor_power"},
               lambda x, k: x / k)
        need = "dropper.p_needed"
        floor = ctx.floor(L, "resistor_power", "dropper.p_floor", r"P_{R,floor}", "W",
                          "Resistor rating floor")
        if floor:
            L.calc("dropper.p_needed_floored", eq.MAX2, r"P_{R,need}", "W",
                   "Resistor rating needed (floor applied)", {"a": need, "b": floor},
                   lambda a, b: max(a, b))
            need = "dropper.p_needed_floored"
        if out.resistor_power is not None:
            L.given("dropper.p_rating", r"P_{R,rated}", out.resistor_power, "W",
                    "Resistor power rating (fixed part)")
        else:
            standards.next_at_or_above(L[need], standards.RESISTOR_POWERS)
            L.calc("dropper.p_rating", eq.PICKED, r"P_{R,rated}", "W",
                   "Resistor power rating (standard class)", {"x": need},
                   lambda x: standards.next_at_or_above(x, standards.RESISTOR_POWERS))
        L.calc("dropper.p_allowed", eq.SCALE, r"P_{R,allow}", "W",
               "Resistor dissipation allowed (derated)",
               {"v": "dropper.p_rating", "k": "margins.resistor_power"}, lambda v, k: v * k)
        fixed = out.series_resistor is not None or out.resistor_power is not None
        ctx.picks["R1"] = Pick("R1", "resistor", "fixed" if fixed else "sized",
                               reason="given in the file" if fixed else
                               "E24 value at or below the largest; standard power class")

    def resistor_axis(self, L):
        r, tr = L["dropper.r"], L["dropper.r_tol"]
        return [(f"R -{tr * 100:g} %", r * (1 - tr)), (f"R +{tr * 100:g} %", r * (1 + tr))]

    def sample_axes(self, L, rng, n, temp):
        import numpy as np

        r = L["dropper.r"] * rng.uniform(1 - L["dropper.r_tol"], 1 + L["dropper.r_tol"], n)
        return np.zeros(n), r

    def circuit(self, L, pts, common):
        from ..engine import Circuit

        return Circuit(**common, load="current", i_load=pts.load)

    def derived_metrics(self, L, pts, m):
        drop = pts.load * pts.r
        return {"v_out_min": m["v_c_min"] - drop, "v_out_max": m["v_c_max"] - drop,
                "v_out_mean": m["v_c_mean"] - drop, "v_out_pp": m["ripple_pp"],
                "p_r_series": pts.load * drop, "p_out": (m["v_c_mean"] - drop) * pts.load}

    holdup_stop = ("the capacitor voltage where the output, after the resistor's drop, is at "
                   "its lower limit")

    def holdup_floor(self, L, pts):
        return L["output.v_lower_limit"] + pts.load * pts.r

    def output_wave(self, L, wave, load, v_z, r):
        return wave["v_c"] - load * r

    def trough_short(self, v):
        return v.short("check.output_low", "output.v_lower_limit", "min")

    def raise_part_floors(self, ctx, L, v):
        if ctx.spec.output[0].resistor_power is not None or not v.short(
                "check.resistor_power", "dropper.p_allowed", "max"):
            return False
        p, where = v.worst("check.resistor_power")
        return ctx.floors.raise_to(
            "resistor_power", p / ctx.spec.margins.resistor_power_derating / (1 - v.band),
            f"the engine found {fq(p, 'W')} in the dropping resistor at {where}")

    def bom_lines(self, ctx, L, line, v):
        return [line("R1", "resistor", f"{v('dropper.r')} {v('dropper.p_rating')}",
                     f"resistor {v('dropper.r')} +/-{v('dropper.r_tol')}, at least "
                     f"{v('dropper.p_rating')}", ("dropper.r", "dropper.p_rating"))]


KIND = Dropper()
