"""The time stepper of ``stepper.integrate`` for a few operating points, one point at a time.

With a handful of points (one point in a benchmark, the two points of a switch-on run, a few
corners) numpy's fixed cost per array operation is most of the cost of a step, so each point is
stepped here with plain floats instead. The arithmetic is that of ``stepper.integrate`` and
``stepper.solve_path`` step for step (results agree to rounding); the per-step coefficients of
every load segment are computed once per pass, as whole arrays, before the loop.
"""

from __future__ import annotations

import math

import numpy as np

from .circuit import Params
from .loads import Load
from .omega import _omega_scalar

_R_MIN = 1e-12  # ohm; as stepper._R_MIN
_ARG_MIN = -1.0 + 1e-15


def integrate_points(p: Params, load: Load, phase: np.ndarray, v_c0, i0, theta: np.ndarray,
                     store: bool, sensitivity: bool, sign0) -> tuple:
    """Every point of ``p`` stepped on its own; returns the fields of a PassResult.

    ``theta`` is the capacitor's theta-method weight per step and point (N, n), as computed by
    ``stepper.integrate``.
    """
    n = p.n
    nsteps = phase.shape[0] - 1
    v_end = np.empty(n)
    slope = np.empty(n)
    i_end = np.empty(n)
    sign_end = None if sign0 is None else np.empty(n)
    out_i = np.empty_like(phase) if store else None
    out_v = np.empty_like(phase) if store else None
    v_c0 = np.broadcast_to(np.asarray(v_c0, dtype=float), (n,))
    i0 = np.broadcast_to(np.asarray(i0, dtype=float), (n,))
    s0 = None if sign0 is None else np.broadcast_to(np.asarray(sign0, dtype=float), (n,))
    dt = np.diff(phase, axis=0) / p.omega
    b_all = dt * theta / p.c
    bh_all = dt * (1.0 - theta) / p.c
    z_all = b_all + p.esr
    r2_all = p.r_lin + 2.0 * p.l_s / dt
    emf = p.vpk * np.sin(phase)
    sin = np.sin(phase)
    for j in range(n):
        r = _one(p, load, j, float(v_c0[j]), float(i0[j]),
                 None if s0 is None else float(s0[j]), sin[:, j], emf[:, j], b_all[:, j],
                 bh_all[:, j], z_all[:, j], r2_all[:, j], 2.0 * p.l_s[j] / dt[:, j],
                 nsteps, store, sensitivity)
        v_end[j], slope[j], i_end[j], sgn, wi, wv = r
        if sign_end is not None:
            sign_end[j] = sgn
        if store:
            out_i[:, j] = wi
            out_v[:, j] = wv
    return v_end, slope, out_i, out_v, i_end, sign_end


def _segments(load: Load, j: int, z: np.ndarray, r2: np.ndarray, isat: float, mvt: float):
    """Per step and segment: d0, d1, r_star, log term, as lists of lists; breaks' y values."""
    segs = []
    for g0, g1 in zip(load.g0, load.g1, strict=True):
        g0j, g1j = float(g0[j]), float(g1[j])
        d1 = 1.0 / (1.0 + z * g1j)
        d0 = -z * g0j * d1
        rs = np.maximum(r2 + d1 * z, _R_MIN)
        lt = np.log(rs * isat / mvt)
        segs.append((g0j, g1j, d0.tolist(), d1.tolist(), rs.tolist(), lt.tolist()))
    ybs = []
    for b, g0, g1 in zip(load.breaks, load.g0, load.g1, strict=False):
        vb = float(b[j])
        ybs.append((vb, (vb + z * (float(g0[j]) + float(g1[j]) * vb)).tolist()))
    return segs, ybs


def _first(p: Params, load: Load, j: int, ep: float, a: float, z: float, r2: float):
    """solve_path at the start of a pass (capacitor branch without history), one point."""
    isat, mvt = float(p.isat[j]), float(p.mvt[j])
    k = 0
    for vb_arr, g0, g1 in zip(load.breaks, load.g0, load.g1, strict=False):
        vb = float(vb_arr[j])
        if z > 0:
            yb = vb + z * (float(g0[j]) + float(g1[j]) * vb)
            ib = (yb - a) / z
            fb = ep - r2 * ib - mvt * math.log1p(max(ib / isat, _ARG_MIN)) - vb
            k += (ib <= -isat) or (fb > 0)
        else:
            k += a >= vb
    g0, g1 = float(load.g0[k][j]), float(load.g1[k][j])
    d1 = 1.0 / (1.0 + z * g1)
    d0 = -z * g0 * d1
    big_a = ep - d0 - d1 * a
    r_star = max(r2 + d1 * z, _R_MIN)
    w = _omega_scalar((big_a + r_star * isat) / mvt + math.log(r_star * isat / mvt))
    i = (mvt / r_star) * w - isat
    v_p = d0 + d1 * (a + z * i)
    return i, big_a - r_star * i, v_p, g1, d1, r_star, w


def _segment_of(load: Load, j: int, v: float) -> int:
    return sum(1 for b in load.breaks if v >= float(b[j]))


