"""Bill of materials: one row per part rating, with the stress, the rating and the margin."""

from __future__ import annotations

import csv
import io
import re

from ..design import Design
from ..units import format_quantity


def bom_rows(design: Design) -> list[dict[str, str]]:
    """Part lines followed by their rating checks (stress at the worst corner vs allowed)."""
    rows: list[dict[str, str]] = []
    for part in design.parts:
        checks = [c for c in design.checks if c.ref == part.ref]
        base = {"ref": part.ref, "part": part.part_id or part.value_text,
                "description": part.description, "origin": part.origin}
        if not checks:
            rows.append({**base, "rating": "", "stress": "", "allowed": "", "margin": "",
                         "status": ""})
        for c in checks:
            rows.append({**base, "rating": c.title,
                         "stress": format_quantity(c.value, c.unit),
                         "allowed": format_quantity(c.limit, c.unit),
                         "margin": format_quantity(c.margin, "%", 3), "status": c.status})
    return rows


# A cell a spreadsheet would run as a formula starts with one of these (OWASP, "CSV Injection";
# tab and carriage return also lead some programs into a formula).
_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")
# A plain signed number with an optional unit ("-12.5 %", "-3 mV") is data, not a formula.
_SIGNED_NUMBER = re.compile(
    r"[-+][0-9]+(?:\.[0-9]+)?(?:e-?[0-9]+)?(?: ?[%\w\u00b0\u00b5\u03a9/]+)?")


def neutralise(cell: str) -> str:
    """A CSV cell that no spreadsheet runs as a formula: one starting with = + - @ (or a tab or
    carriage return) gets a leading apostrophe, unless it is a plain signed number."""
    if cell.startswith(_FORMULA_START) and not _SIGNED_NUMBER.fullmatch(cell):
        return "'" + cell
    return cell


def bom_csv(design: Design) -> str:
    buf = io.StringIO()
    fields = ["ref", "part", "description", "origin", "rating", "stress", "allowed", "margin",
              "status"]
    writer = csv.DictWriter(buf, fieldnames=fields, lineterminator="\n")
    writer.writeheader()
    for row in bom_rows(design):
        writer.writerow({k: neutralise(str(v)) for k, v in row.items()})
    return buf.getvalue()
