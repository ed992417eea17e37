"""Hold-up through a mains dropout: the hand estimate beside the engine's figure.

The regulator's input current is taken as constant from the trough down to the least input the
kind needs (the charge balance of the capacitor, C dV = I dt). The verified figure comes from
the engine's trough at every corner and the kind's load law (docgen.verify.holdup).
"""

from __future__ import annotations

from .. import equations as eq
from ..trace import Ledger
from .context import SizingContext

WRITES = ("reservoir.holdup_est",)


def estimate_holdup(ctx: SizingContext, L: Ledger) -> None:
    """Initial estimate, recorded only when the requirements ask for a hold-up time."""
    if "output.hold_up" not in L:
        return
    L.calc("reservoir.holdup_est", eq.HOLDUP_CC, r"t_{hold,est}", "s",
           "Hold-up time after a dropout at the trough (initial estimate, constant current)",
           {"c": "reservoir.c_min", "a": "reservoir.valley_low",
            "b": "regulator.v_in_min_needed", "i": "regulator.i_in_max"},
           lambda c, a, b, i: max(c * (a - b) / i, 0.0))
