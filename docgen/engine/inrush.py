"""Switch-on surge: the first charging pulse when the mains is connected at the crest.

The capacitor starts empty and the source is closed at the crest of its EMF, the worst instant
for a capacitor-input rectifier. The pulse is integrated with the same stepper as the steady
state, on a time grid that is very fine just after closing (the current may rise within
microseconds when there is little inductance) and uniform after that.

Full-wave circuits are modelled by the path that conducts first; for a bridge that is exact until
the pulse ends, for a center-tap transformer it ignores the other half winding joining in before
the first pulse has ended (possible only with leakage inductance at heavy charge current).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .circuit import Circuit, Params
from .loads import build_load
from .stepper import integrate

FIRST_STEP = 1e-7  # of a mains period
GROWTH = 1.1


@dataclass
class SwitchOn:
    """First-pulse figures after switch-on at the crest with an empty capacitor (SI units).

    ``i_peak``: largest diode current; ``t_peak``: its time after closing; ``i2t``: integral of the
    diode current squared over the first pulse (A^2 s). NaN where ``converged`` is False (the
    pulse did not end within the simulated periods).
    """

    i_peak: np.ndarray
    i2t: np.ndarray
    t_peak: np.ndarray
    converged: np.ndarray


def switch_on(circuit: Circuit, *, periods: float = 1.0, steps_per_period: int = 4000) -> SwitchOn:
    """First charging pulse of every operating point of ``circuit`` (see module notes)."""
    p = Params(circuit)
    load = build_load(p)
    phase = _phase_grid(periods, steps_per_period)[:, None] + np.zeros(p.n)
    zero = np.zeros(p.n)
    r = integrate(p, load, phase, zero, zero, store=True, sensitivity=False, stop_after_pulse=True)
    i = r.i
    phase = phase[: i.shape[0]]
    t = (phase - phase[0]) / p.omega
    started = np.maximum.accumulate(i > 0, axis=0)
    ended = started & (i <= 0)
    ends = ended.any(axis=0)
    k_end = np.where(ends, np.argmax(ended, axis=0), i.shape[0] - 1)
    rows = np.arange(i.shape[0])[:, None]
    in_pulse = rows <= k_end[None, :]
    pulse = np.where(in_pulse, i, 0.0)
    k_pk = np.argmax(pulse, axis=0)
    cols = np.arange(p.n)
    sq = pulse * pulse
    dt = np.diff(t, axis=0)
    i2t = np.sum(0.5 * (sq[:-1] + sq[1:]) * dt, axis=0)
    ok = ends & np.isfinite(i2t)
    nan = np.full(p.n, np.nan)
    return SwitchOn(
        i_peak=np.where(ok, pulse[k_pk, cols], nan),
        i2t=np.where(ok, i2t, nan),
        t_peak=np.where(ok, t[k_pk, cols], nan),
        converged=ok,
    )


def _phase_grid(periods: float, steps_per_period: int) -> np.ndarray:
    """Phase from the crest (pi/2): geometric steps from FIRST_STEP, then uniform."""
    h_max = 2.0 * math.pi / steps_per_period
    h = 2.0 * math.pi * FIRST_STEP
    steps = []
    while h < h_max:
        steps.append(h)
        h *= GROWTH
    head = np.cumsum(steps) if steps else np.zeros(0)
    start = head[-1] if steps else 0.0
    total = 2.0 * math.pi * periods
    body = np.linspace(start, total, max(2, int(math.ceil((total - start) / h_max)) + 1))
    return 0.5 * math.pi + np.concatenate([[0.0], head[:-1] if steps else [], body])
