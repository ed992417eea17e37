"""Circuit model for the waveform engine: winding resistance, leakage inductance and ESR."""

from __future__ import annotations

import math

from .. import equations as eq
from ..trace import Ledger
from .context import SizingContext

WRITES = ("transformer.", "reservoir.esr", "reservoir.tan_delta")
TITLE = "Circuit model"
INTRO = ("The waveform engine needs the transformer's source impedance and the capacitor's ESR. "
         "When the file does not give them they are estimated from the transformer's rating "
         "and regulation and from the capacitor's dissipation factor; the estimates are traced "
         "here so a reviewer can replace them with measured values.")


def model_circuit(ctx: SizingContext, L: Ledger) -> None:
    spec = ctx.spec
    t = spec.transformer
    r = spec.reservoir
    if t.winding_resistance is not None:
        L.given("transformer.r_w", r"R_w", t.winding_resistance, "ohm",
                "Secondary-referred winding resistance (from the file)")
    else:
        L.calc("transformer.r_w", eq.WINDING_R_PATH, r"R_w", "ohm",
               "Secondary-referred resistance of the conducting winding (estimate)",
               {"g": "transformer.regulation", "p": "transformer.v_path",
                "v": "transformer.v_rated", "s": "transformer.va"},
               lambda g, p, v, s: g * p * v / s)
    if t.leakage_inductance is not None:
        L.given("transformer.l_s", r"L_s", t.leakage_inductance, "H",
                "Leakage inductance (from the file)")
    else:
        L.given("transformer.k_x", r"k_X", t.leakage_ratio, "", "Leakage reactance ratio",
                defaulted="leakage_ratio" not in t.model_fields_set)
        L.calc("transformer.l_s", eq.LEAKAGE_L, r"L_s", "H", "Leakage inductance (estimate)",
               {"k": "transformer.k_x", "r": "transformer.r_w", "f": "mains.freq"},
               lambda k, r, f: k * r / (2 * math.pi * f))
    if "reservoir.esr" in L:
        return  # a library part stated its ESR
    if r.esr is not None:
        L.given("reservoir.esr", "ESR", r.esr, "ohm", "Capacitor ESR (from the file)")
    else:
        L.given("reservoir.tan_delta", r"\tan\delta", r.tan_delta, "",
                "Capacitor dissipation factor", defaulted="tan_delta" not in r.model_fields_set)
        L.calc("reservoir.esr", eq.ESR_TAN_DELTA, "ESR", "ohm", "Capacitor ESR (estimate)",
               {"t": "reservoir.tan_delta", "f": "mains.ripple_freq", "c": "reservoir.c"},
               lambda t, f, c: t / (2 * math.pi * f * c))
