"""The zener diode of the shunt and the follower: its choice (library part, fixed in the file or
a standard E24 voltage), its power rating and thermal resistance at the hottest ambient, and the
voltage shift of its self-heating; with the power deratings and rating-class picks both kinds'
parts use.

Power classes are the standard steps of docgen.standards; the derating from 25 degC to the
hottest ambient and the junction thermal resistance are common practice (see rules.py).
"""

from __future__ import annotations

import math

from .. import equations as eq
from .. import standards
from ..errors import InfeasibleDesign
from ..stages.context import Pick, SizingContext, require
from ..trace import Ledger
from . import rules


def choose_zener(ctx: SizingContext, L: Ledger, vz: float):
    """The zener from the library (fixed by id or picked by voltage and power), or None."""
    spec = ctx.spec
    z = spec.output[0].zener
    if z.part:
        part = ctx.fixed_part("zener", z.part, "output[0].zener.part")
        ctx.picks["DZ1"] = Pick("DZ1", "zener", "fixed", part, f"{part.id} named in the file")
        return part
    if ctx.library is None:
        return None
    from ..parts.select import select_zener

    # the floor is a rating; the selector divides the dissipation by the derating itself
    power = max(ctx.floors.zener_power * spec.margins.zener_power_derating, 1e-6)
    # a power rating written in the file is a minimum for the part's own rating
    candidates = [p for p in ctx.library.zeners
                  if z.power is None or p.power >= z.power * (1 - 1e-9)]
    sel = select_zener(candidates, voltage=vz, power=power,
                       ambient_c=spec.environment.ambient_max,
                       lead_to_ambient=z.lead_to_ambient,
                       power_derating=spec.margins.zener_power_derating)
    part = require(sel, f"{vz:g} V zener diode")
    ctx.picks["DZ1"] = Pick("DZ1", "zener", "library", part, sel.reason, sel.generic)
    return part


# file field -> (part attribute, unit) of the zener figures a library part states itself
_PART_FIGURES = {"voltage": ("voltage", "V"), "tolerance": ("tolerance", "%"),
                 "tempco": ("tempco", "%/degC"), "knee_current": ("knee_current", "A"),
                 "dynamic_resistance": ("dynamic_resistance", "ohm"),
                 "test_current": ("test_current", "A")}


def record_power_deratings(ctx: SizingContext, L: Ledger) -> None:
    """The zener and resistor power deratings (shunt and follower alike)."""
    m = ctx.spec.margins
    L.given("margins.zener_power", r"k_{Z,P}", m.zener_power_derating, "%",
            "Zener power derating", defaulted="zener_power_derating" not in m.model_fields_set)
    L.given("margins.resistor_power", r"k_{R,P}", m.resistor_power_derating, "%",
            "Resistor power derating",
            defaulted="resistor_power_derating" not in m.model_fields_set)


def note_conflicts(ctx: SizingContext, z, part) -> None:
    """Figures written in the file that the chosen part states otherwise, made visible."""
    from ..units import format_quantity as fq

    for name, (attr, unit) in _PART_FIGURES.items():
        given = getattr(z, name, None)
        stated = getattr(part, attr, None)
        if name not in z.model_fields_set or given is None or stated is None:
            continue
        if abs(given - stated) > 1e-9 * max(abs(given), abs(stated), 1e-30):
            ctx.conflicts.append((f"output.zener.{name}", (
                f"The file gives output[0].zener.{name} = {fq(given, unit)}, but the zener "
                f"is the library part {part.id}, which states {fq(stated, unit)}; the design "
                "uses the part's figure, because the part is what will be fitted. Remove the "
                "field, or name a part that matches it with [output.zener] part.")))


def with_floor(ctx: SizingContext, L: Ledger, name: str, need_id: str, floor_id: str,
               symbol: str, title: str) -> str:
    """The id of the need, raised to the verification floor when there is one."""
    floor = ctx.floor(L, name, floor_id, symbol, "W", title)
    if not floor:
        return need_id
    L.calc(need_id + "_floored", eq.MAX2, symbol.replace("floor", "need"), "W", title + " applied",
           {"a": need_id, "b": floor}, lambda a, b: max(a, b))
    return need_id + "_floored"


