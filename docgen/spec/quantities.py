"""Pydantic field types of the requirements file that read quantities with units and store SI
floats (through :class:`docgen.quantity_reader.QuantityReader`, shared with the parts library).

Each type also bounds its value to what a small mains-powered supply can physically involve, so a
typing slip ("40 A" for "40 mA", "1e300 V") is caught at the edge with a clear message instead of
reaching the numerics.
"""

from __future__ import annotations

import re
from typing import Annotated

from pydantic import BeforeValidator, WithJsonSchema

from ..quantity_reader import DecibelReader, QuantityReader
from ..units import _NO_PREFIX, DIMENSIONS, PREFIXES

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
    """A float field type that reads text with units and bounds the value (the reader is the
    parts library's too, so both files word the same mistake the same way)."""
    sign = "positive" if positive else "non-negative" if non_negative else "any"
    reader = QuantityReader(dimension, unit, sign=sign, low=low, high=high)
    return Annotated[float, BeforeValidator(reader), _json_schema(dimension, unit)]


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


Decibels = Annotated[float, BeforeValidator(DecibelReader(sign="non-negative", high=120.0)),
                     WithJsonSchema({"anyOf": [
    {"type": "number", "minimum": 0, "maximum": 120, "description": "in dB"},
    {"type": "string", "pattern": f"^\\s*{NUMBER_PATTERN}\\s*(dB)?\\s*$",
     "description": "a level such as \"60 dB\""},
]})]
