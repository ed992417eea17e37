"""The rectifier diode's model for the waveform engine, fitted to the chosen part's forward
characteristic, and its junction temperature at the cold and hot corners.

The engine's diode is an exponential junction with series resistance,
``V = n V_T ln(1 + I / Is) + r_s I`` ([SEDRA-SMITH] Shockley law with a bulk resistance). Its
three numbers come from the forward voltage the library part (or the requirements file) states
at a current: one point fixes ``Is`` once ``n`` and ``r_s`` are known; a second point, or a
stated series resistance, replaces the default. The saturation current then follows the
junction temperature (``docgen.engine.circuit.saturation_current``), so a hot rectifier drops
less and a cold one more, as real ones do.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from .. import equations as eq
from ..engine.circuit import K_OVER_Q, ZERO_C_IN_K, saturation_current

SZE = ("S. M. Sze, K. K. Ng, Physics of Semiconductor Devices, 3rd ed. 2007, sections 2.3 "
       "(pn junction: Is ~ T^3 exp(-Eg/kT)) and 3.3 (Schottky barrier, thermionic emission: "
       "Is ~ T^2 exp(-q phi_B/kT)); section numbers from memory")

# Forward voltages in data sheets are stated at 25 degC (common practice).
T_STATED = 25.0


@dataclass(frozen=True)
class DiodeType:
    """Defaults of one junction technology where the part gives only one forward point."""

    name: str
    n: float  # emission coefficient
    rs_share: float  # share of the stated forward voltage dropped in the series resistance
    eg: float  # V: activation energy of Is (band gap / barrier height) over q
    xti: float  # temperature exponent of Is
    source: str


TYPES = {
    "silicon": DiodeType(
        "silicon", n=1.8, rs_share=0.05, eg=1.11, xti=3.0,
        source="silicon pn rectifier: n = 1.8 (high-level injection at rated current) and a "
               "series resistance dropping 5 % of V_F at the stated current ([CP-DIODE-MODEL], "
               "from memory); "
               "Eg = 1.11 V, XTI = 3 from " + SZE),
    "schottky": DiodeType(
        "schottky", n=1.1, rs_share=0.15, eg=0.69, xti=2.0,
        source="Schottky rectifier: n = 1.1 and a series resistance dropping 15 % of V_F at the "
               "stated current, barrier height 0.69 V ([CP-DIODE-MODEL], from memory); "
               "XTI = 2 from " + SZE),
}


def thermal_voltage(t_c: float) -> float:
    """k T / q at ``t_c`` degC ([CODATA-SI])."""
    return K_OVER_Q * (t_c + ZERO_C_IN_K)


@dataclass(frozen=True)
class Fit:
    is_: float  # A at T_STATED
    n: float
    rs: float  # ohm


def fit(v1: float, i1: float, kind: DiodeType, *, rs: float | None = None,
        v2: float | None = None, i2: float | None = None, t_c: float = T_STATED) -> Fit:
    """Fit (Is, n, r_s) to the forward point (v1, i1), with an optional second point (v2, i2)
    and an optional stated series resistance. Raises ValueError with the reason when the
    points cannot come from such a diode."""
    vt = thermal_voltage(t_c)
    n = kind.n
    if v2 is not None and i2 is not None:
        if i2 == i1 or (v2 - v1) * (i2 - i1) <= 0:
            raise ValueError("the two forward points must differ and the drop must rise with "
                             "the current")
        span = vt * math.log(i1 / i2)
        if rs is None:
            rs = (v1 - v2 - n * span) / (i1 - i2)
            if rs < 0:  # steeper than the default n allows: pure exponential through both
                rs = 0.0
                n = (v1 - v2) / span
        else:
            n = ((v1 - rs * i1) - (v2 - rs * i2)) / span
            if n <= 0:
                raise ValueError("the series resistance leaves no junction drop rising with "
                                 "the current")
    elif rs is None:
        rs = kind.rs_share * v1 / i1
    junction = v1 - rs * i1
    if junction <= 0:
        raise ValueError(f"the series resistance ({rs:g} ohm) drops more than the stated forward "
                         f"voltage ({v1:g} V at {i1:g} A)")
    return Fit(is_=i1 / math.expm1(junction / (n * vt)), n=n, rs=rs)


def forward_voltage(i: float, f: Fit, kind: DiodeType, t_c: float) -> float:
    """Forward drop of the fitted diode at current ``i`` and junction temperature ``t_c``."""
    is_t = float(saturation_current(f.is_, f.n, t_c, T_STATED, kind.eg, kind.xti))
    return f.n * thermal_voltage(t_c) * math.log1p(i / is_t) + f.rs * i


# ---------------------------------------------------------------- traced equations
VT = eq.define("diode.thermal_voltage", "Thermal voltage", r"\frac{k \cdot $t}{q}",
               {"t": "T"}, "definition ([CODATA-SI] constants k, q)")
RS_SHARE = eq.define(
    "diode.rs_share", "Series resistance from its default share of the forward drop",
    r"\frac{$s \cdot $v}{$i}", {"s": "s", "v": r"V_F", "i": r"I_F"},
    "common practice (share from memory, by junction type)")
RS_TWO = eq.define(
    "diode.rs_two_points", "Series resistance through two forward points",
    r"\max\left(0,\ \frac{$v - $w - $n \cdot $t \cdot \ln($i / $j)}{$i - $j}\right)",
    {"v": r"V_F", "w": r"V_{F2}", "n": "n", "t": r"V_T", "i": r"I_F", "j": r"I_{F2}"},
    "Shockley law with series resistance ([SEDRA-SMITH]), solved for r_s (derived)")
N_TWO = eq.define(
    "diode.n_two_points", "Emission coefficient through two forward points",
    r"\frac{($v - $r \cdot $i) - ($w - $r \cdot $j)}{$t \cdot \ln($i / $j)}",
    {"v": r"V_F", "w": r"V_{F2}", "r": r"r_s", "i": r"I_F", "j": r"I_{F2}", "t": r"V_T"},
    "Shockley law with series resistance ([SEDRA-SMITH]), solved for n (derived)")
IS_FIT = eq.define(
    "diode.is_fit", "Saturation current through the stated forward point",
    r"\frac{$i}{\exp\left(\frac{$v - $r \cdot $i}{$n \cdot $t}\right) - 1}",
    {"i": r"I_F", "v": r"V_F", "r": r"r_s", "n": "n", "t": r"V_T"},
    "Shockley law with series resistance ([SEDRA-SMITH]), solved for Is (derived)")
IS_TEMP = eq.define(
    "diode.is_temperature", "Saturation current at the junction temperature (T in kelvin: "
    "T_J = theta_J + 273.15 K, T_0 = theta_0 + 273.15 K)",
    r"$s \cdot \left(\frac{T_J}{T_0}\right)^{$x / $n} \cdot "
    r"\exp\left(\frac{q \cdot $g}{$n \cdot k} \cdot \left(\frac{1}{T_0} - \frac{1}{T_J}"
    r"\right)\right),\ T_J = $t,\ T_0 = $u",
    {"s": r"I_S", "t": r"\vartheta_J", "u": r"\vartheta_0", "x": r"X_{TI}", "n": "n",
     "g": r"E_g"}, SZE)
VF_AT = eq.define(
    "diode.forward_voltage", "Forward drop at the stated current and a junction temperature "
    "(T_J = theta_J + 273.15 K)",
    r"$n \cdot \frac{k \cdot T_J}{q} \cdot \ln\left(1 + \frac{$i}{$s}\right) + $r \cdot $i,"
    r"\ T_J = $t",
    {"n": "n", "t": r"\vartheta_J", "i": r"I_F", "s": r"I_S(T_J)", "r": r"r_s"},
    "Shockley law with series resistance ([SEDRA-SMITH])")


# ---------------------------------------------------------------- the ledger
def diode_inputs(spec, part) -> dict:
    """The forward characteristic the model is fitted to: the part's when a library part is
    chosen, the requirements file's otherwise (``current`` None: at the hand peak current)."""
    r = spec.rectifier
    if part is not None:
        return {"type": part.technology or r.diode_type, "v": part.v_f,
                "i": part.v_f_current or part.i_f_avg, "rs": part.series_resistance,
                "v2": part.v_f2, "i2": part.v_f2_current,
                "src": f"library part {part.id}", "i_src": "v_f_current" if part.v_f_current
                else "its average current rating i_f_avg, where makers usually state v_f "
                     "(common practice)"}
    return {"type": r.diode_type, "v": r.diode_drop, "i": r.diode_drop_current,
            "rs": r.diode_resistance, "v2": None, "i2": None, "src": "requirements file",
            "i_src": "rectifier.diode_drop_current"}


