"""Mains: nominal, low and high line, and their peaks."""

from __future__ import annotations

import math

from .. import equations as eq
from ..trace import Ledger
from .context import SizingContext

TITLE = "Mains supply"
INTRO = ("The supply range follows the tolerances in the requirements file; by default the "
         "IEC 60038 supply range of +/-10 % around nominal.")


def size_mains(ctx: SizingContext, L: Ledger) -> None:
    m = ctx.spec.mains
    explicit = m.model_fields_set
    L.given("mains.v_nom", r"V_{nom}", m.nominal, "V", "Nominal mains voltage (RMS)",
            defaulted="nominal" not in explicit)
    L.given("mains.freq", "f", m.frequency, "Hz", "Mains frequency",
            defaulted="frequency" not in explicit)
    L.given("mains.tol_low", r"t_{lo}", m.tolerance_low, "%", "Low-line tolerance",
            defaulted="tolerance_low" not in explicit)
    L.given("mains.tol_high", r"t_{hi}", m.tolerance_high, "%", "High-line tolerance",
            defaulted="tolerance_high" not in explicit)
    L.calc("mains.v_low", eq.LINE_LOW, r"V_{lo}", "V", "Low-line voltage (RMS)",
           {"v": "mains.v_nom", "t": "mains.tol_low"}, lambda v, t: v * (1 - t))
    L.calc("mains.v_high", eq.LINE_HIGH, r"V_{hi}", "V", "High-line voltage (RMS)",
           {"v": "mains.v_nom", "t": "mains.tol_high"}, lambda v, t: v * (1 + t))
    L.calc("mains.v_pk_high", eq.SINE_PEAK, r"V_{pk,hi}", "V", "High-line peak voltage",
           {"v": "mains.v_high"}, lambda v: math.sqrt(2) * v)
    if ctx.spec.rectifier.topology == "half-wave":
        L.calc("mains.ripple_freq", eq.RIPPLE_FREQ_HW, r"f_r", "Hz",
               "Ripple frequency (half-wave)", {"f": "mains.freq"}, lambda f: f)
    else:
        L.calc("mains.ripple_freq", eq.RIPPLE_FREQ_FW, r"f_r", "Hz",
               "Ripple frequency (full-wave)", {"f": "mains.freq"}, lambda f: 2 * f)
