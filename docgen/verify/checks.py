"""Checks: a value against its limit with margin and status, and the catalogue of checks
evaluated on the engine's figures at every corner."""

from __future__ import annotations

from dataclasses import dataclass

from ..design import Check
from ..trace import Ledger


def margin_of(value: float, limit: float, sense: str) -> float:
    """Fraction of the limit left over: (limit - value)/|limit| for a maximum, the reverse for a
    minimum. Negative means the limit is violated."""
    if sense not in ("max", "min"):
        raise ValueError(f"sense must be 'max' or 'min', got {sense!r}")
    scale = abs(limit) if limit != 0 else 1.0
    return (limit - value) / scale if sense == "max" else (value - limit) / scale


def status_of(margin: float, warn_band: float) -> str:
    if margin < 0:
        return "fail"
    if margin < warn_band:
        return "warn"
    return "pass"


def make_check(
    ledger: Ledger,
    check_id: str,
    title: str,
    value_id: str,
    limit_id: str,
    sense: str,
    corner: str,
    warn_band: float,
    *,
    ref: str = "",
    requirement: str = "",
) -> Check:
    value = ledger[value_id]
    limit = ledger[limit_id]
    margin = margin_of(value, limit, sense)
    return Check(
        id=check_id,
        title=title,
        value=value,
        limit=limit,
        unit=ledger.values[value_id].unit,
        sense=sense,
        margin=margin,
        status=status_of(margin, warn_band),
        corner=corner,
        value_id=value_id,
        limit_id=limit_id,
        ref=ref,
        requirement=requirement,
    )


def overall_status(checks: list[Check]) -> str:
    statuses = {c.status for c in checks}
    if "fail" in statuses:
        return "fail"
    if "warn" in statuses:
        return "warn"
    return "pass"


@dataclass(frozen=True)
class EngineCheck:
    """A check evaluated on the engine's figures at every corner, reported at the worst one."""

    id: str
    title: str
    metric: str
    sense: str  # "max" or "min"
    limit_id: str
    symbol: str
    unit: str
    ref: str = ""  # designator; "RECT" stands for the topology's rectifier designator
    requirement: str = ""
    nominal_line_only: bool = False  # ratings defined at nominal mains


# Checks every design has, whatever its regulator.
COMMON_CHECKS = (
    # Worst over every corner, high line included: a shunt regulator's current rises with the
    # line, and the winding heats with the current it carries (common practice).
    EngineCheck("check.transformer_current", "Secondary RMS current <= rated current "
                "derated for the ambient", "i_sec_rms", "max", "transformer.i_allowed",
                r"I_{sec,rms}", "A", "T1", ""),
    EngineCheck("check.bridge_current", "Rectifier output current <= derated I_F(AV)", "i_dc",
                "max", "rect.i_allowed", r"I_{DC}", "A", "RECT",
                "margins.diode_current_derating"),
    EngineCheck("check.cap_ripple_current", "Capacitor ripple current <= rating", "i_c_rms",
                "max", "reservoir.i_ripple_rating", r"I_{C,rms}", "A", "C1", ""),
)
# Hold-up through a mains dropout (only when the requirements ask for it: the limit's id exists
# only then). Worst over the corners: low line, full load, least capacitance.
HOLDUP = EngineCheck("check.holdup", "Hold-up time >= required", "holdup", "min",
                     "output.hold_up", r"t_{hold}", "s", "C1", "output[0].hold_up")
COMMON_CHECKS = (*COMMON_CHECKS, HOLDUP)
# Output checks shared by several regulator kinds.
OUTPUT_RIPPLE = EngineCheck("check.output_ripple", "Output ripple <= limit", "v_out_pp", "max",
                            "output.ripple_max", r"V_{r,out}", "V", "", "output[0].ripple_max")
OUTPUT_HIGH = EngineCheck("check.output_high", "Highest output voltage <= upper limit",
                          "v_out_max", "max", "output.v_upper_limit", r"V_{out,max}", "V", "",
                          "output[0].tolerance")
OUTPUT_LOW = EngineCheck("check.output_low", "Lowest output voltage >= lower limit", "v_out_min",
                         "min", "output.v_lower_limit", r"V_{out,min}", "V", "",
                         "output[0].tolerance")
