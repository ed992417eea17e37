"""The protocol every regulator kind provides, with the defaults most kinds share.

A kind holds everything that depends on it: what it needs from the reservoir (sizing runs
backwards from this), its own sizing after the reservoir, its corner axes and Monte Carlo draws,
the engine's load law, the figures it derives from the engine's results, its checks, the floors
it raises when the engine finds a part short, its BOM lines, how it is drawn and how the
document describes it. The pipeline, the verification and the renderers look kinds up in the
registry (``docgen.regulators.regulator``) and never branch on a kind's name.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import TYPE_CHECKING, Any, Protocol

import numpy as np

from .. import equations as eq
from ..design import Check, PartChoice
from ..trace import Caution, Ledger

if TYPE_CHECKING:
    from ..engine import Circuit
    from ..stages.context import SizingContext
    from ..verify.checks import EngineCheck

NEEDS_INTRO = ("What the regulator needs from the reservoir at the ripple trough, and the current "
               "it draws; everything upstream is sized backwards from these.")

# A BOM line builder handed to kinds by the pipeline: (ref, kind, value text, generic text,
# traced value ids) -> PartChoice.
LineFn = Callable[[str, str, str, str, tuple[str, ...]], PartChoice]


class Verdict(Protocol):
    """The engine's worst figures of one verification pass, as the refine loop sees them."""

    band: float

    def worst(self, check_id: str) -> tuple[float, str]:
        """Worst value of a check over the corners and the corner's name."""

    def short(self, check_id: str, limit_id: str, sense: str) -> bool:
        """True when the check would fail, or sit inside the warning band, at some corner."""

    def has(self, check_id: str) -> bool:
        """True when the kind runs this check."""


