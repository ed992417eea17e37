"""Each regulator kind against outside numbers (keys of docs/references.md beside each check).

* zener shunt: W2 [SEDRA-SMITH] (also in test_stage_formulas through the whole pipeline).
* emitter follower: [ROSCOE-6.101] V_out = V_Z - V_BE, base current I_L / (beta + 1), and
  Eq. 10.41 (the follower works down to R_L,min = R1 (V_Z - 0.6) / ((beta + 1)(V_CC - V_Z))).
* fixed three-terminal: C-DROPOUT (5 V with 2 V dropout needs 7.0 V at the trough), C-RR
  (2 V p-p in, 60 dB -> 2.0 mV; 73 dB -> 0.448 mV), C-THERMAL (4.0 W, 40 degC, theta_JC 5,
  theta_CS 0.5: theta_SA 12 -> T_J 110.0 degC; T_J,max 125 degC -> theta_SA <= 15.75 degC/W; no sink
  (theta_JA 50) -> 240 degC).
* adjustable three-terminal: [CP-THREE-TERMINAL] V_out = V_ref (1 + R2 / R1) + I_adj R2, R1
  carrying the minimum load: R1 <= V_ref / I_min; [IEC60063] E24 / E96 values.
* unregulated: the reservoir is the output; its figures checked with the independent
  integrator of tests/reference/independent.py.
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from docgen.pipeline import run
from docgen.regulators import thermal
from docgen.spec import load_requirements
from docgen.stages.context import SizingContext
from docgen.trace import Ledger

from .independent import Point
from .test_independent_demo import saturation_at

HEADER = 'schema = 1\n[project]\ntitle = "regulator test"\ndocument_id = "REF-R"\n'


def build(tmp_path: Path, name: str, body: str):
    path = tmp_path / f"{name}.toml"
    path.write_text(HEADER + body, encoding="utf-8")
    design = run(load_requirements(path), samples=0)
    return design, {k: tv.value for k, tv in design.values.items()}


def three_terminal(rr: float, ripple: str, tol: str = "0", extra: str = "") -> str:
    return ('[[output]]\nname = "logic"\nvoltage = "5 V"\nload_max = "0.3 A"\n'
            f'ripple_max = "{ripple}"\nregulator = "three-terminal"\n'
            f'[output.linear]\ndropout = "2 V"\nripple_rejection = {rr}\ntolerance = {tol}\n'
            + extra)


# ------------------------------------------------------------------ fixed three-terminal
def test_fixed_regulator_needs_output_plus_dropout_at_the_trough(tmp_path):
    # C-DROPOUT [CP-THREE-TERMINAL]: 5 V, 2 V dropout -> 7.0 V at the ripple trough. The 2 V
    # is given as the worst-case (datasheet maximum) dropout, the output tolerance is 0 and
    # the ripple-rejection window 0 V, so the published case applies unchanged.
    design, v = build(tmp_path, "dropout", three_terminal(
        60, "2 mV", extra='dropout_max = "2 V"\nrr_window = "0 V"\n'))
    assert v["reg.v_in_floor"] == pytest.approx(7.0, rel=1e-12)
    assert v["regulator.v_in_min_needed"] == pytest.approx(7.0, rel=1e-12)
    # the check compares the trough (engine) with exactly this need
    chk = next(c for c in design.checks if c.id == "check.dropout")
    assert chk.limit == pytest.approx(7.0, rel=1e-12) and chk.sense == "min"


@pytest.mark.parametrize("rr, out_ripple", [(60, 2.0e-3), (73, 0.448e-3)])
def test_ripple_rejection_sets_the_input_ripple_allowed(tmp_path, rr, out_ripple):
    # C-RR [CP-RR]: RR = 20 log10(V_r,in / V_r,out); 2 V p-p in -> 2.0 mV at 60 dB, 0.448 mV at
    # 73 dB (the printed 0.448 is rounded: +/-0.1 %).
    _, v = build(tmp_path, f"rr{rr}", three_terminal(rr, f"{out_ripple} V"))
    assert v["regulator.ripple_in_allowed"] == pytest.approx(2.0, rel=1e-3)


def thermal_ledger(p: float, t_a: float, jc: float, cs: float, ja: float, *,
                   band: float = 0.0, t_j_maker: float = 150.0) -> Ledger:
    # band: the warning band the heat budget keeps as margin; t_j_maker: the maker's junction
    # limit (the design limit is the lower of it and margins.junction_max)
    L = Ledger()
    L.stage = "seed"
    for vid, val, unit in (("reg.p_hand", p, "W"), ("env.t_max", t_a, "degC"),
                           ("reg.theta_jc", jc, "K/W"), ("reg.theta_cs", cs, "K/W"),
                           ("reg.theta_ja", ja, "K/W"), ("margins.warn_band", band, ""),
                           ("reg.t_j_max", t_j_maker, "degC")):
        L.given(vid, vid, val, unit, vid)
    return L


def thermal_spec(tmp_path: Path, junction_max: float):
    path = tmp_path / "thermal.toml"
    path.write_text(HEADER + f"[margins]\njunction_max = {junction_max}\n"
                    + three_terminal(60, "2 mV"), encoding="utf-8")
    return load_requirements(path).requirements


def test_thermal_chain_c_thermal(tmp_path):
    # C-THERMAL [CP-THERMAL]: 10 V mean input, 5 V out, 0.8 A -> P = (10 - 5) x 0.8 = 4.0 W.
    p = (10.0 - 5.0) * 0.8
    assert p == pytest.approx(4.0)
    # The heat sink needed to hold T_J,max = 125 degC at 40 degC ambient:
    # theta_SA = (125 - 40) / 4 - 5 - 0.5 = 15.75 degC/W; without a sink (theta_JA = 50 degC/W)
    # the junction would reach 40 + 4 x 50 = 240 degC.
    spec = thermal_spec(tmp_path, 125.0)
    L = thermal_ledger(p, 40.0, 5.0, 0.5, 50.0)
    thermal.size_heat_budget(SizingContext(spec=spec), L, "reg", "U1", "regulator")
    assert L["reg.t_j_bare"] == pytest.approx(240.0, rel=1e-12)
    assert L["reg.theta_sa_needed"] == pytest.approx(15.75, rel=1e-12)
    # The heat sink sized with a 5 % warning band as margin aims at 125 x 0.95 = 118.75 degC:
    # theta_SA = (118.75 - 40) / 4 - 5.5 = 14.1875 degC/W; a maker's limit below the design
    # limit (115 degC) governs: (115 x 0.95 - 40) / 4 - 5.5 = 11.8125 degC/W.
    L = thermal_ledger(p, 40.0, 5.0, 0.5, 50.0, band=0.05)
    thermal.size_heat_budget(SizingContext(spec=spec), L, "reg", "U1", "regulator")
    assert L["reg.theta_sa_needed"] == pytest.approx(14.1875, rel=1e-12)
    L = thermal_ledger(p, 40.0, 5.0, 0.5, 50.0, band=0.05, t_j_maker=115.0)
    thermal.size_heat_budget(SizingContext(spec=spec), L, "reg", "U1", "regulator")
    assert L["reg.t_j_limit"] == 115.0
    assert L["reg.theta_sa_needed"] == pytest.approx(11.8125, rel=1e-12)
    # With a 12 degC/W sink: T_J = 40 + 4 x (5 + 0.5 + 12) = 110.0 degC.
    L2 = Ledger()
    for vid in ("reg.theta_jc", "reg.theta_cs"):
        L2.given(vid, vid, L[vid], "K/W", vid)
    L2.given("reg.theta_sa", "s", 12.0, "K/W", "sink")
    assert 40.0 + p * thermal.thermal_chain(L2, "reg") == pytest.approx(110.0, rel=1e-12)


def test_no_heat_sink_when_the_bare_junction_is_cool_enough(tmp_path):
    # [CP-THERMAL]: 1 W with theta_JA 50 at 40 degC -> 90 degC, below a 110 degC design limit
    # even with a 5 % warning band as margin (104.5 degC): no heat sink, and the chain is
    # theta_JA alone.
    spec = thermal_spec(tmp_path, 110.0)
    L = thermal_ledger(1.0, 40.0, 5.0, 0.5, 50.0, band=0.05)
    thermal.size_heat_budget(SizingContext(spec=spec), L, "reg", "U1", "regulator")
    assert L["reg.t_j_bare"] == pytest.approx(90.0, rel=1e-12)
    assert "reg.theta_sa" not in L
    assert thermal.thermal_chain(L, "reg") == 50.0


# ------------------------------------------------------------------ adjustable
def test_adjustable_divider(tmp_path):
    # [CP-THREE-TERMINAL] 1.25 V reference, 50 uA adjust current, 5 mA minimum load carried by
    # R1: R1 <= 1.25 V / 5 mA = 250 ohm -> 240 ohm ([IEC60063] E24, down);
    # R2 = (9 - 1.25) / (1.25 / 240 + 50e-6) = 1473.9 ohm -> 1.47 kohm (E96 nearest);
    # V_out = 1.25 (1 + 1470 / 240) + 50e-6 x 1470 = 8.98 V.
    body = ('[[output]]\nname = "adj"\nvoltage = "9 V"\nload_max = "0.2 A"\n'
            'ripple_max = "5 mV"\nregulator = "adjustable"\n')
    _, v = build(tmp_path, "adj", body)
    assert v["reg.v_ref"] == 1.25 and v["reg.i_min_load"] == pytest.approx(5e-3)
    assert v["reg.r1"] == 240.0
    assert v["reg.r2_calc"] == pytest.approx(7.75 / (1.25 / 240 + 50e-6), rel=1e-9)
    assert v["reg.r2"] == 1470.0
    assert v["reg.v_out"] == pytest.approx(1.25 * (1 + 1470 / 240) + 50e-6 * 1470, rel=1e-12)
    assert v["reg.v_out"] == pytest.approx(8.98, abs=0.0005)
    # the divider draws V_ref / R1 from the input on top of the load
    assert v["reg.i_q"] == pytest.approx(1.25 / 240, rel=1e-12)


# ------------------------------------------------------------------ emitter follower
def test_follower_base_drive_roscoe(tmp_path):
    # [ROSCOE-6.101]: V_out = V_Z - V_BE -> V_Z = 12 + 0.7 = 12.7 V; the default zener is the
    # standard value nearest it ([IEC60063] E24: 12 and 13 V neighbour 12.7 V -> 13 V). Base
    # current I_L / (beta + 1) = 1 A / 41 = 24.39 mA; R1 passes I_Z,min + I_B = 5 mA + 24.39 mA.
    body = ('[[output]]\nname = "bench"\nvoltage = "12 V"\nload_max = "1 A"\nload_min = "50 mA"\n'
            'ripple_max = "100 mV"\nregulator = "follower"\n'
            '[output.zener]\ntolerance = "5 %"\nknee_current = "1 mA"\n'
            'dynamic_resistance = "5 ohm"\n[output.transistor]\nh_fe_min = 40\nv_be = "0.7 V"\n')
    design, v = build(tmp_path, "follower", body)
    assert v["zener.v_nom"] == 13.0
    assert v["q.i_b_max"] == pytest.approx(1.0 / 41, rel=1e-12)
    assert v["q.i_r1"] == pytest.approx(5e-3 + 1.0 / 41, rel=1e-12)
    # the output window holds V_Z - V_BE at V_Z's +/-5 % tolerance extremes and 0.7 V: with
    # self-heating, the zener's temperature drift and V_BE's spread it can only be wider
    assert v["output.v_max_est"] >= 13.0 * 1.05 - 0.7 - 1e-9
    assert v["output.v_min_est"] <= 13.0 * 0.95 - 0.7 + 1e-9
    # Eq. 10.41: the follower holds regulation down to R_L,min = R1 (V_Z - 0.6) /
    # ((beta + 1)(V_CC - V_Z)); with the chosen R1 at +tol, the highest zener voltage and the
    # hand trough as V_CC, the full load (12 V / 1 A = 12 ohm) must not be below it.
    r1 = v["zener.r"] * (1 + v["zener.r_tol"])
    v_z, v_cc = v["zener.v_max_hot"], v["reservoir.valley_low"]
    r_l_min = r1 * (v_z - 0.6) / (41 * (v_cc - v_z))
    assert 12.0 / 1.0 >= r_l_min


# ------------------------------------------------------------------ unregulated
def test_unregulated_output_is_the_reservoir(tmp_path):
    # No regulator: the reservoir's trough, peak and ripple are the output's. The figures at the
    # document's own corners are checked with the independent integrator (0.5 %).
    body = ('[transformer]\nsecondary = "12 V"\nva = "10 VA"\nregulation = "15 %"\n'
            '[[output]]\nname = "raw"\nvoltage = "15 V"\ntolerance = "25 %"\n'
            'load_max = "0.2 A"\nripple_max = "1.5 V"\nregulator = "none"\n')
    design, v = build(tmp_path, "none", body)
    rows = {r["name"]: r for r in design.corners}
    for check_id, metric in (("check.output_ripple", "ripple_pp"),
                             ("check.output_low", "v_c_min")):
        chk = next(c for c in design.checks if c.id == check_id)
        row = rows[chk.corner]
        # the document's diode at the corner's junction temperature (ideal-junction law, in
        # the independent-demo test)
        got = Point("bridge", v["transformer.v_nl"] * row["line_factor"], row["freq"],
                    v["transformer.r_w"], v["transformer.l_s"], row["c"], v["reservoir.esr"],
                    load="current", i_load=row["load"],
                    diode_is=saturation_at(v, row["t_diode"]), diode_n=v["rect.d_n"],
                    diode_rs=v["rect.d_rs"], diode_t_c=row["t_diode"]).figures()
        assert chk.value == pytest.approx(got[metric], rel=5e-3), check_id
    # the hand output figures are the reservoir's own
    assert v["regulator.v_in_min_needed"] == pytest.approx(15.0 * 0.75, rel=1e-12)
    assert v["regulator.ripple_in_allowed"] == pytest.approx(1.5, rel=1e-12)
    assert math.isfinite(v["engine.output_ripple"])
