"""Periodic steady state by shooting on the period map, vectorised over operating points.

The pass boundary is the zero crossing of the source EMF, where a capacitor-input rectifier is off,
so the period map has one state, the capacitor voltage (inductor currents are zero there; a pass
that ends with current still flowing is reported as unsupported continuous conduction). Full-wave
circuits are symmetric over half a mains period, so one pulse (half a period) is simulated and
mirrored.

Each point is solved by a safeguarded Newton iteration on G(v) = P(v) - v, with P'(v) from the
differentiated steps: first on a coarse uniform grid to find the state and where the diode
conducts, then on a per-point grid that puts most steps inside the conduction pulse, which is only
a few per cent of the period. Points leave the iteration as soon as they converge.
"""

from __future__ import annotations

import math
import os
from collections.abc import Sequence
from concurrent.futures import ThreadPoolExecutor

import numpy as np

from .circuit import Circuit, Params
from .loads import Load, build_load, typical_current
from .period_figures import METRICS, SteadyState, period_metrics, period_waveforms
from .stepper import PassResult, integrate

# Status codes of SteadyState.status
OK, NOT_CONVERGED, COLLAPSED, CONTINUOUS = 0, 1, 2, 3
STATUS_TEXT = {
    OK: "converged",
    NOT_CONVERGED: "no convergence within max_periods",
    COLLAPSED: "no steady state with a positive capacitor voltage (the load asks for more "
    "than the source gives)",
    CONTINUOUS: "diode current does not return to zero within a pulse period (continuous "
    "conduction, or an overload with inductance; outside the model)",
}

DEFAULT_STEPS_PER_PERIOD = 512
COARSE_STEPS_PER_PERIOD = 128
CHUNK = 2048  # points per vectorised block; bounds memory of the stored pass arrays
MIN_CHUNK = 256  # below this a block is not split further for threads
MAX_THREADS = 4
DENSE_FRACTION = 0.6  # share of fine steps placed in the conduction window
WINDOW_THRESHOLD = 1e-4  # current / peak that bounds the conduction window
COARSE_TOL = 1e-3  # relative state accuracy that ends the coarse stage
CLOSE_TOL = 1e-11  # relative cycle-closure error treated as exact (rounding level)


