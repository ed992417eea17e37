"""Periodic steady-state waveform engine for capacitor-input rectifiers (numpy only).

``simulate`` finds the periodic steady state of many operating points at once by shooting on the
period map; ``switch_on`` gives the first charging pulse after the mains is switched on.
"""

from .circuit import Circuit
from .inrush import SwitchOn, switch_on
from .steady import STATUS_TEXT, SteadyState, simulate

__all__ = ["Circuit", "STATUS_TEXT", "SteadyState", "SwitchOn", "simulate", "switch_on"]
