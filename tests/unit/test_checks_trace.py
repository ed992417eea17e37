"""Direct tests of docgen.verify.checks (margin, status, overall verdict) and docgen.trace (the ledger),
against numbers worked by hand here.

Definitions (the project's, stated in its README and checks module; the arithmetic below is
derived by hand): margin = fraction of the limit left over, (limit - value) / |limit| for a
maximum and (value - limit) / |limit| for a minimum; negative is a failure, a margin below the
warning band a warning.
"""

from __future__ import annotations

import math

import pytest

from docgen.verify.checks import make_check, margin_of, overall_status, status_of
from docgen.design import Check
from docgen.trace import Equation, Ledger, TraceError

BAND = 0.05  # 5 % warning band (the documented default)


def ledger(value: float, limit: float, unit: str = "A") -> Ledger:
    L = Ledger()
    L.given("x.value", "x", value, unit, "value")
    L.given("x.limit", "y", limit, unit, "limit")
    return L


@pytest.mark.parametrize("value, limit, sense, margin, status", [
    (8.0, 10.0, "max", 0.20, "pass"),  # 2 of 10 left
    (9.8, 10.0, "max", 0.02, "warn"),  # 0.2 of 10 left: inside the 5 % band
    (10.2, 10.0, "max", -0.02, "fail"),  # 0.2 over
    (4.0, 3.0, "min", 1.0 / 3.0, "pass"),  # 1 above 3
    (3.1, 3.0, "min", 0.1 / 3.0, "warn"),  # 0.1 above 3: 3.3 %
    (2.9, 3.0, "min", -0.1 / 3.0, "fail"),
    (-12.0, -10.0, "max", 0.2, "pass"),  # a negative limit is scaled by its magnitude
    (1.0, 0.0, "max", -1.0, "fail"),  # a zero limit counts in absolute units
])
def test_margin_and_status_by_hand(value, limit, sense, margin, status):
    L = ledger(value, limit)
    c = make_check(L, "check.x", "x <= y", "x.value", "x.limit", sense, "somewhere", BAND,
                   ref="R1", requirement="output[0].x")
    assert c.margin == pytest.approx(margin, rel=1e-12, abs=1e-15)
    assert c.status == status
    assert (c.value, c.limit, c.unit, c.sense) == (value, limit, "A", sense)
    assert (c.corner, c.value_id, c.limit_id, c.ref, c.requirement) == (
        "somewhere", "x.value", "x.limit", "R1", "output[0].x")


def test_zero_against_zero_passes_with_no_band():
    # the engine-convergence check: 0 unsolved corners of 0 allowed
    assert margin_of(0.0, 0.0, "max") == 0.0
    assert status_of(0.0, 0.0) == "pass"


def test_unknown_sense_is_refused():
    with pytest.raises(ValueError):
        margin_of(1.0, 2.0, "below")


def _chk(status: str) -> Check:
    return Check("c", "t", 1.0, 2.0, "V", "max", 0.5, status, "", "a", "b")


@pytest.mark.parametrize("statuses, overall", [
    (["pass", "pass"], "pass"), (["pass", "warn"], "warn"), (["warn", "fail", "pass"], "fail"),
    ([], "pass"),
])
def test_overall_status_is_the_worst(statuses, overall):
    assert overall_status([_chk(s) for s in statuses]) == overall


# ------------------------------------------------------------------ ledger
SUM = Equation("t.sum", "Sum", "$a + $b", {"a": "A", "b": "B"}, "derived")
SQUARE = Equation("t.p", "Power", "$i^2 \\cdot $r", {"i": "I", "r": "R"}, "Joule's law")


def test_given_and_calc_trace_by_hand():
    L = Ledger()
    L.stage = "s1"
    L.given("a", "V_a", 2.0, "V", "first")
    L.given("b", "V_b", 3.5, "V", "second", defaulted=True)
    assert L.values["a"].equation == "given" and L.values["a"].source == "requirements file"
    assert L.values["b"].equation == "default" and L.values["b"].source == "default"
    L.stage = "s2"
    got = L.calc("c", SUM, "V_c", "V", "sum", {"a": "a", "b": "b"}, lambda a, b: a + b)
    assert got == 5.5 and L["c"] == 5.5 and "c" in L
    tv = L.values["c"]
    assert tv.inputs == ("a", "b") and tv.equation == "t.sum" and tv.stage == "s2"
    assert tv.latex == "V_c = V_a + V_b"
    assert tv.substituted == r"V_c = 2\,\mathrm{V} + 3.5\,\mathrm{V} = 5.5\,\mathrm{V}"
    assert L.equations["t.sum"] is SUM
    assert L.ids_for_stage("s1") == ["a", "b"]


def test_powers_of_quantities_are_bracketed():
    # 0.93 A squared times 2 ohm = 1.7298 W; the substituted form must read (930 mA)^2.
    L = Ledger()
    L.given("i", "I", 0.93, "A", "current")
    L.given("r", "R", 2.0, "ohm", "resistance")
    assert L.calc("p", SQUARE, "P", "W", "power", {"i": "i", "r": "r"},
                  lambda i, r: i * i * r) == pytest.approx(1.7298)
    assert r"\left(930\,\mathrm{mA}\right)^2" in L.values["p"].substituted


def test_measured_names_its_corner():
    L = Ledger()
    L.given("c", "C", 1e-3, "F", "capacitance")
    eng = Equation("t.eng", "engine", r"\mathrm{engine}", {}, "docgen waveform engine")
    L.measured("m", eng, "V_m", 12.5, "V", "measured", ("c",), "low line, full load")
    tv = L.values["m"]
    assert tv.value == 12.5 and tv.inputs == ("c",)
    assert r"low\ line" in tv.substituted and "12.5" in tv.substituted


@pytest.mark.parametrize("bad", ["duplicate", "unknown", "nonfinite", "params"])
def test_ledger_refuses_programming_errors(bad):
    L = Ledger()
    L.given("a", "a", 1.0, "V", "a")
    L.given("b", "b", 0.0, "V", "b")
    with pytest.raises(TraceError):
        if bad == "duplicate":
            L.given("a", "a", 2.0, "V", "again")
        elif bad == "unknown":
            L.calc("c", SUM, "c", "V", "c", {"a": "a", "b": "nope"}, lambda a, b: a + b)
        elif bad == "nonfinite":
            L.calc("c", SUM, "c", "V", "c", {"a": "a", "b": "b"}, lambda a, b: a * math.inf)
        else:
            L.calc("c", SUM, "c", "V", "c", {"a": "a"}, lambda a: a)