class Regulator:
    """Base of every regulator kind; subclasses override what differs."""

    kind = ""
    title = "Regulator"
    intro = ""
    needs_title = "Regulator requirements"
    needs_intro = NEEDS_INTRO
    # How the engine models the kind's load, for the assumptions of the document.
    load_model = ""
    # Schematic drawing style (see docgen.render.schematic) and the designators the kind uses.
    drawing = "none"
    refs: tuple[str, ...] = ()
    # Heat-sink budget this kind may size: (value prefix, heat-sink designator)
    heat_sink: tuple[str, str] | None = None
    # Names of the kind's own corner axes, for captions ("V_Z low / high" ...)
    corner_axis_names: tuple[str, ...] = ()
    engine_checks: tuple[EngineCheck, ...] = ()
    # What the kind's model does not cover, in plain words, for the document's assumptions.
    not_covered: tuple[str, ...] = ()
    # Ledger id prefixes the kind's two stages write (tests/unit/test_ledger.py holds kinds to
    # them): the output requirements, what the regulator draws, the reservoir ripple under its
    # load law, and its own block.
    writes: tuple[str, ...] = ("output.", "env.", "regulator.", "reservoir.ripple_low",
                               "reservoir.ripple_high", "reservoir.valley_low",
                               "reservoir.v_mean_high")

    # -- sizing ----------------------------------------------------------------------------
    def needs(self, ctx: SizingContext, L: Ledger) -> None:
        """Record the output requirements and what the kind needs from the reservoir:
        ``regulator.v_in_min_needed``, ``regulator.i_in_design``, ``regulator.ripple_in_allowed``."""
        raise NotImplementedError

    def input_current_high(self, ctx: SizingContext, L: Ledger) -> None:
        """``regulator.i_in_high_est``: the largest input current, for the capacitor and the
        ripple current. A series regulator draws a constant current."""
        L.calc("regulator.i_in_high_est", eq.IDENT, r"I_{in,hi,est}", "A",
               "Regulator input current at high line (constant)", {"x": "regulator.i_in_design"},
               lambda x: x)

    def size(self, ctx: SizingContext, L: Ledger) -> None:
        """Size the kind's parts once the reservoir is known; records ``regulator.i_trough``,
        ``regulator.i_in_max``, ``reservoir.ripple_low/high``, ``reservoir.valley_low`` and
        ``reservoir.v_mean_high`` for the stages that follow."""
        raise NotImplementedError

    # -- verification ------------------------------------------------------------------------
    def zener_axis(self, L: Ledger) -> list[tuple[str, float]]:
        """Corner values of the reference (zener knee) voltage; one neutral value by default."""
        return [("", 0.0)]

    def resistor_axis(self, L: Ledger) -> list[tuple[str, float]]:
        """Corner values of the kind's series resistor; one neutral value by default."""
        return [("", 1.0)]

    def sample_axes(self, L: Ledger, rng: np.random.Generator, n: int, temp: np.ndarray
                    ) -> tuple[np.ndarray, np.ndarray]:
        """Monte Carlo draws of (zener voltage, series resistor)."""
        return np.zeros(n), np.ones(n)

    def circuit(self, L: Ledger, pts: Any, common: dict[str, Any]) -> Circuit:
        """The engine circuit of these operating points with the kind's load law."""
        raise NotImplementedError

    def derived_metrics(self, L: Ledger, pts: Any, m: dict[str, np.ndarray]
                        ) -> dict[str, np.ndarray]:
        """Figures the checks need that follow from the engine's by the kind's own formulas
        (``pts`` are the corners followed by the samples)."""
        return {}

    def output_wave(self, L: Ledger, wave: dict[str, np.ndarray], load: float, v_z: float,
                    r: float) -> np.ndarray:
        """The output voltage over time at one operating point, from the engine's waveforms
        (the engine's own output node by default: the zener node, or the capacitor)."""
        return wave["v_out"]

    def hand_checks(self, ctx: SizingContext, L: Ledger, warn_band: float) -> list[Check]:
        """Checks on hand figures that the engine does not change (tolerance windows...)."""
        return []

    def trough_short(self, v: Verdict) -> bool:
        """True when the reservoir trough is too low for the kind at some corner."""
        return False

    def raise_bias_floor(self, ctx: SizingContext, L: Ledger, v: Verdict) -> bool:
        """Lower the series resistor when the engine finds too little bias current."""
        return False

    def raise_part_floors(self, ctx: SizingContext, L: Ledger, v: Verdict) -> bool:
        """Raise the kind's power classes and heat budget when the engine finds them short."""
        return False

    # -- hold-up and regulation --------------------------------------------------------------
    # What the kind's line and load regulation figures leave out, in plain words ("" when the
    # engine's output model carries the whole dependence on line and load).
    regulation_note = ""
    # What the hold-up stops at, in words, for the check's corner.
    holdup_stop = "the capacitor voltage at the output's lower limit"

    def holdup_floor(self, L: Ledger, pts: Any) -> np.ndarray:
        """Capacitor voltage below which the output leaves its limits (a regulated kind: its
        regulation), per operating point. By default the capacitor voltage is the output."""
        return np.full(len(pts.load), L["output.v_lower_limit"])

    # -- document ----------------------------------------------------------------------------
    def cautions(self, L: Ledger) -> list[Caution]:
        """Cautions this design of the kind triggers (written from its figures)."""
        return []

    def bom_lines(self, ctx: SizingContext, L: Ledger, line: LineFn,
                  v: Callable[[str], str]) -> list[PartChoice]:
        return []


