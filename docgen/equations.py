"""The equation catalogue: every formula docgen evaluates, written once with its source.

Right-hand sides are mathtext-compatible LaTeX with ``$name`` placeholders (see docgen.trace).
Sources follow the tags of the project's reference notes: a published work (with "from memory"
where the location was not re-checked), "IEC ..." for standards, or "common practice" for a
fact of the trade with no single source.
"""

from __future__ import annotations

from .trace import Equation

SEDRA_SMITH = "A. S. Sedra, K. C. Smith, Microelectronic Circuits (rectifier and zener sections; from memory)"
IEC_60038 = "IEC 60038:2009 IEC standard voltages, supply voltage range +/-10 %"
COMMON = "common practice"
DEF = "definition"

E: dict[str, Equation] = {}


def define(id: str, title: str, rhs: str, params: dict[str, str], source: str,
           note: str = "") -> Equation:
    """Add an equation to the catalogue (a regulator kind's module may define its own)."""
    return _eq(id, title, rhs, params, source, note)


def _eq(id: str, title: str, rhs: str, params: dict[str, str], source: str, note: str = "") -> Equation:
    eq = Equation(id=id, title=title, rhs=rhs, params=params, source=source, note=note)
    if id in E:
        raise ValueError(f"duplicate equation id {id}")
    E[id] = eq
    return eq


# ---------------------------------------------------------------- mains
LINE_LOW = _eq("mains.line_low", "Low-line voltage", r"$v \cdot (1 - $t)",
               {"v": r"V_{nom}", "t": r"t_{lo}"}, IEC_60038)
LINE_HIGH = _eq("mains.line_high", "High-line voltage", r"$v \cdot (1 + $t)",
                {"v": r"V_{nom}", "t": r"t_{hi}"}, IEC_60038)
SINE_PEAK = _eq("sine.peak", "Peak of a sinusoid", r"\sqrt{2} \cdot $v", {"v": r"V_{rms}"},
                "sinusoid relation, any circuits text (e.g. " + SEDRA_SMITH + ")")
RIPPLE_FREQ_FW = _eq("rectifier.ripple_frequency_fw", "Ripple frequency, full-wave", r"2 \cdot $f",
                     {"f": "f"}, "full-wave rectification, any circuits text (" + SEDRA_SMITH + ")")

# ---------------------------------------------------------------- zener requirements
BOUND_HIGH = _eq("tolerance.upper", "Upper bound with tolerance", r"$x \cdot (1 + $t)",
                 {"x": "x", "t": "t"}, DEF)
BOUND_LOW = _eq("tolerance.lower", "Lower bound with tolerance", r"$x \cdot (1 - $t)",
                {"x": "x", "t": "t"}, DEF)
ZENER_DT = _eq(
    "zener.delta_t", "Largest junction temperature excursion from 25 degC",
    r"\max(|$h - 25\,^{\circ}C|,\ |$c - 25\,^{\circ}C|)",
    {"h": r"T_{A,max}", "c": r"T_{A,min}"},
    "common practice: zener voltage is specified at 25 degC; the junction's self-heating "
    "is added separately (zener.self_heating)",
)
ZENER_HIGH = _eq(
    "zener.voltage_high", "Zener voltage, upper extreme",
    r"$v \cdot (1 + $t) + |$a| \cdot $v \cdot $d",
    {"v": r"V_Z", "t": r"t_Z", "a": r"\alpha_Z", "d": r"\Delta T"},
    "temperature coefficient definition (common practice); conservative: the temperature "
    "term widens both extremes",
)
ZENER_LOW = _eq(
    "zener.voltage_low", "Zener voltage, lower extreme",
    r"$v \cdot (1 - $t) - |$a| \cdot $v \cdot $d",
    {"v": r"V_Z", "t": r"t_Z", "a": r"\alpha_Z", "d": r"\Delta T"},
    "temperature coefficient definition (common practice)",
)
ZENER_KNEE = _eq(
    "zener.knee_voltage", "Knee voltage of the piecewise-linear zener model",
    r"$v - $r \cdot $i", {"v": r"V_Z", "r": r"r_z", "i": r"I_{ZT}"},
    "common practice: V_Z is specified at the test current I_ZT; r_z is the slope around it",
)
ZENER_IZMIN = _eq("zener.iz_min", "Minimum zener current", r"$k \cdot $i",
                  {"k": r"k_{ZK}", "i": r"I_{ZK}"},
                  SEDRA_SMITH + "; the exercise keeps I_Z above 5 x I_ZK")
