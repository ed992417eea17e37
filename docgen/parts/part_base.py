"""What every model of the parts library shares: strict parsing, the common part fields and
the rules over several fields; and the [library] table."""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any, ClassVar

from pydantic import BaseModel, ConfigDict, model_validator

from .readers import (
    PartId,
    Price,
    Text,
)


class _Model(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, populate_by_name=True)


class _PartBase(_Model):
    kind: ClassVar[str] = ""
    id: PartId
    description: Text = ""
    price: Price | None = None
    notes: Text = ""

    @classmethod
    def _group_problems(cls, given: Mapping[str, Any]) -> list[str]:
        """Rules over several fields ("give esr or tan_delta"), checked on the file's keys
        (``given``: key -> value of every field present), so they are reported together with
        problems in single fields."""
        return []

    @model_validator(mode="after")
    def _check_groups(self) -> _PartBase:
        given = {info.alias or name: getattr(self, name)
                 for name, info in type(self).model_fields.items()
                 if getattr(self, name) is not None}
        problems = self._group_problems(given)
        if problems:
            raise ValueError("; ".join(problems))
        return self


class LibraryInfo(_Model):
    name: Text
    source: Text = ""
    notes: Text = ""
    currency: Text = ""
