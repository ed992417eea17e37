"""Engine against an independent reference: the same circuit written out here as switched ODEs
and integrated with scipy.integrate.solve_ivp (Radau, rtol 1e-9), periodic state by shooting.

The reference is deliberately built another way than the engine:
- event-driven: an off mode (capacitor discharging into the load, diode current exactly zero) and
  an on mode per conducting path, switched by solve_ivp events (the engine instead keeps one
  smooth exponential law through zero current, which also carries the reverse saturation
  current, at most diode_is = 1 nA here);
- the diode current with l_s = 0 comes from scipy.special.wrightomega and the capacitor node from
  scipy.optimize.brentq (the engine has its own omega iteration and piecewise-linear algebra);
- the full mains period is integrated, both paths of a full-wave rectifier included (the engine
  uses half-period symmetry);
- the periodic state is found by a secant iteration on the period map (the engine uses Newton
  with its own sensitivity).
Integrals (RMS values) are integrated as extra ODE states.

Diode law: Shockley exponential i = Is (exp(v / (n Vt)) - 1), Vt = k T / q (Sedra & Smith,
Microelectronic Circuits, diode chapter; formula from memory), plus a series resistance.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import pytest
from scipy.integrate import solve_ivp
from scipy.optimize import brentq, minimize_scalar
from scipy.special import wrightomega

from docgen.engine import Circuit, simulate, switch_on

K_B = 1.380649e-23  # J/K, SI exact (from memory)
Q_E = 1.602176634e-19  # C, SI exact (from memory)
RTOL = 1e-9
# With leakage inductance the on mode ends when the path current falls to I_OFF: near zero current
# the diode law makes the ODE extremely stiff. The dropped tail carries about L I_OFF^2 / 2 of
# energy and L I_OFF / |v_L| ~ 1e-7 s of charge time, far below the compared figures.
I_OFF = 1e-4


@dataclass
class Ref:
    """One operating point, SI units, written independently of docgen.engine."""

    topology: str
    v_rms: float
    freq: float
    r_s: float
    l_s: float
    c: float
    esr: float
    load: str = "current"
    i_load: float = 0.0
    r_load: float = math.inf
    r_series: float = 0.0
    v_z0: float = 0.0
    r_z: float = 1.0
    i_out: float = 0.0
    diode_is: float = 1e-9
    diode_n: float = 1.8
    diode_rs: float = 0.05
    diode_t_c: float = 25.0

    def __post_init__(self):
        self.vpk = math.sqrt(2.0) * self.v_rms
        self.w = 2.0 * math.pi * self.freq
        self.period = 1.0 / self.freq
        self.nd = 2 if self.topology == "bridge" else 1  # diodes in series in a path
        self.vt = self.diode_n * K_B * (self.diode_t_c + 273.15) / Q_E
        self.rpath = self.r_s + self.nd * self.diode_rs
        # paths: (sign of the winding EMF that drives it)
        self.paths = (1.0,) if self.topology == "half-wave" else (1.0, -1.0)
        # LSODA is much faster on the resistive paths; Radau is robust with the inductor.
        self.method = "Radau" if self.l_s > 0 else "LSODA"

    # --- circuit pieces -------------------------------------------------------------------
    def emf(self, t, sign):
        return sign * self.vpk * math.sin(self.w * t)

    def zener_branch(self, v):
        """(current from the capacitor, node voltage, zener current, output current).

        Shunt regulator by cases: node held at 0 V when r_series cannot carry i_out (output
        current limited to v / r_series); zener off while the node is below v_z0; otherwise the
        node from Kirchhoff's current law with the zener as v_z0 in series with r_z.
        """
        r, i_out = self.r_series, self.i_out
        if v <= r * i_out:
            return v / r, 0.0, 0.0, v / r
        vn = v - r * i_out
        if vn <= self.v_z0:
            return i_out, vn, 0.0, i_out
        vn = (v / r - i_out + self.v_z0 / self.r_z) / (1.0 / r + 1.0 / self.r_z)
        return (v - vn) / r, vn, (vn - self.v_z0) / self.r_z, i_out

    def load_current(self, v):
        if self.load == "current":
            return self.i_load
        if self.load == "resistor":
            return v / self.r_load
        return self.zener_branch(v)[0]

    def node(self, v_cap, i_rect):
        """Terminal voltage v with v = v_cap + esr * (i_rect - load(v))."""
        if self.esr == 0.0:
            return v_cap

        def f(v):
            return v - v_cap - self.esr * (i_rect - self.load_current(v))

        lo, hi = v_cap - 1.0 - abs(self.esr * i_rect) * 2, v_cap + 1.0 + abs(self.esr * i_rect) * 2
        return brentq(f, lo, hi, xtol=1e-13, rtol=1e-15)

    def diode_path_current(self, e, v):
        """Current of a resistive path (l_s = 0) with EMF e into terminal voltage v.

        Solves e - v = rpath i + nd n Vt ln(1 + i/Is) via the Wright omega function.
        """
        a = self.nd * self.vt
        r = self.rpath
        x = (e - v + r * self.diode_is) / a + math.log(r * self.diode_is / a)
        w = float(np.real(wrightomega(x)))
        return a / r * w - self.diode_is

    def path_current_l0(self, t, v_cap, sign):
        """(current, terminal voltage) of path 'sign' when l_s = 0 (both from v_cap and t)."""
        e = self.emf(t, sign)
        if self.esr == 0.0:
            return self.diode_path_current(e, v_cap), v_cap

        def f(v):
            return v - v_cap - self.esr * (self.diode_path_current(e, v) - self.load_current(v))

        v = brentq(f, v_cap - 5.0 - e * 0, v_cap + 5.0 + abs(e), xtol=1e-13, rtol=1e-15)
        return self.diode_path_current(e, v), v

    def diode_drop(self, i):
        return self.nd * (self.vt * math.log1p(i / self.diode_is) + self.diode_rs * i)

    # --- one mode at a time ---------------------------------------------------------------
    def rhs(self, t, y, mode):
        """y = [v_cap, (i_l), q_i2, q_ic2, q_i]; mode = None (off) or path sign."""
        v_cap = y[0]
        if mode is None:
            i = 0.0
            v = self.node(v_cap, 0.0)
            di = []
        elif self.l_s > 0:
            i = max(y[1], 0.0)
            v = self.node(v_cap, i)
            di = [(self.emf(t, mode) - self.r_s * i - self.diode_drop(i) - v) / self.l_s]
        else:
            i, v = self.path_current_l0(t, v_cap, mode)
            di = []
        i_c = i - self.load_current(v)
        return [i_c / self.c, *di, i * i, i_c * i_c, i]

    def state_of(self, t, y, mode):
        """(path current, terminal voltage) from the state."""
        if mode is None:
            return 0.0, self.node(y[0], 0.0)
        if self.l_s > 0:
            return max(y[1], 0.0), self.node(y[0], max(y[1], 0.0))
        return self.path_current_l0(t, y[0], mode)

    def run_period(self, v0, dense=False):
        """Integrate one mains period from the EMF zero crossing, starting off."""
        t, y, mode = 0.0, [v0, 0.0, 0.0, 0.0], None
        segs = []
        while t < self.period * (1 - 1e-12):
            if mode is None:
                evs = []
                for s in self.paths:

                    def on(tt, yy, _mode, s=s):
                        return self.emf(tt, s) - self.node(yy[0], 0.0)

                    on.terminal, on.direction = True, 1.0
                    evs.append(on)
                yy0 = [y[0], y[-3], y[-2], y[-1]]
            else:
                if self.l_s > 0:

                    def off(tt, yy, _mode):
                        return yy[1] - I_OFF

                    yy0 = [y[0], 0.0, y[-3], y[-2], y[-1]]
                else:

                    def off(tt, yy, s):
                        return self.path_current_l0(tt, yy[0], s)[0]

                    yy0 = [y[0], y[-3], y[-2], y[-1]]
                off.terminal, off.direction = True, -1.0
                evs = [off]
            sol = solve_ivp(
                self.rhs,
                (t, self.period),
                yy0,
                method=self.method,
                args=(mode,),
                events=evs,
                rtol=RTOL,
                atol=1e-12,
                dense_output=dense,
                max_step=self.period / 400,
            )  # events are found between steps
            assert sol.status >= 0, sol.message
            segs.append((mode, sol))
            t, y = sol.t[-1], list(sol.y[:, -1])
            if sol.status == 1:  # an event fired: switch mode
                if mode is None:
                    fired = [k for k, te in enumerate(sol.t_events) if len(te)]
                    mode = self.paths[fired[0]]
                    if self.l_s > 0:
                        y = [y[0], 0.0, *y[1:]]
                else:
                    mode = None
                    if self.l_s > 0:
                        y = [y[0], *y[2:]]
                # step past the switching instant so the event does not fire again at once
        if mode is not None:
            raise AssertionError("reference: conduction continues through the period boundary")
        return y, segs

    def steady(self):
        """Periodic state by a secant iteration on P(v0) - v0."""
        guess = self.vpk - self.nd * 0.9
        v_a, v_b = guess, guess - 0.05 * self.vpk
        g_a = self.run_period(v_a)[0][0] - v_a
        for _ in range(30):
            g_b = self.run_period(v_b)[0][0] - v_b
            if abs(g_b) < 1e-10 * self.vpk:
                break
            v_a, v_b, g_a = v_b, v_b - g_b * (v_b - v_a) / (g_b - g_a), g_b
        else:
            raise AssertionError("reference shooting did not converge")
        return self.metrics(v_b)

    def metrics(self, v0):
        y, segs = self.run_period(v0, dense=True)
        q_i2, q_ic2, q_i = y[-3], y[-2], y[-1]
        tp = self.period
        v_all, pk = [], 0.0
        for mode, sol in segs:
            ts = np.linspace(sol.t[0], sol.t[-1], 1500)
            for tt in ts:
                i, v = self.state_of(tt, sol.sol(tt), mode)
                v_all.append(v)
            if mode is not None:
                cur = [self.state_of(tt, sol.sol(tt), mode)[0] for tt in ts]
                k = int(np.argmax(cur))
                lo, hi = ts[max(k - 1, 0)], ts[min(k + 1, len(ts) - 1)]

                def neg_current(tt, sol=sol, mode=mode):
                    return -self.state_of(tt, sol.sol(tt), mode)[0]

                best = minimize_scalar(
                    neg_current, bounds=(lo, hi), method="bounded", options={"xatol": 1e-12}
                )
                pk = max(pk, cur[k], -best.fun)
        n_paths = len(self.paths)
        i_d_rms = math.sqrt(q_i2 / n_paths / tp)  # each path carries one diode's current
        i_sec = math.sqrt(q_i2 / tp) if self.topology == "bridge" else i_d_rms
        return {
            "ripple_pp": max(v_all) - min(v_all),
            "v_c_mean": None,
            "i_d_peak": pk,
            "i_sec_rms": i_sec,
            "i_c_rms": math.sqrt(q_ic2 / tp),
            "i_d_avg": q_i / n_paths / tp,
        }


CASES = {
    # name: reference parameters (one per topology x leakage, small and large ripple, loads)
    "bridge_L0_small_ripple_current": dict(
        topology="bridge", v_rms=12.0, freq=50.0, r_s=0.3, l_s=0.0, c=10000e-6, esr=0.02, i_load=0.5
    ),
    "bridge_L1mH_resistor": dict(
        topology="bridge",
        v_rms=12.0,
        freq=50.0,
        r_s=0.5,
        l_s=1e-3,
        c=2200e-6,
        esr=0.05,
        load="resistor",
        r_load=15.0,
    ),
    "center_tap_L0_large_ripple": dict(
        topology="center-tap",
        v_rms=12.0,
        freq=60.0,
        r_s=0.4,
        l_s=0.0,
        c=1000e-6,
        esr=0.03,
        i_load=0.5,
    ),
    "center_tap_L_small_ripple": dict(
        topology="center-tap",
        v_rms=9.0,
        freq=50.0,
        r_s=0.2,
        l_s=0.5e-3,
        c=4700e-6,
        esr=0.02,
        i_load=0.3,
    ),
    "half_wave_L0_resistor": dict(
        topology="half-wave",
        v_rms=12.0,
        freq=50.0,
        r_s=1.0,
        l_s=0.0,
        c=2200e-6,
        esr=0.0,
        load="resistor",
        r_load=100.0,
    ),
    "half_wave_L_large_ripple": dict(
        topology="half-wave",
        v_rms=12.0,
        freq=50.0,
        r_s=0.5,
        l_s=2e-3,
        c=1000e-6,
        esr=0.05,
        i_load=0.2,
    ),
    "bridge_zener": dict(
        topology="bridge",
        v_rms=15.0,
        freq=50.0,
        r_s=0.8,
        l_s=0.3e-3,
        c=1000e-6,
        esr=0.1,
        load="zener",
        r_series=47.0,
        v_z0=12.0,
        r_z=2.0,
        i_out=0.05,
    ),
}

COMPARED = ("ripple_pp", "i_d_peak", "i_sec_rms", "i_c_rms")
TOL = 0.005  # 0.5 %, the engine's accuracy target


def _engine(params: dict):
    return simulate(Circuit(**params))


@pytest.mark.parametrize("name", sorted(CASES))
def test_engine_matches_solve_ivp(name):
    params = CASES[name]
    ref = Ref(**params).steady()
    got = _engine(params)
    assert got.converged[0]
    for key in COMPARED:
        assert got.point(0)[key] == pytest.approx(ref[key], rel=TOL), key
    # Charge balance is exact physics: mean diode current = load share (checked against the
    # reference's own integral, not only the engine's).
    assert got.i_d_avg[0] == pytest.approx(ref["i_d_avg"], rel=TOL)


def test_switch_on_matches_solve_ivp():
    """First pulse after closing at the crest, empty capacitor: peak and I^2 t (the whole
    switch-on transient is compared in test_switch_on.py)."""
    params = dict(
        topology="bridge",
        v_rms=12.0,
        freq=50.0,
        r_s=0.4,
        l_s=0.5e-3,
        c=4700e-6,
        esr=0.03,
        i_load=0.5,
    )
    ref = Ref(**params)
    t0 = 0.25 / ref.freq  # crest of the EMF

    def rhs(t, y):
        i = max(y[1], 0.0)
        v = ref.node(y[0], i)
        di = (ref.emf(t, 1.0) - ref.r_s * i - ref.diode_drop(i) - v) / ref.l_s
        return [(i - ref.load_current(v)) / ref.c, di, i * i]

    def ended(t, y):
        return y[1]

    ended.terminal, ended.direction = True, -1.0
    sol = solve_ivp(
        rhs,
        (t0, t0 + 2 * ref.period),
        [0.0, 0.0, 0.0],
        method="Radau",
        rtol=RTOL,
        atol=1e-12,
        events=ended,
        dense_output=True,
        first_step=1e-8,
    )
    assert sol.status == 1
    ts = np.linspace(sol.t[0], sol.t[-1], 20001)
    peak = sol.sol(ts)[1].max()
    got = switch_on(Circuit(**params))
    assert got.converged[0]
    assert got.first_peak[0] == pytest.approx(peak, rel=TOL)
    assert got.first_i2t[0] == pytest.approx(sol.y[2, -1], rel=TOL)