SUM2 = _eq("sum.two", "Sum", r"$a + $b", {"a": "a", "b": "b"}, DEF)
DIFF2 = _eq("diff.two", "Difference", r"$a - $b", {"a": "a", "b": "b"}, DEF)

# ---------------------------------------------------------------- reservoir and transformer
PEAK_FROM_VALLEY = _eq(
    "reservoir.peak_needed", "Capacitor peak needed for a valley and ripple fraction",
    r"\frac{$v}{1 - $r}", {"v": r"V_{valley}", "r": r"r_{ripple}"},
    "valley = peak - ripple (" + SEDRA_SMITH + ")",
)
RIPPLE_FRACTION = _eq("reservoir.ripple_allowed_frac", "Ripple allowed by the ripple fraction",
                      r"$r \cdot $p", {"r": r"r_{ripple}", "p": r"V_{C,pk}"}, COMMON)
RIPPLE_THROUGH_DIVIDER = _eq(
    "zener.ripple_in_allowed", "Input ripple allowed by the output ripple limit",
    r"$o \cdot \frac{$R + $z}{$z}",
    {"o": r"V_{r,out}", "R": "R", "z": r"r_z"},
    SEDRA_SMITH + ": line regulation r_z / (R + r_z)",
)
IDENT = _eq("identity", "Carried over unchanged (no floor applies)", r"$x", {"x": "x"}, DEF)
MIN2 = _eq("min.two", "Smaller of two limits", r"\min($a,\ $b)", {"a": "a", "b": "b"}, DEF)
MAX2 = _eq("max.two", "Larger of two values", r"\max($a,\ $b)", {"a": "a", "b": "b"}, DEF)
SEC_PEAK_NEEDED = _eq(
    "transformer.secondary_peak_needed", "Secondary peak needed at low line, full load",
    r"$v + $r + 2 \cdot $d",
    {"v": r"V_{valley}", "r": r"V_r", "d": r"V_F"},
    "bridge: two diode drops in the conducting path (about 1.4-2 V, common practice)",
)
RMS_FROM_PEAK = _eq("sine.rms", "RMS of a sinusoid from its peak", r"\frac{$v}{\sqrt{2}}",
                    {"v": r"V_{pk}"}, "sinusoid relation, any circuits text")
RATED_FROM_LOW_LINE = _eq(
    "transformer.rated_needed", "Rated secondary needed at nominal mains",
    r"\frac{$v}{1 - $t}", {"v": r"V_{sec,lo}", "t": r"t_{lo}"},
    "secondary scales with the primary (ideal turns ratio)",
)
PICKED = _eq("pick.standard", "Next standard value at or above the need", r"\lceil $x \rceil_{std}",
             {"x": "x"}, COMMON, note="chosen from the standard list named in the value title")
SEC_RMS_CURRENT = _eq(
    "transformer.secondary_rms_table", "Secondary RMS current of a capacitor-input bridge",
    r"$k \cdot $i", {"k": r"k_{rms}", "i": r"I_{DC}"},
    "common practice: makers' selection tables give 1.6-1.8 x I_DC for a bridge; "
    "O. H. Schade, Proc. IRE 1943, shows the ratio depends on wCR_L and R_s/R_L",
)
VA_NEEDED = _eq("transformer.va", "Apparent power of the secondary", r"$v \cdot $i",
                {"v": r"V_{sec}", "i": r"I_{sec,rms}"}, DEF)
REGULATION_TYPICAL = _eq(
    "transformer.regulation_typical", "Typical regulation for the VA rating",
    r"\mathrm{reg}($s)", {"s": r"S"},
    "common practice: typical regulation of small mains transformers by VA band",
    note="interpolated on a log scale between band figures; a datasheet figure overrides it",
)
NO_LOAD = _eq("transformer.no_load", "No-load secondary voltage", r"$v \cdot (1 + $g)",
              {"v": r"V_{sec}", "g": r"\mathrm{Reg}"},
              "common practice: Reg = (V_NL - V_FL) / V_FL")
