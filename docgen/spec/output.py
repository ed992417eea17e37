"""The requirements file as pydantic models: validation, units and explicit defaults.

Each field carries its unit and a one-line description in ``json_schema_extra``; the reference
documentation (docs/requirements.md) and the report's requirements table are generated from them,
so the file format is documented in one place.
"""

from __future__ import annotations

from typing import Any, Literal

from pydantic import BaseModel, ConfigDict, Field, ValidationInfo, field_validator, model_validator

from ..regulators import KINDS as REGULATOR_KINDS
from ..units import show_raw
from .quantities import (
    ApparentPower,
    Capacitance,
    Current,
    Decibels,
    Duration,
    Fraction,
    Frequency,
    Inductance,
    NonNegResistance,
    PositiveCurrent,
    PositiveFraction,
    Power,
    Resistance,
    Tempco,
    Temperature,
    ThermalResistance,
    Voltage,
    VoltageTempco,
    _quantity,
)

# a voltage that may be zero (an allowance or a window)
NonNegVoltage = _quantity("voltage", "V", non_negative=True, high=1000.0)

SCHEMA_VERSION = 1


def q(default: Any, unit: str, text: str, source: str = "") -> Any:
    """A documented field: unit for display, description, and where its default comes from."""
    extra = {"unit": unit}
    if source:
        extra["default_source"] = source
    return Field(default=default, description=text, json_schema_extra=extra)


class Section(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, str_strip_whitespace=True)


class Project(Section):
    title: str = Field(min_length=1, max_length=200, description="Title printed on the cover.")
    document_id: str = Field(min_length=1, max_length=60, description="Document number.")
    revision: str = Field(default="A", max_length=20, description="Document revision.")
    author: str = Field(default="", max_length=120, description="Author or team.")
    date: str = Field(
        default="",
        max_length=40,
        description="Issue date printed on the cover (kept as written; no clock is read, "
        "so the same file gives the same document).",
    )
    description: str = Field(default="", max_length=2000, description="What the supply feeds.")
    demo: bool = Field(default=False, description="Marks the file as invented demo data.")


class Revision(Section):
    revision: str = Field(min_length=1, max_length=20, description="Revision letter or number.")
    date: str = Field(default="", max_length=40, description="Date of the revision, as written.")
    author: str = Field(default="", max_length=120, description="Who made the revision.")
    text: str = Field(default="", max_length=1000, description="What changed.")


class Document(Section):
    """Review data printed on the cover: status, sign-off and revision history. Every field is
    optional; an empty name or date is printed as a blank line to sign on."""

    status: str = Field(default="draft", max_length=40,
                        description="Document status printed on the cover (e.g. draft, for "
                        "review, released).")
    prepared_by: str = Field(default="", max_length=120, description="Name of the preparer.")
    prepared_date: str = Field(default="", max_length=40, description="Date prepared.")
    checked_by: str = Field(default="", max_length=120, description="Name of the checker.")
    checked_date: str = Field(default="", max_length=40, description="Date checked.")
    approved_by: str = Field(default="", max_length=120, description="Name of the approver.")
    approved_date: str = Field(default="", max_length=40, description="Date approved.")
    revisions: list[Revision] = Field(
        default_factory=list, max_length=200,
        description="Revision history ([[document.revisions]] tables); commits of the file in "
        "a git repository are listed beside them.")
    git_history: bool = Field(default=True, description="List the git commits that touched "
                              "the requirements file when it is in a git repository.")


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


