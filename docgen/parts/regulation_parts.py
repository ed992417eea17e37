"""The part models of the parts library: one pydantic model per kind of part, with the
ratings docgen selects on (read by the readers of docgen.parts.readers)."""

from __future__ import annotations

import math
from collections.abc import Mapping
from typing import Any, ClassVar

from pydantic import BaseModel, ConfigDict, Field, model_validator

from ..units import format_quantity
from . import ambient, eseries, ripple
from .readers import (
    ApparentPower,
    Capacitance,
    ChargeIntegral,
    Current,
    CurrentOrZero,
    Decibel,
    Flag,
    Frequency,
    Length,
    MultiplierTable,
    Number,
    PartId,
    Power,
    Price,
    Regulation,
    Resistance,
    SeriesName,
    TanDelta,
    TempCo,
    Temperature,
    Text,
    ThermalResistance,
    Time,
    Tolerance,
    Voltage,
    _choice,
)

# --------------------------------------------------------------------------------------------
# Field readers. Each is a callable object used as a pydantic BeforeValidator; ``expects`` is
# the text shown when the field is missing.


class _Model(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, populate_by_name=True)


class _PartBase(_Model):
    kind: ClassVar[str] = ""
    id: PartId
    description: Text = ""
    price: Price | None = None
    notes: Text = ""

    @classmethod
    def _group_problems(cls, given: Mapping[str, Any]) -> list[str]:
        """Rules over several fields ("give esr or tan_delta"), checked on the file's keys
        (``given``: key -> value of every field present), so they are reported together with
        problems in single fields."""
        return []

    @model_validator(mode="after")
    def _check_groups(self) -> _PartBase:
        given = {info.alias or name: getattr(self, name)
                 for name, info in type(self).model_fields.items()
                 if getattr(self, name) is not None}
        problems = self._group_problems(given)
        if problems:
            raise ValueError("; ".join(problems))
        return self


class Transformer(_PartBase):
    """Mains transformer. Secondary figures are RMS at full rated load and rated primary."""

    kind: ClassVar[str] = "transformer"
    secondary_voltage: Voltage  # whole winding when center_tapped
    center_tapped: Flag = False
    va: ApparentPower
    regulation: Regulation | None = None  # (V_NL - V_FL) / V_FL at full load
    winding_resistance: Resistance | None = None  # secondary (whole winding), primary referred in
    primary_voltage: Voltage | None = None
    # ambient the VA rating holds at (25 degC when absent) and the insulation's thermal class
    rated_ambient_c: Temperature | None = Field(None, alias="rated_ambient")
    insulation_class: _choice(*ambient.CLASSES, case=False) | None = None
    size: Text = ""

    @classmethod
    def _group_problems(cls, given: Mapping[str, Any]) -> list[str]:
        if "regulation" not in given and "winding_resistance" not in given:
            return ['give regulation (e.g. "20 %") or winding_resistance (e.g. "2.2 ohm"), '
                    "or both"]
        return []

    @property
    def rated_current(self) -> float:
        """Rated RMS secondary current of the (whole) winding, A: va / secondary_voltage."""
        return self.va / self.secondary_voltage

    @property
    def no_load_voltage(self) -> float | None:
        """Secondary RMS voltage at no load, V_FL * (1 + regulation), or None if not stated."""
        return None if self.regulation is None else self.secondary_voltage * (1 + self.regulation)

    @property
    def rated_ambient(self) -> float:
        """Ambient of the VA rating, degC (IEC 61558-1's 25 degC when not stated)."""
        return (self.rated_ambient_c if self.rated_ambient_c is not None
                else ambient.DEFAULT_RATED_AMBIENT)

    @property
    def class_temperature(self) -> float:
        """Winding temperature limit of the insulation class, degC (class A when not stated)."""
        return ambient.CLASS_TEMPERATURE[self.insulation_class or ambient.DEFAULT_CLASS]

    def ambient_factor(self, t_ambient: float) -> float:
        """Allowed secondary current per rated current at ``t_ambient`` (docgen.parts.ambient)."""
        return ambient.ambient_factor(t_ambient, self.rated_ambient, self.class_temperature)

    @property
    def half_voltage(self) -> float:
        """RMS voltage of one half of a center-tapped winding (the whole winding otherwise)."""
        return self.secondary_voltage / 2 if self.center_tapped else self.secondary_voltage


