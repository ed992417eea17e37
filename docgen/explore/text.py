"""Sentences and tables about a search, written from its result (the CLI prints them, the
document of the chosen design states the summary)."""

from __future__ import annotations

import math

from ..units import format_quantity as fq
from .objectives import OBJECTIVES, pareto, value
from .search import SearchResult

PHRASE = {"cost": "lowest total part cost", "dissipation": "lowest worst-case heat",
          "life": "longest capacitor life", "hold-up": "longest hold-up time"}


def money(x: float, currency: str) -> str:
    return f"{x:.2f} {currency}".strip() if math.isfinite(x) else "n/a"


def merit(v, objective: str, currency: str) -> str:
    x = value(v, objective)
    if objective == "cost":
        return money(x, currency)
    unit = OBJECTIVES[objective][1]
    return fq(x, unit, 3) if math.isfinite(x) else "n/a"


def space_sentence(r: SearchResult) -> str:
    """How many candidates, how each group left, what was verified."""
    axes = ", ".join(f"{n} {name}{'' if n == 1 else 's'}" for name, n in r.axes)
    pruned = r.bounded_out
    text = (f"The search took every combination of the library's {axes}: {r.space_size} "
            f"candidates. {pruned} were ruled out by hand bounds (a part that cannot give the "
            "voltage or current, or a voltage rating below the peak it would see); "
            f"{len(r.verdicts)} were sized with the pipeline's own rules and verified by the "
            "waveform engine at their worst-case corners and switch-on")
    if r.skipped_by_cost:
        text += (f"; {r.skipped_by_cost} were not verified because their searched parts alone "
                 "cost more than the best design found")
    if r.budget_reached:
        text += (f"; the search stopped at its budget of {r.budget} verified candidates, so the "
                 "rest were not verified")
    n_ok = sum(v.feasible for v in r.verdicts)
    return text + f". {n_ok} passed every check."


def why_sentence(r: SearchResult, currency: str) -> str:
    """Why the best one: its merit, against the greedy design and the runner-up."""
    best = r.best
    if best is None:
        return "No candidate passed every check."
    obj = r.objective
    text = (f"This design ({best.cand.label()}) has the {PHRASE[obj]} of them: "
            f"{merit(best, obj, currency)}")
    if obj != "cost":
        text += f", at a part cost of {money(best.cost, currency)}"
    g = r.greedy
    if g is not None and g.cand == best.cand:
        text += "; it is also the design that stage-by-stage sizing gives."
    elif g is not None and g.feasible:
        text += (f", against {merit(g, obj, currency)} for the design that stage-by-stage "
                 f"sizing gives ({g.cand.label()}).")
    elif g is not None:
        text += (f". The design that stage-by-stage sizing gives ({g.cand.label()}) fails a "
                 f"check: {g.reason}.")
    elif r.greedy_status == "infeasible":
        text += (". Stage-by-stage sizing gives no working design here"
                 + (f" ({r.greedy_reason})" if r.greedy_reason else "") + ".")
    elif r.greedy_status in ("pass", "warn", "fail"):
        text += (". The design that stage-by-stage sizing gives is not among the candidates: "
                 f"{r.greedy_reason}.")
    else:
        text += "."
    others = r.feasible[1:2]
    if others:
        nxt = others[0]
        text += (f" The runner-up ({differs(best, nxt)}) has "
                 f"{merit(nxt, obj, currency)}.")
    return text


def differs(a, b) -> str:
    """The searched parts in which b differs from a."""
    diff = [f"{name} {pid}" for name, pid in b.cand.choice if a.cand.part_id(name) != pid]
    return "other " + ", ".join(diff) if diff else "the same searched parts"


def table(r: SearchResult, currency: str, n: int = 5) -> str:
    """The best few, with what separates each from the best."""
    rows = r.feasible[:n]
    if not rows:
        return "no feasible candidate\n"
    head = (f"{'#':>2}  {'cost':>10}  {'heat':>9}  {'cap life':>10}  {'hold-up':>9}  "
            "parts / differs from #1")
    lines = [head]
    best = rows[0]
    for k, v in enumerate(rows, 1):
        life = fq(v.cap_life, "h", 3) if math.isfinite(v.cap_life) else "n/a"
        what = v.cand.label() if k == 1 else differs(best, v)
        mark = " (greedy)" if v.greedy else ""
        hold = fq(v.hold_up, "s", 3) if math.isfinite(v.hold_up) else "n/a"
        lines.append(f"{k:>2}  {money(v.cost, currency):>10}  {fq(v.dissipation, 'W', 3):>9}  "
                     f"{life:>10}  {hold:>9}  {what}{mark}")
    return "\n".join(lines) + "\n"


def front_points(r: SearchResult, x: str = "cost", y: str = "dissipation"):
    pts = [(value(v, x), value(v, y)) for v in r.feasible]
    front = [(value(v, x), value(v, y)) for v in pareto(r.feasible, x, y)]
    return pts, front
