"""The output section: the rail, its regulator and the zener, three-terminal regulator and pass
transistor sub-tables."""

from __future__ import annotations

from typing import Literal

from pydantic import Field, ValidationInfo, field_validator

from ..regulators import KINDS as REGULATOR_KINDS
from .quantities import (
    Current,
    Decibels,
    Duration,
    Fraction,
    PositiveCurrent,
    PositiveFraction,
    Power,
    Resistance,
    Tempco,
    Temperature,
    ThermalResistance,
    Voltage,
    VoltageTempco,
)
from .section import NonNegVoltage, Section, q


class Zener(Section):
    voltage: Voltage | None = q(
        None, "V", "Zener voltage. When absent: the standard (E24, IEC 60063) value nearest the "
        "output voltage (zener kind) or the output plus V_BE (follower) that keeps the output "
        "window at the zener's tolerance and temperature extremes; a value written here is "
        "used as written.")
    tolerance: Fraction = q(0.05, "%", "Zener voltage tolerance.", "common practice (+/-5 % grade)")
    power: Power | None = q(None, "W", "Fixed part: rated zener power (sized when absent).")
    knee_current: PositiveCurrent = q(
        1e-3, "A", "Knee current I_ZK below which the zener stops regulating.",
        "common practice for small zeners",
    )
    min_current_factor: float = Field(
        default=5.0, ge=1.0, le=100.0,
        description="Minimum zener current as a multiple of the knee current.",
        json_schema_extra={"unit": "", "default_source": "Sedra & Smith zener exercise uses 5 x I_ZK"},
    )
    test_current: PositiveCurrent = q(
        0.02, "A", "Test current at which the zener voltage is specified.",
        "common practice for small zeners",
    )
    dynamic_resistance: Resistance = q(
        10.0, "ohm", "Dynamic resistance r_z at the operating current.",
        "common practice for small zeners",
    )
    tempco: Tempco = q(
        0.0006, "%/degC", "Temperature coefficient of the zener voltage.",
        "common practice for zeners above about 6 V",
    )
    t_j_max: Temperature = q(175.0, "degC", "Maker's junction limit of a zener without a library "
                             "part.", "common practice for small glass and plastic zeners")
    theta_ja: ThermalResistance | None = q(
        None, "K/W", "Junction-to-ambient thermal resistance of a zener without a library part, "
        "for its derating and self-heating (when absent: (t_j_max - 25 degC) / rated power).",
        "common practice: a zener's rated power is its free-air figure at 25 degC",
    )
    lead_to_ambient: ThermalResistance = q(
        90.0, "K/W", "Lead-to-ambient thermal resistance of a lead-rated library zener as "
        "mounted (used when the part does not state r_theta_la).",
        "common practice: a 1 W axial zener with R_thJL about 80 K/W is about 170 K/W junction to "
        "ambient on a board",
    )
    part: str = Field(default="", max_length=80,
                      description="Library part id of a fixed zener (needs [parts]).")