SCALE = _eq("scale.ratio", "Scaled by a ratio", r"$v \cdot $k", {"v": "v", "k": "k"}, DEF)
CAP_PEAK_LOW = _eq(
    "rectifier.cap_peak", "Capacitor peak voltage",
    r"\sqrt{2} \cdot $v - 2 \cdot $d", {"v": r"V_{sec}", "d": r"V_F"},
    SEDRA_SMITH + "; bridge loses two diode drops",
)
XFMR_AMBIENT_DERATING = _eq(
    "transformer.ambient_derating", "Secondary current derating for a hotter ambient",
    r"\min\left(1,\ \sqrt{\frac{$c - $a}{$c - $r}}\right)",
    {"c": r"T_{class}", "a": r"T_{A,max}", "r": r"T_{A,rated}"},
    "common practice [CP-XFMR-AMBIENT]: the winding's rise follows its copper loss I^2 R; the "
    "rated load at the rated ambient is taken to reach the class temperature (IEC 60085 "
    "classes, from memory); core loss left out")
RATED_CURRENT = _eq("transformer.rated_current", "Rated secondary current", r"\frac{$s}{$v}",
                    {"s": "S", "v": r"V_{sec}"}, DEF)

# ---------------------------------------------------------------- reservoir
CAP_FOR_RIPPLE = _eq(
    "reservoir.capacitance", "Capacitance for the allowed ripple",
    r"\frac{$i}{$f \cdot $v}", {"i": r"I_{DC}", "f": r"f_r", "v": r"V_r"},
    SEDRA_SMITH + ": V_r = I / (f_r C); conservative by about 15-25 % at 10 % ripple",
)
CAP_NOMINAL_NEEDED = _eq("reservoir.nominal_needed", "Nominal capacitance covering the tolerance",
                         r"\frac{$c}{1 - $t}", {"c": r"C_{req}", "t": r"t_C"}, DEF)
RIPPLE = _eq(
    "reservoir.ripple", "Peak-to-peak ripple (constant-current discharge)",
    r"\frac{$i}{$f \cdot $c}", {"i": r"I_{DC}", "f": r"f_r", "c": "C"},
    SEDRA_SMITH + ": small-ripple approximation",
)
RIPPLE_RATING_AT_FREQ = _eq(
    "reservoir.ripple_rating_at_frequency", "Ripple-current rating at the ripple frequency",
    r"$i \cdot \frac{$a}{$b}", {"i": r"I_{C,q}", "a": r"M(f_r)", "b": r"M(f_q)"},
    "makers' frequency multipliers for aluminium electrolytics (common practice; typical "
    "table from memory, [CP-RIPPLE-FREQ])")
DERATED_NEED = _eq("derating.rating_needed", "Rating needed after derating", r"\frac{$x}{$k}",
                   {"x": "x", "k": r"k_{der}"}, COMMON)

# ---------------------------------------------------------------- zener regulator
ZENER_R = _eq(
    "zener.series_resistor", "Largest series resistor keeping the zener in regulation",
    r"\frac{$v - $z}{$l + $i}",
    {"v": r"V_{in,min}", "z": r"V_{Z,max}", "l": r"I_{L,max}", "i": r"I_{Z,min}"},
    SEDRA_SMITH + " (zener shunt regulator)",
)
PREFERRED_DOWN = _eq("eseries.down", "Preferred value at or below", r"\lfloor $x \rfloor_{E24}",
                     {"x": "x"}, "IEC 60063:2015 E24 series")
PREFERRED_UP = _eq("eseries.up", "Preferred value at or above", r"\lceil $x \rceil_{E6}",
                   {"x": "x"}, "IEC 60063:2015 E6 series (usual for electrolytics, common practice)")
ZENER_CURRENT_AT = _eq(
    "zener.current", "Zener current", r"\frac{$v - $z}{$R} - $l",
    {"v": r"V_{in}", "z": r"V_Z", "R": "R", "l": r"I_L"},
    SEDRA_SMITH + " (current balance at the zener node)",
)
INPUT_CURRENT = _eq("zener.input_current", "Regulator input current", r"\frac{$v - $z}{$R}",
                    {"v": r"V_{in}", "z": r"V_Z", "R": "R"}, "Ohm's law")
POWER_VI = _eq("power.vi", "Power", r"$v \cdot $i", {"v": "V", "i": "I"}, DEF)
POWER_V2R = _eq("power.v2r", "Power in a resistor", r"\frac{($a - $b)^2}{$R}",
                {"a": r"V_a", "b": r"V_b", "R": "R"}, "Joule's law")
DIVIDER = _eq("zener.ripple_out", "Output ripple through the R / r_z divider",
              r"$v \cdot \frac{$z}{$R + $z}", {"v": r"V_r", "z": r"r_z", "R": "R"},
              SEDRA_SMITH + ": line regulation r_z / (R + r_z)")
