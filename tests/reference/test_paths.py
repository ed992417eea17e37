"""Every rectifier path against outside numbers: bridge, center tap, half-wave and split.

Sources are keys of docs/references.md, named beside each check:
* C-PIV / [DERIVED-PIV]: 12 V RMS -> bridge 16.97 V; 12-0-12 center tap 33.94 V; half-wave with a
  reservoir 33.94 V (the capacitor holds +Vpk while the winding swings to -Vpk).
* [DERIVED-CHARGE]: per-diode average current I_DC (half-wave), I_DC / 2 (center tap, bridge).
* [DERIVED-RMS]: I_C,rms = sqrt(I_rect,rms^2 - I_DC^2); a center-tap half winding carries one
  diode's pulse train, so I_rect,rms = sqrt(2) I_half,rms.
* W1 / C-RIPPLE ([SEDRA-SMITH]): half-wave i_D,max = I_L (1 + 2 pi sqrt(2 Vpk / V_r)) = 638 mA for
  Vpk = 100 V, V_r = 2 V, I_L = 10 mA; full-wave 324 mA; ripple 1 A into 4700 uF: 2.128 V
  full-wave, 4.255 V half-wave (ripple at f half-wave, 2 f full-wave).
The expected values are the printed check values or are derived in the test from first
principles; production's figures are never the reference.
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from docgen.pipeline import run
from docgen.spec import load_requirements
from docgen.stages import rectifier, reservoir

from .independent import Point
from .test_stage_formulas import call_stage, stage_ledger

HEADER = 'schema = 1\n[project]\ntitle = "path test"\ndocument_id = "REF-P"\n'
ZENER_OUT = ('[[output]]\nname = "rail"\nvoltage = "5.6 V"\nload_max = "15 mA"\n'
             'ripple_max = "50 mV"\n')
SPLIT_OUT = "".join(
    f'[[output]]\nname = "{p}"\npolarity = "{p}"\nvoltage = "5 V"\nload_max = "50 mA"\n'
    f'ripple_max = "10 mV"\nregulator = "three-terminal"\n' for p in ("positive", "negative"))


def build(tmp_path: Path, topology: str, secondary: float, *, outputs: str = ZENER_OUT,
          extra: str = ""):
    """A design with a fixed transformer whose no-load voltage is `secondary` V RMS (center tap:
    the whole winding): rated secondary V_NL / 1.1 with 10 % regulation, V_NL = V_FL (1 + Reg)
    ([CP-REGULATION], W5), and no high-line tolerance, so the no-load high-line peak is
    sqrt(2) x the conducting winding's no-load voltage."""
    body = (HEADER + "[mains]\ntolerance_high = 0\n"
            f'[rectifier]\ntopology = "{topology}"\n'
            f'[transformer]\nsecondary = {secondary / 1.1!r}\nva = "10 VA"\nregulation = 0.1\n'
            + extra + outputs)
    path = tmp_path / f"{topology}.toml"
    path.write_text(body, encoding="utf-8")
    design = run(load_requirements(path), samples=0)
    return design, {k: tv.value for k, tv in design.values.items()}


