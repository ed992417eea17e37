"""Run the whole job for one requirements file: size -> verify at the corners -> check -> Design.

Sizing uses the hand formulas of the stages. The waveform engine then simulates every corner
(and the Monte Carlo samples); where a sized part falls short at some corner, a floor is raised
for that part, the reason recorded, and the design is sized again (at most MAX_PASSES times).
Fixed parts are never changed: their shortfall stays a failing check.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from functools import partial
from typing import Any

import numpy as np

from . import __version__
from . import equations as eq
from .cautions import STANDING, triggered_cautions
from .checks import make_check, overall_status
from .corners import CornerResult, analyse, model_inputs
from .design import Check, Design, PartChoice, Stage
from .errors import InfeasibleDesign, SpecError
from .parts.location import library_for
from .spec import LoadedSpec
from .spec.models import Requirements
from .stages import (
    mains,
    model,
    protection,
    rectifier,
    regulator_needs,
    reservoir,
    series,
    transformer,
    zener,
)
from .stages.context import SizingContext
from .stages.series import thermal_chain
from .trace import Assumption, Ledger, TraceError
from .undefined import undefined_text
from .units import format_quantity as fq

MAX_PASSES = 8
# Above this regulation a headroom shortfall is met with a larger transformer, not a higher
# secondary (common practice: small transformers lose their headroom in winding resistance).
STIFF_REGULATION = 0.15
RECT_TEXT = {
    "bridge": "bridge rectifier, V_RRM at least {v}, I_F(AV) at least {i}, I_FSM at least {s}",
    "center-tap": "2 rectifier diodes, V_RRM at least {v}, I_F(AV) together at least {i} "
                  "(half each), I_FSM at least {s}",
    "half-wave": "rectifier diode, V_RRM at least {v}, I_F(AV) at least {i}, I_FSM at least {s}",
}
RMS_FACTORS = {"bridge": 1.8, "center-tap": 1.2, "half-wave": 3.6}
LIFE_CAP = 15 * 8766 * 3600.0  # s; 15 years of 8766 h

def _needs(ctx: SizingContext, L: Ledger) -> None:
    if ctx.spec.output[0].regulator == "zener":
        regulator_needs.size_regulator_needs(ctx, L)
    else:
        series.needs_series(ctx, L)


def _regulator(ctx: SizingContext, L: Ledger) -> None:
    if ctx.spec.output[0].regulator == "zener":
        zener.size_zener(ctx, L)
    else:
        series.size_series(ctx, L)


REGULATOR_TEXT = {
    "zener": (zener.TITLE, zener.INTRO),
    "follower": ("Emitter-follower regulator",
                 "A zener fed through R1 holds the base of an NPN pass transistor; the output is "
                 "the zener voltage less V_BE. R1 must supply the minimum zener current plus the "
                 "largest base current at the ripple trough; the transistor dissipates the "
                 "input-output difference times the load current."),
    "three-terminal": ("Three-terminal regulator",
                       "A fixed three-terminal regulator needs its dropout above the output at "
                       "the ripple trough; it passes the ripple reduced by its ripple rejection "
                       "and dissipates the input-output difference times the load current."),
    "adjustable": ("Adjustable three-terminal regulator",
                   "The divider R1 (output to adjust) and R2 (adjust to ground) sets the output "
                   "from the reference; R1 also carries the regulator's minimum load. The "
                   "regulator needs its dropout above the output at the ripple trough."),
    "none": ("Unregulated output",
             "Without a regulator the reservoir voltage is the output: its trough, peak and "
             "ripple must all lie inside the output requirements."),
}
NEEDS_TEXT = {
    "zener": (regulator_needs.TITLE, regulator_needs.INTRO),
    "other": ("Regulator requirements",
              "What the regulator needs from the reservoir at the ripple trough, and the current "
              "it draws; everything upstream is sized backwards from these."),
}

STAGES = (
    ("mains", mains.size_mains),
    ("regulator_needs", _needs),
    ("transformer", transformer.size_transformer),
    ("reservoir", reservoir.size_reservoir),
    ("zener", _regulator),
    ("model", model.model_circuit),
    ("rectifier", rectifier.size_rectifier),
)


def _stage_meta(spec: Requirements) -> list[Stage]:
    kind = spec.output[0].regulator
    text = {
        "mains": (mains.TITLE, mains.INTRO),
        "regulator_needs": NEEDS_TEXT["zener" if kind == "zener" else "other"],
        "transformer": (transformer.TITLE, transformer.INTRO),
        "reservoir": (reservoir.TITLE, reservoir.INTRO),
        "zener": REGULATOR_TEXT[kind],
        "model": (model.TITLE, model.INTRO),
        "rectifier": (rectifier.TITLE, rectifier.INTRO),
    }
    return [Stage(sid, *text[sid]) for sid, _ in STAGES]

ASSUMPTIONS = (
    Assumption("assume.engine",
               "Ratings and checks come from the waveform engine at 48 worst-case corners: "
               "exponential diodes with series resistance, the transformer as an EMF behind its "
               "winding resistance and leakage inductance, the capacitor with its ESR, the "
               "zener as a knee voltage plus dynamic resistance. The hand formulas are shown "
               "beside them for review.",
               "docgen waveform engine, verified against scipy.integrate.solve_ivp"),
    Assumption("assume.transformer_model",
               "The transformer's EMF is its no-load voltage; its regulation is taken as a "
               "resistive drop at rated current (winding resistance), plus an estimated "
               "leakage inductance unless the file gives one.", "common practice"),
    Assumption("assume.no_load_peak",
               "Voltage ratings (capacitor, diode reverse voltage) use the no-load peak at high "
               "line with the diode drop neglected (conservative).", "common practice"),
    Assumption("assume.zener_model",
               "The zener conducts above its knee voltage (the rated voltage at its tolerance "
               "and temperature extremes) with its dynamic resistance; self-heating of the "
               "junction is not modelled.",
               "A. S. Sedra, K. C. Smith, Microelectronic Circuits (from memory)"),
    Assumption("assume.monte_carlo",
               "Monte Carlo draws each tolerance independently and uniformly within its band "
               "(mains range, capacitance, zener voltage with temperature, resistor, load).",
               "common practice when the distributions are unknown"),
    Assumption("assume.not_covered",
               "Fuse, bleeder, heat sinking and creepage/clearance are outside this version's "
               "sizing; the safety section lists what to check by hand.", "scope of this version"),
)


@dataclass(frozen=True)
class EngineCheck:
    """A check evaluated on the engine's figures at every corner, reported at the worst one."""

    id: str
    title: str
    metric: str
    sense: str  # "max" or "min"
    limit_id: str
    symbol: str
    unit: str
    ref: str = ""
    requirement: str = ""
    nominal_line_only: bool = False  # ratings defined at nominal mains


