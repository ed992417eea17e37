"""IEC 60063 preferred values (E series) and rounding of a computed value to one of them.

Sources
-------
* E6, E12, E24: IEC 60063:2015 *Preferred number series for resistors and capacitors*, table
  of the E series. Values as listed in docs/references.md [IEC60063], confirmed against a
  secondary copy of the standard's table.
* E96: written from memory of the IEC 60063 table and compared, value by value, with two
  secondary web copies of the table (the primary text was not seen). Unlike E6-E24, every E96
  value equals ``10**(i/96)`` rounded to three significant figures; the tests use that as an
  independent check of the typing.
* E48: every other E96 value (from memory; also stated by a secondary copy of the table).

The E6-E24 values are historical roundings and are *not* the geometric series (2.7, 3.3, 3.9,
4.7, 8.2 ...), so every table is written out here and never generated.

Rounding
--------
:func:`preferred` rounds a positive SI value to a member of a series times a power of ten:
``mode="up"`` gives the smallest preferred value not below it, ``"down"`` the largest not
above it and ``"nearest"`` the closest on a logarithmic scale (ties go up). A value within
:data:`REL_TOL` of a preferred value counts as that value, so floating-point noise such as
``4.7e-6 * (1 + 1e-15)`` still maps to ``4.7e-6``. Results are built from the decimal text of
the table entry (``float("4.7e-6")``), so they compare equal to the literal a person types.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

__all__ = [
    "E6",
    "E12",
    "E24",
    "E48",
    "E96",
    "SERIES",
    "TOLERANCE",
    "REL_TOL",
    "series_values",
    "preferred",
    "is_preferred",
    "values_between",
    "value_code",
]

# IEC 60063 ([IEC60063], confirmed against a secondary copy of the table).
E6: tuple[float, ...] = (1.0, 1.5, 2.2, 3.3, 4.7, 6.8)

E12: tuple[float, ...] = (1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2)

E24: tuple[float, ...] = (
    1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0,
    3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1,
)

# IEC 60063 E96, from memory; matches two secondary copies of the table.
E96: tuple[float, ...] = (
    1.00, 1.02, 1.05, 1.07, 1.10, 1.13, 1.15, 1.18, 1.21, 1.24, 1.27, 1.30,
    1.33, 1.37, 1.40, 1.43, 1.47, 1.50, 1.54, 1.58, 1.62, 1.65, 1.69, 1.74,
    1.78, 1.82, 1.87, 1.91, 1.96, 2.00, 2.05, 2.10, 2.15, 2.21, 2.26, 2.32,
    2.37, 2.43, 2.49, 2.55, 2.61, 2.67, 2.74, 2.80, 2.87, 2.94, 3.01, 3.09,
    3.16, 3.24, 3.32, 3.40, 3.48, 3.57, 3.65, 3.74, 3.83, 3.92, 4.02, 4.12,
    4.22, 4.32, 4.42, 4.53, 4.64, 4.75, 4.87, 4.99, 5.11, 5.23, 5.36, 5.49,
    5.62, 5.76, 5.90, 6.04, 6.19, 6.34, 6.49, 6.65, 6.81, 6.98, 7.15, 7.32,
    7.50, 7.68, 7.87, 8.06, 8.25, 8.45, 8.66, 8.87, 9.09, 9.31, 9.53, 9.76,
)

# E48 is every other E96 value (from memory).
E48: tuple[float, ...] = E96[::2]

SERIES: dict[str, tuple[float, ...]] = {
    "E6": E6,
    "E12": E12,
    "E24": E24,
    "E48": E48,
    "E96": E96,
}

# Tolerance usually associated with each series. E6/E12/E24: IEC 60063
# ([IEC60063], confirmed); E48/E96: from memory. IEC 60063:2015 loosened the wording of this
# relation, so it is a habit of the trade rather than a rule.
TOLERANCE: dict[str, float] = {"E6": 0.20, "E12": 0.10, "E24": 0.05, "E48": 0.02, "E96": 0.01}

# A value within this relative distance of a preferred value is taken to be that value.
REL_TOL = 1e-9

_MODES = ("up", "down", "nearest")


def series_values(name: str) -> tuple[float, ...]:
    """The members of one decade of series ``name`` ("E6", "E12", "E24", "E48", "E96").

    Raises ValueError naming the known series when ``name`` is not one of them.
    """
    key = name.strip().upper() if isinstance(name, str) else name
    try:
        return SERIES[key]
    except (KeyError, TypeError):
        known = ", ".join(SERIES)
        raise ValueError(f"unknown E series {name!r}; expected one of {known}") from None


def _scaled(mantissa: float, exponent: int) -> float:
    """``mantissa * 10**exponent`` as the float nearest the decimal number (no product error)."""
    return float(f"{mantissa!r}e{exponent}")


def _check_value(value: float) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise ValueError(f"expected a positive number, got {value!r}")
    value = float(value)
    if not math.isfinite(value) or value <= 0.0:
        raise ValueError(f"preferred values exist only for positive finite numbers, got {value!r}")
    return value


def _candidates(value: float, values: Sequence[float]) -> list[float]:
    """Preferred values of the decades around ``value``, ascending, always bracketing it."""
    exponent = math.floor(math.log10(value))
    out = [_scaled(m, k) for k in (exponent - 1, exponent, exponent + 1) for m in values]
    out.append(_scaled(1.0, exponent + 2))
    return out


def preferred(value: float, series: str = "E24", mode: str = "up") -> float:
    """Round a positive value to a preferred value of ``series``.

    Parameters
    ----------
    value : float
        Positive SI value, e.g. 478.0 (ohm) or 4.7e-6 (F).
    series : str
        "E6", "E12", "E24", "E48" or "E96".
    mode : str
        "up": smallest preferred value >= value; "down": largest preferred value <= value;
        "nearest": closest on a logarithmic scale, ties going up.

    Returns
    -------
    float
        The preferred value in the same unit, e.g. ``preferred(478, "E24", "down") == 470``.
    """
    value = _check_value(value)
    values = series_values(series)
    if mode not in _MODES:
        raise ValueError(f"unknown rounding mode {mode!r}; expected one of {', '.join(_MODES)}")
    candidates = _candidates(value, values)
    for c in candidates:
        if math.isclose(c, value, rel_tol=REL_TOL):
            return c
    above = min(c for c in candidates if c > value)
    below = max(c for c in candidates if c < value)
    if mode == "up":
        return above
    if mode == "down":
        return below
    # Ties (within rounding noise) go up.
    return above if math.log(above / value) <= math.log(value / below) + REL_TOL else below


def is_preferred(value: float, series: str = "E24") -> bool:
    """True when ``value`` is a member of ``series`` times a power of ten (within REL_TOL)."""
    try:
        value = _check_value(value)
    except ValueError:
        return False
    return any(math.isclose(c, value, rel_tol=REL_TOL)
               for c in _candidates(value, series_values(series)))


def values_between(low: float, high: float, series: str = "E24") -> list[float]:
    """Every preferred value of ``series`` from ``low`` to ``high`` inclusive, ascending."""
    low = _check_value(low)
    high = _check_value(high)
    values = series_values(series)
    if high < low:
        raise ValueError(f"empty range: {high!r} is below {low!r}")
    first = preferred(low, series, "up")
    out: list[float] = []
    exponent = math.floor(math.log10(first))
    while True:
        for m in values:
            c = _scaled(m, exponent)
            if c < first and not math.isclose(c, first, rel_tol=REL_TOL):
                continue
            if c > high and not math.isclose(c, high, rel_tol=REL_TOL):
                return out
            out.append(c)
        exponent += 1


def value_code(ohms: float) -> str:
    """Short marking code of a resistance: the multiplier letter stands for the decimal point.

    Examples: 0.47 -> "R47", 4.7 -> "4R7", 470 -> "470R", 4700 -> "4K7", 10000 -> "10K",
    1e6 -> "1M". This is the letter-and-digit style printed on resistors and in parts lists
    (common practice, no source); docgen uses it only to name members of a resistor family.
    """
    ohms = _check_value(ohms)
    for factor, letter in ((1e9, "G"), (1e6, "M"), (1e3, "K"), (1.0, "R")):
        if ohms >= factor * (1 - REL_TOL) or letter == "R":
            scaled = ohms / factor
            text = f"{scaled:.6g}"
            if "e" in text:
                text = f"{scaled:.6f}".rstrip("0").rstrip(".")
            whole, _, frac = text.partition(".")
            if whole == "0":
                whole = ""
            return f"{whole}{letter}{frac}"
    raise AssertionError("unreachable")  # pragma: no cover
