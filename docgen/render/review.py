"""What a reviewer reads first, prepared from the Design: one stress table over every part, the
checks, the design decisions and the open points.

A split supply shows its two rails side by side: each row carries one cell per rail (the
negative rail's value ids carry the prefix "neg."), and a part both rails share (transformer,
fuse) fills the first cell only. Numbers stay numbers here; the templates format them.
"""

from __future__ import annotations

from typing import Any

from ..design import Check, Design
from ..rails import NEG

RAIL_PREFIXES = ("(+ rail) ", "(- rail) ")
# Equations that turn a rating into the allowed stress: (rating, derating factor).
DERATING_EQUATIONS = ("scale.ratio", "fuse.pulse_derated")


def is_split(design: Design) -> bool:
    return design.requirements.rectifier.topology == "split"


def rail_names(design: Design) -> list[str]:
    return ["+ rail", "\u2212 rail"] if is_split(design) else [""]


def base_title(title: str) -> str:
    for prefix in RAIL_PREFIXES:
        if title.startswith(prefix):
            return title[len(prefix):]
    return title


def _paired_checks(design: Design) -> list[tuple[Check, Check | None]]:
    """Each check of the positive (or only) rail with its negative-rail twin, if any."""
    by_id = {c.id: c for c in design.checks}
    return [(c, by_id.get(NEG + c.id)) for c in design.checks if not c.id.startswith(NEG)]


def _rating(design: Design, check: Check) -> dict[str, Any]:
    """The part's rating behind a check's limit and the derating factor applied to it."""
    limit = design.values.get(check.limit_id)
    if limit is not None and limit.equation in DERATING_EQUATIONS and len(limit.inputs) == 2:
        ins = [design.values[i] for i in limit.inputs]
        rating = next((v for v in ins if v.unit == limit.unit), None)
        factor = next((v for v in ins if v is not rating), None)
        if rating is not None and factor is not None:
            return {"rating": rating.value, "factor": factor.value, "factor_unit": factor.unit}
    return {"rating": check.limit, "factor": None, "factor_unit": ""}


def _cell(design: Design, check: Check | None) -> dict[str, Any] | None:
    if check is None:
        return None
    return {"check": check, "ref": check.ref, **_rating(design, check)}


def _part_label(design: Design, ref: str) -> str:
    part = next((p for p in design.parts if p.ref == ref), None)
    return (part.part_id or part.value_text) if part else ""


def stress_table(design: Design) -> list[dict[str, Any]]:
    """Every part's stresses, each once: the verified figure, its corner, the rating, the
    derated allowed value and the margin, in bill-of-materials order."""
    order = {p.ref: i for i, p in enumerate(design.parts)}
    rows = []
    for pos, neg in _paired_checks(design):
        if not pos.ref:
            continue
        refs = [pos.ref] + ([neg.ref] if neg is not None else [])
        rows.append({"id": pos.id, "title": base_title(pos.title), "unit": pos.unit,
                     "refs": refs,
                     "parts": [_part_label(design, r) for r in refs],
                     "cells": [_cell(design, pos), _cell(design, neg)][:len(rail_names(design))],
                     "order": order.get(pos.ref, len(order))})
    rows.sort(key=lambda r: r["order"])
    return rows


def check_table(design: Design) -> list[dict[str, Any]]:
    """Every check, worst first, both rails in one row."""
    def rank(pair):
        worst = min((c for c in pair if c is not None),
                    key=lambda c: ({"fail": 0, "warn": 1, "pass": 2}[c.status], c.margin))
        return ({"fail": 0, "warn": 1, "pass": 2}[worst.status], worst.margin)

    rows = []
    for pos, neg in sorted(_paired_checks(design), key=rank):
        rows.append({"id": pos.id, "title": base_title(pos.title),
                     "refs": [r for r in (pos.ref, neg.ref if neg else "") if r],
                     "checks": [pos, neg][:len(rail_names(design))]})
    return rows


def decisions(design: Design) -> dict[str, Any]:
    """What was chosen and why (the selection records of the parts), and what the engine raised
    between sizing passes and why (the refine loop's records)."""
    chosen = [{"ref": p.ref, "choice": p.part_id or p.value_text, "origin": p.origin,
               "description": p.description, "reason": p.reason} for p in design.parts]
    raised = [a for a in design.assumptions if ".raised." in "." + a.id]
    conflicts = [a for a in design.assumptions if a.id.startswith("assume.conflict.")]
    return {"chosen": chosen, "raised": raised, "conflicts": conflicts,
            "topology": design.requirements.rectifier.topology}


NOT_COVERED = "not covered"


def _not_covered(text: str) -> str:
    """The "not covered" part of an assumption's text, or "" when it has none."""
    at = text.lower().find(NOT_COVERED)
    return text[at:] if at >= 0 else ""


def open_points(design: Design) -> list[dict[str, Any]]:
    """Every point a reviewer must close by hand, in one list: checks that fail or sit in the
    warning band, cautions this design raised, conflicts with the file, Monte Carlo samples
    that fail, and every "not covered" statement of the assumptions."""
    points: list[dict[str, Any]] = []
    for c in sorted(design.checks, key=lambda c: ({"fail": 0, "warn": 1}.get(c.status, 2),
                                                  c.margin)):
        if c.status != "pass":
            points.append({"kind": "check", "check": c})
    for c in design.cautions:
        if c.triggered_by:
            points.append({"kind": "caution", "title": c.title, "text": c.text})
    for a in design.assumptions:
        if a.id.startswith("assume.conflict."):
            points.append({"kind": "conflict", "text": a.text})
    mc = design.monte_carlo or {}
    for label, summary in (("", mc), ("negative rail", mc.get("negative_rail") or {})):
        if summary and summary.get("yield", 1.0) < 1.0:
            points.append({"kind": "yield", "rail": label, "yield": summary["yield"],
                           "samples": summary.get("samples", 0),
                           "failing": {k: n for k, n in summary.get("failing", {}).items()
                                       if n}})
    seen: set[str] = set()
    for a in design.assumptions:
        text = a.text if a.id.startswith("assume.not_covered") else _not_covered(a.text)
        if text and text not in seen:
            seen.add(text)
            points.append({"kind": "not covered", "text": text})
    for c in design.cautions:
        text = _not_covered(c.text)
        if text and text not in seen:
            seen.add(text)
            points.append({"kind": "not covered", "text": text})
    return points
