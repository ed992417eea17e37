"""Worst-case corners and Monte Carlo samples of one design, run through the waveform engine.

Corners combine the extremes of every tolerance that moves a checked quantity: mains low /
nominal / high, load least / full, capacitance at -tol / +tol, the regulator kind's own
axes (a zener shunt adds its zener voltage at the lower / upper extreme and its series resistor
at -tol / +tol; a three-terminal regulator its output setpoint), the rectifier's junction at the
lowest and highest ambient (a cold diode drops more, a hot one less), and, for a product that
must run from two mains frequencies, both frequencies (the lower gives the deeper trough, the
higher the taller, narrower charging pulses). Each check reports the corner where it is worst.

Monte Carlo draws every tolerance independently and uniformly within its band (uniform is the
conservative choice when the distribution is unknown: common practice), with the seed from the
requirements file so runs repeat exactly. Corners and samples go through the engine in one
vectorised call.
"""

from __future__ import annotations

import itertools
import math
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from ..engine import Circuit, concat_circuits, simulate, switch_on
from ..stages.diodes import engine_diode
from ..topology import topology as topology_record
from ..trace import Ledger
from .holdup import holdup_times

# Inputs the circuit model can be built from, for the trace of every engine value.
MODEL_INPUTS = (
    "transformer.v_nl", "mains.tol_low", "mains.tol_high", "mains.freq", "transformer.r_w",
    "transformer.l_s", "reservoir.c", "reservoir.tol", "reservoir.esr", "zener.r",
    "zener.r_tol", "zener.v_knee_max", "zener.v_knee_min", "zener.v_max", "zener.v_min",
    "zener.r_z", "output.i_max", "output.i_min_worst", "reg.i_q", "reg.dropout",
    "reg.v_out_min", "q.i_r1", "rect.d_is", "rect.d_n", "rect.d_rs", "rect.d_t0", "rect.d_eg",
    "rect.d_xti", "rect.d_t_cold", "rect.d_t_hot", "mains.freq_also",
)


def model_inputs(L: Ledger) -> tuple[str, ...]:
    """The model inputs this design has (they differ by regulator kind)."""
    return tuple(i for i in MODEL_INPUTS if i in L)


# The switch-on transient runs until the capacitor is charged (at most SURGE_CYCLES mains
# periods); a coarser grid than the engine's default (2000 steps per period in the first window,
# 500 in the later ones) keeps the pulses well resolved (peak and I^2 t within about 1e-4 of a
# grid four times as fine on the demo designs) at a fraction of the cost.
SURGE_CYCLES = 10.0
SURGE_STEPS = 2000


@dataclass
class PointSet:
    """Operating points as parallel arrays (SI); ``name`` describes each corner."""

    line: np.ndarray  # mains factor relative to nominal
    load: np.ndarray  # A
    c: np.ndarray  # F
    v_z: np.ndarray  # V, zener knee voltage
    r: np.ndarray  # ohm
    t_d: np.ndarray  # degC, rectifier junction temperature
    freq: np.ndarray  # Hz, mains frequency
    name: list[str]
    line_name: list[str]
    load_name: list[str]

    def __len__(self) -> int:
        return len(self.name)


@dataclass
class CornerResult:
    corners: PointSet
    samples: PointSet | None
    metrics: dict[str, np.ndarray]  # engine figures for corners then samples
    converged: np.ndarray
    surge_peak: float
    surge_i2t: float
    surge_converged: bool
    surge_first_i2t: float = float("nan")
    surge_cycles: float = float("nan")
    surge_corner: str = ""
    surge_settled: bool = False
    waveforms: dict[str, dict[str, np.ndarray]] = field(default_factory=dict)
    nominal_index: int = 0

    @property
    def points(self) -> PointSet:
        """Corners followed by the samples, in the order of the metrics."""
        return _concat(self.corners, self.samples)

    @property
    def n_corners(self) -> int:
        return len(self.corners)

    def corner_metric(self, name: str) -> np.ndarray:
        return self.metrics[name][: self.n_corners]

    def sample_metric(self, name: str) -> np.ndarray:
        return self.metrics[name][self.n_corners:]