def record_diode(ctx, L, part) -> None:
    """Fit the engine's diode to the chosen rectifier and record it, with its forward drop at
    the cold and hot corners' junction temperatures (the ambient extremes: self-heating of the
    rectifier is not estimated)."""
    from ..errors import InfeasibleDesign

    spec = ctx.spec
    d = diode_inputs(spec, part)
    kind = TYPES[d["type"]]
    r = spec.rectifier
    if part is not None and part.technology and "diode_type" in r.model_fields_set \
            and part.technology != r.diode_type:
        ctx.conflicts.append(("rectifier.diode_type", (
            f"The file gives diode_type = {r.diode_type}, but the rectifier {part.id} is "
            f"{part.technology} in the library; the waveform engine models the part.")))
    if part is not None and "diode_drop" in r.model_fields_set:
        ctx.conflicts.append(("rectifier.diode_drop", (
            f"The file's diode_drop ({r.diode_drop:g} V) sizes the transformer by hand; the "
            f"waveform engine models the rectifier {part.id} from its stated forward voltage "
            f"({part.v_f:g} V).")))
    src = d["src"]
    L.given("rect.d_vf", r"V_F", d["v"], "V", "Stated forward voltage of one diode", source=src)
    if d["i"] is not None:
        L.given("rect.d_if", r"I_F", d["i"], "A", "Current at which the forward voltage is stated",
                source=f"{src}: {d['i_src']}")
    else:
        L.calc("rect.d_if", eq.IDENT, r"I_F", "A",
               "Current at which the forward voltage is stated (the charging peaks)",
               {"x": "rect.i_peak"}, lambda x: x)
    L.given("rect.d_t0", r"\vartheta_0", T_STATED, "degC",
            "Junction temperature of the stated forward point",
            source="common practice: data-sheet forward voltages are stated at 25 degC")
    L.calc("rect.d_vt0", VT, r"V_{T0}", "V", "Thermal voltage at the stated point",
           {"t": "rect.d_t0"}, lambda t: thermal_voltage(t))
    try:
        f = fit(d["v"], L["rect.d_if"], kind, rs=d["rs"], v2=d["v2"], i2=d["i2"])
    except ValueError as exc:
        raise InfeasibleDesign(f"the rectifier's forward characteristic ({src}) cannot be "
                               f"modelled: {exc}") from None
    tsrc = f"{kind.name} junction default: {kind.source}"
    two = d["v2"] is not None and d["i2"] is not None
    if two:
        L.given("rect.d_vf2", r"V_{F2}", d["v2"], "V", "Second stated forward voltage",
                source=src)
        L.given("rect.d_if2", r"I_{F2}", d["i2"], "A", "Current of the second forward voltage",
                source=src)
    pts = {"v": "rect.d_vf", "w": "rect.d_vf2", "i": "rect.d_if", "j": "rect.d_if2",
           "t": "rect.d_vt0"}
    if d["rs"] is not None:
        L.given("rect.d_rs", r"r_s", d["rs"], "ohm", "Series resistance of one diode",
                source=src)
    if two and (d["rs"] is not None or f.rs == 0.0):
        if d["rs"] is None:
            L.given("rect.d_rs", r"r_s", 0.0, "ohm", "Series resistance of one diode",
                    source="two-point fit: the points are steeper than the default emission "
                           "coefficient allows, so the drop is taken as exponential")
        L.calc("rect.d_n", N_TWO, "n", "", "Emission coefficient (two-point fit)",
               {**pts, "r": "rect.d_rs"},
               lambda v, w, r, i, j, t: ((v - r * i) - (w - r * j)) / (t * math.log(i / j)))
    else:
        L.given("rect.d_n", "n", kind.n, "", "Emission coefficient", defaulted=True,
                source=tsrc)
        if two:
            L.calc("rect.d_rs", RS_TWO, r"r_s", "ohm", "Series resistance (two-point fit)",
                   {**pts, "n": "rect.d_n"},
                   lambda v, w, n, t, i, j: max(0.0, (v - w - n * t * math.log(i / j)) / (i - j)))
        elif d["rs"] is None:
            L.given("rect.d_rs_share", "s", kind.rs_share, "%",
                    "Share of the forward voltage dropped in the series resistance",
                    defaulted=True, source=tsrc)
            L.calc("rect.d_rs", RS_SHARE, r"r_s", "ohm", "Series resistance of one diode",
                   {"s": "rect.d_rs_share", "v": "rect.d_vf", "i": "rect.d_if"},
                   lambda s, v, i: s * v / i)
    L.calc("rect.d_is", IS_FIT, r"I_S", "A", "Saturation current at the stated point",
           {"i": "rect.d_if", "v": "rect.d_vf", "r": "rect.d_rs", "n": "rect.d_n",
            "t": "rect.d_vt0"}, lambda i, v, r, n, t: i / math.expm1((v - r * i) / (n * t)))
    L.given("rect.d_eg", r"E_g", kind.eg, "V",
            "Activation energy of the saturation current over q", defaulted=True, source=tsrc)
    L.given("rect.d_xti", r"X_{TI}", kind.xti, "", "Temperature exponent of the saturation "
            "current", defaulted=True, source=tsrc)
    for tag, t_id, word in (("cold", "env.t_min", "lowest"), ("hot", "env.t_max", "highest")):
        L.calc(f"rect.d_t_{tag}", eq.IDENT, rf"\vartheta_{{J,{tag}}}", "degC",
               f"Diode junction temperature at the {tag} corners (the {word} ambient; "
               "self-heating not estimated)", {"x": t_id}, lambda x: x)
        L.calc(f"rect.d_is_{tag}", IS_TEMP, rf"I_{{S,{tag}}}", "A",
               f"Saturation current at the {tag} corners",
               {"s": "rect.d_is", "t": f"rect.d_t_{tag}", "u": "rect.d_t0", "x": "rect.d_xti",
                "n": "rect.d_n", "g": "rect.d_eg"},
               lambda s, t, u, x, n, g: float(saturation_current(s, n, t, u, g, x)))
        L.calc(f"rect.d_vf_{tag}", VF_AT, rf"V_{{F,{tag}}}", "V",
               f"Forward drop at the stated current, {tag} corners",
               {"n": "rect.d_n", "t": f"rect.d_t_{tag}", "i": "rect.d_if",
                "s": f"rect.d_is_{tag}", "r": "rect.d_rs"},
               lambda n, t, i, s, r: n * thermal_voltage(t) * math.log1p(i / s) + r * i)


def engine_diode(L, t_c) -> dict:
    """The engine's diode fields for junction temperature(s) ``t_c`` (degC)."""
    return {"diode_is": L["rect.d_is"], "diode_n": L["rect.d_n"], "diode_rs": L["rect.d_rs"],
            "diode_t_ref": L["rect.d_t0"], "diode_eg": L["rect.d_eg"],
            "diode_xti": L["rect.d_xti"], "diode_t_c": t_c}
