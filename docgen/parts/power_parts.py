"""Part models of the power path: transformer, diodes and bridges, reservoir capacitor, fuse."""

from __future__ import annotations

import math
from collections.abc import Mapping
from typing import Any, ClassVar

from pydantic import Field

from . import ambient, ripple
from .part_base import _PartBase
from .readers import (
    ApparentPower,
    Capacitance,
    ChargeIntegral,
    Current,
    Flag,
    Frequency,
    Length,
    MultiplierTable,
    Regulation,
    Resistance,
    TanDelta,
    Temperature,
    Text,
    Time,
    Tolerance,
    Voltage,
    _choice,
)


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


class Fuse(_PartBase):
    kind: ClassVar[str] = "fuse"
    current: Current  # rated current I_N
    characteristic: _choice("FF", "F", "M", "T", "TT", case=True)  # IEC 60127 speed letters
    voltage: Voltage
    i2t: ChargeIntegral  # melting (pre-arcing) I2t
    breaking_capacity: Current | None = None
    size: Text = ""
