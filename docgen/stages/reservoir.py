"""Reservoir capacitor: capacitance for the allowed ripple, voltage at high line and no load."""

from __future__ import annotations

import math

from .. import equations as eq
from .. import standards
from ..errors import InfeasibleDesign
from ..parts import ripple
from ..parts.eseries import preferred
from ..regulators import regulator
from ..topology import topology
from ..trace import Ledger
from .context import Pick, SizingContext, require

WRITES = ("reservoir.", "margins.cap_voltage", "regulator.i_in_high_est")
TITLE = "Reservoir capacitor"
INTRO = ("The capacitor carries the load between charging pulses. Its capacitance follows from "
         "the ripple allowed at the regulator input with the constant-current approximation "
         "(conservative by some 15-25 % at 10 % ripple) at the largest input current, which a "
         "shunt regulator draws at high line; its low tolerance is used for sizing. "
         "Its voltage rating covers the no-load peak at high line, with the diode drop neglected. "
         "A library part's ripple-current rating is converted from the frequency it is quoted at "
         "to the ripple frequency with a frequency multiplier table (the part's own, else a "
         "typical one), and a part the engine finds short is chosen again.")

MAX_CAPACITANCE = 1.0  # F; beyond this no practical reservoir exists for a small supply


def size_reservoir(ctx: SizingContext, L: Ledger) -> None:
    spec = ctx.spec
    r = spec.reservoir
    m = spec.margins
    L.calc("reservoir.v_pk_low", eq.CAP_PEAK_N, r"V_{C,pk,lo}", "V",
           "Capacitor peak at low line, full load",
           {"v": "transformer.v_low_fl", "n": "rect.n_d", "d": "rect.v_f"},
           lambda v, n, d: math.sqrt(2) * v - n * d)
    L.calc("reservoir.v_pk_high", eq.CAP_PEAK_N, r"V_{C,pk,hi}", "V",
           "Capacitor peak at high line, transformer at rated load",
           {"v": "transformer.v_high_fl", "n": "rect.n_d", "d": "rect.v_f"},
           lambda v, n, d: math.sqrt(2) * v - n * d)
    L.calc("reservoir.v_max", eq.SINE_PEAK, r"V_{C,max}", "V",
           "Capacitor peak at high line, no load (no diode drop: conservative)",
           {"v": "transformer.v_high_nl"}, lambda v: math.sqrt(2) * v)
    regulator(spec.output[0].regulator).input_current_high(ctx, L)
    L.calc("reservoir.c_calc", eq.CAP_FOR_RIPPLE, r"C_{calc}", "F",
           "Capacitance for the allowed ripple at the largest input current",
           {"i": "regulator.i_in_high_est", "f": "mains.ripple_freq",
            "v": "reservoir.ripple_allowed"},
           lambda i, f, v: i / (f * v))
    floor = ctx.floor(L, "capacitance", "reservoir.c_floor", r"C_{floor}", "F",
                      "Capacitance floor")
    if floor:
        L.calc("reservoir.c_required", eq.MAX2, r"C_{req}", "F", "Capacitance required",
               {"a": "reservoir.c_calc", "b": floor}, lambda a, b: max(a, b))
    else:
        L.calc("reservoir.c_required", eq.IDENT, r"C_{req}", "F", "Capacitance required",
               {"x": "reservoir.c_calc"}, lambda x: x)
    if L["reservoir.c_required"] > MAX_CAPACITANCE:
        raise InfeasibleDesign(
            f"the output ripple limit allows only {L['reservoir.ripple_allowed'] * 1e3:.2f} mV "
            f"of ripple at the regulator input, which needs "
            f"{L['reservoir.c_required']:.2f} F of reservoir capacitance; relax ripple_max or "
            "use a regulator with more ripple rejection"
        )
    L.given("margins.cap_voltage", r"k_{C,V}", m.capacitor_voltage_derating, "%",
            "Capacitor voltage derating",
            defaulted="capacitor_voltage_derating" not in m.model_fields_set)
    L.calc("reservoir.v_rating_needed", eq.DERATED_NEED, r"V_{C,rated,req}", "V",
           "Capacitor voltage rating needed", {"x": "reservoir.v_max", "k": "margins.cap_voltage"},
           lambda x, k: x / k)
    topo = topology(spec.rectifier.topology)
    L.given("reservoir.k_w", r"k_w", topo.winding_factor, "",
            "Rectifier output RMS per winding RMS",
            source=f"{topo.name} rectifier" + (": two half windings feed the capacitor in turn"
                                                if topo.center_tapped else ""))
    L.calc("reservoir.i_ripple_est", eq.CAP_RIPPLE_CURRENT, r"I_{C,rms,est}", "A",
           "Capacitor ripple current estimate (initial, table ratio, high line)",
           {"i": "regulator.i_in_high_est", "w": "reservoir.k_w",
            "k": "margins.secondary_rms_factor"},
           lambda i, w, k: i * math.sqrt(max((w * k) ** 2 - 1, 0.0)))

    part = None
    if r.part:
        part = ctx.fixed_part("capacitor", r.part, "reservoir.part")
        ctx.picks["C1"] = Pick("C1", "capacitor", "fixed", part, f"{part.id} named in the file")
    elif r.capacitance is None and ctx.library is not None:
        part = _select_from_library(ctx, L)
    if part is not None:
        src = f"library part {part.id}"
        L.given("reservoir.tol", r"t_C", part.tolerance, "%", "Capacitance tolerance", source=src)
        L.given("reservoir.c", "C", part.capacitance, "F", "Reservoir capacitance", source=src)
        L.given("reservoir.v_rating", r"V_{C,rated}", part.voltage, "V",
                "Capacitor voltage rating", source=src)
        _ripple_rating(L, part, src)
        L.given("reservoir.esr", "ESR", part.esr_at(L["mains.ripple_freq"]), "ohm",
                "Capacitor ESR at the ripple frequency", source=src)
        L.given("reservoir.life_rated", r"L_0", part.life, "h", "Rated capacitor life",
                source=src)
        L.given("reservoir.life_temp", r"T_0", part.life_temperature_c, "degC",
                "Temperature of the rated life", source=src)
        L.calc("reservoir.c_min", eq.BOUND_LOW, r"C_{min}", "F", "Lowest capacitance (tolerance)",
               {"x": "reservoir.c", "t": "reservoir.tol"}, lambda x, t: x * (1 - t))
        return

    L.given("reservoir.tol", r"t_C", r.tolerance, "%", "Capacitance tolerance",
            defaulted="tolerance" not in r.model_fields_set)
    L.calc("reservoir.c_nominal_needed", eq.CAP_NOMINAL_NEEDED, r"C_{nom,req}", "F",
           "Nominal capacitance covering the tolerance",
           {"c": "reservoir.c_required", "t": "reservoir.tol"}, lambda c, t: c / (1 - t))
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
    fixed = r.capacitance is not None or r.voltage_rating is not None
    ctx.picks["C1"] = Pick("C1", "capacitor", "fixed" if fixed else "sized",
                           reason="ratings given in the file" if fixed else
                           "E6 value at or above the need; standard voltage step")
    L.calc("reservoir.c_min", eq.BOUND_LOW, r"C_{min}", "F", "Lowest capacitance (tolerance)",
           {"x": "reservoir.c", "t": "reservoir.tol"}, lambda x, t: x * (1 - t))


