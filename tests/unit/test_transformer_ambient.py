"""The transformer in a hotter ambient than its rating, and the extra-low-voltage caution of a
center-tapped winding.

Sources:
* Derating: the winding's temperature rise follows its copper loss I^2 R (common practice,
  [CP-XFMR-AMBIENT] in docs/references.md); with the rated load bringing the winding to its
  class temperature T_c at the rated ambient T_r, the current allowed at T_A keeps the same
  loss per kelvin of headroom: I / I_rated = sqrt((T_c - T_A) / (T_c - T_r)), derived in each
  test from the rise. Class temperatures A 105 degC, B 130 degC: IEC 60085 (from memory).
  Rated ambient when none is marked: 25 degC, IEC 61558-1 (from memory).
* Safety isolating transformer output at most 50 V AC no-load, IEC 61558-2-6:2021 scope
  ([IEC61558-2-6]); a center-tapped winding's end-to-end voltage is twice each half (the tap
  sits at the middle: definition).
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from docgen.parts.library import parse_library
from docgen.parts.select import select_transformer
from docgen.pipeline import run
from docgen.spec import load_requirements

ROOT = Path(__file__).resolve().parents[2]
HEADER = 'schema = 1\n[library]\nname = "test"\n'


def allowed_fraction(t_class: float, t_rated: float, t_ambient: float) -> float:
    """Copper loss ~ I^2 and rise ~ loss: the rise left at T_A over the rise at the rating."""
    rise_rated = t_class - t_rated
    rise_left = t_class - t_ambient
    return math.sqrt(rise_left / rise_rated)


def xfmr(part_id: str, va: str, *, extra: str = "", price: float = 5.0) -> str:
    return (f'[[transformer]]\nid = "{part_id}"\nsecondary_voltage = "12 V"\nva = "{va}"\n'
            f'regulation = "20 %"\nprice = {price}\n{extra}\n')


def test_library_part_is_derated_from_its_own_ambient_and_class():
    lib = parse_library(HEADER + xfmr("T-B40", "10 VA",
                                      extra='rated_ambient = "40 degC"\ninsulation_class = "B"'))
    part = lib.transformers[0]
    assert part.ambient_factor(40.0) == 1.0  # at its rated ambient: the full rating
    assert part.ambient_factor(25.0) == 1.0  # no up-rating in a cooler room
    assert part.ambient_factor(60.0) == pytest.approx(allowed_fraction(130.0, 40.0, 60.0))


def test_unstated_part_takes_25_degc_and_class_a():
    part = parse_library(HEADER + xfmr("T-NONE", "10 VA")).transformers[0]
    assert part.ambient_factor(55.0) == pytest.approx(allowed_fraction(105.0, 25.0, 55.0))


def test_bad_insulation_class_names_the_field():
    from docgen.errors import SpecError
    with pytest.raises(SpecError) as err:
        parse_library(HEADER + xfmr("T-X", "10 VA", extra='insulation_class = "Q"'), "l.toml")
    assert "transformer[0].insulation_class" in str(err.value)


def test_selection_counts_each_part_at_the_hottest_ambient():
    # 4.5 VA needed at 55 degC. The cheap 5 VA part (25 degC, class A) gives only
    # 5 x sqrt(50/80) = 3.95 VA there; the 6 VA part rated at 50 degC, class B, gives
    # 6 x sqrt(75/80) = 5.81 VA.
    lib = parse_library(HEADER + xfmr("T-CHEAP", "5 VA", price=3.0)
                        + xfmr("T-HOT", "6 VA", price=6.0,
                               extra='rated_ambient = "50 degC"\ninsulation_class = "B"'))
    assert select_transformer(lib.transformers, secondary_voltage=12.0,
                              va=4.5).part.id == "T-CHEAP"
    sel = select_transformer(lib.transformers, secondary_voltage=12.0, va=4.5, ambient_c=55.0)
    assert sel.part.id == "T-HOT"
    assert 5 * allowed_fraction(105, 25, 55) < 4.5 < 6 * allowed_fraction(130, 50, 55)


SPEC = """\
schema = 1
[project]
title = "test: hot transformer"
document_id = "TEST-HOT-1"
demo = true
[mains]
preset = "230V-50Hz"
[environment]
ambient_min = "0 degC"
ambient_max = "{t_max}"
[rectifier]
topology = "{topology}"
{transformer}
[[output]]
name = "out"
voltage = "12 V"
tolerance = "10 %"
load_min = "10 mA"
load_max = "{load}"
ripple_max = "50 mV"
regulator = "three-terminal"
"""


def design(tmp_path: Path, *, t_max: str = "55 degC", topology: str = "bridge",
           transformer: str = "", load: str = "200 mA"):
    path = tmp_path / "spec.toml"
    path.write_text(SPEC.format(t_max=t_max, topology=topology, transformer=transformer,
                                load=load), encoding="utf-8")
    return run(load_requirements(path), samples=0)


def test_fixed_transformer_check_uses_the_derated_current(tmp_path):
    d = design(tmp_path, transformer='[transformer]\nsecondary = "18 V"\nva = "10 VA"')
    chk = next(c for c in d.checks if c.id == "check.transformer_current")
    # 10 VA / 18 V at 25 degC, class A (defaults), derated to 55 degC
    assert chk.limit == pytest.approx(10 / 18 * allowed_fraction(105.0, 25.0, 55.0))
    t1 = next(p for p in d.parts if p.ref == "T1")
    assert "derated to" in t1.description
    # no derating at the rated ambient
    d25 = design(tmp_path, t_max="25 degC",
                 transformer='[transformer]\nsecondary = "18 V"\nva = "10 VA"')
    chk25 = next(c for c in d25.checks if c.id == "check.transformer_current")
    assert chk25.limit == pytest.approx(10 / 18)


def test_sized_transformer_is_large_enough_at_the_hottest_ambient(tmp_path):
    d = design(tmp_path, load="500 mA")
    v = {k: x.value for k, x in d.values.items()}
    k = allowed_fraction(105.0, 25.0, 55.0)
    # the standard step is chosen for the nameplate VA whose derated share covers the need
    assert v["transformer.va_rated_needed"] == pytest.approx(v["transformer.va_sized"] / k)
    assert v["transformer.va"] * k >= v["transformer.va_sized"] * (1 - 1e-9)
    chk = next(c for c in d.checks if c.id == "check.transformer_current")
    assert chk.value <= chk.limit  # the engine's current fits the derated rating


# ------------------------------------------------------------------ ELV caution, center tap

def test_two_by_thirty_volt_center_tap_triggers_the_selv_caution(tmp_path):
    # 2 x 30 V: each half is 30 V, the whole winding 60 V RMS at rated load, more at no load
    # and high line: above the 50 V AC limit of a safety isolating transformer's output.
    d = design(tmp_path, t_max="40 degC", topology="center-tap", load="100 mA",
               transformer='[transformer]\nsecondary = "60 V"\nva = "10 VA"')
    assert "caution.secondary_not_selv" in {c.id for c in d.cautions}
    v = {k: x.value for k, x in d.values.items()}
    assert v["transformer.v_path"] == pytest.approx(30.0)  # the half the rectifier sees
    whole = v["transformer.v_winding_high_nl"]
    assert whole == pytest.approx(2 * v["transformer.v_high_nl"])
    assert whole > 60.0
    caution = next(c for c in d.cautions if c.id == "caution.secondary_not_selv")
    assert f"{whole:.0f} V RMS" in caution.text
    assert f"{whole * math.sqrt(2):.0f} V peak" in caution.text
    assert "end to end" in caution.text


def test_bridge_winding_below_the_limit_has_no_selv_caution(tmp_path):
    d = design(tmp_path, t_max="40 degC", transformer='[transformer]\nsecondary = "18 V"\n'
               'va = "10 VA"')
    assert "caution.secondary_not_selv" not in {c.id for c in d.cautions}
