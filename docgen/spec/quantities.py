"""Pydantic field types that read quantities with units and store SI floats.

Each type also bounds its value to what a small mains-powered supply can physically involve, so a
typing slip ("40 A" for "40 mA", "1e300 V") is caught at the edge with a clear message instead of
reaching the numerics.
"""

from __future__ import annotations

import re
from typing import Annotated

from pydantic import BeforeValidator, WithJsonSchema

from ..units import (
    _NO_PREFIX,
    DIMENSIONS,
    PREFIXES,
    UnitError,
    format_quantity,
    parse_quantity,
    show_raw,
)

# The number part of a quantity as the unit parser reads it (JSON Schema / ECMA-262 syntax).
NUMBER_PATTERN = r"[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?"


def unit_pattern(dimension: str) -> str:
    """A regular expression for the unit spellings the parser accepts for ``dimension``
    (optional: a plain number is read in SI)."""
    _, spellings = DIMENSIONS[dimension]
    plain = sorted((u for u in spellings if u), key=len, reverse=True)
    prefixed = [u for u in plain if u not in _NO_PREFIX]
    prefixes = "".join(sorted(p for p in PREFIXES if p))
    alternatives = [re.escape(u) for u in plain]
    if prefixed:
        alternatives.insert(0, f"[{prefixes}]({'|'.join(re.escape(u) for u in prefixed)})")
    return f"({'|'.join(alternatives)})?"


def _json_schema(dimension: str, unit: str) -> WithJsonSchema:
    """What an editor checks: a plain SI number, or text with a unit of this dimension."""
    si = DIMENSIONS[dimension][0] if dimension in DIMENSIONS else unit
    return WithJsonSchema({"anyOf": [
        {"type": "number", "description": _NUMBER_MEANS.get(dimension, f"in {si}")},
        {"type": "string", "pattern": f"^\\s*{NUMBER_PATTERN}\\s*{unit_pattern(dimension)}\\s*$",
         "description": f"a number and a unit, such as \"{_EXAMPLES.get(dimension, unit)}\""},
    ]})


_NUMBER_MEANS = {"ratio": "a plain fraction: 0.1 means 10 %", "tempco": "per kelvin",
                 "temperature": "in degrees Celsius"}
_EXAMPLES = {"voltage": "230 V", "current": "40 mA", "capacitance": "4700 uF",
             "inductance": "2 mH", "resistance": "470 ohm", "power": "0.5 W",
             "apparent_power": "10 VA", "frequency": "50 Hz", "time": "20000 h",
             "temperature": "45 degC", "thermal_resistance": "5 K/W", "ratio": "10 %",
             "tempco": "0.05 %/degC"}


def _quantity(dimension: str, unit: str, *, positive: bool = False, non_negative: bool = False,
              low: float | None = None, high: float | None = None):
    """A float field type that reads text with units and bounds the value."""
    def read(raw: object) -> float:
        try:
            value = parse_quantity(raw, dimension)
        except UnitError as exc:
            raise ValueError(str(exc)) from None
        if positive and value <= 0:
            raise ValueError(f"must be greater than zero, got {show_raw(raw)}")
        if non_negative and value < 0:
            raise ValueError(f"must not be negative, got {show_raw(raw)}")
        if high is not None and value > high:
            raise ValueError(f"{show_raw(raw)} is above {format_quantity(high, unit)}, the "
                             "largest value docgen accepts here")
        if low is not None and value < low:
            raise ValueError(f"{show_raw(raw)} is below {format_quantity(low, unit)}, the "
                             "smallest value docgen accepts here")
        return value

    return Annotated[float, BeforeValidator(read), _json_schema(dimension, unit)]


Voltage = _quantity("voltage", "V", positive=True, high=1000.0)
Current = _quantity("current", "A", non_negative=True, high=100.0)
PositiveCurrent = _quantity("current", "A", positive=True, high=100.0)
Capacitance = _quantity("capacitance", "F", positive=True, high=10.0)
Resistance = _quantity("resistance", "ohm", positive=True, high=1e9)
NonNegResistance = _quantity("resistance", "ohm", non_negative=True, high=1e6)
Inductance = _quantity("inductance", "H", non_negative=True, high=100.0)
Power = _quantity("power", "W", positive=True, high=10e3)
ApparentPower = _quantity("apparent_power", "VA", positive=True, high=10e3)
Frequency = _quantity("frequency", "Hz", positive=True, low=10.0, high=1000.0)
Duration = _quantity("time", "s", positive=True, high=1e10)
Temperature = _quantity("temperature", "degC", low=-100.0, high=300.0)
Fraction = _quantity("ratio", "%", non_negative=True, high=10.0)
PositiveFraction = _quantity("ratio", "%", positive=True, high=10.0)
Tempco = _quantity("tempco", "%/degC", low=-0.01, high=0.01)
VoltageTempco = _quantity("voltage_tempco", "V/K", non_negative=True, high=0.01)
ThermalResistance = _quantity("thermal_resistance", "K/W", positive=True,
                                             high=1e4)


def _decibels(raw: object) -> float:
    """A level in decibels: a plain number or text such as "60 dB" (dB is not an SI unit, so
    the shared unit parser does not take it)."""
    text = raw.strip() if isinstance(raw, str) else raw
    if isinstance(text, str) and text.endswith("dB"):
        text = text[:-2].strip()
    try:
        value = float(text) if isinstance(text, (str, int, float)) and not isinstance(
            text, bool) else float("nan")
    except ValueError:
        value = float("nan")
    if not 0.0 <= value <= 120.0:
        raise ValueError(f"expected a level from 0 dB to 120 dB such as \"60 dB\", got {raw!r}")
    return value


Decibels = Annotated[float, BeforeValidator(_decibels), WithJsonSchema({"anyOf": [
    {"type": "number", "minimum": 0, "maximum": 120, "description": "in dB"},
    {"type": "string", "pattern": f"^\\s*{NUMBER_PATTERN}\\s*(dB)?\\s*$",
     "description": "a level such as \"60 dB\""},
]})]
