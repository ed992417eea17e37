"""An independent integrator of the rectifier circuit model, for checking the project's figures.

Written for the tests only and deliberately unlike docgen.engine (which steps a trapezoidal /
theta rule on a per-point phase grid, solves each step with the Wright omega function, uses
half-period symmetry and shoots with Newton on a differentiated period map):

- event-driven: an *off* mode (diode current exactly zero, the capacitor discharging into the
  load) integrated with scipy's DOP853, and an *on* mode per conducting path (inductor current
  and capacitor voltage) integrated with scipy's LSODA (stiff BDF where the diode's small-current
  resistance makes the path stiff, Adams elsewhere) with an analytic Jacobian, switched by solve_ivp
  events: on when the path's EMF reaches the capacitor terminal voltage, off when the path
  current falls to I_OFF;
- the whole mains period is integrated, both paths of a full-wave rectifier included;
- the capacitor terminal voltage is solved case by case in closed form for each load law;
- the periodic state is found by a secant iteration on the period map, with brentq as the
  fall-back;
- averages and RMS values are integrated from the dense output with Simpson's rule, extremes
  found by sampling and scipy's bounded scalar minimiser;
- the switch-on transient (closing at the crest, capacitor empty) is integrated the same
  event-driven way over as many pulse periods as the documented stop rule takes (see
  Point.switch_on), I^2 t as an extra state.

The circuit model is the one the project documents for its engine (docs/references.md
[SCHADE-1943] for why a numerical solution is needed): the transformer as an EMF
sqrt(2) V_rms sin(wt) behind its winding resistance r_s and leakage inductance l_s; each
conducting path has m diodes in series (bridge 2, center tap and half-wave 1), each a Shockley
exponential i = Is (exp(v / (n Vt)) - 1) ([SEDRA-SMITH], diode chapter; Vt = kT/q with the SI
constants [CODATA-SI]) plus a series resistance; the capacitor has an ESR; loads:
- current: a constant current;
- regulator: a constant current above a knee voltage, falling in proportion to the voltage
  below it (a series regulator in dropout);
- zener: a series resistor to a node held by a zener (off below v_z0, v_z0 + r_z i_z above)
  and a constant output current (limited to what the resistor passes with the node at 0 V).

All quantities SI.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.integrate import simpson, solve_ivp
from scipy.optimize import brentq, minimize_scalar

K_B = 1.380649e-23  # J/K, exact SI value [CODATA-SI]
Q_E = 1.602176634e-19  # C, exact SI value [CODATA-SI]
# The on mode ends when the path current has fallen to I_OFF (near zero current the diode law
# makes the path extremely stiff). The dropped tail carries a charge of order I_OFF l_s / (m n Vt),
# below 1e-9 C for the circuits here: far below anything compared.
I_OFF = 1e-6
RTOL = 1e-10  # off mode (DOP853) and switch-on
ON_RTOL = 1e-9  # on mode
ON_CALLS = 20000  # right-hand-side calls after which LSODA counts as stalled


class _Stalled(Exception):
    pass

SAMPLES = 1500  # dense-output samples per segment for averages and extremes


@dataclass
class Point:
    """One operating point of the circuit model (SI)."""

    topology: str  # "bridge" | "center-tap" | "half-wave"
    v_rms: float  # open-circuit EMF of a conducting winding (center tap: each half)
    freq: float
    r_s: float
    l_s: float
    c: float
    esr: float
    load: str = "current"  # "current" | "regulator" | "zener"
    i_load: float = 0.0  # current: the sink; regulator: load current (bias added below)
    i_q: float = 0.0  # regulator: bias current
    knee: float = 0.0  # regulator: dropout knee voltage
    r_series: float = 0.0  # zener: series resistor
    v_z0: float = 0.0  # zener: knee voltage
    r_z: float = 1.0  # zener: dynamic resistance
    i_out: float = 0.0  # zener: output current
    diode_is: float = 1e-9
    diode_n: float = 1.8
    diode_rs: float = 0.05
    diode_t_c: float = 25.0

    def __post_init__(self):
        if self.l_s <= 0:
            raise ValueError("this reference covers circuits with leakage inductance")
        self.vpk = math.sqrt(2.0) * self.v_rms
        self.w = 2.0 * math.pi * self.freq
        self.period = 1.0 / self.freq
        self.m = 2 if self.topology == "bridge" else 1
        self.full_wave = self.topology != "half-wave"
        self.slope = self.m * self.diode_n * K_B * (self.diode_t_c + 273.15) / Q_E
        self.r_path = self.r_s + self.m * self.diode_rs

    # ------------------------------------------------------------------ circuit pieces
    def emf(self, t: float, sign: float) -> float:
        return sign * self.vpk * math.sin(self.w * t)

    def load_current(self, v: float) -> float:
        if self.load == "current":
            return self.i_load
        if self.load == "regulator":
            i_tot = self.i_load + self.i_q
            return i_tot if v >= self.knee else i_tot * v / self.knee
        return self.zener(v)[3]

    def zener(self, v: float) -> tuple[float, float, float, float]:
        """(node voltage, zener current, output current, resistor current) at input voltage v."""
        r, i_o = self.r_series, self.i_out
        if v <= r * i_o:  # the resistor cannot carry the output current: node at 0 V
            return 0.0, 0.0, v / r, v / r
        if v - r * i_o <= self.v_z0:  # zener off
            return v - r * i_o, 0.0, i_o, i_o
        i_z = (v - r * i_o - self.v_z0) / (r + self.r_z)
        return self.v_z0 + self.r_z * i_z, i_z, i_o, i_o + i_z

    def node(self, v_c: float, i: float) -> float:
        """Capacitor terminal voltage v with v = v_c + esr (i - load(v)), case by case."""
        e = self.esr
        if self.load == "current":
            return v_c + e * (i - self.i_load)
        if self.load == "regulator":
            i_tot = self.i_load + self.i_q
            v = v_c + e * (i - i_tot)
            if v >= self.knee:
                return v
            return (v_c + e * i) / (1.0 + e * i_tot / self.knee)
        r, i_o, rz = self.r_series, self.i_out, self.r_z
        # zener on: load(v) = i_o + (v - r i_o - v_z0) / (r + r_z)
        v = (v_c + e * (i - i_o + (r * i_o + self.v_z0) / (r + rz))) / (1.0 + e / (r + rz))
        if v - r * i_o > self.v_z0:
            return v
        v = v_c + e * (i - i_o)  # zener off, output current flowing
        if v > r * i_o:
            return v
        return (v_c + e * i) / (1.0 + e / r)  # node at 0 V

    def junction(self, i: float) -> float:
        return self.slope * math.log1p(i / self.diode_is)

    # ------------------------------------------------------------------ the two modes
    def _off_rhs(self, t, y):
        return [-self.load_current(self.node(y[0], 0.0)) / self.c]

    def _on_rhs(self, t, y, sign):
        i = max(y[1], 0.0)
        v = self.node(y[0], i)
        di = (self.emf(t, sign) - self.r_path * i - self.junction(i) - v) / self.l_s
        return [(i - self.load_current(v)) / self.c, di]

    def _on_jac(self, t, y, sign):
        i = max(y[1], 0.0)
        v = self.node(y[0], i)
        # local load conductance by a small difference of the (piecewise-linear) law
        h = 1e-7 * max(1.0, abs(v))
        g = (self.load_current(v + h) - self.load_current(v - h)) / (2 * h)
        dv_dvc = 1.0 / (1.0 + self.esr * g)
        dv_di = self.esr * dv_dvc
        return [[-g * dv_dvc / self.c, (1.0 - g * dv_di) / self.c],
                [-dv_dvc / self.l_s,
                 -(self.r_path + self.slope / (i + self.diode_is) + dv_di) / self.l_s]]

    def _on_solve(self, span, v_c, sign, event, dense):
        """On mode: LSODA, falling back to Radau if LSODA stalls (it can, near the stiff end of
        a pulse, at tight tolerances)."""
        calls = [0]

        def rhs(t, y, s):
            calls[0] += 1
            if calls[0] > ON_CALLS:
                raise _Stalled
            return self._on_rhs(t, y, s)

        kw = dict(rtol=ON_RTOL, atol=[1e-12, 1e-12], args=(sign,), jac=self._on_jac,
                  events=event, dense_output=dense, first_step=self.period * 1e-7)
        try:
            return solve_ivp(rhs, span, [v_c, 0.0], method="LSODA", **kw)
        except _Stalled:
            return solve_ivp(self._on_rhs, span, [v_c, 0.0], method="Radau", **kw)

    def run_period(self, v0: float, dense: bool = False):
        """One mains period from the EMF zero crossing, starting off. Returns (v_c end, segments);
        a segment is (mode, sign, solve_ivp solution); mode "off" or "on"."""
        t_p = self.period
        halves = ([(0.0, t_p / 2, 1.0), (t_p / 2, t_p, -1.0)] if self.full_wave
                  else [(0.0, t_p, 1.0)])
        v_c = v0
        segs = []
        for a, b, sign in halves:
            t = a
            while t < b * (1 - 1e-13):

                def turn_on(tt, yy, sign=sign):
                    return self.emf(tt, sign) - self.node(yy[0], 0.0)

                turn_on.terminal, turn_on.direction = True, 1.0
                off = solve_ivp(self._off_rhs, (t, b), [v_c], method="DOP853", rtol=RTOL,
                                atol=1e-12, events=turn_on, dense_output=dense,
                                max_step=t_p / 64)
                if off.status < 0:
                    raise RuntimeError(off.message)
                segs.append(("off", sign, off))
                t, v_c = float(off.t[-1]), float(off.y[0, -1])
                if off.status != 1:
                    break

                def turn_off(tt, yy, sign):
                    return yy[1] - I_OFF

                turn_off.terminal, turn_off.direction = True, -1.0
                on = self._on_solve((t, b), v_c, sign, turn_off, dense)
                if on.status < 0:
                    raise RuntimeError(on.message)
                segs.append(("on", sign, on))
                t, v_c = float(on.t[-1]), float(on.y[0, -1])
                if on.status != 1:
                    raise RuntimeError("current still flowing at the EMF zero crossing "
                                       "(continuous conduction): outside the model")
        return v_c, segs

    # ------------------------------------------------------------------ steady state
    def steady_state(self) -> float:
        """Capacitor voltage at the EMF zero crossing in the periodic steady state."""
        tol = 1e-11 * self.vpk

        def g(v):
            return self.run_period(v)[0] - v

        # Start: peak less about 1 V per diode, less the droop of a quarter period.
        i_guess = self.load_current(0.8 * self.vpk)
        v_a = max(0.3 * self.vpk, self.vpk - self.m * 1.0 - i_guess * self.period / 4 / self.c)
        v_b = v_a - 0.01 * self.vpk
        g_a, g_b = g(v_a), g(v_b)
        for _ in range(40):
            if abs(g_b) < tol:
                return v_b
            if g_b == g_a:
                break
            v_a, v_b, g_a = v_b, v_b - g_b * (v_b - v_a) / (g_b - g_a), g_b
            if not 0.0 < v_b < self.vpk:
                break
            g_b = g(v_b)
        return brentq(g, 1e-3 * self.vpk, self.vpk, xtol=tol, rtol=1e-14)

    def figures(self) -> dict[str, float]:
        """Steady-state figures with the same meaning as the project's (see module notes)."""
        v0 = self.steady_state()
        _, segs = self.run_period(v0, dense=True)
        t_p = self.period
        s_i = {1.0: 0.0, -1.0: 0.0}
        s_i2 = {1.0: 0.0, -1.0: 0.0}
        s_ic2 = s_vp = s_pin = s_vn = s_pz = s_pr = s_po = s_vr2 = 0.0
        vp_all, vn_all, iz_all = [], [], []
        i_peak = 0.0
        for mode, sign, sol in segs:
            if sol.t[-1] <= sol.t[0]:
                continue
            ts = np.linspace(sol.t[0], sol.t[-1], SAMPLES)
            ys = sol.sol(ts)
            i = np.maximum(ys[1], 0.0) if mode == "on" else np.zeros_like(ts)
            vp = np.array([self.node(vc, ii) for vc, ii in zip(ys[0], i, strict=True)])
            il = np.array([self.load_current(v) for v in vp])
            ic = i - il
            e = sign * self.vpk * np.sin(self.w * ts)
            s_i[sign] += simpson(i, x=ts)
            s_i2[sign] += simpson(i * i, x=ts)
            s_ic2 += simpson(ic * ic, x=ts)
            s_vp += simpson(vp, x=ts)
            s_vr2 += simpson(vp * vp, x=ts)
            s_pin += simpson(e * i, x=ts)
            vp_all.append(vp)
            if self.load == "zener":
                z = np.array([self.zener(v) for v in vp])
                vn, iz, io, ir = z.T
                s_vn += simpson(vn, x=ts)
                s_pz += simpson(vn * iz, x=ts)
                s_pr += simpson(self.r_series * ir * ir, x=ts)
                s_po += simpson(vn * io, x=ts)
                vn_all.append(vn)
                iz_all.append(iz)
            if mode == "on":
                k = int(np.argmax(i))
                lo, hi = ts[max(k - 1, 0)], ts[min(k + 1, len(ts) - 1)]
                best = minimize_scalar(lambda tt, sol=sol: -sol.sol(tt)[1], bounds=(lo, hi),
                                       method="bounded", options={"xatol": 1e-13})
                i_peak = max(i_peak, float(i[k]), -float(best.fun))
        vp_all = np.concatenate(vp_all)
        paths = 2 if self.full_wave else 1
        i_tot, i2_tot = s_i[1.0] + s_i[-1.0], s_i2[1.0] + s_i2[-1.0]
        out = {
            "v_c_max": float(vp_all.max()),
            "v_c_min": float(vp_all.min()),
            "v_c_mean": s_vp / t_p,
            "v_c_rms_dev": math.sqrt(max(s_vr2 / t_p - (s_vp / t_p) ** 2, 0.0)),
            "i_d_peak": i_peak,
            "i_d_avg": i_tot / paths / t_p,
            "i_d_rms": math.sqrt(i2_tot / paths / t_p),
            "i_dc": i_tot / t_p,
            "i_c_rms": math.sqrt(s_ic2 / t_p),
            "p_in": s_pin / t_p,
        }
        out["ripple_pp"] = out["v_c_max"] - out["v_c_min"]
        if self.topology == "bridge":
            # the winding carries both paths' pulses, one in each direction [DERIVED-RMS]
            out["i_sec_rms"] = math.sqrt(i2_tot / t_p)
            out["va_sec"] = self.v_rms * out["i_sec_rms"]
        elif self.topology == "center-tap":
            # each half winding carries one path's pulses [DERIVED-RMS]
            out["i_sec_rms"] = math.sqrt(s_i2[1.0] / t_p)
            out["va_sec"] = 2 * self.v_rms * out["i_sec_rms"]
        else:
            out["i_sec_rms"] = math.sqrt(i2_tot / t_p)
            out["va_sec"] = self.v_rms * out["i_sec_rms"]
        if self.load == "zener":
            vn_all, iz_all = np.concatenate(vn_all), np.concatenate(iz_all)
            out.update(v_out_max=float(vn_all.max()), v_out_min=float(vn_all.min()),
                       v_out_mean=s_vn / t_p, i_z_min=float(iz_all.min()),
                       i_z_max=float(iz_all.max()), p_zener=s_pz / t_p, p_r_series=s_pr / t_p,
                       p_out=s_po / t_p)
            out["v_out_pp"] = out["v_out_max"] - out["v_out_min"]
        return out

    def switch_on(self, settle_peak: float | None = None, max_cycles: float = 10.0,
                  settle_ratio: float = 1.1, settle_i2t: float = 1e-4) -> dict[str, float]:
        """The switch-on transient: closing at the EMF crest with the capacitor empty, integrated
        pulse period by pulse period until the capacitor is charged, by the stop rule the project
        documents for its switch-on (docgen/engine/inrush.py module notes): a pulse period after
        the first counts as settled when its peak stays below ``settle_ratio`` x the steady-state
        repetitive peak ``settle_peak`` (here the independent steady state's) or it adds less
        than ``settle_i2t`` of the I^2 t so far, with no current flowing at its end; at most
        ``max_cycles`` mains periods. Pulse periods: the first from the crest to the next EMF
        zero crossing (half-wave: the negative crest), then half periods (half-wave: periods).

        Event-driven as ``run_period``: an off mode and an on mode per conducting path (the
        path's EMF sign s sin(wt) holds across window ends, so a pulse still flowing at a
        window's end continues into the next); I^2 t is an extra state. For a center tap the
        other half winding is assumed not to join in while one conducts.

        Returns the largest pulse peak and the I^2 t of the whole transient, the first pulse's
        peak and I^2 t, the windows integrated and whether the stop rule was met."""
        t_p = self.period
        t0 = t_p / 4
        first_end = t_p / 2 if self.full_wave else 0.75 * t_p
        half = t_p / 2 if self.full_wave else t_p
        n_win = 1 + max(0, math.ceil((max_cycles * t_p - (first_end - t0)) / half - 1e-9))
        signs = (1.0, -1.0) if self.full_wave else (1.0,)

        def rhs(t, y, sign):
            i = max(y[1], 0.0)
            v = self.node(y[0], i)
            di = (self.emf(t, sign) - self.r_path * i - self.junction(i) - v) / self.l_s
            return [(i - self.load_current(v)) / self.c, di, i * i]

        def jac(t, y, sign):
            j = self._on_jac(t, y[:2], sign)
            return [[*j[0], 0.0], [*j[1], 0.0], [0.0, 2.0 * max(y[1], 0.0), 0.0]]

        def turn_off(t, y, sign):
            return y[1] - I_OFF

        turn_off.terminal, turn_off.direction = True, -1.0
        # path: sign of the conducting path, None when off; at the crest the empty capacitor
        # puts the first path into conduction at once
        v_c, i_on, path = 0.0, 0.0, 1.0
        total = peak = first_peak = first_i2t = 0.0
        first_open, started, settled = True, False, False
        windows = 0
        t = t0
        for w in range(n_win):
            a, b = (t0, first_end) if w == 0 else (first_end + (w - 1) * half,
                                                 first_end + w * half)
            w_i2t = w_pk = 0.0
            t = a
            while t < b * (1 - 1e-13):
                if path is None:
                    evs = []
                    for s in signs:
                        def on(tt, yy, s=s):
                            return self.emf(tt, s) - self.node(yy[0], 0.0)

                        on.terminal, on.direction = True, 1.0
                        evs.append(on)
                    off = solve_ivp(self._off_rhs, (t, b), [v_c], method="DOP853", rtol=RTOL,
                                    atol=1e-12, events=evs, max_step=t_p / 64)
                    if off.status < 0:
                        raise RuntimeError(off.message)
                    t, v_c = float(off.t[-1]), float(off.y[0, -1])
                    if off.status != 1:
                        break
                    path = signs[next(k for k, te in enumerate(off.t_events) if len(te))]
                    i_on = 0.0
                    continue
                sol = self._switch_on_pulse(rhs, jac, (t, b), [v_c, i_on, 0.0], path,
                                            turn_off, first_step=t_p * (1e-9 if w == 0
                                                                        else 1e-7))
                if sol.status < 0:
                    raise RuntimeError(sol.message)
                ts = np.linspace(sol.t[0], sol.t[-1], 4 * SAMPLES)
                cur = sol.sol(ts)[1]
                k = int(np.argmax(cur))
                best = minimize_scalar(lambda tt, sol=sol: -sol.sol(tt)[1],
                                       bounds=(ts[max(k - 1, 0)], ts[min(k + 1, len(ts) - 1)]),
                                       method="bounded", options={"xatol": 1e-14})
                pk = max(float(cur[k]), -float(best.fun))
                seg_i2t = float(sol.y[2, -1])
                w_pk, w_i2t = max(w_pk, pk), w_i2t + seg_i2t
                if first_open:
                    first_peak, first_i2t = max(first_peak, pk), first_i2t + seg_i2t
                started = True
                t, v_c, i_on = float(sol.t[-1]), float(sol.y[0, -1]), float(sol.y[1, -1])
                if sol.status == 1:  # the pulse has ended
                    path = None
                    first_open = False
            total += w_i2t
            peak = max(peak, w_pk)
            windows += 1
            if w > 0 and path is None:
                quiet = w_i2t < settle_i2t * total
                if settle_peak is not None:
                    quiet = quiet or w_pk < settle_ratio * settle_peak
                if quiet:
                    settled = True
                    break
        if not started:
            raise RuntimeError("no charging pulse")
        return {"i_peak": peak, "i2t": total, "first_peak": first_peak, "first_i2t": first_i2t,
                "windows": windows, "settled": settled}

    def _switch_on_pulse(self, rhs, jac, span, y0, sign, event, first_step):
        """One on-mode stretch of the switch-on: LSODA, Radau when LSODA stalls (as _on_solve)."""
        calls = [0]

        def counted(t, y, s):
            calls[0] += 1
            if calls[0] > ON_CALLS:
                raise _Stalled
            return rhs(t, y, s)

        kw = dict(args=(sign,), jac=jac, rtol=ON_RTOL, atol=1e-12, events=event,
                  dense_output=True, first_step=first_step)
        try:
            return solve_ivp(counted, span, y0, method="LSODA", **kw)
        except _Stalled:
            return solve_ivp(rhs, span, y0, method="Radau", **kw)
