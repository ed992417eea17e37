"""The neutral result of a run: what the report, results.json and the CLI are rendered from."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from .trace import Assumption, Caution, Equation, TracedValue


@dataclass(frozen=True)
class PartChoice:
    """One bill-of-materials line: a fixed part, a library part or a generic requirement."""

    ref: str  # reference designator, e.g. "C1"
    kind: str  # "transformer", "bridge", "capacitor", "zener", "resistor"
    value_text: str  # short value shown on the schematic, e.g. "1000 uF 25 V"
    description: str  # generic requirement text or the library description
    part_id: str = ""  # library or fixed part id; "" for a generic requirement
    origin: str = "sized"  # "sized" (standard step), "library", or "fixed" (from the file)
    reason: str = ""  # why this part: the selection rule with numbers
    value_ids: tuple[str, ...] = ()  # traced values of its ratings


@dataclass(frozen=True)
class Check:
    """A requirement or rating compared with the design at a named corner."""

    id: str
    title: str
    value: float
    limit: float
    unit: str
    sense: str  # "max": value must not exceed limit; "min": value must not fall below it
    margin: float  # fraction of the limit left over; negative when violated
    status: str  # "pass" | "warn" | "fail"
    corner: str
    value_id: str  # traced value compared
    limit_id: str  # traced value or requirement giving the limit
    ref: str = ""  # part designator when it is a rating check
    requirement: str = ""  # requirements-file field this check enforces, if any


@dataclass
class Stage:
    id: str
    title: str
    intro: str


@dataclass
class Design:
    """Everything computed for one requirements file. No presentation in here."""

    spec_path: str
    spec_text: str
    spec_sha256: str
    requirements: Any  # docgen.spec.requirements.Requirements
    stages: list[Stage]
    values: dict[str, TracedValue]
    equations: dict[str, Equation]
    checks: list[Check]
    parts: list[PartChoice]
    assumptions: list[Assumption]
    cautions: list[Caution]
    status: str  # "pass" | "warn" | "fail" | "infeasible"
    infeasible_reason: str = ""
    waveforms: dict[str, Any] = field(default_factory=dict)  # name -> arrays for plots
    corners: list[dict[str, Any]] = field(default_factory=list)
    monte_carlo: dict[str, Any] = field(default_factory=dict)
    samples: dict[str, Any] = field(default_factory=dict)  # metric -> array, for histograms
    library: tuple[str, str] | None = None  # (path, sha256) of the parts library used
    tool_version: str = ""
    # the design-space search that chose this design (docgen.explore.document.tradeoff_data),
    # drawn as a trade-off figure; None for a design sized stage by stage
    search_tradeoff: dict[str, Any] | None = None

    def counts(self) -> dict[str, int]:
        out = {"pass": 0, "warn": 0, "fail": 0}
        for c in self.checks:
            out[c.status] += 1
        return out
