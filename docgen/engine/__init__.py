"""Periodic steady-state waveform engine for capacitor-input rectifiers (numpy only).

``simulate`` finds the periodic steady state of many operating points at once; ``switch_on``
integrates the charging pulses after the mains is switched on at the crest until the capacitor
is charged (largest pulse, whole-transient I^2 t, and the first pulse's figures).

Circuit model (secondary-referred, SI units)
--------------------------------------------
Each conducting path is an EMF ``vpk sin(w t)`` in series with ``r_s``, ``l_s`` and the path's
diodes (one, or two for a bridge), each an exponential junction
``i = Is (exp(v / (n Vt)) - 1)`` with series resistance ``diode_rs``, ``Vt = k T / q`` and
``Is`` at the junction temperature (``circuit.saturation_current``: rises with T, so the drop
falls by about 2 mV/K for silicon at constant current). The path
feeds the reservoir capacitor ``c`` (with ``esr``) and the load (see ``Circuit``). Center-tap half
windings are independent sources (no coupling between their leakage inductances). Reverse
leakage of the path that is not conducting is neglected (at most ``Is``).

Method
------
- Time stepping: trapezoidal rule for capacitor and inductor; each step is solved in closed form
  (Wright omega function, piecewise-linear loads), so it costs a fixed number of array operations
  over all points. Where a step is longer than the capacitor's fastest time constant the
  capacitor step is damped towards backward Euler; an inductor whose diode has turned off has its
  voltage reset to zero. Both remove the trapezoidal rule's ringing.
- Steady state: shooting with a safeguarded Newton iteration on the period map of the capacitor
  voltage, with the map's slope carried through the steps. The pass starts at the EMF zero
  crossing, where a capacitor-input rectifier is off; full-wave circuits use half-period symmetry.
  A coarse uniform grid finds the state and the conduction pulse; a per-point grid with most of
  its steps inside the pulse gives the final figures.

Accuracy: against a solve_ivp reference (tests/reference) the ripple, peak diode current and RMS
currents agree within about 5e-4 at the default 512 steps per period. Continuous conduction
(current through the EMF zero crossing) is outside the model and is reported, not computed.

``SteadyState.status``: 0 converged, 1 no convergence within ``max_periods``, 2 no steady state
with a positive capacitor voltage (the load asks for more than the source gives), 3 continuous
conduction. Figures are NaN unless the status is 0.
"""

from .circuit import Circuit, concat_circuits
from .inrush import SwitchOn, switch_on
from .period_figures import SteadyState
from .steady import STATUS_TEXT, simulate

__all__ = ["Circuit", "concat_circuits", "STATUS_TEXT", "SteadyState", "SwitchOn", "simulate",
           "switch_on"]
