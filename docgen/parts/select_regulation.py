"""Selection of the regulator's parts: zener, resistor, three-terminal regulator, pass
transistor, heat sink (the selection rule is in docgen.parts.choose)."""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import replace
from typing import Any

from . import eseries
from .choose import (
    _NOUNS,
    _REL_TOL,
    Selection,
    _check_positive,
    _choose,
    _Condition,
    _default_rank,
    _derated,
    _fmt,
    _Need,
    _price_key,
    generic_requirement,
)
from .library import (
    Heatsink,
    Regulator,
    Resistor,
    ResistorFamily,
    Transistor,
    Zener,
)


def select_zener(
    parts: Iterable[Zener],
    *,
    voltage: float,
    power: float,
    ambient_c: float | None = None,
    lead_c: float | None = None,
    lead_to_ambient: float | None = None,
    power_derating: float = 1.0,
    voltage_rel_tol: float = 0.005,
    tolerance_max: float | None = None,
    knee_current_max: float | None = None,
) -> Selection:
    """Zener diode of a given nominal voltage.

    Parameters
    ----------
    voltage : float
        Nominal zener voltage, V; parts must match within ``voltage_rel_tol``.
    power : float
        Worst-case dissipation, W; the allowed power at the operating temperature must be at
        least ``power / power_derating``.
    ambient_c, lead_c : float, optional
        Operating temperatures, degC, of the two reference points makers use. Each part is
        derated from its own reference ([CP-ZENER]: makers rate the same type
        against lead or ambient): ambient-rated parts at ``ambient_c``, lead-rated parts at
        ``lead_c``. A missing one is replaced by the other, and the reason says so: lead at
        ambient is optimistic, ambient at lead pessimistic. With neither, the rated power is
        used as it stands.
    lead_to_ambient : float, optional
        Lead-to-ambient thermal resistance, K/W, for lead-rated parts that do not state their
        own ``r_theta_la``. Given with ``ambient_c`` and no ``lead_c``, a lead-rated part's
        lead is put P R_thLA above ambient instead of at ambient (``Zener.power_at_ambient``).
    tolerance_max : float, optional
        Largest voltage tolerance accepted, fraction.
    knee_current_max : float, optional
        Largest knee current accepted, A.
    """
    _check_positive(voltage=voltage, power=power, tolerance_max=tolerance_max,
                    knee_current_max=knee_current_max)
    parts = list(parts)
    any_lead = any(p.power_reference == "lead" for p in parts)

    def temperature(p: Zener) -> float | None:
        if p.power_reference == "lead":
            return lead_c if lead_c is not None else ambient_c
        return ambient_c if ambient_c is not None else lead_c

    lead_path = lead_c is None and ambient_c is not None and lead_to_ambient is not None

    def allowed(p: Zener) -> float:
        if lead_path and p.power_reference == "lead":
            return p.power_at_ambient(ambient_c, lead_to_ambient)
        t = temperature(p)
        return p.power if t is None else p.power_at(t)

    note = ""
    if ambient_c is not None or lead_c is not None:
        parts_at = []
        if ambient_c is not None:
            parts_at.append(f"{_fmt(ambient_c, 'degC')} ambient")
        if lead_c is not None:
            parts_at.append(f"{_fmt(lead_c, 'degC')} lead")
        elif ambient_c is not None and any_lead and lead_path:
            parts_at.append("lead above ambient through its lead-to-ambient path")
        elif ambient_c is not None and any_lead:
            parts_at.append("lead taken at ambient (optimistic)")
        if ambient_c is None and any(p.power_reference == "ambient" for p in parts):
            parts_at.append("ambient taken at lead (pessimistic)")
        note = " derated for " + ", ".join(parts_at)
    needs = [
        _Need("voltage", "voltage", voltage, "V", "equal", lambda p: p.voltage,
              rel_tol=voltage_rel_tol, margin=False),
        _derated("power", "allowed power", power, power_derating, "W", allowed, note=note),
    ]
    if tolerance_max is not None:
        needs.append(_Need("tolerance", "tolerance", tolerance_max, "%", "max",
                           lambda p: p.tolerance))
    if knee_current_max is not None:
        needs.append(_Need("knee_current", "knee current", knee_current_max, "A", "max",
                           lambda p: p.knee_current))
    return _choose("zener", parts, needs, (), _default_rank(lambda p: p.power),
                   noun="zener diode")


# --------------------------------------------------------------------------------------------
# Resistor



