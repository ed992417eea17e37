"""Fixed three-terminal regulator: needs its dropout above the output at the ripple trough,
passes the ripple reduced by its ripple rejection and dissipates the input-output difference
times the load current (P = (V_in - V_out) I_out + V_in I_Q: power balance, common practice).

Worst case, not typical: a dropout given as a typical figure at 25 degC gets a stated allowance
(common practice, overridable; a datasheet maximum replaces it). Ripple rejection falls near
dropout, so the reservoir is sized for a trough a window above the dropout floor, and the engine
takes a reduced rejection at every corner whose trough comes inside that window (common
practice; the rule and its figures are stated in the document).
"""

from __future__ import annotations

import numpy as np

from .. import equations as eq
from ..stages.context import Pick, SizingContext
from ..trace import Ledger
from ..verify.checks import COMMON_CHECKS, OUTPUT_HIGH, OUTPUT_LOW, OUTPUT_RIPPLE, EngineCheck
from . import decoupling, rules
from .base import Regulator, record_output, regulator_load, series_ripple
from .decoupling import decoupling_lines, size_decoupling
from .thermal import junction_limit_check, size_heat_budget, thermal_chain

TITLE = "Three-terminal regulator"
INTRO = ("A fixed three-terminal regulator needs its dropout above the output at the ripple "
         "trough; it passes the ripple reduced by its ripple rejection and dissipates the "
         "input-output difference times the load current.")


def regulator_data(ctx: SizingContext, L: Ledger, adjustable: bool = False):
    """Three-terminal regulator data: from the library part, or the file's typical figures."""
    # (typical datasheet figures are common practice; a library part states its own)
    spec = ctx.spec
    lin = spec.output[0].linear
    part = None
    if lin.part:
        part = ctx.fixed_part("regulator", lin.part, "output[0].linear.part")
        ctx.picks["U1"] = Pick("U1", "regulator", "fixed", part, f"{part.id} named in the file")
    elif ctx.library is not None:
        from ..parts.select import select_regulator

        sel = select_regulator(
            ctx.library.regulators, output_voltage=spec.output[0].voltage,
            current=spec.output[0].load_max, input_voltage_max=0.0 + 1e-3,
            kind="adjustable" if adjustable else "fixed")
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
    given("reg.dropout", r"V_{DO}", "dropout", p.dropout if p else None, "V",
          "Dropout voltage (as stated)")
    dropout_max = p.dropout_max if p is not None else lin.dropout_max
    if dropout_max is not None:
        if p is not None and p.dropout_max is not None:
            L.given("reg.dropout_max", r"V_{DO,max}", dropout_max, "V",
                    "Dropout voltage, datasheet maximum", source=src)
        else:
            L.given("reg.dropout_max", r"V_{DO,max}", dropout_max, "V",
                    "Dropout voltage, datasheet maximum")
    else:
        L.given("reg.dropout_allowance", r"\Delta V_{DO}", lin.dropout_allowance, "V",
                "Allowance above a typical dropout (temperature, current, spread)",
                defaulted="dropout_allowance" not in explicit)
        L.calc("reg.dropout_max", rules.DROPOUT_WORST, r"V_{DO,max}", "V",
               "Dropout voltage, worst case (typical plus allowance)",
               {"d": "reg.dropout", "a": "reg.dropout_allowance"}, lambda d, a: d + a)
    L.given("reg.rr_window", r"V_{RR,win}", lin.rr_window, "V",
            "Headroom above dropout below which ripple rejection is reduced",
            defaulted="rr_window" not in explicit)
    L.given("reg.rr_loss", r"\Delta RR", lin.rr_loss_near_dropout, "dB",
            "Loss of ripple rejection inside the window above dropout",
            defaulted="rr_loss_near_dropout" not in explicit)
    given("reg.tol", r"t_{reg}", "tolerance", p.tolerance if p else None, "%",
          "Output / reference tolerance")
    given("reg.rr", r"RR", "ripple_rejection", p.ripple_rejection_db if p else None, "dB",
          "Ripple rejection")
    L.calc("reg.rr_low", rules.RR_NEAR_DROPOUT, r"RR_{DO}", "dB",
           "Ripple rejection near dropout", {"r": "reg.rr", "d": "reg.rr_loss"},
           lambda r, d: max(r - d, 0.0))
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
    if not adjustable:
        given("reg.i_q", r"I_Q", "quiescent_current", p.i_q if p and p.i_q is not None else None,
              "A", "Quiescent (ground) current")
    else:
        given("reg.v_ref", r"V_{ref}", "reference", p.reference_voltage if p else None, "V",
              "Reference voltage")
        given("reg.i_adj", r"I_{ADJ}", "adjust_current",
              p.adjust_current if p and p.adjust_current is not None else None, "A",
              "Adjust-pin current (typical)")
        given("reg.i_adj_max", r"I_{ADJ,max}", "adjust_current_max",
              p.adjust_current_max if p and p.adjust_current_max is not None else None, "A",
              "Adjust-pin current, largest")
        L.given("reg.i_adj_min", r"I_{ADJ,min}", 0.0, "A", "Adjust-pin current, least",
                defaulted=True, source="common practice: taken as zero (conservative)")
        L.given("reg.div_tol", r"t_{div}", lin.divider_tolerance, "%",
                "Divider resistor tolerance",
                defaulted="divider_tolerance" not in explicit)
        given("reg.i_min_load", r"I_{min}", "min_load",
              p.min_load_current if p and p.min_load_current is not None else None, "A",
              "Least load the regulator needs")
    return part




