"""Mains: nominal, low and high line, and their peaks."""

from __future__ import annotations

import math

from .. import equations as eq
from ..topology import topology
from ..trace import Ledger
from .context import SizingContext

WRITES = ("mains.",)
TITLE = "Mains supply"
INTRO = ("The supply range follows the tolerances in the requirements file; by default the "
         "IEC 60038 supply range of +/-10 % around nominal.")


def size_mains(ctx: SizingContext, L: Ledger) -> None:
    m = ctx.spec.mains
    for vid, sym, key, unit, title in (
        ("mains.v_nom", r"V_{nom}", "nominal", "V", "Nominal mains voltage (RMS)"),
        ("mains.tol_low", r"t_{lo}", "tolerance_low", "%", "Low-line tolerance"),
        ("mains.tol_high", r"t_{hi}", "tolerance_high", "%", "High-line tolerance"),
    ):
        defaulted, source = m.origin(key)
        L.given(vid, sym, getattr(m, key), unit, title, defaulted=defaulted, source=source)
    defaulted, source = m.origin("frequency")
    if m.also_frequency is None:
        L.given("mains.freq", "f", m.frequency, "Hz", "Mains frequency", defaulted=defaulted,
                source=source)
    else:
        L.given("mains.freq_given", r"f_1", m.frequency, "Hz", "Mains frequency",
                defaulted=defaulted, source=source)
        L.given("mains.freq_also", r"f_2", m.also_frequency, "Hz",
                "Second mains frequency the product must run from")
        L.calc("mains.freq", eq.MIN2, "f", "Hz", "Design frequency (the lower: more ripple)",
               {"a": "mains.freq_given", "b": "mains.freq_also"}, lambda a, b: min(a, b))
    L.calc("mains.v_low", eq.LINE_LOW, r"V_{lo}", "V", "Low-line voltage (RMS)",
           {"v": "mains.v_nom", "t": "mains.tol_low"}, lambda v, t: v * (1 - t))
    L.calc("mains.v_high", eq.LINE_HIGH, r"V_{hi}", "V", "High-line voltage (RMS)",
           {"v": "mains.v_nom", "t": "mains.tol_high"}, lambda v, t: v * (1 + t))
    L.calc("mains.v_pk_high", eq.SINE_PEAK, r"V_{pk,hi}", "V", "High-line peak voltage",
           {"v": "mains.v_high"}, lambda v: math.sqrt(2) * v)
    topo = topology(ctx.spec.rectifier.topology)
    pulses = topo.pulses_per_cycle
    L.calc("mains.ripple_freq", topo.ripple_equation, r"f_r", "Hz",
           f"Ripple frequency ({'half' if topo.half_wave else 'full'}-wave)", {"f": "mains.freq"},
           lambda f: pulses * f)
