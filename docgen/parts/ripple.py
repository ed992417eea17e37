"""Ripple-current rating of an aluminium electrolytic at another frequency than its quoted one.

A maker quotes the ripple-current rating at one frequency (usually 100 Hz or 120 Hz, some at
10 kHz or 100 kHz) and gives a table of multipliers for other frequencies: the rating falls at
low frequency, where the ESR (and so the heat per ampere) is higher. The rating at the design's
ripple frequency f_r is I_quoted * M(f_r) / M(f_quoted).

TYPICAL_MULTIPLIERS is from memory, typical of makers' data for general-purpose radial
aluminium electrolytics (the column headings 50/60 Hz, 120 Hz, 1 kHz, 10 kHz, 100 kHz of their
tables); [CP-RIPPLE-FREQ] in docs/references.md. A library part that gives its own table
(``ripple_multipliers``) overrides it.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

# Quoted frequency of a rating that does not say (makers quote 100 Hz or 120 Hz; the typical
# table gives both the same multiplier): common practice.
DEFAULT_QUOTED_FREQUENCY = 120.0  # Hz

# (frequency Hz, multiplier relative to 100/120 Hz); from memory, typical of makers' data
TYPICAL_MULTIPLIERS: tuple[tuple[float, float], ...] = (
    (60.0, 0.80),
    (100.0, 1.00),
    (120.0, 1.00),
    (1e3, 1.35),
    (1e4, 1.50),
    (1e5, 1.50),
)
TYPICAL_SOURCE = ("typical frequency multipliers of aluminium electrolytics (from memory, "
                  "typical of makers' data)")


def multiplier(frequency: float, table: Sequence[tuple[float, float]] = TYPICAL_MULTIPLIERS
               ) -> float:
    """The table's multiplier at ``frequency`` (Hz): straight lines on a logarithmic
    frequency axis between the points, flat beyond the first and the last."""
    points = sorted(table)
    if not points:
        raise ValueError("a ripple multiplier table needs at least one point")
    if not (math.isfinite(frequency) and frequency > 0):
        raise ValueError(f"frequency must be positive, got {frequency!r}")
    if frequency <= points[0][0]:
        return points[0][1]
    if frequency >= points[-1][0]:
        return points[-1][1]
    for (f0, m0), (f1, m1) in zip(points, points[1:]):
        if f0 <= frequency <= f1:
            x = math.log(frequency / f0) / math.log(f1 / f0)
            return m0 + (m1 - m0) * x
    raise AssertionError("unreachable: frequency lies inside the table")
