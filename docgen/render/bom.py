"""Bill of materials for people (the report's table) and for spreadsheets (two CSV files).

bom.csv has one row per distinct part with its designators, quantity and ratings as plain numbers
(the unit in the column header), so a spreadsheet or pandas can sort and sum it. The stress of
every rating at its worst corner goes to bom-stresses.csv, one row per rating check. Both files
start with a UTF-8 byte-order mark so spreadsheets read the unit symbols, and text cells that a
spreadsheet would run as a formula are neutralised.
"""

from __future__ import annotations

import csv
import io
import math

from ..design import Design, PartChoice
from ..units import format_quantity

BOM_CSV = "bom.csv"
STRESS_CSV = "bom-stresses.csv"
BOM_BYTE_ORDER_MARK = "\ufeff"

# A cell starting with one of these runs as a formula in common spreadsheets.
_FORMULA_LEADS = ("=", "+", "-", "@", "\t", "\r")


def neutralise(text: str) -> str:
    """Text that a spreadsheet would evaluate gets a leading apostrophe (shown as text)."""
    return "'" + text if text.startswith(_FORMULA_LEADS) else text


def _cell(value: object) -> object:
    """Numbers stay numbers (finite only); text is neutralised."""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, float):
        return repr(value) if math.isfinite(value) else ""
    return neutralise(str(value))


def _scaled(value: float, unit: str) -> tuple[float, str]:
    """SI numbers as written in the CSV: fractions whose unit is % become percent."""
    return (value * 100.0, "%") if unit == "%" else (value, unit)


def bom_rows(design: Design) -> list[dict[str, str]]:
    """Rating lines for the report: stress at the worst corner against the allowed value."""
    rows: list[dict[str, str]] = []
    for part in design.parts:
        for c in (c for c in design.checks if c.ref == part.ref):
            rows.append({"ref": part.ref, "part": part.part_id or part.value_text,
                         "rating": c.title, "value_id": c.value_id, "limit_id": c.limit_id,
                         "stress": format_quantity(c.value, c.unit),
                         "allowed": format_quantity(c.limit, c.unit),
                         "margin": format_quantity(c.margin, "%", 3), "status": c.status})
    return rows


def _rating_key(value_id: str) -> str:
    """A rating's column key: the value id without the rail prefix, so both rails share it."""
    return value_id[4:] if value_id.startswith("neg.") else value_id


def _ratings(design: Design, part: PartChoice) -> dict[str, tuple[float, str]]:
    out: dict[str, tuple[float, str]] = {}
    for vid in part.value_ids:
        v = design.values.get(vid)
        if v is not None:
            out[_rating_key(vid)] = _scaled(v.value, v.unit)
    return out


def _header(key: str, unit: str) -> str:
    return f"{key} ({unit})" if unit else key


def part_table(design: Design) -> tuple[list[str], list[list[object]]]:
    """One row per distinct part: identical parts share a row with their designators listed."""
    groups: dict[tuple, dict] = {}
    columns: dict[str, str] = {}  # rating key -> unit, in first-seen order
    for part in design.parts:
        ratings = _ratings(design, part)
        for key, (_, unit) in ratings.items():
            columns.setdefault(key, unit)
        ident = (part.kind, part.value_text, part.part_id, part.description, part.origin,
                 tuple(sorted((k, v) for k, (v, _) in ratings.items())))
        group = groups.setdefault(ident, {"part": part, "refs": [], "ratings": ratings})
        group["refs"].append(part.ref)
    header = ["designators", "quantity", "kind", "value", "part_id", "description", "origin",
              "reason"] + [_header(k, u) for k, u in columns.items()]
    rows: list[list[object]] = []
    for group in groups.values():
        p: PartChoice = group["part"]
        ratings = group["ratings"]
        rows.append([" ".join(group["refs"]), len(group["refs"]), p.kind, p.value_text,
                     p.part_id, p.description, p.origin, p.reason]
                    + [ratings[k][0] if k in ratings else "" for k in columns])
    return header, rows


def stress_table(design: Design) -> tuple[list[str], list[list[object]]]:
    """One row per rating check of a part: stress, allowed value and margin as numbers."""
    header = ["ref", "check", "rating", "stress", "allowed", "unit", "margin (%)", "status",
              "corner"]
    rows: list[list[object]] = []
    refs = [p.ref for p in design.parts]
    for ref in refs:
        for c in (c for c in design.checks if c.ref == ref):
            stress, unit = _scaled(c.value, c.unit)
            allowed, _ = _scaled(c.limit, c.unit)
            rows.append([ref, c.id, c.title, stress, allowed, unit, c.margin * 100.0, c.status,
                         c.corner])
    return header, rows


def _csv_text(header: list[str], rows: list[list[object]]) -> str:
    buf = io.StringIO()
    writer = csv.writer(buf, lineterminator="\n")
    writer.writerow([neutralise(h) for h in header])
    for row in rows:
        writer.writerow([_cell(v) for v in row])
    return BOM_BYTE_ORDER_MARK + buf.getvalue()


def bom_csv(design: Design) -> str:
    """bom.csv: one row per part; a byte-order mark first."""
    return _csv_text(*part_table(design))


def stress_csv(design: Design) -> str:
    """bom-stresses.csv: one row per rating check of a part; a byte-order mark first."""
    return _csv_text(*stress_table(design))
