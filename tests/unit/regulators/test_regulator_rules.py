"""Worst-case rules of the regulator kinds (issue 14): junction limits and heat sinks, worst-case
dropout and ripple rejection near dropout, the adjustable regulator's output window, zener
derating with the lead above ambient, self-heating, standard zener voltages, and the follower's
V_BE drift, V_CE check and short-circuit caution.

Outside sources, named beside each check:
* thermal-resistance chain T_J = T_A + P (theta_JC + theta_CS + theta_SA) (common practice),
  with the worked check values P = 4 W, T_A = 40 degC, theta_JC = 5, theta_CS = 0.5,
  theta_SA = 12 K/W -> T_J = 110 degC; theta_SA for T_J = 125 degC -> 15.75 K/W (own arithmetic);
* zener derating P = (T_J,max - T_ref) / R_th: R_thJL = 80 K/W, T_J,max = 175 degC ->
  1.00 W at a 95 degC lead, 0.50 W at 135 degC (own arithmetic with illustrative inputs, "W6");
* the zener shunt exercise (A. S. Sedra, K. C. Smith, zener exercise, from memory; "W2"):
  V_Z = 5.6 V, P_Z,max = 112 mW, used with the temperature-coefficient definition
  Delta V = alpha V_Z Delta T (common practice) for self-heating;
* ripple rejection RR = 20 log10(V_in / V_out): 2 V p-p at 60 dB -> 2.0 mV (own arithmetic);
* IEC 60063 E24 series (zener voltages of +/-5 % parts);
* V_BE falls about 2 mV/K and changes by V_T ln 10 per decade of current (common practice;
  exponential junction law, A. S. Sedra, K. C. Smith, from memory);
* the adjustable regulator relation V_out = V_ref (1 + R2/R1) + I_ADJ R2 (common practice).
Closed forms are derived in the tests from the design's own inputs.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

from docgen.parts.library import Zener as LibZener
from docgen.pipeline import run
from docgen.regulators import regulator
from docgen.regulators.rules import round_down_2sig, standard_zener_voltage
from docgen.regulators.thermal import size_heat_budget
from docgen.spec import load_requirements
from docgen.stages.context import SizingContext
from docgen.trace import Ledger

from ...conftest import DATA, ROOT

SPECS = ROOT / "specs"
LIBRARY = SPECS / "parts" / "demo-parts.toml"


def _variant(tmp_path: Path, name: str, text: str) -> Path:
    """A spec written to ``tmp_path`` with the demo library path made absolute."""
    text = text.replace('library = "parts/demo-parts.toml"', f'library = "{LIBRARY.as_posix()}"')
    path = tmp_path / name
    path.write_text(text)
    return path


def _check(design, check_id):
    return next(c for c in design.checks if c.id == check_id)


@pytest.fixture(scope="module")
def us5v():
    return run(load_requirements(SPECS / "us-controller-5v-120v.toml"))


@pytest.fixture(scope="module")
def follower():
    return run(load_requirements(SPECS / "bench-psu-12v-follower.toml"))


@pytest.fixture(scope="module")
def adjustable():
    return run(load_requirements(SPECS / "lab-reference-adjustable.toml"))


# -- junction limits and heat sinks --------------------------------------------------------------

def _heat_budget(t_j_design: float, t_j_maker: float, band: float) -> Ledger:
    """The heat budget of the thermal-chain worked example (P = 4 W, T_A = 40 degC,
    theta_JC = 5, theta_CS = 0.5 K/W, theta_JA = 50 K/W)."""
    spec = load_requirements(DATA / "all-pass.toml").requirements
    spec = spec.model_copy(update={"margins": spec.margins.model_copy(
        update={"junction_max": t_j_design, "warn_band": band})})
    ctx = SizingContext(spec=spec)
    L = Ledger()
    L.given("env.t_max", "T", 40.0, "degC", "ambient")
    L.given("margins.warn_band", "w", band, "%", "band")
    L.given("reg.t_j_max", "T", t_j_maker, "degC", "maker")
    L.given("reg.p_hand", "P", 4.0, "W", "dissipation")
    L.given("reg.theta_jc", "t", 5.0, "K/W", "jc")
    L.given("reg.theta_cs", "t", 0.5, "K/W", "cs")
    L.given("reg.theta_ja", "t", 50.0, "K/W", "ja")
    size_heat_budget(ctx, L, "reg", "U1", "regulator")
    return L


def test_heat_sink_of_the_thermal_chain_example_without_band():
    # common practice, thermal chain: theta_SA = (125 - 40) / 4 - 5 - 0.5 = 15.75 K/W
    L = _heat_budget(125.0, 150.0, 0.0)
    assert L["reg.t_j_bare"] == pytest.approx(40 + 4 * 50)  # 240 degC bare: a sink is needed
    assert L["reg.theta_sa_needed"] == pytest.approx(15.75)
    # with the example's 12 K/W sink the junction is at 110 degC
    assert 40 + 4 * (5 + 0.5 + 12) == pytest.approx(110.0)


def test_heat_sink_keeps_the_warning_band_as_margin():
    band = 0.05
    L = _heat_budget(125.0, 150.0, band)
    target = 125.0 * (1 - band)
    assert L["reg.theta_sa_needed"] == pytest.approx((target - 40) / 4 - 5.5)
    t_j = 40 + 4 * (5 + 0.5 + L["reg.theta_sa"])
    margin = (125.0 - t_j) / 125.0
    # the old sizing put T_J exactly on 125 degC (margin 0: WARN for ever)
    assert margin >= band
    assert L["reg.theta_sa"] <= L["reg.theta_sa_needed"]


def test_junction_limit_is_the_lower_of_design_and_maker():
    L = _heat_budget(130.0, 125.0, 0.05)
    assert L["reg.t_j_limit"] == 125.0
    assert L["reg.theta_sa_needed"] == pytest.approx((125.0 * 0.95 - 40) / 4 - 5.5)


def test_round_down_two_figures():
    assert round_down_2sig(15.75) == pytest.approx(15.0)
    assert round_down_2sig(0.5398) == pytest.approx(0.53)
    assert round_down_2sig(38.95) == pytest.approx(38.0)
    assert round_down_2sig(12.0) == pytest.approx(12.0)


def test_no_junction_check_of_a_demo_lands_in_the_warning_band(us5v, adjustable, follower):
    for design in (us5v, adjustable, follower):
        band = design.requirements.margins.warn_band
        for c in design.checks:
            if c.id.endswith("_junction"):
                assert c.margin >= band, (c.id, c.value, c.limit)


def test_design_limit_above_the_makers_fails_and_the_check_uses_the_makers(tmp_path):
    text = (SPECS / "us-controller-5v-120v.toml").read_text()
    text += '\n[margins]\njunction_max = "130 degC"\n'
    design = run(load_requirements(_variant(tmp_path, "hot.toml", text)))
    rating = _check(design, "check.regulator_t_j_rating")
    assert rating.status == "fail" and rating.limit == 125.0 and rating.value == 130.0
    assert _check(design, "check.regulator_junction").limit == 125.0


# -- three-terminal: dropout and ripple rejection ----------------------------------------------

def test_typical_dropout_gets_the_allowance(us5v):
    v = us5v.values
    assert v["reg.dropout"].value == 2.0  # as written in the file, not replaced
    assert v["reg.dropout_max"].value == pytest.approx(2.0 + 0.5)
    dropout = _check(us5v, "check.dropout")
    # the old check used the typical 2 V: limit 5.2 V + 2 V = 7.2 V
    assert dropout.limit == pytest.approx(5.0 * 1.04 + 2.5)
    # the reservoir is sized for the ripple-rejection window above that floor
    assert v["regulator.v_in_min_needed"].value == pytest.approx(dropout.limit + 1.0)


def test_a_datasheet_maximum_replaces_the_allowance(tmp_path):
    text = (SPECS / "us-controller-5v-120v.toml").read_text().replace(
        'dropout = "2 V"', 'dropout = "2 V"\ndropout_max = "2.8 V"')
    design = run(load_requirements(_variant(tmp_path, "dmax.toml", text)))
    assert design.values["reg.dropout_max"].value == 2.8
    assert "reg.dropout_allowance" not in design.values
    assert _check(design, "check.dropout").limit == pytest.approx(5.2 + 2.8)


class _Pts:
    def __init__(self, n, v_set=5.0):
        self.load = np.full(n, 0.3)
        self.v_z = np.full(n, v_set)  # the regulator's output setpoint at each point


def test_ripple_rejection_is_reduced_near_dropout(us5v):
    L = Ledger()
    for vid, value in us5v.values.items():
        L.given(vid, "x", value.value, value.unit, "copy")
    kind = regulator("three-terminal")
    floor = L["reg.v_in_floor"]
    m = {"v_c_min": np.array([floor + 0.5, floor + 2.0]), "v_c_mean": np.array([10.0, 11.0]),
         "v_c_max": np.array([floor + 2.5, floor + 4.0]),
         "ripple_pp": np.array([2.0, 2.0])}
    out = kind.derived_metrics(L, _Pts(2), m)["v_out_pp"]
    rr, loss = L["reg.rr"], L["reg.rr_loss"]
    # RR = 20 log10(V_in / V_out): 2 V at 62 dB -> 1.59 mV; inside the window 20 dB less
    assert out[1] == pytest.approx(2.0 / 10 ** (rr / 20))
    assert out[0] == pytest.approx(2.0 / 10 ** ((rr - loss) / 20))
    assert out[0] == pytest.approx(10 * out[1])


def test_ripple_rejection_arithmetic_of_the_worked_values():
    # 2 V p-p through 60 dB is 2.0 mV (own arithmetic on the definition)
    assert 2.0 * 10 ** (-60 / 20) == pytest.approx(2.0e-3)


# -- adjustable: output window --------------------------------------------------------------------

def test_adjustable_window_takes_divider_and_adjust_current(adjustable):
    v = {k: x.value for k, x in adjustable.values.items()}
    ref, t, r1, r2 = v["reg.v_ref"], v["reg.tol"], v["reg.r1"], v["reg.r2"]
    p, i_max = v["reg.div_tol"], v["reg.i_adj_max"]
    # V_out = V_ref (1 + R2/R1) + I_ADJ R2 at the extremes of each term
    hi = ref * (1 + t) * (1 + r2 * (1 + p) / (r1 * (1 - p))) + i_max * r2 * (1 + p)
    lo = ref * (1 - t) * (1 + r2 * (1 - p) / (r1 * (1 + p)))
    assert v["reg.v_out_max"] == pytest.approx(hi)
    assert v["reg.v_out_min"] == pytest.approx(lo)
    # wider than the reference tolerance alone (the old window)
    assert v["reg.v_out_max"] > v["reg.v_out"] * (1 + t)
    assert v["reg.v_out_min"] < v["reg.v_out"] * (1 - t)
    assert _check(adjustable, "check.output_high").value == pytest.approx(hi)


# -- zeners -------------------------------------------------------------------------------------

W6 = dict(id="W6", voltage="9.1 V", tolerance="5 %", power="1 W", power_reference="lead",
          power_reference_temperature="95 degC", t_j_max="175 degC", r_theta="80 K/W",
          knee_current="1 mA", test_current="20 mA", dynamic_resistance="5 ohm",
          tempco="0.05 %/K")


def test_w6_derating_at_the_lead():
    z = LibZener.model_validate(W6)
    # (175 - 95) / 80 = 1.00 W; (175 - 135) / 80 = 0.50 W
    assert z.power_at(95.0) == pytest.approx(1.0)
    assert z.power_at(135.0) == pytest.approx(0.5)


def test_lead_rated_zener_is_derated_with_its_lead_above_ambient():
    z = LibZener.model_validate(W6)
    t_a, r_la = 55.0, 80.0
    p = z.power_at_ambient(t_a, r_la)
    # the old reading put the lead at ambient: 1 W
    assert z.power_at(t_a) == pytest.approx(1.0)
    assert p == pytest.approx((175 - 55) / (80 + 80))
    # self-consistent: at the lead temperature T_A + P R_LA, the W6 derating allows exactly P
    assert z.power_at(t_a + p * r_la) == pytest.approx(p)


def test_demo_lead_rated_zener_uses_the_lead_path():
    design = run(load_requirements(SPECS / "hydroponic-sensor-hub.toml"))
    v = design.values
    part = design.parts[[p.ref for p in design.parts].index("DZ1")]
    assert part.part_id == "DP-Z-9V1-5W"
    # library: 5 W at a 75 degC lead, R_thJL 20 K/W, lead to ambient 25 K/W, 45 degC ambient
    assert v["zener.p_rating_amb"].value == pytest.approx((175 - 45) / (20 + 25))
    assert v["zener.theta_ja"].value == pytest.approx(45.0)


def test_self_heating_of_the_w2_zener():
    # W2: 5.6 V, worst-case dissipation 112 mW; illustrative 300 K/W and +0.05 %/K
    from docgen.regulators.zener_part import self_heating

    L = Ledger()
    L.given("zener.tempco", "a", 0.0005, "%/degC", "tempco")
    L.given("zener.v_nom", "V", 5.6, "V", "V_Z")
    L.given("zener.p", "P", (15 - 5.6) / 470 * 5.6, "W", "P_Z")
    L.given("zener.theta_ja", "R", 300.0, "K/W", "R_th")
    L.given("zener.v_max", "V", 5.88, "V", "max")
    L.given("zener.v_min", "V", 5.32, "V", "min")
    self_heating(L)
    assert L["zener.p"] == pytest.approx(0.112)  # the exercise's P_Z,max
    rise = 0.112 * 300.0  # 33.6 K above ambient
    assert L["zener.dv_self"] == pytest.approx(0.0005 * 5.6 * rise)
    assert L["zener.v_max_hot"] == pytest.approx(5.88 + 0.0005 * 5.6 * rise)
    assert L["zener.v_min_hot"] == pytest.approx(5.32)  # a positive coefficient only raises


def test_shunt_corner_includes_self_heating(tmp_path):
    design = run(load_requirements(DATA / "all-pass.toml"))
    v = {k: x.value for k, x in design.values.items()}
    knee_hi = max(r["v_z"] for r in design.corners)
    assert knee_hi == pytest.approx(v["zener.v_knee_max"] + v["zener.dv_self"])
    assert v["zener.dv_self"] == pytest.approx(
        abs(v["zener.tempco"]) * v["zener.v_nom"] * v["zener.p"] * v["zener.theta_ja"])


def test_generic_zener_is_derated_from_25_degc():
    design = run(load_requirements(DATA / "all-pass.toml"))
    v = {k: x.value for k, x in design.values.items()}
    # rated at 25 degC free air, zero at 175 degC: P x (175 - 30) / 150 for a standard
    # rating P (0.5 W or 1 W, as the sizing needs)
    p = v["zener.p_rating"]
    assert p in (0.5, 1.0)
    assert v["zener.p_rating_amb"] == pytest.approx(p * (175 - 30) / 150)
    assert _check(design, "check.zener_power").limit == pytest.approx(
        v["zener.p_rating_amb"] * 0.5)


@pytest.mark.parametrize("target, expected", [(12.7, 13.0), (25.4, 24.0), (9.1, 9.1),
                                              (5.0, 5.1), (0.95, 0.91)])
def test_standard_zener_voltage_is_e24(target, expected):
    v, ok = standard_zener_voltage(target, lambda _: True)
    assert ok and v == pytest.approx(expected)


def test_standard_zener_voltage_skips_values_that_break_the_window():
    v, ok = standard_zener_voltage(12.7, lambda x: x < 12.5)
    assert ok and v == pytest.approx(12.0)
    v, ok = standard_zener_voltage(12.7, lambda x: False)
    assert not ok and v == pytest.approx(13.0)


# -- follower ------------------------------------------------------------------------------

def test_follower_zener_is_a_standard_value_and_the_output_is_shown(follower):
    v = {k: x.value for k, x in follower.values.items()}
    # 12 V + 0.7 V = 12.7 V is not an E24 value; the nearest buyable one is 13 V
    assert v["zener.v_target"] == pytest.approx(12.7)
    assert v["zener.v_nom"] == pytest.approx(13.0)
    assert v["output.v_set"] == pytest.approx(13.0 - 0.7)


def test_follower_window_has_tempco_self_heating_and_vbe_drift(follower):
    v = {k: x.value for k, x in follower.values.items()}
    vz, t, a = v["zener.v_nom"], v["zener.tol"], v["zener.tempco"]
    d_t = max(abs(v["env.t_max"] - 25), abs(v["env.t_min"] - 25))
    vz_hi = vz * (1 + t) + abs(a) * vz * d_t + abs(a) * vz * v["zener.p"] * v["zener.theta_ja"]
    # V_BE: -2 mV/K; 60 mV per decade; 50 mA least load of 1 A is log10(20) decades
    decades = math.log10(1.0 / 0.05)
    assert v["q.decades"] == pytest.approx(decades)
    vbe_min = 0.7 - max(0.002 * (40 - 25) + 0.06 * decades, 0.002 * (v["q.t_j_target"] - 25))
    vbe_max = 0.7 + 0.002 * (25 - 0)
    assert v["q.v_be_min"] == pytest.approx(vbe_min)
    assert v["q.v_be_max"] == pytest.approx(vbe_max)
    assert v["output.v_max_est"] == pytest.approx(vz_hi - vbe_min)
    assert v["output.v_min_est"] == pytest.approx(vz * (1 - t) - abs(a) * vz * d_t - vbe_max)


def test_follower_vce_rating_is_checked_when_given(tmp_path):
    text = (SPECS / "bench-psu-12v-follower.toml").read_text().replace(
        "h_fe_min = 40", 'h_fe_min = 40\nv_ceo = "18 V"')
    design = run(load_requirements(_variant(tmp_path, "vce.toml", text)))
    c = _check(design, "check.transistor_vce")
    v = design.values
    assert c.value == pytest.approx(v["reservoir.v_max"].value - v["output.v_min_est"].value)
    # the no-load peak less the lowest output, about 19.5 V, across an 18 V part
    assert c.limit == 18.0 and c.value > 19.0 and c.status == "fail"


def test_follower_short_circuit_caution_from_the_design(follower):
    v = {k: x.value for k, x in follower.values.items()}
    i_sc = (v["q.h_fe"] + 1) * (v["reservoir.v_mean_high"] - v["q.v_be"]) / v["zener.r"]
    assert v["q.i_sc"] == pytest.approx(i_sc)
    assert v["q.p_sc"] == pytest.approx(v["reservoir.v_mean_high"] * i_sc)
    caution = next(c for c in follower.cautions if c.id == "caution.follower_short")
    from docgen.units import format_quantity

    assert format_quantity(v["q.p_sc"], "W") in caution.text
    assert format_quantity(v["q.i_sc"], "A") in caution.text
    assert "does not check survival of a short circuit" in caution.text
    assert not any(c.id == "caution.follower_short" for c in run(
        load_requirements(SPECS / "us-controller-5v-120v.toml")).cautions)


def test_not_covered_statements_are_in_the_assumptions(follower, us5v):
    text = next(a.text for a in follower.assumptions if a.id == "assume.not_covered.regulator")
    assert "safe operating area" in text and "secondary breakdown" in text
    text = next(a.text for a in us5v.assumptions if a.id == "assume.not_covered.regulator")
    assert "current limit" in text


def test_standard_zener_voltage_has_candidates_at_any_scale():
    """IEC 60063 E24 steps scale by decades: a target of any size has a nearest step (the
    candidates were once rounded to six decimals, which left none below about 1 uV)."""
    from docgen.regulators.rules import standard_zener_voltage

    for target in (1e-300, 1e-9, 9.1, 9.1e6):
        v, fits = standard_zener_voltage(target, lambda v: True)
        assert fits and target / 1.25 <= v <= target * 1.25
    assert standard_zener_voltage(9.0, lambda v: True)[0] == pytest.approx(9.1)