RELATIVE_DEV = _eq("deviation.relative", "Relative deviation from nominal", r"\frac{$a - $n}{$n}",
                   {"a": "V", "n": r"V_{nom}"}, DEF)

# ---------------------------------------------------------------- rectifier
PIV_BRIDGE = _eq("rect.piv", "Peak inverse voltage per bridge diode", r"\sqrt{2} \cdot $v",
                 {"v": r"V_{sec,NL,hi}"},
                 SEDRA_SMITH + ": each blocking bridge diode sees the winding peak")
HALF = _eq("bridge.avg_current", "Average current per bridge diode", r"\frac{$i}{2}",
           {"i": r"I_{DC}"}, "full-wave: each diode pair conducts every other half-cycle")
PEAK_CURRENT_FW = _eq(
    "bridge.peak_current", "Repetitive peak diode current (ideal source)",
    r"$i \cdot \left(1 + 2\pi\sqrt{\frac{$v}{2 \cdot $r}}\right)",
    {"i": r"I_{DC}", "v": r"V_{C,pk}", "r": r"V_r"},
    SEDRA_SMITH + ": full-wave peak rectifier; an upper bound (no source resistance)",
)
CONDUCTION_ANGLE = _eq(
    "rectifier.conduction_angle", "Conduction angle per pulse",
    r"\arccos\left(1 - \frac{$r}{$v}\right)", {"r": r"V_r", "v": r"V_{C,pk}"},
    SEDRA_SMITH + " (peak rectifier)",
)

# ---------------------------------------------------------------- zener regulator, self-consistent
RIPPLE_WITH_R = _eq(
    "zener.ripple_with_resistor", "Ripple with the regulator's own input current",
    r"\frac{$v - $z}{$f \cdot $c \cdot $R + 1/2}",
    {"v": r"V_{C,pk}", "z": r"V_Z", "f": r"f_r", "c": r"C_{min}", "R": "R"},
    "derived from " + SEDRA_SMITH + ": V_r = I/(f_r C) with I = (V_pk - V_r/2 - V_Z)/R",
)
ZENER_B = _eq(
    "zener.quadratic_b", "Auxiliary term of the series-resistor quadratic",
    r"$a \cdot $f \cdot $c - \frac{$i}{2}",
    {"a": "a", "f": r"f_r", "c": r"C_{min}", "i": r"I_T"},
    "derived (see zener.series_resistor_exact)",
)
ZENER_R_EXACT = _eq(
    "zener.series_resistor_exact", "Largest series resistor holding I_Z,min at the trough",
    r"\frac{$b + \sqrt{$b^2 - 2 \cdot $i \cdot $f \cdot $c \cdot $a}}{2 \cdot $i \cdot $f \cdot $c}",
    {"a": r"a", "b": "b", "i": r"I_T", "f": r"f_r", "c": r"C_{min}"},
    "derived: (V_pk - V_r - V_Z)/R = I_T with V_r from the ripple equation "
    "zener.ripple_with_resistor (zener shunt design of " + SEDRA_SMITH + ")",
    note="a = V_C,pk,lo - V_Z,max; I_T = I_L,max + I_Z,min; the larger root has the small ripple",
)
VALLEY = _eq("reservoir.valley", "Capacitor voltage at the ripple trough", r"$p - $r",
             {"p": r"V_{C,pk}", "r": r"V_r"}, SEDRA_SMITH + ": valley = peak - ripple")
MEAN_FROM_PEAK = _eq("reservoir.mean", "Mean capacitor voltage", r"$p - \frac{$r}{2}",
                     {"p": r"V_{C,pk}", "r": r"V_r"}, SEDRA_SMITH)
ENERGY = _eq("reservoir.energy", "Energy stored in the reservoir", r"\frac{1}{2} \cdot $c \cdot $v^2",
             {"c": "C", "v": r"V_{C,max}"}, "capacitor energy, any physics text")