def corner_points(L: Ledger, reg) -> PointSet:
    """Corners of the tolerances that matter for this regulator kind."""
    tl, th = L["mains.tol_low"], L["mains.tol_high"]
    lines = [("low line", 1 - tl), ("nominal mains", 1.0), ("high line", 1 + th)]
    least = L["output.i_min_worst"]
    loads = [("least load" if least == 0 else "minimum load", least),
             ("full load", L["output.i_max"])]
    c, tc = L["reservoir.c"], L["reservoir.tol"]
    caps = [(f"C -{tc * 100:g} %", c * (1 - tc)), (f"C +{tc * 100:g} %", c * (1 + tc))]
    zeners = reg.zener_axis(L)
    resistors = reg.resistor_axis(L)
    rows = list(itertools.product(lines, loads, caps, zeners, resistors, diode_temperatures(L),
                                  frequencies(L)))
    return PointSet(
        line=np.array([x[0][1] for x in rows]),
        load=np.array([x[1][1] for x in rows]),
        c=np.array([x[2][1] for x in rows]),
        v_z=np.array([x[3][1] for x in rows]),
        r=np.array([x[4][1] for x in rows]),
        t_d=np.array([x[5][1] for x in rows]),
        freq=np.array([x[6][1] for x in rows]),
        name=[", ".join(part[0] for part in x if part[0]) for x in rows],
        line_name=[x[0][0] for x in rows],
        load_name=[x[1][0] for x in rows],
    )


def diode_temperatures(L: Ledger) -> list[tuple[str, float]]:
    """The rectifier junction at the cold and the hot corners (one value if they coincide)."""
    cold, hot = L["rect.d_t_cold"], L["rect.d_t_hot"]
    return [(f"diodes {t:g} degC", t) for t in sorted({cold, hot})]


def frequencies(L: Ledger) -> list[tuple[str, float]]:
    """Both mains frequencies of a dual-frequency product, named, lower first; the one
    frequency otherwise (unnamed: every corner has it)."""
    if "mains.freq_also" not in L:
        return [("", L["mains.freq"])]
    return [(f"{f:g} Hz", f) for f in sorted({L["mains.freq_given"], L["mains.freq_also"]})]


def sample_points(L: Ledger, n: int, seed: int, t_min: float, t_max: float, reg) -> PointSet:
    rng = np.random.default_rng(seed)
    tl, th = L["mains.tol_low"], L["mains.tol_high"]
    line = rng.uniform(1 - tl, 1 + th, n)
    load = rng.uniform(L["output.i_min_worst"], L["output.i_max"], n)
    c = L["reservoir.c"] * rng.uniform(1 - L["reservoir.tol"], 1 + L["reservoir.tol"], n)
    temp = rng.uniform(t_min, t_max, n)  # drawn for every kind so samples stay comparable
    v_z, r = reg.sample_axes(L, rng, n, temp)
    freqs = [f for _, f in frequencies(L)]
    freq = rng.choice(freqs, n) if len(freqs) > 1 else np.full(n, freqs[0])
    # the rectifier junction at the sample's ambient (self-heating not estimated)
    return PointSet(line, load, c, v_z, r, temp, freq, name=[f"sample {k + 1}" for k in range(n)],
                    line_name=["sample"] * n, load_name=["sample"] * n)


def _circuit(L: Ledger, pts: PointSet, topology: str, reg) -> Circuit:
    common = dict(topology=topology_record(topology).engine, v_rms=L["transformer.v_nl"] * pts.line,
                  freq=pts.freq, r_s=L["transformer.r_w"], l_s=L["transformer.l_s"],
                  c=pts.c, esr=L["reservoir.esr"], **engine_diode(L, pts.t_d))
    return reg.circuit(L, pts, common)


AXES = ("line", "load", "c", "v_z", "r", "t_d", "freq")


def design_circuit(L: Ledger, pts: PointSet, topology: str, reg) -> Circuit:
    """The engine circuit of one design at ``pts``; public so that many designs can be put
    through the engine in one call (docgen.explore)."""
    return _circuit(L, pts, topology, reg)


# The engine's steady-state figures every design keeps.
STEADY_FIGURES = (
    "v_c_max", "v_c_min", "v_c_mean", "ripple_pp", "conduction_angle", "i_d_peak",
    "i_d_avg", "i_d_rms", "i_sec_rms", "va_sec", "i_c_rms", "p_source", "p_diodes",
    "p_esr", "p_r_series", "p_zener", "p_out", "p_in", "v_out_max", "v_out_min",
    "v_out_mean", "v_out_pp", "i_z_min", "i_z_max")


