"""What the zener shunt regulator needs from the unregulated side, before anything is sized."""

from __future__ import annotations

from .. import equations as eq
from ..errors import InfeasibleDesign
from ..trace import Ledger
from .context import Pick, SizingContext, record_fields, require
from .series import record_output

TITLE = "Regulator requirements"
INTRO = ("The zener shunt regulator needs a minimum input voltage at the ripple trough: the "
         "highest zener voltage plus the headroom across the series resistor. Everything "
         "upstream is sized backwards from this voltage.")


def _zener_part(ctx: SizingContext, L: Ledger, vz: float):
    """The zener from the library (fixed by id or picked by voltage and power), or None."""
    spec = ctx.spec
    z = spec.output[0].zener
    if z.part:
        part = ctx.fixed_part("zener", z.part, "output[0].zener.part")
        ctx.picks["DZ1"] = Pick("DZ1", "zener", "fixed", part, f"{part.id} named in the file")
        return part
    if ctx.library is None:
        return None
    from ..parts.select import select_zener

    # the floor is a rating; the selector divides the dissipation by the derating itself
    power = max(ctx.floors.zener_power * spec.margins.zener_power_derating, 1e-6)
    sel = select_zener(ctx.library.zeners, voltage=vz, power=power,
                       ambient_c=spec.environment.ambient_max,
                       power_derating=spec.margins.zener_power_derating)
    part = require(sel, f"{vz:g} V zener diode")
    ctx.picks["DZ1"] = Pick("DZ1", "zener", "library", part, sel.reason, sel.generic)
    return part


def size_regulator_needs(ctx: SizingContext, L: Ledger) -> None:
    spec = ctx.spec
    out = spec.output[0]
    z = out.zener
    explicit_out = out.model_fields_set
    explicit_z = z.model_fields_set
    record_output(ctx, L)
    L.given("output.headroom", r"V_{hr}", out.headroom, "V",
            "Headroom across the series resistor at the trough",
            defaulted="headroom" not in explicit_out)
    vz = z.voltage if z.voltage is not None else out.voltage
    part = _zener_part(ctx, L, vz)
    if part is not None:
        src = f"library part {part.id}"
        L.given("zener.v_nom", r"V_Z", part.voltage, "V", "Zener voltage (nominal)", source=src)
        L.given("zener.tol", r"t_Z", part.tolerance, "%", "Zener voltage tolerance", source=src)
        L.given("zener.tempco", r"\alpha_Z", part.tempco, "%/degC",
                "Zener temperature coefficient", source=src)
        L.given("zener.i_zk", r"I_{ZK}", part.knee_current, "A", "Zener knee current",
                source=src)
        L.given("zener.r_z", r"r_z", part.dynamic_resistance, "ohm", "Zener dynamic resistance",
                source=src)
        L.given("zener.i_zt", r"I_{ZT}", part.test_current, "A", "Zener test current",
                source=src)
    else:
        L.given("zener.v_nom", r"V_Z", vz, "V", "Zener voltage (nominal)",
                defaulted=z.voltage is None,
                source="" if z.voltage else "equal to the output voltage")
        record_fields(L, z, (
            ("zener.tol", r"t_Z", "tolerance", "%", "Zener voltage tolerance"),
            ("zener.tempco", r"\alpha_Z", "tempco", "%/degC", "Zener temperature coefficient"),
            ("zener.i_zk", r"I_{ZK}", "knee_current", "A", "Zener knee current"),
            ("zener.r_z", r"r_z", "dynamic_resistance", "ohm", "Zener dynamic resistance"),
            ("zener.i_zt", r"I_{ZT}", "test_current", "A", "Zener test current"),
        ))
    L.given("zener.k_zk", r"k_{ZK}", z.min_current_factor, "",
            "Minimum zener current as a multiple of I_ZK",
            defaulted="min_current_factor" not in explicit_z)

    L.calc("zener.delta_t", eq.ZENER_DT, r"\Delta T_Z", "K", "Temperature excursion from 25 degC",
           {"h": "env.t_max", "c": "env.t_min"}, lambda h, c: max(abs(h - 25.0), abs(c - 25.0)))
    L.calc("zener.v_max", eq.ZENER_HIGH, r"V_{Z,max}", "V", "Highest zener voltage",
           {"v": "zener.v_nom", "t": "zener.tol", "a": "zener.tempco", "d": "zener.delta_t"},
           lambda v, t, a, d: v * (1 + t) + abs(a) * v * d)
    L.calc("zener.v_min", eq.ZENER_LOW, r"V_{Z,min}", "V", "Lowest zener voltage",
           {"v": "zener.v_nom", "t": "zener.tol", "a": "zener.tempco", "d": "zener.delta_t"},
           lambda v, t, a, d: v * (1 - t) - abs(a) * v * d)
    L.calc("zener.v_knee_max", eq.ZENER_KNEE, r"V_{Z0,max}", "V",
           "Knee voltage of the zener model, upper extreme",
           {"v": "zener.v_max", "r": "zener.r_z", "i": "zener.i_zt"}, lambda v, r, i: v - r * i)
    L.calc("zener.v_knee_min", eq.ZENER_KNEE, r"V_{Z0,min}", "V",
           "Knee voltage of the zener model, lower extreme",
           {"v": "zener.v_min", "r": "zener.r_z", "i": "zener.i_zt"}, lambda v, r, i: v - r * i)
    if L["zener.v_knee_min"] <= 0:
        raise InfeasibleDesign(
            f"the zener's dynamic resistance ({L['zener.r_z']:g} ohm) times its test current "
            f"({L['zener.i_zt'] * 1e3:g} mA) exceeds its lowest voltage "
            f"({L['zener.v_min']:.2f} V): no such zener exists; check dynamic_resistance")
    L.calc("zener.i_min", eq.ZENER_IZMIN, r"I_{Z,min}", "A", "Minimum zener current",
           {"k": "zener.k_zk", "i": "zener.i_zk"}, lambda k, i: k * i)
    L.calc("regulator.v_in_min_needed", eq.SUM2, r"V_{in,min}", "V",
           "Input voltage needed at the trough", {"a": "zener.v_max", "b": "output.headroom"},
           lambda a, b: a + b)
    L.calc("regulator.i_in_design", eq.SUM2, r"I_{in}", "A",
           "Regulator input current at full load (design)",
           {"a": "output.i_max", "b": "zener.i_min"}, lambda a, b: a + b)
    L.calc("regulator.r_target", eq.ZENER_R, r"R_{target}", "ohm",
           "Series resistor if the trough sat exactly at the needed input voltage",
           {"v": "regulator.v_in_min_needed", "z": "zener.v_max", "l": "output.i_max",
            "i": "zener.i_min"},
           lambda v, z, l, i: (v - z) / (l + i))
    L.calc("regulator.ripple_in_allowed", eq.RIPPLE_THROUGH_DIVIDER, r"V_{r,in,out}", "V",
           "Input ripple the output ripple limit allows",
           {"o": "output.ripple_max", "R": "regulator.r_target", "z": "zener.r_z"},
           lambda o, R, z: o * (R + z) / z)
