"""JSON Schemas of the requirements file (for editors) and of results.json (for tools).

The requirements schema comes from the pydantic models, so it cannot drift from what docgen
accepts; it is post-processed for editors' TOML language servers: every $ref is inlined (some
servers do not follow $defs), null is dropped (TOML has none) and each field's unit is added
to its description. Quantity fields accept a plain SI number or text with a unit of the right
dimension (see docgen.spec.quantities). The results schema is written here by hand and checked
against real builds by tests/unit/test_schema.py.

``python -m docgen.schema`` rewrites docs/schema/; a test keeps those files current.
"""

from __future__ import annotations

import copy
import json
from pathlib import Path
from typing import Any

DRAFT = "http://json-schema.org/draft-07/schema#"
BASE_ID = "https://linear-supply-docgen.invalid/schema/"  # an identifier, never fetched


def _inline(node: Any, defs: dict[str, Any]) -> Any:
    if isinstance(node, dict):
        if "$ref" in node:
            target = copy.deepcopy(defs[node["$ref"].rsplit("/", 1)[-1]])
            extra = {k: v for k, v in node.items() if k != "$ref"}
            return _inline({**target, **extra}, defs)
        return {k: _inline(v, defs) for k, v in node.items() if k != "$defs"}
    if isinstance(node, list):
        return [_inline(v, defs) for v in node]
    return node


def _drop_null(node: Any) -> Any:
    if isinstance(node, dict):
        node = {k: _drop_null(v) for k, v in node.items()}
        branches = node.get("anyOf")
        if isinstance(branches, list):
            kept = [b for b in branches if b != {"type": "null"}]
            if len(kept) != len(branches):
                node.pop("anyOf")
                node = {**kept[0], **node} if len(kept) == 1 else {**node, "anyOf": kept}
        if node.get("default", 0) is None:
            node.pop("default")
        return node
    if isinstance(node, list):
        return [_drop_null(v) for v in node]
    return node


def _describe_units(node: Any) -> Any:
    """Fold the field's unit (kept by pydantic as an extra keyword) into its description."""
    if isinstance(node, dict):
        node = {k: _describe_units(v) for k, v in node.items()}
        unit = node.get("unit")
        if isinstance(unit, str) and unit and isinstance(node.get("description"), str):
            node["description"] = f"{node['description']} Unit: {unit}."
        return node
    if isinstance(node, list):
        return [_describe_units(v) for v in node]
    return node


def requirements_schema() -> dict[str, Any]:
    from .spec.requirements import Requirements

    raw = Requirements.model_json_schema(by_alias=True, mode="validation")
    schema = _describe_units(_drop_null(_inline(raw, raw.get("$defs", {}))))
    return {"$schema": DRAFT, "$id": BASE_ID + "requirements.schema.json",
            **{k: v for k, v in schema.items() if k != "title"},
            "title": "docgen requirements file (schema = 1)",
            "description": "A small mains-powered linear DC supply: requirements that docgen "
            "sizes, checks and documents. Quantities are a plain SI number or text with a unit "
            "(\"230 V\", \"40 mA\", \"10 %\"). Field reference: docs/requirements.md."}


_NUM = {"type": ["number", "null"]}
_STR = {"type": "string"}
_STATUS = {"enum": ["pass", "warn", "fail", "infeasible"]}


def _obj(props: dict[str, Any], required: list[str] | None = None, **more: Any) -> dict:
    return {"type": "object", "properties": props,
            "required": list(props) if required is None else required, **more}