class Transformer(Section):
    secondary: Voltage | None = q(
        None, "V", "Fixed part: rated secondary RMS voltage at rated load and nominal mains "
        "(sized when absent)."
    )
    va: ApparentPower | None = q(None, "VA", "Fixed part: rated apparent power (sized when absent).")
    regulation: PositiveFraction | None = q(
        None, "%", "Load regulation (V_no-load - V_full-load) / V_full-load; when absent, "
        "a typical figure for the VA rating is used."
    )
    # Greater than zero: every real winding has resistance, and it bounds the switch-on surge
    # the fuse and rectifier are checked against (zero would make that surge infinite).
    winding_resistance: Resistance | None = q(
        None, "ohm", "Secondary-referred winding resistance, greater than zero (estimated from "
        "VA and regulation when absent)."
    )
    leakage_inductance: Inductance | None = q(
        None, "H", "Secondary-referred leakage inductance (estimated when absent)."
    )
    leakage_ratio: PositiveFraction = q(
        0.2, "", "Leakage reactance over winding resistance, used to estimate the leakage "
        "inductance when it is not given.",
        "common practice: small mains transformers are mostly resistive",
    )
    magnetising_current: PositiveFraction | None = q(
        None, "%", "No-load (magnetising) primary current as a fraction of the rated primary "
        "current; when absent, a typical figure for the VA rating (about 60 % at 1 VA down to "
        "6 % at 500 VA).", "common practice (from memory): small EI transformers; toroids lower",
    )
    inrush_factor: float = Field(
        default=10.0, ge=0.0, le=200.0,
        description="Peak of the magnetising inrush in the first half-cycle after switch-on, "
        "as a multiple of the rated primary current (use 30-90 for toroids).",
        json_schema_extra={"unit": "", "default_source": "common practice (from memory): "
                           "small EI transformers about 5-15, toroids 30-90"},
    )
    part: str = Field(default="", max_length=80,
                      description="Library part id of a fixed transformer (needs [parts]).")

    @model_validator(mode="after")
    def _fixed_pair(self) -> Transformer:
        if (self.secondary is None) != (self.va is None):
            raise ValueError("a fixed transformer needs both 'secondary' and 'va'")
        return self


class Rectifier(Section):
    topology: Literal["bridge", "center-tap", "half-wave", "split"] = Field(
        default="bridge",
        description="Rectifier topology: bridge, center-tap (full-wave from a center-tapped "
        "winding; the transformer secondary is then the whole winding), half-wave, or split "
        "(a bridge on a center-tapped winding feeding a positive and a negative reservoir; two "
        "[[output]] tables, one of each polarity).",
    )
    diode_drop: Voltage = q(
        1.0, "V", "Forward drop of one diode at the charging-current peaks (or at "
        "diode_drop_current). Default 1.0 V for silicon, 0.55 V for schottky. Sizes the "
        "transformer by hand; without a library part the waveform engine's diode is fitted to it.",
        "common practice: ~1 V for a silicon rectifier at its charging peaks, ~0.5 V for a "
        "Schottky rectifier (from memory)",
    )
    diode_type: Literal["silicon", "schottky"] = Field(
        default="silicon",
        description="Junction type of the rectifier: silicon (pn) or schottky. Sets the "
        "engine diode's defaults and its temperature law (a library part's technology "
        "overrides it, with a note).",
    )
    diode_drop_current: PositiveCurrent | None = q(
        None, "A", "Current at which diode_drop is stated (the hand estimate of the "
        "charging-current peaks when absent).")
    diode_resistance: NonNegResistance | None = q(
        None, "ohm", "Series resistance of one diode for the engine (when absent: a default "
        "share of diode_drop by diode_type).")
    part: str = Field(default="", max_length=80,
                      description="Library part id of a fixed bridge or diode (needs [parts]).")


    @model_validator(mode="after")
    def _drop_by_type(self) -> Rectifier:
        if "diode_drop" not in self.model_fields_set and self.diode_type == "schottky":
            object.__setattr__(self, "diode_drop", 0.55)
        if (self.diode_resistance is not None and self.diode_drop_current is not None
                and self.diode_resistance * self.diode_drop_current >= self.diode_drop):
            raise ValueError("diode_resistance x diode_drop_current must stay below diode_drop")
        return self


