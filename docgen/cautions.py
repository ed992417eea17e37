"""Safety cautions: a standing set for any mains design, plus ones the design itself triggers.

The texts are our own wording of widely taught practice; each names its basis. They are not a
safety approval: every caution defers to local codes and a qualified person.
"""

from __future__ import annotations

import math

from .design import Check
from .topology import Topology
from .trace import Caution

DEFER = ("Follow the local wiring rules (for example IEC 60364 or the national code) and the "
         "product safety standard that applies, and have the design and the build checked by a "
         "qualified, licensed person.")

STANDING: tuple[Caution, ...] = (
    Caution("caution.mains", "Hazardous mains voltage",
            "The primary wiring, the fuse holder, the switch and the transformer primary "
            "terminals carry mains voltage, which can kill. Work on them only disconnected from "
            "the supply; keep them out of reach of a test finger inside the enclosure.",
            "IEC 62368-1 energy class ES3 for mains circuits"),
    Caution("caution.isolation", "Isolation",
            "Use a safety isolating transformer for an extra-low-voltage output (IEC 61558-2-6): "
            "it keeps reinforced or double insulation between primary and secondary. Keep "
            "creepage and clearance distances on the board as the product standard requires; "
            "docgen does not compute them.",
            "IEC 61558-2-6:2021 scope; IEC 62368-1 safeguards"),
    Caution("caution.fusing", "Fusing and switching",
            "Fit a time-lag (T) fuse in the live conductor, first after the inlet, with the live "
            "wire on the fuse holder's rear contact. Where plug polarity is not guaranteed use a "
            "double-pole switch. A transformer that is not inherently short-circuit-proof needs "
            "the fuse its label states.",
            "P. Horowitz, W. Hill, The Art of Electronics (fuse advice); IEC 60127 fuse-links"),
    Caution("caution.earth", "Protective earth or double insulation",
            "A Class I enclosure must have its accessible metal bonded to protective earth with "
            "a low-resistance connection and no fuse or switch in the earth path; the earth "
            "conductor should break last. A Class II design relies on double or reinforced "
            "insulation and must not rely on earth.",
            "IEC 61140 protection classes (from memory); common practice"),
    Caution("caution.enclosure", "Enclosure and mechanics",
            "Use mains-rated wire and connectors, cord anchorage with strain relief, and "
            "ventilation for the transformer and any hot parts. Observe capacitor polarity and "
            "leave room for the capacitor vent.",
            "common practice"),
    Caution("caution.discharge", "Stored charge",
            "The reservoir capacitor stays charged after the mains is removed. Check it is "
            "discharged before touching the circuit; a bleeder resistor speeds this up.",
            "P. Horowitz, W. Hill, The Art of Electronics (charged capacitors); common practice"),
    Caution("caution.defer", "Local codes and licensed practice", DEFER, "common practice"),
)

SELV_DC_LIMIT = 60.0  # V, ripple-free DC limit of ES1 / extra-low voltage (IEC 62368-1, from memory)
SELV_AC_LIMIT = 50.0  # V RMS, no-load secondary limit of a safety isolating transformer
STORED_ENERGY_LIMIT = 20.0  # J, a stored-energy threshold used by equipment standards (from memory)


def triggered_cautions(
    v_dc_max: float, v_sec_nl_max: float, stored_energy: float, checks: list[Check],
    *, topology: Topology, dual_frequency: tuple[float, float] | None = None,
) -> list[Caution]:
    """Cautions this design triggers. ``v_sec_nl_max`` is the whole secondary winding, end to
    end (both halves of a center tap), RMS at high line and no load."""
    out: list[Caution] = []
    if topology.caution is not None:
        cid, title, text, source = topology.caution
        out.append(Caution(cid, title, text, source, triggered_by="rectifier.topology"))
    if dual_frequency is not None:
        lo, hi = sorted(dual_frequency)
        out.append(Caution(
            "caution.dual_frequency", f"Runs from {lo:g} Hz and {hi:g} Hz",
            f"The design is sized at {lo:g} Hz, where the ripple is largest. The transformer "
            f"must be rated for {lo:g} Hz: a transformer built for {hi:g} Hz can saturate and "
            f"overheat at {lo:g} Hz, while a {lo:g} Hz design works at {hi:g} Hz.",
            "common practice (transformer core flux rises as frequency falls)",
            triggered_by="mains.freq"))
    if v_dc_max > SELV_DC_LIMIT:
        out.append(Caution(
            "caution.above_elv", "Output above extra-low voltage",
            f"The reservoir can reach {v_dc_max:.0f} V DC, above the {SELV_DC_LIMIT:.0f} V "
            "limit of the extra-low-voltage class: the secondary side is itself hazardous and "
            "needs the same protection against contact as the mains side.",
            "IEC 62368-1 ES1 limit 60 V DC (class limit from memory)",
            triggered_by="reservoir.v_max"))
    if v_sec_nl_max > SELV_AC_LIMIT:
        whole = ("the whole center-tapped winding, end to end across both halves,"
                 if topology.center_tapped else "the secondary winding")
        out.append(Caution(
            "caution.secondary_not_selv", "Secondary above the safety-isolating limit",
            f"At high line and no load {whole} reaches {v_sec_nl_max:.0f} V RMS "
            f"({v_sec_nl_max * math.sqrt(2):.0f} V peak), above the {SELV_AC_LIMIT:.0f} V RMS "
            f"({SELV_AC_LIMIT * math.sqrt(2):.0f} V peak) of a safety isolating transformer's "
            "extra-low output: treat the winding, its wiring and the rectifier as hazardous.",
            "IEC 61558-2-6:2021 scope (50 V AC no-load)",
            triggered_by="transformer.v_winding_high_nl"))
    if stored_energy > STORED_ENERGY_LIMIT:
        out.append(Caution(
            "caution.stored_energy", "Stored energy in the reservoir",
            f"The reservoir stores up to {stored_energy:.1f} J, enough to burn or weld on a "
            "short circuit. Fit a bleeder and insulate the terminals.",
            "stored-energy threshold of 20 J used in equipment safety standards (from memory)",
            triggered_by="reservoir.energy"))
    out += rating_cautions(checks)
    return out


def rating_cautions(checks: list[Check]) -> list[Caution]:
    """One caution per part run close to, or beyond, a rating: every part whose checks warn or
    fail gets one, naming each such check with its margin (a part never gets two, and no part
    with less margin is left out)."""
    by_part: dict[str, list[Check]] = {}
    for c in checks:
        if c.ref and c.status in ("warn", "fail"):
            by_part.setdefault(c.ref, []).append(c)
    out = []
    for ref, cs in by_part.items():
        cs = sorted(cs, key=lambda c: c.margin)
        failing = cs[0].status == "fail"
        lines = []
        for c in cs:
            if c.margin < 0:
                lines.append(f"{c.title}: the limit is exceeded by {-c.margin * 100:.1f} % at "
                             f"the {c.corner} corner")
            else:
                lines.append(f"{c.title}: only {c.margin * 100:.1f} % of the limit is left at "
                             f"the {c.corner} corner")
        advice = ("A part beyond its rating fails early or at once; choose a larger part or "
                  "relax the requirement." if failing else
                  "A part run this close to its rating ages faster; consider the next size up.")
        out.append(Caution(
            f"caution.near_rating.{ref}",
            f"{ref} {'beyond' if failing else 'close to'} its rating",
            "; ".join(lines) + ". " + advice,
            "common practice (derating for reliability)",
            triggered_by=", ".join(c.id for c in cs)))
    return out