COMMON_CHECKS = (
    EngineCheck("check.transformer_current", "Secondary RMS current <= rated current",
                "i_sec_rms", "max", "transformer.i_rated", r"I_{sec,rms}", "A", "T1", "",
                nominal_line_only=True),
    EngineCheck("check.bridge_current", "Rectifier output current <= derated I_F(AV)", "i_dc",
                "max", "rect.i_allowed", r"I_{DC}", "A", "RECT",
                "margins.diode_current_derating"),
    EngineCheck("check.cap_ripple_current", "Capacitor ripple current <= rating", "i_c_rms",
                "max", "reservoir.i_ripple_rating", r"I_{C,rms}", "A", "C1", ""),
)
OUTPUT_RIPPLE = EngineCheck("check.output_ripple", "Output ripple <= limit", "v_out_pp", "max",
                            "output.ripple_max", r"V_{r,out}", "V", "", "output[0].ripple_max")
OUTPUT_HIGH = EngineCheck("check.output_high", "Highest output voltage <= upper limit",
                          "v_out_max", "max", "output.v_upper_limit", r"V_{out,max}", "V", "",
                          "output[0].tolerance")
OUTPUT_LOW = EngineCheck("check.output_low", "Lowest output voltage >= lower limit", "v_out_min",
                         "min", "output.v_lower_limit", r"V_{out,min}", "V", "",
                         "output[0].tolerance")
ZENER_CURRENT = EngineCheck("check.zener_current", "Zener current at the trough >= I_Z,min",
                            "i_z_min", "min", "zener.i_min", r"I_{Z,min}", "A", "DZ1",
                            "output[0].zener.knee_current")
ZENER_POWER = EngineCheck("check.zener_power", "Zener dissipation <= derated rating", "p_zener",
                          "max", "zener.p_allowed", r"P_Z", "W", "DZ1",
                          "margins.zener_power_derating")
RESISTOR_POWER = EngineCheck("check.resistor_power", "Series-resistor dissipation <= derated "
                             "rating", "p_r_series", "max", "zener.r_p_allowed", r"P_R", "W",
                             "R1", "margins.resistor_power_derating")

ENGINE_CHECKS: dict[str, tuple[EngineCheck, ...]] = {
    "zener": (
        EngineCheck("check.headroom", "Drop across R at the trough >= headroom", "headroom",
                    "min", "output.headroom", r"V_{R,min}", "V", "R1", "output[0].headroom"),
        ZENER_CURRENT, ZENER_POWER, RESISTOR_POWER, OUTPUT_RIPPLE, OUTPUT_HIGH, OUTPUT_LOW,
        *COMMON_CHECKS),
    "follower": (
        ZENER_CURRENT, ZENER_POWER, RESISTOR_POWER,
        EngineCheck("check.transistor_junction", "Pass-transistor junction <= design limit",
                    "t_j", "max", "margins.t_j_design", r"T_J", "degC", "Q1",
                    "margins.junction_max"),
        OUTPUT_RIPPLE, *COMMON_CHECKS),
    "three-terminal": (
        EngineCheck("check.dropout", "Capacitor trough >= output plus dropout", "v_c_min", "min",
                    "regulator.v_in_min_needed", r"V_{C,min}", "V", "U1", ""),
        EngineCheck("check.regulator_junction", "Regulator junction <= design limit", "t_j",
                    "max", "margins.t_j_design", r"T_J", "degC", "U1", "margins.junction_max"),
        OUTPUT_RIPPLE, *COMMON_CHECKS),
    "none": (OUTPUT_RIPPLE, OUTPUT_HIGH, OUTPUT_LOW, *COMMON_CHECKS),
}
ENGINE_CHECKS["adjustable"] = ENGINE_CHECKS["three-terminal"]
ALL_CHECK_IDS = list(dict.fromkeys(c.id for checks in ENGINE_CHECKS.values() for c in checks))


