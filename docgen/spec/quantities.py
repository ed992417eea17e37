"""Pydantic field types that read quantities with units and store SI floats.

Each type also bounds its value to what a small mains-powered supply can physically involve, so a
typing slip ("40 A" for "40 mA", "1e300 V") is caught at the edge with a clear message instead of
reaching the numerics.
"""

from __future__ import annotations

from typing import Annotated

from pydantic import BeforeValidator

from ..units import UnitError, format_quantity, parse_quantity, show_raw


def _reader(dimension: str, unit: str, *, positive: bool = False, non_negative: bool = False,
            low: float | None = None, high: float | None = None):
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

    return BeforeValidator(read)


Voltage = Annotated[float, _reader("voltage", "V", positive=True, high=1000.0)]
Current = Annotated[float, _reader("current", "A", non_negative=True, high=100.0)]
PositiveCurrent = Annotated[float, _reader("current", "A", positive=True, high=100.0)]
Capacitance = Annotated[float, _reader("capacitance", "F", positive=True, high=10.0)]
Resistance = Annotated[float, _reader("resistance", "ohm", positive=True, high=1e9)]
NonNegResistance = Annotated[float, _reader("resistance", "ohm", non_negative=True, high=1e6)]
Inductance = Annotated[float, _reader("inductance", "H", non_negative=True, high=100.0)]
Power = Annotated[float, _reader("power", "W", positive=True, high=10e3)]
ApparentPower = Annotated[float, _reader("apparent_power", "VA", positive=True, high=10e3)]
Frequency = Annotated[float, _reader("frequency", "Hz", positive=True, low=10.0, high=1000.0)]
Duration = Annotated[float, _reader("time", "s", positive=True, high=1e10)]
Temperature = Annotated[float, _reader("temperature", "degC", low=-100.0, high=300.0)]
Fraction = Annotated[float, _reader("ratio", "%", non_negative=True, high=10.0)]
PositiveFraction = Annotated[float, _reader("ratio", "%", positive=True, high=10.0)]
Tempco = Annotated[float, _reader("tempco", "%/degC", low=-0.01, high=0.01)]
ThermalResistance = Annotated[float, _reader("thermal_resistance", "K/W", positive=True,
                                             high=1e4)]
