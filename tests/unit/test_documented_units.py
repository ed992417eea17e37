"""Every quantity field accepts its default written with the unit its documentation gives."""

from __future__ import annotations

from typing import Annotated, Any

import pytest
from pydantic import BaseModel, TypeAdapter, ValidationError

from docgen.spec.requirements import Requirements


def _models(model: type[BaseModel], seen: set) -> list[type[BaseModel]]:
    out = [model]
    seen.add(model)
    for f in model.model_fields.values():
        for arg in _types(f.annotation):
            if isinstance(arg, type) and issubclass(arg, BaseModel) and arg not in seen:
                out += _models(arg, seen)
    return out


def _types(annotation: Any) -> list[Any]:
    args = getattr(annotation, "__args__", None)
    if not args:
        return [annotation]
    return [t for a in args for t in _types(a)]


def _documented_fields() -> list[tuple[str, Any, str, float]]:
    rows = []
    for model in _models(Requirements, set()):
        for name, f in model.model_fields.items():
            extra = f.json_schema_extra if isinstance(f.json_schema_extra, dict) else {}
            unit = extra.get("unit")
            if unit and isinstance(f.default, (int, float)) and not isinstance(f.default, bool):
                rows.append((f"{model.__name__}.{name}", f, unit, float(f.default)))
    return rows


FIELDS = _documented_fields()


def _as_written(value: float, unit: str) -> str:
    if unit.startswith("%"):
        return f"{value * 100:g} {unit}"
    return f"{value:g} {unit}"


@pytest.mark.parametrize("name,field,unit,default", FIELDS, ids=[r[0] for r in FIELDS])
def test_default_written_with_its_documented_unit_is_accepted(name, field, unit, default):
    adapter = TypeAdapter(Annotated[(field.annotation, *field.metadata)])
    assert adapter.validate_python(_as_written(default, unit)) == pytest.approx(default)


def test_the_units_of_the_issue_are_covered():
    units = {unit for _, _, unit, _ in FIELDS}
    assert {"K/W", "dB", "V", "%", "degC"} <= units
    assert len(FIELDS) > 40


def test_a_wrong_unit_is_still_refused():
    by_name = {name: f for name, f, _, _ in FIELDS}
    for name, text in (("LinearRegulator.ripple_rejection", "60 dBm"),
                       ("LinearRegulator.theta_jc", "5 V"),
                       ("Reservoir.thermal_resistance", "25 %")):
        f = by_name[name]
        with pytest.raises(ValidationError):
            TypeAdapter(Annotated[(f.annotation, *f.metadata)]).validate_python(text)