def simulate(
    circuit: Circuit,
    *,
    keep_waveforms: Sequence[int] = (),
    steps_per_period: int | None = None,
    tol: float = 1e-6,
    max_periods: int = 60,
) -> SteadyState:
    """Periodic steady state of every operating point of ``circuit``.

    steps_per_period: fine-grid time steps per mains period of a full-wave rectifier (default
        512); a half-wave rectifier, with one pulse per period, gets the same number per pulse
        (steps_per_period / 2 per period), most of them inside the conduction pulse.
    tol: converged when the Newton correction of the capacitor voltage is below tol * vpk.
    max_periods: cap on period-map evaluations per point (coarse and fine grids together).
    """
    p = Params(circuit)
    steps = int(steps_per_period or DEFAULT_STEPS_PER_PERIOD)
    if steps < 16:
        raise ValueError("steps_per_period must be at least 16")
    keep = sorted({_index(k, p.n) for k in keep_waveforms})
    n = p.n
    res = {name: np.full(n, np.nan) for name in METRICS}
    status = np.full(n, NOT_CONVERGED, dtype=int)
    iters = np.zeros(n, dtype=int)
    waves: dict[int, dict[str, np.ndarray]] = {}
    # numpy releases the GIL inside array operations, so blocks of points run in parallel threads.
    workers = max(1, min(os.cpu_count() or 1, MAX_THREADS))
    size = min(CHUNK, max(MIN_CHUNK, -(-n // workers)))
    blocks = [np.arange(s, min(n, s + size)) for s in range(0, n, size)]

    def run(idx):
        start = int(idx[0])
        local_keep = {k - start: k for k in keep if start <= k < start + len(idx)}
        chunk = _Chunk(p.take(idx), steps, tol, max_periods, local_keep)
        chunk.run()
        return idx, local_keep, chunk

    if workers > 1 and len(blocks) > 1:
        with ThreadPoolExecutor(max_workers=workers) as pool:
            done = list(pool.map(run, blocks))
    else:
        done = [run(idx) for idx in blocks]
    for idx, local_keep, chunk in done:
        for name in METRICS:
            res[name][idx] = chunk.res[name]
        status[idx] = chunk.status
        iters[idx] = chunk.iters
        waves.update({local_keep[k]: w for k, w in chunk.waves.items()})
    converged = status == OK
    for name in METRICS:
        res[name][~converged] = np.nan
    res["ripple_freq"] = np.where(converged, p.freq * (2.0 if p.full_wave else 1.0), np.nan)
    return SteadyState(**res, converged=converged, status=status, iterations=iters, waveforms=waves)


def _index(k, n: int) -> int:
    k = int(k)
    if not -n <= k < n:
        raise IndexError(f"keep_waveforms index {k} out of range for {n} points")
    return k % n


class _Chunk:
    """Shooting iteration for one block of points."""

    def __init__(self, p: Params, steps: int, tol: float, max_periods: int, keep: dict[int, int]):
        self.p, self.tol, self.max_passes, self.keep = p, tol, max_periods, keep
        self.load = build_load(p)
        n = p.n
        # One pulse per pass in every topology, so each pass gets the steps of half a period:
        # a half-wave pass covers a whole period but the extra off-time needs no resolution.
        self.n_fine = max(8, steps // 2)
        self.n_coarse = max(8, COARSE_STEPS_PER_PERIOD // 2)
        self.res = {name: np.full(n, np.nan) for name in METRICS}
        self.status = np.full(n, NOT_CONVERGED, dtype=int)
        self.iters = np.zeros(n, dtype=int)
        self.waves: dict[int, dict[str, np.ndarray]] = {}
        self.v = _initial_guess(p)
        self.win = np.zeros((2, n))
        self.lo = np.zeros(n)
        self.hi = 1.5 * p.vpk

    def run(self) -> None:
        p, n = self.p, self.p.n
        coarse = np.linspace(0.0, p.span, self.n_coarse + 1)[:, None] * np.ones(n)
        todo = self._coarse(np.arange(n), coarse)
        if todo.size:
            dense = self._margins(self.win[:, todo], p.span / self.n_coarse)
            grid = np.zeros((self.n_fine + 1, n))
            grid[:, todo] = _window_grid(self.n_fine, p.span, dense[0], dense[1])
            self.dense = np.zeros((2, n))
            self.dense[:, todo] = dense
            self._fine(todo, grid)

    def _margins(self, win: np.ndarray, step: float) -> np.ndarray:
        margin = 0.25 * (win[1] - win[0]) + 2.0 * step
        return np.clip(np.stack([win[0] - margin, win[1] + margin]), 0.0, self.p.span)

    def _newton(self, active: np.ndarray, grid: np.ndarray, tol: float, final: bool):
        """One period-map evaluation and safeguarded Newton update for the active points."""
        q = self.p.take(active)
        ld = self.load.take(active)
        va = self.v[active]
        r = integrate(q, ld, grid[:, active], va, np.zeros(active.size))
        self.iters[active] += 1
        g = r.v_c_end - va
        lo, hi = self.lo[active], self.hi[active]
        lo = np.where(g > 0, np.maximum(lo, va), lo)
        hi = np.where(g < 0, np.minimum(hi, va), hi)
        gp = r.slope - 1.0
        newton = gp < 0
        step = np.where(newton, -g / np.where(newton, gp, -1.0), np.inf)
        vn = va + step
        inside = newton & (vn > lo) & (vn < hi)
        # The lower bracket 0 V is assumed, not known: test it before bisecting towards it.
        to_zero = ~inside & newton & (vn <= lo) & (lo == 0.0) & (va > 0.0)
        vn = np.where(inside, vn, np.where(to_zero, 0.0, 0.5 * (lo + hi)))
        self.lo[active], self.hi[active] = lo, hi
        scale = q.vpk
        # No fixed point at a non-negative voltage (only a load that can pull the capacitor
        # below 0 V, a current sink, does this). P is increasing, so P(v) < 0 for some v >= 0
        # proves it.
        collapsed = r.v_c_end < -tol * scale
        # Current left at the end of the pass; a trace (a fully discharged capacitor at the zero
        # crossing) does not count.
        flowing = r.i_end > WINDOW_THRESHOLD * np.maximum(r.i.max(axis=0), 0.0)
        # With inductance and current still flowing at the end, the pass's zero-current start was
        # wrong, so the collapse is not proven: report continuous conduction instead.
        carried = collapsed & flowing & (q.l_s > 0)
        collapsed &= ~carried
        # Converged: the Newton correction is below tol, or the cycle already closes to rounding
        # level (a nearly neutral map, e.g. no load, where the correction is all rounding noise).
        conv = newton & (np.abs(step) <= tol * scale)
        conv |= np.abs(g) <= CLOSE_TOL * scale
        # Current still flowing at the end of a pass is judged only at the converged state: a
        # start far below it can charge right through the zero crossing.
        continuous = (conv & flowing & ~collapsed & final) | carried
        self.status[active[collapsed]] = COLLAPSED
        self.status[active[continuous]] = CONTINUOUS
        return r, q, ld, vn, conv, collapsed | continuous

    def _coarse(self, active: np.ndarray, grid: np.ndarray) -> np.ndarray:
        """Coarse uniform grid: rough state and conduction window; returns the points to refine."""
        cap = max(1, self.max_passes // 2)
        out = []
        while active.size:
            r, _, _, vn, conv, bad = self._newton(active, grid, COARSE_TOL, final=False)
            self.v[active] = np.where(bad, self.v[active], vn)
            exhausted = ~conv & ~bad & (self.iters[active] >= cap)
            go = (conv | exhausted) & ~bad
            self.win[:, active[go]] = _window(grid[:, active[go]], r.i[:, go])
            out.append(active[go])
            active = active[~(conv | bad | exhausted)]
        return np.sort(np.concatenate(out)) if out else np.array([], dtype=int)

    def _fine(self, active: np.ndarray, grid: np.ndarray) -> None:
        """Fine per-point grid; regrids once if the pulse left the dense window."""
        p = self.p
        self.lo[active] = 0.0
        self.hi[active] = 1.5 * p.vpk[active]
        first = True
        while active.size:
            active = active[self.iters[active] < self.max_passes]
            if not active.size:
                break
            r, q, ld, vn, conv, bad = self._newton(active, grid, self.tol, final=True)
            if first:
                win = _window(grid[:, active], r.i)
                moved = (win[0] < self.dense[0, active]) | (win[1] > self.dense[1, active])
                moved &= ~bad
                if moved.any():
                    cols = active[moved]
                    dense = self._margins(win[:, moved], 4.0 * p.span / self.n_fine)
                    grid[:, cols] = _window_grid(self.n_fine, p.span, dense[0], dense[1])
                    self.lo[cols] = 0.0
                    self.hi[cols] = 1.5 * p.vpk[cols]
                    conv &= ~moved
                first = False
            good = conv & ~bad
            if good.any():
                self._record(active, good, grid, r, q, ld)
            self.v[active] = np.where(bad, self.v[active], vn)
            active = active[~(conv | bad)]

    def _record(self, active, good, grid, r: PassResult, q: Params, ld: Load) -> None:
        cols = active[good]
        qs, lds = q.take(np.flatnonzero(good)), ld.take(np.flatnonzero(good))
        phase = grid[:, cols]
        m = period_metrics(qs, lds, phase, r.i[:, good], r.v_p[:, good])
        for name, val in m.items():
            self.res[name][cols] = val
        self.status[cols] = OK
        for pos, (j, col) in enumerate(zip(np.flatnonzero(good), cols, strict=True)):
            if int(col) in self.keep:
                one = np.array([j])
                self.waves[int(col)] = period_waveforms(
                    q.take(one), ld.take(one), phase[:, pos], r.i[:, j], r.v_p[:, j]
                )


def _initial_guess(p: Params) -> np.ndarray:
    """Rough capacitor voltage at the EMF zero crossing: peak less drops and a quarter-cycle droop.

    The diode drop uses a guessed peak current (a few times the load current, at least enough
    forward current to balance the reverse saturation current at no load).
    """
    i_est = typical_current(p)
    i_pk = np.maximum(5.0 * i_est, 50.0 * p.isat)
    drop = p.mvt * np.log1p(i_pk / p.isat) + p.r_lin * i_pk
    droop = i_est * (0.5 * math.pi / p.omega) / p.c
    return np.clip(p.vpk - drop - droop, 0.3 * p.vpk, p.vpk)


def _window(phase: np.ndarray, i: np.ndarray) -> np.ndarray:
    """Phase interval (2, k) where the path current exceeds WINDOW_THRESHOLD of its peak."""
    nsteps = i.shape[0] - 1
    peak = i.max(axis=0)
    above = i > WINDOW_THRESHOLD * np.maximum(peak, 0.0)
    first = np.argmax(above, axis=0)
    last = nsteps - np.argmax(above[::-1], axis=0)
    cols = np.arange(i.shape[1])
    lo = phase[np.maximum(first - 1, 0), cols]
    hi = phase[np.minimum(last + 1, nsteps), cols]
    return np.stack([lo, hi])


def _window_grid(nsteps: int, span: float, a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """Phase grid (nsteps+1, k): DENSE_FRACTION of the steps in [a, b], the rest spread outside."""
    s = np.linspace(0.0, 1.0, nsteps + 1)[:, None]
    width = np.maximum(b - a, 1e-9 * span)
    outside = np.maximum(span - width, 0.0)
    frac = np.where(outside > 1e-9 * span, DENSE_FRACTION, 1.0)
    s1 = (1.0 - frac) * np.divide(a, outside, out=np.zeros_like(a), where=outside > 0)
    s2 = s1 + frac
    before = s * np.divide(a, s1, out=np.zeros_like(a), where=s1 > 0)
    inside = a + (s - s1) * width / frac
    tail = 1.0 - s2
    after = b + (s - s2) * np.divide(span - b, tail, out=np.zeros_like(b), where=tail > 0)
    ph = np.where(s < s1, before, np.where(s <= s2, inside, after))
    ph[0], ph[-1] = 0.0, span
    return np.maximum.accumulate(ph, axis=0)
