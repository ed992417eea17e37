"""The schematic as text: which terminal of each part goes to which node.

The drawing is a picture; this list says the same in words, for screen readers (the schematic
image points at it) and for anyone checking the wiring. It follows the circuits docgen draws
(docgen/render/schematic.py): designators by letter in natural order, adjustable divider R OUT-ADJ
then ADJ-0 V, the negative rail of a split supply mirrored.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from ..design import Design, PartChoice

SHARED = {"T1", "F1", "R9", "R10", "BR1", "D1", "D3"}


@dataclass(frozen=True)
class Connection:
    ref: str
    part: str  # short value text
    pins: str  # "terminal: node; terminal: node"


def _natural(ref: str) -> tuple[str, int]:
    m = re.match(r"([A-Z]+)(\d*)", ref)
    return (m.group(1), int(m.group(2) or 0)) if m else (ref, 0)


def _label(p: PartChoice) -> str:
    return p.value_text + (f" ({p.part_id})" if p.part_id else "")


def _rectifier(topology: str, parts: dict[str, PartChoice], vc: str, vneg: str) -> list[tuple]:
    if topology == "bridge" and "BR1" in parts:
        return [("BR1", "~: S1 and S2; +: " + vc + "; -: 0 V")]
    if topology == "center-tap" and "D1" in parts:
        return [("D1", "two diodes: anodes at S1 and S2; cathodes at " + vc)]
    if topology == "half-wave" and "D1" in parts:
        return [("D1", "anode: S1; cathode: " + vc)]
    if topology == "split":
        rows = []
        if "D1" in parts:
            rows.append(("D1", "positive-rail diodes: anodes at S1 and S2; cathodes at " + vc))
        if "D3" in parts:
            rows.append(("D3", "negative-rail diodes: cathodes at S1 and S2; anodes at " + vneg))
        return rows
    return []


def _regulator(style: str, refs: list[str], vin: str, out: str, negative: bool) -> list[tuple]:
    """Connections of one output's parts by the kind's drawing style (docgen.regulators)."""
    by_letter: dict[str, list[str]] = {}
    for ref in sorted(refs, key=_natural):
        by_letter.setdefault(_natural(ref)[0], []).append(ref)
    r, dz = by_letter.get("R", []), by_letter.get("DZ", [])
    q, u = by_letter.get("Q", []), by_letter.get("U", [])
    rows: list[tuple] = []
    zener_pins = ("anode: {0}; cathode: 0 V" if negative else "cathode: {0}; anode: 0 V")
    if style == "series" and r:
        rows.append((r[0], f"{vin} to {out}"))
    elif style == "zener" and r and dz:
        rows += [(r[0], f"{vin} to {out}"), (dz[0], zener_pins.format(out))]
    elif style == "follower" and r and dz and q:
        base = "B-" if negative else "B"
        rows += [(r[0], f"{vin} to {base}"), (dz[0], zener_pins.format(base)),
                 (q[0], f"collector: {vin}; base: {base}; emitter: {out}"
                        + (" (PNP)" if negative else " (NPN)"))]
    elif style == "three-terminal" and u:
        rows.append((u[0], f"input: {vin}; ground: 0 V; output: {out}"))
    elif style == "adjustable" and u:
        adj = "ADJ-" if negative else "ADJ"
        rows.append((u[0], f"input: {vin}; adjust: {adj}; output: {out}"))
        if len(r) >= 2:
            rows += [(r[0], f"{out} to {adj}"), (r[1], f"{adj} to 0 V")]
    c = by_letter.get("C", [])
    if style in ("three-terminal", "adjustable") and u and len(c) >= 2:
        rows += [(c[0], f"{vin} to 0 V (regulator input)"),
                 (c[1], f"{out} to 0 V (regulator output)")]
    return rows


def netlist(design: Design) -> list[Connection]:
    """Every part with the nodes its terminals connect to (heat sinks: what they cool)."""
    parts = {p.ref: p for p in design.parts}
    spec = design.requirements
    topology = spec.rectifier.topology
    split = topology == "split"
    vc, vneg = ("V_C+", "V_C-") if split else ("V_C", "")
    rows: list[tuple[str, str]] = []
    if "F1" in parts:
        rows.append(("F1", "mains L to L fused"))
    if "T1" in parts:
        tap = "; centre tap CT: 0 V" if topology in ("center-tap", "split") else ""
        low = "; S2: 0 V" if topology == "half-wave" else ""
        rows.append(("T1", "primary: L fused and N; secondary: S1 and S2" + tap + low))
    rows += _rectifier(topology, parts, vc, vneg)
    if "C1" in parts:
        rows.append(("C1", f"+: {vc}; -: 0 V"))
    if split and "C2" in parts:
        rows.append(("C2", f"+: 0 V; -: {vneg}"))
    for bleeder in ("R9", "R10"):
        if bleeder in parts:
            rows.append((bleeder, f"{vc} to {vneg or '0 V'} (bleeder)"))
    from ..rails import REF_MAP
    from ..regulators import regulator

    negative_refs = set(REF_MAP.values()) - SHARED
    for out in spec.output:
        negative = out.polarity == "negative"
        reservoirs = ("C1", "C2") if split else ("C1",)
        refs = [r for r in parts if r not in SHARED and not r.startswith("HS")
                and r not in reservoirs and ((r in negative_refs) == negative or not split)]
        node = "OUT-" if negative else ("OUT+" if split else "OUT")
        vin = vneg if negative else vc
        style = regulator(out.regulator).drawing
        if style == "none":
            rows.append(("", f"{out.name}: {node} is {vin}"))
        rows += _regulator(style, refs, vin, node, negative)
    last = ""  # a heat sink follows the part it cools in the bill of materials
    for p in design.parts:
        if p.ref.startswith(("U", "Q")):
            last = p.ref
        elif p.ref.startswith("HS"):
            rows.append((p.ref, f"mounted on {last or 'the regulator'} (no electrical "
                                "connection)"))
    listed = {ref for ref, _ in rows}
    rows += [(ref, "see the schematic") for ref in parts if ref not in listed]
    return [Connection(ref, _label(parts[ref]) if ref in parts else "", pins)
            for ref, pins in rows]
