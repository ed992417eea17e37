"""The approved-parts library: a TOML file of parts with their ratings, read into typed models.

File format (schema 1)
----------------------
::

    schema = 1

    [library]
    name = "Bench supplies, approved parts"
    source = "Datasheets in ../datasheets, checked 2024-05"   # where the numbers come from
    notes = "..."                                             # optional
    currency = "EUR"                                          # optional, unit of every price

    [[capacitor]]
    id = "DP-CAP-3300U35"
    capacitance = "3300 uF"
    tolerance = "20 %"
    voltage = "35 V"
    ripple_current = "2.2 A"
    ripple_temperature = "105 degC"
    tan_delta = 0.12              # or esr = "40 mohm"
    life = "5000 h"
    life_temperature = "105 degC"
    price = 0.45

One array of tables per kind of part: ``[[transformer]]``, ``[[diode]]``, ``[[bridge]]``,
``[[capacitor]]``, ``[[zener]]``, ``[[resistor]]``, ``[[transistor]]``, ``[[regulator]]``,
``[[fuse]]`` and ``[[heatsink]]``; the fields of each are the attributes of the model classes
below. Quantities are text with a unit ("35 V", "2.2 A", "20 %") or plain SI numbers; they
are stored as SI floats, except temperatures (kept in degrees Celsius, attribute names ending
in ``_c``) and ripple rejection (kept in dB, ``_db``). Lengths accept "mm", "cm" and "m".

Conventions that matter for the numbers:

* ``transformer.secondary_voltage`` is the rated RMS voltage at full rated load and rated
  primary voltage; for a center-tapped part it is the whole winding (2 x 12 V -> "24 V").
  ``regulation`` is (V_no_load - V_full_load) / V_full_load, the full-load convention most
  makers use ([CP-REGULATION], docs/references.md) - a figure divided by V_no_load must be
  converted.
* ``bridge.i_f_avg`` is the bridge's rated average *output* current, as bridge makers quote it;
  ``diode.i_f_avg`` is the rating of one diode. ``i_fsm`` is the single half-sine surge peak.
* ``zener.power`` is the rated power up to ``power_reference_temperature`` of the
  ``power_reference`` point ("lead" or "ambient"), and ``r_theta`` is the thermal resistance
  from the junction to that point, so the allowed power above it is (t_j_max - T) / r_theta.
  A lead-rated part's lead runs above ambient: ``r_theta_la`` (lead to ambient as mounted)
  gives the path, else the requirements file's [output.zener] lead_to_ambient is used.
* ``regulator.dropout`` is the typical figure; ``dropout_max`` the datasheet maximum, used
  when given (else the file's allowance is added to the typical figure).
* A ``[[resistor]]`` table is either one part (``resistance``) or a family (``series``, ``min``,
  ``max``): a family stands for every preferred value of its IEC 60063 series from min to max.
  A member's id is the family id, "-" and the value code, e.g. "DP-RES-E24-0W25-4K7".
* ``capacitor.life`` is the rated endurance at ``life_temperature`` (e.g. "5000 h"); a plain
  number is seconds, like every other SI number.
* ``price`` is a plain number in the library's currency; a part without a price is chosen only
  when no priced part fits.

Every problem in a file is reported at once in a :class:`~docgen.errors.SpecError` whose
locations are paths such as ``capacitor[3].voltage`` (index counted from 0 within its kind, in
file order); unknown keys get a "did you mean" suggestion.
"""

from __future__ import annotations

import difflib
import hashlib
import math
import re
from collections.abc import Iterator, Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Annotated, Any, ClassVar

from pydantic import BaseModel, BeforeValidator, ConfigDict, Field, ValidationError, model_validator

from ..errors import SpecError, SpecIssue
from ..textfile import decode, parse_toml, read_bounded
from ..units import as_float, expected_text, format_quantity, parse_quantity, show_raw
from . import eseries

