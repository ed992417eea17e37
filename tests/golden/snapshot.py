"""Pinned results of every demo spec and test spec: the numbers a refactor must not move.

A snapshot keeps what a reviewer reads (traced values, checks, corners, Monte Carlo summary, BOM,
assumptions and cautions) and leaves out what legitimately differs between machines or
versions (paths, tool version, spec hash, equation text).

Regenerate on purpose, and say why in the commit:  python -m tests.golden.snapshot
"""

from __future__ import annotations

import json
import math
import sys
from pathlib import Path
from typing import Any

ROOT = Path(__file__).resolve().parents[2]
GOLDEN = Path(__file__).resolve().parent / "data"
SPECS = sorted((ROOT / "specs").glob("*.toml")) + sorted(
    p for p in (ROOT / "tests" / "data").glob("*.toml") if p.stem != "bad-unit")
REL_TOL = 1e-6
ABS_TOL = 1e-12


def snapshot(spec: Path) -> dict[str, Any]:
    from docgen.errors import InfeasibleDesign
    from docgen.pipeline import run
    from docgen.render.results_json import results_dict
    from docgen.spec import load_requirements

    try:
        data = results_dict(run(load_requirements(spec)))
    except InfeasibleDesign as exc:
        return {"status": "infeasible", "reason": str(exc)}
    return {
        "status": data["status"],
        "values": {k: {"value": v["value"], "unit": v["unit"]} for k, v in data["values"].items()},
        "checks": [{k: c[k] for k in ("id", "status", "value", "limit", "unit", "corner", "ref")}
                   for c in data["checks"]],
        "corners": data["corners"],
        "monte_carlo": data["monte_carlo"],
        "bom": [{k: p[k] for k in ("ref", "kind", "value_text", "part_id", "origin")}
                for p in data["bom"]],
        "assumptions": sorted(a["id"] for a in data["assumptions"]),
        "cautions": sorted(c["id"] for c in data["cautions"]),
    }


def differences(expected: Any, actual: Any, path: str = "") -> list[str]:
    """Every place where two snapshots differ beyond the tolerance, as readable lines."""
    if isinstance(expected, dict) and isinstance(actual, dict):
        out = []
        for key in sorted(set(expected) | set(actual)):
            if key not in actual:
                out.append(f"{path}/{key}: missing")
            elif key not in expected:
                out.append(f"{path}/{key}: new")
            else:
                out += differences(expected[key], actual[key], f"{path}/{key}")
        return out
    if isinstance(expected, list) and isinstance(actual, list):
        if len(expected) != len(actual):
            return [f"{path}: {len(expected)} items, now {len(actual)}"]
        out = []
        for i, (e, a) in enumerate(zip(expected, actual, strict=True)):
            out += differences(e, a, f"{path}[{i}]")
        return out
    if isinstance(expected, (int, float)) and isinstance(actual, (int, float)) \
            and not isinstance(expected, bool) and not isinstance(actual, bool):
        if math.isclose(expected, actual, rel_tol=REL_TOL, abs_tol=ABS_TOL):
            return []
        return [f"{path}: {expected!r} -> {actual!r}"]
    return [] if expected == actual else [f"{path}: {expected!r} -> {actual!r}"]


def main(argv: list[str]) -> int:
    GOLDEN.mkdir(exist_ok=True)
    for spec in SPECS:
        text = json.dumps(snapshot(spec), sort_keys=True, indent=1, ensure_ascii=False) + "\n"
        (GOLDEN / f"{spec.stem}.json").write_text(text, encoding="utf-8")
        print(f"wrote {spec.stem}.json")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
