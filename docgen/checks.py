"""Turn a value and its limit into a Check with margin and status."""

from __future__ import annotations

from .design import Check
from .trace import Ledger


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