def design_metrics(L: Ledger, pts: PointSet, figures: dict[str, np.ndarray], topology: str,
                   reg) -> dict[str, Any]:
    """One design's figures at ``pts``: the engine's (``STEADY_FIGURES``), the rectifier's
    output current from one diode's average, then the regulator kind's own figures."""
    metrics: dict[str, Any] = {name: figures[name] for name in STEADY_FIGURES}
    metrics["i_dc"] = metrics["i_d_avg"] * topology_record(topology).dc_per_diode_average
    metrics.update(reg.derived_metrics(L, pts, metrics))
    return metrics


def _concat(a: PointSet, b: PointSet | None) -> PointSet:
    if b is None:
        return a
    return PointSet(*(np.concatenate([getattr(a, f), getattr(b, f)])
                      for f in AXES),
                    name=a.name + b.name, line_name=a.line_name + b.line_name,
                    load_name=a.load_name + b.load_name)


def _with_output(L: Ledger, reg, wave: dict, pts: PointSet, k: int) -> dict:
    """A kept waveform with the kind's output voltage and the name of its corner."""
    out = dict(wave)
    out["v_out"] = reg.output_wave(L, wave, float(pts.load[k]), float(pts.v_z[k]),
                                   float(pts.r[k]))
    out["corner"] = pts.name[k]
    return out


def nominal_corner(corners: PointSet) -> int:
    """The corner whose figures the summary calls nominal: nominal mains, full load, C low."""
    return next(k for k, n in enumerate(corners.name)
                if n.startswith("nominal mains, full load, C -"))


def analyse(L: Ledger, topology: str, samples: int, seed: int, t_min: float, t_max: float, *,
            reg, surge: bool = True) -> CornerResult:
    """Simulate every corner and Monte Carlo sample of the design in one engine call, the
    switch-on surge too (unless ``surge`` is False), and add the figures derived from them."""
    return analyse_together([dict(L=L, topology=topology, samples=samples, seed=seed,
                                  t_min=t_min, t_max=t_max, reg=reg, surge=surge)])[0]


def analyse_together(jobs: list[dict]) -> list[CornerResult]:
    """``analyse`` for several designs (each job: analyse's arguments by name), with the
    corners and samples of all of them in one engine call where their circuits have the same
    topology and load law (the two rails of a split supply)."""
    prepared = [_prepare(**job) for job in jobs]
    circuits = [c for _, c in prepared]
    if len({(c.topology, c.load) for c in circuits}) == 1 and len(circuits) > 1:
        sizes = [c.n for c in circuits]
        offsets = np.cumsum([0] + sizes)
        keep = [int(o) + k for o, (prep, _) in zip(offsets, prepared, strict=False)
                for k in (prep["nominal"], prep["trough"])]
        whole = simulate(concat_circuits(circuits), keep_waveforms=keep)
        results = [whole.take(int(a), int(b)) for a, b in zip(offsets[:-1], offsets[1:],
                                                                strict=True)]
    else:
        results = [simulate(c, keep_waveforms=(prep["nominal"], prep["trough"]))
                   for prep, c in prepared]
    return [_complete(ss=ss, **prep) for (prep, _), ss in zip(prepared, results, strict=True)]


def _prepare(L: Ledger, topology: str, samples: int, seed: int, t_min: float, t_max: float, *,
             reg, surge: bool = True) -> tuple[dict, Circuit]:
    corners = corner_points(L, reg)
    mc = sample_points(L, samples, seed, t_min, t_max, reg) if samples > 0 else None
    pts = _concat(corners, mc)
    # waveforms for the nominal corner and the low-line, full-load, C low corner (there with
    # the cold diode and the lower frequency: the deepest trough)
    nominal = nominal_corner(corners)
    trough = max((k for k, n in enumerate(corners.name) if n.startswith("low line, full load, C -")),
                 key=lambda k: (corners.v_z[k], corners.r[k], -corners.t_d[k], -corners.freq[k]))
    circuit = _circuit(L, pts, topology, reg)
    prep = dict(L=L, topology=topology, reg=reg, surge=surge, corners=corners, mc=mc, pts=pts,
                nominal=nominal, trough=trough, circuit=circuit)
    return prep, circuit


