"""bom.csv and bom-stresses.csv read back with the csv module: numeric columns, one row per part."""

from __future__ import annotations

import csv
import dataclasses
import io

import pytest

from docgen.design import Check
from docgen.jobs.build import design_for
from docgen.render.bom import bom_csv, neutralise, stress_csv
from tests.conftest import DATA, ROOT


@pytest.fixture(scope="module")
def split_design():
    return design_for(ROOT / "specs" / "audio-preamp-split-15v.toml")


@pytest.fixture(scope="module")
def failing_design():
    return design_for(DATA / "undersized-capacitor.toml")


def _read(text: str) -> list[dict[str, str]]:
    assert text.startswith("\ufeff"), "a byte-order mark comes first"
    data = text.encode("utf-8")
    assert data[:3] == b"\xef\xbb\xbf"
    return list(csv.DictReader(io.StringIO(data.decode("utf-8-sig"))))


def test_one_row_per_part_with_numeric_ratings(split_design):
    d = split_design
    rows = _read(bom_csv(d))
    refs = [r for row in rows for r in row["designators"].split()]
    assert sorted(refs) == sorted(p.ref for p in d.parts)
    assert sum(int(row["quantity"]) for row in rows) == len(d.parts)
    c1 = next(row for row in rows if row["designators"] == "C1")
    assert float(c1["reservoir.c (F)"]) == pytest.approx(d.values["reservoir.c"].value)
    assert float(c1["reservoir.v_rating (V)"]) == pytest.approx(
        d.values["reservoir.v_rating"].value)
    # the negative rail's capacitor fills the same columns
    c2 = next(row for row in rows if row["designators"] == "C2")
    assert float(c2["reservoir.c (F)"]) == pytest.approx(d.values["neg.reservoir.c"].value)
    # a percentage is written in percent, and the header says so
    t1 = next(row for row in rows if row["designators"] == "T1")
    assert float(t1["transformer.regulation (%)"]) == pytest.approx(
        100 * d.values["transformer.regulation"].value)
    # every rating column holds numbers or nothing
    for row in rows:
        for key, cell in row.items():
            if key.endswith(")") and cell:
                float(cell)


def test_identical_parts_share_a_row(split_design):
    d = split_design
    c1 = next(p for p in d.parts if p.ref == "C1")
    twin = dataclasses.replace(c1, ref="C7")
    rows = _read(bom_csv(dataclasses.replace(d, parts=[*d.parts, twin])))
    shared = next(row for row in rows if "C1" in row["designators"].split())
    assert shared["designators"] == "C1 C7"
    assert shared["quantity"] == "2"
    assert len(rows) == len(d.parts)  # one more part, no more rows


def test_stresses_are_numbers_matching_the_checks(failing_design):
    d = failing_design
    rows = _read(stress_csv(d))
    rated = [c for c in d.checks if c.ref]
    assert len(rows) == len(rated)
    by_id = {c.id: c for c in rated}
    for row in rows:
        c = by_id[row["check"]]
        scale = 100.0 if c.unit == "%" else 1.0
        assert float(row["stress"]) == pytest.approx(c.value * scale)
        assert float(row["allowed"]) == pytest.approx(c.limit * scale)
        assert float(row["margin (%)"]) == pytest.approx(c.margin * 100)
        assert row["status"] == c.status
    # the failing spec has a negative margin; it stays a number, not neutralised text
    negative = [row for row in rows if row["margin (%)"].startswith("-")]
    assert negative and all(float(row["margin (%)"]) < 0 for row in negative)


def test_formula_cells_are_neutralised(split_design):
    d = split_design
    parts = [dataclasses.replace(p, description="=HYPERLINK(\"x\")", value_text="-15 V")
             if p.ref == "C1" else p for p in d.parts]
    bad = Check(id="check.x", title="@SUM(A1)", value=1.0, limit=2.0, unit="V", sense="max",
                margin=0.5, status="pass", corner="+cmd", value_id="", limit_id="", ref="C1")
    d2 = dataclasses.replace(d, parts=parts, checks=[*d.checks, bad])
    row = next(r for r in _read(bom_csv(d2)) if r["designators"] == "C1")
    assert row["description"] == "'=HYPERLINK(\"x\")"
    assert row["value"] == "'-15 V"
    stress = next(r for r in _read(stress_csv(d2)) if r["check"] == "check.x")
    assert stress["rating"] == "'@SUM(A1)" and stress["corner"] == "'+cmd"
    assert neutralise("plain") == "plain" and neutralise("\tx") == "'\tx"
