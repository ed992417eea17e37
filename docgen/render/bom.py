"""Bill of materials: one row per part rating, with the stress, the rating and the margin."""

from __future__ import annotations

import csv
import io

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


def bom_csv(design: Design) -> str:
    buf = io.StringIO()
    fields = ["ref", "part", "description", "origin", "rating", "stress", "allowed", "margin",
              "status"]
    writer = csv.DictWriter(buf, fieldnames=fields, lineterminator="\n")
    writer.writeheader()
    for row in bom_rows(design):
        writer.writerow(row)
    return buf.getvalue()