class LinearRegulator(Section):
    """Three-terminal regulator data (fixed or adjustable); typical figures by default."""

    dropout: Voltage = q(2.0, "V", "Least input-output difference that keeps regulation, typical "
                         "at 25 degC.",
                         "common practice: about 2 V typical for a fixed three-terminal regulator")
    dropout_max: Voltage | None = q(
        None, "V", "Datasheet maximum dropout over temperature and current; when given it is the "
        "worst case, else dropout plus dropout_allowance.")
    dropout_allowance: NonNegVoltage = q(
        0.5, "V", "Allowance added to a typical dropout for the worst case (temperature, "
        "current, part spread).", "common practice: about 0.5 V above the typical figure")
    rr_window: NonNegVoltage = q(
        1.0, "V", "Headroom above the worst-case dropout inside which the ripple rejection is "
        "taken reduced; the reservoir is sized for a trough this far above dropout.",
        "common practice: rejection falls within about 1 V of dropout")
    rr_loss_near_dropout: Decibels = Field(
        default=20.0, ge=0.0, le=120.0,
        description="Ripple rejection lost inside rr_window, dB.",
        json_schema_extra={"unit": "dB", "default_source": "common practice: makers' curves "
                           "fall by tens of dB near dropout"},
    )
    tolerance: Fraction = q(0.04, "%", "Output (fixed) or reference (adjustable) tolerance.",
                            "common practice: +/-4 % standard grade")
    quiescent_current: Current = q(0.006, "A", "Ground-pin current (fixed) drawn from the input.",
                                   "common practice: a few mA")
    ripple_rejection: Decibels = Field(
        default=60.0,
        description="Ripple rejection at the ripple frequency, dB (minimum figure).",
        json_schema_extra={"unit": "dB",
                           "default_source": "common practice: 62-68 dB minimum for fixed types"},
    )
    v_in_max: Voltage = q(35.0, "V", "Highest input voltage allowed.",
                          "common practice for 5-15 V fixed types")
    reference: Voltage = q(1.25, "V", "Reference voltage of an adjustable regulator.",
                           "common practice")
    adjust_current: Current = q(50e-6, "A", "Adjust-pin current of an adjustable regulator "
                                "(typical; sets R2).", "common practice")
    adjust_current_max: Current = q(100e-6, "A", "Largest adjust-pin current (output window).",
                                    "common practice: about twice the typical figure")
    divider_tolerance: PositiveFraction = q(0.01, "%", "Tolerance of the adjustable regulator's "
                                            "divider resistors.", "common practice: 1 % film")
    min_load: Current = q(0.005, "A", "Least load an adjustable regulator needs, taken by the "
                          "divider.", "common practice")
    t_j_max: Temperature = q(125.0, "degC", "Highest junction temperature allowed by the maker.",
                             "common practice")
    theta_jc: ThermalResistance = q(5.0, "K/W", "Junction-to-case thermal resistance.",
                                   "common practice: TO-220 outline")
    theta_ja: ThermalResistance = q(50.0, "K/W", "Junction-to-ambient thermal resistance without "
                                   "a heat sink.", "common practice: TO-220 outline")
    theta_cs: ThermalResistance = q(0.5, "K/W", "Case-to-sink thermal resistance (greased).",
                                   "common practice")
    part: str = Field(default="", max_length=80,
                      description="Library part id of a fixed regulator (needs [parts]).")


class PassTransistor(Section):
    """NPN pass transistor of the zener-referenced emitter follower."""

    h_fe_min: float = Field(default=40.0, ge=1.0, le=10000.0,
                            description="Least current gain at the load current.",
                            json_schema_extra={"unit": "", "default_source":
                                               "common practice for a power transistor"})
    v_be: Voltage = q(0.7, "V", "Base-emitter voltage at the full load current and 25 degC.",
                      "A. S. Sedra, K. C. Smith (0.6-0.7 V, from memory)")
    v_be_tempco: VoltageTempco = Field(
        default=0.002, ge=0.0, le=0.01,
        description="Fall of V_BE per kelvin of junction temperature, as a plain number in V/K "
        "(magnitude; 0.002 is 2 mV/K).",
        json_schema_extra={"unit": "V/K", "default_source": "common practice: about -2 mV/K"})
    v_be_per_decade: Voltage = q(0.06, "V", "Change of V_BE per decade of emitter current.",
                                 "exponential junction law: V_T ln 10, about 60 mV at room "
                                 "temperature (A. S. Sedra, K. C. Smith, from memory)")
    load_decades_max: float = Field(
        default=3.0, ge=0.0, le=9.0,
        description="Decades of emitter current taken between full load and a disconnected "
        "load (the V_BE change is bounded by this).",
        json_schema_extra={"unit": "", "default_source": "common practice: leakage and bias "
                           "keep some emitter current; fit a minimum load for a tighter bound"})
    v_ceo: Voltage | None = q(None, "V", "Transistor V_CEO rating; checked against the highest "
                              "collector-emitter voltage when given.")
    t_j_max: Temperature = q(150.0, "degC", "Highest junction temperature.", "common practice")
    theta_jc: ThermalResistance = q(3.0, "K/W", "Junction-to-case thermal resistance.",
                                   "common practice: TO-220 power transistor")
    theta_ja: ThermalResistance = q(62.5, "K/W", "Junction-to-ambient without a heat sink.",
                                   "common practice: TO-220 outline")
    theta_cs: ThermalResistance = q(0.5, "K/W", "Case-to-sink thermal resistance (greased).",
                                   "common practice")
    part: str = Field(default="", max_length=80,
                      description="Library part id of a fixed transistor (needs [parts]).")


