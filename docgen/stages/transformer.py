"""Transformer: the secondary voltage needed at low line and full load, then a standard rating."""

from __future__ import annotations

import math

from .. import equations as eq
from .. import standards
from ..errors import InfeasibleDesign
from ..parts import ambient
from ..topology import topology
from ..trace import Ledger
from .context import Pick, SizingContext, require

# A library transformer may exceed the needed secondary by at most this factor: a higher
# secondary only heats the shunt regulator (common practice).
MAX_SECONDARY_EXCESS = 1.5

# (it also fixes the design ripple of the reservoir and the diode drop it is sized with)
WRITES = ("transformer.", "rect.n_d", "rect.v_f", "reservoir.ripple_fraction",
          "reservoir.v_pk_by_fraction", "reservoir.ripple_by_fraction",
          "reservoir.ripple_allowed")
TITLE = "Transformer"
INTRO = ("The rated secondary voltage is specified at rated load and nominal mains, so the "
         "low-line, full-load secondary is the rated voltage scaled by the low-line ratio. The "
         "capacitor peak must cover the regulator's trough voltage, the ripple and two diode "
         "drops. The no-load voltage is higher by the transformer's regulation. When the "
         "highest ambient is above the ambient its rating holds at, the secondary current it "
         "may carry is derated so that the copper loss keeps the winding within its insulation "
         "class (the core loss is not included in this rule).")


