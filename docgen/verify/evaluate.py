"""Checks of a verified design: the engine's worst-corner figures traced and compared with
their limits, the checks on hand figures, capacitor life, and the protection sized from the
engine's currents."""

from __future__ import annotations

import math

import numpy as np

from .. import equations as eq
from ..design import Check
from ..errors import InfeasibleDesign
from ..stages import protection
from ..stages.context import SizingContext
from ..topology import topology
from ..trace import Ledger
from .checks import make_check
from .corners import CornerResult, model_inputs
from .regulation import regulation_checks
from .worst import worst_corner

# Ids the evaluation writes (stage "corners"): engine figures and capacitor life.
WRITES = ("engine.", "reservoir.life", "reservoir.t_core", "reservoir.r_th", "env.required_life")
LIFE_CAP = 15 * 8766 * 3600.0  # s; 15 years of 8766 h
# Engine figures computed from the engine's waveforms by a rule of their own.
ENGINE_EQUATIONS = {"holdup": eq.HOLDUP_ENGINE}


def designator(spec, ref: str) -> str:
    """Designators that depend on the topology: RECT is BR1 for a bridge, D1 otherwise."""
    return topology(spec.rectifier.topology).designator if ref == "RECT" else ref


def engine_checks(ctx: SizingContext, L: Ledger, cr: CornerResult, reg) -> list[Check]:
    """Trace the worst-corner engine figures and turn them into checks."""
    spec = ctx.spec
    w = spec.margins.warn_band
    L.stage = "corners"
    checks: list[Check] = []
    inputs = model_inputs(L)
    for chk in reg.engine_checks:
        if chk.limit_id not in L:
            continue
        value, k = worst_corner(cr, chk)
        if k < 0:
            raise InfeasibleDesign(
                f"the waveform engine did not converge at any corner for {chk.title.lower()}; "
                "no number is reported that was not converged to")
        where = cr.corners.name[k]
        if not chk.nominal_line_only:
            value, where = worse_sample(cr, chk.metric, chk.sense, value, where)
        vid = f"engine.{chk.id.split('.', 1)[1]}"
        title = f"{chk.title.split(' <=')[0].split(' >=')[0]} (engine, worst corner)"
        if chk.metric == "holdup":
            title = (f"Hold-up time (engine, worst corner): mains lost at the trough, down to "
                     f"{reg.holdup_stop}")
        L.measured(vid, ENGINE_EQUATIONS.get(chk.metric, eq.ENGINE), chk.symbol, value,
                   chk.unit, title, inputs, where)
        checks.append(make_check(L, chk.id, chk.title, vid, chk.limit_id, chk.sense,
                                 where, w, ref=designator(spec, chk.ref),
                                 requirement=chk.requirement))
    verified_stresses(L, cr)
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
                                 ref=designator(spec, "RECT")))
    # Nominal-corner figures for the summary: efficiency, VA, ripple current.
    k = cr.nominal_index
    where = cr.corners.name[k]
    if not (bool(cr.converged[k]) and math.isfinite(float(cr.metrics["p_in"][k]))):
        raise InfeasibleDesign(
            f"the waveform engine found no steady state at the nominal corner ({where}); no "
            "efficiency or nominal figure is reported that was not converged to; check the "
            "transformer (winding resistance, leakage) and the load")
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
    checks += regulation_checks(ctx, L, cr, reg)
    checks += hand_checks(ctx, L, cr, reg)
    return checks


def worse_sample(cr: CornerResult, metric: str, sense: str, value: float, where: str
                 ) -> tuple[float, str]:
    """The worst corner's figure, or a Monte Carlo sample's where one is worse: the verified
    figure is the worst over the corners and the samples."""
    if cr.samples is None or metric not in cr.metrics:
        return value, where
    s = np.asarray(cr.sample_metric(metric), dtype=float)
    conv = np.asarray(cr.converged, dtype=bool)
    if len(conv) == cr.n_corners + len(s):
        s = np.where(conv[cr.n_corners:], s, np.nan)
    if not np.isfinite(s).any():
        return value, where
    j = int(np.nanargmax(s) if sense == "max" else np.nanargmin(s))
    worse = s[j] > value if sense == "max" else s[j] < value
    if worse:
        return float(s[j]), f"Monte Carlo sample {j + 1} of {len(s)}"
    return value, where


# Engine figures of stresses that no check reads but the document states beside their initial
# estimates (docgen.verify.stresses): metric, value id, symbol, unit, title, sense.
VERIFIED_STRESSES = (
    ("i_d_peak", "engine.i_d_peak", r"I_{D,pk}", "A", "Repetitive peak diode current", "max"),
    ("conduction_angle", "engine.conduction_min", r"\theta_{min}", "rad",
     "Shortest conduction angle per pulse", "min"),
    ("p_reg", "engine.regulator_power", r"P_{reg}", "W", "Regulator dissipation", "max"),
    ("p_q", "engine.transistor_power", r"P_Q", "W", "Pass-transistor dissipation", "max"),
)