__all__ = [
    "SCHEMA",
    "KINDS",
    "Part",
    "Transformer",
    "Diode",
    "Bridge",
    "Capacitor",
    "Zener",
    "Resistor",
    "ResistorFamily",
    "Transistor",
    "Regulator",
    "Fuse",
    "Heatsink",
    "LibraryInfo",
    "PartsLibrary",
    "load_library",
    "parse_library",
]

SCHEMA = 1
MAX_BYTES = 2_000_000  # a library of a few thousand parts; far larger is a mistake

# --------------------------------------------------------------------------------------------
# Field readers. Each is a callable object used as a pydantic BeforeValidator; ``expects`` is
# the text shown when the field is missing.


class _Reader:
    expects = "a value"

    def __call__(self, raw: Any) -> Any:  # pragma: no cover - overridden
        raise NotImplementedError


class _Quantity(_Reader):
    """Quantity text or SI number -> SI float, with range checks in the field's own unit."""

    def __init__(self, dimension: str, *, sign: str = "positive", unit: str | None = None,
                 low: float | None = None, high: float | None = None, hint: str = "") -> None:
        self.dimension = dimension
        self.sign = sign  # "positive" (> 0), "non-negative" (>= 0) or "any"
        self.unit = unit  # display unit for messages
        self.low = low
        self.high = high
        self.hint = hint
        self.expects = expected_text(dimension)

    def _show(self, value: float) -> str:
        if self.unit == "1/K":
            return f"{value * 100:g} %/K"
        return format_quantity(value, self.unit) if self.unit is not None else f"{value:g}"

    def __call__(self, raw: Any) -> float:
        value = parse_quantity(raw, self.dimension)  # UnitError is a ValueError
        what = self.dimension.replace("_", " ")
        if self.sign == "positive" and not value > 0:
            raise ValueError(f"expected a positive {what}, got {show_raw(raw)}{self.hint}")
        if self.sign == "non-negative" and value < 0:
            raise ValueError(f"expected zero or a positive {what}, got {show_raw(raw)}{self.hint}")
        if self.low is not None and value < self.low:
            raise ValueError(f"expected at least {self._show(self.low)}, "
                             f"got {show_raw(raw)}{self.hint}")
        if self.high is not None and value > self.high:
            raise ValueError(f"expected at most {self._show(self.high)}, "
                             f"got {show_raw(raw)}{self.hint}")
        return value


class _Fraction(_Reader):
    """A ratio such as "20 %" or 0.2, in [0, high]; catches 20 meant as 20 %."""

    def __init__(self, high: float = 1.0, *, positive: bool = False) -> None:
        self.high = high
        self.positive = positive
        self.expects = expected_text("ratio")

    def __call__(self, raw: Any) -> float:
        value = parse_quantity(raw, "ratio")
        if value < 0 or (self.positive and value == 0):
            raise ValueError(f"expected a {'positive' if self.positive else 'non-negative'} "
                             f"fraction such as \"10 %\" or 0.1, got {show_raw(raw)}")
        if value > self.high:
            hint = (f"; if {show_raw(raw)} is meant in percent, write \"{raw} %\""
                    if isinstance(raw, (int, float)) and not isinstance(raw, bool) else "")
            raise ValueError(f"expected at most {self.high * 100:g} %, got {show_raw(raw)}{hint}")
        return value


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


class _Decibel(_Reader):
    """Decibels as "80 dB" or a plain number of dB (kept in dB)."""

    expects = '"80 dB" or a number of decibels'

    def __call__(self, raw: Any) -> float:
        if isinstance(raw, bool):
            raise ValueError(f"expected {self.expects}, got a true/false value")
        if isinstance(raw, (int, float)):
            value = as_float(raw)
        elif isinstance(raw, str):
            m = re.fullmatch(r"[ \t]*([-+]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+))[ \t]*(dB)?[ \t]*",
                             raw)
            if not m:
                raise ValueError(f"expected {self.expects}, got {show_raw(raw)}")
            value = float(m.group(1))
        else:
            raise ValueError(f"expected {self.expects}, got {type(raw).__name__}")
        if not (math.isfinite(value) and value > 0):
            raise ValueError(f"expected a positive number of dB, got {show_raw(raw)}")
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