def set_output(ctx: SizingContext, L: Ledger) -> None:
    """The output voltage as set: the regulator's own voltage (a fixed part)."""
    L.calc("reg.v_out", eq.IDENT, r"V_{out,set}", "V", "Output voltage as set",
           {"x": "output.v_nom"}, lambda x: x)


def output_window(ctx: SizingContext, L: Ledger) -> None:
    """Output window of a fixed regulator: its own tolerance."""
    L.calc("reg.v_out_max", eq.BOUND_HIGH, r"V_{out,max}", "V", "Highest output voltage",
           {"x": "reg.v_out", "t": "reg.tol"}, lambda x, t: x * (1 + t))
    L.calc("reg.v_out_min", eq.BOUND_LOW, r"V_{out,min}", "V", "Lowest output voltage",
           {"x": "reg.v_out", "t": "reg.tol"}, lambda x, t: x * (1 - t))


def regulator_needs(ctx: SizingContext, L: Ledger) -> None:
    """Trough and input current of a three-terminal regulator (after its output window)."""
    L.calc("reg.v_in_floor", rules.DROPOUT_FLOOR, r"V_{in,DO}", "V",
           "Least input that keeps regulation (output plus worst-case dropout)",
           {"o": "reg.v_out_max", "d": "reg.dropout_max"}, lambda o, d: o + d)
    L.calc("regulator.v_in_min_needed", rules.RR_WINDOW_NEED, r"V_{in,min}", "V",
           "Input needed at the trough (dropout floor plus the ripple-rejection window)",
           {"f": "reg.v_in_floor", "w": "reg.rr_window"}, lambda f, w: f + w)
    L.calc("regulator.i_in_design", eq.SUM2, r"I_{in}", "A",
           "Regulator input current at full load", {"a": "output.i_max", "b": "reg.i_q"},
           lambda a, b: a + b)
    L.calc("regulator.ripple_in_allowed", eq.RIPPLE_RR_ALLOWED, r"V_{r,in,out}", "V",
           "Input ripple the output ripple limit allows",
           {"o": "output.ripple_max", "r": "reg.rr"}, lambda o, r: o * 10 ** (r / 20))


def junction_floor(ctx, L, v, check_id: str, metric: str, limit_id: str) -> bool:
    """Raise the heat budget to the dissipation the engine found at the hottest corner."""
    from ..units import format_quantity as fq

    if not (v.short(check_id, limit_id, "max") and v.has_metric(metric)):
        return False
    p = v.corner_max(metric)
    return ctx.floors.raise_to(
        "heat_power", p / (1 - v.band), f"the engine found {fq(p, 'W')} dissipated in "
        "the regulator at the hottest corner, more than the hand estimate")