def size_transformer(ctx: SizingContext, L: Ledger) -> None:
    """Pick (or take) the secondary voltage and VA rating."""
    spec = ctx.spec
    t = spec.transformer
    res = spec.reservoir
    L.given("rect.v_f", r"V_F", spec.rectifier.diode_drop, "V",
            "Diode forward drop at the charging peaks",
            defaulted="diode_drop" not in spec.rectifier.model_fields_set)
    L.given("reservoir.ripple_fraction", r"r_{ripple}", res.ripple_fraction, "%",
            "Design ripple as a fraction of the capacitor peak",
            defaulted="ripple_fraction" not in res.model_fields_set)
    L.calc("reservoir.v_pk_by_fraction", eq.PEAK_FROM_VALLEY, r"V_{C,pk,frac}", "V",
           "Capacitor peak needed with the design ripple fraction",
           {"v": "regulator.v_in_min_needed", "r": "reservoir.ripple_fraction"},
           lambda v, r: v / (1 - r))
    L.calc("reservoir.ripple_by_fraction", eq.DIFF2, r"V_{r,frac}", "V",
           "Ripple allowed by the ripple fraction",
           {"a": "reservoir.v_pk_by_fraction", "b": "regulator.v_in_min_needed"},
           lambda a, b: a - b)
    L.calc("reservoir.ripple_allowed", eq.MIN2, r"V_{r,allow}", "V",
           "Ripple allowed at the regulator input",
           {"a": "reservoir.ripple_by_fraction", "b": "regulator.ripple_in_allowed"},
           lambda a, b: min(a, b))
    topo = topology(spec.rectifier.topology)
    L.given("rect.n_d", r"n_d", float(topo.diodes_in_path), "",
            "Diodes conducting in series", source=f"{topo.name} rectifier")
    L.calc("transformer.v_pk_needed", eq.SEC_PEAK_NEEDED_N, r"V_{path,pk,lo}", "V",
           "Winding peak needed at low line, full load",
           {"v": "regulator.v_in_min_needed", "r": "reservoir.ripple_allowed", "n": "rect.n_d",
            "d": "rect.v_f"},
           lambda v, r, n, d: v + r + n * d)
    L.calc("transformer.v_rms_low_needed", eq.RMS_FROM_PEAK, r"V_{path,lo}", "V",
           "Winding RMS needed at low line, full load",
           {"v": "transformer.v_pk_needed"}, lambda v: v / math.sqrt(2))
    rated_calc = "transformer.v_rated_calc"
    if topo.center_tapped:
        L.calc("transformer.v_half_calc", eq.RATED_FROM_LOW_LINE, r"V_{half,calc}", "V",
               "Rated half-winding needed (nominal mains, rated load)",
               {"v": "transformer.v_rms_low_needed", "t": "mains.tol_low"},
               lambda v, t: v / (1 - t))
        L.calc(rated_calc, eq.CT_WHOLE, r"V_{sec,calc}", "V",
               "Rated whole winding needed", {"v": "transformer.v_half_calc"}, lambda v: 2 * v)
    else:
        L.calc(rated_calc, eq.RATED_FROM_LOW_LINE, r"V_{sec,calc}", "V",
               "Rated secondary needed (nominal mains, rated load)",
               {"v": "transformer.v_rms_low_needed", "t": "mains.tol_low"},
               lambda v, t: v / (1 - t))
    floor_v = ctx.floor(L, "secondary", "transformer.v_floor", r"V_{sec,floor}", "V",
                        "Secondary voltage floor")
    if floor_v:
        L.calc("transformer.v_rated_needed", eq.MAX2, r"V_{sec,req}", "V",
               "Rated secondary needed", {"a": "transformer.v_rated_calc", "b": floor_v},
               lambda a, b: max(a, b))
    else:
        L.calc("transformer.v_rated_needed", eq.IDENT, r"V_{sec,req}", "V",
               "Rated secondary needed", {"x": "transformer.v_rated_calc"}, lambda x: x)
    L.calc("transformer.i_rms_est", eq.SEC_RMS_CURRENT, r"I_{sec,rms,est}", "A",
           "Secondary RMS current estimate (table ratio)",
           {"k": "margins.secondary_rms_factor", "i": "regulator.i_in_design"},
           lambda k, i: k * i)

    shared = ctx.shared_transformer
    if t.part:
        part = ctx.fixed_part("transformer", t.part, "transformer.part")
        ctx.picks["T1"] = Pick("T1", "transformer", "library" if shared else "fixed", part,
                               shared or f"{part.id} named in the file")
        _from_part(L, part)
        _ambient(L, part)
    elif t.secondary is not None:
        how = "chosen for both rails" if shared else "fixed part"
        L.given("transformer.v_rated", r"V_{sec}", t.secondary, "V",
                f"Rated secondary voltage ({how})", source=shared)
        L.given("transformer.va", "S", t.va, "VA", f"Rated apparent power ({how})",
                source=shared)
        ctx.picks["T1"] = Pick("T1", "transformer", "sized" if shared else "fixed",
                               reason=shared or "ratings given in the file")
        _ambient(L)
    else:
        _size_rating(ctx, L)

    if "transformer.regulation" in L:
        pass
    elif t.regulation is not None and shared:
        L.given("transformer.regulation", r"\mathrm{Reg}", t.regulation, "%",
                "Transformer regulation (typical for the shared rating)",
                source=shared + "; typical regulation for its VA (common practice)")
    elif t.regulation is not None:
        L.given("transformer.regulation", r"\mathrm{Reg}", t.regulation, "%",
                "Transformer regulation (from the file)")
    else:
        L.calc("transformer.regulation", eq.REGULATION_TYPICAL, r"\mathrm{Reg}", "%",
               "Transformer regulation (typical for the rating)", {"s": "transformer.va"},
               lambda s: standards.typical_regulation(s))
    L.calc("transformer.i_rated", eq.RATED_CURRENT, r"I_{sec,rated}", "A",
           "Rated secondary current", {"s": "transformer.va", "v": "transformer.v_rated"},
           lambda s, v: s / v)
    L.calc("transformer.i_allowed", eq.SCALE, r"I_{sec,allow}", "A",
           "Secondary current allowed at the highest ambient",
           {"v": "transformer.i_rated", "k": "transformer.k_amb"}, lambda v, k: v * k)
    L.calc("transformer.va_allowed", eq.SCALE, r"S_{allow}", "VA",
           "Apparent power allowed at the highest ambient",
           {"v": "transformer.va", "k": "transformer.k_amb"}, lambda v, k: v * k)
    if topo.center_tapped:
        L.calc("transformer.v_path", eq.CT_HALF, r"V_{path}", "V",
               "Rated voltage of each half winding", {"v": "transformer.v_rated"},
               lambda v: v / 2)
    else:
        L.calc("transformer.v_path", eq.IDENT, r"V_{path}", "V",
               "Rated voltage of the conducting winding", {"x": "transformer.v_rated"},
               lambda x: x)
    L.calc("transformer.v_nl", eq.NO_LOAD, r"V_{path,NL}", "V",
           "No-load winding voltage (nominal mains)",
           {"v": "transformer.v_path", "g": "transformer.regulation"}, lambda v, g: v * (1 + g))
    L.calc("transformer.v_low_fl", eq.LINE_LOW, r"V_{path,lo}", "V",
           "Winding voltage at low line, full load",
           {"v": "transformer.v_path", "t": "mains.tol_low"}, lambda v, t: v * (1 - t))
    L.calc("transformer.v_high_fl", eq.LINE_HIGH, r"V_{path,hi}", "V",
           "Winding voltage at high line, rated load",
           {"v": "transformer.v_path", "t": "mains.tol_high"}, lambda v, t: v * (1 + t))
    L.calc("transformer.v_high_nl", eq.LINE_HIGH, r"V_{path,NL,hi}", "V",
           "Winding voltage at high line, no load",
           {"v": "transformer.v_nl", "t": "mains.tol_high"}, lambda v, t: v * (1 + t))
    # the safety limits concern the whole winding, end to end: both halves of a center tap
    if topo.center_tapped:
        L.calc("transformer.v_winding_high_nl", eq.CT_WHOLE, r"V_{sec,NL,hi}", "V",
               "Whole winding (end to end) at high line, no load",
               {"v": "transformer.v_high_nl"}, lambda v: 2 * v)
    else:
        L.calc("transformer.v_winding_high_nl", eq.IDENT, r"V_{sec,NL,hi}", "V",
               "Whole winding (end to end) at high line, no load",
               {"x": "transformer.v_high_nl"}, lambda x: x)
    L.calc("transformer.v_winding_peak", eq.SINE_PEAK, r"V_{sec,NL,hi,pk}", "V",
           "Peak of the whole winding at high line, no load",
           {"v": "transformer.v_winding_high_nl"}, lambda v: math.sqrt(2) * v)


