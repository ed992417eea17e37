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
from .library import (
    Part,
)

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


def _with_reason(selection: Selection, reason: str) -> Selection:
    return replace(selection, reason=reason)


# --------------------------------------------------------------------------------------------
# Zener
