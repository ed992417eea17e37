"""Switch-on transient: the charging pulses after the mains is connected at the crest.

The capacitor starts empty and the source is closed at the crest of its EMF, the worst instant
for a capacitor-input rectifier. The transient is integrated with the same stepper as the steady
state, pulse period by pulse period, until the capacitor is charged: a pulse period whose peak
current stays below ``settle_ratio`` times the steady-state repetitive peak (when that is given)
or that adds less than SETTLE_I2T of the I^2 t so far (no load: no more pulses), or
``max_cycles`` mains periods, whichever comes first. With leakage inductance the capacitor
voltage overshoots and rings, so the second pulse can be larger than the first, and the I^2 t
of the whole transient is several times the first pulse's; both figures are reported.

The first window starts at the crest on a grid that is very fine just after closing (the current
may rise within microseconds when there is little inductance) and uniform after that; the later
windows run from one EMF zero crossing (half-wave: negative crest) to the next on a uniform grid.

Full-wave circuits carry one path whose EMF changes sign only while it is off (see
``stepper.integrate``); for a bridge that is exact, for a center-tap transformer it ignores the
other half winding joining in while the first still conducts (possible only while the capacitor
voltage is below the EMF of both halves, i.e. in the first pulse with a large leakage inductance).
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
MAX_CYCLES = 10.0  # mains periods; common practice: the capacitor charges within a few cycles
SETTLE_RATIO = 1.1  # pulse peak over the steady-state repetitive peak counted as settled
SETTLE_I2T = 1e-4  # a pulse period adding less than this fraction of the I^2 t so far: settled


@dataclass
class SwitchOn:
    """Switch-on transient at the crest with an empty capacitor (SI units, arrays over points).

    ``i_peak``: largest path current of the whole transient; ``t_peak``: its time after closing;
    ``i2t``: integral of the path current squared over the transient (A^2 s); ``first_peak`` and
    ``first_i2t``: the same over the first pulse only; ``pulses``: pulse periods integrated;
    ``duration``: time integrated (s); ``settled``: the settling test was met (False when no
    steady-state peak was given or ``max_cycles`` ran out). Figures are NaN where ``converged``
    is False (not finite, or the current still flowing at the end).
    """

    i_peak: np.ndarray
    i2t: np.ndarray
    t_peak: np.ndarray
    first_peak: np.ndarray
    first_i2t: np.ndarray
    pulses: np.ndarray
    duration: np.ndarray
    settled: np.ndarray
    converged: np.ndarray


def switch_on(circuit: Circuit, *, steps_per_period: int = 4000, max_cycles: float = MAX_CYCLES,
              settle_peak=None, settle_ratio: float = SETTLE_RATIO,
              later_steps_per_period: int | None = None) -> SwitchOn:
    """Switch-on transient of every operating point of ``circuit`` (see module notes).

    The first window (from closing, where the current may rise within microseconds) uses
    ``steps_per_period``; the later pulse periods, whose pulses are rounder, a quarter of it
    unless ``later_steps_per_period`` says otherwise (peak and I^2 t then move by less than
    1e-4 relative on the test circuits, at a third of the cost).

    ``settle_peak``: the steady-state repetitive peak current of each point (float or array); a
    point stops accumulating once a pulse period's peak is below ``settle_ratio`` times it. Without
    it every point runs ``max_cycles`` mains periods.
    """
    p = Params(circuit)
    load = build_load(p)
    n = p.n
    ref = np.full(n, np.nan) if settle_peak is None else \
        np.broadcast_to(np.asarray(settle_peak, dtype=float), (n,)).copy()
    half = p.span  # pulse period in phase: pi full-wave, 2 pi half-wave
    # First window: from the crest to the next EMF zero crossing (half-wave: negative crest).
    first_end = math.pi if p.full_wave else 1.5 * math.pi
    n_windows = 1 + max(0, int(math.ceil((2.0 * math.pi * max_cycles - (first_end - 0.5 * math.pi))
                                         / half - 1e-9)))
    later = later_steps_per_period or max(64, steps_per_period // 4)
    h_steps = max(8, int(round(later * half / (2.0 * math.pi))))

    v_c = np.zeros(n)
    i = np.zeros(n)
    sign = np.ones(n) if p.full_wave else None
    active = np.ones(n, dtype=bool)
    settled = np.zeros(n, dtype=bool)
    i2t = np.zeros(n)
    peak = np.zeros(n)
    t_peak = np.zeros(n)
    first_peak = np.zeros(n)
    first_i2t = np.zeros(n)
    first_open = np.ones(n, dtype=bool)  # the first pulse has not ended yet
    started = np.zeros(n, dtype=bool)
    pulses = np.zeros(n)
    duration = np.zeros(n)
    for w in range(n_windows):
        if w == 0:
            grid = _phase_grid(first_end - 0.5 * math.pi, steps_per_period)
        else:
            grid = first_end + (w - 1) * half + np.linspace(0.0, half, h_steps + 1)
        phase = grid[:, None] + np.zeros(n)
        r = integrate(p, load, phase, v_c, i, store=True, sensitivity=False,
                      sign0=sign if p.full_wave else None)
        cur = r.i
        t = (grid - 0.5 * math.pi)[:, None] / p.omega
        sq = cur * cur
        w_i2t = np.sum(0.5 * (sq[:-1] + sq[1:]) * np.diff(t, axis=0), axis=0)
        k_pk = np.argmax(cur, axis=0)
        w_pk = cur[k_pk, np.arange(n)]
        # First pulse: from closing until the current is first off again after flowing.
        on = np.maximum.accumulate(cur > 0, axis=0) | started
        off = on & (cur <= 0)
        k_end = np.where(off.any(axis=0), np.argmax(off, axis=0), cur.shape[0] - 1)
        rows = np.arange(cur.shape[0])[:, None]
        fsq = np.where(rows <= k_end[None, :], sq, 0.0)
        f_i2t = np.sum(0.5 * (fsq[:-1] + fsq[1:]) * np.diff(t, axis=0), axis=0)
        f_pk = np.max(np.where(rows <= k_end[None, :], cur, 0.0), axis=0)
        first_i2t += np.where(first_open, f_i2t, 0.0)
        first_peak = np.where(first_open, np.maximum(first_peak, f_pk), first_peak)
        first_open &= ~off.any(axis=0)
        started = on[-1]
        i2t += np.where(active, w_i2t, 0.0)
        better = active & (w_pk > peak)
        t_peak = np.where(better, t[k_pk, 0], t_peak)
        peak = np.where(better, w_pk, peak)
        pulses += active
        duration = np.where(active, t[-1, 0], duration)
        if w > 0:
            quiet = (w_pk < settle_ratio * ref) | (w_i2t < SETTLE_I2T * i2t)
            now = active & quiet & (r.i_end <= 0)
            settled |= now
            active &= ~now
        v_c, i, sign = r.v_c_end, r.i_end, r.sign_end
        if not active.any():
            break
    ok = np.isfinite(i2t) & np.isfinite(peak) & (settled | (i <= 0))
    nan = np.full(n, np.nan)
    return SwitchOn(
        i_peak=np.where(ok, peak, nan),
        i2t=np.where(ok, i2t, nan),
        t_peak=np.where(ok, t_peak, nan),
        first_peak=np.where(ok, first_peak, nan),
        first_i2t=np.where(ok, first_i2t, nan),
        pulses=pulses,
        duration=duration,
        settled=settled,
        converged=ok,
    )


def _phase_grid(span: float, steps_per_period: int) -> np.ndarray:
    """Phase from the crest (pi/2) over ``span``: geometric steps from FIRST_STEP, then uniform."""
    h_max = 2.0 * math.pi / steps_per_period
    h = 2.0 * math.pi * FIRST_STEP
    steps = []
    while h < h_max:
        steps.append(h)
        h *= GROWTH
    head = np.cumsum(steps) if steps else np.zeros(0)
    start = head[-1] if steps else 0.0
    body = np.linspace(start, span, max(2, int(math.ceil((span - start) / h_max)) + 1))
    return 0.5 * math.pi + np.concatenate([[0.0], head[:-1] if steps else [], body])