def _complete(L: Ledger, topology: str, reg, surge: bool, corners: PointSet, mc, pts: PointSet,
              nominal: int, trough: int, circuit: Circuit, ss) -> CornerResult:
    metrics = design_metrics(L, pts, {name: getattr(ss, name) for name in STEADY_FIGURES},
                             topology, reg)
    if "output.hold_up" in L:
        metrics["holdup"] = holdup_times(L, reg, pts, metrics["v_c_min"], circuit)
    surge = _surge(L, corners, ss, topology, reg) if surge else {}
    return CornerResult(
        corners=corners, samples=mc, metrics=metrics, converged=ss.converged,
        surge_peak=surge.get("peak", float("nan")), surge_i2t=surge.get("i2t", float("nan")),
        surge_converged=surge.get("ok", False),
        surge_first_i2t=surge.get("first_i2t", float("nan")),
        surge_cycles=surge.get("cycles", float("nan")), surge_corner=surge.get("corner", ""),
        surge_settled=surge.get("settled", False),
        waveforms={name: _with_output(L, reg, ss.waveforms[k], corners, k)
                   for name, k in (("nominal", nominal), ("trough", trough))
                   if k in ss.waveforms and bool(ss.converged[k])},
        nominal_index=nominal,
    )


def _surge(L: Ledger, corners: PointSet, ss, topology: str, reg) -> dict:
    """Switch-on transient at high line, largest capacitance, hot rectifier (the least drop),
    closed at the crest, with the least and with the full load (the load lengthens the charging
    and so adds I^2 t), at each mains frequency; all run in one vectorised call. Each runs until
    its pulses fall to 1.1 x its steady-state repetitive peak; the larger peak and the larger
    I^2 t are reported."""
    sub, ref = surge_points(corners, ss.i_d_peak)
    so = switch_on(_circuit(L, sub, topology, reg), steps_per_period=SURGE_STEPS,
                   max_cycles=SURGE_CYCLES, settle_peak=ref)
    return surge_figures(sub, so)


def surge_points(corners: PointSet, i_d_peak: np.ndarray) -> tuple[PointSet, np.ndarray]:
    """The switch-on corners of ``_surge`` and their steady-state repetitive peaks (the settling
    reference; NaN where the engine gave none)."""
    top = max(range(len(corners)), key=lambda j: (corners.line[j], corners.c[j], corners.t_d[j]))
    same = [j for j in range(len(corners))
            if all(getattr(corners, f)[j] == getattr(corners, f)[top]
                   for f in ("line", "c", "v_z", "r", "t_d"))]
    pick = set()
    for f in sorted({float(corners.freq[j]) for j in same}):
        at_f = [j for j in same if corners.freq[j] == f]
        pick |= {min(at_f, key=lambda j: corners.load[j]), max(at_f, key=lambda j: corners.load[j])}
    pick = sorted(pick)
    sub = PointSet(*(getattr(corners, f)[pick] for f in AXES),
                   name=[corners.name[j] for j in pick],
                   line_name=[corners.line_name[j] for j in pick],
                   load_name=[corners.load_name[j] for j in pick])
    ref = np.asarray(i_d_peak)[pick]
    return sub, np.where(np.isfinite(ref), ref, np.nan)


def surge_figures(sub: PointSet, so) -> dict:
    """The reported switch-on figures of the points ``sub`` (``so``: their SwitchOn arrays)."""
    if not bool(np.all(so.converged)):
        return {"ok": False}
    kp = int(np.argmax(so.i_peak))
    ki = int(np.argmax(so.i2t))
    return {"ok": True, "peak": float(so.i_peak[kp]), "i2t": float(so.i2t[ki]),
            "first_i2t": float(so.first_i2t[ki]),
            "cycles": float(so.duration[ki] * sub.freq[ki]),
            "corner": sub.name[ki], "settled": bool(so.settled[ki])}


def corner_rows(cr: CornerResult) -> list[dict]:
    """One row per corner: its operating point and the engine's figures there."""
    rows = []
    keys = ("v_c_min", "v_c_max", "ripple_pp", "v_out_min", "v_out_max", "v_out_pp", "i_z_min",
            "i_z_max", "p_zener", "p_r_series", "i_sec_rms", "va_sec", "i_c_rms", "i_d_peak",
            "i_dc", "p_in", "p_out")
    for k in range(cr.n_corners):
        row = {"name": cr.corners.name[k], "converged": bool(cr.converged[k]),
               "line_factor": float(cr.corners.line[k]), "load": float(cr.corners.load[k]),
               "c": float(cr.corners.c[k]), "v_z": float(cr.corners.v_z[k]),
               "r": float(cr.corners.r[k]), "t_diode": float(cr.corners.t_d[k]),
               "freq": float(cr.corners.freq[k])}
        for key in keys:
            v = float(cr.metrics[key][k])
            row[key] = v if math.isfinite(v) else None
        rows.append(row)
    return rows
