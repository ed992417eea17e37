"""Capacitor voltage of an ideal-diode bridge feeding a zener shunt regulator, for the report plot.

A deliberately simple time-step model (ideal diodes with a fixed drop, stiff source, capacitor
discharged by the regulator's input current) that shows the shape the hand formulas assume.
"""

from __future__ import annotations

import numpy as np


def ideal_bridge_zener(v_pk_sec: float, v_f: float, freq: float, c: float, r: float,
                       v_z: float, periods: int = 2, steps: int = 2000) -> dict[str, np.ndarray]:
    """Return t, rectified source, capacitor voltage and charging current over ``periods``.

    Starts from the crest and runs one extra period so the shown periods are in steady state.
    """
    total = (periods + 1) * steps
    t = np.arange(total + 1) / (steps * freq)
    src = np.abs(v_pk_sec * np.sin(2 * np.pi * freq * t + np.pi / 2)) - 2 * v_f
    dt = 1.0 / (steps * freq)
    v = np.empty_like(t)
    i_load = np.empty_like(t)
    v[0] = src[0]
    for k in range(1, t.size):
        load = max(v[k - 1] - v_z, 0.0) / r
        held = v[k - 1] - load * dt / c
        v[k] = max(src[k], held)
        i_load[k] = load
    i_load[0] = i_load[1]
    i_charge = np.clip(np.gradient(v, dt) * c + i_load, 0.0, None)
    keep = slice(steps, None)
    return {"t": t[keep] - t[steps], "source": src[keep], "v_c": v[keep],
            "i_charge": i_charge[keep]}
