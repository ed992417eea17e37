"""The calculation appendix as derivation chains, one per block of the design.

A chain reads: the symbols it uses, defined once with their values and where they come from;
each step as one table row (what it finds, the formula, the values put in, the result, its
basis); and the part the chain ends in. Identity steps ("C_req = C_calc") are left out (their
symbol is listed as the same as its source), and an engine figure names the engine instead of
the long list of inputs it was simulated from. A split supply carries both rails in each row.
"""

from __future__ import annotations

from typing import Any

from ..design import Design
from ..rails import NEG
from ..trace import TracedValue
from .review import is_split
from .sources import Citations, basis_word

INPUT_EQUATIONS = ("given", "default")


def _rhs(latex: str) -> str:
    """The values put in: 'lhs = values = result' without its two ends (the result has its
    own column); text only, the numbers were set by the ledger."""
    parts = latex.split("=")
    return "=".join(parts[1:-1]).strip() if len(parts) > 2 else latex


def _twin(design: Design, value_id: str, split: bool) -> list[TracedValue | None]:
    v = design.values.get(value_id)
    if not split:
        return [v]
    return [v, design.values.get(NEG + value_id)]


def _origin(design: Design, v: TracedValue, stage_titles: dict[str, str]) -> str:
    if v.equation == "given":
        return v.source or "requirements file"
    if v.equation == "default":
        return "default" + (f": {v.source}" if v.source and v.source != "default" else "")
    return "step of " + stage_titles.get(v.stage, v.stage)


def _is_identity(v: TracedValue) -> bool:
    return v.equation == "identity"


def _resolve(design: Design, vid: str) -> str:
    """An identity's value id traced back to the value it copies."""
    seen = set()
    while vid in design.values and _is_identity(design.values[vid]) and vid not in seen:
        seen.add(vid)
        vid = design.values[vid].inputs[0]
    return vid


def chains(design: Design, cite: Citations) -> list[dict[str, Any]]:
    split = is_split(design)
    titles = {s.id: s.title for s in design.stages}
    by_stage: dict[str, list[TracedValue]] = {}
    for v in design.values.values():
        by_stage.setdefault(v.stage, []).append(v)
    out = []
    for stage in design.stages:
        if split and stage.id.startswith("neg:"):
            continue  # shown beside the positive rail's step
        values = by_stage.get(stage.id, [])
        steps, legend, aliases = [], {}, []
        for v in values:
            if v.equation in INPUT_EQUATIONS:
                legend.setdefault(v.id, v)
                continue
            if _is_identity(v):
                aliases.append({"v": v, "same_as": design.values[_resolve(design, v.id)]})
                continue
            engine = v.equation.startswith("engine.")
            # an engine figure is simulated from the whole circuit: its inputs are not listed
            for i in () if engine else v.inputs:
                src = design.values[_resolve(design, i)]
                if split and src.id.startswith(NEG) and src.id[len(NEG):] in design.values:
                    src = design.values[src.id[len(NEG):]]  # listed with its rail twin
                if src.stage != stage.id:
                    legend.setdefault(src.id, src)
            eq = design.equations.get(v.equation)
            source = eq.source if eq else v.source
            steps.append({
                "id": v.id, "title": v.title, "symbol": v.symbol, "unit": v.unit,
                "formula": "" if engine else v.latex,
                "engine": engine,
                "cells": [None if t is None else
                          {"id": t.id, "values": "" if engine else _rhs(t.substituted),
                           "value": t.value}
                          for t in _twin(design, v.id, split)],
                "refs": cite.cite(source),
                "basis": basis_word(source),
            })
        if not steps and not legend:
            continue
        stage_ids = {v.id for v in values}
        parts = [p for p in design.parts if any(i in stage_ids for i in p.value_ids)]
        if split:
            parts += [p for p in design.parts
                      if any(i[len(NEG):] in stage_ids for i in p.value_ids if i.startswith(NEG))]
        out.append({
            "id": stage.id, "title": stage.title, "intro": stage.intro,
            # a symbol is anchored where it belongs (its own stage); elsewhere it is repeated
            "symbols": [{"v": v, "home": v.stage == stage.id,
                         "twins": [t for t in _twin(design, v.id, split)],
                         "origin": _origin(design, v, titles)} for v in legend.values()],
            "aliases": aliases,
            "steps": steps,
            "parts": parts,
        })
    return out


def trace_matrix(design: Design, trace_rows: list[dict[str, Any]]) -> dict[str, Any]:
    """Inputs down, checks across; a mark where the input flows into the check. A split
    supply's two rails share a column: + , - or +/- shows which rail."""
    split = is_split(design)
    columns: list[str] = []
    titles: dict[str, str] = {}
    for c in design.checks:
        base = c.id[len(NEG):] if c.id.startswith(NEG) else c.id
        if base not in titles:
            columns.append(base)
            titles[base] = c.title
    rows: dict[str, dict[str, Any]] = {}
    for r in trace_rows:
        vid = r["value"].id
        neg = vid.startswith(NEG)
        base = vid[len(NEG):] if neg else vid
        row = rows.setdefault(base, {"value": design.values.get(base, r["value"]),
                                     "marks": {}})
        for cid in r["checks"]:
            cbase = cid[len(NEG):] if cid.startswith(NEG) else cid
            rail = "-" if (neg or cid.startswith(NEG)) else "+"
            row["marks"].setdefault(cbase, set()).add(rail)
    out_rows = []
    for row in rows.values():
        marks = {}
        for cid, rails in row["marks"].items():
            if not split:
                marks[cid] = "\u25cf"
            else:
                marks[cid] = "\u00b1" if len(rails) == 2 else next(iter(rails)).replace(
                    "-", "\u2212")
        out_rows.append({"value": row["value"], "marks": marks})
    from .review import base_title

    return {"columns": [{"id": c, "n": i + 1, "title": base_title(titles[c])}
                        for i, c in enumerate(columns)],
            "rows": out_rows}
