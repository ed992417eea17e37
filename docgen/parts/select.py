"""Choosing parts from an approved-parts library, with the reason in words.

Each ``select_*`` function takes the parts of one kind (for example ``library.capacitors``) and
the stresses the design puts on the part, in SI units (temperatures in degrees Celsius). Where
a derating factor is given, the required rating is ``stress / derating`` (a factor of 0.8 means
"use at most 80 % of the rating"), and the reason text shows the division. Derating factors
default to 1.0 (none) here on purpose: the requirements file's margins are the one place that
sets them, and the caller passes them in.

Selection rule
--------------
Among the parts that meet every rating and condition, the one with the **lowest price** is
chosen; ties go to the **smallest part** (the smallest main rating of its kind: capacitance,
VA, current, power...), then to the **id** in alphabetical order, so the choice is
deterministic. A part with no price sorts after every priced part. Two kinds differ, because
for them a larger rating is worse, not merely dearer:

* fuses: the smallest current rating that fits comes first (closest protection), then price;
* heat sinks: among equal prices the *highest* thermal resistance that fits (the smallest sink).

When no part fits, :class:`Selection` says which ratings were short (``unmet``) for the
``closest`` part: the one failing the fewest conditions (polarity, kind...) and, among those,
with the smallest total shortfall measured as the sum of |ln(rated / required)| over the
ratings it misses.

Margins are fractions of the requirement: ``(rated - required) / required`` for a minimum
rating and ``(required - rated) / required`` for a maximum; positive means room to spare.

Every function also works with an empty list of parts; the :class:`Selection` then carries the
``requirement`` and the ``generic`` text ("electrolytic capacitor, at least 3300 uF, ...") for a
bill of materials without a library.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterable, Mapping, Sequence
from dataclasses import dataclass, field, replace
from decimal import ROUND_CEILING, ROUND_FLOOR, ROUND_HALF_EVEN, Decimal
from typing import Any

from ..units import format_quantity
from . import eseries
from .library import (
    Bridge,
    Capacitor,
    Diode,
    Fuse,
    Heatsink,
    Part,
    Regulator,
    Resistor,
    ResistorFamily,
    Transformer,
    Transistor,
    Zener,
)

__all__ = [
    "Selection",
    "generic_requirement",
    "select_capacitor",
    "select_transformer",
    "select_bridge_or_diodes",
    "select_zener",
    "select_resistor",
    "select_regulator",
    "select_transistor",
    "select_fuse",
    "select_heatsink",
]

# A rating within this relative distance of a requirement counts as meeting it (float noise).
_REL_TOL = 1e-9
_DIGITS = 3  # significant digits of numbers in reasons and generic texts


@dataclass(frozen=True)
class Selection:
    """The outcome of one selection.

    Attributes
    ----------
    kind : str
        Kind of part: "capacitor", "transformer", "bridge", "diode", ...
    part : Part or None
        The chosen part (a resistor family yields the concrete member), or None.
    reason : str
        One sentence: what was picked and why, or why nothing fits.
    requirement : dict
        rating name -> (required value, unit); SI (temperatures degC, "%" values as fractions,
        "dB" in dB), derating already applied.
    margins : dict
        rating name -> (required, rated, margin fraction) for the chosen part.
    conditions : tuple of str
        Non-numeric requirements in words ("center-tapped", "time-lag (T)").
    quantity : int
        How many of ``part`` the design uses (2 or 4 diodes instead of a bridge).
    unmet : tuple of str
        When nothing fits: the ratings/conditions the closest part misses.
    closest : Part or None
        When nothing fits: the part that came nearest.
    closest_lacks : str
        What the closest part lacks, with numbers.
    candidates : int
        How many parts met every rating.
    generic : str
        The requirement as text for a generic bill-of-materials line.
    """

    kind: str
    part: Part | None
    reason: str
    requirement: dict[str, tuple[float, str]]
    margins: dict[str, tuple[float, float, float]] = field(default_factory=dict)
    conditions: tuple[str, ...] = ()
    quantity: int = 1
    unmet: tuple[str, ...] = ()
    closest: Part | None = None
    closest_lacks: str = ""
    candidates: int = 0
    generic: str = ""

    @property
    def ok(self) -> bool:
        return self.part is not None


# --------------------------------------------------------------------------------------------
# Number display


def _round_sig(value: float, digits: int, rounding: str | None) -> float:
    """Round to ``digits`` significant digits; ceiling/floor after removing float noise."""
    if value == 0 or not math.isfinite(value):
        return value
    d = Decimal(repr(value))
    d = d.quantize(Decimal(1).scaleb(d.adjusted() - 11))  # drop noise like ...0000004
    quantum = Decimal(1).scaleb(d.adjusted() - digits + 1)
    return float(d.quantize(quantum, rounding=rounding or ROUND_HALF_EVEN))


def _fmt(value: float, unit: str, rounding: str | None = None) -> str:
    return format_quantity(_round_sig(value, _DIGITS, rounding), unit, _DIGITS)


# --------------------------------------------------------------------------------------------
# Requirements


@dataclass(frozen=True)
class _Need:
    name: str  # key in Selection.requirement
    label: str  # words for reasons: "voltage"
    required: float  # SI, after derating
    unit: str
    sense: str  # "min", "max" or "equal"
    rated: Callable[[Any], float | None]  # the part's rating (None: not stated)
    stress: float | None = None  # before derating
    derating: float = 1.0
    rel_tol: float = 0.0  # for "equal"
    margin: bool = True  # False for temperatures and equalities
    note: str = ""  # appended to the phrase, e.g. " at 85 °C"
    in_reason: bool = True  # False when another phrase already says it

    def meets(self, part: Any) -> bool:
        rated = self.rated(part)
        if rated is None:
            return False
        if self.sense == "min":
            return rated >= self.required * (1 - _REL_TOL) if self.required > 0 else (
                rated >= self.required - _REL_TOL)
        if self.sense == "max":
            return rated <= self.required * (1 + _REL_TOL) if self.required > 0 else (
                rated <= self.required + _REL_TOL)
        return math.isclose(rated, self.required, rel_tol=max(self.rel_tol, _REL_TOL))

    def shortfall(self, part: Any) -> float:
        rated = self.rated(part)
        if rated is None or rated <= 0 or self.required <= 0:
            return 10.0
        return abs(math.log(rated / self.required))

    def phrase(self) -> str:
        op = {"min": "≥", "max": "≤", "equal": "="}[self.sense]
        rounding = {"min": ROUND_CEILING, "max": ROUND_FLOOR}.get(self.sense)
        value = _fmt(self.required, self.unit, rounding)
        if self.stress is not None and self.derating != 1.0:
            value = f"{_fmt(self.stress, self.unit)} / {self.derating:g} = {value}"
        tol = f" ± {self.rel_tol * 100:g} %" if self.sense == "equal" and self.rel_tol else ""
        return f"{self.label} {op} {value}{tol}{self.note}"

    def lacks(self, part: Any) -> str:
        rated = self.rated(part)
        if rated is None:
            return f"{self.label}: not stated"
        rel = {"min": "<", "max": ">", "equal": "≠"}[self.sense]
        return (f"{self.label} {_fmt(rated, self.unit)} {rel} "
                f"{_fmt(self.required, self.unit)}{self.note}")


@dataclass(frozen=True)
class _Condition:
    name: str
    text: str  # "center-tapped"
    test: Callable[[Any], bool]
    lacks: Callable[[Any], str]


def _price_key(part: Any) -> float:
    return math.inf if part.price is None else part.price


def _default_rank(size: Callable[[Any], float]) -> Callable[[Any], tuple[Any, ...]]:
    return lambda p: (_price_key(p), size(p), p.id)


def _choose(kind: str, parts: Iterable[Any], needs: Sequence[_Need],
            conditions: Sequence[_Condition], rank: Callable[[Any], tuple[Any, ...]], *,
            rule: str = "the lowest price", quantity: int = 1,
            noun: str | None = None) -> Selection:
    parts = list(parts)
    requirement = {n.name: (n.required, n.unit) for n in needs}
    cond_texts = tuple(c.text for c in conditions)
    generic = generic_requirement(kind, requirement, cond_texts)
    wanted = ", ".join([n.phrase() for n in needs if n.in_reason] + list(cond_texts))
    noun = noun or kind
    count = f"{quantity} × " if quantity > 1 else ""
    base = dict(kind=kind, requirement=requirement, conditions=cond_texts, quantity=quantity,
                generic=generic)
    if not parts:
        return Selection(part=None, reason=f"no {noun} in the parts library; needed: {wanted}",
                         **base)
    fits: list[Any] = []
    misses: list[tuple[Any, list[_Need], list[_Condition]]] = []
    for part in parts:
        failed = [n for n in needs if not n.meets(part)]
        failed_c = [c for c in conditions if not c.test(part)]
        if failed or failed_c:
            misses.append((part, failed, failed_c))
        else:
            fits.append(part)
    if fits:
        best = min(fits, key=rank)
        margins: dict[str, tuple[float, float, float]] = {}
        for n in needs:
            rated = n.rated(best)
            if not n.margin or n.sense == "equal" or rated is None or n.required == 0:
                continue
            m = (rated - n.required) if n.sense == "min" else (n.required - rated)
            margins[n.name] = (n.required, rated, m / abs(n.required))
        others = f"{rule} of {len(fits)} that fit" if len(fits) > 1 else "the only one that fits"
        reason = f"picked {count}{best.id} ({others}): {wanted}"
        return Selection(part=best, reason=reason, margins=margins, candidates=len(fits), **base)
    part, failed, failed_c = min(
        misses,
        key=lambda m: (len(m[2]), sum(n.shortfall(m[0]) for n in m[1]), _price_key(m[0]), m[0].id),
    )
    lacks = "; ".join([n.lacks(part) for n in failed] + [c.lacks(part) for c in failed_c])
    reason = (f"no {noun} in the library meets every rating ({wanted}); closest is {part.id}, "
              f"which misses {lacks}")
    return Selection(part=None, reason=reason, unmet=tuple(n.name for n in failed)
                     + tuple(c.name for c in failed_c), closest=part, closest_lacks=lacks, **base)


def _derated(name: str, label: str, stress: float, derating: float, unit: str,
             rated: Callable[[Any], float | None], note: str = "") -> _Need:
    if not (derating > 0 and derating <= 1.0):
        raise ValueError(f"derating factor for {label} must be in (0, 1], got {derating!r}")
    return _Need(name, label, stress / derating, unit, "min", rated, stress=stress,
                 derating=derating, note=note)


def _check_positive(**values: float | None) -> None:
    for name, value in values.items():
        if value is None:
            continue
        if isinstance(value, bool) or not isinstance(value, (int, float)) or not (
                math.isfinite(value) and value > 0):
            raise ValueError(f"{name} must be a positive finite number (SI), got {value!r}")


# --------------------------------------------------------------------------------------------
# Generic requirement text

_NOUNS = {
    "transformer": "mains transformer",
    "bridge": "bridge rectifier",
    "diode": "rectifier diode",
    "capacitor": "electrolytic capacitor",
    "zener": "zener diode",
    "resistor": "resistor",
    "transistor": "transistor",
    "regulator": "linear regulator",
    "fuse": "fuse",
    "heatsink": "heat sink",
}

# (kind, rating) -> phrase with {} for the value; "min" values are rounded up in the text,
# "max" values down. A phrase starting with "at " joins the previous one without a comma.
_PHRASES: dict[str, dict[str, tuple[str, str]]] = {
    "transformer": {
        "secondary_voltage": ("min", "secondary at least {} RMS at full load"),
        "secondary_voltage_max": ("max", "at most {}"),
        "va": ("min", "at least {}"),
    },
    "bridge": {
        "v_rrm": ("min", "V_RRM at least {}"),
        "i_f_avg": ("min", "at least {} average output current"),
        "i_fsm": ("min", "surge at least {}"),
        "i2t": ("min", "I²t at least {}"),
    },
    "diode": {
        "v_rrm": ("min", "V_RRM at least {}"),
        "i_f_avg": ("min", "at least {} average forward current"),
        "i_fsm": ("min", "surge at least {}"),
        "i2t": ("min", "I²t at least {}"),
    },
    "capacitor": {
        "capacitance": ("min", "at least {}"),
        "voltage": ("min", "at least {}"),
        "ripple_current": ("min", "at least {} ripple"),
        "ripple_temperature": ("min", "at {}"),
    },
    "zener": {
        "voltage": ("equal", "{}"),
        "power": ("min", "at least {}"),
        "tolerance": ("max", "tolerance at most {}"),
        "knee_current": ("max", "knee current at most {}"),
    },
    "resistor": {
        "resistance": ("equal", "{}"),
        "power": ("min", "at least {}"),
        "voltage": ("min", "rated for at least {}"),
        "tolerance": ("max", "tolerance at most {}"),
    },
    "transistor": {
        "v_ceo": ("min", "V_CEO at least {}"),
        "i_c": ("min", "I_C at least {}"),
        "power": ("min", "P_tot at least {}"),
        "h_fe": ("min", "h_FE at least {}"),
    },
    "regulator": {
        "output_voltage": ("equal", "{} output"),
        "current": ("min", "at least {}"),
        "input_voltage": ("min", "input rated to at least {}"),
        "dropout": ("max", "dropout at most {}"),
        "ripple_rejection": ("min", "ripple rejection at least {}"),
        "tolerance": ("max", "tolerance at most {}"),
    },
    "fuse": {
        "current": ("min", "at least {}"),
        "current_max": ("max", "at most {}"),
        "voltage": ("min", "rated for at least {}"),
        "i2t": ("min", "melting I²t at least {}"),
    },
    "heatsink": {
        "r_theta_sa": ("max", "at most {} sink-to-ambient"),
    },
}


def generic_requirement(kind: str, requirement: Mapping[str, tuple[float, str]],
                        conditions: Sequence[str] = ()) -> str:
    """The requirement as one line of text, for a bill of materials without a library.

    ``requirement`` maps rating names to (SI value, unit) as in :attr:`Selection.requirement`;
    ``conditions`` are extra words ("center-tapped", "time-lag (T)"). Minimum values are
    rounded up and maximum values down to three significant digits, so the text never asks
    for less than the design needs.

    >>> generic_requirement("capacitor", {"capacitance": (3.3e-3, "F"), "voltage": (35.0, "V"),
    ...     "ripple_current": (1.2, "A"), "ripple_temperature": (85.0, "degC")})
    'electrolytic capacitor, at least 3300 µF, at least 35 V, at least 1.2 A ripple at 85 °C'
    """
    if kind not in _NOUNS:
        raise ValueError(f"unknown part kind {kind!r}; expected one of {', '.join(_NOUNS)}")
    text = _NOUNS[kind]
    phrases = _PHRASES[kind]
    for name, (value, unit) in requirement.items():
        sense, template = phrases.get(name, ("min", f"{name.replace('_', ' ')} at least {{}}"))
        rounding = {"min": ROUND_CEILING, "max": ROUND_FLOOR}.get(sense)
        phrase = template.format(_fmt(value, unit, rounding))
        text += (" " if template.startswith("at {}") else ", ") + phrase
    for condition in conditions:
        text += f", {condition}"
    return text


# --------------------------------------------------------------------------------------------
# Capacitor


def select_capacitor(
    parts: Iterable[Capacitor],
    *,
    capacitance: float,
    voltage: float,
    ripple_current: float,
    ripple_temperature_c: float | None = None,
    voltage_derating: float = 1.0,
    ripple_derating: float = 1.0,
    include_tolerance: bool = False,
) -> Selection:
    """Reservoir electrolytic.

    Parameters
    ----------
    capacitance : float
        Smallest capacitance the design needs, F.
    voltage : float
        Highest voltage across the capacitor (no load, high line), V; the rated voltage must
        be at least ``voltage / voltage_derating``.
    ripple_current : float
        RMS ripple current, A; the rated ripple current must be at least
        ``ripple_current / ripple_derating``.
    ripple_temperature_c : float, optional
        Temperature, degC, at which the part must carry that ripple. A rating quoted at this
        temperature or hotter is accepted as it stands (ripple capability falls as temperature
        rises: common practice, no source); a rating quoted only at a cooler temperature is not.
    include_tolerance : bool
        Compare capacitance x (1 - tolerance) instead of the nominal value.

    The ripple rating is used as quoted (usually at 100/120 Hz); no frequency multiplier is
    applied.
    """
    _check_positive(capacitance=capacitance, voltage=voltage, ripple_current=ripple_current)
    if include_tolerance:
        cap_need = _Need("capacitance", "capacitance × (1 − tolerance)", capacitance, "F", "min",
                         lambda p: p.capacitance * (1 - p.tolerance))
    else:
        cap_need = _Need("capacitance", "capacitance", capacitance, "F", "min",
                         lambda p: p.capacitance)
    note = ""
    if ripple_temperature_c is not None:
        note = f" at {_fmt(ripple_temperature_c, 'degC')}"
    needs = [
        cap_need,
        _derated("voltage", "voltage", voltage, voltage_derating, "V", lambda p: p.voltage),
        _derated("ripple_current", "ripple current", ripple_current, ripple_derating, "A",
                 lambda p: p.ripple_current, note=note),
    ]
    if ripple_temperature_c is not None:
        needs.append(_Need("ripple_temperature", "ripple rating quoted at",
                           ripple_temperature_c, "degC", "min",
                           lambda p: p.ripple_temperature_c, margin=False, in_reason=False))
    return _choose("capacitor", parts, needs, (),
                   _default_rank(lambda p: p.capacitance))


# --------------------------------------------------------------------------------------------
# Transformer


def select_transformer(
    parts: Iterable[Transformer],
    *,
    secondary_voltage: float,
    va: float,
    center_tapped: bool = False,
    secondary_voltage_max: float | None = None,
    primary_voltage: float | None = None,
    va_derating: float = 1.0,
) -> Selection:
    """Mains transformer.

    Parameters
    ----------
    secondary_voltage : float
        Smallest rated RMS secondary voltage (full load) the design needs, V. For
        ``center_tapped=True`` this is each half of the winding, and only center-tapped parts
        qualify (their half is ``secondary_voltage / 2`` of the library entry). Otherwise the
        whole winding counts, so a center-tapped part may serve with its tap unused.
    va : float
        Apparent power the design draws, VA; the rating must be at least ``va / va_derating``.
    secondary_voltage_max : float, optional
        Upper limit on the same voltage (a higher secondary wastes power in the regulator).
    primary_voltage : float, optional
        Mains voltage, V; parts that state a primary voltage must match it within 2 %.
    """
    _check_positive(secondary_voltage=secondary_voltage, va=va,
                    secondary_voltage_max=secondary_voltage_max, primary_voltage=primary_voltage)

    def winding(p: Transformer) -> float:
        return p.half_voltage if center_tapped else p.secondary_voltage

    label = "secondary per half" if center_tapped else "secondary"
    needs = [_Need("secondary_voltage", label, secondary_voltage, "V", "min", winding)]
    if secondary_voltage_max is not None:
        needs.append(_Need("secondary_voltage_max", label, secondary_voltage_max, "V", "max",
                           winding))
    needs.append(_derated("va", "rating", va, va_derating, "VA", lambda p: p.va))
    conditions = []
    if center_tapped:
        conditions.append(_Condition("center_tapped", "center-tapped",
                                     lambda p: p.center_tapped,
                                     lambda p: "a center tap (it has none)"))
    if primary_voltage is not None:
        text = f"{_fmt(primary_voltage, 'V')} primary"
        conditions.append(_Condition(
            "primary_voltage", text,
            lambda p: p.primary_voltage is None
            or math.isclose(p.primary_voltage, primary_voltage, rel_tol=0.02),
            lambda p: f"a {text} (it has {_fmt(p.primary_voltage, 'V')})"))
    return _choose("transformer", parts, needs, conditions, _default_rank(lambda p: p.va))


# --------------------------------------------------------------------------------------------
# Rectifier

_TOPOLOGIES = {"bridge": 4, "center-tap": 2, "half-wave": 1}


def select_bridge_or_diodes(
    bridges: Iterable[Bridge],
    diodes: Iterable[Diode],
    *,
    topology: str,
    peak_reverse_voltage: float,
    dc_current: float,
    surge_current: float,
    i2t: float | None = None,
    voltage_derating: float = 1.0,
    current_derating: float = 1.0,
) -> Selection:
    """Rectifier: one bridge, or discrete diodes (4 for a bridge, 2 center-tap, 1 half-wave).

    Parameters
    ----------
    topology : str
        "bridge", "center-tap" or "half-wave".
    peak_reverse_voltage : float
        Worst-case reverse voltage across one diode, V; V_RRM >= it / voltage_derating.
    dc_current : float
        Average DC output current I_DC, A. Each diode carries I_DC / 2 on average in bridge and
        center-tap circuits and I_DC in half-wave ([DERIVED-CHARGE], derived). A bridge
        part's i_f_avg is its output rating, so it is compared with I_DC itself.
    surge_current : float
        Peak switch-on surge through one diode, A; compared with I_FSM as it stands.
    i2t : float, optional
        Switch-on I²t, A²s; parts must state an I²t at least this large.

    With a bridge topology, the cheaper of the best bridge and four of the best diode is
    chosen (a bridge on a tie: one part to place).
    """
    if topology not in _TOPOLOGIES:
        raise ValueError(f"unknown rectifier topology {topology!r}; expected one of "
                         f"{', '.join(_TOPOLOGIES)}")
    _check_positive(peak_reverse_voltage=peak_reverse_voltage, dc_current=dc_current,
                    surge_current=surge_current, i2t=i2t)
    per_diode = dc_current if topology == "half-wave" else dc_current / 2

    def needs(output: bool) -> list[_Need]:
        out = [
            _derated("v_rrm", "V_RRM", peak_reverse_voltage, voltage_derating, "V",
                     lambda p: p.v_rrm),
            _derated("i_f_avg", "average output current" if output else
                     "average current per diode", dc_current if output else per_diode,
                     current_derating, "A", lambda p: p.i_f_avg),
            _Need("i_fsm", "I_FSM", surge_current, "A", "min", lambda p: p.i_fsm),
        ]
        if i2t is not None:
            out.append(_Need("i2t", "I²t", i2t, "A2s", "min", lambda p: p.i2t))
        return out

    count = _TOPOLOGIES[topology]
    rank = _default_rank(lambda p: p.i_f_avg)
    by_diodes = _choose("diode", diodes, needs(False), (), rank, quantity=count,
                        noun="rectifier diode")
    if topology != "bridge":
        return by_diodes
    by_bridge = _choose("bridge", bridges, needs(True), (), rank, noun="bridge rectifier")
    if by_bridge.ok and by_diodes.ok:
        bridge_cost = _price_key(by_bridge.part)
        diodes_cost = _price_key(by_diodes.part) * count
        if diodes_cost < bridge_cost:
            return _with_reason(by_diodes, f"{by_diodes.reason}; {count} diodes cost "
                                f"{diodes_cost:g}, less than {by_bridge.part.id} at "
                                f"{bridge_cost:g}")
        return by_bridge
    if by_bridge.ok:
        return by_bridge
    if by_diodes.ok:
        return _with_reason(by_diodes, f"{by_diodes.reason}; no bridge fits: {by_bridge.reason}")
    return _with_reason(by_bridge, f"{by_bridge.reason}; nor do {count} discrete diodes: "
                        f"{by_diodes.reason}")


def _with_reason(selection: Selection, reason: str) -> Selection:
    return replace(selection, reason=reason)


# --------------------------------------------------------------------------------------------
# Zener


def select_zener(
    parts: Iterable[Zener],
    *,
    voltage: float,
    power: float,
    ambient_c: float | None = None,
    lead_c: float | None = None,
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

    def allowed(p: Zener) -> float:
        t = temperature(p)
        return p.power if t is None else p.power_at(t)

    note = ""
    if ambient_c is not None or lead_c is not None:
        parts_at = []
        if ambient_c is not None:
            parts_at.append(f"{_fmt(ambient_c, 'degC')} ambient")
        if lead_c is not None:
            parts_at.append(f"{_fmt(lead_c, 'degC')} lead")
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

_CHARACTERISTICS = {"FF": "very quick-acting (FF)", "F": "quick-acting (F)",
                    "M": "medium time-lag (M)", "T": "time-lag (T)", "TT": "long time-lag (TT)"}


def select_fuse(
    parts: Iterable[Fuse],
    *,
    current: float,
    voltage: float,
    characteristic: str = "T",
    i2t: float | None = None,
    current_max: float | None = None,
) -> Selection:
    """Mains fuse: the smallest rating that carries the current.

    Parameters
    ----------
    current : float
        Least rated current, A (the caller applies its factor over the primary RMS current).
    voltage : float
        Mains voltage the fuse must be rated for, V.
    characteristic : str
        IEC 60127 speed letter: "T" (time-lag, the usual choice before a transformer), "F"...
    i2t : float, optional
        Switch-on I²t, A²s, that the fuse must survive: melting I²t >= it.
    current_max : float, optional
        Largest acceptable rating, A (for example the transformer maker's stated fuse).

    Ranked by rating first (the smallest that fits protects best), then price, then id.
    """
    _check_positive(current=current, voltage=voltage, i2t=i2t, current_max=current_max)
    if characteristic not in _CHARACTERISTICS:
        raise ValueError(f"unknown fuse characteristic {characteristic!r}; expected one of "
                         f"{', '.join(_CHARACTERISTICS)}")
    needs = [_Need("current", "rating", current, "A", "min", lambda p: p.current)]
    if current_max is not None:
        needs.append(_Need("current_max", "rating", current_max, "A", "max", lambda p: p.current))
    needs.append(_Need("voltage", "voltage", voltage, "V", "min", lambda p: p.voltage))
    if i2t is not None:
        needs.append(_Need("i2t", "melting I²t", i2t, "A2s", "min", lambda p: p.i2t))
    words = _CHARACTERISTICS[characteristic]
    conditions = [_Condition("characteristic", words,
                             lambda p: p.characteristic == characteristic,
                             lambda p: f"{words} (it is {_CHARACTERISTICS[p.characteristic]})")]
    return _choose("fuse", parts, needs, conditions,
                   lambda p: (p.current, _price_key(p), p.id), rule="the smallest rating")


# --------------------------------------------------------------------------------------------
# Heat sink


def select_heatsink(parts: Iterable[Heatsink], *, r_theta_sa: float) -> Selection:
    """Heat sink with a sink-to-ambient thermal resistance of at most ``r_theta_sa`` (K/W).

    Among equal prices the sink with the highest thermal resistance that fits (the smallest)
    wins.
    """
    _check_positive(r_theta_sa=r_theta_sa)
    needs = [_Need("r_theta_sa", "R_θSA", r_theta_sa, "K/W", "max", lambda p: p.r_theta_sa)]
    return _choose("heatsink", parts, needs, (), _default_rank(lambda p: -p.r_theta_sa),
                   noun="heat sink")
