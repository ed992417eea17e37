"""Reference documentation of the requirements file, generated from the models themselves."""

from __future__ import annotations

from typing import Any

from pydantic import BaseModel

from .spec.output import LinearRegulator, Output, PassTransistor, Zener
from .spec.requirements import Requirements
from .units import format_quantity

HEADER = """\
# Requirements file reference

Generated from the models in `docgen/spec/` by `python -m docgen.fields > docs/requirements.md`;
a test keeps it in step with the code. Quantities are written with units ("230 V", "40 mA",
"4700 uF", "10 %", "45 degC") or as plain SI numbers (volts, amperes, farads, ohms, watts,
hertz, seconds; temperatures in degrees Celsius; ratios as fractions). A field marked
*required* has no default; every default is listed as the document reports it.
"""


def _default_text(field: Any, unit: str) -> str:
    if field.is_required():
        return "*required*"
    if field.default_factory is not None:
        return "(table)"
    d = field.default
    if d is None:
        return "sized / not set"
    if isinstance(d, bool) or isinstance(d, str):
        return f"`{d!r}`" if d != "" else '`""`'
    if isinstance(d, (int, float)) and unit:
        return format_quantity(float(d), unit)
    return f"`{d}`"


def _section(name: str, model: type[BaseModel]) -> list[str]:
    lines = [f"## `{name}`", "", "| key | unit | default | meaning | default from |",
             "|---|---|---|---|---|"]
    for key, field in model.model_fields.items():
        extra = field.json_schema_extra or {}
        unit = extra.get("unit", "") if isinstance(extra, dict) else ""
        src = extra.get("default_source", "") if isinstance(extra, dict) else ""
        alias = field.alias or key
        if isinstance(field.annotation, type) and issubclass(field.annotation, BaseModel):
            continue
        desc = (field.description or "").replace("|", "/")
        lines.append(f"| `{alias}` | {unit} | {_default_text(field, unit)} | {desc} | {src} |")
    return lines + [""]


def field_reference_markdown() -> str:
    out = [HEADER]
    top = Requirements.model_fields
    out += ["## top level", "", "| key | meaning |", "|---|---|",
            "| `schema` | File format version; write 1. |", ""]
    for key, field in top.items():
        if key == "schema_":
            continue
        ann = field.annotation
        if key == "output":
            out += _section("[[output]]", Output)
            out += _section("[output.zener]", Zener)
            out += _section("[output.linear]", LinearRegulator)
            out += _section("[output.transistor]", PassTransistor)
        elif isinstance(ann, type) and issubclass(ann, BaseModel):
            out += _section(f"[{key}]", ann)
    return "\n".join(out).rstrip() + "\n"


if __name__ == "__main__":  # pragma: no cover
    import sys

    sys.stdout.write(field_reference_markdown())
