"""Selection of the parts on the power path: transformer, rectifier, reservoir capacitor, fuse
(the selection rule is in docgen.parts.choose)."""

from __future__ import annotations

import math
from collections.abc import Iterable

from .choose import (
    Selection,
    _check_positive,
    _choose,
    _Condition,
    _default_rank,
    _derated,
    _fmt,
    _Need,
    _price_key,
    _with_reason,
)
from .library import (
    Bridge,
    Capacitor,
    Diode,
    Fuse,
    Transformer,
)


def select_transformer(
    parts: Iterable[Transformer],
    *,
    secondary_voltage: float,
    va: float,
    center_tapped: bool = False,
    secondary_voltage_max: float | None = None,
    primary_voltage: float | None = None,
    va_derating: float = 1.0,
    ambient_c: float | None = None,
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
    ambient_c : float, optional
        Highest ambient, degC: each part's VA counts as derated to it
        (``Transformer.ambient_factor``: its rated ambient and insulation class).
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
    if ambient_c is None:
        needs.append(_derated("va", "rating", va, va_derating, "VA", lambda p: p.va))
    else:
        needs.append(_derated("va", "rating", va, va_derating, "VA",
                              lambda p: p.va * p.ambient_factor(ambient_c),
                              note=f" at {_fmt(ambient_c, 'degC')} ambient"))
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



def select_capacitor(
    parts: Iterable[Capacitor],
    *,
    capacitance: float,
    voltage: float,
    ripple_current: float,
    ripple_temperature_c: float | None = None,
    ripple_frequency: float | None = None,
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
    ripple_frequency : float, optional
        Ripple frequency of the design, Hz (2 f full-wave, f half-wave). Each part's rating is
        converted to it from the frequency it is quoted at, with the part's multiplier table or
        the typical one (``Capacitor.ripple_current_at``). Without it the rating is used as
        quoted.
    include_tolerance : bool
        Compare capacitance x (1 - tolerance) instead of the nominal value.
    """
    _check_positive(capacitance=capacitance, voltage=voltage, ripple_current=ripple_current,
                    ripple_frequency=ripple_frequency)
    if include_tolerance:
        cap_need = _Need("capacitance", "capacitance × (1 − tolerance)", capacitance, "F", "min",
                         lambda p: p.capacitance * (1 - p.tolerance))
    else:
        cap_need = _Need("capacitance", "capacitance", capacitance, "F", "min",
                         lambda p: p.capacitance)
    note = ""
    if ripple_frequency is not None:
        note = f" at {_fmt(ripple_frequency, 'Hz')}"
    if ripple_temperature_c is not None:
        note += f" at {_fmt(ripple_temperature_c, 'degC')}"

    def ripple_rating(p: Capacitor) -> float:
        return (p.ripple_current if ripple_frequency is None
                else p.ripple_current_at(ripple_frequency))

    needs = [
        cap_need,
        _derated("voltage", "voltage", voltage, voltage_derating, "V", lambda p: p.voltage),
        _derated("ripple_current", "ripple current", ripple_current, ripple_derating, "A",
                 ripple_rating, note=note),
    ]
    if ripple_temperature_c is not None:
        needs.append(_Need("ripple_temperature", "ripple rating quoted at",
                           ripple_temperature_c, "degC", "min",
                           lambda p: p.ripple_temperature_c, margin=False, in_reason=False))
    return _choose("capacitor", parts, needs, (),
                   _default_rank(lambda p: p.capacitance))


# --------------------------------------------------------------------------------------------
# Transformer



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
