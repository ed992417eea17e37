"""A transformer run in a hotter ambient than it is rated for: the secondary current it may
carry so that its windings stay within their insulation class.

The winding's rise above ambient follows its copper loss, I^2 R. Taking the rated load at the
rated ambient T_r to bring the winding to its class temperature T_c, the current that keeps it
there at ambient T_A is I_rated sqrt((T_c - T_A) / (T_c - T_r)) ([CP-XFMR-AMBIENT] in
docs/references.md, common practice). The assumption is conservative for a transformer that
runs cooler than its class allows; the core loss (which does not fall with the current) is left
out, which is optimistic; the document says both.
"""

from __future__ import annotations

import math

# Thermal classes of electrical insulation, degC: IEC 60085 (class letters and temperatures
# from memory).
CLASS_TEMPERATURE: dict[str, float] = {"A": 105.0, "E": 120.0, "B": 130.0, "F": 155.0,
                                       "H": 180.0}
CLASSES = tuple(CLASS_TEMPERATURE)

# Rated ambient of a transformer that does not state one: IEC 61558-1 asks for the rated
# ambient t_a on the label only when it is other than 25 degC (from memory).
DEFAULT_RATED_AMBIENT = 25.0  # degC
DEFAULT_RATED_AMBIENT_SOURCE = ("not stated: IEC 61558-1 marks the rated ambient t_a only "
                                "when it is other than 25 degC (from memory)")
# Insulation class of a transformer that does not state one: the lowest class in use, so the
# derating is never smaller than the real one (common practice).
DEFAULT_CLASS = "A"
DEFAULT_CLASS_SOURCE = ("not stated: class A (105 degC), the lowest thermal class of "
                        "IEC 60085 (from memory), so the derating is not understated")


def ambient_factor(t_ambient: float, t_rated: float, t_class: float) -> float:
    """Allowed secondary current per rated current at ambient ``t_ambient`` (degC); 1 at or
    below the rated ambient (no up-rating in a cooler room), 0 at or above the class limit."""
    if t_ambient <= t_rated:
        return 1.0
    if t_ambient >= t_class:
        return 0.0
    return math.sqrt((t_class - t_ambient) / (t_class - t_rated))