def results_schema() -> dict[str, Any]:
    counts = _obj({k: {"type": "integer", "minimum": 0} for k in ("pass", "warn", "fail")})
    value = _obj({"value": _NUM, "unit": _STR, "display_unit": _STR, "symbol": _STR,
                  "title": _STR,
                  "equation": _STR, "inputs": {"type": "array", "items": _STR},
                  "stage": _STR, "source": _STR})
    equation = _obj({"title": _STR, "rhs": _STR,
                     "params": {"type": "object", "additionalProperties": _STR},
                     "source": _STR, "note": _STR})
    check = _obj({"id": _STR, "title": _STR, "value": _NUM, "limit": _NUM, "unit": _STR,
                  "display_unit": _STR, "sense": {"enum": ["max", "min"]}, "margin": _NUM,
                  "margin_unit": _STR,
                  "status": {"enum": ["pass", "warn", "fail"]}, "corner": _STR,
                  "value_id": _STR, "limit_id": _STR, "ref": _STR, "requirement": _STR})
    part = _obj({"ref": _STR, "kind": _STR, "value_text": _STR, "description": _STR,
                 "part_id": _STR, "origin": {"enum": ["sized", "library", "fixed"]},
                 "reason": _STR, "value_ids": {"type": "array", "items": _STR}})
    assumption = _obj({"id": _STR, "text": _STR, "source": _STR})
    caution = _obj({"id": _STR, "title": _STR, "text": _STR, "source": _STR,
                    "triggered_by": _STR})
    sha = {"type": "string", "pattern": "^[0-9a-f]{64}$"}
    given = {"type": "boolean"}
    insulation = _obj({
        "basis": {"type": "object", "additionalProperties": _STR},
        "equipment_class": {"enum": ["I", "II"]}, "equipment_class_given": given,
        "output_elv": given, "insulation_needed": _STR, "insulation_reason": _STR,
        "insulation_source": _STR,
        "overvoltage_category": {"enum": ["I", "II", "III", "IV"]},
        "overvoltage_category_given": given,
        "pollution_degree": {"type": "integer", "minimum": 1, "maximum": 4},
        "pollution_degree_given": given,
        "material_group": {"enum": ["I", "II", "IIIa", "IIIb"]}, "material_group_given": given,
        "conditions_source": _STR, "distances_computed": {"const": False},
        "distances_standard": _STR,
        "working_voltage_ids": {"type": "array", "items": _STR}},
        description="The mains-to-output barrier: the insulation it needs and the conditions "
        "its creepage and clearance are looked up under (never computed); the working "
        "voltages are the values named in working_voltage_ids.")
    full = {
        "schema": {"const": 1}, "status": _STATUS, "infeasible_reason": _STR,
        "spec_path": _STR, "spec_sha256": sha, "tool_version": _STR, "counts": counts,
        "values": {"type": "object", "additionalProperties": value},
        "equations": {"type": "object", "additionalProperties": equation},
        "evaluations": {"type": "object",
                        "additionalProperties": _obj({"latex": _STR, "substituted": _STR})},
        "checks": {"type": "array", "items": check},
        "corners": {"type": "array", "items": _obj(
            {"name": _STR, "converged": {"type": "boolean"}}, additionalProperties={
                "type": ["number", "string", "boolean", "null"]})},
        "monte_carlo": {"type": "object"},
        "parts_library": {"oneOf": [{"type": "null"}, _obj({"path": _STR, "sha256": sha})]},
        "bom": {"type": "array", "items": part},
        "assumptions": {"type": "array", "items": assumption},
        "cautions": {"type": "array", "items": caution},
        "initial_estimates": {"type": "object", "additionalProperties": _obj(
            {"verified_id": _STR, "initial": _NUM, "verified": _NUM, "unit": _STR,
             "basis": _STR,
             "difference": _NUM})},
        "summary": _obj({"largest_stress": {"type": "array", "items": {"type": "object"}},
                         "heat": {"type": "array", "items": {"type": "object"}}}),
        "insulation": {"oneOf": [{"type": "null"}, insulation]},
    }
    return {
        "$schema": DRAFT, "$id": BASE_ID + "results.schema.json",
        "title": "docgen results.json",
        "description": "The machine-readable twin of the report. Numbers are SI (temperatures "
        "in degC, ratios as fractions with unit \"1\", times in s); \"unit\" names the unit of "
        "the stored number and \"display_unit\" the one the report shows; values are keyed by stable ids that the report and "
        "the checks cite. When the design is infeasible only status, infeasible_reason, "
        "spec_path and spec_sha256 are written.",
        "type": "object",
        "properties": full,
        "required": ["status", "spec_path", "spec_sha256"],
        "additionalProperties": False,
        "if": {"properties": {"status": {"enum": ["pass", "warn", "fail"]}}},
        "then": {"required": list(full)},
        "else": {"properties": {"status": {"const": "infeasible"}},
                 "required": ["infeasible_reason"]},
    }