def _ref(spec: Requirements, ref: str) -> str:
    """Designators that depend on the topology: RECT is BR1 for a bridge, D1 otherwise."""
    return rectifier.rectifier_ref(spec.rectifier.topology) if ref == "RECT" else ref


def _derived_metrics(cr: CornerResult, L: Ledger, spec: Requirements) -> None:
    """Figures the checks need that follow from the engine's by a formula of the regulator."""
    m = cr.metrics
    kind = spec.output[0].regulator
    pts_load = np.concatenate([cr.corners.load] + ([cr.samples.load] if cr.samples else []))
    pts_vz = np.concatenate([cr.corners.v_z] + ([cr.samples.v_z] if cr.samples else []))
    pts_r = np.concatenate([cr.corners.r] + ([cr.samples.r] if cr.samples else []))
    m["i_dc"] = m["i_d_avg"] * (1.0 if spec.rectifier.topology == "half-wave" else 2.0)
    if kind == "zener":
        m["headroom"] = m["v_c_min"] - m["v_out_mean"]
    elif kind in ("three-terminal", "adjustable"):
        rr = 10 ** (-L["reg.rr"] / 20)
        m["v_out_pp"] = m["ripple_pp"] * rr
        p_reg = (m["v_c_mean"] - L["reg.v_out_min"]) * pts_load + m["v_c_mean"] * L["reg.i_q"]
        m["p_reg"] = p_reg
        m["t_j"] = L["env.t_max"] + p_reg * thermal_chain(L, "reg")
        m["p_out"] = L["reg.v_out"] * pts_load
    elif kind == "follower":
        beta = L["q.h_fe"]
        i_b = pts_load / (beta + 1)
        i_r1 = (m["v_c_min"] - pts_vz) / pts_r
        m["i_z_min"] = i_r1 - i_b
        i_r1_mean = (m["v_c_mean"] - pts_vz) / pts_r
        m["p_zener"] = pts_vz * np.maximum(i_r1_mean - i_b, 0.0)
        m["p_r_series"] = (m["v_c_mean"] - pts_vz) ** 2 / pts_r
        v_out = pts_vz - L["q.v_be"]
        m["p_q"] = (m["v_c_mean"] - v_out) * pts_load
        m["t_j"] = L["env.t_max"] + m["p_q"] * thermal_chain(L, "q")
        m["v_out_pp"] = m["ripple_pp"] * L["zener.r_z"] / (pts_r + L["zener.r_z"])
        m["p_out"] = v_out * pts_load
    else:  # none: the reservoir is the output
        m["v_out_pp"] = m["ripple_pp"]
        m["v_out_max"] = m["v_c_max"]
        m["v_out_min"] = m["v_c_min"]
        m["p_out"] = m["v_c_mean"] * pts_load


def _record_margins(spec: Requirements, L: Ledger) -> None:
    m = spec.margins
    topology = spec.rectifier.topology
    if m.secondary_rms_factor is not None:
        L.given("margins.secondary_rms_factor", r"k_{rms}", m.secondary_rms_factor, "",
                "Secondary RMS to DC current ratio")
    else:
        L.given("margins.secondary_rms_factor", r"k_{rms}", RMS_FACTORS[topology], "",
                f"Secondary RMS to DC current ratio ({topology}, capacitor input)",
                defaulted=True, source="common practice: upper end of makers' selection "
                "tables (bridge 1.6-1.8, center-tap 1.0-1.2 per half, half-wave 2.6-3.6)")
    L.given("margins.warn_band", r"w", m.warn_band, "%", "Warning band for checks",
            defaulted="warn_band" not in m.model_fields_set)


def _size(ctx: SizingContext) -> Ledger:
    L = Ledger()
    L.stage = "margins"
    _record_margins(ctx.spec, L)
    for stage_id, fn in STAGES:
        L.stage = stage_id
        fn(ctx, L)
    L.stage = "reservoir"
    L.calc("reservoir.energy", eq.ENERGY, r"E_C", "J", "Energy stored at the highest voltage",
           {"c": "reservoir.c", "v": "reservoir.v_max"}, lambda c, v: 0.5 * c * v * v)
    L.calc("reservoir.v_allowed", eq.SCALE, r"V_{C,allow}", "V",
           "Capacitor voltage allowed (derated)",
           {"v": "reservoir.v_rating", "k": "margins.cap_voltage"}, lambda v, k: v * k)
    return L


def _worst(cr: CornerResult, chk: EngineCheck) -> tuple[float, int]:
    values = cr.corner_metric(chk.metric)
    mask = np.isfinite(values)
    if chk.nominal_line_only:
        mask &= np.array([n == "nominal mains" for n in cr.corners.line_name])
    if not mask.any():
        return math.nan, -1
    masked = np.where(mask, values, -np.inf if chk.sense == "max" else np.inf)
    k = int(np.argmax(masked) if chk.sense == "max" else np.argmin(masked))
    return float(values[k]), k