# ---------------------------------------------------------------- circuit model for the engine
WINDING_R = _eq(
    "transformer.winding_resistance", "Secondary-referred winding resistance from regulation",
    r"\frac{$g \cdot $v^2}{$s}", {"g": r"\mathrm{Reg}", "v": r"V_{sec}", "s": "S"},
    "common practice: the regulation is taken as the resistive drop at rated current, "
    "(V_NL - V_FL) = I_rated R_w",
)
LEAKAGE_L = _eq(
    "transformer.leakage_inductance", "Leakage inductance estimate",
    r"\frac{$k \cdot $r}{2 \pi \cdot $f}", {"k": r"k_X", "r": r"R_w", "f": "f"},
    "common practice: leakage reactance a fraction of the winding resistance for small "
    "mains transformers (estimate; give the measured value when known)",
)
ESR_TAN_DELTA = _eq(
    "reservoir.esr_tan_delta", "ESR from the dissipation factor",
    r"\frac{$t}{2 \pi \cdot $f \cdot $c}", {"t": r"\tan\delta", "f": r"f_r", "c": "C"},
    "common practice: ESR = tan(delta) / (2 pi f C), makers' application guides",
)
ENGINE = _eq(
    "engine.steady_state", "Periodic steady state of the rectifier circuit (numerical)",
    r"\mathrm{steady\ state\ of\ the\ circuit\ model}",
    {},
    "docgen waveform engine: trapezoidal integration with an exponential diode, shooting on "
    "the period map; checked against scipy.integrate.solve_ivp in the test suite",
)
ENGINE_SWITCH_ON = _eq(
    "engine.switch_on", "Switch-on transient (numerical)",
    r"\mathrm{empty\ capacitor,\ closed\ at\ the\ crest,\ until\ charged}",
    {},
    "docgen waveform engine (switch-on transient over the pulses until the capacitor is "
    "charged); worst switching instant per common practice",
)
CAP_RIPPLE_CURRENT = _eq(
    "reservoir.ripple_current_table", "Capacitor ripple current estimate",
    r"$i \cdot \sqrt{($w \cdot $k)^2 - 1}", {"i": r"I_{DC}", "w": r"k_w", "k": r"k_{rms}"},
    "derived [DERIVED-RMS]: the capacitor carries the rectifier's output current less its DC, "
    "I_C,rms = sqrt(I_rect,rms^2 - I_DC^2), with I_rect,rms = k_w k_rms I_DC from the table "
    "ratio of the winding current (common practice [CP-SELECTION-TABLES]); k_w = sqrt(2) for a "
    "center tap, whose two half windings feed the capacitor in turn",
)
SURGE_ESTIMATE = _eq(
    "rectifier.surge_estimate", "Switch-on surge estimate (empty capacitor, closed at the crest)",
    r"\frac{$v}{$r}", {"v": r"V_{C,max}", "r": r"R_w"},
    "common practice: the winding resistance limits the first charging pulse",
)
CAP_CORE_TEMP = _eq(
    "reservoir.core_temperature", "Capacitor core temperature with ripple self-heating",
    r"$t + $i^2 \cdot $e \cdot $r", {"t": r"T_{A,max}", "i": r"I_{C,rms}", "e": "ESR",
                                     "r": r"R_{th}"},
    "common practice: dT = I_rms^2 ESR R_th (makers' application guides)",
)
CAP_LIFE = _eq(
    "reservoir.life", "Capacitor life at the operating temperature (10-degree rule)",
    r"\min\left($l \cdot 2^{($a - $t)/10\,\mathrm{K}},\ $m\right)",
    {"l": r"L_0", "a": r"T_0", "t": r"T_{core}", "m": r"L_{cap}"},
    "common practice: life doubles for every 10 K below the rated temperature "
    "(Arrhenius-based rule stated in electrolytic capacitor makers' application guides); "
    "extrapolation capped at about 15 years, where sealing and electrolyte loss take over",
)
EFFICIENCY = _eq("power.efficiency", "Efficiency", r"\frac{$o}{$i}",
                 {"o": r"P_{out}", "i": r"P_{in}"}, DEF)

# ---------------------------------------------------------------- topologies
RIPPLE_FREQ_HW = _eq("rectifier.ripple_frequency_hw", "Ripple frequency, half-wave", r"$f",
                     {"f": "f"}, "half-wave rectification, any circuits text (" + SEDRA_SMITH + ")")
SEC_PEAK_NEEDED_N = _eq(
    "transformer.path_peak_needed", "Winding peak needed at low line, full load",
    r"$v + $r + $n \cdot $d",
    {"v": r"V_{valley}", "r": r"V_r", "n": r"n_d", "d": r"V_F"},
    "n_d diodes conduct in series: 2 in a bridge, 1 in center-tap and half-wave (common practice)",
)
CT_WHOLE = _eq("transformer.ct_whole", "Whole center-tapped winding", r"2 \cdot $v",
               {"v": r"V_{half}"}, "center tap at the middle of the winding")
