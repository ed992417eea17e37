"""What every section model of the requirements file shares: strict parsing and documented fields.

Each field carries its unit and a one-line description in ``json_schema_extra``; the reference
documentation (docs/requirements.md) and the report's requirements table are generated from them,
so the file format is documented in one place.
"""

from __future__ import annotations

from typing import Any

from pydantic import BaseModel, ConfigDict, Field

from .quantities import _quantity

# a voltage that may be zero (an allowance or a window)
NonNegVoltage = _quantity("voltage", "V", non_negative=True, high=1000.0)

SCHEMA_VERSION = 1


def q(default: Any, unit: str, text: str, source: str = "") -> Any:
    """A documented field: unit for display, description, and where its default comes from."""
    extra = {"unit": unit}
    if source:
        extra["default_source"] = source
    return Field(default=default, description=text, json_schema_extra=extra)


class Section(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, str_strip_whitespace=True)
