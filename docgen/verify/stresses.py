"""Initial estimates beside their verified figures: one figure per stress.

The hand formulas size the design; the waveform engine, at every corner and every Monte Carlo
sample, verifies it. Wherever the document shows a hand value of a stress it is the initial
estimate, and the verified figure (the one the checks, the summary and the BOM use) stands
beside it with the difference. The pairs are data; ``pairs`` only looks them up, so the HTML,
the PDF and results.json all show the same numbers.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any

# hand (initial estimate) value id -> verified value ids, first present wins
INITIAL_TO_VERIFIED: dict[str, tuple[str, ...]] = {
    "zener.p": ("engine.zener_power",),
    "zener.r_p": ("engine.resistor_power",),
    "reg.p_hand": ("engine.regulator_power",),
    "q.p_hand": ("engine.transistor_power",),
    "rect.i_peak": ("engine.i_d_peak",),
    "rect.i_peak_low": ("engine.i_d_peak",),
    "rect.i_peak_high": ("engine.i_d_peak",),
    "rect.conduction_angle": ("engine.conduction_min",),
    "rect.i_surge_est": ("engine.surge_peak",),
    "transformer.i_rms_est": ("engine.transformer_current",),
    "transformer.i_rms": ("engine.transformer_current",),
    "reservoir.i_ripple_est": ("engine.cap_ripple_current", "engine.i_c_rms_max",
                               "engine.i_c_rms"),
    "output.ripple": ("engine.output_ripple",),
}

WORST = "engine, worst over the corners and the Monte Carlo samples"
# Verified figures found otherwise than as the worst over corners and samples.
BASIS = {"engine.surge_peak": "engine, switch-on transient at the crest, high line, "
                              "capacitance at its upper tolerance"}


def verified_id(hand_id: str, values: Mapping[str, Any]) -> str | None:
    """The verified figure's id for a hand value (a split supply's "neg." prefix kept)."""
    prefix = "neg." if hand_id.startswith("neg.") else ""
    for vid in INITIAL_TO_VERIFIED.get(hand_id[len(prefix):], ()):
        if prefix + vid in values:
            return prefix + vid
    return None


def pairs(values: Mapping[str, Any]) -> dict[str, dict[str, Any]]:
    """hand id -> {"verified_id", "initial", "verified", "unit", "difference"}: the difference
    is (verified - initial) / initial, a fraction; None when the initial estimate is zero."""
    out: dict[str, dict[str, Any]] = {}
    for hand_id, tv in values.items():
        vid = verified_id(hand_id, values)
        if vid is None:
            continue
        ver = values[vid]
        if ver.unit != tv.unit:
            continue
        out[hand_id] = {"verified_id": vid, "initial": tv.value, "verified": ver.value,
                        "unit": tv.unit, "basis": BASIS.get(vid[4:] if vid.startswith("neg.")
                                                            else vid, WORST),
                        "difference": ((ver.value - tv.value) / tv.value) if tv.value else None}
    return out
