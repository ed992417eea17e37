"""Bill-of-materials lines of a sized design: the parts every design has, the regulator kind's
own lines, protection and heat sinks. Each line names its origin (library, fixed, sized) and
the traced values of its ratings."""

from __future__ import annotations

from ..design import PartChoice
from ..stages.context import SizingContext
from ..topology import topology
from ..trace import Ledger
from ..units import format_quantity as fq

# A library pick states the needs it was chosen for: the sizing figures (initial estimates, or
# floors raised by an earlier verification pass), not the verified stresses.
LIBRARY_NOTE = (" (needs from the sizing figures; the verified stresses are in the part "
                "ratings table)")


def fuse_line(ctx: SizingContext, L: Ledger) -> PartChoice:
    """F1: the pick made by the protection stage (a split supply makes it for both rails)."""
    pick = ctx.picks.get("F1")
    part = pick.part if pick else None
    rating = fq(L["fuse.rating"], "A", 3)
    return PartChoice(
        "F1", "fuse", f"{rating} T",
        description=(part.description or part.id) if part is not None else
        f"fuse-link, time-lag (T), {rating}, rated for {fq(L['fuse.v_need'], 'V', 3)} or more "
        "(nominal mains), in the live lead",
        part_id=part.id if part is not None else "",
        origin=pick.origin if pick else "sized",
        reason=(pick.reason + (LIBRARY_NOTE if pick.origin == "library" else "")) if pick
        else "",
        value_ids=("fuse.rating",))


def bom_lines(ctx: SizingContext, L: Ledger, reg) -> list[PartChoice]:
    def v(i: str) -> str:
        return fq(L[i], L.values[i].unit, 3)

    def line(ref: str, kind: str, value_text: str, generic: str, ids: tuple[str, ...]
             ) -> PartChoice:
        pick = ctx.picks.get(ref)
        part = pick.part if pick else None
        qty = f"{pick.quantity} x " if pick and pick.quantity > 1 else ""
        reason = pick.reason if pick else ""
        if pick and pick.origin == "library" and reason:
            reason += LIBRARY_NOTE
        return PartChoice(
            ref, kind, value_text,
            description=(qty + (part.description or part.id)) if part is not None else generic,
            part_id=part.id if part is not None else "",
            origin=pick.origin if pick else "sized",
            reason=reason,
            value_ids=ids)

    topo = topology(ctx.spec.rectifier.topology)
    lines = [
        line("T1", "transformer", f"{v('transformer.v_rated')} {v('transformer.va')}",
             f"mains transformer, secondary {v('transformer.v_rated')} RMS at rated load, "
             f"at least {v('transformer.va')} at {v('transformer.t_amb_rated')} ambient"
             + ("" if L["transformer.k_amb"] >= 1 else
                f" (derated to {v('transformer.va_allowed')} at {v('env.t_max')}, insulation "
                f"limit {v('transformer.t_class')})")
             + f", regulation at most {v('transformer.regulation')}",
             ("transformer.v_rated", "transformer.va", "transformer.va_allowed",
              "transformer.regulation")),
        line(topo.designator, "rectifier", f"{v('rect.v_rrm')} {v('rect.i_f_rating')}",
             topo.bom_text.format(v=v('rect.v_rrm'), i=v('rect.i_f_rating'), s=v('rect.i_fsm')),
             ("rect.v_rrm", "rect.i_f_rating", "rect.i_fsm")),
        line("C1", "capacitor", f"{v('reservoir.c')} {v('reservoir.v_rating')}",
             f"aluminium electrolytic capacitor, {v('reservoir.c')} (tolerance "
             f"{v('reservoir.tol')}), at least {v('reservoir.v_rating')}"
             + (f", ripple current at least {v('engine.cap_ripple_current')} at "
                f"{v('mains.ripple_freq')}" if "engine.cap_ripple_current" in L else ""),
             ("reservoir.c", "reservoir.v_rating")),
    ]
    lines += reg.bom_lines(ctx, L, line, v)
    lines.append(fuse_line(ctx, L))
    if "bleeder.r" in L:
        lines.append(line("R9", "resistor", f"{v('bleeder.r')} {v('bleeder.p_rating')}",
                          f"bleeder resistor {v('bleeder.r')}, at least {v('bleeder.p_rating')}, "
                          f"across C1", ("bleeder.r", "bleeder.p_rating")))
    if reg.heat_sink is not None:
        p_, ref = reg.heat_sink
        if f"{p_}.theta_sa" in L:
            lines.append(line(ref, "heatsink", v(f"{p_}.theta_sa"),
                              f"heat sink, at most {v(f'{p_}.theta_sa')} sink-to-ambient",
                              (f"{p_}.theta_sa",)))
    return lines