def _show_raw(raw: Any) -> str:
    if isinstance(raw, bool):
        return "true" if raw else "false"
    if isinstance(raw, (dict, list)):
        return "a table" if isinstance(raw, dict) else "a list"
    return show_raw(raw)


def _q(dimension: str, unit: str | None = None, **kw: Any) -> Any:
    return Annotated[float, BeforeValidator(_Quantity(dimension, unit=unit, **kw))]


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
Tolerance = Annotated[float, BeforeValidator(_Fraction(0.5, positive=True))]
Regulation = Annotated[float, BeforeValidator(_Fraction(2.0))]
TanDelta = Annotated[float, BeforeValidator(_Fraction(1.0, positive=True))]
Length = Annotated[float, BeforeValidator(_Length())]
Decibel = Annotated[float, BeforeValidator(_Decibel())]
Number = Annotated[float, BeforeValidator(_Number())]
Price = Annotated[float, BeforeValidator(_Price())]
Text = Annotated[str, BeforeValidator(_Text())]
PartId = Annotated[str, BeforeValidator(_Text(part_id=True))]
Flag = Annotated[bool, BeforeValidator(_Flag())]
SeriesName = Annotated[str, BeforeValidator(_Choice(*eseries.SERIES, case=False))]


def _choice(*choices: str, case: bool = False) -> Any:
    return Annotated[str, BeforeValidator(_Choice(*choices, case=case))]


# --------------------------------------------------------------------------------------------
# Part models


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
    def half_voltage(self) -> float:
        """RMS voltage of one half of a center-tapped winding (the whole winding otherwise)."""
        return self.secondary_voltage / 2 if self.center_tapped else self.secondary_voltage


class _Rectifier(_PartBase):
    v_rrm: Voltage
    i_f_avg: Current
    i_fsm: Current
    v_f: Voltage
    i2t: ChargeIntegral | None = None


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
    ripple_frequency: Frequency | None = None
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


# --------------------------------------------------------------------------------------------
# The library


@dataclass(frozen=True)
class PartsLibrary:
    """A validated parts library; every rating SI (temperatures degC)."""

    info: LibraryInfo
    path: str
    sha256: str  # of the file's bytes, so a build can tell the library changed
    transformers: tuple[Transformer, ...] = ()
    diodes: tuple[Diode, ...] = ()
    bridges: tuple[Bridge, ...] = ()
    capacitors: tuple[Capacitor, ...] = ()
    zeners: tuple[Zener, ...] = ()
    resistors: tuple[Resistor | ResistorFamily, ...] = ()
    transistors: tuple[Transistor, ...] = ()
    regulators: tuple[Regulator, ...] = ()
    fuses: tuple[Fuse, ...] = ()
    heatsinks: tuple[Heatsink, ...] = ()

    @property
    def name(self) -> str:
        return self.info.name

    def parts(self, kind: str) -> tuple[Part, ...]:
        """All parts of one kind ("capacitor", ...), in file order."""
        if kind not in _MODELS:
            raise ValueError(f"unknown part kind {kind!r}; expected one of {', '.join(KINDS)}")
        return getattr(self, _PLURAL[kind])

    def __iter__(self) -> Iterator[Part]:
        for kind in KINDS:
            yield from self.parts(kind)

    def get(self, part_id: str) -> Part:
        """The part with this id; a resistor family member id ("<family>-4K7") also works.

        Raises KeyError with a "did you mean" suggestion.
        """
        for part in self:
            if part.id == part_id:
                return part
        family_id, _, code = part_id.rpartition("-")
        for part in self.resistors:
            if isinstance(part, ResistorFamily) and part.id == family_id:
                value = _value_from_code(code)
                if value is not None and part.offers(value):
                    return part.member(value)
        ids = [p.id for p in self]
        close = difflib.get_close_matches(part_id, ids, n=1)
        hint = f"; did you mean {close[0]!r}?" if close else ""
        raise KeyError(f"no part {part_id!r} in library {self.info.name!r}{hint}")