class Output(Section):
    name: str = Field(min_length=1, max_length=80, description="Name of the output rail.")
    polarity: Literal["positive", "negative"] = Field(
        default="positive",
        description="Polarity of the rail (split supplies: one of each); voltages are given as "
        "magnitudes.",
    )
    voltage: Voltage = q(..., "V", "Nominal output voltage.")
    tolerance: PositiveFraction = q(0.10, "%", "Allowed output deviation, +/-.", "common practice")
    load_min: Current = q(0.0, "A", "Minimum load current while connected.")
    load_max: PositiveCurrent = q(..., "A", "Maximum load current.")
    load_can_disconnect: bool = Field(
        default=True,
        description="True when the load can be unplugged, so the regulator sees no load.",
    )
    ripple_max: Voltage = q(..., "V", "Maximum output ripple, peak to peak.")
    regulator: Literal[tuple(REGULATOR_KINDS)] = Field(  # type: ignore[valid-type]
        default="zener",
        description="Regulator kind: " + "; ".join(
            f"{name} ({what})" for name, (_, what) in REGULATOR_KINDS.items()) + ".",
    )
    headroom: Voltage = q(
        3.0, "V", "Minimum drop across the series element at the ripple trough, low line, "
        "full load.", "common practice",
    )
    series_resistor: Resistance | None = q(
        None, "ohm", "Fixed part: zener series resistor (sized when absent)."
    )
    resistor_power: Power | None = q(None, "W", "Fixed part: series-resistor power rating.")
    resistor_tolerance: Fraction = q(0.05, "%", "Series-resistor tolerance.",
                                     "common practice (E24 +/-5 % grade)")
    hold_up: Duration | None = q(
        None, "s", "Hold-up time: how long the output must stay within its limits (a regulator "
        "in regulation) after the mains drops out, checked at the worst corner (low line, full "
        "load, least capacitance, dropout at the capacitor's trough); e.g. \"20 ms\". When "
        "given and the capacitor is sized, the capacitance is raised until it holds up.")
    line_regulation: PositiveFraction | None = q(
        None, "%", "Largest change of the mean output voltage over the mains range at full "
        "load, as a fraction of the nominal output; checked on the engine's corners.")
    load_regulation: PositiveFraction | None = q(
        None, "%", "Largest change of the mean output voltage from the least load to full load "
        "at nominal mains, as a fraction of the nominal output; checked on the engine's "
        "corners.")
    zener: Zener = Field(default_factory=Zener, description="Zener diode data.")
    linear: LinearRegulator = Field(default_factory=LinearRegulator,
                                    description="Three-terminal regulator data.")
    transistor: PassTransistor = Field(default_factory=PassTransistor,
                                       description="Pass transistor data (follower).")

    @field_validator("load_max")
    @classmethod
    def _above_min(cls, value: float, info: ValidationInfo) -> float:
        low = info.data.get("load_min")
        if low is not None and low > value:
            raise ValueError(f"{value:g} A is below load_min ({low:g} A); expected "
                             "load_max >= load_min")
        return value

    @field_validator("tolerance")
    @classmethod
    def _tolerance(cls, value: float) -> float:
        if value >= 0.5:
            raise ValueError("must be below 50 %")
        return value
