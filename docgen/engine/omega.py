"""Wright omega function: the real solution w > 0 of w + ln(w) = x.

A diode (exponential law) in series with a linear resistance has a current that is a closed-form
function of the applied voltage through this function, which lets the time stepper solve each step
without an open-ended iteration. A fixed number of fourth-order corrections (Fritsch, Shafer and
Crowley, CACM 16(2), 1973, from memory) starting from piecewise approximations gives full double
precision over the range the engine uses.
"""

from __future__ import annotations

import math

import numpy as np

# Below this argument omega(x) = exp(x) to double precision; clipping avoids log(0) downstream.
_X_MIN = -700.0


def wright_omega(x: np.ndarray) -> np.ndarray:
    """Return w with w + ln(w) = x, elementwise, for real x (vectorised, no warnings)."""
    x = np.asarray(x, dtype=float)
    if x.size == 1:  # one operating point: plain floats avoid numpy's per-call overhead
        return np.full(x.shape, _omega_scalar(float(x.reshape(-1)[0])))
    x = np.maximum(x, _X_MIN)
    # Starting values: exp(x - exp(x)) on the left; Taylor series about x = 1 (omega(1) = 1,
    # derivatives 1/2, 1/8, -1/32) in the middle; the asymptotic x - ln x + ln(x)/x on the right.
    d = x - 1.0
    taylor = 1.0 + d * (0.5 + d * (1.0 / 16.0 - d / 192.0))
    xr = np.maximum(x, 4.0)
    lnx = np.log(xr)
    xl = np.minimum(x, -1.0)
    left = np.exp(xl - np.exp(xl))
    w = np.where(x < -1.0, left, np.where(x < 4.0, taylor, xr - lnx + lnx / xr))
    for _ in range(2):
        z = x - w - np.log(w)
        q = 2.0 * (1.0 + w) * (1.0 + w + (2.0 / 3.0) * z)
        w = w * (1.0 + z / (1.0 + w) * (q - z) / (q - 2.0 * z))
    return w


def _omega_scalar(x: float) -> float:
    """The same starting values and corrections as wright_omega, for one float."""
    x = max(x, _X_MIN)
    if x < -1.0:
        w = math.exp(x - math.exp(x))
    elif x < 4.0:
        d = x - 1.0
        w = 1.0 + d * (0.5 + d * (1.0 / 16.0 - d / 192.0))
    else:
        lnx = math.log(x)
        w = x - lnx + lnx / x
    for _ in range(2):
        z = x - w - math.log(w)
        q = 2.0 * (1.0 + w) * (1.0 + w + (2.0 / 3.0) * z)
        w = w * (1.0 + z / (1.0 + w) * (q - z) / (q - 2.0 * z))
    return w
