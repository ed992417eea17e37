"""Number and text formatting for templates: the only place numbers become text."""

from __future__ import annotations

from ..units import display_unit, format_quantity


def qty(value: float, unit: str, digits: int = 4) -> str:
    return format_quantity(value, unit, digits)


def pct(value: float, digits: int = 3) -> str:
    return format_quantity(value, "%", digits)


def unit_text(unit: str) -> str:
    return display_unit(unit)


STATUS_WORDS = {"pass": "PASS", "warn": "WARN", "fail": "FAIL", "infeasible": "INFEASIBLE"}


def status_word(status: str) -> str:
    return STATUS_WORDS.get(status, status.upper())


def anchor(value_id: str) -> str:
    return "v-" + value_id.replace(".", "-")