class _Rectifier(_PartBase):
    """Ratings, and the forward characteristic the waveform engine's diode is fitted to:
    ``v_f`` per diode at ``v_f_current`` (the average current rating when absent), an optional
    second point (``v_f2`` at ``v_f2_current``) or ``series_resistance``, and the junction
    ``technology`` (silicon or schottky) that sets the temperature law."""

    v_rrm: Voltage
    i_f_avg: Current
    i_fsm: Current
    v_f: Voltage
    i2t: ChargeIntegral | None = None
    v_f_current: Current | None = None
    v_f2: Voltage | None = None
    v_f2_current: Current | None = None
    series_resistance: Resistance | None = None
    technology: _choice("silicon", "schottky") | None = None

    @classmethod
    def _group_problems(cls, given: Mapping[str, Any]) -> list[str]:
        if ("v_f2" in given) != ("v_f2_current" in given):
            return ["give v_f2 and v_f2_current together (a second forward point), or neither"]
        if "v_f2" in given:
            v1, v2 = given["v_f"], given["v_f2"]
            i1 = given.get("v_f_current", given["i_f_avg"])
            i2 = given["v_f2_current"]
            if i1 == i2 or (v2 - v1) * (i2 - i1) <= 0:
                return ["the forward voltage must rise with the current: v_f2 at v_f2_current "
                        f"against v_f at {i1:g} A"]
        rs = given.get("series_resistance")
        if rs is not None and rs * given.get("v_f_current", given["i_f_avg"]) >= given["v_f"]:
            return ["series_resistance drops more than v_f at its current"]
        return []


class Diode(_Rectifier):
    """One rectifier diode; ``i_f_avg`` is its own average forward current rating."""

    kind: ClassVar[str] = "diode"


class Bridge(_Rectifier):
    """Bridge rectifier; ``i_f_avg`` is the rated average output current, ``v_rrm`` per leg."""

    kind: ClassVar[str] = "bridge"


class Capacitor(_PartBase):
    """Aluminium electrolytic capacitor (reservoir)."""

    kind: ClassVar[str] = "capacitor"
    capacitance: Capacitance
    tolerance: Tolerance
    voltage: Voltage
    ripple_current: Current  # RMS, at ripple_temperature_c and ripple_frequency
    ripple_temperature_c: Temperature = Field(alias="ripple_temperature")
    ripple_frequency: Frequency | None = None  # of the quoted rating; 100/120 Hz when absent
    ripple_multipliers: MultiplierTable | None = None  # the maker's table; typical when absent
    esr: Resistance | None = None
    tan_delta: TanDelta | None = None
    life: Time
    life_temperature_c: Temperature = Field(alias="life_temperature")
    diameter: Length | None = None
    height: Length | None = None

    @classmethod
    def _group_problems(cls, given: Mapping[str, Any]) -> list[str]:
        if "esr" not in given and "tan_delta" not in given:
            return ['give esr (e.g. "40 mohm") or tan_delta (e.g. 0.12), or both']
        return []

    @property
    def quoted_frequency(self) -> float:
        """Frequency of the quoted ripple rating, Hz (100/120 Hz when the file does not say)."""
        return (self.ripple_frequency if self.ripple_frequency is not None
                else ripple.DEFAULT_QUOTED_FREQUENCY)

    def ripple_multiplier(self, frequency: float) -> float:
        """The frequency multiplier at ``frequency`` (Hz): the part's table, else the typical
        one (docgen.parts.ripple; from memory, typical of makers' data)."""
        return ripple.multiplier(frequency, self.ripple_multipliers or ripple.TYPICAL_MULTIPLIERS)

    def ripple_current_at(self, frequency: float) -> float:
        """Ripple-current rating at ``frequency`` (Hz): I_quoted M(f) / M(f_quoted)."""
        return (self.ripple_current * self.ripple_multiplier(frequency)
                / self.ripple_multiplier(self.quoted_frequency))

    def esr_at(self, frequency: float) -> float:
        """ESR in ohm at ``frequency`` (Hz): the stated esr, else tan_delta / (2 pi f C).

        The tan-delta relation is common practice, no source ([CP-ESR]).
        """
        if self.esr is not None:
            return self.esr
        assert self.tan_delta is not None
        return self.tan_delta / (2 * math.pi * frequency * self.capacitance)


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


class Fuse(_PartBase):
    kind: ClassVar[str] = "fuse"
    current: Current  # rated current I_N
    characteristic: _choice("FF", "F", "M", "T", "TT", case=True)  # IEC 60127 speed letters
    voltage: Voltage
    i2t: ChargeIntegral  # melting (pre-arcing) I2t
    breaking_capacity: Current | None = None
    size: Text = ""


class Heatsink(_PartBase):
    kind: ClassVar[str] = "heatsink"
    r_theta_sa: ThermalResistance
    size: Text = ""


Part = (Transformer | Diode | Bridge | Capacitor | Zener | Resistor | ResistorFamily | Transistor
        | Regulator | Fuse | Heatsink)

_MODELS: dict[str, type[_PartBase]] = {
    "transformer": Transformer,
    "diode": Diode,
    "bridge": Bridge,
    "capacitor": Capacitor,
    "zener": Zener,
    "resistor": Resistor,
    "transistor": Transistor,
    "regulator": Regulator,
    "fuse": Fuse,
    "heatsink": Heatsink,
}
KINDS: tuple[str, ...] = tuple(_MODELS)


class LibraryInfo(_Model):
    name: Text
    source: Text = ""
    notes: Text = ""
    currency: Text = ""