_PLURAL = {
    "transformer": "transformers",
    "diode": "diodes",
    "bridge": "bridges",
    "capacitor": "capacitors",
    "zener": "zeners",
    "resistor": "resistors",
    "transistor": "transistors",
    "regulator": "regulators",
    "fuse": "fuses",
    "heatsink": "heatsinks",
}


def _value_from_code(code: str) -> float | None:
    m = re.fullmatch(r"([0-9]*)([RKMG])([0-9]*)", code)
    if not m or not (m.group(1) or m.group(3)):
        return None
    factor = {"R": 1.0, "K": 1e3, "M": 1e6, "G": 1e9}[m.group(2)]
    return float(f"{m.group(1) or '0'}.{m.group(3) or '0'}") * factor


# --------------------------------------------------------------------------------------------
# Loading

_TOP_KEYS = ("schema", "library", *KINDS)


def _did_you_mean(word: str, choices: list[str] | tuple[str, ...]) -> str:
    close = difflib.get_close_matches(word, list(choices), n=1, cutoff=0.6)
    return f"; did you mean {close[0]!r}?" if close else ""


def _field_keys(model: type[BaseModel]) -> list[str]:
    return [info.alias or name for name, info in model.model_fields.items()]


def _expects(model: type[BaseModel], key: str) -> str:
    for name, info in model.model_fields.items():
        if (info.alias or name) == key:
            for meta in info.metadata:
                func = getattr(meta, "func", None)
                if isinstance(func, _Reader):
                    return func.expects
    return "a value"


def _path(prefix: str, loc: tuple[Any, ...]) -> str:
    text = prefix
    for item in loc:
        if isinstance(item, int):
            text += f"[{item}]"
        else:
            text = f"{text}.{item}" if text else str(item)
    return text


def _issues_from(error: ValidationError, model: type[BaseModel], prefix: str,
                 part_id: str | None) -> list[SpecIssue]:
    issues = []
    suffix = f" (part {part_id!r})" if part_id else ""
    for err in error.errors(include_url=False):
        loc = tuple(err["loc"])
        kind = err["type"]
        if kind == "value_error":
            message = str(err["ctx"]["error"]) if "ctx" in err else err["msg"]
        elif kind == "missing":
            key = str(loc[-1]) if loc else ""
            message = f"missing required field; expected {_expects(model, key)}"
        elif kind == "extra_forbidden":
            key = str(loc[-1]) if loc else ""
            hint = _did_you_mean(key, _field_keys(model))
            message = f"unknown field {key!r}" + (
                hint or f"; known fields: {', '.join(_field_keys(model))}")
        else:
            message = err["msg"]
        issues.append(SpecIssue(_path(prefix, loc), message + suffix))
    return issues


def _resistor_model(raw: Mapping[str, Any]) -> type[_PartBase]:
    return ResistorFamily if any(k in raw for k in ("series", "min", "max")) else Resistor


