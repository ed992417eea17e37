"""What each requirement costs: the best cost found again with one requirement tightened or
relaxed by a step (ripple limit +-20 %, hottest ambient +-10 K, load current +-10 %)."""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from ..errors import DocgenError
from ..spec import LoadedSpec
from .search import search
from .space import set_field

# (field, what, [(step name, new value from the old)]); tightening first
STEPS = (
    ("output[0].ripple_max", "ripple limit",
     (("-20 %", lambda v: v * 0.8), ("+20 %", lambda v: v * 1.2))),
    ("environment.ambient_max", "hottest ambient",
     (("+10 K", lambda v: v + 10.0), ("-10 K", lambda v: v - 10.0))),
    ("output[0].load_max", "load current",
     (("+10 %", lambda v: v * 1.1), ("-10 %", lambda v: v * 0.9))),
)


@dataclass
class Step:
    field: str
    what: str
    step: str
    value: float  # the requirement after the step, SI
    best_cost: float  # nan when no candidate passes
    candidates: int  # verified


def _get(spec, path: str) -> float:
    obj = spec
    for part in path.split("."):
        if part.endswith("]"):
            name, index = part[:-1].split("[")
            obj = getattr(obj, name)[int(index)]
        else:
            obj = getattr(obj, part)
    return float(obj)


def sensitivity(loaded: LoadedSpec, *, budget: int) -> list[Step]:
    """The best cost with each requirement stepped, one at a time (cost objective)."""
    out = []
    for field, what, steps in STEPS:
        old = _get(loaded.requirements, field)
        for name, fn in steps:
            new = fn(old)
            spec = set_field(loaded.requirements, field, new)
            try:
                r = search(replace(loaded, requirements=spec), budget=budget, greedy=False)
            except DocgenError:
                out.append(Step(field, what, name, new, math.nan, 0))
                continue
            out.append(Step(field, what, name, new,
                            r.best.cost if r.best is not None else math.nan, len(r.verdicts)))
    return out