CT_HALF = _eq("transformer.ct_half", "Half of a center-tapped winding", r"\frac{$v}{2}",
              {"v": r"V_{sec}"}, "center tap at the middle of the winding")
CAP_PEAK_N = _eq(
    "rectifier.cap_peak_n", "Capacitor peak voltage",
    r"\sqrt{2} \cdot $v - $n \cdot $d", {"v": r"V_{path}", "n": r"n_d", "d": r"V_F"},
    SEDRA_SMITH + "; the conducting path loses n_d diode drops",
)
PIV_DOUBLE = _eq(
    "rectifier.piv_double", "Peak inverse voltage per diode (center-tap or half-wave)",
    r"2 \sqrt{2} \cdot $v", {"v": r"V_{path,NL,hi}"},
    SEDRA_SMITH + ": the blocking diode sees twice the path peak (center-tap: the whole winding; "
    "half-wave with a reservoir: the winding peak plus the capacitor)",
)
PEAK_CURRENT_HW = _eq(
    "rectifier.peak_current_hw", "Repetitive peak diode current, half-wave (ideal source)",
    r"$i \cdot \left(1 + 2\pi\sqrt{\frac{2 \cdot $v}{$r}}\right)",
    {"i": r"I_{DC}", "v": r"V_{C,pk}", "r": r"V_r"},
    SEDRA_SMITH + ": half-wave peak rectifier; an upper bound (no source resistance)",
)
WINDING_R_PATH = _eq(
    "transformer.winding_resistance_path", "Winding resistance of one conducting path",
    r"\frac{$g \cdot $p \cdot $v}{$s}",
    {"g": r"\mathrm{Reg}", "p": r"V_{path}", "v": r"V_{sec}", "s": "S"},
    "common practice: the regulation is taken as the resistive drop at rated current, "
    "(V_NL - V_FL) = I_rated R_w, per conducting winding",
)

# ---------------------------------------------------------------- series regulators
OHM = _eq("ohm.r_or_i", "Ohm's law", r"\frac{$v}{$i}", {"v": "V", "i": "I"}, "Ohm's law")
PREFERRED_E96 = _eq("eseries.nearest96", "Nearest E96 value", r"\mathrm{E96}($x)", {"x": "x"},
                    "IEC 60063:2015 E96 series")
ADJ_R2 = _eq(
    "adjustable.r2", "Divider resistor R2 of an adjustable regulator",
    r"\frac{$v - $r}{$r/$a + $i}",
    {"v": r"V_{out}", "r": r"V_{ref}", "a": r"R_1", "i": r"I_{ADJ}"},
    "adjustable three-terminal regulator: V_out = V_ref (1 + R2/R1) + I_ADJ R2 (makers' "
    "datasheets; common practice)",
)
ADJ_VOUT = _eq(
    "adjustable.v_out", "Output voltage of an adjustable regulator",
    r"$r \cdot \left(1 + \frac{$b}{$a}\right) + $i \cdot $b",
    {"r": r"V_{ref}", "a": r"R_1", "b": r"R_2", "i": r"I_{ADJ}"},
    "adjustable three-terminal regulator relation (common practice)",
)
RIPPLE_RR_ALLOWED = _eq(
    "regulator.ripple_rejection_allowed", "Input ripple allowed by the ripple rejection",
    r"$o \cdot 10^{$r/20}", {"o": r"V_{r,out}", "r": "RR"},
    "ripple rejection RR = 20 log10(V_r,in / V_r,out) (common practice)",
)
RIPPLE_RR_OUT = _eq(
    "regulator.ripple_out_rr", "Output ripple through the regulator's ripple rejection",
    r"$v \cdot 10^{-$r/20}", {"v": r"V_{r,in}", "r": "RR"},
    "ripple rejection RR = 20 log10(V_r,in / V_r,out) (common practice)",
)
BASE_CURRENT = _eq("follower.base_current", "Base current of the pass transistor",
                   r"\frac{$i}{$b + 1}", {"i": r"I_E", "b": r"\beta"},
                   "bipolar transistor, I_E = (beta + 1) I_B (any circuits text)")
