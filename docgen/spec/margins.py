"""The margins, protection and insulation sections: the limits a design is held to."""

from __future__ import annotations

from typing import Literal

from pydantic import Field, model_validator

from .quantities import (
    Duration,
    Fraction,
    PositiveFraction,
    Temperature,
    Voltage,
)
from .section import Section, q


class Margins(Section):
    junction_max: Temperature = q(
        110.0, "degC", "Highest junction temperature the design may reach (below the maker's "
        "absolute limit).", "common practice: 100-110 degC for margin",
    )
    capacitor_voltage_derating: PositiveFraction = q(
        0.80, "%", "Highest capacitor voltage as a fraction of its rating.", "common practice"
    )
    zener_power_derating: PositiveFraction = q(
        0.50, "%", "Highest zener dissipation as a fraction of its rating.", "common practice"
    )
    resistor_power_derating: PositiveFraction = q(
        0.50, "%", "Highest resistor dissipation as a fraction of its rating.", "common practice"
    )
    diode_voltage_derating: PositiveFraction = q(
        0.50, "%", "Highest reverse voltage as a fraction of V_RRM (V_RRM >= 2 x PIV).",
        "common practice: V_RRM 1.5-2 x PIV for mains transients",
    )
    diode_current_derating: PositiveFraction = q(
        0.50, "%", "Average diode current as a fraction of I_F(AV) (rating >= 2 x I_DC covers "
        "the turn-on surge).", "common practice",
    )
    secondary_rms_factor: PositiveFraction | None = q(
        None, "", "Secondary RMS current (per conducting winding) over DC current, for the "
        "first VA estimate before the waveform engine verifies it; by topology when absent: "
        "bridge 1.8, center-tap 1.2 per half, half-wave 3.6.",
        "common practice: upper end of makers' selection tables",
    )
    warn_band: Fraction = q(
        0.05, "%", "A check within this fraction of its limit is reported as a warning.",
        "common practice",
    )

    @model_validator(mode="after")
    def _bounds(self) -> Margins:
        for name in ("capacitor_voltage_derating", "zener_power_derating",
                     "resistor_power_derating", "diode_voltage_derating",
                     "diode_current_derating"):
            if getattr(self, name) > 1.0:
                raise ValueError(f"{name} must not exceed 100 %")
        if self.warn_band >= 1.0:
            raise ValueError("warn_band must be below 100 %")
        return self


class Protection(Section):
    fuse_factor: PositiveFraction = q(
        1.5, "", "Primary fuse rating over the transformer's rated primary current (use 2-2.5 "
        "for toroids or large capacitors).", "common practice; P. Horowitz, W. Hill, The Art of "
        "Electronics (fuse at least 50 % above the true RMS line current)",
    )
    fuse_part: str = Field(default="", max_length=80,
                           description="Library part id of a fixed primary fuse.")
    pulse_derating: PositiveFraction = q(
        0.30, "%", "Largest switch-on I2t as a fraction of the fuse's melting I2t (repeated "
        "switch-on ages the fuse element).", "common practice (from memory): at most about "
        "20-50 % for tens of thousands of switchings",
    )
    bleeder: bool | None = Field(
        default=None,
        description="Fit a bleeder resistor across the reservoir: true, false, or absent for "
        "automatic (fitted when the reservoir can exceed safe_voltage).",
    )
    safe_voltage: Voltage = q(60.0, "V", "Voltage the reservoir must fall below after switch-off.",
                              "IEC 60204-1 residual voltage: 60 V within 5 s (secondary copy)")
    discharge_time: Duration = q(5.0, "s", "Time allowed to reach safe_voltage.",
                                 "IEC 60204-1 residual voltage: 60 V within 5 s (secondary copy)")

    @model_validator(mode="after")
    def _pulse(self) -> Protection:
        if self.pulse_derating > 1.0:
            raise ValueError("pulse_derating must not exceed 100 %")
        return self


class Insulation(Section):
    """What the mains-to-output insulation is stated against (not computed: see the document)."""

    equipment_class: Literal["I", "II"] = Field(
        default="II",
        description="Protection class of the equipment: \"I\" (accessible metal on protective "
        "earth) or \"II\" (double or reinforced insulation, no reliance on earth).",
        json_schema_extra={"unit": "", "default_source": "common practice: class II, the "
                           "stricter barrier, when the enclosure is not known"},
    )
    overvoltage_category: Literal["I", "II", "III", "IV"] = Field(
        default="II",
        description="Overvoltage category of the mains connection (IEC 60664-1).",
        json_schema_extra={"unit": "", "default_source": "common practice: OVC II for "
                           "equipment plugged into a building's socket outlets"},
    )
    pollution_degree: int = Field(
        default=2, ge=1, le=4,
        description="Pollution degree of the environment around the insulation (IEC 60664-1).",
        json_schema_extra={"unit": "", "default_source": "common practice: PD 2 for office and "
                           "household equipment"},
    )
    material_group: Literal["I", "II", "IIIa", "IIIb"] = Field(
        default="IIIb",
        description="Material group of the insulation (by comparative tracking index) for "
        "creepage distances.",
        json_schema_extra={"unit": "", "default_source": "common practice: IIIb when the "
                           "board material's CTI is not known"},
    )