class Reservoir(Section):
    capacitance: Capacitance | None = q(
        None, "F", "Fixed part: reservoir capacitance (sized when absent)."
    )
    voltage_rating: Voltage | None = q(None, "V", "Fixed part: rated DC voltage.")
    tolerance: Fraction = q(0.20, "%", "Capacitance tolerance (minus side used for sizing).",
                            "common practice for aluminium electrolytics")
    esr: NonNegResistance | None = q(None, "ohm", "Equivalent series resistance at the ripple "
                                     "frequency (estimated from tan_delta when absent).")
    tan_delta: PositiveFraction = q(0.12, "", "Dissipation factor at 100/120 Hz, for the ESR "
                                    "estimate ESR = tan_delta / (2 pi f_r C).",
                                    "common practice for small aluminium electrolytics")
    thermal_resistance: ThermalResistance = q(
        25.0, "K/W", "Capacitor core-to-ambient thermal resistance, for ripple self-heating.",
        "common practice for a small radial can",
    )
    part: str = Field(default="", max_length=80,
                      description="Library part id of a fixed capacitor (needs [parts]).")
    ripple_fraction: PositiveFraction = q(
        0.10, "%", "Design ripple at the regulator input as a fraction of the peak voltage "
        "(an upper bound; tightened when the output ripple needs it).",
        "common practice",
    )

    @model_validator(mode="after")
    def _bounds(self) -> Reservoir:
        if self.tolerance >= 0.9:
            raise ValueError("tolerance must be below 90 %")
        if self.ripple_fraction >= 0.5:
            raise ValueError("ripple_fraction must be below 50 %")
        return self


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


MAX_SAMPLES = 10_000


class Analysis(Section):
    samples: int = Field(
        default=400, ge=0,
        description="Monte Carlo samples over the tolerances (0 turns Monte Carlo off).",
        json_schema_extra={"unit": "", "default_source": "common practice"},
    )
    seed: int = Field(
        default=1, ge=0, le=2**32 - 1,
        description="Seed of the Monte Carlo generator; the same seed repeats the same samples.",
        json_schema_extra={"unit": ""},
    )


    @field_validator("samples")
    @classmethod
    def _samples_bounded(cls, value: int) -> int:
        # Each sample is one steady-state waveform solve (about 1 ms); 10,000 already pins the
        # 1 % and 99 % points to a fraction of a percent, and keeps `docgen check` near 10 s.
        if value > MAX_SAMPLES:
            raise ValueError(f"expected at most {MAX_SAMPLES} Monte Carlo samples (about 1 ms "
                             f"each), got {show_raw(value)}")
        return value


class Parts(Section):
    library: str = Field(
        default="", max_length=400,
        description="Approved-parts library file, relative to the requirements file; when "
        "given, parts are picked from it instead of standard rating steps.",
    )


class Requirements(Section):
    """The whole requirements file."""

    schema_: Literal[1] = Field(alias="schema", description="File format version; write 1.")
    project: Project
    document: Document = Field(default_factory=Document)
    mains: Mains = Field(default_factory=Mains)
    environment: Environment = Field(default_factory=Environment)
    transformer: Transformer = Field(default_factory=Transformer)
    rectifier: Rectifier = Field(default_factory=Rectifier)
    reservoir: Reservoir = Field(default_factory=Reservoir)
    output: list[Output] = Field(min_length=1, max_length=2,
                                 description="The output rail; two for a split supply.")
    margins: Margins = Field(default_factory=Margins)
    protection: Protection = Field(default_factory=Protection)
    analysis: Analysis = Field(default_factory=Analysis)
    parts: Parts = Field(default_factory=Parts)
    insulation: Insulation = Field(default_factory=Insulation)

    @model_validator(mode="after")
    def _rails(self) -> Requirements:
        split = self.rectifier.topology == "split"
        polarities = sorted(o.polarity for o in self.output)
        if split and polarities != ["negative", "positive"]:
            raise ValueError("a split supply needs two [[output]] tables, one with polarity = "
                             "\"positive\" and one with polarity = \"negative\"")
        if not split and len(self.output) != 1:
            raise ValueError("only a split supply (rectifier.topology = \"split\") has two "
                             "outputs; give one [[output]] table")
        if not split and polarities != ["positive"]:
            raise ValueError("a single-rail supply is drawn positive; set polarity = "
                             "\"positive\" (or use rectifier.topology = \"split\")")
        return self
