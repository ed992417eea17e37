"""The worst corner of a check: the corner where its figure is largest (or smallest)."""

from __future__ import annotations

import math

import numpy as np

from .checks import EngineCheck
from .corners import CornerResult


def worst_corner(cr: CornerResult, chk: EngineCheck) -> tuple[float, int]:
    """(worst value, corner index); (nan, -1) when no corner gives a finite figure."""
    values = cr.corner_metric(chk.metric)
    mask = np.isfinite(values)
    if chk.nominal_line_only:
        mask &= np.array([n == "nominal mains" for n in cr.corners.line_name])
    if not mask.any():
        return math.nan, -1
    masked = np.where(mask, values, -np.inf if chk.sense == "max" else np.inf)
    k = int(np.argmax(masked) if chk.sense == "max" else np.argmin(masked))
    return float(values[k]), k
