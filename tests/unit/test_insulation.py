"""Insulation facts of the mains-to-output barrier: what they state and that no distance is made up.

Sources (docs/references.md): the working voltage as the mains and winding voltages added
(conservative, common practice [CP-WORKING-VOLTAGE]); the insulation each protection class needs
[IEC61140] (from memory); the ES1 / SELV limits the cautions use [IEC62368-1] [IEC61558-2-6].
"""

from __future__ import annotations

import math
import re
from pathlib import Path
from types import SimpleNamespace

import pytest

from docgen.pipeline import run
from docgen.render.html import render_html
from docgen.render.results_json import results_dict
from docgen.spec import load_requirements
from docgen.stages.insulation import barrier_facts

ROOT = Path(__file__).resolve().parents[2]


@pytest.fixture(scope="module")
def design():
    return run(load_requirements(ROOT / "specs" / "us-controller-5v-120v.toml"), samples=0)


def test_working_voltage_adds_mains_and_winding(design):
    v = {k: tv.value for k, tv in design.values.items()}
    high = 120.0 * (1 + v["mains.tol_high"])
    assert v["mains.v_nom"] == 120.0 and v["mains.v_high"] == pytest.approx(high)
    assert v["insulation.v_work_rms"] == pytest.approx(120.0 + v["transformer.v_nl"], rel=1e-12)
    assert v["insulation.v_work_peak"] == pytest.approx(
        math.sqrt(2) * (high + v["transformer.v_high_nl"]), rel=1e-12)
    # the bound is above the mains alone, which a barrier always sees
    assert v["insulation.v_work_peak"] > math.sqrt(2) * high


def _spec(**ins):
    fields = set(ins)
    defaults = {"equipment_class": "II", "overvoltage_category": "II", "pollution_degree": 2,
                "material_group": "IIIb"}
    from docgen.spec.margins import Insulation

    model = Insulation(**ins)
    assert model.model_fields_set == fields
    return SimpleNamespace(insulation=model), {**defaults, **ins}


def _values(v_dc: float, v_sec: float):
    return {"reservoir.v_max": SimpleNamespace(value=v_dc),
            "transformer.v_high_nl": SimpleNamespace(value=v_sec)}


def test_class_ii_elv_output_needs_double_or_reinforced():
    spec, _ = _spec()
    f = barrier_facts(spec, _values(17.0, 13.0))
    assert f["output_elv"] and f["insulation_needed"] == "double or reinforced"
    assert "without reliance on protective earth" in f["insulation_reason"]
    assert f["basis"]["equipment_class"].startswith("assumed (default)")
    assert f["distances_computed"] is False


def test_class_i_allows_basic_with_protective_earthing():
    spec, _ = _spec(equipment_class="I", pollution_degree=3)
    f = barrier_facts(spec, _values(17.0, 13.0))
    assert f["insulation_needed"] == "double or reinforced, or basic with protective earthing"
    assert f["basis"]["equipment_class"] == "requirements file"
    assert f["basis"]["pollution_degree"] == "requirements file"
    assert f["basis"]["overvoltage_category"].startswith("assumed (default)")
    assert f["pollution_degree"] == 3


@pytest.mark.parametrize("v_dc,v_sec", [(75.0, 45.0), (40.0, 55.0)])
def test_an_output_above_elv_is_called_hazardous(v_dc, v_sec):
    # above 60 V DC on the reservoir or 50 V RMS no-load on the winding (the cautions' limits)
    spec, _ = _spec()
    f = barrier_facts(spec, _values(v_dc, v_sec))
    assert not f["output_elv"]
    assert "itself hazardous" in f["insulation_reason"]


def test_results_json_and_document_state_the_lookup_not_a_distance(design):
    res = results_dict(design)
    ins = res["insulation"]
    assert ins["distances_computed"] is False
    assert set(ins["working_voltage_ids"]) <= set(res["values"])
    html = render_html(design, {}, medium="screen")
    section = html[html.index('<section id="insulation">'):]
    section = section[:section.index("</section>")]
    text = re.sub(r"\s+", " ", re.sub(r"<[^>]+>", " ", section))
    assert "Look them up in the applicable standard" in text
    assert "overvoltage category II, pollution degree 2, material group IIIb" in text
    rms = design.values["insulation.v_work_rms"].value
    assert f"{rms:.1f} V RMS" in text
    # no creepage or clearance distance is stated: no length appears anywhere in the section
    assert not re.search(r"\d\s*(mm|cm|um|µm)\b", text)
