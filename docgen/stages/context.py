"""What every sizing stage shares besides the ledger: the spec, the parts library, the floors
raised by the engine's verification, and the record of which part was chosen for each block."""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

from ..errors import InfeasibleDesign, SpecError, SpecIssue
from ..spec.requirements import Requirements
from ..trace import Ledger


@dataclass
class Floors:
    """Lower limits raised between sizing passes when the engine finds a part short.

    Each nonzero floor is recorded in the ledger with the reason, so the document shows why a
    part is larger than the hand formulas asked for.
    """

    va: float = 0.0
    secondary: float = 0.0
    capacitance: float = 0.0
    ripple_current: float = 0.0  # capacitor ripple-current rating at the ripple frequency
    zener_power: float = 0.0
    resistor_power: float = 0.0
    bridge_current: float = 0.0
    heat_power: float = 0.0  # dissipation the heat sink is sized for
    resistor_ceiling: float = math.inf  # an upper limit: lowered, never raised
    reasons: dict[str, str] = field(default_factory=dict)

    def raise_to(self, name: str, value: float, reason: str) -> bool:
        if value > getattr(self, name) * (1 + 1e-9):
            setattr(self, name, value)
            self.reasons[name] = reason
            return True
        return False

    def lower_to(self, name: str, value: float, reason: str) -> bool:
        if value < getattr(self, name) * (1 - 1e-9):
            setattr(self, name, value)
            self.reasons[name] = reason
            return True
        return False


@dataclass
class Pick:
    """The part chosen for one designator: a library part, a fixed part or a standard step."""

    ref: str
    kind: str
    origin: str  # "library" | "fixed" | "sized"
    part: Any = None  # library part model, when there is one
    reason: str = ""
    generic: str = ""
    quantity: int = 1


@dataclass
class SizingContext:
    spec: Requirements
    spec_path: str = ""
    library: Any = None  # docgen.parts.library.PartsLibrary or None
    floors: Floors = field(default_factory=Floors)
    shared_transformer: str = ""  # why the transformer was chosen for both rails (split only)
    # (field, text): a value written in the file that a chosen part states differently; the
    # document shows each one (a value in the file is never replaced silently)
    conflicts: list[tuple[str, str]] = field(default_factory=list)
    picks: dict[str, Pick] = field(default_factory=dict)

    def fixed_part(self, kind: str, part_id: str, location: str) -> Any:
        """A part named in the requirements file, looked up in the library."""
        if self.library is None:
            raise SpecError(self.spec_path, [SpecIssue(
                location, f"names part {part_id!r} but the file gives no [parts] library")])
        try:
            part = self.library.get(part_id)
        except KeyError as exc:
            raise SpecError(self.spec_path, [SpecIssue(location, str(exc).strip("'\""))]) from None
        if getattr(part, "kind", "") != kind and not (kind == "rectifier" and
                                                     part.kind in ("bridge", "diode")):
            raise SpecError(self.spec_path, [SpecIssue(
                location, f"part {part_id!r} is a {part.kind}, expected a {kind}")])
        return part

    def floor(self, L: Ledger, name: str, value_id: str, symbol: str, unit: str, title: str
              ) -> str | None:
        """Record a nonzero floor as a traced input; return its id (None when unset)."""
        value = getattr(self.floors, name)
        if value <= 0 or not math.isfinite(value):
            return None
        L.given(value_id, symbol, value, unit, title,
                source="raised after an earlier verification pass, where "
                + self.floors.reasons[name])
        return value_id


def require(selection: Any, what: str) -> Any:
    """The part of a library selection, or an infeasible verdict naming what was missing."""
    if selection.part is None:
        raise InfeasibleDesign(f"no {what} in the parts library fits: {selection.reason}")
    return selection.part


def record_fields(L: Ledger, model: Any, rows: tuple[tuple[str, str, str, str, str], ...]) -> None:
    """Record fields of a requirements section as traced inputs, marking the defaulted ones.

    Each row is (value id, symbol, field name, unit, title).
    """
    for value_id, symbol, attr, unit, title in rows:
        L.given(value_id, symbol, getattr(model, attr), unit, title,
                defaulted=attr not in model.model_fields_set)