def _select_from_library(ctx: SizingContext, L: Ledger):
    """The cheapest library capacitor for the need; the ripple-current need is the larger of
    the hand estimate and the floor the engine raised. When no part meets that floor, the
    part the estimate allows stays, and the floor's reason says so: its ripple-current check
    then fails with the engine's figure beside the rating (never a silent pass)."""
    from ..parts.select import select_capacitor

    spec = ctx.spec
    args = dict(capacitance=L["reservoir.c_required"], include_tolerance=True,
                voltage=L["reservoir.v_max"],
                voltage_derating=spec.margins.capacitor_voltage_derating,
                ripple_temperature_c=spec.environment.ambient_max,
                ripple_frequency=L["mains.ripple_freq"])
    estimate = L["reservoir.i_ripple_est"]
    floor = ctx.floors.ripple_current
    sel = select_capacitor(ctx.library.capacitors, ripple_current=max(estimate, floor), **args)
    if sel.ok and floor > estimate:
        fid = ctx.floor(L, "ripple_current", "reservoir.i_ripple_floor", r"I_{C,floor}", "A",
                        "Capacitor ripple-current floor")
        L.calc("reservoir.i_ripple_need", eq.MAX2, r"I_{C,req}", "A",
               "Ripple-current rating needed at the ripple frequency",
               {"a": "reservoir.i_ripple_est", "b": fid}, lambda a, b: max(a, b))
    elif floor > estimate:
        short = sel
        sel = select_capacitor(ctx.library.capacitors, ripple_current=estimate, **args)
        note = (f"; no capacitor in the library meets it ({short.closest_lacks or short.reason}"
                "), so C1 stays as chosen from the estimate and its ripple-current check fails")
        if sel.ok and note not in ctx.floors.reasons["ripple_current"]:
            ctx.floors.reasons["ripple_current"] += note
    if "reservoir.i_ripple_need" not in L:
        L.calc("reservoir.i_ripple_need", eq.IDENT, r"I_{C,req}", "A",
               "Ripple-current rating needed at the ripple frequency",
               {"x": "reservoir.i_ripple_est"}, lambda x: x)
    part = require(sel, "reservoir capacitor")
    ctx.picks["C1"] = Pick("C1", "capacitor", "library", part, sel.reason, sel.generic)
    return part


