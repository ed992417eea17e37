"""The mains and environment sections: the conditions the supply runs in."""

from __future__ import annotations

from typing import Any, Literal

from pydantic import Field, model_validator

from .quantities import (
    Duration,
    Fraction,
    Frequency,
    Temperature,
    Voltage,
)
from .section import Section, q

# Common nominal supplies: (nominal V, frequency Hz, low tolerance, high tolerance, basis).
MAINS_PRESETS: dict[str, tuple[float, float, float, float, str]] = {
    "230V-50Hz": (230.0, 50.0, 0.10, 0.10, "IEC 60038:2009, 230 V +/-10 %"),
    "230V-60Hz": (230.0, 60.0, 0.10, 0.10, "IEC 60038:2009, 230 V +/-10 %"),
    "240V-50Hz": (240.0, 50.0, 0.10, 0.10, "IEC 60038:2009 (240 V systems), +/-10 %"),
    "220V-60Hz": (220.0, 60.0, 0.10, 0.10, "220 V systems, +/-10 % (common practice)"),
    "120V-60Hz": (120.0, 60.0, 0.10, 0.06, "ANSI C84.1 (Range A 114-126 V), low side widened "
                  "to -10 % for utilisation drop (common practice)"),
    "110V-60Hz": (110.0, 60.0, 0.10, 0.10, "110 V systems, +/-10 % (common practice)"),
    "100V-50Hz": (100.0, 50.0, 0.10, 0.10, "BSI World Electricity Supplies 1989: Japan east, "
                  "+/-10 %"),
    "100V-60Hz": (100.0, 60.0, 0.10, 0.10, "BSI World Electricity Supplies 1989: Japan west, "
                  "+/-10 %"),
}


class Mains(Section):
    preset: Literal[tuple(MAINS_PRESETS)] | None = Field(  # type: ignore[valid-type]
        default=None,
        description="A common supply that fills nominal, frequency and tolerances: "
        + ", ".join(MAINS_PRESETS) + ". Keys given in the file override it.",
    )
    nominal: Voltage = q(230.0, "V", "Nominal mains RMS voltage.", "IEC 60038 nominal")
    frequency: Frequency = q(50.0, "Hz", "Mains frequency.", "IEC 60038")
    also_frequency: Frequency | None = q(
        None, "Hz", "A second mains frequency the product must also run from (e.g. 60 Hz for a "
        "50 Hz design); the design is sized at the lower of the two.",
    )
    tolerance_low: Fraction = q(
        0.10, "%", "Low-line tolerance below nominal.", "IEC 60038 supply range +/-10 %"
    )
    tolerance_high: Fraction = q(
        0.10, "%", "High-line tolerance above nominal.", "IEC 60038 supply range +/-10 %"
    )

    @model_validator(mode="before")
    @classmethod
    def _apply_preset(cls, data: Any) -> Any:
        if isinstance(data, dict) and isinstance(data.get("preset"), str) \
                and data["preset"] in MAINS_PRESETS:
            nominal, freq, lo, hi, _ = MAINS_PRESETS[data["preset"]]
            filled = {"nominal": nominal, "frequency": freq, "tolerance_low": lo,
                      "tolerance_high": hi}
            return {**filled, **data}
        return data

    def origin(self, key: str) -> tuple[bool, str]:
        """(defaulted, source) of a field, telling preset values from the file's own."""
        keys = ("nominal", "frequency", "tolerance_low", "tolerance_high")
        if self.preset and key in keys:
            preset_value = MAINS_PRESETS[self.preset][keys.index(key)]
            if getattr(self, key) == preset_value:
                return False, f"mains preset {self.preset}: {MAINS_PRESETS[self.preset][4]}"
            return False, ""
        return key not in self.model_fields_set, ""

    @model_validator(mode="after")
    def _tolerances(self) -> Mains:
        if self.tolerance_low >= 0.5 or self.tolerance_high >= 0.5:
            raise ValueError("mains tolerances must be below 50 %")
        return self


class Environment(Section):
    ambient_min: Temperature = q(0.0, "degC", "Lowest ambient temperature.", "common practice")
    ambient_max: Temperature = q(40.0, "degC", "Highest ambient temperature around the parts.",
                                 "common practice")

    required_life: Duration | None = q(
        None, "s", "Required reservoir-capacitor life at the hottest ambient (e.g. "
        "\"50000 h\"); checked when the capacitor's rated life is known.",
    )

    @model_validator(mode="after")
    def _order(self) -> Environment:
        if self.ambient_min > self.ambient_max:
            raise ValueError("ambient_min is above ambient_max")
        if not -60.0 <= self.ambient_min <= 150.0 or not -60.0 <= self.ambient_max <= 150.0:
            raise ValueError("ambient temperatures must lie between -60 degC and 150 degC")
        return self