FOLLOWER_R1 = _eq(
    "follower.r1", "Largest base resistor of a zener-referenced emitter follower",
    r"\frac{$v - $z}{$i}", {"v": r"V_{in,min}", "z": r"V_{Z,max}", "i": r"I_{Z,min} + I_{B,max}"},
    "R. Roscoe, MIT OCW 6.101 (2007) sec. 10.2.3, base-drive design",
)
REG_POWER = _eq(
    "regulator.dissipation", "Series regulator dissipation",
    r"($v - $o) \cdot $i + $v \cdot $q",
    {"v": r"V_{in}", "o": r"V_{out}", "i": r"I_{out}", "q": r"I_Q"},
    "power balance of a linear regulator (common practice; makers' application notes)",
)
JUNCTION_BARE = _eq(
    "thermal.junction_bare", "Junction temperature without a heat sink",
    r"$t + $p \cdot $r", {"t": r"T_A", "p": "P", "r": r"\theta_{JA}"},
    "thermal-resistance model (common practice)",
)
HEATSINK_NEEDED = _eq(
    "thermal.heatsink_needed", "Heat-sink thermal resistance needed",
    r"\frac{$j - $t}{$p} - $c - $s",
    {"j": r"T_{J,design}", "t": r"T_A", "p": "P", "c": r"\theta_{JC}", "s": r"\theta_{CS}"},
    "thermal-resistance model (common practice)",
)
JUNCTION = _eq(
    "thermal.junction", "Junction temperature at the hottest ambient",
    r"$t + $p \cdot $r", {"t": r"T_{A,max}", "p": r"P_{max}", "r": r"\theta_{total}"},
    "thermal-resistance model (common practice)",
)

# ---------------------------------------------------------------- protection
PRIMARY_RATED = _eq("fuse.primary_rated", "Rated primary current (rule of thumb)",
                    r"\frac{$s}{$v}", {"s": "S", "v": r"V_{nom}"},
                    "common practice: I_pri ~ VA_rated / V_pri for fuse sizing")
TURNS_REFLECT = _eq("transformer.reflect_current", "Secondary current referred to the primary",
                    r"$k \cdot $i \cdot \frac{$s}{$p}",
                    {"k": r"k_{w}", "i": r"I_{sec,rms}", "s": r"V_{path,NL}", "p": r"V_{nom}"},
                    "ideal transformer I1 = I2 N2/N1 (any circuits text); k_w = sqrt(2) when two "
                    "half windings conduct in turn")
I2T_REFLECT = _eq("transformer.reflect_i2t", "Switch-on I2t referred to the primary",
                  r"$i \cdot \left(\frac{$s}{$p}\right)^2",
                  {"i": r"I^2t_{sec}", "s": r"V_{path,NL}", "p": r"V_{nom}"},
                  "ideal transformer current ratio (any circuits text); the magnetising inrush "
                  "is added separately")
BLEEDER_R = _eq("bleeder.resistance", "Largest bleeder for the discharge time",
                r"\frac{$t}{$c \cdot \ln($v / $s)}",
                {"t": "t", "c": r"C_{max}", "v": r"V_0", "s": r"V_{safe}"},
                "capacitor discharge V(t) = V0 exp(-t/RC) (any physics text)")
BLEEDER_T = _eq("bleeder.time", "Discharge time to the safe voltage",
                r"$r \cdot $c \cdot \ln($v / $s)",
                {"r": "R", "c": r"C_{max}", "v": r"V_0", "s": r"V_{safe}"},
                "capacitor discharge V(t) = V0 exp(-t/RC) (any physics text)")
POWER_V2 = _eq("power.v2r_single", "Power in a resistor", r"\frac{$v^2}{$R}",
               {"v": "V", "R": "R"}, "Joule's law")
RSS = _eq("sum.quadrature", "Sum in quadrature (RMS of currents in turn)",
          r"\sqrt{$a^2 + $b^2}", {"a": "a", "b": "b"},
          "RMS of two current pulse trains that do not overlap in time (definition of RMS)")

# Fuse and switch-on (protection stage).
I2T_HALF_SINE = _eq("fuse.inrush_i2t", "I2t of a half-sine pulse lasting half a mains period",
                    r"\frac{($k \cdot $i)^2}{4 \cdot $f}",
                    {"k": r"k_{inr}", "i": r"I_{pri,rated}", "f": "f"},
                    "derived: integral of (I_pk sin)^2 over 1/(2f) is I_pk^2 / (4f); peak k x "
                    "rated primary current: common practice (from memory)")
SUM_RMS_BOUND = _eq("sum.rms_bound", "RMS of a sum of currents (upper bound)", r"$a + $b",
                    {"a": "a", "b": "b"},
                    "Minkowski inequality: the RMS of a sum is at most the sum of the RMS values "
                    "(equal when the currents are in phase)")