def _one(p, load, j, v_c0, i0, sign, sin, emf, b_all, bh_all, z_all, r2_all, kl_all, nsteps,
         store, sensitivity):
    isat, mvt = float(p.isat[j]), float(p.mvt[j])
    r_lin, esr = float(p.r_lin[j]), float(p.esr[j])
    has_l = float(p.l_s[j]) > 0
    g0s = [float(g[j]) for g in load.g0]
    g1s = [float(g[j]) for g in load.g1]

    # Consistent start, as in stepper.integrate.
    e0 = float(emf[0]) * (1.0 if sign is None else sign)
    if has_l:
        y_l = v_c0 + esr * i0
        kk = 0
        for jb, b in enumerate(load.breaks):
            vb = float(b[j])
            kk += y_l >= vb + esr * (g0s[jb] + g1s[jb] * vb)
        v_node = (y_l - esr * g0s[kk]) / (1.0 + esr * g1s[kk])
        ks = _segment_of(load, j, v_node)
        g0l, g1l = g0s[ks], g1s[ks]
        d1_0 = 1.0 / (1.0 + esr * g1l)
        v_p = (y_l - esr * g0l) * d1_0
        i = i0
        junction = mvt * math.log1p(max(i0, 0.0) / isat) if i0 > 0 else 0.0
        g1_0 = g1l
        d_i = 0.0
    else:
        i, junction, v_p, g1_0, d1_0, r_star, w = _first(p, load, j, e0, v_c0, esr, r_lin)
        d_i = -d1_0 / (r_star * (1.0 + 1.0 / w))
    kv = _segment_of(load, j, v_p)
    i_c = i - (g0s[kv] + g1s[kv] * v_p)
    v_l = e0 - r_lin * i - junction - v_p if (has_l and i > 0) else 0.0
    v_c = v_c0
    d_vc = 1.0
    d_vp = d1_0 * (1.0 + esr * d_i)
    d_ic = d_i - g1_0 * d_vp
    d_vl = -d_vp if (has_l and i > 0) else 0.0

    r2l = r2_all.tolist() if has_l else None
    segs, ybs = _segments(load, j, z_all, r2_all if has_l else r_lin + 0.0 * z_all, isat, mvt)
    b_l, bh_l, z_l = b_all.tolist(), bh_all.tolist(), z_all.tolist()
    kl_l = kl_all.tolist() if has_l else None
    emf_l = emf.tolist()
    sin_l = sin.tolist() if sign is not None else None
    single = len(segs) == 1
    if single:
        g0, g1, d0_l, d1_l, rs_l, lt_l = segs[0]
    wi = [i] if store else None
    wv = [v_p] if store else None
    m_isat = -isat
    log1p, log = math.log1p, math.log
    for k in range(nsteps):
        b = b_l[k]
        bh = bh_l[k]
        z = z_l[k]
        a = v_c + bh * i_c
        e_new = emf_l[k + 1]
        if sign is not None:
            if not i > 0:
                sign = -1.0 if sin_l[k + 1] < 0 else 1.0
            e_new = sign * e_new
        if has_l:
            kl = kl_l[k]
            ep = e_new + kl * i + v_l
        else:
            ep = e_new
        if single:
            d0, d1, rs, lt = d0_l[k], d1_l[k], rs_l[k], lt_l[k]
        else:
            r2 = r2l[k] if has_l else r_lin
            seg = 0
            for vb, yb_l in ybs:
                ib = (yb_l[k] - a) / z
                if ib <= m_isat:
                    seg += 1
                    continue
                arg = ib / isat
                if ep - r2 * ib - mvt * log1p(arg if arg > _ARG_MIN else _ARG_MIN) - vb > 0:
                    seg += 1
            g0, g1, d0_s, d1_s, rs_s, lt_s = segs[seg]
            d0, d1, rs, lt = d0_s[k], d1_s[k], rs_s[k], lt_s[k]
        big_a = ep - d0 - d1 * a
        # Wright omega (the corrections of omega._omega_scalar, inlined)
        x = (big_a + rs * isat) / mvt + lt
        if x < -700.0:
            x = -700.0
        if x < -1.0:
            w = math.exp(x - math.exp(x))
        elif x < 4.0:
            dx = x - 1.0
            w = 1.0 + dx * (0.5 + dx * (1.0 / 16.0 - dx / 192.0))
        else:
            lnx = log(x)
            w = x - lnx + lnx / x
        for _ in range(2):
            zz = x - w - log(w)
            q = 2.0 * (1.0 + w) * (1.0 + w + (2.0 / 3.0) * zz)
            w = w * (1.0 + zz / (1.0 + w) * (q - zz) / (q - 2.0 * zz))
        s_i = (mvt / rs) * w - isat
        s_vp = d0 + d1 * (a + z * s_i)
        s_ic = s_i - (g0 + g1 * s_vp)
        if has_l:
            on = s_i > 0
            v_l_new = kl * (s_i - i) - v_l if on else 0.0
        vc_new = a + b * s_ic
        if sensitivity:
            da = d_vc + bh * d_ic
            d_big_a = -d1 * da
            if has_l:
                d_big_a += kl * d_i + d_vl
            di_new = d_big_a * w / (rs * (1.0 + w))
            dvp = d1 * (da + z * di_new)
            d_ic = di_new - g1 * dvp
            d_vc = da + b * d_ic
            if has_l:
                d_vl = kl * (di_new - d_i) - d_vl if on else 0.0
            d_i = di_new
        if has_l:
            v_l = v_l_new
        i, i_c, v_c = s_i, s_ic, vc_new
        if store:
            wi.append(s_i)
            wv.append(s_vp)
    return v_c, d_vc, i, sign, wi, wv
