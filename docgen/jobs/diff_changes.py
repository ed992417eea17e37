"""What changed between two computed sides, in design terms.

Requirements are compared as validated values (so "40 mA" and "0.04 A" are the same), computed
values above a relative threshold, bill-of-materials lines, checks that changed status or
margin, cautions and the overall status. Changes in ``[project]`` (title, revision, date, ...)
are listed as document fields but do not count as a change of the design.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

from .diff_sides import Side

DEFAULT_THRESHOLD = 1e-9


@dataclass
class FieldChange:
    path: str  # "output[0].load_max"
    old: str  # display text with unit, "" when the field is absent on that side
    new: str


@dataclass
class ValueChange:
    id: str
    title: str
    old: str
    new: str
    percent: float | None  # change relative to the old value; None when new/removed/old = 0


@dataclass
class PartChange:
    ref: str
    kind: str
    old: str  # short text: value, part id, origin; "" when the line is new
    new: str  # "" when the line is gone
    old_detail: str = ""  # the description (requirement text or library description)
    new_detail: str = ""


@dataclass
class CheckChange:
    id: str
    title: str
    old_status: str  # "" when the check is new
    new_status: str  # "" when the check is gone
    old_margin: float | None
    new_margin: float | None

    @property
    def flipped(self) -> bool:
        return self.old_status != self.new_status


@dataclass
class CautionChange:
    id: str
    title: str
    change: str  # "added" | "removed"


@dataclass
class DiffReport:
    old: Side
    new: Side
    threshold: float
    requirements: list[FieldChange] = field(default_factory=list)
    document: list[FieldChange] = field(default_factory=list)  # [project] fields
    values: list[ValueChange] = field(default_factory=list)
    parts: list[PartChange] = field(default_factory=list)
    checks: list[CheckChange] = field(default_factory=list)
    cautions: list[CautionChange] = field(default_factory=list)
    compared: bool = True  # False when either side is infeasible (no design to compare)

    @property
    def flipped(self) -> list[CheckChange]:
        return [c for c in self.checks if c.flipped]

    @property
    def moved(self) -> list[CheckChange]:
        return [c for c in self.checks if not c.flipped]

    @property
    def status_changed(self) -> bool:
        return (self.old.status, self.old.reason) != (self.new.status, self.new.reason)

    @property
    def changed(self) -> bool:
        """True when anything that matters changed (not [project] fields alone)."""
        return bool(self.requirements or self.values or self.parts or self.checks
                    or self.cautions or self.status_changed)

    def count(self) -> int:
        return (len(self.requirements) + len(self.values) + len(self.parts) + len(self.checks)
                + len(self.cautions) + (1 if self.status_changed else 0))


def moved(old: float, new: float, threshold: float) -> bool:
    """True when ``new`` differs from ``old`` by more than ``threshold`` relative."""
    if old == new:
        return False
    if not (math.isfinite(old) and math.isfinite(new)):
        return True
    return abs(new - old) > threshold * max(abs(old), abs(new))


def _field_text(value: Any, unit: str) -> str:
    from ..units import format_quantity

    if value is None:
        return "not set"
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float) and unit:
        return format_quantity(value, unit)
    if isinstance(value, (int, float)):
        return f"{value:g}"
    return str(value)


def flatten(model: Any, prefix: str = "") -> dict[str, tuple[Any, str]]:
    """A validated model -> {TOML path: (value, unit)} for every leaf field."""
    from pydantic import BaseModel

    out: dict[str, tuple[Any, str]] = {}
    for name, info in type(model).model_fields.items():
        key = info.alias or name
        if key == "schema":
            continue
        path = f"{prefix}.{key}" if prefix else key
        value = getattr(model, name)
        extra = info.json_schema_extra if isinstance(info.json_schema_extra, dict) else {}
        unit = str(extra.get("unit", ""))
        if isinstance(value, BaseModel):
            out.update(flatten(value, path))
        elif isinstance(value, (list, tuple)) and value and isinstance(value[0], BaseModel):
            for i, item in enumerate(value):
                out.update(flatten(item, f"{path}[{i}]"))
        else:
            out[path] = (value, unit)
    return out


def _same_field(a: Any, b: Any, threshold: float) -> bool:
    if isinstance(a, float) and isinstance(b, float):
        return not moved(a, b, threshold)
    return a == b


def compare_requirements(old: Any, new: Any, threshold: float = 1e-12) -> list[FieldChange]:
    """Every field whose validated value differs; ``threshold`` only absorbs the rounding of
    unit conversion ("40 mA" vs "0.04 A"), it is not the user's value threshold."""
    a, b = flatten(old), flatten(new)
    rows = []
    for path in list(a) + [p for p in b if p not in a]:
        if path in a and path in b and _same_field(a[path][0], b[path][0], threshold):
            continue
        rows.append(FieldChange(
            path,
            _field_text(*a[path]) if path in a else "",
            _field_text(*b[path]) if path in b else ""))
    return rows