def _bumps(ctx: SizingContext, L: Ledger, cr: CornerResult) -> bool:
    """Raise floors for sized parts that the engine found short; True if anything changed."""
    spec = ctx.spec
    fixed_t = bool(spec.transformer.part) or spec.transformer.secondary is not None
    kind = spec.output[0].regulator
    ids = {c.id for c in ENGINE_CHECKS[kind]}
    changed = False

    def worst(check_id: str) -> tuple[float, str]:
        chk = next(c for c in ENGINE_CHECKS[kind] if c.id == check_id)
        value, k = _worst(cr, chk)
        return value, cr.corners.name[k] if k >= 0 else ""

    band = spec.margins.warn_band

    def short(check_id: str, limit_id: str, sense: str) -> bool:
        """True when a sized part would fail, or sit inside the warning band, at some corner."""
        if limit_id not in L or check_id not in ids:
            return False
        value, _ = worst(check_id)
        limit = L[limit_id]
        if sense == "max":
            return math.isfinite(value) and value > limit * (1 - band)
        return math.isfinite(value) and value < limit * (1 + band)

    if not fixed_t and short("check.transformer_current", "transformer.i_rated", "max"):
        i, where = worst("check.transformer_current")
        need = i * L["transformer.v_rated"] / (1 - band)
        changed |= ctx.floors.raise_to(
            "va", need, f"the engine found {fq(i, 'A')} RMS in the secondary at {where}, above "
            f"the {fq(L['transformer.i_rated'], 'A')} rating of a {fq(L['transformer.va'], 'VA')}"
            " transformer")
    follower_starved = (kind == "follower" and "check.zener_current" in ids
                        and worst("check.zener_current")[0] < 0)
    if not fixed_t and (short("check.headroom", "output.headroom", "min")
                        or short("check.dropout", "regulator.v_in_min_needed", "min")
                        or follower_starved):
        from . import standards

        v = L["transformer.v_rated"]
        va = L["transformer.va"]
        stiffer = next((s for s in standards.TRANSFORMER_VA if s > va * (1 + 1e-9)), None)
        if L["transformer.regulation"] > STIFF_REGULATION and stiffer is not None:
            # A small transformer's winding resistance eats the headroom: a larger core with
            # better regulation helps without the extra heat of a higher secondary.
            changed |= ctx.floors.raise_to(
                "va", stiffer, f"at the trough the engine found too little headroom with a "
                f"{fq(va, 'VA')} transformer whose regulation is "
                f"{fq(L['transformer.regulation'], '%')} (winding resistance)")
        else:
            nxt = next((s for s in standards.SECONDARY_VOLTAGES if s > v * (1 + 1e-9)),
                       v * 1.25)
            changed |= ctx.floors.raise_to(
                "secondary", nxt, f"at the trough the engine found less than the required "
                f"headroom with a {fq(v, 'V')} secondary (winding resistance and diode drops)")
    elif kind in ("zener", "follower") and spec.output[0].series_resistor is None and short(
            "check.zener_current", "zener.i_min", "min"):
        i_z, where = worst("check.zener_current")
        i_l = L["output.i_max"] if kind == "zener" else L["q.i_b_max"]
        ceiling = L["zener.r"] * (i_l + i_z) / (i_l + L["zener.i_min"]) * 0.99
        changed |= ctx.floors.lower_to(
            "resistor_ceiling", ceiling, f"the engine found only {fq(i_z, 'A')} of zener "
            f"current at {where} with R = {fq(L['zener.r'], 'ohm')} (winding resistance and "
            "diode drops lower the trough below the hand estimate)")
    if spec.reservoir.capacitance is None and not spec.reservoir.part and short(
            "check.output_ripple", "output.ripple_max", "max"):
        ripple, where = worst("check.output_ripple")
        need = L["reservoir.c_required"] * ripple / L["output.ripple_max"] * 1.05
        changed |= ctx.floors.raise_to(
            "capacitance", need, f"the engine found {fq(ripple, 'V')} output ripple at {where}")
    if kind in ("zener", "follower") and spec.output[0].zener.power is None and short(
            "check.zener_power", "zener.p_allowed", "max"):
        p, where = worst("check.zener_power")
        changed |= ctx.floors.raise_to(
            "zener_power", p / spec.margins.zener_power_derating / (1 - band),
            f"the engine found {fq(p, 'W')} in the zener at {where}")
    if kind in ("zener", "follower") and spec.output[0].resistor_power is None and short(
            "check.resistor_power", "zener.r_p_allowed", "max"):
        p, where = worst("check.resistor_power")
        changed |= ctx.floors.raise_to(
            "resistor_power", p / spec.margins.resistor_power_derating / (1 - band),
            f"the engine found {fq(p, 'W')} in the series resistor at {where}")
    for check_id, metric in (("check.regulator_junction", "p_reg"),
                             ("check.transistor_junction", "p_q")):
        if short(check_id, "margins.t_j_design", "max") and metric in cr.metrics:
            p = float(np.nanmax(cr.corner_metric(metric)))
            changed |= ctx.floors.raise_to(
                "heat_power", p / (1 - band), f"the engine found {fq(p, 'W')} dissipated in "
                "the regulator at the hottest corner, more than the hand estimate")
    if not spec.rectifier.part and short("check.bridge_current", "rect.i_allowed", "max"):
        i, where = worst("check.bridge_current")
        changed |= ctx.floors.raise_to(
            "bridge_current", i / spec.margins.diode_current_derating / (1 - band),
            f"the engine found {fq(i, 'A')} average output current at {where}")
    return changed


