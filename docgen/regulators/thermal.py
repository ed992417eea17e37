"""Heat budget of a series pass element (pass transistor or three-terminal regulator).

The junction limit is the lower of the design's limit and the maker's absolute limit (a design
limit above the maker's is reported by its own check). The junction temperature without a heat
sink decides whether one is needed; the heat sink is then sized for the limit less the warning
band, so the junction check passes with that margin by construction instead of landing on its
limit (T_J = T_A + P (theta_JC + theta_CS + theta_SA): the standard thermal-resistance chain,
common practice). A generic heat sink is rounded down to two significant figures.
"""

from __future__ import annotations

from .. import equations as eq
from ..design import Check
from ..errors import InfeasibleDesign
from ..stages.context import Pick, SizingContext
from ..trace import Ledger
from . import rules


def size_heat_budget(ctx: SizingContext, L: Ledger, p: str, ref: str, what: str) -> None:
    """Junction temperature without a heat sink; the heat sink needed when that is too hot."""
    m = ctx.spec.margins
    L.given("margins.t_j_design", r"T_{J,design}", m.junction_max, "degC",
            "Highest junction temperature allowed by the design",
            defaulted="junction_max" not in m.model_fields_set)
    L.calc(f"{p}.t_j_limit", rules.TJ_LIMIT, r"T_{J,lim}", "degC",
           f"Junction limit of the {what} (lower of design and maker's)",
           {"d": "margins.t_j_design", "m": f"{p}.t_j_max"}, lambda d, m: min(d, m))
    L.calc(f"{p}.t_j_target", rules.TJ_TARGET, r"T_{J,target}", "degC",
           f"Junction temperature the {what}'s heat budget aims at (limit less the warning band)",
           {"j": f"{p}.t_j_limit", "w": "margins.warn_band"}, lambda j, w: j - w * abs(j))
    floor = ctx.floor(L, "heat_power", f"{p}.p_floor", r"P_{floor}", "W",
                      "Dissipation floor for the heat budget")
    if floor:
        L.calc(f"{p}.p_design", eq.MAX2, r"P_{design}", "W", "Dissipation the heat budget uses",
               {"a": f"{p}.p_hand", "b": floor}, lambda a, b: max(a, b))
    else:
        L.calc(f"{p}.p_design", eq.IDENT, r"P_{design}", "W", "Dissipation the heat budget uses",
               {"x": f"{p}.p_hand"}, lambda x: x)
    L.calc(f"{p}.t_j_bare", eq.JUNCTION_BARE, r"T_{J,bare}", "degC",
           f"Junction temperature the {what} would reach without a heat sink (a "
           "thermal-resistance figure that decides whether a heat sink is needed; above the "
           "junction limit one is)",
           {"t": "env.t_max", "p": f"{p}.p_design", "r": f"{p}.theta_ja"},
           lambda t, p, r: t + p * r)
    if L[f"{p}.t_j_bare"] <= L[f"{p}.t_j_target"]:
        return
    L.calc(f"{p}.theta_sa_needed", eq.HEATSINK_NEEDED, r"\theta_{SA,req}", "K/W",
           f"Heat-sink thermal resistance needed for the {what}",
           {"j": f"{p}.t_j_target", "t": "env.t_max", "p": f"{p}.p_design",
            "c": f"{p}.theta_jc", "s": f"{p}.theta_cs"},
           lambda j, t, p, c, s: (j - t) / p - c - s)
    if L[f"{p}.theta_sa_needed"] <= 0.05:
        raise InfeasibleDesign(
            f"the {what} dissipates {L[f'{p}.p_design']:.1f} W: no heat sink keeps its junction "
            f"below {L[f'{p}.t_j_target']:g} degC at {L['env.t_max']:g} degC ambient")
    sink = None
    if ctx.library is not None:
        from ..parts.select import select_heatsink

        sel = select_heatsink(ctx.library.heatsinks, r_theta_sa=L[f"{p}.theta_sa_needed"])
        sink = sel.part
        if sink is not None:
            ctx.picks["HS1" if ref == "U1" else "HS2"] = Pick(
                "HS1" if ref == "U1" else "HS2", "heatsink", "library", sink, sel.reason)
    if sink is not None:
        L.given(f"{p}.theta_sa", r"\theta_{SA}", sink.r_theta_sa, "K/W", "Heat sink",
                source=f"library part {sink.id}")
    else:
        L.calc(f"{p}.theta_sa", rules.SINK_ROUNDED, r"\theta_{SA}", "K/W",
               "Heat sink (generic: at most this thermal resistance)",
               {"x": f"{p}.theta_sa_needed"}, rules.round_down_2sig)
        ref_hs = "HS1" if ref == "U1" else "HS2"
        ctx.picks[ref_hs] = Pick(ref_hs, "heatsink", "sized",
                                 reason="thermal resistance from the junction budget")


def thermal_chain(L: Ledger, p: str) -> float:
    """Junction-to-ambient thermal resistance of the element with prefix ``p`` as designed."""
    if f"{p}.theta_sa" in L:
        return L[f"{p}.theta_jc"] + L[f"{p}.theta_cs"] + L[f"{p}.theta_sa"]
    return L[f"{p}.theta_ja"]


def junction_limit_check(L: Ledger, p: str, ref: str, what: str, w: float) -> Check:
    """The design junction limit must not exceed the maker's absolute limit."""
    from ..verify.checks import make_check

    return make_check(L, f"check.{what}_t_j_rating",
                      "Design junction limit <= maker's junction limit", "margins.t_j_design",
                      f"{p}.t_j_max", "max", "design limit", w, ref=ref,
                      requirement="margins.junction_max")
