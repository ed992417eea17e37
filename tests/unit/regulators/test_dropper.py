"""The dropping-resistor kind, added behind the regulator protocol (the recipe in DEVELOPERS.md).

Outside references: Ohm's law (V_out = V_C - I R) and Joule's law (P = I^2 R) derived in the
test from the corner figures; the IEC 60063 E24 series (20 ohm is an E24 value).
"""

from __future__ import annotations

import pytest

from docgen.pipeline import run
from docgen.regulators import KINDS, regulator
from docgen.render.figures import schematic_for
from docgen.spec import load_requirements

from ...conftest import DATA

SPEC = DATA / "relay-dropper.toml"


@pytest.fixture(scope="module")
def design():
    return run(load_requirements(SPEC))


def test_the_kind_is_registered_and_accepted_by_the_file_format():
    assert "dropper" in KINDS
    assert regulator("dropper").kind == "dropper"
    assert load_requirements(SPEC).requirements.output[0].regulator == "dropper"


def test_resistor_drops_the_requested_voltage_at_full_load(design):
    v = design.values
    # 2 V at 100 mA is 20 ohm, itself an E24 value (IEC 60063): no rounding
    assert v["dropper.r"].value == pytest.approx(2.0 / 0.100)
    # Joule's law at the +5 % tolerance
    assert v["dropper.p"].value == pytest.approx(0.100 ** 2 * 20.0 * 1.05)


def test_every_corner_obeys_ohms_law(design):
    # mains x load x C x R x diode junction cold / hot: no zener axis
    assert len(design.corners) == 3 * 2 * 2 * 2 * 2
    for row in design.corners:
        drop = row["load"] * row["r"]
        assert row["v_out_min"] == pytest.approx(row["v_c_min"] - drop, rel=1e-9)
        assert row["v_out_max"] == pytest.approx(row["v_c_max"] - drop, rel=1e-9)
        assert row["p_out"] == pytest.approx(row["load"] * (row["v_out_min"] + row["v_out_max"])
                                             / 2, rel=0.05)


def test_checks_and_bom_come_from_the_kind(design):
    ids = [c.id for c in design.checks]
    assert {"check.output_high", "check.output_low", "check.resistor_power"} <= set(ids)
    assert "check.zener_current" not in ids and "check.dropout" not in ids
    power = next(c for c in design.checks if c.id == "check.resistor_power")
    worst = max(r["load"] ** 2 * r["r"] for r in design.corners)
    assert power.value == pytest.approx(worst, rel=1e-9)
    assert [p.ref for p in design.parts if p.kind == "resistor"] == ["R1"]
    engine = next(a for a in design.assumptions if a.id == "assume.engine")
    assert "48 worst-case corners" in engine.text and "dropping resistor" in engine.text
    assert not any(a.id == "assume.zener_model" for a in design.assumptions)


def test_schematic_draws_the_resistor_on_the_rail(design):
    svg = schematic_for(design)
    # the screen-reader description lists the resistor with its value, on the output's rail
    desc = svg.split("<desc>")[1].split("</desc>")[0].splitlines()
    assert "R1 20 Ω 500 mW" in desc
    assert desc.index("R1 20 Ω 500 mW") < desc.index("output (+) relay coils 12 V, 100 mA")