def _engine_values(ctx: SizingContext, L: Ledger, cr: CornerResult) -> list[Check]:
    """Trace the worst-corner engine figures and turn them into checks."""
    spec = ctx.spec
    w = spec.margins.warn_band
    L.stage = "corners"
    checks: list[Check] = []
    inputs = model_inputs(L)
    for chk in ENGINE_CHECKS[spec.output[0].regulator]:
        if chk.limit_id not in L:
            continue
        value, k = _worst(cr, chk)
        if k < 0:
            raise InfeasibleDesign(
                f"the waveform engine did not converge at any corner for {chk.title.lower()}; "
                "no number is reported that was not converged to")
        vid = f"engine.{chk.id.split('.', 1)[1]}"
        L.measured(vid, eq.ENGINE, chk.symbol, value, chk.unit,
                   f"{chk.title.split(' <=')[0].split(' >=')[0]} (engine, worst corner)",
                   inputs, cr.corners.name[k])
        checks.append(make_check(L, chk.id, chk.title, vid, chk.limit_id, chk.sense,
                                 cr.corners.name[k], w, ref=_ref(spec, chk.ref),
                                 requirement=chk.requirement))
    # A corner the engine could not solve is a failing check of its own, never a number.
    bad = [cr.corners.name[k] for k in range(cr.n_corners) if not cr.converged[k]]
    L.given("engine.corners_not_converged", r"N_{nc}", float(len(bad)), "",
            "Corners where the engine did not converge",
            source="waveform engine" + (": " + "; ".join(bad) if bad else ""))
    L.given("engine.corners_allowed", r"N_{nc,max}", 0.0, "", "Corners allowed to fail",
            source="every corner must be solved")
    checks.append(make_check(L, "check.engine_converged", "Every corner solved by the engine",
                             "engine.corners_not_converged", "engine.corners_allowed", "max",
                             (f"{len(bad)} corners, first: {bad[0]}" if bad else "all corners"),
                             0.0))
    # Switch-on surge through the bridge.
    if cr.surge_converged:
        L.measured("engine.surge_peak", eq.ENGINE_SWITCH_ON, r"I_{surge}", cr.surge_peak, "A",
                   "Switch-on surge peak (engine)", model_inputs(L), "high line, C +tol")
        checks.append(make_check(L, "check.bridge_surge", "Switch-on surge <= I_FSM",
                                 "engine.surge_peak", "rect.i_fsm", "max",
                                 "switch-on at the crest, high line, C +tol", w,
                                 ref=_ref(spec, "RECT")))
    # Nominal-corner figures for the summary: efficiency, VA, ripple current.
    k = cr.nominal_index
    where = cr.corners.name[k]
    for metric, vid, sym, unit, title in (
        ("p_in", "engine.p_in_nominal", r"P_{in}", "W", "Input power (engine, nominal)"),
        ("p_out", "engine.p_out_nominal", r"P_{out}", "W", "Output power (engine, nominal)"),
        ("va_sec", "engine.va_nominal", r"S_{sec}", "VA", "Secondary VA drawn (engine, nominal)"),
        ("i_d_peak", "engine.i_d_peak_nominal", r"I_{D,pk}", "A",
         "Repetitive peak diode current (engine, nominal)"),
        ("conduction_angle", "engine.conduction_nominal", r"\theta", "rad",
         "Conduction angle per pulse (engine, nominal)"),
    ):
        L.measured(vid, eq.ENGINE, sym, float(cr.metrics[metric][k]), unit, title, model_inputs(L),
                   where)
    L.calc("engine.efficiency", eq.EFFICIENCY, r"\eta", "%", "Efficiency at nominal, full load",
           {"o": "engine.p_out_nominal", "i": "engine.p_in_nominal"}, lambda o, i: o / i)
    checks += _hand_checks(ctx, L, cr)
    return checks