def _value_rows(old: Any, new: Any, threshold: float) -> list[ValueChange]:
    from ..units import format_quantity as fq

    rows = []
    for vid, nv in new.values.items():
        ov = old.values.get(vid)
        if ov is None:
            rows.append(ValueChange(vid, nv.title, "", fq(nv.value, nv.unit), None))
        elif ov.unit != nv.unit or moved(ov.value, nv.value, threshold):
            pct = (nv.value - ov.value) / abs(ov.value) * 100.0 if ov.value != 0 else None
            rows.append(ValueChange(vid, nv.title, fq(ov.value, ov.unit), fq(nv.value, nv.unit),
                                    pct))
    for vid, ov in old.values.items():
        if vid not in new.values:
            rows.append(ValueChange(vid, ov.title, fq(ov.value, ov.unit), "", None))
    return rows


def _part_text(p: Any) -> str:
    text = p.value_text
    if p.part_id:
        text += f" [{p.part_id}]"
    if p.origin != "sized":
        text += f" ({p.origin})"
    return text


def _part_rows(old: Any, new: Any) -> list[PartChange]:
    a = {p.ref: p for p in old.parts}
    b = {p.ref: p for p in new.parts}
    rows = []
    for ref in list(b) + [r for r in a if r not in b]:
        pa, pb = a.get(ref), b.get(ref)
        ta = _part_text(pa) if pa else ""
        tb = _part_text(pb) if pb else ""
        da = pa.description if pa else ""
        db = pb.description if pb else ""
        if (ta, da, pa and pa.kind) != (tb, db, pb and pb.kind):
            rows.append(PartChange(ref, (pb or pa).kind, ta, tb, da, db))
    return rows


def _check_rows(old: Any, new: Any, threshold: float) -> list[CheckChange]:
    a = {c.id: c for c in old.checks}
    b = {c.id: c for c in new.checks}
    rows = []
    for cid in list(b) + [c for c in a if c not in b]:
        ca, cb = a.get(cid), b.get(cid)
        if ca and cb and ca.status == cb.status and not moved(ca.margin, cb.margin, threshold):
            continue
        rows.append(CheckChange(
            cid, (cb or ca).title, ca.status if ca else "", cb.status if cb else "",
            ca.margin if ca else None, cb.margin if cb else None))
    return rows


def _caution_rows(old: Any, new: Any) -> list[CautionChange]:
    a = {c.id: c for c in old.cautions}
    b = {c.id: c for c in new.cautions}
    rows = [CautionChange(cid, c.title, "added") for cid, c in b.items() if cid not in a]
    rows += [CautionChange(cid, c.title, "removed") for cid, c in a.items() if cid not in b]
    return rows


def compare(old: Side, new: Side, threshold: float = DEFAULT_THRESHOLD) -> DiffReport:
    report = DiffReport(old, new, threshold)
    everything = compare_requirements(old.requirements, new.requirements)
    report.document = [c for c in everything if c.path.startswith("project.")]
    report.requirements = [c for c in everything if not c.path.startswith("project.")]
    if old.design is None or new.design is None:
        report.compared = False
        return report
    report.values = _value_rows(old.design, new.design, threshold)
    report.parts = _part_rows(old.design, new.design)
    report.checks = _check_rows(old.design, new.design, threshold)
    report.cautions = _caution_rows(old.design, new.design)
    return report
