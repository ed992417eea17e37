"""results.json: the machine-readable twin of the report (sorted keys, SI units, stable ids)."""

from __future__ import annotations

import json
import math
from dataclasses import asdict
from pathlib import Path
from typing import Any

from ..design import Design
from ..verify.stresses import pairs as initial_vs_verified
from .summary import summary_facts

# Display units the ledger carries beside numbers stored in SI: the unit results.json names is
# the one the stored number is in; the display unit is what the document shows.
SI_OF_DISPLAY = {"%": "1", "h": "s", "%/degC": "1/K", "": "1"}
# SI units of the engine's figures in the Monte Carlo summary.
METRIC_UNITS = {"v_out_mean": "V", "v_out_pp": "V", "v_out_max": "V", "v_out_min": "V",
                "p_zener": "W", "p_r_series": "W", "i_sec_rms": "A", "i_z_min": "A",
                "i_c_rms": "A", "v_c_min": "V", "t_j": "degC"}


def _num(x: float) -> float | None:
    return float(x) if isinstance(x, (int, float)) and math.isfinite(x) else None


def _units(unit: str) -> dict[str, str]:
    return {"unit": SI_OF_DISPLAY.get(unit, unit), "display_unit": unit}


def _relative(path: str, spec_path: str) -> str:
    """A path as seen from the requirements file's folder (no machine's absolute paths)."""
    import os

    try:
        return Path(os.path.relpath(path, Path(spec_path).resolve().parent)).as_posix()
    except ValueError:  # another drive on Windows
        return Path(path).name


def _monte_carlo(mc: dict[str, Any]) -> dict[str, Any]:
    out = dict(mc)
    if "quantities" in mc:
        out["quantities"] = {k: {**v, "unit": METRIC_UNITS.get(k, "")}
                             for k, v in mc["quantities"].items()}
    if "negative_rail" in mc:
        out["negative_rail"] = _monte_carlo(mc["negative_rail"])
    if "yield" in mc:
        out["yield_unit"] = "1"
    return out


def results_dict(design: Design) -> dict[str, Any]:
    values = {
        v.id: {"value": _num(v.value), **_units(v.unit), "symbol": v.symbol, "title": v.title,
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
        {**asdict(c), **_units(c.unit), "value": _num(c.value), "limit": _num(c.limit),
         "margin": _num(c.margin), "margin_unit": "1"}
        for c in design.checks
    ]
    return {
        "schema": 1,
        "status": design.status,
        "infeasible_reason": design.infeasible_reason,
        "spec_path": Path(design.spec_path).name,
        "spec_sha256": design.spec_sha256,
        "tool_version": design.tool_version,
        "counts": design.counts(),
        "values": values,
        "equations": equations,
        "evaluations": evaluations,
        "checks": checks,
        "corners": design.corners,
        "monte_carlo": _monte_carlo(design.monte_carlo),
        "parts_library": ({"path": _relative(design.library[0], design.spec_path),
                           "sha256": design.library[1]}
                          if design.library else None),
        "bom": [asdict(p) for p in design.parts],
        "assumptions": [asdict(a) for a in design.assumptions],
        "cautions": [asdict(c) for c in design.cautions],
        "initial_estimates": initial_vs_verified(design.values),
        "summary": summary_facts(design),
        "insulation": insulation_facts(design),
    }


def insulation_facts(design: Design) -> dict[str, Any] | None:
    """The mains-to-output barrier's facts (the working voltages are traced values)."""
    from ..stages.insulation import barrier_facts

    if "insulation.v_work_rms" not in design.values:
        return None
    return barrier_facts(design.requirements, design.values)


def results_json(design: Design) -> str:
    return json.dumps(results_dict(design), sort_keys=True, indent=1, ensure_ascii=False,
                      allow_nan=False) + "\n"
