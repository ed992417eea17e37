"""Pydantic field types that read quantities with units and store SI floats."""

from __future__ import annotations

from typing import Annotated

from pydantic import BeforeValidator

from ..units import UnitError, parse_quantity


def _reader(dimension: str, *, positive: bool = False, non_negative: bool = False):
    def read(raw: object) -> float:
        try:
            value = parse_quantity(raw, dimension)
        except UnitError as exc:
            raise ValueError(str(exc)) from None
        if positive and value <= 0:
            raise ValueError(f"must be greater than zero, got {raw!r}")
        if non_negative and value < 0:
            raise ValueError(f"must not be negative, got {raw!r}")
        return value

    return BeforeValidator(read)


Voltage = Annotated[float, _reader("voltage", positive=True)]
Current = Annotated[float, _reader("current", non_negative=True)]
PositiveCurrent = Annotated[float, _reader("current", positive=True)]
Capacitance = Annotated[float, _reader("capacitance", positive=True)]
Resistance = Annotated[float, _reader("resistance", positive=True)]
NonNegResistance = Annotated[float, _reader("resistance", non_negative=True)]
Inductance = Annotated[float, _reader("inductance", non_negative=True)]
Power = Annotated[float, _reader("power", positive=True)]
ApparentPower = Annotated[float, _reader("apparent_power", positive=True)]
Frequency = Annotated[float, _reader("frequency", positive=True)]
Duration = Annotated[float, _reader("time", positive=True)]
Temperature = Annotated[float, _reader("temperature")]
Fraction = Annotated[float, _reader("ratio", non_negative=True)]
PositiveFraction = Annotated[float, _reader("ratio", positive=True)]
Tempco = Annotated[float, _reader("tempco")]
ThermalResistance = Annotated[float, _reader("thermal_resistance", positive=True)]