def record_output(ctx: SizingContext, L: Ledger) -> None:
    """The output requirements every regulator kind reads."""
    spec = ctx.spec
    out = spec.output[0]
    env = spec.environment
    explicit = out.model_fields_set
    L.given("output.v_nom", r"V_{out}", out.voltage, "V", "Nominal output voltage")
    L.given("output.tolerance", r"t_{out}", out.tolerance, "%", "Output voltage tolerance",
            defaulted="tolerance" not in explicit)
    L.given("output.i_max", r"I_{L,max}", out.load_max, "A", "Maximum load current")
    L.given("output.i_min", r"I_{L,min}", out.load_min, "A", "Minimum load current (connected)",
            defaulted="load_min" not in explicit)
    L.given("output.i_min_worst", r"I_{L,least}",
            0.0 if out.load_can_disconnect else out.load_min, "A",
            "Least load current", source="load can be disconnected"
            if out.load_can_disconnect else "load_min")
    L.given("output.ripple_max", r"V_{r,out,max}", out.ripple_max, "V",
            "Output ripple limit (peak to peak)")
    L.given("env.t_max", r"T_{A,max}", env.ambient_max, "degC", "Highest ambient temperature",
            defaulted="ambient_max" not in env.model_fields_set)
    L.given("env.t_min", r"T_{A,min}", env.ambient_min, "degC", "Lowest ambient temperature",
            defaulted="ambient_min" not in env.model_fields_set)
    for key, vid, sym, unit, title in (
            ("hold_up", "output.hold_up", r"t_{hold,req}", "s", "Required hold-up time"),
            ("line_regulation", "output.line_regulation", r"\delta_{line,max}", "%",
             "Line regulation allowed (full load, over the mains range)"),
            ("load_regulation", "output.load_regulation", r"\delta_{load,max}", "%",
             "Load regulation allowed (nominal mains, least to full load)")):
        if getattr(out, key) is not None:
            L.given(vid, sym, getattr(out, key), unit, title)
    L.calc("output.v_upper_limit", eq.BOUND_HIGH, r"V_{out,hi,lim}", "V", "Output upper limit",
           {"x": "output.v_nom", "t": "output.tolerance"}, lambda x, t: x * (1 + t))
    L.calc("output.v_lower_limit", eq.BOUND_LOW, r"V_{out,lo,lim}", "V", "Output lower limit",
           {"x": "output.v_nom", "t": "output.tolerance"}, lambda x, t: x * (1 - t))


def series_ripple(ctx: SizingContext, L: Ledger) -> None:
    """Reservoir ripple, trough and mean for a load that draws a constant current."""
    from ..errors import InfeasibleDesign

    L.calc("regulator.i_trough", eq.IDENT, r"I_T", "A", "Input current at the trough",
           {"x": "regulator.i_in_design"}, lambda x: x)
    L.calc("regulator.i_in_max", eq.IDENT, r"I_{in,max}", "A", "Largest input current",
           {"x": "regulator.i_in_design"}, lambda x: x)
    for tag in ("low", "high"):
        L.calc(f"reservoir.ripple_{tag}", eq.RIPPLE, rf"V_{{r,{'lo' if tag == 'low' else 'hi'}}}",
               "V", f"Ripple at {tag} line", {"i": "regulator.i_in_design",
                                              "f": "mains.ripple_freq", "c": "reservoir.c_min"},
               lambda i, f, c: i / (f * c))
    L.calc("reservoir.valley_low", eq.VALLEY, r"V_{C,min}", "V",
           "Capacitor trough at low line, full load",
           {"p": "reservoir.v_pk_low", "r": "reservoir.ripple_low"}, lambda p, r: p - r)
    L.calc("reservoir.v_mean_high", eq.MEAN_FROM_PEAK, r"V_{C,mean,hi}", "V",
           "Mean capacitor voltage at high line",
           {"p": "reservoir.v_pk_high", "r": "reservoir.ripple_high"}, lambda p, r: p - r / 2)
    if L["reservoir.valley_low"] <= 0:
        raise InfeasibleDesign("the reservoir is emptied every cycle at low line: the ripple "
                               "exceeds the peak voltage; the capacitor is far too small")


def regulator_load(L: Ledger, common: dict[str, Any], pts: Any, bias: float, floor: float
                   ) -> Circuit:
    """Engine circuit of a series regulator: load current plus a bias while the input is above
    ``floor``; below it (dropout) the current falls with the voltage."""
    from ..engine import Circuit

    return Circuit(**common, load="regulator", i_load=pts.load, i_q=bias, v_dropout_min=floor)


def all_points(pts: Any) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(load, zener voltage, resistor) of every simulated point, corners then samples."""
    return pts.load, pts.v_z, pts.r