def _hand_checks(ctx: SizingContext, L: Ledger, cr: CornerResult) -> list[Check]:
    spec = ctx.spec
    w = spec.margins.warn_band
    out = [
        make_check(L, "check.cap_voltage", "Capacitor voltage <= derated rating",
                   "reservoir.v_max", "reservoir.v_allowed", "max", "high line, no load", w,
                   ref="C1", requirement="margins.capacitor_voltage_derating"),
        make_check(L, "check.bridge_piv", "Diode reverse voltage <= derated V_RRM", "rect.piv",
                   "rect.v_allowed", "max", "high line, no load", w, ref=_ref(spec, "RECT"),
                   requirement="margins.diode_voltage_derating"),
    ]
    kind = spec.output[0].regulator
    if kind in ("three-terminal", "adjustable"):
        out += [
            make_check(L, "check.regulator_input", "Highest input voltage <= regulator rating",
                       "reservoir.v_max", "reg.v_in_max", "max", "high line, no load", w,
                       ref="U1"),
            make_check(L, "check.output_high", "Highest output voltage <= upper limit",
                       "reg.v_out_max", "output.v_upper_limit", "max",
                       "regulator tolerance, high side", w, requirement="output[0].tolerance"),
            make_check(L, "check.output_low", "Lowest output voltage >= lower limit",
                       "reg.v_out_min", "output.v_lower_limit", "min",
                       "regulator tolerance, low side", w, requirement="output[0].tolerance"),
        ]
    if kind == "follower":
        out += [
            make_check(L, "check.output_high", "Highest output voltage <= upper limit",
                       "output.v_max_est", "output.v_upper_limit", "max", "zener high", w,
                       requirement="output[0].tolerance"),
            make_check(L, "check.output_low", "Lowest output voltage >= lower limit",
                       "output.v_min_est", "output.v_lower_limit", "min", "zener low", w,
                       requirement="output[0].tolerance"),
        ]
    if "reservoir.life_rated" in L and spec.environment.required_life is not None:
        L.stage = "corners"
        L.given("env.required_life", r"L_{req}", spec.environment.required_life, "h",
                "Required capacitor life")
        L.given("reservoir.r_th", r"R_{th}", spec.reservoir.thermal_resistance, "K/W",
                "Capacitor thermal resistance",
                defaulted="thermal_resistance" not in spec.reservoir.model_fields_set)
        i_c = float(np.nanmax(cr.corner_metric("i_c_rms")))
        L.measured("engine.i_c_rms_max", eq.ENGINE, r"I_{C,rms}", i_c, "A",
                   "Largest capacitor ripple current (engine)", model_inputs(L), "worst corner")
        L.calc("reservoir.t_core", eq.CAP_CORE_TEMP, r"T_{core}", "degC",
               "Capacitor core temperature at the hottest ambient",
               {"t": "env.t_max", "i": "engine.i_c_rms_max", "e": "reservoir.esr",
                "r": "reservoir.r_th"}, lambda t, i, e, r: t + i * i * e * r)
        L.given("reservoir.life_cap", r"L_{cap}", LIFE_CAP, "h",
                "Longest life the 10-degree rule is trusted for",
                source="common practice: about 15 years")
        L.calc("reservoir.life", eq.CAP_LIFE, r"L_C", "h", "Capacitor life expectancy",
               {"l": "reservoir.life_rated", "a": "reservoir.life_temp", "t": "reservoir.t_core",
                "m": "reservoir.life_cap"},
               lambda l, a, t, m: capacitor_life(l, a, t, m))
        out.append(make_check(L, "check.cap_life", "Capacitor life >= required life",
                              "reservoir.life", "env.required_life", "min",
                              "hottest ambient, largest ripple current", w, ref="C1",
                              requirement="environment.required_life"))
    return out


def capacitor_life(rated: float, rated_temp_c: float, temp_c: float, cap: float) -> float:
    """The 10-degree rule: life doubles for every 10 K below the rated temperature, capped."""
    return min(rated * 2 ** ((rated_temp_c - temp_c) / 10.0), cap)


def _protection(ctx: SizingContext, L: Ledger, cr: CornerResult) -> list[Check]:
    """Fuse and bleeder, sized after the engine has given the operating and surge currents."""
    w = ctx.spec.margins.warn_band
    nominal = np.array([n.startswith("nominal mains, full load") for n in cr.corners.name])
    i_sec = float(np.nanmax(np.where(nominal, cr.corner_metric("i_sec_rms"), np.nan)))
    L.stage = "protection"
    protection.size_protection(ctx, L, i_sec, cr.surge_i2t)
    out = [make_check(L, "check.fuse_operating", "Fuse rating >= k_F x operating primary current",
                      "fuse.i_pri_margin", "fuse.rating", "max", "nominal mains, full load", w,
                      ref="F1", requirement="protection.fuse_factor")]
    if "fuse.i2t" in L and "fuse.i2t_surge" in L:
        out.append(make_check(L, "check.fuse_surge", "Switch-on I2t <= fuse melting I2t",
                              "fuse.i2t_surge", "fuse.i2t", "max", "switch-on at the crest", w,
                              ref="F1"))
    if "bleeder.time" in L:
        out.append(make_check(L, "check.bleeder_time", "Discharge time <= allowed time",
                              "bleeder.time", "bleeder.t", "max", "high line, no load, C +tol",
                              w, ref="R9", requirement="protection.discharge_time"))
    return out


def _monte_carlo(ctx: SizingContext, L: Ledger, cr: CornerResult) -> dict:
    if cr.samples is None:
        return {}
    n = len(cr.samples)
    ok = cr.converged[cr.n_corners:].copy()
    failing: dict[str, int] = {}
    for chk in ENGINE_CHECKS[ctx.spec.output[0].regulator]:
        if chk.limit_id not in L:
            continue
        vals = cr.sample_metric(chk.metric)
        limit = L[chk.limit_id]
        if chk.nominal_line_only:
            continue  # a rating at nominal mains; samples span the whole mains range
        bad = ~(vals <= limit) if chk.sense == "max" else ~(vals >= limit)
        failing[chk.id] = int(np.sum(bad))
        ok &= ~bad
    summary = {}
    for metric in ("v_out_mean", "v_out_pp", "p_zener", "p_r_series", "i_sec_rms", "i_z_min",
                   "i_c_rms", "v_c_min", "t_j"):
        if metric not in cr.metrics:
            continue
        vals = cr.sample_metric(metric)
        vals = vals[np.isfinite(vals)]
        if vals.size:
            summary[metric] = {
                "min": float(vals.min()), "p1": float(np.percentile(vals, 1)),
                "median": float(np.median(vals)), "p99": float(np.percentile(vals, 99)),
                "max": float(vals.max()),
            }
    return {
        "samples": n,
        "seed": ctx.spec.analysis.seed,
        "converged": int(np.sum(cr.converged[cr.n_corners:])),
        "yield": float(np.sum(ok)) / n,
        "failing": failing,
        "quantities": summary,
    }


