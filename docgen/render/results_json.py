"""results.json: the machine-readable twin of the report (sorted keys, SI units, stable ids)."""

from __future__ import annotations

import json
import math
from dataclasses import asdict
from typing import Any

from ..design import Design


def _num(x: float) -> float | None:
    return float(x) if isinstance(x, (int, float)) and math.isfinite(x) else None


def results_dict(design: Design) -> dict[str, Any]:
    values = {
        v.id: {"value": _num(v.value), "unit": v.unit, "symbol": v.symbol, "title": v.title,
               "equation": v.equation, "inputs": list(v.inputs), "stage": v.stage,
               "source": v.source}
        for v in design.values.values()
    }
    equations = {
        e.id: {"title": e.title, "rhs": e.rhs, "params": dict(e.params), "source": e.source,
               "note": e.note}
        for e in design.equations.values()
    }
    evaluations = {
        v.id: {"latex": v.latex, "substituted": v.substituted}
        for v in design.values.values() if v.latex
    }
    checks = [
        {**asdict(c), "value": _num(c.value), "limit": _num(c.limit), "margin": _num(c.margin)}
        for c in design.checks
    ]
    return {
        "schema": 1,
        "status": design.status,
        "infeasible_reason": design.infeasible_reason,
        "spec_path": design.spec_path,
        "spec_sha256": design.spec_sha256,
        "tool_version": design.tool_version,
        "counts": design.counts(),
        "values": values,
        "equations": equations,
        "evaluations": evaluations,
        "checks": checks,
        "corners": design.corners,
        "monte_carlo": design.monte_carlo,
        "parts_library": ({"path": design.library[0], "sha256": design.library[1]}
                          if design.library else None),
        "bom": [asdict(p) for p in design.parts],
        "assumptions": [asdict(a) for a in design.assumptions],
        "cautions": [asdict(c) for c in design.cautions],
    }


def results_json(design: Design) -> str:
    return json.dumps(results_dict(design), sort_keys=True, indent=1, ensure_ascii=False,
                      allow_nan=False) + "\n"