def parse_library(data: bytes | str, path: str | Path = "<parts library>") -> PartsLibrary:
    """Read a parts library from the file's bytes (or text); ``path`` is used in messages.

    Raises SpecError listing every problem found.
    """
    raw_bytes = data.encode("utf-8") if isinstance(data, str) else bytes(data)
    where = str(path)
    digest = hashlib.sha256(raw_bytes).hexdigest()
    if len(raw_bytes) > MAX_BYTES:
        raise SpecError(where, [SpecIssue("", f"file is {len(raw_bytes)} bytes; expected at most "
                                              f"{MAX_BYTES}")])
    doc = parse_toml(where, decode(where, raw_bytes))

    issues: list[SpecIssue] = []

    schema = doc.get("schema")
    if "schema" not in doc:
        issues.append(SpecIssue("schema", f"missing; expected schema = {SCHEMA} at the top"))
    elif isinstance(schema, bool) or schema != SCHEMA:
        issues.append(SpecIssue("schema", f"expected {SCHEMA} (the only format this docgen "
                                          f"reads), got {_show_raw(schema)}"))

    info: LibraryInfo | None = None
    header = doc.get("library")
    if header is None:
        issues.append(SpecIssue("library", 'missing; expected a [library] table with name = "..."'))
    elif not isinstance(header, dict):
        issues.append(SpecIssue("library", 'expected a [library] table with name = "..."'))
    else:
        try:
            info = LibraryInfo.model_validate(header)
        except ValidationError as exc:
            issues.extend(_issues_from(exc, LibraryInfo, "library", None))

    for key in doc:
        if key not in _TOP_KEYS:
            hint = _did_you_mean(key, _TOP_KEYS)
            issues.append(SpecIssue(key, "unknown table or key" + (
                hint or f"; known: {', '.join(_TOP_KEYS)}")))

    parts: dict[str, list[Any]] = {kind: [] for kind in KINDS}
    first_seen: dict[str, str] = {}
    for kind in [key for key in doc if key in _MODELS]:  # file order
        tables = doc[kind]
        if not isinstance(tables, list):
            issues.append(SpecIssue(kind, f"expected an array of tables written [[{kind}]], "
                                          f"got {_show_raw(tables)}"))
            continue
        for index, table in enumerate(tables):
            prefix = f"{kind}[{index}]"
            if not isinstance(table, dict):
                issues.append(SpecIssue(prefix, f"expected a table written [[{kind}]], "
                                                f"got {_show_raw(table)}"))
                continue
            part_id = table.get("id") if isinstance(table.get("id"), str) else None
            model = _MODELS[kind]
            if kind == "resistor":
                model = _resistor_model(table)
                if model is ResistorFamily and "resistance" in table:
                    issues.append(SpecIssue(
                        f"{prefix}.resistance",
                        "a [[resistor]] is either one part (resistance) or a family (series, "
                        "min, max), not both" + (f" (part {part_id!r})" if part_id else "")))
                    continue
            try:
                part = model.model_validate(table)
            except ValidationError as exc:
                found = _issues_from(exc, model, prefix, part_id)
                if all(issue.location != prefix for issue in found):
                    # Field errors stop pydantic before the cross-field rules; check them here
                    # on the raw keys so they are reported in the same pass.
                    suffix = f" (part {part_id!r})" if part_id else ""
                    found += [SpecIssue(prefix, problem + suffix)
                              for problem in model._group_problems(table)]
                issues.extend(found)
            else:
                parts[kind].append(part)
            if part_id is not None:
                if part_id in first_seen:
                    issues.append(SpecIssue(f"{prefix}.id", f"duplicate id {part_id!r}; first "
                                                            f"used at {first_seen[part_id]}.id"))
                else:
                    first_seen[part_id] = prefix

    if issues:
        raise SpecError(where, issues)
    assert info is not None
    return PartsLibrary(
        info=info,
        path=where,
        sha256=digest,
        **{_PLURAL[kind]: tuple(items) for kind, items in parts.items()},
    )


def load_library(path: str | Path) -> PartsLibrary:
    """Read and validate the parts library at ``path``. Raises SpecError listing every problem."""
    try:
        data = read_bounded(Path(path), MAX_BYTES, "a parts library .toml file")
    except SpecError as exc:
        issues = [SpecIssue(i.location, f"cannot read the parts library: {i.message}")
                  for i in exc.issues]
        raise SpecError(exc.path, issues) from None
    return parse_library(data, path)

