"""Circuit description and its conversion to per-point SI arrays.

A ``Circuit`` holds one topology and one load kind; every numeric field may be a float or a 1-D
array, and all of them broadcast to a common length n, so corners and Monte Carlo samples of one
design are simulated in a single vectorised call.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, fields
from typing import Any

import numpy as np

TOPOLOGIES = ("bridge", "center-tap", "half-wave")
LOADS = ("current", "resistor", "zener", "regulator")

# Boltzmann constant over elementary charge, V/K (CODATA exact-definition value, from memory).
K_OVER_Q = 8.617333262e-5
ZERO_C_IN_K = 273.15


def saturation_current(is_ref, n, t_c, t_ref_c, eg, xti):
    """Junction saturation current at ``t_c`` (degC) from its value ``is_ref`` at ``t_ref_c``.

    Is(T) = Is(T0) (T/T0)^(XTI/n) exp((Eg / (n k/q)) (1/T0 - 1/T)), the emission-coefficient
    form of the ideal-junction law Is ~ T^XTI exp(-Eg / kT): XTI = 3 and Eg the band gap for a
    pn junction, XTI = 2 and Eg the barrier height for a Schottky junction (thermionic emission)
    (S. M. Sze, K. K. Ng, Physics of Semiconductor Devices, 3rd ed., sections 2.3 and 3.3;
    the emission-coefficient scaling from memory). At constant current the forward drop then
    falls by (Eg/q + XTI kT/q - V) / T, about 2 mV/K for silicon near 0.6 V.
    """
    t = np.asarray(t_c, dtype=float) + ZERO_C_IN_K
    t0 = np.asarray(t_ref_c, dtype=float) + ZERO_C_IN_K
    return is_ref * np.exp((xti / n) * np.log(t / t0) + eg / (n * K_OVER_Q) * (1.0 / t0 - 1.0 / t))


@dataclass(frozen=True, eq=False)
class Circuit:
    """Mains transformer -> rectifier -> reservoir capacitor -> load, secondary-referred, SI units.

    ``v_rms`` is the open-circuit secondary voltage (center-tap: each half winding); ``r_s`` and
    ``l_s`` are the source resistance and leakage inductance of each conducting path (center-tap:
    of each half winding). The diodes: saturation current ``diode_is`` stated at ``diode_t_ref``
    (degC), emission coefficient ``diode_n``, series resistance ``diode_rs``, junction temperature
    ``diode_t_c`` (degC); the saturation current follows ``saturation_current`` with the
    activation energy ``diode_eg`` (eV) and exponent ``diode_xti``. Loads:

    - ``current``: constant current ``i_load`` from the capacitor at any voltage.
    - ``resistor``: ``r_load``.
    - ``regulator``: input current ``i_load + i_q`` while the capacitor voltage is at or above
      ``v_dropout_min``; below it the current falls in proportion to the voltage (the regulator is
      in dropout and its load sees less voltage). ``v_dropout_min = 0`` makes it a current sink.
    - ``zener``: capacitor -> ``r_series`` -> node; from the node a zener (off below ``v_z0``,
      ``v_z0 + r_z * i_z`` above: piecewise linear) and a constant output current ``i_out``.
      If the node would fall below 0 V the output current is limited to what ``r_series`` can
      pass with the node at 0 V. Requires ``r_series > 0``.

    Equality is identity (fields may be arrays).
    """

    topology: str
    v_rms: Any
    freq: Any
    r_s: Any
    l_s: Any
    c: Any
    esr: Any
    diode_is: Any = 1e-9
    diode_n: Any = 1.8
    diode_rs: Any = 0.05
    diode_t_c: Any = 25.0
    diode_t_ref: Any = 25.0
    diode_eg: Any = 1.11
    diode_xti: Any = 3.0
    load: str = "current"
    i_load: Any = 0.0
    r_load: Any = math.inf
    i_q: Any = 0.0
    r_series: Any = 0.0
    v_z0: Any = 0.0
    r_z: Any = 1.0
    i_out: Any = 0.0
    v_dropout_min: Any = 0.0

    @property
    def n(self) -> int:
        """Number of operating points after broadcasting."""
        return _broadcast(self)[1]


_NUMERIC = tuple(f.name for f in fields(Circuit) if f.name not in ("topology", "load"))

# field -> (lowest allowed value, whether the bound itself is allowed)
_BOUNDS = {
    "v_rms": (0.0, False),
    "freq": (0.0, False),
    "r_s": (0.0, True),
    "l_s": (0.0, True),
    "c": (0.0, False),
    "esr": (0.0, True),
    "diode_is": (0.0, False),
    "diode_n": (0.0, False),
    "diode_rs": (0.0, True),
    "diode_t_c": (-ZERO_C_IN_K, False),
    "diode_t_ref": (-ZERO_C_IN_K, False),
    "diode_eg": (0.0, True),
    "diode_xti": (0.0, True),
    "i_load": (0.0, True),
    "r_load": (0.0, False),
    "i_q": (0.0, True),
    "r_series": (0.0, True),
    "v_z0": (0.0, True),
    "r_z": (0.0, False),
    "i_out": (0.0, True),
    "v_dropout_min": (0.0, True),
}


def _broadcast(circuit: Circuit) -> tuple[dict[str, np.ndarray], int]:
    raw = {}
    for name in _NUMERIC:
        arr = np.asarray(getattr(circuit, name), dtype=float)
        if arr.ndim > 1:
            raise ValueError(f"Circuit.{name} must be a float or a 1-D array, not {arr.shape}")
        raw[name] = arr
    try:
        arrays = np.broadcast_arrays(*raw.values())
    except ValueError as exc:
        shapes = {k: v.shape for k, v in raw.items() if v.ndim}
        raise ValueError(f"Circuit fields do not broadcast to one length: {shapes}") from exc
    n = int(arrays[0].size) if arrays[0].ndim else 1
    return {k: np.array(np.atleast_1d(a), dtype=float) for k, a in zip(raw, arrays, strict=True)}, n


class Params:
    """Per-point arrays (length n) derived from a Circuit, plus the topology constants.

    Attributes beyond the Circuit fields: ``vpk`` (open-circuit peak), ``omega``, ``m`` (diodes in
    series per conducting path), ``mvt`` (m * n * kT/q, the path's exponential slope voltage),
    ``r_lin`` (r_s + m * diode_rs), ``span`` (phase length of one pulse period: pi full-wave,
    2 pi half-wave).
    """

    def __init__(self, circuit: Circuit):
        if circuit.topology not in TOPOLOGIES:
            raise ValueError(f"topology must be one of {TOPOLOGIES}, got {circuit.topology!r}")
        if circuit.load not in LOADS:
            raise ValueError(f"load must be one of {LOADS}, got {circuit.load!r}")
        arrays, n = _broadcast(circuit)
        bad = []
        for name, (low, inclusive) in _BOUNDS.items():
            a = arrays[name]
            ok = (a >= low) if inclusive else (a > low)
            ok &= ~np.isnan(a)
            if name not in ("r_load",):
                ok &= np.isfinite(a)
            if not ok.all():
                bad.append(f"{name} at index {np.flatnonzero(~ok)[:5].tolist()}")
        if circuit.load == "zener" and not (arrays["r_series"] > 0).all():
            bad.append("r_series must be > 0 for a zener load")
        if bad:
            raise ValueError("Circuit values out of range: " + "; ".join(bad))
        self.topology = circuit.topology
        self.load = circuit.load
        self.n = n
        self.full_wave = circuit.topology != "half-wave"
        self.m = 2 if circuit.topology == "bridge" else 1
        self.span = math.pi if self.full_wave else 2.0 * math.pi
        self.a = arrays
        self._derive()

    def _derive(self) -> None:
        a = self.a
        self.vpk = math.sqrt(2.0) * a["v_rms"]
        self.omega = 2.0 * math.pi * a["freq"]
        self.mvt = self.m * a["diode_n"] * K_OVER_Q * (a["diode_t_c"] + ZERO_C_IN_K)
        self.r_lin = a["r_s"] + self.m * a["diode_rs"]
        self.isat = saturation_current(a["diode_is"], a["diode_n"], a["diode_t_c"],
                                       a["diode_t_ref"], a["diode_eg"], a["diode_xti"])

    def __getattr__(self, name: str) -> np.ndarray:
        try:
            return self.__dict__["a"][name]
        except KeyError:
            raise AttributeError(name) from None

    def take(self, idx: np.ndarray) -> Params:
        """Subset of the points (used for chunking and for dropping converged points)."""
        new = object.__new__(Params)
        new.__dict__.update({k: v for k, v in self.__dict__.items() if k != "a"})
        new.a = {k: v[idx] for k, v in self.a.items()}
        new.n = len(idx)
        new._derive()
        return new


def concat_circuits(circuits: list[Circuit]) -> Circuit:
    """One Circuit holding the points of several of the same topology and load law, in order
    (so that they run in one vectorised call)."""
    first = circuits[0]
    if any((c.topology, c.load) != (first.topology, first.load) for c in circuits):
        raise ValueError("only circuits of one topology and load law can be joined")
    parts = [_broadcast(c)[0] for c in circuits]
    joined = {name: np.concatenate([p[name] for p in parts]) for name in _NUMERIC}
    return Circuit(topology=first.topology, load=first.load, **joined)
