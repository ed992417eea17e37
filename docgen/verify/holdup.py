"""Hold-up: how long the output stays within its limits after the mains drops out.

The worst phase of a dropout is the capacitor's trough: the charging pulse that would have
topped it up never comes, so the discharge starts from the lowest voltage of the cycle. From
there the capacitor feeds the kind's load law (the engine's own piecewise-linear law,
docgen.engine.loads) until the terminal voltage reaches the kind's floor
(``Regulator.holdup_floor``). On each linear segment i = g0 + g1 v the time has a closed form
(charge balance, C du/dt = -i, with the terminal voltage v = u - ESR i):

    t = C (1 + ESR g1) / g1 * ln((g0 + g1 v_hi) / (g0 + g1 v_lo))     (g1 != 0)
    t = C (v_hi - v_lo) / g0                                            (g1 = 0)
"""

from __future__ import annotations

import numpy as np

from ..engine.circuit import Circuit, Params
from ..engine.loads import Load, build_load


def discharge_time(load: Load, c: np.ndarray, esr: np.ndarray, v_from: np.ndarray,
                   v_to: np.ndarray) -> np.ndarray:
    """Time for the terminal voltage to fall from ``v_from`` to ``v_to`` under ``load``
    (0 when it starts at or below ``v_to``; inf when the load draws nothing on the way)."""
    n = len(v_from)
    edges = ([np.full(n, -np.inf)] + [np.asarray(b, dtype=float) for b in load.breaks]
             + [np.full(n, np.inf)])
    t = np.zeros(n)
    with np.errstate(divide="ignore", invalid="ignore"):
        for k in range(len(load.g0)):
            lo = np.maximum(v_to, edges[k])
            hi = np.minimum(v_from, edges[k + 1])
            span = hi > lo
            g0 = np.broadcast_to(load.g0[k], (n,))
            g1 = np.broadcast_to(load.g1[k], (n,))
            i_lo, i_hi = g0 + g1 * lo, g0 + g1 * hi
            sloped = c * (1 + esr * g1) / g1 * np.log(i_hi / i_lo)
            flat = c * (hi - lo) / g0
            seg = np.where(np.abs(g1) > 0, sloped, flat)
            # a segment that draws no current on the way holds the voltage for ever
            seg = np.where((i_lo <= 0) & (i_hi <= 0), np.inf, seg)
            t += np.where(span, seg, 0.0)
    return np.where(v_from > v_to, t, 0.0)


def holdup_times(L, reg, pts, v_trough: np.ndarray, circuit: Circuit) -> np.ndarray:
    """Hold-up time of every operating point: from the engine's trough to the kind's floor."""
    p = Params(circuit)
    floor = np.asarray(reg.holdup_floor(L, pts), dtype=float)
    v1 = np.asarray(v_trough, dtype=float)
    t = discharge_time(build_load(p), p.c, p.esr, np.where(np.isfinite(v1), v1, 0.0), floor)
    return np.where(np.isfinite(v1), t, np.nan)
