"""Run the whole job for one requirements file: stages -> checks -> parts -> cautions -> Design."""

from __future__ import annotations

from . import __version__
from . import equations as eq
from .cautions import STANDING, triggered_cautions
from .checks import make_check, overall_status
from .design import Check, Design, PartChoice, Stage
from .errors import InfeasibleDesign
from .spec import LoadedSpec
from .spec.models import Requirements
from .stages import mains, rectifier, regulator_needs, reservoir, transformer, zener
from .trace import Assumption, Ledger, TraceError
from .units import format_quantity as fq
from .waveform_ideal import ideal_bridge_zener

STAGES = (
    (mains, mains.size_mains),
    (regulator_needs, regulator_needs.size_regulator_needs),
    (transformer, transformer.size_transformer),
    (reservoir, reservoir.size_reservoir),
    (zener, zener.size_zener),
    (rectifier, rectifier.size_rectifier),
)

ASSUMPTIONS = (
    Assumption("assume.hand_formulas",
               "Ripple, diode currents and the secondary RMS current come from hand formulas "
               "with an ideal source (constant-current discharge, table ratio for RMS current).",
               "A. S. Sedra, K. C. Smith, Microelectronic Circuits (from memory); common practice"),
    Assumption("assume.rated_at_full_load",
               "The transformer's rated secondary voltage holds at its rated load and nominal "
               "mains; at lighter load it is higher, which the low-line check ignores "
               "(conservative).", "common practice"),
    Assumption("assume.no_load_peak",
               "The no-load peak neglects the diode drop and takes the full regulation rise "
               "(conservative for voltage ratings).", "common practice"),
    Assumption("assume.zener_model",
               "The zener holds its voltage within tolerance and temperature drift above "
               "I_Z,min; its dynamic resistance sets the line regulation.",
               "A. S. Sedra, K. C. Smith, Microelectronic Circuits (from memory)"),
    Assumption("assume.not_covered",
               "Fuse, bleeder, heat sinking and creepage/clearance are outside this version's "
               "sizing; the safety section lists what to check by hand.", "scope of this version"),
)


def _record_margins(spec: Requirements, L: Ledger) -> None:
    m = spec.margins
    L.given("margins.secondary_rms_factor", r"k_{rms}", m.secondary_rms_factor, "",
            "Secondary RMS to DC current ratio (capacitor-input bridge)",
            defaulted="secondary_rms_factor" not in m.model_fields_set,
            source="common practice: makers' tables give 1.6-1.8 for a bridge")
    L.given("margins.warn_band", r"w", m.warn_band, "%", "Warning band for checks",
            defaulted="warn_band" not in m.model_fields_set)


def _size(spec: Requirements, va_floor: float) -> Ledger:
    L = Ledger()
    L.stage = "margins"
    _record_margins(spec, L)
    for module, fn in STAGES:
        L.stage = module.__name__.rsplit(".", 1)[-1]
        if fn is transformer.size_transformer:
            fn(spec, L, va_floor=va_floor)
        else:
            fn(spec, L)
    L.stage = "reservoir"
    L.calc("reservoir.energy", eq.ENERGY, r"E_C", "J", "Energy stored at the highest voltage",
           {"c": "reservoir.c", "v": "reservoir.v_max"}, lambda c, v: 0.5 * c * v * v)
    return L


def _checks(spec: Requirements, L: Ledger) -> list[Check]:
    w = spec.margins.warn_band
    lo, hi = "low line, full load, C at -tol", "high line, least load"
    nom = "nominal mains, full load"
    specs = [
        ("check.headroom", "Drop across R at the trough >= headroom", "regulator.headroom_low",
         "output.headroom", "min", lo, "R1", "output[0].headroom"),
        ("check.zener_current", "Zener current at the trough >= I_Z,min", "zener.i_z_trough",
         "zener.i_min", "min", lo, "D1", "output[0].zener.knee_current"),
        ("check.zener_power", "Zener dissipation <= derated rating", "zener.p", "zener.p_allowed",
         "max", hi, "D1", "margins.zener_power_derating"),
        ("check.resistor_power", "Series-resistor dissipation <= derated rating", "zener.r_p",
         "zener.r_p_allowed", "max", hi, "R1", "margins.resistor_power_derating"),
        ("check.output_ripple", "Output ripple <= limit", "output.ripple", "output.ripple_max",
         "max", "high line, C at -tol", "", "output[0].ripple_max"),
        ("check.output_high", "Highest output voltage <= upper limit", "zener.v_max",
         "output.v_upper_limit", "max", "zener +tol, temperature extreme", "",
         "output[0].tolerance"),
        ("check.output_low", "Lowest output voltage >= lower limit", "zener.v_min",
         "output.v_lower_limit", "min", "zener -tol, temperature extreme", "",
         "output[0].tolerance"),
        ("check.cap_voltage", "Capacitor voltage <= derated rating", "reservoir.v_max",
         "reservoir.v_allowed", "max", "high line, no load", "C1",
         "margins.capacitor_voltage_derating"),
        ("check.bridge_piv", "Diode reverse voltage <= derated V_RRM", "bridge.piv",
         "bridge.v_allowed", "max", "high line, no load", "BR1", "margins.diode_voltage_derating"),
        ("check.bridge_current", "Diode average current <= derated I_F(AV)", "bridge.i_avg",
         "bridge.i_allowed", "max", "high line", "BR1", "margins.diode_current_derating"),
        ("check.transformer_current", "Secondary RMS current <= rated current",
         "transformer.i_rms", "transformer.i_rated", "max", "high line", "T1", ""),
    ]
    return [
        make_check(L, cid, title, vid, lid, sense, corner, w, ref=ref, requirement=req)
        for cid, title, vid, lid, sense, corner, ref, req in specs
    ]


