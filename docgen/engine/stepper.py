"""Implicit time stepping of one rectifier conduction path, vectorised over operating points.

Model of a path (one diode, or the two series diodes of a bridge, and its source):

    e(t) = r_lin * i + L di/dt + J(i) + v_p,        J(i) = mvt * ln(1 + i / Is)
    C dv_C/dt = i_c,   v_p = v_C + esr * i_c,       i_c = i - i_load(v_p)

where r_lin = r_s + m * diode_rs and J is the total junction voltage of the m series diodes.
The trapezoidal rule is applied to L, and to C unless the step is longer than the capacitor's
fastest time constant (then a damped theta-method, see integrate). With the piecewise-linear load
the step reduces to
``A - R* i - mvt ln(1 + i/Is) = 0`` on one load segment, solved in closed form with the Wright
omega function, so a step costs a fixed number of array operations and never fails to converge.

Trapezoidal integration of an inductor that is switched off by a diode rings (the stored inductor
voltage flips sign every step). A path whose current is not positive at the end of a step is off,
and its inductor voltage is set to its physical value, zero, which removes the ringing.

The derivative of the final capacitor voltage with respect to the initial one (the slope of the
period map used by the shooting Newton iteration) is carried along by differentiating each step.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .circuit import Params
from .loads import Load, typical_current
from .omega import wright_omega
from .pointwise import integrate_points

_R_MIN = 1e-12  # ohm; keeps the closed form finite for a path with no resistance at all
# Up to this many points (the 24 corners of a three-terminal rail) a pass steps each point with
# plain floats (pointwise.py): numpy's fixed cost per array operation would be most of the cost
# of a step.
POINTWISE_MAX = 24


@dataclass
class Solution:
    """Solution of the path equation at one instant (arrays over points)."""

    i: np.ndarray  # path current
    junction: np.ndarray | None  # total junction voltage of the path's diodes (if needed)
    v_p: np.ndarray  # capacitor terminal voltage
    i_c: np.ndarray  # capacitor current
    g1: np.ndarray  # load slope on the active segment
    d1: np.ndarray  # d v_p / d y on the active segment, y = a + Z i
    r_star: np.ndarray
    w: np.ndarray


def solve_path(p: Params, load: Load, ep, a, z, r2) -> Solution:
    """Solve ep - r2 i - J(i) - v_p = 0 with v_p = a + z * (i - i_load(v_p)).

    ep: source voltage including inductor history; a: capacitor history; z: discrete impedance of
    the capacitor branch (theta h / C + esr); r2: path resistance including the discrete inductor
    (r_lin + 2 L / h).
    """
    isat, mvt = p.isat, p.mvt
    if load.breaks:
        k = 0
        for j, vb in enumerate(load.breaks):
            g0b, g1b = load.g0[j], load.g1[j]
            yb = vb + z * (g0b + g1b * vb)
            zpos = z > 0
            ib = (yb - a) / np.where(zpos, z, 1.0)
            arg = np.maximum(ib / isat, -1.0 + 1e-15)
            fb = ep - r2 * ib - mvt * np.log1p(arg) - vb
            beyond = np.where(zpos, (ib <= -isat) | (fb > 0), a >= vb)
            k = k + beyond.astype(int)
        g0, g1 = load.select(k)
    else:
        g0, g1 = load.select(None)
    d1 = 1.0 / (1.0 + z * g1)
    d0 = -z * g0 * d1
    big_a = ep - d0 - d1 * a
    r_star = np.maximum(r2 + d1 * z, _R_MIN)
    x = (big_a + r_star * isat) / mvt + np.log(r_star * isat / mvt)
    w = wright_omega(x)
    i = (mvt / r_star) * w - isat
    v_p = d0 + d1 * (a + z * i)
    i_c = i - (g0 + g1 * v_p)
    return Solution(i, big_a - r_star * i, v_p, i_c, g1, d1, r_star, w)


def _solve_linear(isat, mvt, ep, a, z, d0, d1, g0, g1, r_star, lterm) -> Solution:
    """solve_path for a load with one segment, with the per-step coefficients precomputed."""
    big_a = ep - d0 - d1 * a
    w = wright_omega((big_a + r_star * isat) / mvt + lterm)
    i = (mvt / r_star) * w - isat
    v_p = d0 + d1 * (a + z * i)
    return Solution(i, None, v_p, i - (g0 + g1 * v_p), g1, d1, r_star, w)


@dataclass
class PassResult:
    v_c_end: np.ndarray
    slope: np.ndarray  # d v_c_end / d v_c_start
    i: np.ndarray | None = None  # (N+1, n) path current
    v_p: np.ndarray | None = None
    i_end: np.ndarray | None = None
    sign_end: np.ndarray | None = None  # path EMF signs at the end (passes given sign0)


def integrate(
    p: Params,
    load: Load,
    phase: np.ndarray,
    v_c0: np.ndarray,
    i0: np.ndarray,
    store: bool = True,
    sensitivity: bool = True,
    stop_after_pulse: bool = False,
    sign0: np.ndarray | None = None,
) -> PassResult:
    """Integrate one pass over the per-point phase grid ``phase`` (shape (N+1, n), radians).

    The pass starts with capacitor voltage v_c0 and, where l_s > 0, inductor current i0 (where
    l_s = 0 the current is found from the circuit). Phase is that of the open-circuit EMF
    e = vpk * sin(phase) of the path.

    ``sign0`` (full-wave passes longer than half a period, e.g. the switch-on transient): the
    EMF is that of the conducting path, sign * vpk * sin(phase), starting with ``sign0``. While
    the current flows the path keeps its sign (its diodes stay on past the EMF zero crossing);
    once it is off the path that the EMF now forward-biases takes over. The other path cannot
    conduct while one does as long as the capacitor voltage is not negative, so one path
    variable describes both. The final signs are returned in ``PassResult.sign_end``.
    """
    nsteps = phase.shape[0] - 1
    if p.n <= POINTWISE_MAX and not stop_after_pulse:
        dt = np.diff(phase, axis=0) / p.omega
        theta = np.maximum(0.5, 1.0 - fast_time_constant(p, load, dt) / dt)
        v_c, d_vc, out_i, out_v, i_end, sign_end = integrate_points(
            p, load, phase, v_c0, i0, theta, store, sensitivity, sign0)
        return PassResult(v_c, d_vc, out_i, out_v, i_end, sign_end)
    vpk, c, esr, ind = p.vpk, p.c, p.esr, p.l_s
    has_l = ind > 0
    sin = np.sin(phase)
    dt = np.diff(phase, axis=0) / p.omega

    # Consistent start (t0): capacitor branch without history (z = esr).
    sign = None if sign0 is None else np.asarray(sign0, dtype=float).copy()
    e0 = vpk * sin[0] * (1.0 if sign is None else sign)
    s0 = solve_path(p, load, e0, v_c0, esr, p.r_lin)
    # Paths with an inductor carry the given current; the node then follows from the load law.
    y_l = v_c0 + esr * i0
    g0l, g1l = load.segment_of_voltage(node_voltage(load, y_l, esr))
    d1l = 1.0 / (1.0 + esr * g1l)
    vp_l = (y_l - esr * g0l) * d1l
    i = np.where(has_l, i0, s0.i)
    junction = np.where(
        has_l, np.where(i0 > 0, p.mvt * np.log1p(np.maximum(i0, 0) / p.isat), 0.0), s0.junction
    )
    v_p = np.where(has_l, vp_l, s0.v_p)
    g1_0 = np.where(has_l, g1l, s0.g1)
    i_c = i - load.current(v_p)
    v_l = np.where(has_l & (i > 0), e0 - p.r_lin * i - junction - v_p, 0.0)
    v_l = np.where(has_l & (i <= 0), 0.0, v_l)
    v_c = v_c0.astype(float).copy()

    # Sensitivities with respect to v_c0.
    d_vc = np.ones_like(v_c0)
    d1_0 = np.where(has_l, d1l, s0.d1)
    di_alg = -s0.d1 / (s0.r_star * (1.0 + 1.0 / s0.w))
    d_i = np.where(has_l, 0.0, di_alg)
    z0 = esr
    d_vp = d1_0 * (1.0 + z0 * d_i)
    d_ic = d_i - g1_0 * d_vp
    d_vl = np.where(has_l & (i > 0), -d_vp, 0.0)  # v_l = e0 - r_lin i0 - J(i0) - v_p, i0 fixed

    if store:
        out_i = np.empty_like(phase)
        out_v = np.empty_like(phase)
        out_i[0], out_v[0] = i, v_p

    # Per-step coefficients for the whole pass at once (fewer, larger array operations).
    emf = vpk * sin
    # Capacitor: theta-method, theta = max(1/2, 1 - tau/h). It is the trapezoidal rule wherever
    # the step resolves the fastest capacitor time constant tau (h <= 2 tau); on coarser steps the
    # weight moves towards backward Euler so that the fast mode is damped in one step instead of
    # ringing (the trapezoidal rule maps a mode with h >> tau to about minus itself).
    theta = np.maximum(0.5, 1.0 - fast_time_constant(p, load, dt) / dt)
    b_all = dt * theta / c  # weight of the new capacitor current
    bh_all = dt * (1.0 - theta) / c  # weight of the old one
    z_all = b_all + esr
    any_l = bool(has_l.any())
    r2_all = p.r_lin
    if any_l:
        kl_all = 2.0 * ind / dt
        r2_all = p.r_lin + kl_all
    linear = not load.breaks
    if linear:
        g0, g1 = load.select(None)
        d1_all = 1.0 / (1.0 + z_all * g1)
        d0_all = -z_all * g0 * d1_all
        rs_all = np.maximum(r2_all + d1_all * z_all, _R_MIN)
        lt_all = np.log(rs_all * (p.isat / p.mvt))
    else:
        pw = _Piecewise(p, load, z_all, r2_all)
    started = i > 0
    for k in range(nsteps):
        b = b_all[k]
        bh = bh_all[k]
        z = z_all[k]
        a = v_c + bh * i_c
        e_new = emf[k + 1]
        if sign is not None:
            sign = np.where(i > 0, sign, np.where(sin[k + 1] < 0, -1.0, 1.0))
            e_new = sign * e_new
        if any_l:
            kl = kl_all[k]
            ep = e_new + kl * i + v_l
        else:
            ep = e_new
        if linear:
            s = _solve_linear(
                p.isat, p.mvt, ep, a, z, d0_all[k], d1_all[k], g0, g1, rs_all[k], lt_all[k]
            )
        else:
            s = pw.solve(k, ep, a, z, r2_all[k] if any_l else r2_all)
        if any_l:
            on = s.i > 0
            v_l_new = np.where(on, kl * (s.i - i) - v_l, 0.0)
        vc_new = a + b * s.i_c
        if sensitivity:
            da = d_vc + bh * d_ic
            d_big_a = -s.d1 * da
            if any_l:
                d_big_a += kl * d_i + d_vl
            di_new = d_big_a * s.w / (s.r_star * (1.0 + s.w))
            dvp = s.d1 * (da + z * di_new)
            d_ic = di_new - s.g1 * dvp
            d_vc = da + b * d_ic
            if any_l:
                d_vl = np.where(on, kl * (di_new - d_i) - d_vl, 0.0)
            d_i = di_new
        if any_l:
            v_l = v_l_new
        i, i_c, v_c = s.i, s.i_c, vc_new
        if store:
            out_i[k + 1], out_v[k + 1] = i, s.v_p
        if stop_after_pulse:
            # Stop once every point has had its first pulse and the current is off again.
            started |= i > 0
            if k % 32 == 31 and (started & (i <= 0)).all():
                nsteps = k + 1
                break

    res = PassResult(v_c, d_vc, i_end=i, sign_end=sign)
    if store:
        res.i, res.v_p = out_i[: nsteps + 1], out_v[: nsteps + 1]
    return res


class _Piecewise:
    """solve_path over a whole pass with the per-step coefficients of every load segment (and
    the breakpoints' capacitor-branch voltages) computed once, as (steps, segments, points)
    arrays; each step then tests all breakpoints at once and gathers its segment's row."""

    def __init__(self, p: Params, load: Load, z_all: np.ndarray, r2_all):
        self.isat, self.mvt = p.isat, p.mvt
        g0 = np.stack(load.g0)  # (S, n)
        g1 = np.stack(load.g1)
        vb = np.stack(load.breaks)  # (B, n)
        z = z_all[:, None, :]  # (N, 1, n)
        r2 = np.asarray(r2_all)
        r2 = r2[:, None, :] if r2.ndim == 2 else r2
        d1 = 1.0 / (1.0 + z * g1)
        d0 = -z * g0 * d1
        rs = np.maximum(r2 + d1 * z, _R_MIN)
        lt = np.log(rs * self.isat / self.mvt)
        shape = d1.shape
        # (N, 6, S, n): one gather per step picks every coefficient of the active segment.
        self.coef = np.stack([d0, d1, rs, lt, np.broadcast_to(g0, shape),
                              np.broadcast_to(g1, shape)], axis=1)
        self.vb = vb
        self.yb = vb + z * (g0[:-1] + g1[:-1] * vb)  # (N, B, n)
        self.cols = np.arange(p.n)
        self.arg_min = -1.0 + 1e-15

    def solve(self, k: int, ep, a, z, r2) -> Solution:
        isat, mvt = self.isat, self.mvt
        ib = (self.yb[k] - a) / z
        fb = ep - r2 * ib - mvt * np.log1p(np.maximum(ib / isat, self.arg_min)) - self.vb
        seg = ((ib <= -isat) | (fb > 0)).sum(axis=0)
        d0, d1, r_star, lt, g0, g1 = self.coef[k][:, seg, self.cols]
        big_a = ep - d0 - d1 * a
        w = wright_omega((big_a + r_star * isat) / mvt + lt)
        i = (mvt / r_star) * w - isat
        v_p = d0 + d1 * (a + z * i)
        i_c = i - (g0 + g1 * v_p)
        return Solution(i, None, v_p, i_c, g1, d1, r_star, w)


def fast_time_constant(p: Params, load: Load, dt: np.ndarray) -> np.ndarray:
    """Shortest time constant of the capacitor over a step dt: through the load, or through a
    conducting path (whose inductance, seen over one step, acts as 2 L / dt).

    The path resistance uses the diode slope at a typical peak current (a few times the load
    current); only its order of magnitude matters.
    """
    g_load = np.maximum.reduce([np.asarray(g) for g in load.g1]) if len(load.g1) > 1 else load.g1[0]
    i_ref = np.maximum(5.0 * typical_current(p), 1e3 * p.isat)
    g_path = 1.0 / (p.r_lin + p.mvt / i_ref + 2.0 * p.l_s / dt)
    return p.c * (p.esr + 1.0 / (g_load + g_path))


def node_voltage(load: Load, y: np.ndarray, z) -> np.ndarray:
    """Invert y = v + z * i_load(v) (monotone, piecewise linear) for v."""
    if not load.breaks:
        g0, g1 = load.select(None)
        return (y - z * g0) / (1.0 + z * g1)
    k = 0
    for j, vb in enumerate(load.breaks):
        yb = vb + z * (load.g0[j] + load.g1[j] * vb)
        k = k + (y >= yb).astype(int)
    g0, g1 = load.select(k)
    return (y - z * g0) / (1.0 + z * g1)