def verified_stresses(L: Ledger, cr: CornerResult) -> None:
    """The worst over corners and samples of each stress in VERIFIED_STRESSES the kind has."""
    for metric, vid, sym, unit, title, sense in VERIFIED_STRESSES:
        if metric not in cr.metrics:
            continue
        values = np.asarray(cr.corner_metric(metric), dtype=float)
        if not np.isfinite(values).any():
            continue
        k = int(np.nanargmax(values) if sense == "max" else np.nanargmin(values))
        value, where = worse_sample(cr, metric, sense, float(values[k]), cr.corners.name[k])
        L.measured(vid, eq.ENGINE, sym, value, unit, f"{title} (engine, worst corner)",
                   model_inputs(L), where)


def hand_checks(ctx: SizingContext, L: Ledger, cr: CornerResult, reg) -> list[Check]:
    spec = ctx.spec
    w = spec.margins.warn_band
    out = [
        make_check(L, "check.cap_voltage", "Capacitor voltage <= derated rating",
                   "reservoir.v_max", "reservoir.v_allowed", "max", "high line, no load", w,
                   ref="C1", requirement="margins.capacitor_voltage_derating"),
        make_check(L, "check.bridge_piv", "Diode reverse voltage <= derated V_RRM", "rect.piv",
                   "rect.v_allowed", "max", "high line, no load", w, ref=designator(spec, "RECT"),
                   requirement="margins.diode_voltage_derating"),
    ]
    out += reg.hand_checks(ctx, L, w)
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


def fuse_surge_check(L: Ledger, w: float, prefix: str = "") -> Check:
    """The switch-on I2t against the derated melting I2t; never left out: when the engine gave
    no switch-on transient the check fails and says so."""
    if prefix + "fuse.i2t_surge" in L:
        return make_check(L, prefix + "check.fuse_surge",
                          "Switch-on I2t <= k_pulse x fuse melting I2t", prefix + "fuse.i2t_surge",
                          prefix + "fuse.i2t_allowed", "max", "switch-on at the crest, high line, "
                          "C +tol, charging transient + magnetising inrush", w, ref="F1",
                          requirement="protection.pulse_derating")
    L.given(prefix + "fuse.i2t_unknown", r"N_{I^2t}", 1.0, "",
            "Switch-on I2t not known (the engine's switch-on transient did not converge)",
            source="waveform engine")
    L.given(prefix + "fuse.i2t_unknown_allowed", r"N_{I^2t,max}", 0.0, "",
            "Unknown switch-on I2t allowed", source="the fuse must be checked")
    return make_check(L, prefix + "check.fuse_surge", "Switch-on I2t known and within the fuse",
                      prefix + "fuse.i2t_unknown", prefix + "fuse.i2t_unknown_allowed", "max",
                      "switch-on transient not converged", 0.0, ref="F1")


def fuse_voltage_check(L: Ledger, w: float) -> list[Check]:
    """A part's voltage rating against the nominal mains (a sized fuse is specified by it)."""
    if "fuse.v_rating" not in L:
        return []
    return [make_check(L, "check.fuse_voltage", "Fuse voltage rating >= nominal mains voltage",
                       "fuse.v_need", "fuse.v_rating", "max", "nominal mains", 0.0, ref="F1",
                       requirement="protection.fuse_part")]


def protection_checks(ctx: SizingContext, L: Ledger, cr: CornerResult) -> list[Check]:
    """Fuse and bleeder, sized after the engine has given the operating and surge currents."""
    w = ctx.spec.margins.warn_band
    nominal = np.array([n.startswith("nominal mains, full load") for n in cr.corners.name])
    i_sec = float(np.nanmax(np.where(nominal, cr.corner_metric("i_sec_rms"), np.nan)))
    L.stage = "protection"
    protection.size_protection(ctx, L, i_sec, cr)
    out = [make_check(L, "check.fuse_operating", "Fuse rating >= k_F x operating primary current",
                      "fuse.i_pri_margin", "fuse.rating", "max", "nominal mains, full load", w,
                      ref="F1", requirement="protection.fuse_factor")]
    out.append(fuse_surge_check(L, w))
    out += fuse_voltage_check(L, w)
    if "bleeder.time" in L:
        out.append(make_check(L, "check.bleeder_time", "Discharge time <= allowed time",
                              "bleeder.time", "bleeder.t", "max", "high line, no load, C +tol",
                              w, ref="R9", requirement="protection.discharge_time"))
    return out