def _parts(L: Ledger) -> list[PartChoice]:
    def v(i: str, unit: str | None = None) -> str:
        return fq(L[i], unit or L.values[i].unit, 3)

    return [
        PartChoice("T1", "transformer", f"{v('transformer.v_rated')} {v('transformer.va')}",
                   f"mains transformer, secondary {v('transformer.v_rated')} RMS at rated load, "
                   f"at least {v('transformer.va')}, regulation at most "
                   f"{v('transformer.regulation')}",
                   reason="standard secondary and VA steps at or above the need",
                   value_ids=("transformer.v_rated", "transformer.va", "transformer.regulation")),
        PartChoice("BR1", "bridge", f"{v('bridge.v_rrm')} {v('bridge.i_f_rating')}",
                   f"bridge rectifier, V_RRM at least {v('bridge.v_rrm')}, I_F(AV) at least "
                   f"{v('bridge.i_f_rating')}",
                   reason="standard rating classes at or above the derated need",
                   value_ids=("bridge.v_rrm", "bridge.i_f_rating")),
        PartChoice("C1", "capacitor", f"{v('reservoir.c')} {v('reservoir.v_rating')}",
                   f"aluminium electrolytic capacitor, {v('reservoir.c')} "
                   f"(tolerance {v('reservoir.tol')}), at least {v('reservoir.v_rating')}",
                   reason="E6 value at or above the need; standard voltage step",
                   value_ids=("reservoir.c", "reservoir.v_rating")),
        PartChoice("R1", "resistor", f"{v('zener.r')} {v('zener.r_p_rating')}",
                   f"resistor {v('zener.r')}, at least {v('zener.r_p_rating')}",
                   reason="E24 value at or below the largest allowed; standard power class",
                   value_ids=("zener.r", "zener.r_p_rating")),
        PartChoice("D1", "zener", f"{v('zener.v_nom')} {v('zener.p_rating')}",
                   f"zener diode {v('zener.v_nom')} +/-{v('zener.tol')}, at least "
                   f"{v('zener.p_rating')}",
                   reason="standard power class at or above the derated need",
                   value_ids=("zener.v_nom", "zener.p_rating")),
    ]


def run(loaded: LoadedSpec) -> Design:
    """Size, check and collect everything for one loaded requirements file.

    Raises InfeasibleDesign when no design of the chosen kind meets the requirements.
    """
    spec = loaded.requirements
    va_floor = 0.0
    for _ in range(4):
        try:
            L = _size(spec, va_floor)
        except (TraceError, ArithmeticError, ValueError) as exc:
            # Requirements that pass validation can still be physically contradictory in a way
            # that surfaces as a non-finite or undefined value; never report such numbers.
            raise InfeasibleDesign(
                f"the requirements lead to an undefined value while sizing ({exc})") from None
        # The secondary current is known only once the regulator is sized; raise the VA
        # rating and size again if the first estimate was short (sized transformers only).
        need = L["transformer.i_rms"] * L["transformer.v_rated"]
        if spec.transformer.secondary is not None or need <= L["transformer.va"] * (1 + 1e-9):
            break
        va_floor = need
    else:  # pragma: no cover - the VA steps are finite, so the loop settles quickly
        raise InfeasibleDesign("the transformer VA rating did not settle")

    L.stage = "reservoir"
    L.calc("reservoir.v_allowed", eq.SCALE, r"V_{C,allow}", "V",
           "Capacitor voltage allowed (derated)",
           {"v": "reservoir.v_rating", "k": "margins.cap_voltage"}, lambda v, k: v * k)
    checks = _checks(spec, L)
    waveforms = {
        "low_line_full_load": ideal_bridge_zener(
            v_pk_sec=2**0.5 * L["transformer.v_low_fl"], v_f=L["rect.v_f"], freq=L["mains.freq"],
            c=L["reservoir.c_min"], r=L["zener.r"], v_z=L["zener.v_max"]),
    }
    cautions = list(STANDING) + triggered_cautions(
        L["reservoir.v_max"], L["transformer.v_high_nl"], L["reservoir.energy"], checks)
    stages = [Stage("margins", "Design margins", "Derating factors and design ratios used below.")]
    stages += [Stage(m.__name__.rsplit(".", 1)[-1], m.TITLE, m.INTRO) for m, _ in STAGES]
    return Design(
        spec_path=str(loaded.path),
        spec_text=loaded.text,
        spec_sha256=loaded.sha256,
        requirements=spec,
        stages=stages,
        values=dict(L.values),
        equations=dict(L.equations),
        checks=checks,
        parts=_parts(L),
        assumptions=list(ASSUMPTIONS),
        cautions=cautions,
        status=overall_status(checks),
        tool_version=__version__,
        waveforms=waveforms,
    )