def input_rating_floor(ctx, L, v) -> bool:
    """The no-load peak above the regulator's input rating: a stiffer (larger) transformer, whose
    lower regulation lowers the no-load voltage (common practice)."""
    from .. import standards
    from ..units import format_quantity as fq

    spec = ctx.spec
    if spec.transformer.part or spec.transformer.secondary is not None:
        return False
    # only a typical regulation improves with size; a warning stays a visible warning
    typical = L.values["transformer.regulation"].equation == eq.REGULATION_TYPICAL.id
    if not typical or L["reservoir.v_max"] <= L["reg.v_in_max"]:
        return False
    va, reg_now = L["transformer.va"], L["transformer.regulation"]
    stiffer = next((s for s in standards.TRANSFORMER_VA
                    if s > va and standards.typical_regulation(s) < reg_now - 1e-9), None)
    if stiffer is None:
        return False
    return ctx.floors.raise_to(
        "va", stiffer * L["transformer.k_amb"],
        f"the no-load peak of {fq(L['reservoir.v_max'], 'V')} at high line is "
        f"above the regulator's {fq(L['reg.v_in_max'], 'V')} input rating with a "
        f"{fq(va, 'VA')} transformer of {fq(reg_now, '%')} typical regulation; the next size "
        "with a lower typical regulation is chosen")


