"""Loads on the reservoir capacitor as monotone piecewise-linear current laws i(v).

Piecewise-linear laws keep the per-step solve in closed form: on each segment the load is a
conductance plus a constant current, and the segment is found by a sign test at the breakpoints.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .circuit import Params


@dataclass
class Load:
    """i(v) = g0[k] + g1[k] * v on segment k; segment k spans breaks[k-1] <= v < breaks[k]."""

    breaks: list[np.ndarray]  # ascending, per point
    g0: list[np.ndarray]  # len(breaks) + 1 entries
    g1: list[np.ndarray]

    def current(self, v: np.ndarray) -> np.ndarray:
        g0, g1 = self.segment_of_voltage(v)
        return g0 + g1 * v

    def segment_of_voltage(self, v: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        return self._select(sum((v >= b).astype(int) for b in self.breaks) if self.breaks else None)

    def select(self, k: np.ndarray | None) -> tuple[np.ndarray, np.ndarray]:
        """Coefficients (g0, g1) of segment k (array of segment indices, or None if one segment)."""
        return self._select(k)

    def _select(self, k):
        if k is None:
            return self.g0[0], self.g1[0]
        return np.choose(k, self.g0), np.choose(k, self.g1)

    def take(self, idx: np.ndarray) -> Load:
        return Load(
            [b[idx] for b in self.breaks], [g[idx] for g in self.g0], [g[idx] for g in self.g1]
        )


def build_load(p: Params) -> Load:
    """Piecewise-linear current law of the load for every point of ``p``."""
    n = p.n
    zero = np.zeros(n)
    if p.load == "current":
        return Load([], [p.i_load + zero], [zero])
    if p.load == "resistor":
        return Load([], [zero], [1.0 / p.r_load + zero])
    if p.load == "regulator":
        i_tot = p.i_load + p.i_q
        knee = p.v_dropout_min
        # Below the knee the current falls linearly to 0 at 0 V; a zero knee leaves a pure sink.
        slope = np.where(knee > 0, i_tot / np.where(knee > 0, knee, 1.0), 0.0)
        g0_low = np.where(knee > 0, 0.0, i_tot)
        return Load([knee.copy()], [g0_low, i_tot.copy()], [slope, zero])
    # zener shunt regulator
    r = p.r_series
    b1 = r * p.i_out  # below: node held at 0 V, output current limited to v / r_series
    b2 = p.v_z0 + b1  # above: zener conducts
    g_z = 1.0 / (p.r_z + r)
    return Load([b1, b2], [zero, p.i_out.copy(), p.i_out - b2 * g_z], [1.0 / r, zero, g_z])


def zener_node(p: Params, v: np.ndarray) -> dict[str, np.ndarray]:
    """Node voltage and branch currents of the zener shunt regulator for capacitor voltage v."""
    r = p.r_series
    b1 = r * p.i_out
    b2 = p.v_z0 + b1
    i_z = np.maximum(v - b2, 0.0) / (p.r_z + r)
    i_o = np.where(v < b1, v / r, p.i_out)
    i_r = i_z + i_o
    v_n = v - r * i_r
    return {"v_n": v_n, "i_z": i_z, "i_out": i_o, "i_r": i_r}


def typical_current(p: Params) -> np.ndarray:
    """Rough mean load current, for starting values and step-size choices only."""
    if p.load == "current":
        return p.i_load + 0.0 * p.vpk
    if p.load == "resistor":
        return p.vpk / p.r_load
    if p.load == "regulator":
        return p.i_load + p.i_q
    return np.maximum(p.vpk - p.v_z0, 0.0) / (p.r_series + p.r_z) + p.i_out
