"""Formulas and small rules shared by the regulator kinds: junction limits and the heat-sink
target, worst-case dropout and ripple rejection near dropout, the adjustable regulator's output
window, zener derating, self-heating and standard zener voltages, the follower's V_BE drift.

Each equation names its source (a publication, "common practice" or a definition).
"""

from __future__ import annotations

import math

from .. import equations as eq
from ..parts.eseries import series_values

COMMON = "common practice"

# -- junction limits and heat sinks ----------------------------------------------------------
TJ_LIMIT = eq.define(
    "thermal.tj_limit", "Junction limit the check uses: the lower of the design's and the maker's",
    r"\min($d,\ $m)", {"d": r"T_{J,design}", "m": r"T_{J,max}"},
    "definition: the design limit must not exceed the maker's absolute limit")
TJ_TARGET = eq.define(
    "thermal.tj_target", "Junction temperature the heat sink is sized for",
    r"$j - $w \cdot |$j|", {"j": r"T_{J,lim}", "w": "w"},
    "common practice: keep the warning band as margin so the check passes by construction")
SINK_ROUNDED = eq.define(
    "thermal.heatsink_rounded", "Heat-sink thermal resistance, rounded down to two figures",
    r"\lfloor $x \rfloor_{2\,sig}", {"x": r"\theta_{SA,req}"},
    "common practice: heat sinks are bought by catalogue steps; rounding down is conservative")

# -- three-terminal regulators -----------------------------------------------------------------
DROPOUT_WORST = eq.define(
    "regulator.dropout_worst", "Worst-case dropout from a typical figure",
    r"$d + $a", {"d": r"V_{DO,typ}", "a": r"\Delta V_{DO}"},
    "common practice: a typical dropout at 25 degC plus an allowance for temperature, current "
    "and part spread (overridable; a datasheet maximum replaces it)")
DROPOUT_FLOOR = eq.define(
    "regulator.dropout_floor", "Least input that keeps regulation (output plus dropout)",
    r"$o + $d", {"o": r"V_{out,max}", "d": r"V_{DO,max}"},
    "dropout definition (common practice)")
RR_WINDOW_NEED = eq.define(
    "regulator.rr_window_need", "Trough the reservoir is sized for: dropout floor plus the "
    "ripple-rejection window", r"$f + $w", {"f": r"V_{in,DO}", "w": r"V_{RR,win}"},
    "common practice: ripple rejection falls when the input comes within about 1 V of dropout")
RR_NEAR_DROPOUT = eq.define(
    "regulator.rr_near_dropout", "Ripple rejection taken within the window above dropout",
    r"$r - $d", {"r": "RR", "d": r"\Delta RR"},
    "common practice: makers' rejection-versus-headroom curves fall by tens of dB near "
    "dropout (no single source; overridable)")
ADJ_VOUT_MAX = eq.define(
    "adjustable.v_out_max", "Highest output of an adjustable regulator",
    r"$r (1 + $t) \left(1 + \frac{$b (1 + $p)}{$a (1 - $p)}\right) + $i \cdot $b (1 + $p)",
    {"r": r"V_{ref}", "t": r"t_{ref}", "a": r"R_1", "b": r"R_2", "p": r"t_{div}",
     "i": r"I_{ADJ,max}"},
    "adjustable three-terminal regulator relation V_out = V_ref (1 + R2/R1) + I_ADJ R2 at the "
    "extremes of each term (common practice)")
ADJ_VOUT_MIN = eq.define(
    "adjustable.v_out_min", "Lowest output of an adjustable regulator",
    r"$r (1 - $t) \left(1 + \frac{$b (1 - $p)}{$a (1 + $p)}\right) + $i \cdot $b (1 - $p)",
    {"r": r"V_{ref}", "t": r"t_{ref}", "a": r"R_1", "b": r"R_2", "p": r"t_{div}",
     "i": r"I_{ADJ,min}"},
    "adjustable three-terminal regulator relation at the extremes of each term "
    "(common practice)")

# -- zeners ------------------------------------------------------------------------------------
ZENER_P_LEAD = eq.define(
    "zener.power_lead", "Allowed zener power with the lead above ambient",
    r"\min\left($p,\ \frac{$j - $t}{$r + $l}\right)",
    {"p": r"P_{rated}", "j": r"T_{J,max}", "t": r"T_A", "r": r"R_{\theta JL}",
     "l": r"R_{\theta LA}"},
    "thermal-resistance chain: T_J = T_A + P (R_thJL + R_thLA), with the rated power as a cap "
    "(P = (T_J,max - T_ref) / R_th: common practice)")
ZENER_P_AMBIENT = eq.define(
    "zener.power_ambient", "Allowed zener power at the hottest ambient",
    r"\min\left($p,\ \frac{$j - $t}{$r}\right)",
    {"p": r"P_{rated}", "j": r"T_{J,max}", "t": r"T_A", "r": r"R_{\theta JA}"},
    "linear derating P = (T_J,max - T_A) / R_thJA above the rating temperature "
    "(common practice)")
ZENER_THETA_GENERIC = eq.define(
    "zener.theta_generic", "Junction-to-ambient thermal resistance of a generic zener",
    r"\frac{$j - 25\,^{\circ}C}{$p}", {"j": r"T_{J,max}", "p": r"P_{rated}"},
    "common practice: a zener's rated power is its free-air figure at 25 degC ambient")
