"""Cheap necessary conditions: a candidate that fails one cannot pass the checks, so it is
dropped before any sizing or engine run.

Each bound is weaker than the check it stands for (a slack covers the difference between the
library's figures and the pipeline's models), so a bound never drops a feasible design:
- the peak of the secondary at low line (no-load EMF, with 10 % slack) must reach the output
  voltage, and for a three-terminal regulator the output plus its dropout (the capacitor cannot
  charge above the source's peak: common practice);
- the transformer's rated current must cover the average output current (the RMS of a winding
  current is at least its mean; a center-tap half carries half the current: 1/4 with slack);
- capacitor and diode voltage ratings, derated, must cover the no-load peak at high line (the
  regulation taken 10 % low), the diode's times the topology's PIV factor (the hand checks
  cap_voltage and bridge_piv);
- the rectifier's derated average-current rating must cover the load current;
- a regulator, zener or pass transistor must be able to give the output voltage and current.
"""

from __future__ import annotations

import itertools
import math
from collections import Counter

from ..spec.requirements import Requirements
from ..topology import topology
from .space import Axis, Candidate

SLACK = 0.10  # on the transformer's no-load voltage estimate


def _half(t) -> float:
    return t.half_voltage


def _emf_high(t) -> float:
    """An upper estimate of the secondary's no-load RMS (per conducting winding), with slack."""
    if t.regulation is not None:
        v = t.secondary_voltage * (1 + t.regulation)
    else:
        v = t.secondary_voltage + t.rated_current * (t.winding_resistance or 0.0)
    if t.center_tapped:
        v /= 2
    return v * (1 + SLACK)


def part_bound(spec: Requirements, axis: str, p) -> str:
    """Why one part alone cannot serve (empty when it may)."""
    o = spec.output[0]
    v_out, i_out, tol = o.voltage, o.load_max, o.tolerance
    topo = topology(spec.rectifier.topology)
    m = spec.margins
    low = 1 - spec.mains.tolerance_low
    if axis == "transformer":
        if math.sqrt(2) * _emf_high(p) * low < v_out:
            return "secondary peak at low line below the output voltage"
        share = 0.25 if topo.center_tapped else 1.0
        if p.rated_current < i_out * share:
            return "rated current below the load current"
    elif axis == "rectifier":
        per = 1.0 if p.kind == "bridge" else topo.output_per_rating
        if p.i_f_avg * per * m.diode_current_derating < i_out:
            return "derated current rating below the load current"
    elif axis == "regulator":
        if p.i_max < i_out:
            return "current rating below the load current"
        if p.type == "fixed" and abs(p.output_voltage - v_out) > tol * v_out:
            return "fixed output voltage outside the output tolerance"
        if p.type == "adjustable" and p.reference_voltage > v_out:
            return "reference voltage above the output voltage"
    elif axis == "zener":
        if o.regulator == "zener" and abs(p.voltage - v_out) > tol * v_out:
            return "zener voltage outside the output tolerance"
        if o.regulator == "follower" and p.voltage <= v_out:
            return "zener voltage not above the output (the follower loses V_BE)"
    elif axis == "transistor":
        if p.i_c_max < i_out:
            return "collector current rating below the load current"
    return ""


def pair_bound(spec: Requirements, parts: dict[str, object]) -> str:
    """Why a combination cannot serve, from its transformer with another part (empty: may)."""
    t = parts.get("transformer")
    if t is None:
        return ""
    m = spec.margins
    topo = topology(spec.rectifier.topology)
    high = 1 + spec.mains.tolerance_high
    # the no-load peak at high line, with the regulation less the slack (the pipeline takes
    # the whole regulation: V_NL = V_path (1 + Reg))
    peak_rated = math.sqrt(2) * _half(t) * (1 + (t.regulation or 0.0) * (1 - SLACK)) * high
    c = parts.get("capacitor")
    if c is not None and c.voltage * m.capacitor_voltage_derating < peak_rated:
        return "capacitor voltage rating below the peak at high line"
    r = parts.get("rectifier")
    if r is not None and r.v_rrm * m.diode_voltage_derating < topo.piv_factor * peak_rated:
        return "rectifier reverse-voltage rating below the peak reverse voltage"
    u = parts.get("regulator")
    if u is not None:
        low = 1 - spec.mains.tolerance_low
        if math.sqrt(2) * _emf_high(t) * low < spec.output[0].voltage + u.dropout:
            return "secondary peak at low line below the output plus the regulator's dropout"
    return ""


def prune(spec: Requirements, free: list[Axis], parts_out: Counter, combos_out: Counter
          ) -> list[Candidate]:
    """The candidates that pass every bound. ``parts_out`` counts the parts a single-part bound
    removed, ``combos_out`` the combinations a pair bound removed, both by reason."""
    kept: list[list] = []
    for axis in free:
        ok = []
        for p in axis.parts:
            why = part_bound(spec, axis.name, p)
            if why:
                parts_out[f"{axis.name} {p.id}: {why}"] += 1
            else:
                ok.append(p)
        kept.append(ok)
    out = []
    names = [a.name for a in free]
    for combo in itertools.product(*kept):
        parts = dict(zip(names, combo, strict=True))
        why = pair_bound(spec, parts)
        if why:
            combos_out[why] += 1
            continue
        out.append(Candidate(tuple((n, p.id) for n, p in parts.items())))
    return out


def lower_cost(cand: Candidate, library, topo_name: str) -> float:
    """The price of the candidate's searched parts: a lower bound of its whole cost (the parts
    sized with it, the fuse and the heat sink only add)."""
    from .space import count

    total = 0.0
    for _, pid in cand.choice:
        part = library.get(pid)
        total += (part.price or 0.0) * (count(topo_name, part) if part.kind in ("diode", "bridge")
                                        else 1)
    return total