def _corner_rows(cr: CornerResult) -> list[dict]:
    rows = []
    keys = ("v_c_min", "v_c_max", "ripple_pp", "v_out_min", "v_out_max", "v_out_pp", "i_z_min",
            "i_z_max", "p_zener", "p_r_series", "i_sec_rms", "va_sec", "i_c_rms", "i_d_peak",
            "i_dc", "p_in", "p_out")
    for k in range(cr.n_corners):
        row = {"name": cr.corners.name[k], "converged": bool(cr.converged[k]),
               "line_factor": float(cr.corners.line[k]), "load": float(cr.corners.load[k]),
               "c": float(cr.corners.c[k]), "v_z": float(cr.corners.v_z[k]),
               "r": float(cr.corners.r[k])}
        for key in keys:
            v = float(cr.metrics[key][k])
            row[key] = v if math.isfinite(v) else None
        rows.append(row)
    return rows


def _parts(ctx: SizingContext, L: Ledger) -> list[PartChoice]:
    def v(i: str) -> str:
        return fq(L[i], L.values[i].unit, 3)

    def line(ref: str, kind: str, value_text: str, generic: str, ids: tuple[str, ...]
             ) -> PartChoice:
        pick = ctx.picks.get(ref)
        part = pick.part if pick else None
        qty = f"{pick.quantity} x " if pick and pick.quantity > 1 else ""
        return PartChoice(
            ref, kind, value_text,
            description=(qty + (part.description or part.id)) if part is not None else generic,
            part_id=part.id if part is not None else "",
            origin=pick.origin if pick else "sized",
            reason=pick.reason if pick else "",
            value_ids=ids)

    lines = [
        line("T1", "transformer", f"{v('transformer.v_rated')} {v('transformer.va')}",
             f"mains transformer, secondary {v('transformer.v_rated')} RMS at rated load, "
             f"at least {v('transformer.va')}, regulation at most {v('transformer.regulation')}",
             ("transformer.v_rated", "transformer.va", "transformer.regulation")),
        line(_ref(ctx.spec, "RECT"), "rectifier", f"{v('rect.v_rrm')} {v('rect.i_f_rating')}",
             RECT_TEXT[ctx.spec.rectifier.topology].format(
                 v=v('rect.v_rrm'), i=v('rect.i_f_rating'), s=v('rect.i_fsm')),
             ("rect.v_rrm", "rect.i_f_rating", "rect.i_fsm")),
        line("C1", "capacitor", f"{v('reservoir.c')} {v('reservoir.v_rating')}",
             f"aluminium electrolytic capacitor, {v('reservoir.c')} (tolerance "
             f"{v('reservoir.tol')}), at least {v('reservoir.v_rating')}"
             + (f", ripple current at least {v('engine.cap_ripple_current')}"
                if "engine.cap_ripple_current" in L else ""),
             ("reservoir.c", "reservoir.v_rating")),
    ]
    kind = ctx.spec.output[0].regulator
    if kind in ("zener", "follower"):
        lines += [
            line("R1", "resistor", f"{v('zener.r')} {v('zener.r_p_rating')}",
                 f"resistor {v('zener.r')} +/-{v('zener.r_tol')}, at least "
                 f"{v('zener.r_p_rating')}", ("zener.r", "zener.r_p_rating")),
            line("DZ1", "zener", f"{v('zener.v_nom')} {v('zener.p_rating')}",
                 f"zener diode {v('zener.v_nom')} +/-{v('zener.tol')}, at least "
                 f"{v('zener.p_rating')}", ("zener.v_nom", "zener.p_rating")),
        ]
    if kind == "follower":
        lines.append(line("Q1", "transistor", f"NPN {v('q.v_ce_max')}",
                          f"NPN power transistor, V_CEO at least {v('q.v_ce_max')}, I_C at least "
                          f"{v('output.i_max')}, h_FE at least {v('q.h_fe')}", ("q.v_ce_max",)))
    if kind in ("three-terminal", "adjustable"):
        what = (f"fixed three-terminal regulator {v('reg.v_out')}" if kind == "three-terminal"
                else f"adjustable three-terminal regulator, {v('reg.v_ref')} reference")
        lines.append(line("U1", "regulator", v("reg.v_out"),
                          f"{what}, at least {v('output.i_max')}, dropout at most "
                          f"{v('reg.dropout')}, input rating at least {v('reservoir.v_max')}",
                          ("reg.v_out", "reg.dropout")))
        if kind == "adjustable":
            lines += [line("R2", "resistor", v("reg.r1"), f"resistor {v('reg.r1')} 1 %, OUT to "
                           "ADJ", ("reg.r1",)),
                      line("R3", "resistor", v("reg.r2"), f"resistor {v('reg.r2')} 1 %, ADJ to "
                           "ground", ("reg.r2",))]
    lines.append(line("F1", "fuse", f"{v('fuse.rating')} T",
                      f"fuse-link, time-lag (T), {v('fuse.rating')}, rated for "
                      f"{v('mains.v_high')} or more, in the live lead", ("fuse.rating",)))
    if "bleeder.r" in L:
        lines.append(line("R9", "resistor", f"{v('bleeder.r')} {v('bleeder.p_rating')}",
                          f"bleeder resistor {v('bleeder.r')}, at least {v('bleeder.p_rating')}, "
                          f"across C1", ("bleeder.r", "bleeder.p_rating")))
    for p_, ref in (("reg", "HS1"), ("q", "HS2")):
        if f"{p_}.theta_sa" in L:
            lines.append(line(ref, "heatsink", v(f"{p_}.theta_sa"),
                              f"heat sink, at most {v(f'{p_}.theta_sa')} sink-to-ambient",
                              (f"{p_}.theta_sa",)))
    return lines


