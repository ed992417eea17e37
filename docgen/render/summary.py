"""What the summary says beyond the checks: the largest stress of the design and, for a pass
element whose junction without a heat sink is computed, what that figure means.

``summary_facts`` picks value ids (results.json carries them); ``summary_notes`` writes the
sentences from the same ids, numbers through the project's formatter, so the summary, the
checks and results.json show one figure per stress.
"""

from __future__ import annotations

from typing import Any

from ..design import Design
from ..units import format_quantity

# Verified dissipations (engine, worst over corners and samples) and the part each heats.
POWER_STRESSES = (
    ("engine.transistor_power", "Q1", "the pass transistor"),
    ("engine.regulator_power", "U1", "the regulator"),
    ("engine.zener_power", "DZ1", "the zener"),
    ("engine.resistor_power", "R1", "the series resistor"),
)
# (prefix, part, verified junction id) of pass elements with a heat budget
HEAT = (("q", "the pass transistor", "engine.transistor_junction"),
        ("reg", "the regulator", "engine.regulator_junction"))


def _rails(design: Design) -> list[tuple[str, str]]:
    """(value prefix, rail words) of each rail."""
    if any(k.startswith("neg.") for k in design.values):
        return [("", "positive rail: "), ("neg.", "negative rail: ")]
    return [("", "")]


def _ref(design: Design, value_id: str, default: str) -> str:
    """The part a stress belongs to: its check's designator, else the kind's usual one (the
    negative rail's designator on a split supply)."""
    from ..rails import REF_MAP

    check = next((c for c in design.checks if c.value_id == value_id and c.ref), None)
    if check:
        return check.ref
    return REF_MAP.get(default, default) if value_id.startswith("neg.") else default


def summary_facts(design: Design) -> dict[str, Any]:
    """Value ids the summary states: the largest verified dissipation per rail and the heat
    budget of each pass element."""
    v = design.values
    largest, heat = [], []
    for prefix, rail in _rails(design):
        found = [(prefix + vid, ref, what) for vid, ref, what in POWER_STRESSES
                 if prefix + vid in v]
        if found:
            vid, ref, what = max(found, key=lambda f: v[f[0]].value)
            largest.append({"value_id": vid, "ref": _ref(design, vid, ref), "part": what,
                            "rail": rail})
        for p, what, tj in HEAT:
            bare = f"{prefix}{p}.t_j_bare"
            if bare not in v:
                continue
            heat.append({"bare_id": bare, "part": what, "rail": rail,
                         "max_id": f"{prefix}{p}.t_j_max", "limit_id": f"{prefix}{p}.t_j_limit",
                         "sink_id": (f"{prefix}{p}.theta_sa" if f"{prefix}{p}.theta_sa" in v
                                     else None),
                         "power_id": f"{prefix}{p}.p_design",
                         "verified_id": prefix + tj if prefix + tj in v else None})
    return {"largest_stress": largest, "heat": heat}


def summary_notes(design: Design) -> list[dict[str, Any]]:
    """Sentences of the summary, each with the value ids whose numbers it shows."""
    v = design.values

    def q(vid: str) -> str:
        return format_quantity(v[vid].value, v[vid].unit)

    facts = summary_facts(design)
    notes = []
    for f in facts["largest_stress"]:
        vid = f["value_id"]
        notes.append({"ids": [vid], "text": (
            f"{f['rail'].capitalize()}Largest stress of the design: {q(vid)} dissipated in "
            f"{f['part']} ({f['ref']}), the verified figure (engine, worst over the corners "
            "and the Monte Carlo samples).")})
    for h in facts["heat"]:
        bare, power, mx = h["bare_id"], h["power_id"], h["max_id"]
        rail = h["rail"].capitalize()
        text = (f"{rail}Without a heat sink the junction of {h['part']} would reach {q(bare)} "
                f"at the hottest ambient with the {q(power)} its heat budget uses (a "
                "thermal-resistance figure")
        ids = [bare, power]
        if v[bare].value > v[mx].value:
            text += f"; the part would fail long before, its maker's limit being {q(mx)}"
            ids.append(mx)
        text += ")"
        if h["sink_id"]:
            text += (f"; a heat sink of at most {q(h['sink_id'])} sink-to-ambient is "
                     "therefore required and is in the bill of materials")
            ids.append(h["sink_id"])
        else:
            text += "; no heat sink is needed"
        if h["verified_id"]:
            text += (f". With the design as built the verified junction temperature is "
                     f"{q(h['verified_id'])} against a limit of {q(h['limit_id'])}")
            ids += [h["verified_id"], h["limit_id"]]
        notes.append({"ids": ids, "text": text + "."})
    return notes
