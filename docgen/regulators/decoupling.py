"""Input and output capacitors of a three-terminal regulator (fixed or adjustable).

A three-terminal regulator needs a small capacitor at its input pins (the reservoir may be a wire
length away) and one at its output for stability and transient response. Their values are not
sized from the design: they are the capacitors makers' data sheets typically show in the
standard application circuit (from memory, typical of makers' data sheets; the regulator's own
data sheet overrides them) [CP-REGULATOR-CAPS]. Each is rated for the largest voltage it sees after the capacitor
voltage derating (common practice): the input one for the reservoir's no-load peak, the output
one for the highest output.
"""

from __future__ import annotations

from .. import equations as eq
from .. import standards
from ..trace import Ledger

SOURCE = "from memory, typical of makers' data sheets (standard application circuit)"
# (input, output) capacitance in F: a fixed regulator's usual 0.33 uF / 0.1 uF, an adjustable
# regulator's usual 0.1 uF / 1 uF.
TYPICAL = {False: (0.33e-6, 0.1e-6), True: (0.1e-6, 1e-6)}
# Designators on a single rail; a split supply renames them (docgen.rails).
REFS = {"in": "C2", "out": "C3"}


def size_decoupling(L: Ledger, adjustable: bool) -> None:
    """Capacitances from common practice; voltage ratings from the stresses, derated."""
    c_in, c_out = TYPICAL[adjustable]
    what = "adjustable" if adjustable else "fixed"
    for tag, c, stress in (("in", c_in, "reservoir.v_max"), ("out", c_out, "reg.v_out_max")):
        side = "input" if tag == "in" else "output"
        L.given(f"reg.c_{tag}", rf"C_{{{tag}}}", c, "F",
                f"Regulator {side} capacitor (ceramic, {what} regulator)", source=SOURCE)
        L.calc(f"reg.c_{tag}_v_needed", eq.DERATED_NEED, rf"V_{{C{tag},req}}", "V",
               f"Regulator {side} capacitor voltage rating needed",
               {"x": stress, "k": "margins.cap_voltage"}, lambda x, k: x / k)
        L.calc(f"reg.c_{tag}_v_rating", eq.PICKED, rf"V_{{C{tag},rated}}", "V",
               f"Regulator {side} capacitor voltage rating (standard step)",
               {"x": f"reg.c_{tag}_v_needed"},
               lambda x: standards.next_at_or_above(x, standards.CAPACITOR_VOLTAGES))


def decoupling_lines(line, v) -> list:
    """BOM lines of the two capacitors (``line`` and ``v`` as handed to a kind's bom_lines)."""
    out = []
    for tag, where in (("in", "between the regulator's input and ground, at its pins"),
                       ("out", "between the regulator's output and ground, at its pins")):
        c, vr = v(f"reg.c_{tag}"), v(f"reg.c_{tag}_v_rating")
        out.append(line(REFS[tag], "capacitor", f"{c} {vr} ceramic",
                        f"ceramic capacitor {c}, at least {vr}, {where} (value typical of "
                        "makers' data sheets)", (f"reg.c_{tag}", f"reg.c_{tag}_v_rating")))
    return out