def _guarded(fn: Callable[[], Any]) -> Any:
    try:
        return fn()
    except (TraceError, ArithmeticError, ValueError) as exc:
        if isinstance(exc, SpecError):
            raise
        # Requirements that pass validation can still be physically contradictory in a way
        # that surfaces as a non-finite or undefined value; never report such numbers.
        raise InfeasibleDesign(undefined_text(exc)) from None


def run(loaded: LoadedSpec, *, samples: int | None = None) -> Design:
    """Size, verify, check and collect everything for one loaded requirements file.

    ``samples`` overrides the Monte Carlo sample count of the file (0 turns it off).
    Raises InfeasibleDesign when no design of the chosen kind meets the requirements.
    """
    library = library_for(loaded)  # confined to the project: docgen.parts.location
    if loaded.requirements.rectifier.topology == "split":
        from .split import run_split

        return run_split(loaded, library, samples)
    return run_rail(loaded, loaded.requirements, library, samples)


def run_rail(loaded: LoadedSpec, spec: Requirements, library, samples: int | None) -> Design:
    """One rail: a single output fed by its own rectifier and reservoir."""
    ctx = SizingContext(spec=spec, spec_path=str(loaded.path), library=library)
    n_samples = spec.analysis.samples if samples is None else samples
    env = spec.environment
    kind = spec.output[0].regulator
    for _ in range(MAX_PASSES):
        ctx.picks.clear()
        L = _guarded(partial(_size, ctx))
        cr = _guarded(partial(analyse, L, spec.rectifier.topology, 0, spec.analysis.seed,
                              env.ambient_min, env.ambient_max, surge=False, kind=kind))
        _derived_metrics(cr, L, spec)
        if not _bumps(ctx, L, cr):
            break
    # Final run with the Monte Carlo samples and the switch-on surge on the settled design.
    cr = _guarded(partial(analyse, L, spec.rectifier.topology, n_samples, spec.analysis.seed,
                          env.ambient_min, env.ambient_max, kind=kind))
    _derived_metrics(cr, L, spec)
    checks = _engine_values(ctx, L, cr)
    checks += _guarded(partial(_protection, ctx, L, cr))
    checks.sort(key=lambda c: ALL_CHECK_IDS.index(c.id) if c.id in ALL_CHECK_IDS else 100)
    cautions = list(STANDING) + triggered_cautions(
        L["reservoir.v_max"], L["transformer.v_high_nl"], L["reservoir.energy"], checks,
        topology=spec.rectifier.topology,
        dual_frequency=((spec.mains.frequency, spec.mains.also_frequency)
                        if spec.mains.also_frequency else None))
    stages = [Stage("margins", "Design margins", "Derating factors and design ratios used below.")]
    stages += _stage_meta(spec)
    stages.append(Stage("protection", protection.TITLE, protection.INTRO))
    stages.append(Stage("corners", "Worst-case corners (waveform engine)",
                        "Each value below is the worst over the 48 corners named in the "
                        "worst-case section, from the waveform engine; the corner is given "
                        "beside it."))
    notes = [Assumption(f"assume.raised.{name}", f"Raised after the engine verification: "
                        f"{reason}.", "docgen pipeline")
             for name, reason in ctx.floors.reasons.items()]
    return Design(
        spec_path=str(loaded.path),
        spec_text=loaded.text,
        spec_sha256=loaded.sha256,
        requirements=spec,
        stages=stages,
        values=dict(L.values),
        equations=dict(L.equations),
        checks=checks,
        parts=_parts(ctx, L),
        assumptions=list(ASSUMPTIONS) + notes,
        cautions=cautions,
        status=overall_status(checks),
        tool_version=__version__,
        waveforms=cr.waveforms,
        corners=_corner_rows(cr),
        monte_carlo=_monte_carlo(ctx, L, cr),
        samples=({m: cr.sample_metric(m) for m in ("v_out_max", "v_out_min", "v_out_pp",
                                                   "p_zener", "i_z_min", "i_sec_rms", "t_j",
                                                   "v_c_min") if m in cr.metrics}
                 if cr.samples is not None else {}),
        library=(str(ctx.library.path), ctx.library.sha256) if ctx.library else None,
    )
