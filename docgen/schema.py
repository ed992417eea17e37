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
    from .spec.models import Requirements

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
    value = _obj({"value": _NUM, "unit": _STR, "symbol": _STR, "title": _STR,
                  "equation": _STR, "inputs": {"type": "array", "items": _STR},
                  "stage": _STR, "source": _STR})
    equation = _obj({"title": _STR, "rhs": _STR,
                     "params": {"type": "object", "additionalProperties": _STR},
                     "source": _STR, "note": _STR})
    check = _obj({"id": _STR, "title": _STR, "value": _NUM, "limit": _NUM, "unit": _STR,
                  "sense": {"enum": ["max", "min"]}, "margin": _NUM,
                  "status": {"enum": ["pass", "warn", "fail"]}, "corner": _STR,
                  "value_id": _STR, "limit_id": _STR, "ref": _STR, "requirement": _STR})
    part = _obj({"ref": _STR, "kind": _STR, "value_text": _STR, "description": _STR,
                 "part_id": _STR, "origin": {"enum": ["sized", "library", "fixed"]},
                 "reason": _STR, "value_ids": {"type": "array", "items": _STR}})
    assumption = _obj({"id": _STR, "text": _STR, "source": _STR})
    caution = _obj({"id": _STR, "title": _STR, "text": _STR, "source": _STR,
                    "triggered_by": _STR})
    sha = {"type": "string", "pattern": "^[0-9a-f]{64}$"}
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
    }
    return {
        "$schema": DRAFT, "$id": BASE_ID + "results.schema.json",
        "title": "docgen results.json",
        "description": "The machine-readable twin of the report. Numbers are SI (temperatures "
        "in degC, ratios as fractions); values are keyed by stable ids that the report and "
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


SCHEMAS = {"requirements": requirements_schema, "results": results_schema}


def schema_text(which: str) -> str:
    return json.dumps(SCHEMAS[which](), indent=2, ensure_ascii=False) + "\n"


def docs_dir() -> Path:
    return Path(__file__).resolve().parent.parent / "docs" / "schema"


def main() -> None:  # pragma: no cover - developer tool, checked by the docs test
    target = docs_dir()
    target.mkdir(parents=True, exist_ok=True)
    for which in SCHEMAS:
        (target / f"{which}.schema.json").write_text(schema_text(which), encoding="utf-8")
        print(f"wrote {target / f'{which}.schema.json'}")


if __name__ == "__main__":  # pragma: no cover
    main()