def pick_power_class(L: Ledger, value_id: str, symbol: str, title: str, need_id: str,
                     steps: tuple[float, ...], what: str) -> None:
    """The standard power class at or above the need; past the largest class no shunt part
    can carry the load, which the message says with the way out."""
    try:
        standards.next_at_or_above(L[need_id], steps)
    except standards.NoStandardValue:
        raise InfeasibleDesign(
            f"{title} ({value_id}): the {what} must dissipate so much that it needs a "
            f"{L[need_id]:.1f} W rating, above the largest standard class ({steps[-1]:g} W); "
            "to fix it: a series-pass regulator (regulator = \"follower\" or "
            "\"three-terminal\") suits this load better"
        ) from None
    L.calc(value_id, eq.PICKED, symbol, "W", title, {"x": need_id},
           lambda x: standards.next_at_or_above(x, steps))


def standard_voltage(ctx: SizingContext, L: Ledger, target_id: str, to_output) -> None:
    """``zener.v_std``: the E24 zener voltage nearest the target (``target_id``) whose output
    (``to_output(v_z)``) stays inside the output window at the zener's tolerance and temperature
    extremes; the nearest E24 value when none does (the output checks then say so)."""
    out = ctx.spec.output[0]
    z = out.zener
    env = ctx.spec.environment
    d_t = max(abs(env.ambient_max - 25.0), abs(env.ambient_min - 25.0))
    hi, lo = out.voltage * (1 + out.tolerance), out.voltage * (1 - out.tolerance)

    def fits(v: float) -> bool:
        swing = v * z.tolerance + abs(z.tempco) * v * d_t
        return to_output(v + swing) <= hi and to_output(v - swing) >= lo

    L.calc("zener.v_std", rules.ZENER_STANDARD, r"V_{Z,std}", "V",
           "Standard (E24) zener voltage nearest the target that keeps the output window",
           {"x": target_id}, lambda x: rules.standard_zener_voltage(x, fits)[0])


def zener_rating(ctx: SizingContext, L: Ledger, need_id: str) -> None:
    """Rated power (``zener.p_rating``), junction-to-ambient thermal resistance
    (``zener.theta_ja``) and the power allowed at the hottest ambient (``zener.p_rating_amb``):
    a library part's from its own rating point (a lead-rated part's lead sits above ambient),
    a part without library data rated at 25 degC in free air."""
    spec = ctx.spec
    z = spec.output[0].zener
    t_a = spec.environment.ambient_max
    zpick = ctx.picks.get("DZ1")
    if zpick is not None and zpick.part is not None:
        part = zpick.part
        src = f"library part {part.id}"
        L.given("zener.p_rating", r"P_{Z,rated}", part.power, "W",
                f"Zener power rating (up to {part.power_reference_temperature_c:g} degC "
                f"{part.power_reference})", source=src)
        lead_note = ("" if part.power_reference == "ambient" else
                     f", lead {'as stated' if part.r_theta_la is not None else 'to ambient per '}"
                     f"{'' if part.r_theta_la is not None else 'output.zener.lead_to_ambient'}")
        L.given("zener.theta_ja", r"R_{\theta JA}", part.r_theta_ja(z.lead_to_ambient), "K/W",
                "Zener junction-to-ambient thermal resistance", source=src + lead_note)
        L.given("zener.p_rating_amb", r"P_{Z,amb}",
                part.power_at_ambient(t_a, z.lead_to_ambient), "W",
                f"Zener power allowed at {t_a:g} degC ambient ({part.power_reference} rating"
                + (", lead above ambient" if part.power_reference == "lead" else "") + ")",
                source=src)
        return
    L.given("zener.t_j_max", r"T_{J,max}", z.t_j_max, "degC", "Zener junction limit",
            defaulted="t_j_max" not in z.model_fields_set)
    if z.power is not None:
        L.given("zener.p_rating", r"P_{Z,rated}", z.power, "W", "Zener power rating (fixed)")
        ctx.picks["DZ1"] = Pick("DZ1", "zener", "fixed", reason="power rating given in the file")
    else:
        need = with_floor(ctx, L, "zener_power", need_id, "zener.p_floor", r"P_{Z,floor}",
                           "Zener rating floor")
        if z.theta_ja is None:
            L.calc("zener.p_need_25", rules.ZENER_NEED_AT_25, r"P_{Z,25,req}", "W",
                   "Zener rating needed at 25 degC (derated to the hottest ambient)",
                   {"x": need, "j": "zener.t_j_max", "t": "env.t_max"},
                   lambda x, j, t: x * max(1.0, (j - 25.0) / (j - t)) if j > t else math.inf)
            need = "zener.p_need_25"
        pick_power_class(L, "zener.p_rating", r"P_{Z,rated}", "Zener power rating (standard class)", need,
              standards.ZENER_POWERS, "zener")
        ctx.picks["DZ1"] = Pick("DZ1", "zener", "sized",
                               reason="standard power class at or above the derated need")
    if z.theta_ja is not None:
        L.given("zener.theta_ja", r"R_{\theta JA}", z.theta_ja, "K/W",
                "Zener junction-to-ambient thermal resistance")
    else:
        L.calc("zener.theta_ja", rules.ZENER_THETA_GENERIC, r"R_{\theta JA}", "K/W",
               "Zener junction-to-ambient thermal resistance (rated at 25 degC free air)",
               {"j": "zener.t_j_max", "p": "zener.p_rating"}, lambda j, p: (j - 25.0) / p)
    L.calc("zener.p_rating_amb", rules.ZENER_P_AMBIENT, r"P_{Z,amb}", "W",
           "Zener power allowed at the hottest ambient",
           {"p": "zener.p_rating", "j": "zener.t_j_max", "t": "env.t_max", "r": "zener.theta_ja"},
           lambda p, j, t, r: max(0.0, min(p, (j - t) / r)))


