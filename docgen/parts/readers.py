"""Readers of the parts library's fields: quantities with units, fractions and decibels (the
readers the requirements file uses too, docgen.quantity_reader), lengths, prices, text, flags
and choices, each with the wording of its error."""

from __future__ import annotations

import difflib
import math
import re
from typing import Annotated, Any

from pydantic import BeforeValidator

from ..quantity_reader import DecibelReader, QuantityReader
from ..units import as_float, parse_quantity, show_raw
from . import eseries


class _Reader:
    expects = "a value"

    def __call__(self, raw: Any) -> Any:  # pragma: no cover - overridden
        raise NotImplementedError


class _Length(_Reader):
    """Length text ("12.5 mm") or a number in metres. (docgen.units has no length dimension.)"""

    expects = '"12.5 mm" or a number in metres'
    _UNITS = {"mm": 1e-3, "cm": 1e-2, "m": 1.0}

    def __call__(self, raw: Any) -> float:
        if isinstance(raw, bool):
            raise ValueError(f"expected {self.expects}, got a true/false value")
        if isinstance(raw, (int, float)):
            value = as_float(raw)
        elif isinstance(raw, str):
            m = re.fullmatch(r"[ \t]*([-+]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][-+]?[0-9]+)?)"
                             r"[ \t]*([a-z]*)[ \t]*", raw)
            if not m or m.group(2) not in self._UNITS:
                raise ValueError(f"expected {self.expects}, got {show_raw(raw)}")
            value = float(m.group(1)) * self._UNITS[m.group(2)]
        else:
            raise ValueError(f"expected {self.expects}, got {type(raw).__name__}")
        if not (math.isfinite(value) and value > 0):
            raise ValueError(f"expected a positive length, got {show_raw(raw)}")
        return value


class _Number(_Reader):
    """A plain positive number (a gain, a count)."""

    expects = "a positive number"

    def __call__(self, raw: Any) -> float:
        if isinstance(raw, bool) or not isinstance(raw, (int, float)):
            raise ValueError(f"expected a plain positive number, got {show_raw(raw)}")
        value = as_float(raw)
        if not (math.isfinite(value) and value > 0):
            raise ValueError(f"expected a plain positive number, got {show_raw(raw)}")
        return value


class _Price(_Reader):
    expects = "a plain number in the library's currency"

    def __call__(self, raw: Any) -> float:
        if isinstance(raw, bool) or not isinstance(raw, (int, float)):
            raise ValueError("expected a price as a plain number such as 0.45, "
                             f"got {show_raw(raw)}")
        value = as_float(raw)
        if not (math.isfinite(value) and value >= 0):
            raise ValueError(f"expected a price of zero or more, got {show_raw(raw)}")
        return value


class _Text(_Reader):
    expects = "text in quotes"

    def __init__(self, *, part_id: bool = False) -> None:
        self.part_id = part_id
        if part_id:
            self.expects = 'a part id in quotes, such as "DP-CAP-3300U35"'

    def __call__(self, raw: Any) -> str:
        if not isinstance(raw, str):
            raise ValueError(f"expected {self.expects}, got {_show_raw(raw)}")
        if self.part_id and (not raw or any(c.isspace() for c in raw)):
            raise ValueError(f"expected a part id without spaces, got {show_raw(raw)}")
        return raw


class _Flag(_Reader):
    expects = "true or false"

    def __call__(self, raw: Any) -> bool:
        if not isinstance(raw, bool):
            raise ValueError(f"expected true or false (no quotes), got {_show_raw(raw)}")
        return raw


class _Choice(_Reader):
    def __init__(self, *choices: str, case: bool = False) -> None:
        self.choices = choices
        self.case = case
        self.expects = "one of " + ", ".join(f'"{c}"' for c in choices)

    def __call__(self, raw: Any) -> str:
        if isinstance(raw, str):
            for c in self.choices:
                if raw == c or (not self.case and raw.lower() == c.lower()):
                    return c
            close = difflib.get_close_matches(raw, self.choices, n=1, cutoff=0.5)
            hint = f"; did you mean {close[0]!r}?" if close else ""
            raise ValueError(f"expected {self.expects}, got {show_raw(raw)}{hint}")
        raise ValueError(f"expected {self.expects}, got {_show_raw(raw)}")


