"""Direct tests of the results.json and BOM writers on hand-made designs: what goes in must come
out unchanged (SI numbers, ids, verdicts), non-finite numbers never appear, and the BOM rows
carry each part's rating checks formatted as a person reads them."""

from __future__ import annotations

import csv
import dataclasses
import io
import json
import math

import pytest

from docgen.design import Check, Design, PartChoice
from docgen.render.bom import bom_csv, bom_rows
from docgen.render.results_json import results_dict, results_json
from docgen.trace import Ledger


def hand_design() -> Design:
    L = Ledger()
    L.stage = "reservoir"
    L.given("reservoir.c", "C", 2200e-6, "F", "Reservoir capacitance")
    L.given("reservoir.i_ripple_rating", "I", 1.0, "A", "Ripple rating")
    L.given("engine.cap_ripple_current", "I_C", 0.5, "A", "Ripple current")
    checks = [
        Check("check.cap_ripple_current", "Capacitor ripple current <= rating", 0.5, 1.0, "A",
              "max", 0.5, "pass", "high line, full load", "engine.cap_ripple_current",
              "reservoir.i_ripple_rating", ref="C1"),
        Check("check.output_low", "Lowest output voltage >= lower limit", 8.2, 8.19, "V", "min",
              0.01 / 8.19, "warn", "low line", "a", "b"),
    ]
    parts = [PartChoice("C1", "capacitor", "2200 uF 35 V", "electrolytic, 2200 uF"),
             PartChoice("F1", "fuse", "160 mA T", "fuse-link, time-lag", part_id="F-160")]
    return Design(spec_path="x.toml", spec_text="", spec_sha256="0" * 64, requirements=None,
                  stages=[], values=dict(L.values), equations=dict(L.equations), checks=checks,
                  parts=parts, assumptions=[], cautions=[], status="warn")


def test_results_json_round_trip():
    d = hand_design()
    text = results_json(d)
    data = json.loads(text)
    assert data["status"] == "warn"
    assert data["counts"] == {"pass": 1, "warn": 1, "fail": 0}  # counted by hand
    assert data["values"]["reservoir.c"]["value"] == 2200e-6  # SI, farads
    assert data["values"]["reservoir.c"]["unit"] == "F"
    # a ratio is stored as a fraction and says so; the report shows it in percent
    assert data["checks"][1]["margin_unit"] == "1"
    assert [c["id"] for c in data["checks"]] == ["check.cap_ripple_current", "check.output_low"]
    assert data["checks"][1]["margin"] == pytest.approx(0.01 / 8.19)
    assert [b["ref"] for b in data["bom"]] == ["C1", "F1"]
    # keys sorted at every level, so two runs diff cleanly
    assert list(data) == sorted(data)
    assert text.endswith("\n")


def test_results_json_never_writes_non_finite_numbers():
    d = hand_design()
    bad = dataclasses.replace(d.checks[0], value=math.nan, margin=math.inf)
    d = dataclasses.replace(d, checks=[bad])
    data = results_dict(d)
    assert data["checks"][0]["value"] is None and data["checks"][0]["margin"] is None
    json.loads(results_json(d))  # allow_nan=False would raise on a NaN


def test_bom_rows_by_hand():
    # the document's stress table: one row per rating with its stress, allowed value and margin
    rows = bom_rows(hand_design())
    assert rows == [
        {"ref": "C1", "part": "2200 uF 35 V", "rating": "Capacitor ripple current <= rating",
         "value_id": "engine.cap_ripple_current", "limit_id": "reservoir.i_ripple_rating",
         "stress": "500 mA", "allowed": "1 A", "margin": "50 %", "status": "pass"},
    ]
    # bom.csv: one row per part, read back as a spreadsheet would (byte-order mark first)
    text = bom_csv(hand_design())
    assert text.startswith("\ufeff")
    parsed = list(csv.DictReader(io.StringIO(text.lstrip("\ufeff"))))
    assert [(r["designators"], r["quantity"], r["part_id"]) for r in parsed] == [
        ("C1", "1", ""), ("F1", "1", "F-160")]


def test_html_context_traces_each_check_back_to_its_inputs():
    # By hand: c = a + b is checked against the given limit d; the traceability table must list
    # a, b and d (the given inputs) with the equation that links them and the check; the
    # attention list holds the failing check first, then the warning with the least margin.
    from types import SimpleNamespace

    from docgen.render.html import context, traceability
    from docgen.spec.project import Document
    from docgen.trace import Equation

    L = Ledger()
    L.given("a", "a", 1.0, "V", "first input")
    L.given("b", "b", 2.0, "V", "second input", defaulted=True)
    L.given("d", "d", 2.9, "V", "limit")
    L.calc("c", Equation("t.sum", "Sum", "$x + $y", {"x": "x", "y": "y"}, "derived"), "c", "V",
           "sum", {"x": "a", "y": "b"}, lambda x, y: x + y)
    checks = [
        Check("check.ok", "ok", 1.0, 2.0, "V", "max", 0.5, "pass", "", "a", "d"),
        Check("check.c", "c <= d", 3.0, 2.9, "V", "max", -0.1 / 2.9, "fail", "", "c", "d"),
        Check("check.w2", "w2", 2.8, 2.9, "V", "max", 0.1 / 2.9, "warn", "", "a", "d"),
        Check("check.w1", "w1", 2.85, 2.9, "V", "max", 0.05 / 2.9, "warn", "", "b", "d"),
    ]
    d = dataclasses.replace(hand_design(), values=dict(L.values), equations=dict(L.equations),
                            checks=checks, requirements=SimpleNamespace(
                                project="p", rectifier=SimpleNamespace(topology="bridge"),
                                output=[], document=Document()))
    rows = {r["value"].id: r for r in traceability(d)}
    assert set(rows) == {"a", "b", "d"}
    assert rows["a"]["equations"] == ["t.sum"]
    assert rows["a"]["checks"] == ["check.c", "check.ok", "check.w2"]
    assert rows["b"]["checks"] == ["check.c", "check.w1"]
    assert rows["d"]["equations"] == [] and len(rows["d"]["checks"]) == 4
    ctx = context(d, {})
    assert [c.id for c in ctx["attention"]] == ["check.c", "check.w1", "check.w2"]
    assert [v.id for v in ctx["inputs"]] == ["a", "b", "d"]
    assert ctx["counts"] == {"pass": 1, "warn": 2, "fail": 1}
    assert ctx["sources"] == ["derived"]


def test_results_json_names_the_unit_of_the_stored_number():
    # a life kept in seconds with hours for display, a ratio kept as a fraction: results.json
    # names the unit of the number it stores (SI) and, beside it, the unit the report shows
    L = Ledger()
    L.given("reservoir.life", "L", 40000 * 3600.0, "h", "life")
    L.given("output.tolerance", "t", 0.05, "%", "tolerance")
    d = dataclasses.replace(hand_design(), values=dict(L.values), checks=[])
    values = results_dict(d)["values"]
    assert values["reservoir.life"] == {**values["reservoir.life"], "value": 1.44e8,
                                        "unit": "s", "display_unit": "h"}
    assert values["output.tolerance"]["unit"] == "1"
    assert values["output.tolerance"]["display_unit"] == "%"
