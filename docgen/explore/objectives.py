"""What "best" means: the objectives a search can rank by, each with a tie-break."""

from __future__ import annotations

import math

# name -> (what it measures, unit, sense); "min" ranks the lowest first
OBJECTIVES = {
    "cost": ("total price of the library parts", "", "min"),
    "dissipation": ("largest heat over the corners (engine: input less output power)", "W",
                    "min"),
    "life": ("capacitor life expectancy", "h", "max"),
    "hold-up": ("time the reservoir carries the full load after the mains fails", "s", "max"),
}


def value(v, objective: str) -> float:
    return {"cost": v.cost, "dissipation": v.dissipation, "life": v.cap_life,
            "hold-up": v.hold_up}[objective]


def rank_key(v, objective: str) -> tuple:
    """Best first: the objective, then cost, then dissipation, then the part ids (stable)."""
    x = value(v, objective)
    if not math.isfinite(x):
        x = math.inf
    elif OBJECTIVES[objective][2] == "max":
        x = -x
    return (x, v.cost, v.dissipation, v.cand.choice)


def pareto(points: list, x: str = "cost", y: str = "dissipation") -> list:
    """The verdicts no other beats on both objectives (cost and heat minimised, life and
    hold-up maximised)."""
    def key(v, name):
        val = value(v, name)
        return -val if OBJECTIVES[name][2] == "max" else val

    pts = [v for v in points if math.isfinite(key(v, x)) and math.isfinite(key(v, y))]
    front = []
    for v in sorted(pts, key=lambda v: (key(v, x), key(v, y))):
        if not front or key(v, y) < key(front[-1], y):
            front.append(v)
    return front