def _cli(command: str, body: dict[str, Any], required: list[str]) -> dict[str, Any]:
    """The envelope every --format json document shares (docgen.cli_json), around ``body``."""
    props = {"format": {"const": f"docgen-{command}"}, "format_version": {"const": 1},
             "tool_version": _STR, "exit_code": {"enum": [0, 1, 2]}, "error": _STR, **body}
    return {"$schema": DRAFT, "$id": BASE_ID + f"cli-{command}.schema.json",
            "title": f"docgen {command} --format json",
            "description": f"What `docgen {command} --format json` prints on stdout "
            "(docs/cli-json.md). New keys may appear within format_version 1.",
            "type": "object", "properties": props,
            "required": ["format", "format_version", "tool_version", "exit_code"],
            "if": {"not": {"required": ["error"]}}, "then": {"required": required}}


def check_output_schema() -> dict[str, Any]:
    counts = {"type": "object", "additionalProperties": {"type": "integer", "minimum": 0}}
    check = _obj({"id": _STR, "title": _STR, "status": {"enum": ["pass", "warn", "fail"]},
                  "value": _NUM, "limit": _NUM, "unit": _STR, "sense": {"enum": ["max", "min"]},
                  "margin": _NUM, "corner": _STR, "ref": _STR, "requirement": _STR})
    spec = _obj({"spec": _STR, "status": {"enum": ["pass", "warn", "fail", "infeasible", "error"]},
                 "counts": counts, "reason": _STR, "checks": {"type": "array", "items": check}})
    return _cli("check", {"strict": {"type": "boolean"},
                          "specs": {"type": "array", "items": spec}}, ["strict", "specs"])


def build_output_schema() -> dict[str, Any]:
    ids = {"type": "array", "items": _STR}
    spec = _obj({"spec": _STR, "out_dir": _STR,
                 "action": {"enum": ["built", "up to date", "error"]},
                 "status": {"enum": ["pass", "warn", "fail", "infeasible", "error"]},
                 "counts": {"type": "object"}, "failing": ids, "warnings": ids, "reason": _STR,
                 "why": ids, "seconds": {"type": "number", "minimum": 0},
                 "exit_code": {"enum": [0, 1, 2]}})
    return _cli("build", {"strict": {"type": "boolean"}, "out": _STR,
                          "specs": {"type": "array", "items": spec}}, ["strict", "out", "specs"])


def diff_output_schema() -> dict[str, Any]:
    side = _obj({"label": _STR, "status": _STR, "reason": _STR,
                 "notes": {"type": "array", "items": _STR}})
    field = _obj({"path": _STR, "old": _STR, "new": _STR})
    body = {
        "changed": {"type": "boolean"}, "change_count": {"type": "integer", "minimum": 0},
        "compared": {"type": "boolean"}, "threshold": {"type": "number", "minimum": 0},
        "old": side, "new": side,
        "requirements": {"type": "array", "items": field},
        "document": {"type": "array", "items": field},
        "values": {"type": "array", "items": _obj(
            {"id": _STR, "title": _STR, "old": _STR, "new": _STR, "percent": _NUM})},
        "parts": {"type": "array", "items": _obj(
            {"ref": _STR, "kind": _STR, "old": _STR, "new": _STR, "old_detail": _STR,
             "new_detail": _STR})},
        "checks": {"type": "array", "items": _obj(
            {"id": _STR, "title": _STR, "old_status": _STR, "new_status": _STR,
             "old_margin": _NUM, "new_margin": _NUM, "flipped": {"type": "boolean"}})},
        "cautions": {"type": "array", "items": _obj(
            {"id": _STR, "title": _STR, "change": {"enum": ["added", "removed"]}})},
    }
    return _cli("diff", body, list(body))


SCHEMAS = {"requirements": requirements_schema, "results": results_schema,
           "check": check_output_schema, "build": build_output_schema,
           "diff": diff_output_schema}
# file names in docs/schema/
FILES = {"requirements": "requirements", "results": "results", "check": "cli-check",
         "build": "cli-build", "diff": "cli-diff"}


def schema_text(which: str) -> str:
    return json.dumps(SCHEMAS[which](), indent=2, ensure_ascii=False) + "\n"


def docs_dir() -> Path:
    return Path(__file__).resolve().parent.parent / "docs" / "schema"


def main() -> None:  # pragma: no cover - developer tool, checked by the docs test
    target = docs_dir()
    target.mkdir(parents=True, exist_ok=True)
    for which in SCHEMAS:
        (target / f"{FILES[which]}.schema.json").write_text(schema_text(which), encoding="utf-8")
        print(f"wrote {target / f'{FILES[which]}.schema.json'}")


if __name__ == "__main__":  # pragma: no cover
    main()