I2T_SUM_BOUND = _eq("sum.i2t_bound", "I2t of coincident pulses (upper bound)",
                    r"\left(\sqrt{$a} + \sqrt{$b}\right)^2", {"a": "a", "b": "b"},
                    "Minkowski inequality for the integral of a squared sum (equal when the "
                    "pulses have the same shape and timing)")
FUSE_I2T_GATE = _eq("fuse.i2t_gate", "Least melting I2t allowed by the 10 I_N gate",
                    r"(10 \cdot $i)^2 \cdot $t", {"i": "I_N", "t": r"t_{10,min}"},
                    "IEC 60127-2 standard sheet 3 (time-lag, low breaking capacity): pre-arcing "
                    "time at 10 I_N at least 10 ms (from memory)")
FUSE_RATING_FOR_I2T = _eq("fuse.rating_for_i2t", "Least rating whose gate I2t covers the need",
                          r"\frac{1}{10} \sqrt{\frac{$x}{$t}}", {"x": r"I^2t_{req}",
                                                                  "t": r"t_{10,min}"},
                          "inverse of the IEC 60127-2 sheet 3 gate I2t (from memory)")
PULSE_DERATED = _eq("fuse.pulse_derated", "Switch-on I2t a fuse may see at each switch-on",
                    r"$k \cdot $x", {"k": r"k_{pulse}", "x": r"I^2t_F"},
                    "common practice (from memory): at most about 20-50 % of the melting I2t per "
                    "switch-on for tens of thousands of switchings")
I2T_NEED = _eq("fuse.i2t_need", "Melting I2t needed for repeated switch-on", r"\frac{$x}{$k}",
               {"x": r"I^2t_{pri}", "k": r"k_{pulse}"},
               "common practice (from memory): pulse derating of the melting I2t")
LARGEST3 = _eq("max.three", "Largest of three", r"\max($a, $b, $c)",
               {"a": "a", "b": "b", "c": "c"}, DEF)

# ---------------------------------------------------------------- hold-up, regulation, insulation
CHARGE_BALANCE = ("charge balance of a capacitor, i = C dv/dt (C. K. Alexander, M. N. O. "
                  "Sadiku, Fundamentals of Electric Circuits, chapter on capacitors: from "
                  "memory; common practice for hold-up estimates)")
HOLDUP_CC = _eq("holdup.constant_current", "Hold-up time of a constant-current discharge "
                "(initial estimate)", r"\frac{$c \cdot ($a - $b)}{$i}",
                {"c": r"C_{min}", "a": r"V_{C,min}", "b": r"V_{in,min}", "i": r"I_{in,max}"},
                CHARGE_BALANCE)
HOLDUP_ENGINE = _eq(
    "engine.holdup", "Hold-up time after a mains dropout at the trough (numerical)",
    r"\int_{V_{stop}}^{V_{C,min}} \frac{C\,(1 + R_{ESR}\,\mathrm{d}i/\mathrm{d}v)}{i(v)}"
    r"\,\mathrm{d}v",
    {},
    "the engine's trough V_C,min at each corner, discharged through the kind's load law i(v) "
    "(the engine's piecewise-linear law, integrated in closed form segment by segment) down to "
    "the voltage V_stop where the output leaves its limits or the regulator its regulation; "
    + CHARGE_BALANCE)
REGULATION_SPREAD = _eq(
    "engine.regulation", "Regulation: spread of the engine's mean output over a set of corners",
    r"\frac{\max \bar{V}_{out} - \min \bar{V}_{out}}{V_{out}}", {},
    "definition of line and load regulation as a fraction of the nominal output (common "
    "practice; " + SEDRA_SMITH + ")")
WORKING_RMS = _eq(
    "insulation.working_rms", "Working voltage across the mains-to-output barrier (RMS)",
    r"$m + $s", {"m": r"V_{nom}", "s": r"V_{path,NL}"},
    "conservative bound: the mains and the winding voltage added in phase, the output's "
    "common taken as earthed (common practice; the product standard's own working-voltage rule, "
    "e.g. IEC 62368-1 clause 5.4.1.8 (from memory), may give less)")
WORKING_PEAK = _eq(
    "insulation.working_peak", "Peak working voltage across the mains-to-output barrier",
    r"\sqrt{2} \cdot ($m + $s)", {"m": r"V_{hi}", "s": r"V_{path,NL,hi}"},
    "conservative bound at high line: the mains and the winding peaks added, the output's "
    "common taken as earthed (common practice)")
