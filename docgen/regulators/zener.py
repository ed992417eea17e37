"""Zener shunt regulator: a series resistor from the reservoir and a zener across the output.

Corners add the zener knee voltage (its tolerance and temperature extremes) and the series
resistor's tolerance to the mains, load and capacitance axes. The engine models the zener as a
knee voltage plus its dynamic resistance (A. S. Sedra, K. C. Smith, Microelectronic Circuits,
zener model; from memory).
"""

from __future__ import annotations

import numpy as np

from .. import equations as eq
from ..verify.checks import COMMON_CHECKS, OUTPUT_HIGH, OUTPUT_LOW, OUTPUT_RIPPLE, EngineCheck
from . import zener_sizing
from .base import Regulator

ZENER_CURRENT = EngineCheck("check.zener_current", "Zener current at the trough >= I_Z,min",
                            "i_z_min", "min", "zener.i_min", r"I_{Z,min}", "A", "DZ1",
                            "output[0].zener.knee_current")
ZENER_POWER = EngineCheck("check.zener_power", "Zener dissipation <= derated rating", "p_zener",
                          "max", "zener.p_allowed", r"P_Z", "W", "DZ1",
                          "margins.zener_power_derating")
RESISTOR_POWER = EngineCheck("check.resistor_power", "Series-resistor dissipation <= derated "
                             "rating", "p_r_series", "max", "zener.r_p_allowed", r"P_R", "W",
                             "R1", "margins.resistor_power_derating")


def zener_resistor_bom(L, line, v) -> list:
    """BOM lines of the zener and its series (or base) resistor."""
    return [
        line("R1", "resistor", f"{v('zener.r')} {v('zener.r_p_rating')}",
             f"resistor {v('zener.r')} +/-{v('zener.r_tol')}, at least "
             f"{v('zener.r_p_rating')}", ("zener.r", "zener.r_p_rating")),
        line("DZ1", "zener", f"{v('zener.v_nom')} {v('zener.p_rating')}",
             f"zener diode {v('zener.v_nom')} +/-{v('zener.tol')}, at least "
             f"{v('zener.p_rating')}", ("zener.v_nom", "zener.p_rating")),
    ]


def resistor_axis(L) -> list[tuple[str, float]]:
    r, tr = L["zener.r"], L["zener.r_tol"]
    return [(f"R -{tr * 100:g} %", r * (1 - tr)), (f"R +{tr * 100:g} %", r * (1 + tr))]


def zener_floors(ctx, L, v, *, include_zener: bool = True) -> bool:
    """Raise the zener and resistor power classes the engine found short."""
    from ..units import format_quantity as fq

    spec = ctx.spec
    changed = False
    if include_zener and spec.output[0].zener.power is None and v.short(
            "check.zener_power", "zener.p_allowed", "max"):
        p, where = v.worst("check.zener_power")
        changed |= ctx.floors.raise_to(
            "zener_power", p / spec.margins.zener_power_derating / (1 - v.band),
            f"the engine found {fq(p, 'W')} in the zener at {where}")
    if spec.output[0].resistor_power is None and v.short(
            "check.resistor_power", "zener.r_p_allowed", "max"):
        p, where = v.worst("check.resistor_power")
        changed |= ctx.floors.raise_to(
            "resistor_power", p / spec.margins.resistor_power_derating / (1 - v.band),
            f"the engine found {fq(p, 'W')} in the series resistor at {where}")
    return changed


def bias_floor(ctx, L, v, i_load_id: str) -> bool:
    """Lower the resistor ceiling when the engine finds too little zener current."""
    from ..units import format_quantity as fq

    if ctx.spec.output[0].series_resistor is not None or not v.short(
            "check.zener_current", "zener.i_min", "min"):
        return False
    i_z, where = v.worst("check.zener_current")
    i_l = L[i_load_id]
    ceiling = L["zener.r"] * (i_l + i_z) / (i_l + L["zener.i_min"]) * 0.99
    return ctx.floors.lower_to(
        "resistor_ceiling", ceiling, f"the engine found only {fq(i_z, 'A')} of zener "
        f"current at {where} with R = {fq(L['zener.r'], 'ohm')} (winding resistance and "
        "diode drops lower the trough below the hand estimate)")


