"""Quantities at the edges: text such as "4700 uF" becomes an SI float, and SI floats become text.

Inside docgen every number is SI (volts, amperes, farads, ohms, watts, hertz, seconds, ratios as
fractions). Temperatures are the one exception: they stay in degrees Celsius, as every datasheet
gives them, and names that hold them end in ``_c``.

A small hand-written parser is used instead of a general units library: the set of units a power
supply requirement needs is small, and the parser costs nothing at start-up.
"""

from __future__ import annotations

import math
import re

# SI prefixes accepted in front of a unit symbol. "u" and the micro sign both mean 1e-6.
PREFIXES: dict[str, float] = {
    "p": 1e-12,
    "n": 1e-9,
    "u": 1e-6,
    "\u00b5": 1e-6,
    "\u03bc": 1e-6,
    "m": 1e-3,
    "": 1.0,
    "k": 1e3,
    "M": 1e6,
}

# Dimension name -> (canonical SI unit, accepted unit spellings -> scale to the canonical unit).
# Spellings are matched after an optional SI prefix.
DIMENSIONS: dict[str, tuple[str, dict[str, float]]] = {
    "voltage": ("V", {"V": 1.0}),
    "current": ("A", {"A": 1.0}),
    "capacitance": ("F", {"F": 1.0}),
    "inductance": ("H", {"H": 1.0}),
    "resistance": ("ohm", {"ohm": 1.0, "Ohm": 1.0, "\u03a9": 1.0, "\u2126": 1.0, "R": 1.0}),
    "power": ("W", {"W": 1.0}),
    "apparent_power": ("VA", {"VA": 1.0}),
    "frequency": ("Hz", {"Hz": 1.0}),
    "time": ("s", {"s": 1.0, "h": 3600.0, "min": 60.0, "year": 3.15576e7, "y": 3.15576e7}),
    "temperature": ("degC", {"degC": 1.0, "\u00b0C": 1.0, "C": 1.0}),
    "thermal_resistance": ("K/W", {"K/W": 1.0, "degC/W": 1.0, "\u00b0C/W": 1.0, "C/W": 1.0}),
    "ratio": ("", {"%": 0.01, "": 1.0, "ppm": 1e-6}),
    "tempco": ("1/K", {"%/degC": 0.01, "%/K": 0.01, "%/\u00b0C": 0.01, "1/K": 1.0, "ppm/K": 1e-6}),
    "voltage_tempco": ("V/K", {"V/K": 1.0, "V/degC": 1.0}),
    "charge_integral": ("A2s", {"A2s": 1.0, "A^2s": 1.0, "A\u00b2s": 1.0}),
    "energy": ("J", {"J": 1.0}),
}

# Units that must not take a prefix (a "min" is not a milli-"in"; "%" has no prefix).
_NO_PREFIX = {"%", "min", "h", "year", "y", "degC", "\u00b0C", "C", "ppm", "%/degC", "%/K",
              "%/\u00b0C", "ppm/K", "degC/W", "\u00b0C/W", "C/W", "K/W", "1/K"}

# ASCII digits only: Python's float() also reads Arabic-Indic or full-width digits, which a
# requirements file should not silently accept as numbers. Only spaces and tabs around the
# parts: a carriage return or another control character in a value is a mistake to report.
_NUMBER = re.compile(r"^[ \t]*([-+]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][-+]?[0-9]+)?)"
                     r"[ \t]*(.*?)[ \t]*\Z", re.S)


class UnitError(ValueError):
    """A quantity could not be read; the message says what was expected."""


def as_float(raw: int | float) -> float:
    """A TOML number as a float; an integer too wide for a float is a UnitError, not a crash."""
    try:
        return float(raw)
    except OverflowError:
        raise UnitError("expected a number of ordinary size, got an integer of "
                        f"{len(str(abs(raw))) if abs(raw) < 10**4000 else 'thousands of'} "
                        "digits") from None


def show_raw(raw: object, limit: int = 60) -> str:
    """A raw input value for an error message: repr, cut to ``limit`` characters."""
    if isinstance(raw, int) and not isinstance(raw, bool) and abs(raw) >= 10**30:
        return f"an integer of {len(str(abs(raw)))} digits"
    text = repr(raw)
    if len(text) > limit:
        if isinstance(raw, str):  # cut inside the quotes, so the quotes stay paired
            return f"{raw[: limit - 20]!r}... ({len(raw)} characters)"
        text = f"{text[: limit - 20]}... ({len(text)} characters)"
    return text


def _unit_scale(unit: str, dimension: str) -> float | None:
    """Scale of ``unit`` (with optional prefix) to the SI unit of ``dimension``, or None."""
    _, spellings = DIMENSIONS[dimension]
    if unit in spellings:
        return spellings[unit]
    for prefix, factor in PREFIXES.items():
        if prefix and unit.startswith(prefix):
            rest = unit[len(prefix):]
            if rest in spellings and rest not in _NO_PREFIX and rest != "":
                return factor * spellings[rest]
    return None