def _from_part(L: Ledger, part) -> None:
    src = f"library part {part.id}"
    L.given("transformer.v_rated", r"V_{sec}", part.secondary_voltage, "V",
            "Rated secondary voltage", source=src)
    L.given("transformer.va", "S", part.va, "VA", "Rated apparent power", source=src)
    if part.regulation is not None:
        L.given("transformer.regulation", r"\mathrm{Reg}", part.regulation, "%",
                "Transformer regulation", source=src)
    elif part.winding_resistance is not None:
        L.given("transformer.regulation", r"\mathrm{Reg}",
                part.winding_resistance * part.rated_current / part.secondary_voltage, "%",
                "Transformer regulation (from the winding resistance)", source=src)


def _ambient(L: Ledger, part=None) -> None:
    """The current derating for an ambient above the transformer's rated one
    (docgen.parts.ambient): the part's rated ambient and class, else the documented defaults."""
    rated = part.rated_ambient_c if part is not None else None
    cls = part.insulation_class if part is not None else None
    src = f"library part {part.id}" if part is not None else ""
    L.given("transformer.t_amb_rated", r"T_{A,rated}",
            rated if rated is not None else ambient.DEFAULT_RATED_AMBIENT, "degC",
            "Ambient the transformer's rating holds at",
            source=src if rated is not None else ambient.DEFAULT_RATED_AMBIENT_SOURCE,
            defaulted=rated is None)
    L.given("transformer.t_class", r"T_{class}",
            ambient.CLASS_TEMPERATURE[cls or ambient.DEFAULT_CLASS], "degC",
            f"Winding temperature limit (insulation class {cls or ambient.DEFAULT_CLASS})",
            source=(src + ", insulation class; IEC 60085 class temperature (from memory)"
                    if cls else ambient.DEFAULT_CLASS_SOURCE), defaulted=cls is None)
    L.calc("transformer.k_amb", eq.XFMR_AMBIENT_DERATING, r"k_{amb}", "%",
           "Secondary current derating for the highest ambient",
           {"c": "transformer.t_class", "a": "env.t_max", "r": "transformer.t_amb_rated"},
           lambda c, a, r: ambient.ambient_factor(a, r, c))
    if L["transformer.k_amb"] <= 0:
        raise InfeasibleDesign(
            f"the highest ambient ({L['env.t_max']:g} degC) reaches the "
            f"{L['transformer.t_class']:g} degC limit of the transformer's insulation class: "
            "no current is allowed; use a transformer of a higher thermal class")


