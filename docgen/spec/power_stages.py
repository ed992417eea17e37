"""The transformer, rectifier and reservoir sections: the unregulated power path."""

from __future__ import annotations

from typing import Literal

from pydantic import Field, model_validator

from .quantities import (
    ApparentPower,
    Capacitance,
    Fraction,
    Inductance,
    NonNegResistance,
    PositiveCurrent,
    PositiveFraction,
    Resistance,
    ThermalResistance,
    Voltage,
)
from .section import Section, q


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