class ThreeTerminal(Regulator):
    kind = "three-terminal"
    title = TITLE
    intro = INTRO
    load_model = ("the regulator as its load current plus its quiescent current while the "
                  "input stays above output plus dropout")
    not_covered = (
        "The regulator's line and load regulation, its transient response and its internal "
        "current limit and thermal shutdown are the maker's; docgen does not model them.",
        "Ripple rejection is one figure at the ripple frequency, reduced by a stated amount "
        "inside a window above dropout (common practice); its fall with frequency and the "
        "ripple's harmonics are not modelled.",
    )
    drawing = "three-terminal"
    adjustable = False
    refs = ("U1", *decoupling.REFS.values())
    corner_axis_names = ("output setpoint",)
    writes = (*Regulator.writes, "reg.", "margins.t_j_design")
    heat_sink = ("reg", "HS1")
    engine_checks = (
        EngineCheck("check.dropout", "Capacitor trough >= output plus worst-case dropout",
                    "v_c_min", "min", "reg.v_in_floor", r"V_{C,min}", "V", "U1", ""),
        EngineCheck("check.regulator_junction", "Regulator junction <= junction limit", "t_j",
                    "max", "reg.t_j_limit", r"T_J", "degC", "U1", "margins.junction_max"),
        OUTPUT_RIPPLE, OUTPUT_HIGH, OUTPUT_LOW, *COMMON_CHECKS)

    def needs(self, ctx, L):
        record_output(ctx, L)
        regulator_data(ctx, L)
        self.set_output(ctx, L)
        output_window(ctx, L)
        regulator_needs(ctx, L)

    def set_output(self, ctx, L):
        set_output(ctx, L)

    def size(self, ctx, L):
        series_ripple(ctx, L)
        L.calc("reg.p_hand", eq.REG_POWER, r"P_{reg}", "W",
               "Regulator dissipation at high line, full load, initial estimate (hand formula)",
               {"v": "reservoir.v_mean_high", "o": "reg.v_out_min", "i": "output.i_max",
                "q": "reg.i_q"}, lambda v, o, i, q: (v - o) * i + v * q)
        size_heat_budget(ctx, L, "reg", "U1", "regulator")
        ctx.picks.setdefault("U1", Pick("U1", "regulator", "sized",
                                        reason="typical three-terminal regulator figures"))
        size_decoupling(L, self.adjustable)
        for ref in decoupling.REFS.values():
            ctx.picks[ref] = Pick(ref, "capacitor", "sized", reason=(
                "capacitance typical of makers' data sheets (from memory); voltage rating: "
                "standard step at or above the derated need"))

    # The output setpoint at its tolerance extremes is a corner axis (held in the point sets'
    # reference-voltage column): the dropout and the dissipation depend on it.
    def zener_axis(self, L):
        return [("V_out low", L["reg.v_out_min"]), ("V_out high", L["reg.v_out_max"])]

    def sample_axes(self, L, rng, n, temp):
        # uniform over the output window (tolerance, and for an adjustable regulator the
        # divider and adjust-pin spread)
        return rng.uniform(L["reg.v_out_min"], L["reg.v_out_max"], n), np.ones(n)

    def circuit(self, L, pts, common):
        # the engine's regulator drops out below its setpoint plus the typical dropout; the
        # check holds the trough to the worst-case figure
        return regulator_load(L, common, pts, L["reg.i_q"], pts.v_z + L["reg.dropout"])

    def output_wave(self, L, wave, load, v_z, r):
        # the setpoint with the input ripple reduced by the rejection, never above the input
        # less the worst-case dropout
        rr = 10 ** (-L["reg.rr"] / 20)
        v_c = wave["v_c"]
        return np.minimum(v_z + (v_c - v_c.mean()) * rr, v_c - L["reg.dropout_max"])

    holdup_stop = "the output setpoint plus the worst-case dropout"
    regulation_note = ("The regulator holds its output at the setpoint of each corner in the "
                       "model, so these figures show only a loss of regulation at the trough; "
                       "the maker's line and load regulation figures are to be added to them.")

    def holdup_floor(self, L, pts):
        return pts.v_z + L["reg.dropout_max"]

    def derived_metrics(self, L, pts, m):
        near = m["v_c_min"] < L["reg.v_in_floor"] + L["reg.rr_window"]
        rr_db = np.where(near, L["reg.rr_low"], L["reg.rr"])
        v_set = pts.v_z
        # Below its setpoint plus the worst-case dropout the regulator passes its input less
        # that dropout.
        v_out_min = np.minimum(v_set, m["v_c_min"] - L["reg.dropout_max"])
        v_out_max = np.minimum(v_set, m["v_c_max"] - L["reg.dropout_max"])
        p_reg = (m["v_c_mean"] - v_set) * pts.load + m["v_c_mean"] * L["reg.i_q"]
        return {"v_out_pp": m["ripple_pp"] * 10 ** (-rr_db / 20), "p_reg": p_reg,
                "v_out_min": v_out_min, "v_out_max": v_out_max,
                "v_out_mean": (v_out_min + v_out_max) / 2,
                "t_j": L["env.t_max"] + p_reg * thermal_chain(L, "reg"),
                "p_out": v_set * pts.load}

    def hand_checks(self, ctx, L, w):
        from ..verify.checks import make_check

        return [
            junction_limit_check(L, "reg", "U1", "regulator", w),
            make_check(L, "check.regulator_input", "Highest input voltage <= regulator rating",
                       "reservoir.v_max", "reg.v_in_max", "max", "high line, no load", w,
                       ref="U1"),
        ]

    def trough_short(self, v):
        return v.short("check.dropout", "regulator.v_in_min_needed", "min")

    def raise_part_floors(self, ctx, L, v):
        changed = junction_floor(ctx, L, v, "check.regulator_junction", "p_reg", "reg.t_j_limit")
        return input_rating_floor(ctx, L, v) or changed

    def describe(self, v) -> str:
        return f"fixed three-terminal regulator {v('reg.v_out')}"

    def bom_lines(self, ctx, L, line, v):
        return [line("U1", "regulator", v("reg.v_out"),
                     f"{self.describe(v)}, at least {v('output.i_max')}, dropout at most "
                     f"{v('reg.dropout_max')}, input rating at least {v('reservoir.v_max')}",
                     ("reg.v_out", "reg.dropout_max")), *decoupling_lines(line, v)]


KIND = ThreeTerminal()