def voltage_window(L: Ledger) -> None:
    """The zener voltage's extremes over its tolerance and the temperature excursion from 25 degC
    (the shunt and the follower both regulate on it)."""
    L.calc("zener.delta_t", eq.ZENER_DT, r"\Delta T_Z", "K", "Temperature excursion from 25 degC",
           {"h": "env.t_max", "c": "env.t_min"}, lambda h, c: max(abs(h - 25.0), abs(c - 25.0)))
    L.calc("zener.v_max", eq.ZENER_HIGH, r"V_{Z,max}", "V", "Highest zener voltage",
           {"v": "zener.v_nom", "t": "zener.tol", "a": "zener.tempco", "d": "zener.delta_t"},
           lambda v, t, a, d: v * (1 + t) + abs(a) * v * d)
    L.calc("zener.v_min", eq.ZENER_LOW, r"V_{Z,min}", "V", "Lowest zener voltage",
           {"v": "zener.v_nom", "t": "zener.tol", "a": "zener.tempco", "d": "zener.delta_t"},
           lambda v, t, a, d: v * (1 - t) - abs(a) * v * d)


def self_heating(L: Ledger) -> None:
    """The zener's own dissipation heats its junction above ambient: its voltage moves by
    alpha V_Z P_Z R_thJA (common practice), up for a positive coefficient, down for a
    negative one; the extremes and knee voltages of the output window include it."""
    L.calc("zener.dv_self", rules.ZENER_SELF_HEAT, r"\Delta V_{Z,self}", "V",
           "Zener voltage shift from self-heating at its initial-estimate dissipation",
           {"a": "zener.tempco", "v": "zener.v_nom", "p": "zener.p", "r": "zener.theta_ja"},
           lambda a, v, p, r: abs(a) * v * p * r)
    L.calc("zener.v_max_hot", rules.ZENER_HIGH_SH, r"V_{Z,max,hot}", "V",
           "Highest zener voltage with self-heating",
           {"v": "zener.v_max", "s": "zener.dv_self", "a": "zener.tempco"},
           lambda v, s, a: v + (s if a > 0 else 0.0))
    L.calc("zener.v_min_hot", rules.ZENER_LOW_SH, r"V_{Z,min,hot}", "V",
           "Lowest zener voltage with self-heating",
           {"v": "zener.v_min", "s": "zener.dv_self", "a": "zener.tempco"},
           lambda v, s, a: v - (s if a < 0 else 0.0))
