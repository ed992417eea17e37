"""The JSON that ``check``, ``build`` and ``diff`` print with ``--format json``.

One object on standard output, numbers in SI units, documented in docs/cli-json.md; the
``format`` key names the document and ``format_version`` changes only when a key is removed or
changes meaning (new keys may appear). Progress and timings go to standard error, so standard
output stays parseable.
"""

from __future__ import annotations

import json
import math
from dataclasses import asdict
from typing import Any

from . import __version__

FORMAT_VERSION = 1


def _num(x: Any) -> float | None:
    return float(x) if isinstance(x, (int, float)) and math.isfinite(x) else None


def _envelope(command: str, exit_code: int, **body: Any) -> dict[str, Any]:
    return {"format": f"docgen-{command}", "format_version": FORMAT_VERSION,
            "tool_version": __version__, "exit_code": exit_code, **body}


def check_entry(spec: str, design: Any) -> dict[str, Any]:
    """One spec's verdict with every check (value, limit and margin as numbers)."""
    checks = [{"id": c.id, "title": c.title, "status": c.status, "value": _num(c.value),
               "limit": _num(c.limit), "unit": c.unit, "sense": c.sense,
               "margin": _num(c.margin), "corner": c.corner, "ref": c.ref,
               "requirement": c.requirement} for c in design.checks]
    return {"spec": spec, "status": design.status, "counts": design.counts(), "reason": "",
            "checks": checks}


def problem_entry(spec: str, status: str, reason: str) -> dict[str, Any]:
    """A spec that gave no design: ``infeasible`` (exit 1) or ``error`` (bad input, exit 2)."""
    return {"spec": spec, "status": status, "counts": {}, "reason": reason, "checks": []}


def check_document(entries: list[dict[str, Any]], exit_code: int, strict: bool) -> str:
    return _dump(_envelope("check", exit_code, strict=strict, specs=entries))


def build_document(outcomes: list[Any], exit_code: int, strict: bool, out_root: str) -> str:
    specs = []
    for o in outcomes:
        item = asdict(o)
        item["seconds"] = round(float(item["seconds"]), 3)
        specs.append(item)
    return _dump(_envelope("build", exit_code, strict=strict, out=out_root, specs=specs))


def _side(side: Any) -> dict[str, Any]:
    return {"label": side.label, "status": side.status, "reason": side.reason,
            "notes": list(side.notes)}


def diff_document(report: Any, exit_code: int) -> str:
    checks = []
    for c in report.checks:
        item = asdict(c)
        item["old_margin"] = _num(c.old_margin)
        item["new_margin"] = _num(c.new_margin)
        item["flipped"] = c.flipped
        checks.append(item)
    values = []
    for v in report.values:
        item = asdict(v)
        item["percent"] = _num(v.percent)
        values.append(item)
    return _dump(_envelope(
        "diff", exit_code, changed=report.changed, change_count=report.count(),
        compared=report.compared, threshold=report.threshold,
        old=_side(report.old), new=_side(report.new),
        requirements=[asdict(c) for c in report.requirements],
        document=[asdict(c) for c in report.document],
        values=values, parts=[asdict(p) for p in report.parts], checks=checks,
        cautions=[asdict(c) for c in report.cautions]))


def error_document(command: str, exit_code: int, message: str) -> str:
    """A command that stopped before any spec gave a result (e.g. a refused argument)."""
    return _dump(_envelope(command, exit_code, error=message))


def _dump(payload: dict[str, Any]) -> str:
    return json.dumps(payload, indent=1, sort_keys=True, ensure_ascii=False,
                      allow_nan=False) + "\n"