def _ripple_rating(L: Ledger, part, src: str) -> None:
    """The part's ripple-current rating at the design's ripple frequency: the quoted rating
    times the ratio of the frequency multipliers (docgen.parts.ripple)."""
    f_q = part.quoted_frequency
    L.given("reservoir.i_ripple_quoted", r"I_{C,q}", part.ripple_current, "A",
            f"Capacitor ripple-current rating as quoted ({part.ripple_temperature_c:g} degC)",
            source=src)
    L.given("reservoir.f_ripple_quoted", r"f_q", f_q, "Hz",
            "Frequency of the quoted ripple-current rating",
            source=src if part.ripple_frequency is not None else
            "not stated by the part: makers quote 100 Hz or 120 Hz (common practice)",
            defaulted=part.ripple_frequency is None)
    table = (f"{src}, its frequency multiplier table" if part.ripple_multipliers
             else ripple.TYPICAL_SOURCE)
    L.given("reservoir.m_ripple", r"M(f_r)", part.ripple_multiplier(L["mains.ripple_freq"]), "",
            "Ripple-current multiplier at the ripple frequency", source=table)
    L.given("reservoir.m_ripple_quoted", r"M(f_q)", part.ripple_multiplier(f_q), "",
            "Ripple-current multiplier at the quoted frequency", source=table)
    L.calc("reservoir.i_ripple_rating", eq.RIPPLE_RATING_AT_FREQ, r"I_{C,rated}", "A",
           "Capacitor ripple-current rating at the ripple frequency",
           {"i": "reservoir.i_ripple_quoted", "a": "reservoir.m_ripple",
            "b": "reservoir.m_ripple_quoted"}, lambda i, a, b: i * a / b)


def stored_energy_and_allowance(ctx: SizingContext, L: Ledger) -> None:
    """Energy at the highest voltage (for the cautions) and the derated voltage allowed."""
    L.calc("reservoir.energy", eq.ENERGY, r"E_C", "J", "Energy stored at the highest voltage",
           {"c": "reservoir.c", "v": "reservoir.v_max"}, lambda c, v: 0.5 * c * v * v)
    L.calc("reservoir.v_allowed", eq.SCALE, r"V_{C,allow}", "V",
           "Capacitor voltage allowed (derated)",
           {"v": "reservoir.v_rating", "k": "margins.cap_voltage"}, lambda v, k: v * k)