ZENER_SELF_HEAT = eq.define(
    "zener.self_heating", "Zener voltage shift from self-heating",
    r"|$a| \cdot $v \cdot $p \cdot $r",
    {"a": r"\alpha_Z", "v": r"V_Z", "p": r"P_{Z,max}", "r": r"R_{\theta JA}"},
    "common practice: Delta V = alpha V_Z P_Z R_theta (temperature-coefficient definition "
    "with the junction's rise above ambient)")
ZENER_HIGH_SH = eq.define(
    "zener.voltage_high_hot", "Zener voltage, upper extreme with self-heating",
    r"$v + [$a > 0] \cdot $s", {"v": r"V_{Z,max}", "s": r"\Delta V_{Z,self}", "a": r"\alpha_Z"},
    "common practice (self-heating raises a positive-tempco zener)")
ZENER_LOW_SH = eq.define(
    "zener.voltage_low_hot", "Zener voltage, lower extreme with self-heating",
    r"$v - [$a < 0] \cdot $s", {"v": r"V_{Z,min}", "s": r"\Delta V_{Z,self}", "a": r"\alpha_Z"},
    "common practice (self-heating lowers a negative-tempco zener)")
ZENER_STANDARD = eq.define(
    "zener.standard_voltage", "Standard zener voltage nearest the target that keeps the window",
    r"\mathrm{E24}($x)", {"x": r"V_{Z,target}"},
    "IEC 60063:2015 E24 series (zener voltages of +/-5 % parts follow it)")

# -- follower -----------------------------------------------------------------------------------
VBE_MIN = eq.define(
    "follower.vbe_min", "Least V_BE: the least load at the hottest ambient, or full load with "
    "the junction at its target",
    r"$v - \max\left(|$k| ($a - 25\,^{\circ}C) + $m \cdot $n,\ |$k| ($t - 25\,^{\circ}C)\right)",
    {"v": r"V_{BE}", "k": r"\mathrm{d}V_{BE}/\mathrm{d}T", "a": r"T_{A,max}",
     "t": r"T_{J,target}", "m": r"\Delta V_{BE,dec}", "n": r"n_{dec}"},
    "common practice: V_BE falls about 2 mV/K; it changes by V_T ln 10 (about 60 mV) per "
    "decade of current (exponential junction law, A. S. Sedra, K. C. Smith, from memory)")
VBE_MAX = eq.define(
    "follower.vbe_max", "Largest V_BE: cold junction at full load",
    r"$v + |$k| \cdot \max(25\,^{\circ}C - $t,\ 0)",
    {"v": r"V_{BE}", "k": r"\mathrm{d}V_{BE}/\mathrm{d}T", "t": r"T_{A,min}"},
    "common practice: V_BE rises about 2 mV/K as the junction cools")
CURRENT_DECADES = eq.define(
    "follower.current_decades", "Decades of emitter current between full and least load",
    r"\min\left(\log_{10}\frac{$a}{\max($b,\ 10^{-$c} $a)},\ $c\right)",
    {"a": r"I_{L,max}", "b": r"I_{L,least}", "c": r"n_{dec,max}"},
    "definition; a load that can disconnect is bounded at n_dec,max decades (the transistor's "
    "leakage and the zener bias keep a little emitter current; common practice)")
SHORT_CURRENT = eq.define(
    "follower.short_current", "Collector current with the output shorted (no current limit)",
    r"($b + 1) \cdot \frac{$v - $e}{$r}",
    {"b": r"\beta_{min}", "v": r"V_{C,mean,hi}", "e": r"V_{BE}", "r": r"R_1"},
    "base drive of the follower with its emitter at ground (R. Roscoe, MIT OCW 6.101, "
    "sec. 10.2.3; the least gain gives the least current, so the dissipation is at least this)")
SHORT_POWER = eq.define(
    "follower.short_power", "Pass-transistor dissipation with the output shorted",
    r"$v \cdot $i", {"v": r"V_{C,mean,hi}", "i": r"I_{sc}"},
    "power P = V_CE I_C with the emitter at ground (definition)")


def round_down_2sig(x: float) -> float:
    """Round down to two significant figures (a catalogue step at or below ``x``)."""
    if x <= 0:
        return x
    e = math.floor(math.log10(x)) - 1
    step = 10.0 ** e
    return math.floor(x / step * (1 + 1e-12)) * step


def standard_zener_voltage(target: float, fits, series: str = "E24") -> tuple[float, bool]:
    """The preferred zener voltage nearest ``target`` for which ``fits(v)`` holds, and True;
    when none near the target fits, the nearest preferred value and False.

    Zeners are sold in the IEC 60063 E24 voltages (+/-5 % parts); a value like 12.7 V cannot be
    bought. Candidates are the E24 values within a factor 1.25 of the target.
    """
    if target <= 0:
        raise ValueError("the zener voltage must be positive")
    decade = 10.0 ** math.floor(math.log10(target))
    # six significant figures, not six decimals: a target of any size has candidates
    cands = sorted({float(f"{m * decade * k:.6g}") for m in series_values(series)
                    for k in (0.1, 1.0, 10.0)})
    cands = [c for c in cands if target / 1.25 <= c <= target * 1.25]
    cands.sort(key=lambda c: (abs(c - target), c))
    for c in cands:
        if fits(c):
            return c, True
    return cands[0], False


ZENER_NEED_AT_25 = eq.define(
    "zener.need_at_25", "Rating at 25 degC that still allows the need at the hottest ambient",
    r"$x \cdot \max\left(1,\ \frac{$j - 25\,^{\circ}C}{$j - $t}\right)",
    {"x": r"P_{Z,rated,req}", "j": r"T_{J,max}", "t": r"T_{A,max}"},
    "linear derating from a 25 degC free-air rating to zero at T_J,max (common practice)")