def select_resistor(
    parts: Iterable[Resistor | ResistorFamily],
    *,
    resistance: float,
    power: float,
    mode: str = "nearest",
    series: str | None = None,
    voltage: float | None = None,
    power_derating: float = 1.0,
    tolerance_max: float | None = None,
) -> Selection:
    """Resistor of a computed value, rounded to a preferred value.

    Parameters
    ----------
    resistance : float
        Computed resistance, ohm. It is rounded with ``mode`` ("up", "down", "nearest") to
        the preferred values of ``series``; with ``series=None`` each family rounds in its own
        series (an E96 family can come closer than an E12 one) and single parts are compared
        with the E24 rounding.
    power : float
        Worst-case dissipation, W; rating >= power / power_derating.
    voltage : float, optional
        Largest voltage across the resistor, V; compared with the part's max_voltage.
    tolerance_max : float, optional
        Largest tolerance accepted, fraction.

    Among equal prices the lower power rating wins, then the value closer to ``resistance``.
    """
    _check_positive(resistance=resistance, power=power, voltage=voltage,
                    tolerance_max=tolerance_max)
    if mode not in ("up", "down", "nearest"):
        raise ValueError(f"unknown rounding mode {mode!r}; expected up, down or nearest")
    if series is not None:
        eseries.series_values(series)  # refuses unknown names

    def target(s: str) -> float:
        return eseries.preferred(resistance, series or s, mode)

    candidates: list[Resistor | ResistorFamily] = []
    for part in parts:
        if isinstance(part, ResistorFamily):
            value = target(part.series)
            candidates.append(part.member(value) if part.offers(value) else part)
        else:
            candidates.append(part)

    def offered(p: Resistor | ResistorFamily) -> bool:
        if isinstance(p, ResistorFamily):
            return False
        if p.family:
            return True
        return math.isclose(p.resistance, target("E24"), rel_tol=eseries.REL_TOL)

    def not_offered(p: Resistor | ResistorFamily) -> str:
        if isinstance(p, ResistorFamily):
            return (f"{_fmt(target(p.series), 'ohm')} ({p.series}, outside its range "
                    f"{_fmt(p.minimum, 'ohm')} to {_fmt(p.maximum, 'ohm')})")
        return f"{_fmt(target('E24'), 'ohm')} (it is {_fmt(p.resistance, 'ohm')})"

    rounding = f"{_fmt(resistance, 'ohm')} rounded {mode}" + (
        f" in {series}" if series else " in the part's E series")
    conditions = [_Condition("resistance", rounding, offered, not_offered)]
    needs = [_derated("power", "power", power, power_derating, "W", lambda p: p.power)]
    if voltage is not None:
        needs.append(_Need("voltage", "voltage rating", voltage, "V", "min",
                           lambda p: p.max_voltage))
    if tolerance_max is not None:
        needs.append(_Need("tolerance", "tolerance", tolerance_max, "%", "max",
                           lambda p: p.tolerance))

    def rank(p: Resistor) -> tuple[Any, ...]:
        return (_price_key(p), p.power, abs(math.log(p.resistance / resistance)), p.id)

    selection = _choose("resistor", candidates, needs, conditions, rank)
    # The requirement starts with the value itself (as computed), then the ratings.
    requirement = {"resistance": (resistance, "ohm"), **selection.requirement}
    generic_value = eseries.preferred(resistance, series or "E24", mode)
    generic = generic_requirement(
        "resistor", {"resistance": (generic_value, "ohm"), **selection.requirement},
        (f"{series or 'E24'} value, {_fmt(resistance, 'ohm')} rounded {mode}",))
    return replace(selection, requirement=requirement, generic=generic)


# --------------------------------------------------------------------------------------------
# Regulator



