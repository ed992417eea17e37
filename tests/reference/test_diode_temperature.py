"""The engine diode's temperature law against the textbook figure.

[SEDRA-SMITH] (forward-bias region of the junction diode, temperature dependence; 5th ed.
section 3.2, from memory): at a constant current the forward drop of a silicon diode falls by
about 2 mV for every 1 degC rise. [SZE-NG] (3rd ed., section 2.3, from memory) gives the same
from Is ~ T^3 exp(-Eg / kT). Checked here on a silicon junction carrying the textbook's typical
0.6-0.7 V, with the band of 1.5 to 2.5 mV/K (the textbook's "about 2 mV").

The derivative is also derived in this file from the law (dV/dT at constant current =
(V - Eg/q - XTI kT/q) / T for V = n (kT/q) ln(I / Is(T)); our algebra, [DERIVED-DIODE]) and compared
with a finite difference of the production model.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from docgen.engine import Circuit, simulate
from docgen.stages.diodes import TYPES, Fit, fit, forward_voltage

K_OVER_Q = 1.380649e-23 / 1.602176634e-19  # V/K, [CODATA-SI]


@pytest.mark.parametrize("v_0", [0.6, 0.65, 0.7])
def test_silicon_drop_falls_about_2_mv_per_kelvin(v_0):
    si = TYPES["silicon"]
    # an ideal silicon junction (n = 1, no series resistance) dropping v_0 at 1 mA at 25 degC
    junction = Fit(is_=1e-3 / math.expm1(v_0 / (K_OVER_Q * 298.15)), n=1.0, rs=0.0)
    slope = (forward_voltage(1e-3, junction, si, 26.0)
             - forward_voltage(1e-3, junction, si, 24.0)) / 2.0
    assert -2.5e-3 < slope < -1.5e-3


@pytest.mark.parametrize("kind", ["silicon", "schottky"])
def test_slope_matches_the_derived_closed_form(kind):
    t = TYPES[kind]
    f = fit(1.0 if kind == "silicon" else 0.5, 1.0, t, rs=0.0)
    i = 0.2
    v = forward_voltage(i, f, t, 25.0)
    expected = (v - t.eg - t.xti * K_OVER_Q * 298.15) / 298.15
    slope = (forward_voltage(i, f, t, 25.01) - forward_voltage(i, f, t, 24.99)) / 0.02
    assert slope == pytest.approx(expected, rel=1e-3)


def test_engine_bus_follows_the_junction_law():
    # Near-ideal quasi-static check: a huge capacitor and a small constant load, so the bus sits
    # near Vpk less two diode drops at the (short) charging peak. Warming both junctions by
    # 20 K must raise the bus by about 2 x 20 K x |dV/dT|, with dV/dT taken from the closed form
    # above at the drop the engine's own peak current implies (within 25 %: the peak current
    # itself moves a little with temperature).
    si = TYPES["silicon"]
    f = fit(1.0, 1.0, si)
    common = dict(topology="bridge", v_rms=12.0, freq=50.0, r_s=0.2, l_s=0.0, c=1.0, esr=0.0,
                  i_load=0.05, diode_is=f.is_, diode_n=f.n, diode_rs=f.rs, diode_t_ref=25.0,
                  diode_eg=si.eg, diode_xti=si.xti)
    ss = simulate(Circuit(**common, diode_t_c=np.array([15.0, 35.0])))
    assert ss.converged.all()
    # the junction drop at the peak current, at the midpoint 25 degC, where Is = f.is_
    i_pk = float(ss.i_d_peak.mean())
    v_j = f.n * K_OVER_Q * 298.15 * math.log1p(i_pk / f.is_)
    slope = (v_j - si.eg - si.xti * K_OVER_Q * 298.15) / 298.15
    rise = float(ss.v_c_mean[1] - ss.v_c_mean[0])
    assert rise == pytest.approx(-2 * 20 * slope, rel=0.25)
