"""The axes of the search (which library parts each block may take) and the candidates.

A candidate names one library part per free block; it is applied to the requirements as fixed
parts (the fields a user would write), so the pipeline sizes it with its own rules. A block
the requirements file fixes (a part id, or a secondary voltage, VA or capacitance written in the
file) is not searched: a value in the file is never replaced.
"""

from __future__ import annotations

import itertools
from collections.abc import Iterator
from dataclasses import dataclass
from typing import Any

from ..spec.requirements import Requirements

# Discrete diodes per topology (a bridge package counts once).
DIODES_PER_TOPOLOGY = {"bridge": 4, "center-tap": 2, "half-wave": 1}


@dataclass(frozen=True)
class Axis:
    """One searched block: its name, the requirements field that fixes it, its parts."""

    name: str
    field: str
    ref: str
    parts: tuple[Any, ...]


@dataclass(frozen=True)
class Candidate:
    """One combination: (axis name, part id) per free block."""

    choice: tuple[tuple[str, str], ...]

    def part_id(self, axis: str) -> str:
        return dict(self.choice).get(axis, "")

    def label(self) -> str:
        return " + ".join(pid for _, pid in self.choice)


def axes(spec: Requirements, library) -> list[Axis]:
    """The free blocks of this requirements file and the library parts each may take."""
    out: list[Axis] = []
    topo = spec.rectifier.topology
    t = spec.transformer
    if not t.part and t.secondary is None and t.va is None:
        parts = tuple(p for p in library.transformers
                      if p.center_tapped or topo != "center-tap")
        out.append(Axis("transformer", "transformer.part", "T1", parts))
    if not spec.rectifier.part:
        bridges = library.bridges if topo == "bridge" else ()
        out.append(Axis("rectifier", "rectifier.part", "RECT", tuple(bridges) + library.diodes))
    r = spec.reservoir
    if not r.part and r.capacitance is None:
        out.append(Axis("capacitor", "reservoir.part", "C1", library.capacitors))
    o = spec.output[0]
    kind = o.regulator
    if kind in ("zener", "follower") and not o.zener.part:
        out.append(Axis("zener", "output[0].zener.part", "DZ1", library.zeners))
    if kind == "follower" and not o.transistor.part:
        out.append(Axis("transistor", "output[0].transistor.part", "Q1",
                        tuple(p for p in library.transistors if p.polarity == "npn")))
    if kind in ("three-terminal", "adjustable") and not o.linear.part:
        want = "adjustable" if kind == "adjustable" else "fixed"
        out.append(Axis("regulator", "output[0].linear.part", "U1",
                        tuple(p for p in library.regulators
                              if p.type == want and p.polarity == o.polarity)))
    return [a for a in out if a.parts]


def combinations(free: list[Axis]) -> Iterator[Candidate]:
    """Every combination of the axes' parts (the full space, before any bound)."""
    for parts in itertools.product(*(a.parts for a in free)):
        yield Candidate(tuple((a.name, p.id) for a, p in zip(free, parts, strict=True)))


def apply(spec: Requirements, cand: Candidate, free: list[Axis]) -> Requirements:
    """The requirements with the candidate's parts written in as fixed parts."""
    out = spec
    for axis in free:
        pid = cand.part_id(axis.name)
        if pid:
            out = set_field(out, axis.field, pid)
    return out


def set_field(model: Any, path: str, value: Any) -> Any:
    """A copy of ``model`` with the field at ``path`` ("output[0].linear.part") set."""
    head, _, rest = path.partition(".")
    if head.endswith("]"):
        name, index = head[:-1].split("[")
        items = list(getattr(model, name))
        items[int(index)] = set_field(items[int(index)], rest, value)
        return model.model_copy(update={name: items})
    if not rest:
        return model.model_copy(update={head: value})
    return model.model_copy(update={head: set_field(getattr(model, head), rest, value)})


def count(spec_topology: str, part) -> int:
    """How many of a rectifier part the topology takes."""
    return DIODES_PER_TOPOLOGY[spec_topology] if part.kind == "diode" else 1
