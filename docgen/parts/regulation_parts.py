"""Part models of the regulation: zener, resistors, pass transistor, three-terminal regulator
and heat sink."""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any, ClassVar

from pydantic import Field, model_validator

from ..units import format_quantity
from . import eseries
from .part_base import _PartBase
from .readers import (
    Current,
    CurrentOrZero,
    Decibel,
    Number,
    Power,
    Resistance,
    SeriesName,
    TempCo,
    Temperature,
    Text,
    ThermalResistance,
    Tolerance,
    Voltage,
    _choice,
)


class Zener(_PartBase):
    kind: ClassVar[str] = "zener"
    voltage: Voltage
    tolerance: Tolerance
    power: Power
    power_reference: _choice("ambient", "lead") = "ambient"
    power_reference_temperature_c: Temperature = Field(alias="power_reference_temperature")
    t_j_max_c: Temperature = Field(alias="t_j_max")
    r_theta: ThermalResistance  # junction to the power reference point
    r_theta_la: ThermalResistance | None = None  # lead to ambient (lead-rated parts, as mounted)
    knee_current: Current
    test_current: Current
    dynamic_resistance: Resistance
    tempco: TempCo

    def power_at(self, temperature_c: float) -> float:
        """Allowed power, W, with the reference point at ``temperature_c``.

        The rated power up to the reference temperature, then (t_j_max - T) / r_theta: linear
        derating, the standard thermal relation ([CP-ZENER]), never below zero.
        """
        derated = (self.t_j_max_c - temperature_c) / self.r_theta
        return max(0.0, min(self.power, derated))

    def r_theta_ja(self, lead_to_ambient: float) -> float:
        """Junction-to-ambient thermal resistance, K/W: r_theta itself for an ambient-rated
        part; for a lead-rated part r_theta plus the lead-to-ambient path (the part's own
        ``r_theta_la`` when stated, else ``lead_to_ambient``)."""
        if self.power_reference == "ambient":
            return self.r_theta
        return self.r_theta + (self.r_theta_la if self.r_theta_la is not None
                               else lead_to_ambient)

    def power_at_ambient(self, ambient_c: float, lead_to_ambient: float) -> float:
        """Allowed power, W, with the air at ``ambient_c``.

        A lead-rated part's lead is not at ambient: it sits P R_thLA above it, so the junction
        reaches T_A + P (r_theta + R_thLA) and the allowed power is
        min(power, (t_j_max - T_A) / (r_theta + R_thLA)) (thermal-resistance chain, common
        practice). An ambient-rated part is derated by ``power_at``.
        """
        if self.power_reference == "ambient":
            return self.power_at(ambient_c)
        derated = (self.t_j_max_c - ambient_c) / self.r_theta_ja(lead_to_ambient)
        return max(0.0, min(self.power, derated))


class Resistor(_PartBase):
    """One resistor value; ``family`` names the family it was drawn from, if any."""

    kind: ClassVar[str] = "resistor"
    resistance: Resistance
    tolerance: Tolerance
    power: Power
    max_voltage: Voltage
    family: Text = ""
    series: Text = ""  # E series the value belongs to, when drawn from a family


class ResistorFamily(_PartBase):
    """Every preferred value of ``series`` from ``minimum`` to ``maximum`` with common ratings."""

    kind: ClassVar[str] = "resistor"
    series: SeriesName
    minimum: Resistance = Field(alias="min")
    maximum: Resistance = Field(alias="max")
    tolerance: Tolerance
    power: Power
    max_voltage: Voltage

    @model_validator(mode="after")
    def _range(self) -> ResistorFamily:
        if self.maximum < self.minimum:
            raise ValueError(f"max ({format_quantity(self.maximum, 'ohm')}) is below min "
                             f"({format_quantity(self.minimum, 'ohm')})")
        if not eseries.values_between(self.minimum, self.maximum, self.series):
            raise ValueError(f"no {self.series} value lies between min and max")
        return self

    def values(self) -> list[float]:
        """Every resistance the family offers, ohm, ascending."""
        return eseries.values_between(self.minimum, self.maximum, self.series)

    def offers(self, resistance: float) -> bool:
        lo = self.minimum * (1 - eseries.REL_TOL)
        hi = self.maximum * (1 + eseries.REL_TOL)
        return lo <= resistance <= hi and eseries.is_preferred(resistance, self.series)

    def member(self, resistance: float) -> Resistor:
        """The family's part of value ``resistance`` (ValueError if it does not offer it)."""
        if not self.offers(resistance):
            raise ValueError(f"{self.id} does not offer {format_quantity(resistance, 'ohm')}")
        value = eseries.preferred(resistance, self.series, "nearest")
        return Resistor(
            id=f"{self.id}-{eseries.value_code(value)}",
            description=(f"{self.description}, " if self.description else "")
            + format_quantity(value, "ohm"),
            price=self.price,
            notes=self.notes,
            resistance=value,
            tolerance=self.tolerance,
            power=self.power,
            max_voltage=self.max_voltage,
            family=self.id,
            series=self.series,
        )


class Transistor(_PartBase):
    kind: ClassVar[str] = "transistor"
    polarity: _choice("npn", "pnp") = "npn"
    v_ceo: Voltage
    i_c_max: Current
    p_tot: Power  # as rated by the maker (usually case at 25 degC)
    h_fe_min: Number
    v_be: Voltage
    t_j_max_c: Temperature = Field(alias="t_j_max")
    r_theta_jc: ThermalResistance
    r_theta_ja: ThermalResistance


class Regulator(_PartBase):
    """Three-terminal linear regulator. Voltages are magnitudes; ``polarity`` gives the sign."""

    kind: ClassVar[str] = "regulator"
    type: _choice("fixed", "adjustable") = Field(alias="kind")
    polarity: _choice("positive", "negative") = "positive"
    output_voltage: Voltage | None = None  # fixed parts
    reference_voltage: Voltage | None = None  # adjustable parts
    tolerance: Tolerance
    dropout: Voltage  # typical at 25 degC, as most datasheets headline it
    dropout_max: Voltage | None = None  # datasheet maximum over temperature; preferred when given
    i_max: Current
    i_q: CurrentOrZero | None = None
    adjust_current: CurrentOrZero | None = None
    adjust_current_max: CurrentOrZero | None = None  # datasheet maximum of the adjust-pin current
    min_load_current: CurrentOrZero | None = None
    ripple_rejection_db: Decibel = Field(alias="ripple_rejection")
    v_in_max: Voltage | None = None
    v_diff_max: Voltage | None = None  # input-output differential limit
    t_j_max_c: Temperature = Field(alias="t_j_max")
    r_theta_jc: ThermalResistance
    r_theta_ja: ThermalResistance

    @classmethod
    def _group_problems(cls, given: Mapping[str, Any]) -> list[str]:
        problems = []
        kind = given.get("kind")
        kind = kind.lower() if isinstance(kind, str) else kind
        if kind == "fixed":
            if "output_voltage" not in given:
                problems.append("a fixed regulator needs output_voltage")
            if "i_q" not in given:
                problems.append("a fixed regulator needs i_q (quiescent current)")
        elif kind == "adjustable":
            if "reference_voltage" not in given:
                problems.append("an adjustable regulator needs reference_voltage")
            if "adjust_current" not in given:
                problems.append("an adjustable regulator needs adjust_current")
        if "v_in_max" not in given and "v_diff_max" not in given:
            problems.append("give v_in_max or v_diff_max (input-output limit), or both")
        return problems


class Heatsink(_PartBase):
    kind: ClassVar[str] = "heatsink"
    r_theta_sa: ThermalResistance
    size: Text = ""
