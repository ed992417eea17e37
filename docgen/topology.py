"""Rectifier topologies: one record each, holding everything that differs between them.

Stages, verification, the BOM and the schematic look a topology up here instead of branching
on its name, so a new rectifier is one record (plus its engine wiring and its drawing).

Facts per topology (the sources are in docs/references.md):

- diodes in the conduction path: two for a bridge, one otherwise (A. S. Sedra, K. C. Smith,
  Microelectronic Circuits, rectifier section; from memory);
- charging pulses per mains cycle: two for full-wave, one for half-wave (same source);
- peak reverse voltage per diode: the winding peak for a bridge; twice the conducting winding's
  peak for a center-tap (the whole winding) and for a half-wave rectifier with a reservoir
  capacitor (same source);
- secondary RMS to DC current ratio with capacitor input: upper end of makers' selection tables
  (bridge 1.6-1.8, center-tap 1.0-1.2 per half winding, half-wave 2.6-3.6; common practice).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from . import equations as eq
from .trace import Equation


@dataclass(frozen=True)
class Topology:
    """One rectifier arrangement."""

    name: str
    diodes_in_path: int  # n_d: forward drops in series with the charging current
    pulses_per_cycle: int  # ripple frequency / mains frequency
    piv_factor: float  # peak reverse voltage / peak of the conducting winding
    rms_factor: float  # default secondary RMS / DC current ratio (capacitor input)
    rms_factor_note: str  # what the default ratio refers to
    center_tapped: bool  # the rated winding is two halves; each half conducts in turn
    output_per_rating: float  # DC output current per diode-current rating (two diodes share)
    designator: str  # BR1 for a bridge package, D1 for discrete diodes
    part_kind: str  # parts-library kind of a standard-class part: "bridge" or "diode"
    engine: str  # the engine's wiring of the rectifier
    bom_text: str  # generic BOM line, with {v} reverse voltage, {i} current and {s} surge
    piv_equation: Equation
    peak_equation: Equation  # repetitive peak diode current, ideal source
    ripple_equation: Equation  # ripple frequency from the mains frequency
    caution: tuple[str, str, str, str] | None = None  # (id, title, text, source) if it has one

    @property
    def half_wave(self) -> bool:
        return self.pulses_per_cycle == 1

    @property
    def winding_factor(self) -> float:
        """Primary RMS current per referred winding current: each half of a center-tapped
        winding carries current half of the time, so the primary sees sqrt(2) times a half's RMS."""
        return math.sqrt(2) if self.center_tapped else 1.0

    @property
    def dc_per_diode_average(self) -> float:
        """Output DC current per average diode current (the engine reports one diode)."""
        return float(self.pulses_per_cycle)


HALF_WAVE_CAUTION = (
    "caution.half_wave_dc", "DC in the transformer core",
    "A half-wave rectifier draws current from the secondary in one direction only: the DC "
    "component pre-magnetises the core, so the transformer runs hotter and draws more "
    "magnetising current than its rating suggests. Keep half-wave designs to small loads and "
    "ask the transformer maker.",
    "common practice: makers' selection tables suggest half-wave for about 0.5 W or less",
)

TOPOLOGIES: dict[str, Topology] = {
    t.name: t for t in (
        Topology(
            "bridge", diodes_in_path=2, pulses_per_cycle=2, piv_factor=1.0, rms_factor=1.8,
            rms_factor_note="bridge 1.6-1.8", center_tapped=False, output_per_rating=1.0,
            designator="BR1", part_kind="bridge", engine="bridge",
            bom_text="bridge rectifier, V_RRM at least {v}, I_F(AV) at least {i}, "
                     "I_FSM at least {s}",
            piv_equation=eq.PIV_BRIDGE, peak_equation=eq.PEAK_CURRENT_FW,
            ripple_equation=eq.RIPPLE_FREQ_FW),
        Topology(
            "center-tap", diodes_in_path=1, pulses_per_cycle=2, piv_factor=2.0, rms_factor=1.2,
            rms_factor_note="center-tap 1.0-1.2 per half", center_tapped=True,
            output_per_rating=2.0, designator="D1", part_kind="diode", engine="center-tap",
            bom_text="2 rectifier diodes, V_RRM at least {v}, I_F(AV) together at least {i} "
                     "(half each), I_FSM at least {s}",
            piv_equation=eq.PIV_DOUBLE, peak_equation=eq.PEAK_CURRENT_FW,
            ripple_equation=eq.RIPPLE_FREQ_FW),
        Topology(
            "half-wave", diodes_in_path=1, pulses_per_cycle=1, piv_factor=2.0, rms_factor=3.6,
            rms_factor_note="half-wave 2.6-3.6", center_tapped=False, output_per_rating=1.0,
            designator="D1", part_kind="diode", engine="half-wave",
            bom_text="rectifier diode, V_RRM at least {v}, I_F(AV) at least {i}, "
                     "I_FSM at least {s}",
            piv_equation=eq.PIV_DOUBLE, peak_equation=eq.PEAK_CURRENT_HW,
            ripple_equation=eq.RIPPLE_FREQ_HW, caution=HALF_WAVE_CAUTION),
    )
}


def topology(name: str) -> Topology:
    """The record of a single-rail rectifier (a split supply is two center-tap rails)."""
    try:
        return TOPOLOGIES[name]
    except KeyError:
        raise ValueError(f"unknown rectifier topology {name!r}; "
                         f"expected one of {', '.join(TOPOLOGIES)}") from None