@pytest.fixture(scope="module")
def designs(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("paths")
    return {
        "bridge": build(tmp, "bridge", 12.0),
        # 12-0-12: the file gives the whole winding, 24 V
        "center-tap": build(tmp, "center-tap", 24.0),
        "half-wave": build(tmp, "half-wave", 12.0),
        "split": build(tmp, "split", 24.0, outputs=SPLIT_OUT),
    }


# ---------------------------------------------------------------- reverse voltage (C-PIV)
@pytest.mark.parametrize("topology, piv", [
    ("bridge", 16.97),  # C-PIV: bridge, each blocking diode sees the winding peak
    ("center-tap", 33.94),  # C-PIV: 12-0-12, the whole winding's peak
    ("half-wave", 33.94),  # C-PIV: half-wave with C, 2 Vpk
])
def test_peak_inverse_voltage(designs, topology, piv):
    _, v = designs[topology]
    assert v["rect.piv"] == pytest.approx(piv, abs=0.005)
    # The reservoir's highest voltage is one winding's peak in every path (C-PIV: 16.97 V).
    assert v["reservoir.v_max"] == pytest.approx(16.97, abs=0.005)


def test_split_rails_each_see_the_whole_winding(designs):
    # [DERIVED-PIV]: a bridge on a center-tapped winding feeding two rails: a diode to the +
    # rail blocks from +Vpk (its rail) to -Vpk (the far end of its half winding): 2 x 16.97 V.
    design, v = designs["split"]
    for prefix in ("", "neg."):
        assert v[prefix + "rect.piv"] == pytest.approx(33.94, abs=0.005)
        assert v[prefix + "transformer.v_nl"] == pytest.approx(12.0, rel=1e-12)
        assert v[prefix + "reservoir.v_max"] == pytest.approx(16.97, abs=0.005)


def test_center_tap_half_winding_split(designs):
    # The file's 24 V is the whole winding; each diode conducts from one 12 V half.
    _, v = designs["center-tap"]
    assert v["transformer.v_rated"] == pytest.approx(24.0 / 1.1, rel=1e-12)
    assert v["transformer.v_path"] == pytest.approx(12.0 / 1.1, rel=1e-12)
    assert v["transformer.v_nl"] == pytest.approx(12.0, rel=1e-12)  # W5: V_FL (1 + 10 %)


# ---------------------------------------------------------------- average current per diode
@pytest.mark.parametrize("topology, share", [("bridge", 0.5), ("center-tap", 0.5),
                                             ("half-wave", 1.0)])
def test_average_current_per_diode(designs, topology, share):
    # [DERIVED-CHARGE]: the diodes together carry the DC current; two alternate in full wave.
    _, v = designs[topology]
    assert v["rect.i_avg"] == pytest.approx(share * v["regulator.i_in_max"], rel=1e-12)


# ---------------------------------------------------------------- capacitor ripple current
def test_ripple_current_identity_in_an_independent_integration():
    # [DERIVED-RMS] shown on an integrated center-tap circuit (tests/reference/independent.py):
    # with a constant-current load i_C = i_rect - I_DC, so I_C,rms^2 = I_rect,rms^2 - I_DC^2,
    # and the rectifier output is the two half windings' pulse trains: I_rect,rms^2 =
    # 2 I_half,rms^2. The capacitor ripple current is therefore I_DC sqrt(2 k^2 - 1) with
    # k = I_half,rms / I_DC, not I_DC sqrt(k^2 - 1).
    f = Point("center-tap", v_rms=12.0, freq=50.0, r_s=0.4, l_s=0.5e-3, c=2200e-6, esr=0.03,
              i_load=0.5).figures()
    k = f["i_sec_rms"] / 0.5
    assert f["i_c_rms"] == pytest.approx(0.5 * math.sqrt(2 * k * k - 1), rel=2e-3)
    assert f["i_c_rms"] > 1.5 * 0.5 * math.sqrt(k * k - 1)  # the half-winding form is far off


@pytest.mark.parametrize("topology", [
    "bridge",
    # a center-tap rectifier's output carries both half windings' pulses: I_DC sqrt(2 k^2 - 1)
    # with k the per-half-winding ratio ([DERIVED-RMS]); the estimate was half this before
    "center-tap",
    "half-wave",
])
def test_capacitor_ripple_current_estimate(designs, topology):
    # [DERIVED-RMS] with the secondary RMS ratio k of [CP-SELECTION-TABLES] (per conducting
    # winding): rectifier output RMS = k I_DC (bridge: the winding carries the whole output;
    # half-wave: the winding is the output) or sqrt(2) k I_DC (center tap: two half windings).
    _, v = designs[topology]
    k = v["margins.secondary_rms_factor"]
    per_output = 2.0 if topology == "center-tap" else 1.0
    expected = v["regulator.i_in_high_est"] * math.sqrt(per_output * k * k - 1)
    assert v["reservoir.i_ripple_est"] == pytest.approx(expected, rel=1e-9)


# ---------------------------------------------------------------- half-wave sizing formulas
def half_wave_seed(designs, stage: str, inputs: dict):
    design, _ = designs["half-wave"]
    return design.requirements, stage_ledger(design, stage, inputs)


def test_half_wave_ripple_frequency_is_the_mains_frequency(designs):
    # [SEDRA-SMITH]: one charging pulse per period; full wave two.
    assert designs["half-wave"][1]["mains.ripple_freq"] == 50.0
    assert designs["center-tap"][1]["mains.ripple_freq"] == 100.0
    assert designs["bridge"][1]["mains.ripple_freq"] == 100.0


def test_half_wave_w1_peak_diode_current(designs):
    # W1 [SEDRA-SMITH]: half-wave, Vpk = 100 V, I_L = 10 mA, V_r = 2 V -> i_D,max = 638 mA
    # (+/-0.5 %); the full-wave variant gives 324 mA (tested on the bridge in
    # test_stage_formulas).
    spec, L = half_wave_seed(designs, "rectifier", {
        "margins.secondary_rms_factor": 3.6, "transformer.v_high_nl": 12.0,
        "regulator.i_in_max": 0.010, "regulator.i_trough": 0.010,
        "reservoir.v_pk_low": 100.0, "reservoir.ripple_low": 2.0})
    call_stage(rectifier.size_rectifier, spec, L)
    assert L["rect.i_peak_low"] == pytest.approx(0.638, rel=5e-3)
    # W1: conduction omega dt = sqrt(2 V_r / Vpk) = 0.2 rad (exact arccos(0.98) = 0.2003 rad)
    assert L["rect.conduction_angle"] == pytest.approx(0.2003, rel=1e-3)


def test_half_wave_ripple_c_ripple(designs):
    # C-RIPPLE [SEDRA-SMITH]: 1 A into 4700 uF, half-wave at 50 Hz -> V_r = 4.255 V; the stage
    # solves V_r = I / (f_r C) for C. The stage's current is (Vpk - V_Z,min) / R_target at high
    # line: V_Z,min is set so that it is 1 A through 10 ohm.
    v_sec, v_f, r_t = 12.0, 1.0, 10.0
    v_pk = math.sqrt(2) * v_sec - 1 * v_f  # one diode drop in a half-wave path
    spec, L = half_wave_seed(designs, "reservoir", {
        "transformer.v_low_fl": v_sec, "transformer.v_high_fl": v_sec,
        "transformer.v_high_nl": v_sec, "rect.v_f": v_f, "zener.v_min": v_pk - 1.0 * r_t,
        "regulator.r_target": r_t, "reservoir.ripple_allowed": 4.255})
    call_stage(reservoir.size_reservoir, spec, L)
    assert L["reservoir.v_pk_low"] == pytest.approx(v_pk, rel=1e-12)
    assert L["regulator.i_in_high_est"] == pytest.approx(1.0, rel=1e-12)
    assert L["reservoir.c_required"] == pytest.approx(4700e-6, rel=1e-3)


@pytest.mark.parametrize("topology, f_r, c_expected", [
    ("half-wave", 60.0, 83.3e-6),  # W1: C = Vpk / (V_r f R) = 100 / (2 x 60 x 10 k) = 83.3 uF
    ("bridge", 120.0, 41.7e-6),  # W1 full-wave variant: 41.7 uF
])
def test_w1_capacitance(designs, topology, f_r, c_expected):
    # W1 [SEDRA-SMITH]: Vpk = 100 V, R_L = 10 kohm (I_L = 10 mA), V_r = 2 V, 60 Hz mains.
    # The stage's current is (Vpk - V_Z,min) / R_target at high line: 10 mA through 10 ohm.
    design, _ = designs[topology]
    n_d = 2 if topology == "bridge" else 1
    v_f = 1.0
    v_sec = (100.0 + n_d * v_f) / math.sqrt(2)  # Vpk = sqrt(2) V_sec - n_d V_F = 100 V
    L = stage_ledger(design, "reservoir", {
        "transformer.v_low_fl": v_sec, "transformer.v_high_fl": v_sec,
        "transformer.v_high_nl": v_sec, "rect.v_f": v_f, "zener.v_min": 100.0 - 0.010 * 10.0,
        "regulator.r_target": 10.0, "reservoir.ripple_allowed": 2.0, "mains.ripple_freq": f_r})
    call_stage(reservoir.size_reservoir, design.requirements, L)
    assert L["reservoir.v_pk_low"] == pytest.approx(100.0, rel=1e-12)
    assert L["reservoir.c_required"] == pytest.approx(c_expected, rel=5e-3)