def expected_text(dimension: str) -> str:
    """Human text for what a field of this dimension accepts, used in error messages."""
    si, spellings = DIMENSIONS[dimension]
    examples = {
        "voltage": '"230 V", "9.1 V" or a number in volts',
        "current": '"40 mA", "1.2 A" or a number in amperes',
        "capacitance": '"4700 uF", "2.2 mF" or a number in farads',
        "inductance": '"2 mH" or a number in henries',
        "resistance": '"470 ohm", "2.2 kohm" or a number in ohms',
        "power": '"0.5 W", "250 mW" or a number in watts',
        "apparent_power": '"10 VA" or a number in volt-amperes',
        "frequency": '"50 Hz" or a number in hertz',
        "time": '"2 s", "100 ms", "20000 h" or a number in seconds',
        "temperature": '"45 degC" or a number in degrees Celsius',
        "thermal_resistance": '"12 K/W", "12 degC/W" or a number in kelvin per watt',
        "ratio": '"10 %" or a plain fraction such as 0.1',
        "tempco": '"0.05 %/degC" or a number per kelvin',
        "voltage_tempco": '"5 mV/degC" or a number in volts per kelvin',
        "charge_integral": '"3.7 A2s" or a number in A\u00b2s',
        "energy": '"1.5 J" or a number in joules',
    }
    return examples.get(dimension, f"a quantity in {si or 'plain numbers'}")


def parse_quantity(raw: object, dimension: str) -> float:
    """Read a quantity given as text with a unit or as a plain SI number; return SI.

    Raises UnitError with a message naming what was expected.
    """
    if isinstance(raw, bool):
        raise UnitError(f"expected {expected_text(dimension)}, got a true/false value")
    if isinstance(raw, (int, float)):
        value = as_float(raw)
        scale = 1.0
    elif isinstance(raw, str):
        m = _NUMBER.match(raw) if len(raw) <= 200 else None
        if not m:
            raise UnitError(f"expected {expected_text(dimension)}, got {show_raw(raw)}")
        value = float(m.group(1))
        unit = m.group(2)
        scale = _unit_scale(unit, dimension)
        if scale is None:
            raise UnitError(
                f"unit {show_raw(unit)} is not a {dimension.replace('_', ' ')} unit; "
                f"expected {expected_text(dimension)}"
            )
    else:
        raise UnitError(f"expected {expected_text(dimension)}, got {type(raw).__name__}")
    result = value * scale
    if not math.isfinite(result):
        raise UnitError(f"expected a finite number, got {show_raw(raw)}")
    return result


# --------------------------------------------------------------------------------------------
# Display

_ENG_PREFIXES = [(1e6, "M"), (1e3, "k"), (1.0, ""), (1e-3, "m"), (1e-6, "\u00b5"), (1e-9, "n"),
                 (1e-12, "p")]

# Units shown with an engineering prefix. Others (%, degC, K/W, h, ...) are shown as they are.
_PREFIXABLE = {"V", "A", "F", "H", "\u03a9", "W", "VA", "Hz", "s", "J"}

_DISPLAY_UNIT = {"ohm": "\u03a9", "degC": "\u00b0C", "": "", "A2s": "A\u00b2s", "1/K": "1/K"}


def display_unit(unit: str) -> str:
    return _DISPLAY_UNIT.get(unit, unit)


def significant(value: float, digits: int = 4) -> str:
    """Format with a fixed number of significant digits, no exponent for everyday magnitudes."""
    if value == 0 or not math.isfinite(value):
        return "0" if value == 0 else str(value)
    exponent = math.floor(math.log10(abs(value)))
    if not -15 <= exponent <= 15:  # far outside any supply's values: short scientific form
        return f"{value:.{digits}g}".replace("e+", "e")
    decimals = max(digits - 1 - exponent, 0)
    text = f"{value:.{decimals}f}"
    if "." in text:
        text = text.rstrip("0").rstrip(".")
    return text


def format_quantity(value: float, unit: str, digits: int = 4) -> str:
    """SI value -> text with an engineering prefix, e.g. (0.047, "A") -> "47 mA".

    Capacitance is shown in microfarads from 1 uF to 1 F, as parts are marked.
    Ratios ("") are shown as percent when the unit is "%".
    """
    if value is None:
        return "\u2014"
    if unit == "%":
        return f"{significant(value * 100.0, digits)} %"
    shown = display_unit(unit)
    if value != 0 and math.isfinite(value) and not 1e-15 <= abs(value) < 1e15:
        return f"{significant(value, digits)} {shown}".rstrip()  # no prefix fits
    if unit == "F" and 1e-6 <= abs(value) < 1.0:
        return f"{significant(value * 1e6, digits)} \u00b5F"
    if shown in _PREFIXABLE and value != 0 and math.isfinite(value):
        for factor, prefix in _ENG_PREFIXES:
            if abs(value) >= factor * 0.9995:
                return f"{significant(value / factor, digits)} {prefix}{shown}"
        factor, prefix = _ENG_PREFIXES[-1]
        return f"{significant(value / factor, digits)} {prefix}{shown}"
    if unit == "%/degC":
        return f"{significant(value * 100.0, digits)} %/\u00b0C"
    if unit == "rad":
        return f"{significant(value, digits)} rad ({significant(value * 180 / math.pi, 3)}\u00b0)"
    if unit == "degC":
        return f"{significant(value, digits)} \u00b0C"
    if unit == "h":
        return f"{significant(value / 3600.0, digits)} h"
    return f"{significant(value, digits)} {shown}".rstrip()
