"""Adjustable three-terminal regulator: a fixed one whose output is set from its reference by the
divider R1 (OUT to ADJ) and R2 (ADJ to ground); R1 also carries the least load the regulator
needs. V_out = V_ref (1 + R2/R1) + I_ADJ R2 (the usual adjustable-regulator relation; common
practice). The output window takes every term at its extreme: the reference tolerance, the divider
resistors' tolerance (R2 high with R1 low for the top) and the adjust-pin current's spread (zero
to its largest figure)."""

from __future__ import annotations

from .. import equations as eq
from ..parts.eseries import preferred
from . import rules
from .base import record_output
from .three_terminal import ThreeTerminal, regulator_data, regulator_needs

TITLE = "Adjustable three-terminal regulator"
INTRO = ("The divider R1 (output to adjust) and R2 (adjust to ground) sets the output from the "
         "reference; R1 also carries the regulator's minimum load. The regulator needs its "
         "dropout above the output at the ripple trough.")


def size_divider(L) -> None:
    """R1 from the least load, R2 for the output voltage, and the output as set."""
    L.calc("reg.r1_max", eq.OHM, r"R_{1,max}", "ohm", "Largest R1 (OUT to ADJ)",
           {"v": "reg.v_ref", "i": "reg.i_min_load"}, lambda v, i: v / i)
    L.calc("reg.r1", eq.PREFERRED_DOWN, r"R_1", "ohm", "R1 (E24, rounded down)",
           {"x": "reg.r1_max"}, lambda x: preferred(x, "E24", "down"))
    L.calc("reg.r2_calc", eq.ADJ_R2, r"R_{2,calc}", "ohm", "R2 for the output voltage",
           {"v": "output.v_nom", "r": "reg.v_ref", "a": "reg.r1", "i": "reg.i_adj"},
           lambda v, r, a, i: (v - r) / (r / a + i))
    L.calc("reg.r2", eq.PREFERRED_E96, r"R_2", "ohm", "R2 (E96, nearest)",
           {"x": "reg.r2_calc"}, lambda x: preferred(x, "E96", "nearest"))
    L.calc("reg.v_out", eq.ADJ_VOUT, r"V_{out,set}", "V", "Output voltage as set",
           {"r": "reg.v_ref", "a": "reg.r1", "b": "reg.r2", "i": "reg.i_adj"},
           lambda r, a, b, i: r * (1 + b / a) + i * b)
    L.calc("reg.i_q", eq.OHM, r"I_Q", "A", "Divider current drawn by the regulator",
           {"v": "reg.v_ref", "i": "reg.r1"}, lambda v, i: v / i)


def divider_window(L) -> None:
    """Output extremes with the reference, divider and adjust-current spreads."""
    ins = {"r": "reg.v_ref", "t": "reg.tol", "a": "reg.r1", "b": "reg.r2", "p": "reg.div_tol"}
    L.calc("reg.v_out_max", rules.ADJ_VOUT_MAX, r"V_{out,max}", "V", "Highest output voltage",
           {**ins, "i": "reg.i_adj_max"},
           lambda r, t, a, b, p, i: r * (1 + t) * (1 + b * (1 + p) / (a * (1 - p)))
           + i * b * (1 + p))
    L.calc("reg.v_out_min", rules.ADJ_VOUT_MIN, r"V_{out,min}", "V", "Lowest output voltage",
           {**ins, "i": "reg.i_adj_min"},
           lambda r, t, a, b, p, i: r * (1 - t) * (1 + b * (1 - p) / (a * (1 + p)))
           + i * b * (1 - p))


class Adjustable(ThreeTerminal):
    kind = "adjustable"
    title = TITLE
    intro = INTRO
    drawing = "adjustable"
    adjustable = True
    refs = ("U1", "R2", "R3", "C2", "C3")

    def needs(self, ctx, L):
        record_output(ctx, L)
        regulator_data(ctx, L, adjustable=True)
        size_divider(L)
        divider_window(L)
        regulator_needs(ctx, L)

    def describe(self, v) -> str:
        return f"adjustable three-terminal regulator, {v('reg.v_ref')} reference"

    def bom_lines(self, ctx, L, line, v):
        return super().bom_lines(ctx, L, line, v) + [
            line("R2", "resistor", v("reg.r1"),
                 f"resistor {v('reg.r1')} +/-{v('reg.div_tol')}, OUT to ADJ", ("reg.r1",)),
            line("R3", "resistor", v("reg.r2"),
                 f"resistor {v('reg.r2')} +/-{v('reg.div_tol')}, ADJ to ground", ("reg.r2",))]


KIND = Adjustable()