def select_regulator(
    parts: Iterable[Regulator],
    *,
    output_voltage: float,
    current: float,
    input_voltage_max: float,
    input_voltage_min: float | None = None,
    polarity: str = "positive",
    kind: str | None = None,
    ripple_rejection_db: float | None = None,
    tolerance_max: float | None = None,
    current_derating: float = 1.0,
    voltage_rel_tol: float = 0.005,
) -> Selection:
    """Three-terminal regulator.

    Parameters
    ----------
    output_voltage : float
        Output voltage magnitude, V. A fixed part must match it within ``voltage_rel_tol``;
        an adjustable part qualifies when its reference voltage is at most this.
    current : float
        Largest load current, A; i_max >= current / current_derating.
    input_voltage_max : float
        Highest input voltage (no load, high line), V. Compared with v_in_max, and for parts
        rated by input-output differential with v_diff_max + output_voltage.
    input_voltage_min : float, optional
        Lowest input voltage (ripple valley at low line), V: dropout must be at most
        input_voltage_min - output_voltage.
    polarity : str
        "positive" or "negative".
    kind : str, optional
        "fixed" or "adjustable" to allow only one kind.
    ripple_rejection_db : float, optional
        Least ripple rejection, dB.
    tolerance_max : float, optional
        Largest output (or reference) tolerance, fraction.

    Among equal prices a fixed part wins over an adjustable one (it needs no divider).
    """
    _check_positive(output_voltage=output_voltage, current=current,
                    input_voltage_max=input_voltage_max, input_voltage_min=input_voltage_min,
                    ripple_rejection_db=ripple_rejection_db, tolerance_max=tolerance_max)
    if polarity not in ("positive", "negative"):
        raise ValueError(f"polarity must be 'positive' or 'negative', got {polarity!r}")
    if kind not in (None, "fixed", "adjustable"):
        raise ValueError(f"kind must be 'fixed', 'adjustable' or None, got {kind!r}")

    def input_rating(p: Regulator) -> float:
        limits = []
        if p.v_in_max is not None:
            limits.append(p.v_in_max)
        if p.v_diff_max is not None:
            limits.append(p.v_diff_max + output_voltage)
        return min(limits)

    def settable(p: Regulator) -> bool:
        if p.type == "fixed":
            return math.isclose(p.output_voltage, output_voltage, rel_tol=voltage_rel_tol)
        return p.reference_voltage <= output_voltage * (1 + _REL_TOL)

    def not_settable(p: Regulator) -> str:
        if p.type == "fixed":
            return f"a {_fmt(output_voltage, 'V')} output (fixed at {_fmt(p.output_voltage, 'V')})"
        return (f"a {_fmt(output_voltage, 'V')} output (reference "
                f"{_fmt(p.reference_voltage, 'V')} is higher)")

    sign = "+" if polarity == "positive" else "−"
    conditions = [
        _Condition("polarity", polarity, lambda p: p.polarity == polarity,
                   lambda p: f"{polarity} polarity (it is {p.polarity})"),
        _Condition("output_voltage", f"{sign}{_fmt(output_voltage, 'V')} output", settable,
                   not_settable),
    ]
    if kind is not None:
        conditions.append(_Condition("kind", kind, lambda p: p.type == kind,
                                     lambda p: f"a {kind} part (it is {p.type})"))
    needs = [
        _derated("current", "current", current, current_derating, "A", lambda p: p.i_max),
        _Need("input_voltage", "input rating", input_voltage_max, "V", "min", input_rating),
    ]
    if input_voltage_min is not None:
        needs.append(_Need("dropout", "dropout", input_voltage_min - output_voltage, "V", "max",
                           lambda p: p.dropout))
    if ripple_rejection_db is not None:
        needs.append(_Need("ripple_rejection", "ripple rejection", ripple_rejection_db, "dB",
                           "min", lambda p: p.ripple_rejection_db))
    if tolerance_max is not None:
        needs.append(_Need("tolerance", "tolerance", tolerance_max, "%", "max",
                           lambda p: p.tolerance))

    def rank(p: Regulator) -> tuple[Any, ...]:
        return (_price_key(p), 0 if p.type == "fixed" else 1, p.i_max, p.id)

    selection = _choose("regulator", parts, needs, conditions, rank)
    requirement = {"output_voltage": (output_voltage, "V"), **selection.requirement}
    # "linear regulator, +5 V output, at least 1 A, ..." (the sign says the polarity).
    rest = generic_requirement("regulator", selection.requirement)
    noun = _NOUNS["regulator"]
    generic = f"{noun}, {conditions[1].text}{rest[len(noun):]}"
    if kind is not None:
        generic += f", {kind}"
    return replace(selection, requirement=requirement, generic=generic)


# --------------------------------------------------------------------------------------------
# Transistor



def select_transistor(
    parts: Iterable[Transistor],
    *,
    v_ceo: float,
    i_c: float,
    power: float,
    h_fe_min: float | None = None,
    polarity: str = "npn",
    voltage_derating: float = 1.0,
    current_derating: float = 1.0,
    power_derating: float = 1.0,
) -> Selection:
    """Series-pass transistor.

    ``v_ceo`` (V), ``i_c`` (A) and ``power`` (W) are the worst-case stresses; each rating must
    be at least stress / derating. ``power`` is compared with the maker's p_tot (usually at a
    25 degC case); the heat-sink calculation decides whether it can be carried.
    ``h_fe_min`` is the least current gain the base-drive design assumed.
    """
    _check_positive(v_ceo=v_ceo, i_c=i_c, power=power, h_fe_min=h_fe_min)
    if polarity not in ("npn", "pnp"):
        raise ValueError(f"polarity must be 'npn' or 'pnp', got {polarity!r}")
    needs = [
        _derated("v_ceo", "V_CEO", v_ceo, voltage_derating, "V", lambda p: p.v_ceo),
        _derated("i_c", "I_C", i_c, current_derating, "A", lambda p: p.i_c_max),
        _derated("power", "P_tot", power, power_derating, "W", lambda p: p.p_tot),
    ]
    if h_fe_min is not None:
        needs.append(_Need("h_fe", "h_FE(min)", h_fe_min, "", "min", lambda p: p.h_fe_min))
    conditions = [_Condition("polarity", polarity.upper(), lambda p: p.polarity == polarity,
                             lambda p: f"{polarity.upper()} (it is {p.polarity.upper()})")]
    return _choose("transistor", parts, needs, conditions, _default_rank(lambda p: p.i_c_max))


# --------------------------------------------------------------------------------------------
# Fuse


def select_heatsink(parts: Iterable[Heatsink], *, r_theta_sa: float) -> Selection:
    """Heat sink with a sink-to-ambient thermal resistance of at most ``r_theta_sa`` (K/W).

    Among equal prices the sink with the highest thermal resistance that fits (the smallest)
    wins.
    """
    _check_positive(r_theta_sa=r_theta_sa)
    needs = [_Need("r_theta_sa", "R_θSA", r_theta_sa, "K/W", "max", lambda p: p.r_theta_sa)]
    return _choose("heatsink", parts, needs, (), _default_rank(lambda p: -p.r_theta_sa),
                   noun="heat sink")
