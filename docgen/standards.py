"""Standard ratings that sized values are rounded to when no parts library is given.

These are the usual catalogue steps of the trade (common practice, no single source); a parts
library, when given, replaces them with real parts.
"""

from __future__ import annotations

import bisect

# Rated secondary RMS voltages of small mains transformers, V.
SECONDARY_VOLTAGES = (6.0, 7.5, 9.0, 12.0, 15.0, 18.0, 20.0, 24.0, 30.0, 36.0, 48.0)
# Apparent-power ratings of small mains transformers, VA.
TRANSFORMER_VA = (0.5, 1.0, 1.5, 2.0, 3.0, 5.0, 6.0, 8.0, 10.0, 12.0, 15.0, 20.0, 25.0, 30.0,
                  50.0, 80.0, 100.0, 160.0, 250.0, 300.0, 500.0)
# Rated DC voltages of aluminium electrolytic capacitors, V.
CAPACITOR_VOLTAGES = (6.3, 10.0, 16.0, 25.0, 35.0, 50.0, 63.0, 80.0, 100.0, 160.0, 200.0,
                      250.0, 350.0, 400.0, 450.0)
# Power classes of zener diodes, W.
ZENER_POWERS = (0.5, 1.0, 1.3, 3.0, 5.0)
# Power ratings of through-hole resistors, W.
RESISTOR_POWERS = (0.25, 0.5, 0.6, 1.0, 2.0, 3.0, 5.0, 7.0, 10.0)
# Repetitive peak reverse voltage classes of silicon rectifiers and bridges, V.
DIODE_VRRM = (50.0, 100.0, 200.0, 400.0, 600.0, 800.0, 1000.0)
# Average forward current classes of rectifier bridges, A, with a typical 8.3 ms half-sine
# surge rating for each class (common practice, no source: typical datasheet figures).
BRIDGE_CURRENT_CLASSES = ((0.5, 20.0), (1.0, 30.0), (1.5, 50.0), (2.0, 60.0), (3.0, 80.0),
                          (4.0, 120.0), (6.0, 175.0), (8.0, 200.0), (10.0, 250.0))

# Rated currents of miniature fuse-links, A: the Renard R10 steps used by IEC 60127 (list from
# memory; common practice).
FUSE_RATINGS = (0.032, 0.04, 0.05, 0.063, 0.08, 0.1, 0.125, 0.16, 0.2, 0.25, 0.315, 0.4, 0.5,
                0.63, 0.8, 1.0, 1.25, 1.6, 2.0, 2.5, 3.15, 4.0, 5.0, 6.3, 8.0, 10.0)

# Typical load regulation of small mains transformers by VA, used only when neither the file nor
# a library part gives one (common practice, no source: makers' notes give bands of 30-60 % for
# 1-3 VA, 20-30 % for 5-10 VA, 12-20 % for 15-30 VA, 8-12 % for 50-80 VA, 6-9 % for 100-160 VA
# and 4-6 % for 300-500 VA). Each band is taken at its upper (pessimistic) end: a softer
# transformer has a higher no-load voltage (voltage ratings, shunt dissipation) and a larger
# winding resistance (less headroom at the trough), so the upper end is conservative both ways.
TYPICAL_REGULATION = ((1.0, 0.60), (3.0, 0.60), (5.0, 0.30), (10.0, 0.30), (15.0, 0.20),
                      (30.0, 0.20), (50.0, 0.12), (80.0, 0.12), (100.0, 0.09), (160.0, 0.09),
                      (300.0, 0.06), (500.0, 0.06))


# What each list rates, its unit, and what a user can change when a need exceeds the list;
# the infeasible message quotes it.
STEP_INFO: dict[tuple[float, ...], tuple[str, str, str]] = {
    SECONDARY_VOLTAGES: ("rated secondary voltage of a small mains transformer", "V",
                         "lower the output voltage or the regulator headroom, or give "
                         "[transformer] secondary and va for a transformer you have"),
    TRANSFORMER_VA: ("transformer power rating", "VA",
                     "lower the load current, or give [transformer] secondary and va"),
    CAPACITOR_VOLTAGES: ("capacitor voltage rating", "V",
                         "lower the secondary voltage, or give [reservoir] capacitance and "
                         "voltage_rating, or raise [margins] capacitor_voltage_derating"),
    ZENER_POWERS: ("zener power class", "W",
                   "lower load_max or the input voltage, widen the output tolerance, give a "
                   "follower's pass transistor more gain ([output.transistor] h_fe_min), use "
                   "a three-terminal regulator, or raise [margins] zener_power_derating"),
    RESISTOR_POWERS: ("resistor power class", "W",
                      "lower the load current or the input voltage, or raise [margins] "
                      "resistor_power_derating"),
    DIODE_VRRM: ("diode reverse-voltage class", "V", "lower the secondary voltage"),
    FUSE_RATINGS: ("fuse-link current rating", "A",
                   "lower the load current or use a higher mains voltage"),
}


class NoStandardValue(ValueError):
    """The need is above every standard value in the list; the message says what to change."""


def next_at_or_above(need: float, values: tuple[float, ...]) -> float:
    """Smallest standard value >= need (with a relative tolerance of 1e-9)."""
    i = bisect.bisect_left(values, need * (1 - 1e-9))
    if i >= len(values):
        from .units import format_quantity

        what, unit, advice = STEP_INFO.get(values, ("standard value", "", "change the "
                                                    "requirements that set this need"))
        raise NoStandardValue(
            f"needs {format_quantity(need, unit)}, above the largest standard {what} "
            f"({format_quantity(values[-1], unit)}); to fix it: {advice}")
    return values[i]


def typical_regulation(va: float) -> float:
    """Regulation interpolated on log(VA) between the band figures; clamped at the ends."""
    import math

    points = TYPICAL_REGULATION
    if va <= points[0][0]:
        return points[0][1]
    if va >= points[-1][0]:
        return points[-1][1]
    for (s0, r0), (s1, r1) in zip(points, points[1:], strict=False):
        if s0 <= va <= s1:
            w = (math.log(va) - math.log(s0)) / (math.log(s1) - math.log(s0))
            return r0 + w * (r1 - r0)
    raise AssertionError("unreachable")