class Zener(Regulator):
    kind = "zener"
    title = zener_sizing.TITLE
    intro = zener_sizing.INTRO
    needs_title = zener_sizing.NEEDS_TITLE
    needs_intro = zener_sizing.NEEDS_INTRO
    load_model = "the zener as a knee voltage plus dynamic resistance behind its series resistor"
    not_covered = (
        "The zener's self-heating is taken at its initial-estimate (hand formula) "
        "dissipation for every corner (conservative); its thermal time constant and the "
        "surge on switch-on are not modelled.",
        "The zener's tolerance and temperature coefficient are the file's or the part's; the "
        "coefficient's change with current near 5 V is not modelled.",
    )
    drawing = "zener"
    refs = ("R1", "DZ1")
    writes = (*Regulator.writes, "zener.", "margins.zener_power", "margins.resistor_power")
    corner_axis_names = ("zener voltage", "series resistor")
    engine_checks = (
        EngineCheck("check.headroom", "Drop across R at the trough >= headroom", "headroom",
                    "min", "output.headroom", r"V_{R,min}", "V", "R1", "output[0].headroom"),
        ZENER_CURRENT, ZENER_POWER, RESISTOR_POWER, OUTPUT_RIPPLE, OUTPUT_HIGH, OUTPUT_LOW,
        *COMMON_CHECKS)

    def needs(self, ctx, L):
        zener_sizing.size_needs(ctx, L)

    def input_current_high(self, ctx, L):
        L.calc("regulator.i_in_high_est", eq.INPUT_CURRENT, r"I_{in,hi,est}", "A",
               "Regulator input current at high line (estimate with R_target)",
               {"v": "reservoir.v_pk_high", "z": "zener.v_min", "R": "regulator.r_target"},
               lambda v, z, R: (v - z) / R)

    def size(self, ctx, L):
        zener_sizing.size_zener(ctx, L)

    def zener_axis(self, L):
        # knee voltages at the extremes, self-heating included
        k = L["zener.r_z"] * L["zener.i_zt"]
        return [("V_Z low", L["zener.v_min_hot"] - k), ("V_Z high", L["zener.v_max_hot"] - k)]

    def resistor_axis(self, L):
        return resistor_axis(L)

    def sample_axes(self, L, rng, n, temp):
        vz_nom, tz = L["zener.v_nom"], L["zener.tol"]
        alpha = L["zener.tempco"] if "zener.tempco" in L else 0.0
        rise = L["zener.p"] * L["zener.theta_ja"]  # self-heating at the initial estimate
        v_z = vz_nom * rng.uniform(1 - tz, 1 + tz, n) + alpha * vz_nom * (temp + rise - 25.0)
        v_z = v_z - L["zener.r_z"] * L["zener.i_zt"]
        r = L["zener.r"] * rng.uniform(1 - L["zener.r_tol"], 1 + L["zener.r_tol"], n)
        return v_z, r

    def circuit(self, L, pts, common):
        from ..engine import Circuit

        return Circuit(**common, load="zener", r_series=pts.r, v_z0=pts.v_z,
                       r_z=L["zener.r_z"], i_out=pts.load)

    holdup_stop = "the capacitor voltage where the zener node is at the output's lower limit"

    def holdup_floor(self, L, pts):
        # Capacitor voltage where the node reaches the lower limit: below the knee the node is
        # the capacitor less R times the load; above it the zener's r_z divides (the engine's
        # load law, docgen.engine.loads).
        v_lo = L["output.v_lower_limit"]
        r, r_z = pts.r, L["zener.r_z"]
        off = v_lo + r * pts.load
        on = pts.v_z + r * pts.load + (v_lo - pts.v_z) * (r_z + r) / r_z
        return np.where(v_lo <= pts.v_z, off, on)

    def derived_metrics(self, L, pts, m):
        return {"headroom": m["v_c_min"] - m["v_out_mean"]}

    def trough_short(self, v):
        return v.short("check.headroom", "output.headroom", "min")

    def raise_bias_floor(self, ctx, L, v):
        return bias_floor(ctx, L, v, "output.i_max")

    def raise_part_floors(self, ctx, L, v):
        return zener_floors(ctx, L, v)

    def bom_lines(self, ctx, L, line, v):
        return zener_resistor_bom(L, line, v)


KIND = Zener()