def _size_rating(ctx: SizingContext, L: Ledger) -> None:
    L.calc("transformer.va_needed", eq.VA_NEEDED, r"S_{req}", "VA",
           "Apparent power needed", {"v": "transformer.v_rated_needed",
                                     "i": "transformer.i_rms_est"},
           lambda v, i: v * i)
    floor = ctx.floor(L, "va", "transformer.va_floor", r"S_{floor}", "VA",
                      "Apparent power floor")
    if floor:
        L.calc("transformer.va_sized", eq.MAX2, r"S_{need}", "VA", "Apparent power to provide",
               {"a": "transformer.va_needed", "b": floor}, lambda a, b: max(a, b))
    else:
        L.calc("transformer.va_sized", eq.IDENT, r"S_{need}", "VA", "Apparent power to provide",
               {"x": "transformer.va_needed"}, lambda x: x)
    if ctx.library is not None:
        from ..parts.select import select_transformer

        need_v = L["transformer.v_rated_needed"]
        # The lowest secondary at or above the need wins before price: every extra volt is
        # dissipated in the regulator (common practice).
        tapped = topology(ctx.spec.rectifier.topology).center_tapped
        # the selector compares half windings for a center-tapped need
        need_sel = need_v / 2 if tapped else need_v
        steps = sorted((p.half_voltage if tapped else p.secondary_voltage)
                       for p in ctx.library.transformers
                       if (p.center_tapped or not tapped)
                       and (p.half_voltage if tapped else p.secondary_voltage)
                       >= need_sel * (1 - 1e-9))
        ceiling = min(steps[0] * (1 + 1e-6), need_sel * MAX_SECONDARY_EXCESS) if steps else None
        sel = select_transformer(
            ctx.library.transformers, secondary_voltage=need_sel, va=L["transformer.va_sized"],
            center_tapped=tapped, secondary_voltage_max=ceiling,
            primary_voltage=ctx.spec.mains.nominal, ambient_c=L["env.t_max"])
        part = require(sel, "transformer")
        ctx.picks["T1"] = Pick("T1", "transformer", "library", part, sel.reason, sel.generic)
        _from_part(L, part)
        _ambient(L, part)
        return
    # a standard step is rated at the default ambient and class: size it for the derating
    _ambient(L)
    L.calc("transformer.va_rated_needed", eq.DERATED_NEED, r"S_{rated,req}", "VA",
           "Rated apparent power needed (derated for the highest ambient)",
           {"x": "transformer.va_sized", "k": "transformer.k_amb"}, lambda x, k: x / k)
    need = L["transformer.v_rated_needed"]
    if topology(ctx.spec.rectifier.topology).center_tapped:
        # standard center-tapped windings are twice a standard half (2 x 12 V = 24 V)
        L.calc("transformer.v_rated", eq.PICKED, r"V_{sec}", "V",
               "Rated whole winding (twice a standard half)",
               {"x": "transformer.v_rated_needed"},
               lambda x: 2 * standards.next_at_or_above(x / 2, standards.SECONDARY_VOLTAGES))
        _pick_va(L)
        ctx.picks["T1"] = Pick("T1", "transformer", "sized",
                               reason="standard half-winding and VA steps at or above the need")
        return
    try:
        standards.next_at_or_above(need, standards.SECONDARY_VOLTAGES)
    except standards.NoStandardValue:
        raise InfeasibleDesign(
            f"the output needs a rated secondary of {need:.1f} V, above the largest standard "
            f"secondary ({standards.SECONDARY_VOLTAGES[-1]:g} V) this version sizes"
        ) from None
    L.calc("transformer.v_rated", eq.PICKED, r"V_{sec}", "V",
           "Rated secondary voltage (standard step)", {"x": "transformer.v_rated_needed"},
           lambda x: standards.next_at_or_above(x, standards.SECONDARY_VOLTAGES))
    _pick_va(L)
    ctx.picks["T1"] = Pick("T1", "transformer", "sized",
                           reason="standard secondary and VA steps at or above the need")


def _pick_va(L: Ledger) -> None:
    try:
        standards.next_at_or_above(L["transformer.va_rated_needed"], standards.TRANSFORMER_VA)
    except standards.NoStandardValue:
        raise InfeasibleDesign(
            f"the design needs {L['transformer.va_rated_needed']:.0f} VA, above the largest "
            f"standard transformer ({standards.TRANSFORMER_VA[-1]:g} VA)"
        ) from None
    L.calc("transformer.va", eq.PICKED, "S", "VA", "Rated apparent power (standard step)",
           {"x": "transformer.va_rated_needed"},
           lambda x: standards.next_at_or_above(x, standards.TRANSFORMER_VA))