class _MultiplierTable(_Reader):
    """A frequency multiplier table: an inline table of frequency text -> plain multiplier,
    such as {"50 Hz" = 0.8, "120 Hz" = 1.0, "10 kHz" = 1.4}; kept as sorted (Hz, factor)."""

    expects = '{"50 Hz" = 0.8, "120 Hz" = 1.0, "10 kHz" = 1.4} (frequency = multiplier)'

    def __call__(self, raw: Any) -> tuple[tuple[float, float], ...]:
        if not isinstance(raw, dict) or not raw:
            raise ValueError(f"expected a table {self.expects}, got {_show_raw(raw)}")
        points: dict[float, float] = {}
        for key, factor in raw.items():
            try:
                freq = parse_quantity(key, "frequency")
            except ValueError:
                raise ValueError(f"expected frequency keys such as \"120 Hz\", got "
                                 f"{show_raw(key)}") from None
            if not (math.isfinite(freq) and freq > 0):
                raise ValueError(f"expected a positive frequency key, got {show_raw(key)}")
            if isinstance(factor, bool) or not isinstance(factor, (int, float)) or not (
                    math.isfinite(factor) and 0 < factor <= 10):
                raise ValueError(f"expected a plain multiplier between 0 and 10 for "
                                 f"{show_raw(key)}, got {_show_raw(factor)}")
            if freq in points:
                raise ValueError(f"frequency {show_raw(key)} is given twice")
            points[freq] = float(factor)
        return tuple(sorted(points.items()))


def _show_raw(raw: Any) -> str:
    if isinstance(raw, bool):
        return "true" if raw else "false"
    if isinstance(raw, (dict, list)):
        return "a table" if isinstance(raw, dict) else "a list"
    return show_raw(raw)


def _q(dimension: str, unit: str | None = None, **kw: Any) -> Any:
    return Annotated[float, BeforeValidator(QuantityReader(dimension, unit, **kw))]


Voltage = _q("voltage", "V")
Current = _q("current", "A")
CurrentOrZero = _q("current", "A", sign="non-negative")
Capacitance = _q("capacitance", "F")
Resistance = _q("resistance", "ohm")
Power = _q("power", "W")
ApparentPower = _q("apparent_power", "VA")
Frequency = _q("frequency", "Hz")
Time = _q("time", "s")
ChargeIntegral = _q("charge_integral", "A2s")
ThermalResistance = _q("thermal_resistance", "K/W")
Temperature = _q("temperature", "degC", sign="any", low=-60.0, high=250.0)
TempCo = _q("tempco", "1/K", sign="any", low=-0.01, high=0.01)
Tolerance = _q("ratio", "%", high=0.5)
Regulation = _q("ratio", "%", sign="non-negative", high=2.0)
TanDelta = _q("ratio", "%", high=1.0)
Length = Annotated[float, BeforeValidator(_Length())]
Decibel = Annotated[float, BeforeValidator(DecibelReader())]
Number = Annotated[float, BeforeValidator(_Number())]
Price = Annotated[float, BeforeValidator(_Price())]
Text = Annotated[str, BeforeValidator(_Text())]
PartId = Annotated[str, BeforeValidator(_Text(part_id=True))]
Flag = Annotated[bool, BeforeValidator(_Flag())]
MultiplierTable = Annotated[tuple[tuple[float, float], ...], BeforeValidator(_MultiplierTable())]
SeriesName = Annotated[str, BeforeValidator(_Choice(*eseries.SERIES, case=False))]


def _choice(*choices: str, case: bool = False) -> Any:
    return Annotated[str, BeforeValidator(_Choice(*choices, case=case))]


# --------------------------------------------------------------------------------------------
# Part models
