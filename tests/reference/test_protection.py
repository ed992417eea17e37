"""Fuse, bleeder, switch-on surge and capacitor life against outside numbers.

Keys of docs/references.md beside each check:
* C-FUSE [CP-FUSE] with the [IEC60127-2] R10 ratings: 20 VA on 230 V -> 87 mA primary; x 1.5
  -> 130 mA -> 160 mA T.
* C-BLEEDER [DERIVED-BLEEDER]: 4.7 kohm across 2200 uF -> tau = 10.34 s; 35 V -> 5 V in 20.12 s;
  0.261 W at 35 V. [IEC60204-1]: 60 V within 5 s (the default limits).
* C-SURGE [DERIVED-SURGE]: Vpk 16.97 V through 0.5 ohm -> 33.9 A.
(C-LIFE, the capacitor life check values, are held in test_worst_case.py; the life of each demo
design is recomputed from the independent ripple current in test_independent_demo.py.)
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from docgen.pipeline import run
from docgen.spec import load_requirements
from docgen.spec.requirements import Requirements

HEADER = 'schema = 1\n[project]\ntitle = "protection test"\ndocument_id = "REF-F"\n'
ZENER_OUT = ('[[output]]\nname = "rail"\nvoltage = "5.6 V"\nload_max = "15 mA"\n'
             'ripple_max = "50 mV"\n')


def build(tmp_path: Path, name: str, body: str):
    path = tmp_path / f"{name}.toml"
    path.write_text(HEADER + body, encoding="utf-8")
    design = run(load_requirements(path), samples=0)
    return design, {k: tv.value for k, tv in design.values.items()}


def fixed_transformer(v_nl: float, va: str = "20 VA", extra: str = "") -> str:
    # rated secondary V_NL / 1.1 with 10 % regulation: V_NL = V_FL (1 + Reg) ([CP-REGULATION])
    return (f"[mains]\ntolerance_high = 0\n[transformer]\nsecondary = {v_nl / 1.1!r}\n"
            f'va = "{va}"\nregulation = 0.1\n' + extra)


def test_fuse_c_fuse(tmp_path):
    # C-FUSE: 20 VA / 230 V = 87 mA rated primary current; x 1.5 = 130 mA; the next rating of
    # the R10 series (... 100, 125, 160, 200 mA ...) is 160 mA, time-lag.
    design, v = build(tmp_path, "fuse", fixed_transformer(12.0) + ZENER_OUT)
    assert v["fuse.i_pri_rated"] == pytest.approx(0.087, abs=0.0005)
    assert v["fuse.k"] == 1.5
    assert v["fuse.need"] == pytest.approx(0.130, abs=0.0005)
    assert v["fuse.rating"] == 0.160
    bom = next(p for p in design.parts if p.ref == "F1")
    assert "160 mA T" in bom.value_text


def test_switch_on_surge_estimate_c_surge(tmp_path):
    # C-SURGE: the empty capacitor at the crest sees the winding peak through the loop
    # resistance: 16.97 V / 0.5 ohm = 33.9 A.
    _, v = build(tmp_path, "surge", fixed_transformer(
        12.0, extra='winding_resistance = "0.5 ohm"\n') + ZENER_OUT)
    assert v["transformer.r_w"] == 0.5
    assert v["rect.i_surge_est"] == pytest.approx(33.94, abs=0.01)


def test_bleeder_c_bleeder(tmp_path):
    # C-BLEEDER: reservoir at 35 V (no-load high-line peak: winding 35 / sqrt(2) V no-load),
    # 2200 uF with no tolerance, to reach 5 V within 21 s: R <= 21 / (2200 uF ln 7) = 4905 ohm
    # -> 4.7 kohm ([IEC60063] E24, down); then tau = R C = 10.34 s, 35 V -> 5 V in 20.12 s and
    # 35^2 / 4700 = 0.261 W.
    body = (fixed_transformer(35.0 / math.sqrt(2))
            + '[reservoir]\ncapacitance = "2200 uF"\ntolerance = 0\nvoltage_rating = "63 V"\n'
            + '[protection]\nbleeder = true\nsafe_voltage = "5 V"\ndischarge_time = "21 s"\n'
            + ZENER_OUT)
    design, v = build(tmp_path, "bleeder", body)
    assert v["reservoir.v_max"] == pytest.approx(35.0, rel=1e-9)
    assert v["bleeder.r_max"] == pytest.approx(21.0 / (2200e-6 * math.log(7.0)), rel=1e-9)
    assert v["bleeder.r"] == 4700.0
    assert v["bleeder.r"] * v["bleeder.c_max"] == pytest.approx(10.34, abs=0.005)
    assert v["bleeder.time"] == pytest.approx(20.12, abs=0.005)
    assert v["bleeder.p"] == pytest.approx(0.261, abs=0.0005)
    chk = next(c for c in design.checks if c.id == "check.bleeder_time")
    assert chk.value == pytest.approx(20.12, abs=0.005) and chk.limit == 21.0
    assert chk.status == "warn"  # 4.2 % left, inside the 5 % warning band


def test_default_discharge_limit_is_iec_60204_1():
    # [IEC60204-1]: live parts above 60 V fall to 60 V or less within 5 s.
    pr = Requirements.model_validate({"schema": 1, "project": {"title": "t", "document_id": "d"},
                                      "output": [{"name": "r", "voltage": 5.0, "load_max": 0.1,
                                                  "ripple_max": 0.01}]}).protection
    assert pr.safe_voltage == 60.0 and pr.discharge_time == 5.0
